#include "chem/viscosity.h"

#include "chem/error.h"
#include "chem/units.h"

#include <cmath>

namespace chem {

double water_viscosity_mpa_s(double temperature_k) {
    // Kestin, Sokolov & Wakeham (1978), the 0.1 MPa correlation relative to 20 °C.
    const double d = 20.0 - to_celsius(temperature_k);
    const double log10_ratio =
        d / (to_celsius(temperature_k) + 96.0) * (1.2364 - 1.37e-3 * d + 5.7e-6 * d * d);
    return 1.0016 * std::pow(10.0, log10_ratio);
}

const char* viscosity_basis_name(ViscosityBasis b) {
    switch (b) {
    case ViscosityBasis::published_correlation:
        return "published-correlation";
    case ViscosityBasis::fit_to_published_data:
        return "fit-to-published-data";
    case ViscosityBasis::one_point_estimate:
        return "one-point-estimate";
    case ViscosityBasis::ideal_mixing:
        return "ideal-mixing";
    }
    return "";
}

const std::vector<WaterPairViscosity>& water_pair_viscosities() {
    // Pure organics fitted here as ln η = A + B/T through two handbook points; interactions as
    // stated. The checks against published points are in tests/tst_viscosity.cpp.
    static const std::vector<WaterPairViscosity> pairs = {
        {"acetonitrile", -3.476, 726, -1.762, 929, ViscosityBasis::published_correlation,
         "Chen & Horváth, J. Chromatogr. A 705 (1995) 3: ln η = φ(−3.476 + 726/T) + (1−φ)(water) "
         "+ φ(1−φ)(−1.762 + 929/T), φ the volume fraction of acetonitrile (coefficients from "
         "memory); their water term replaced by Kestin et al. (1978)"},
        {"methanol", -4.597, 1211, -6.215, 2809, ViscosityBasis::published_correlation,
         "Chen & Horváth, J. Chromatogr. A 705 (1995) 3: ln η = φ(−4.597 + 1211/T) + (1−φ)(water) "
         "+ φ(1−φ)(−6.215 + 2809/T), φ the volume fraction of methanol (coefficients from "
         "memory); their water term replaced by Kestin et al. (1978)"},
        // Least-squares fit of the interaction (a + b/T) to the ethanol–water tables at 20 and
        // 40 °C, 10–90 wt % (International Critical Tables / CRC Handbook, after Bingham &
        // Jackson, Bull. Bur. Stand. 14 (1918) 59; from memory): largest deviation 3.2 %.
        // Pure ethanol through 1.074 mPa·s at 25 °C and 0.694 at 50 °C (CRC Handbook, 'Viscosity
        // of Liquids', from memory).
        {"ethanol", -5.573049, 1682.8896, -12.838573, 4934.9426,
         ViscosityBasis::fit_to_published_data,
         "fit to the ethanol–water viscosity tables at 20 and 40 °C (International Critical "
         "Tables / CRC Handbook, after Bingham & Jackson 1918; from memory), largest deviation "
         "3.2 %"},
        // One-point fits: the interaction b/T (a = 0, i.e. a constant excess free energy of
        // activation for flow: an assumption) set so that the maximum at 25 °C is the recalled
        // one. Pure solvents through the CRC values at 25 and 50 °C (from memory):
        // 2-propanol 2.038 and 1.028 mPa·s; THF 0.456 and 0.361 mPa·s.
        {"2-propanol", -8.133988, 2637.4220, 0.0, 886.4, ViscosityBasis::one_point_estimate,
         "one-point estimate: maximum about 3.0 mPa·s near 55–60 wt % 2-propanol at 25 °C "
         "(from memory, e.g. Pang et al., J. Mol. Liq. 136 (2007) 71; not checked), interaction "
         "taken as b/T"},
        {"tetrahydrofuran", -3.804968, 900.3252, 0.0, 894.7, ViscosityBasis::one_point_estimate,
         "one-point estimate: maximum about 1.4 mPa·s near 35–40 % v/v THF at 25 °C (from "
         "memory, source not checked), interaction taken as b/T"},
    };
    return pairs;
}

const WaterPairViscosity* water_pair_viscosity(const std::string& organic) {
    for (const auto& p : water_pair_viscosities())
        if (p.organic == organic)
            return &p;
    return nullptr;
}

EluentViscosity::EluentViscosity(const BlendBasis& basis, double temperature_k)
    : temperature_k_(temperature_k) {
    const double t_c = to_celsius(temperature_k);
    if (!std::isfinite(t_c) || t_c < min_viscosity_temperature_c ||
        t_c > max_viscosity_temperature_c)
        throw Error("temperature_c", format_number(t_c) + " °C is outside " +
                                         format_number(min_viscosity_temperature_c) + " to " +
                                         format_number(max_viscosity_temperature_c) +
                                         " °C, the range of the viscosity model");
    auto rank = [](ViscosityBasis b) { return static_cast<int>(b); };
    for (std::size_t i = 0; i < basis.components.size(); ++i) {
        const Solvent& s = *basis.components[i].solvent;
        double ln_pure = 0, inter = 0;
        ViscosityBasis b = ViscosityBasis::published_correlation;
        if (s.aqueous) {
            ln_pure = std::log(water_viscosity_mpa_s(temperature_k));
            water_ = static_cast<int>(i);
        } else if (const WaterPairViscosity* p = water_pair_viscosity(s.id)) {
            ln_pure = p->pure_a + p->pure_b_k / temperature_k;
            inter = p->interaction_a + p->interaction_b_k / temperature_k;
            b = p->basis;
        } else {
            ln_pure = std::log(s.viscosity_mpa_s); // the library value, at its own temperature
            b = ViscosityBasis::ideal_mixing;
        }
        ln_pure_.push_back(ln_pure);
        interaction_.push_back(inter);
        if (rank(b) > rank(weakest_)) {
            weakest_ = b;
            weakest_ids_.clear();
        }
        if (b == weakest_ && !s.aqueous)
            weakest_ids_.push_back(s.id);
    }
}

double EluentViscosity::at(const SolventBlend& blend) const {
    const double phi_w = water_ >= 0 ? blend.fraction_v[water_] : 0.0;
    double ln_eta = 0;
    for (std::size_t i = 0; i < ln_pure_.size(); ++i) {
        const double phi = blend.fraction_v[i];
        ln_eta += phi * (ln_pure_[i] + phi_w * interaction_[i]);
    }
    return std::exp(ln_eta);
}

double eluent_viscosity_mpa_s(const SolventLibrary& solvents, const EluentMix& mix,
                              double temperature_k) {
    // A one-line basis holding the mix itself.
    LineProfile p;
    p.described = true;
    p.solvent_fraction_v = mix.solvent_fraction_v;
    const BlendBasis basis = blend_basis(solvents, {&p});
    SolventBlend b;
    const double hundred = 100.0;
    blend(basis, &hundred, b);
    return EluentViscosity(basis, temperature_k).at(b);
}

} // namespace chem
