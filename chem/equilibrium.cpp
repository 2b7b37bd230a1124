#include "chem/equilibrium.h"

#include "chem/equilibrium_detail.h"
#include "chem/error.h"
#include "chem/units.h"
#include "chem/water.h"

#include <boost/math/tools/roots.hpp>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <limits>

namespace chem {

const char* severity_name(Warning::Severity s) {
    switch (s) {
    case Warning::Severity::info: return "info";
    case Warning::Severity::caution: return "caution";
    case Warning::Severity::warning: return "warning";
    }
    return "info";
}

double Speciation::concentration_of(const std::string& species_name) const {
    double c = 0;
    for (const auto& s : species)
        if (s.species == species_name) c += s.mol_per_l;
    return c;
}

namespace detail {

namespace {

/// Charge of an ion from its name's trailing sign and number: "Na+" +1, "HPO4-2" -2, "Ca+2" +2.
constexpr int max_charge = 6;

/// Activity coefficients by |z| for one ionic strength.
struct Gammas {
    std::array<double, max_charge + 1> by_abs_z{};
    /// @param highest_abs_z the largest |z| present; γ is computed only up to it (pow is costly).
    Gammas(double a, double ionic_strength, int highest_abs_z = max_charge) {
        by_abs_z[0] = 1.0;
        // Davies: log10 γ(z) = z² · log10 γ(1), so γ(z) = γ(1)^(z²).
        const double g1 = std::pow(10.0, davies_log10_gamma(a, 1, ionic_strength));
        for (int z = 1; z <= highest_abs_z; ++z) {
            double g = 1.0;
            for (int k = 0; k < z * z; ++k) g *= g1;
            by_abs_z[z] = g;
        }
    }
    double operator()(int z) const { return by_abs_z[std::min(std::abs(z), max_charge)]; }
};

/// The solution's balances at one fixed set of activity coefficients. Precomputes, per system,
/// the conditional constants K'_j = Ka_j γ(z_j) / γ(z_j − 1), so that c_{j+1}/c_j = K'_j / h with
/// h the activity of H+; the pH root search then costs one pow and a few products per system.
class AtFixedGamma {
public:
    AtFixedGamma(const Problem& p, const Gammas& g, std::vector<std::array<double, max_steps>>& kc)
        : p_(p), kc_(kc), g1_(g(1)) {
        kc_.resize(p.systems.size());
        for (size_t i = 0; i < p.systems.size(); ++i) {
            const auto& s = p.systems[i];
            for (int j = 0; j < s.steps; ++j) kc_[i][j] = s.ka[j] * g(s.z0 - j) / g(s.z0 - j - 1);
        }
        for (const auto& ion : p.ions) {
            spectator_charge_ += ion.charge * ion.total_mol_per_l;
            spectator_z2_ += ion.charge * ion.charge * ion.total_mol_per_l;
        }
    }

    /// Relative amounts t_j (t_0 = 1) of system i's species at H+ activity h; returns their sum.
    double distribution(size_t i, double inv_h, std::array<double, max_steps + 1>& t) const {
        const auto& s = p_.systems[i];
        t[0] = 1.0;
        double sum = 1.0;
        for (int j = 0; j < s.steps; ++j) {
            t[j + 1] = t[j] * kc_[i][j] * inv_h;
            sum += t[j + 1];
        }
        return sum;
    }

    /// Net charge concentration (mol/L) at pH: strictly decreasing in pH.
    double charge(double ph) const {
        const double h = std::pow(10.0, -ph), inv_h = 1.0 / h;
        double q = (h - p_.kw * inv_h) / g1_ + spectator_charge_;
        std::array<double, max_steps + 1> t{};
        for (size_t i = 0; i < p_.systems.size(); ++i) {
            const auto& s = p_.systems[i];
            if (s.total_mol_per_l <= 0) continue;
            const double sum = distribution(i, inv_h, t);
            double zbar = 0;
            for (int j = 0; j <= s.steps; ++j) zbar += (s.z0 - j) * t[j];
            q += s.total_mol_per_l * zbar / sum;
        }
        return q;
    }

    /// Ionic strength (mol/L) of the solution at pH, ½ Σ c z².
    double ionic_strength(double ph) const {
        const double h = std::pow(10.0, -ph), inv_h = 1.0 / h;
        double sum_cz2 = (h + p_.kw * inv_h) / g1_ + spectator_z2_;
        std::array<double, max_steps + 1> t{};
        for (size_t i = 0; i < p_.systems.size(); ++i) {
            const auto& s = p_.systems[i];
            if (s.total_mol_per_l <= 0) continue;
            const double sum = distribution(i, inv_h, t);
            double z2bar = 0;
            for (int j = 0; j <= s.steps; ++j) z2bar += (s.z0 - j) * (s.z0 - j) * t[j];
            sum_cz2 += s.total_mol_per_l * z2bar / sum;
        }
        return 0.5 * sum_cz2;
    }

private:
    const Problem& p_;
    std::vector<std::array<double, max_steps>>& kc_;
    double g1_;
    double spectator_charge_ = 0, spectator_z2_ = 0;
};

constexpr double ph_low = -3.0;  ///< bracket: [H+] ~ 1000 mol/L exceeds any allowed amount
constexpr double ph_high = 17.0; ///< bracket: [OH-] ~ 1000 mol/L

/// pH at fixed γ by TOMS 748 inside a bracket; the charge balance is strictly decreasing in pH,
/// so the root is unique. A bracket of ±half_width around a guess is tried first (fast re-solves
/// inside the ionic-strength iteration and the recipe searches), then the full range.
double solve_ph(const AtFixedGamma& balance, double guess, double half_width) {
    auto f = [&](double ph) { return balance.charge(ph); };
    double lo = ph_low, hi = ph_high;
    double flo = 0, fhi = 0;
    bool bracketed = false;
    if (std::isfinite(guess)) {
        const double a = std::max(ph_low, guess - half_width), b = std::min(ph_high, guess + half_width);
        const double fa = f(a);
        if (fa >= 0) {
            const double fb = f(b);
            if (fb <= 0) {
                lo = a; hi = b; flo = fa; fhi = fb;
                bracketed = true;
            }
        }
    }
    if (!bracketed) {
        flo = f(lo);
        fhi = f(hi);
    }
    if (flo == 0) return lo;
    if (fhi == 0) return hi;
    if (!(flo > 0 && fhi < 0))
        throw Error("components", "the charge balance has no root between pH " +
                                      format_number(ph_low) + " and " + format_number(ph_high));
    std::uintmax_t max_iter = 200;
    auto r = boost::math::tools::toms748_solve(f, lo, hi, flo, fhi,
                                               boost::math::tools::eps_tolerance<double>(42),
                                               max_iter);
    return 0.5 * (r.first + r.second);
}

} // namespace

void Problem::set_amounts(const std::vector<double>& mol_per_l) {
    for (auto& s : systems) s.total_mol_per_l = 0;
    for (auto& i : ions) i.total_mol_per_l = 0;
    for (size_t k = 0; k < feeds.size() && k < mol_per_l.size(); ++k) {
        for (const auto& [idx, n] : feeds[k].systems) systems[idx].total_mol_per_l += n * mol_per_l[k];
        for (const auto& [idx, n] : feeds[k].ions) ions[idx].total_mol_per_l += n * mol_per_l[k];
    }
}

Problem build_problem(const Library& lib, const std::vector<Component>& components,
                      double temperature_c) {
    if (!std::isfinite(temperature_c) || temperature_c < min_temperature_c ||
        temperature_c > max_temperature_c)
        throw Error("temperature_c", format_number(temperature_c) + " °C is outside " +
                                         format_number(min_temperature_c) + " to " +
                                         format_number(max_temperature_c) + " °C");
    if (components.empty()) throw Error("components", "at least one component is needed");
    Problem p;
    p.temperature_k = to_kelvin(temperature_c);
    p.kw = std::pow(10.0, -pkw(p.temperature_k));
    p.a_dh = debye_huckel_a(p.temperature_k);
    std::vector<double> amounts;
    for (size_t k = 0; k < components.size(); ++k) {
        const auto& c = components[k];
        const std::string field = "components[" + std::to_string(k) + "]";
        if (!c.reagent) throw Error(field + ".reagent", "no reagent given");
        if (!std::isfinite(c.mol_per_l) || c.mol_per_l <= 0)
            throw Error(field + ".mol_per_l", format_number(c.mol_per_l) + " is not a positive amount");
        if (c.mol_per_l > max_concentration_mol_per_l)
            throw Error(field + ".mol_per_l", format_number(c.mol_per_l) + " mol/L is above " +
                                                  format_number(max_concentration_mol_per_l) +
                                                  " mol/L, beyond any solution this tool models");
        // The limit holds for the reagent's total too: the same reagent listed twice (or 2000
        // times) is one amount, and 50 mol/L of it would pass unnoticed entry by entry.
        double reagent_total = 0;
        for (size_t j = 0; j <= k; ++j)
            if (components[j].reagent == c.reagent) reagent_total += components[j].mol_per_l;
        if (reagent_total > max_concentration_mol_per_l * (1 + 1e-12))
            throw Error(field + ".mol_per_l", "brings " + c.reagent->id + " to " +
                                                  format_number(reagent_total) +
                                                  " mol/L in all, above " +
                                                  format_number(max_concentration_mol_per_l) +
                                                  " mol/L, beyond any solution this tool models");
        Problem::Feed feed;
        for (const auto& share : c.reagent->systems) {
            const auto& def = lib.system(share.system, field + ".reagent");
            if (def.steps() > max_steps)
                throw Error(field + ".reagent", "system \"" + def.id + "\" has more than " +
                                                    std::to_string(max_steps) + " steps");
            auto it = std::find_if(p.systems.begin(), p.systems.end(),
                                   [&](const Problem::System& s) { return s.def == &def; });
            if (it == p.systems.end()) {
                Problem::System s;
                s.def = &def;
                s.steps = def.steps();
                s.z0 = def.charge_fully_protonated;
                for (int j = 0; j < s.steps; ++j)
                    s.ka[j] = std::pow(10.0, -def.pka_at(j, p.temperature_k));
                p.systems.push_back(s);
                it = std::prev(p.systems.end());
            }
            feed.systems.emplace_back(static_cast<int>(it - p.systems.begin()), share.count);
        }
        for (const auto& sp : c.reagent->spectators) {
            if (std::abs(sp.charge) > max_charge)
                throw Error(field + ".reagent", "ion " + sp.ion + " has too high a charge");
            auto it = std::find_if(p.ions.begin(), p.ions.end(),
                                   [&](const Problem::Ion& i) { return i.name == sp.ion; });
            if (it == p.ions.end()) {
                p.ions.push_back({sp.ion, sp.charge, 0});
                it = std::prev(p.ions.end());
            }
            feed.ions.emplace_back(static_cast<int>(it - p.ions.begin()), sp.count);
        }
        p.feeds.push_back(std::move(feed));
        amounts.push_back(c.mol_per_l);
    }
    p.set_amounts(amounts);
    return p;
}

State solve_state(const Problem& p, const State* guess) {
    // Outer fixed point on I: I -> γ(I) -> pH (unique root at fixed γ) -> I(pH) =: G(I).
    // G is smooth and contracting for the solutions modelled here; Steffensen's acceleration
    // (Aitken's Δ² on two plain steps) makes it converge quadratically. A plain step is kept
    // whenever the accelerated one would leave the physical range.
    double ph = guess ? guess->ph : std::numeric_limits<double>::quiet_NaN();
    double ionic = 0;
    if (guess) {
        ionic = guess->ionic_strength_mol_per_l;
    } else {
        for (const auto& ion : p.ions) ionic += 0.5 * ion.charge * ion.charge * ion.total_mol_per_l;
    }
    double width = 0.05;
    int evaluations = 0;
    std::vector<std::array<double, max_steps>> kc;
    auto step = [&](double i_in) {
        const AtFixedGamma balance(p, Gammas(p.a_dh, i_in), kc);
        const double new_ph = solve_ph(balance, ph, width);
        if (std::isfinite(ph)) width = std::clamp(4 * std::abs(new_ph - ph), 1e-7, 0.05);
        ph = new_ph;
        ++evaluations;
        return balance.ionic_strength(ph);
    };
    auto converged = [](double a, double b) { return std::abs(a - b) <= 1e-14 + 1e-10 * std::abs(b); };
    for (int cycle = 0; cycle < 100; ++cycle) {
        const double i1 = step(ionic);
        if (converged(i1, ionic)) return State{ph, i1, evaluations};
        const double i2 = step(i1);
        if (converged(i2, i1)) return State{ph, i2, evaluations};
        const double d = i2 - 2 * i1 + ionic;
        double next = i2;
        if (std::abs(d) > 1e-300) {
            const double accelerated = ionic - (i1 - ionic) * (i1 - ionic) / d;
            if (std::isfinite(accelerated) && accelerated >= 0) next = accelerated;
        }
        ionic = next;
    }
    throw Error("components", "the ionic strength did not converge (last " +
                                  format_number(ionic) + " mol/L); the mixture is too concentrated "
                                  "for the Davies model");
}

Speciation report(const Problem& p, const State& st) {
    Speciation out;
    out.temperature_c = to_celsius(p.temperature_k);
    out.ph = st.ph;
    out.ionic_strength_mol_per_l = st.ionic_strength_mol_per_l;
    out.iterations = st.iterations;
    const Gammas g(p.a_dh, st.ionic_strength_mol_per_l);
    std::vector<std::array<double, max_steps>> kc;
    const AtFixedGamma balance(p, g, kc);
    const double h = std::pow(10.0, -st.ph);
    const double c_h = h / g(1), c_oh = p.kw / (h * g(1));
    double beta = c_h + c_oh;
    std::array<double, max_steps + 1> t{};
    for (size_t i = 0; i < p.systems.size(); ++i) {
        const auto& s = p.systems[i];
        const double sum = balance.distribution(i, 1.0 / h, t);
        double mean = 0, mean2 = 0;
        for (int j = 0; j <= s.steps; ++j) {
            const double alpha = t[j] / sum;
            mean += j * alpha;
            mean2 += j * j * alpha;
            out.species.push_back({s.def->species[j], s.def->id, s.z0 - j,
                                   s.total_mol_per_l * alpha, g(s.z0 - j)});
        }
        // dn̄/dpH = -ln10 · Var(protons removed): the generalised Van Slyke buffer value.
        beta += s.total_mol_per_l * (mean2 - mean * mean);
    }
    out.buffer_capacity_mol_per_l = ln10 * beta;
    for (const auto& ion : p.ions)
        out.species.push_back({ion.name, "", ion.charge, ion.total_mol_per_l, g(ion.charge)});
    out.species.push_back({"H+", "", 1, c_h, g(1)});
    out.species.push_back({"OH-", "", -1, c_oh, g(1)});

    const double i = st.ionic_strength_mol_per_l;
    if (i > 0.5)
        out.warnings.push_back({"ionic-strength-high", Warning::Severity::warning,
                                "Ionic strength " + format_number(i) +
                                    " mol/L is above 0.5 mol/L, where the Davies activity model "
                                    "does not hold: treat the pH as indicative only (errors of 0.1 "
                                    "pH unit or more) and measure it."});
    else if (i > 0.1)
        out.warnings.push_back({"ionic-strength-high", Warning::Severity::caution,
                                "Ionic strength " + format_number(i) +
                                    " mol/L is above 0.1 mol/L; the Davies activity model loses "
                                    "accuracy here (a few hundredths of a pH unit)."});
    return out;
}

} // namespace detail

Speciation solve(const Library& lib, const std::vector<Component>& components, double temperature_c) {
    const detail::Problem p = detail::build_problem(lib, components, temperature_c);
    return detail::report(p, detail::solve_state(p, nullptr));
}

} // namespace chem
