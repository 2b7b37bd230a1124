#pragma once
// Viscosity of the eluent: water, its mixtures with acetonitrile, methanol, ethanol, 2-propanol
// and tetrahydrofuran, against composition and temperature. Pressure (chem/pressure.h) follows it.
//
// Every mixture uses one form, that of Chen & Horváth's correlation (J. Chromatogr. A 705 (1995)
// 3):
//   ln η = φ_w ln η_w(T) + Σ_o φ_o ln η_o(T) + Σ_o φ_w φ_o (a_o + b_o / T)
// with φ the volume fractions as measured before mixing (what the pump meters), T in K and η in
// mPa·s. For one organic this is ln η = φ ln η_o + (1−φ) ln η_w + φ(1−φ)(a + b/T). Water comes
// from water_viscosity_mpa_s (checked against IAPWS 2008). Pairs of organics mix ideally (no
// interaction term: an approximation). An organic without a correlation here mixes ideally with
// its library viscosity at the library's temperature (basis ideal_mixing).
#include "chem/eluent_mix.h"
#include "chem/solvent.h"

#include <string>
#include <vector>

namespace chem {

/// Viscosity of liquid water at 0.1 MPa in mPa·s: Kestin, Sokolov & Wakeham, J. Phys. Chem. Ref.
/// Data 7 (1978) 941 (from memory):
///   log10(η/η20) = (20 − t)/(t + 96) · [1.2364 − 1.37e−3 (20 − t) + 5.7e−6 (20 − t)²],
/// t in °C, η20 = 1.0016 mPa·s (IAPWS 2008 at 20 °C). Within 0.3 % of IAPWS 2008 from 0 to 60 °C,
/// drifting to −1.9 % at 90 °C (tst_viscosity). @param temperature_k in K.
double water_viscosity_mpa_s(double temperature_k);

/// Where a water–organic pair's numbers come from.
enum class ViscosityBasis {
    published_correlation, ///< a published correlation, used as published (Chen & Horváth)
    fit_to_published_data, ///< fitted here to published tables
    one_point_estimate,    ///< fitted here to one recalled maximum; temperature by an assumption
    ideal_mixing,          ///< no mixture data: ideal log mixing, library value at its temperature
};
const char* viscosity_basis_name(ViscosityBasis b);

/// One organic's numbers: pure ln η_o = pure_a + pure_b_k / T; interaction with water a + b/T.
struct WaterPairViscosity {
    std::string organic; ///< solvent id
    double pure_a = 0, pure_b_k = 0;
    double interaction_a = 0, interaction_b_k = 0;
    ViscosityBasis basis = ViscosityBasis::published_correlation;
    std::string source;
};
/// The pairs known here (acetonitrile, methanol, ethanol, 2-propanol, tetrahydrofuran).
const std::vector<WaterPairViscosity>& water_pair_viscosities();
const WaterPairViscosity* water_pair_viscosity(const std::string& organic);

/// Lowest and highest temperature accepted for the eluent models, in °C.
inline constexpr double min_viscosity_temperature_c = 0.0;
inline constexpr double max_viscosity_temperature_c = 90.0;

/// The viscosity model for the solvents of a BlendBasis at one temperature, prepared once.
class EluentViscosity {
  public:
    /// Throws chem::Error("temperature_c", …) outside 0–90 °C.
    EluentViscosity(const BlendBasis& basis, double temperature_k);
    /// Viscosity of a blend of the basis's solvents in mPa·s.
    double at(const SolventBlend& blend) const;
    /// The weakest basis among the solvents of the basis (ideal_mixing is the weakest), and the
    /// organics that have it.
    ViscosityBasis weakest_basis() const { return weakest_; }
    const std::vector<std::string>& weakest_organics() const { return weakest_ids_; }
    double temperature_k() const { return temperature_k_; }

  private:
    std::vector<double> ln_pure_;     ///< per component
    std::vector<double> interaction_; ///< per component: a + b/T with water (0 for water)
    int water_ = -1;
    ViscosityBasis weakest_ = ViscosityBasis::published_correlation;
    std::vector<std::string> weakest_ids_;
    double temperature_k_ = 298.15;
};

/// Viscosity of a mixed eluent in mPa·s (one evaluation; for many, use EluentViscosity).
double eluent_viscosity_mpa_s(const SolventLibrary& solvents, const EluentMix& mix,
                              double temperature_k);

} // namespace chem
