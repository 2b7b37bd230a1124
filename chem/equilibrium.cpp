#include "chem/equilibrium.h"
#include "chem/finding_text.h"

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
    case Warning::Severity::info:
        return "info";
    case Warning::Severity::caution:
        return "caution";
    case Warning::Severity::warning:
        return "warning";
    }
    return "info";
}

double Speciation::concentration_of(const std::string& species_name) const {
    double c = 0;
    for (const auto& s : species)
        if (s.species == species_name)
            c += s.mol_per_l;
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
        const double g1 = std::exp(ln10 * davies_log10_gamma(a, 1, ionic_strength));
        for (int z = 1; z <= highest_abs_z; ++z) {
            double g = 1.0;
            for (int k = 0; k < z * z; ++k)
                g *= g1;
            by_abs_z[z] = g;
        }
    }
    double operator()(int z) const { return by_abs_z[std::min(std::abs(z), max_charge)]; }
};

/// The solution's balances at one fixed set of activity coefficients (one per flat species,
/// Problem::index_species). Precomputes, per system, the conditional constants
/// K'_j = Ka_j γ(species j) / γ(species j+1), so that c_{j+1}/c_j = K'_j / h with h the activity
/// of H+; the pH root search then costs one pow and a few products per system.
class AtFixedGamma {
  public:
    AtFixedGamma(const Problem& p, const std::vector<double>& g,
                 std::vector<std::array<double, max_steps>>& kc)
        : p_(p), kc_(kc), gh_(g[p.h_index]), goh_(g[p.oh_index]) {
        kc_.resize(p.systems.size());
        for (size_t i = 0; i < p.systems.size(); ++i) {
            const auto& s = p.systems[i];
            const int o = p.sys_offset[i];
            for (int j = 0; j < s.steps; ++j)
                kc_[i][j] = s.ka[j] * g[o + j] / g[o + j + 1];
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

    double h_mol_per_l(double h) const { return h / gh_; }
    double oh_mol_per_l(double h) const { return p_.kw / (h * goh_); }

    /// Net charge concentration (mol/L) at pH: strictly decreasing in pH.
    double charge(double ph) const {
        const double h = std::exp(-ln10 * ph), inv_h = 1.0 / h;
        double q = h / gh_ - p_.kw * inv_h / goh_ + spectator_charge_;
        std::array<double, max_steps + 1> t{};
        for (size_t i = 0; i < p_.systems.size(); ++i) {
            const auto& s = p_.systems[i];
            if (s.total_mol_per_l <= 0)
                continue;
            const double sum = distribution(i, inv_h, t);
            double zbar = 0;
            for (int j = 0; j <= s.steps; ++j)
                zbar += (s.z0 - j) * t[j];
            q += s.total_mol_per_l * zbar / sum;
        }
        return q;
    }

    /// Net charge q (mol/L) at pH and its slope dq/dpH = −ln 10 · ([H+] + [OH−] + Σ C_T ·
    /// Var(protons removed)), the Van Slyke buffer value at fixed γ with its sign (α_j ∝ 10^(j·pH)
    /// makes d ln α_j / dpH = ln 10 · (j − mean j)). One pow for both.
    void charge_and_slope(double ph, double& q, double& dq) const {
        const double h = std::exp(-ln10 * ph), inv_h = 1.0 / h;
        const double c_h = h / gh_, c_oh = p_.kw * inv_h / goh_;
        q = c_h - c_oh + spectator_charge_;
        double var_sum = c_h + c_oh;
        std::array<double, max_steps + 1> t{};
        for (size_t i = 0; i < p_.systems.size(); ++i) {
            const auto& s = p_.systems[i];
            if (s.total_mol_per_l <= 0)
                continue;
            const double inv_sum = 1.0 / distribution(i, inv_h, t);
            double mean = 0, mean2 = 0;
            for (int j = 1; j <= s.steps; ++j) {
                mean += j * t[j];
                mean2 += j * j * t[j];
            }
            mean *= inv_sum;
            mean2 *= inv_sum;
            q += s.total_mol_per_l * (s.z0 - mean);
            var_sum += s.total_mol_per_l * (mean2 - mean * mean);
        }
        dq = -ln10 * var_sum;
    }

    /// For Newton's method on (pH, I) with Davies γ (log10 γ_k = z_k² L, L = log10 γ of a
    /// singly charged ion): the charge balance q, the computed ionic strength Ic = ½ Σ c z²
    /// (mol/L), and their derivatives in pH and in L, in one pass. With α_j a system's species
    /// fractions, d ln α_j / dpH = ln 10 (j − mean j) and d ln α_j / dL = ln 10 (w_j − mean w),
    /// w_j = z_0² − z_j² (K'_j = Ka_j γ_j / γ_{j+1}); [H+] and [OH−] scale as 10^(∓pH − L).
    struct Terms {
        double q = 0, q_ph = 0, q_l = 0;    ///< mol/L, per pH unit, per unit of L
        double ic = 0, ic_ph = 0, ic_l = 0; ///< the same for Ic
    };
    Terms davies_terms(double ph) const {
        Terms r;
        const double h = std::exp(-ln10 * ph), inv_h = 1.0 / h;
        const double c_h = h / gh_, c_oh = p_.kw * inv_h / goh_;
        double q = c_h - c_oh + spectator_charge_;
        double var = c_h + c_oh;    // −q_ph / ln 10
        double cov_zw = c_oh - c_h; // q_l / ln 10
        double z2 = c_h + c_oh + spectator_z2_;
        double cov_z2j = c_oh - c_h;    // 2 ic_ph / ln 10
        double cov_z2w = -(c_h + c_oh); // 2 ic_l / ln 10
        std::array<double, max_steps + 1> t{};
        for (size_t i = 0; i < p_.systems.size(); ++i) {
            const auto& s = p_.systems[i];
            if (s.total_mol_per_l <= 0)
                continue;
            const double inv_sum = 1.0 / distribution(i, inv_h, t);
            double ej = 0, ejj = 0, ew = 0, ezw = 0, ez2 = 0, ejz2 = 0, ez2w = 0;
            const double z0sq = double(s.z0) * s.z0;
            for (int j = 0; j <= s.steps; ++j) {
                const double a = t[j] * inv_sum;
                const double z = s.z0 - j, zz = z * z, w = z0sq - zz;
                ej += j * a;
                ejj += j * j * a;
                ew += w * a;
                ezw += z * w * a;
                ez2 += zz * a;
                ejz2 += j * zz * a;
                ez2w += zz * w * a;
            }
            const double c = s.total_mol_per_l, ez = s.z0 - ej;
            q += c * ez;
            var += c * (ejj - ej * ej);
            cov_zw += c * (ezw - ez * ew);
            z2 += c * ez2;
            cov_z2j += c * (ejz2 - ez2 * ej);
            cov_z2w += c * (ez2w - ez2 * ew);
        }
        r.q = q;
        r.q_ph = -ln10 * var;
        r.q_l = ln10 * cov_zw;
        r.ic = 0.5 * z2;
        r.ic_ph = 0.5 * ln10 * cov_z2j;
        r.ic_l = 0.5 * ln10 * cov_z2w;
        return r;
    }

    /// Ionic strength (mol/L) of the solution at pH, ½ Σ c z².
    double ionic_strength(double ph) const {
        const double h = std::exp(-ln10 * ph), inv_h = 1.0 / h;
        double sum_cz2 = h / gh_ + p_.kw * inv_h / goh_ + spectator_z2_;
        std::array<double, max_steps + 1> t{};
        for (size_t i = 0; i < p_.systems.size(); ++i) {
            const auto& s = p_.systems[i];
            if (s.total_mol_per_l <= 0)
                continue;
            const double sum = distribution(i, inv_h, t);
            double z2bar = 0;
            for (int j = 0; j <= s.steps; ++j)
                z2bar += (s.z0 - j) * (s.z0 - j) * t[j];
            sum_cz2 += s.total_mol_per_l * z2bar / sum;
        }
        return 0.5 * sum_cz2;
    }

    /// Concentration (mol/L) of every flat species at pH.
    void concentrations(double ph, std::vector<double>& c) const {
        const double h = std::exp(-ln10 * ph), inv_h = 1.0 / h;
        c.assign(p_.n_flat, 0.0);
        std::array<double, max_steps + 1> t{};
        for (size_t i = 0; i < p_.systems.size(); ++i) {
            const auto& s = p_.systems[i];
            const double sum = distribution(i, inv_h, t);
            for (int j = 0; j <= s.steps; ++j)
                c[p_.sys_offset[i] + j] = s.total_mol_per_l * t[j] / sum;
        }
        for (size_t k = 0; k < p_.ions.size(); ++k)
            c[p_.ion_offset + k] = p_.ions[k].total_mol_per_l;
        c[p_.h_index] = h / gh_;
        c[p_.oh_index] = p_.kw * inv_h / goh_;
    }

  private:
    const Problem& p_;
    std::vector<std::array<double, max_steps>>& kc_;
    double gh_, goh_;
    double spectator_charge_ = 0, spectator_z2_ = 0;
};

/// Davies γ of every flat species at ionic strength I (mol/L).
void davies_gammas(const Problem& p, double ionic_strength, std::vector<double>& g) {
    int highest = 0;
    for (int z : p.flat_charge)
        highest = std::max(highest, std::abs(z));
    const Gammas by_z(p.a_dh, ionic_strength, std::min(highest, max_charge));
    g.resize(p.n_flat);
    for (int k = 0; k < p.n_flat; ++k)
        g[k] = by_z(p.flat_charge[k]);
}

/// Truesdell–Jones log10 γ of every flat species at ionic strength i_m (mol/kg), with the
/// Bates–Guggenheim convention term (chem::truesdell_jones_convention), which it returns.
double truesdell_jones_log10(const Problem& p, double i_m, std::vector<double>& lg) {
    const double phi =
        truesdell_jones_convention(p.a_molal, p.b_molal, p.tj_chloride_size, p.tj_chloride_b, i_m);
    lg.resize(p.n_flat);
    for (int k = 0; k < p.n_flat; ++k) {
        const int z = p.flat_charge[k];
        lg[k] = z == 0 ? 0.0
                       : truesdell_jones_raw_log10_gamma(p.a_molal, p.b_molal, z, p.tj_size[k],
                                                         p.tj_b[k], i_m) -
                             z * phi;
    }
    return phi;
}

/// SIT log10 γ of every flat species at ionic strength i_m (mol/kg), the ε terms on the
/// concentrations c (mol/L).
void sit_log10(const Problem& p, const std::vector<double>& c, double i_m,
               std::vector<double>& lg) {
    const double d = sit_debye_huckel(p.a_molal, i_m);
    lg.resize(p.n_flat);
    for (int k = 0; k < p.n_flat; ++k) {
        const int z = p.flat_charge[k];
        lg[k] = -z * z * d;
        if (z != 0) {
            const double* row = &p.sit_eps[static_cast<size_t>(k) * p.n_flat];
            for (int l = 0; l < p.n_flat; ++l)
                if (row[l] != 0)
                    lg[k] += row[l] * c[l] / p.kg_per_l;
        }
    }
}

/// The γ of an extended model (SIT or Truesdell–Jones) of every flat species from their
/// concentrations (mol/L, converted to mol/kg).
///
/// Associated species (Problem::complexes) are folded into stoichiometric coefficients: with m
/// the total and m_f = f m the free molality of each member, a complex's amount is
/// x = K° Π (γ_k m_f,k)^ν_k / γ_complex, the members' balances are m_f,k + Σ ν_k x = m_k, and the
/// γ given for a member is γ_free f, so that γ m is its free activity and every equilibrium of
/// the solver holds for the free species. A complex takes the model's γ for its charge
/// (Truesdell–Jones: default_ion_size_angstrom, b = 0; SIT: no ε), and the ionic strength counts
/// it at its own charge. A damped fixed point (to 1e-13 relative, at most 200 passes) settles f,
/// x and I together; the outer fixed point on γ (solve_state) makes the whole consistent.
void extended_gammas(const Problem& p, const std::vector<double>& c, std::vector<double>& g) {
    double i_stoich = 0;
    for (int k = 0; k < p.n_flat; ++k)
        i_stoich += 0.5 * p.flat_charge[k] * p.flat_charge[k] * c[k];
    i_stoich /= p.kg_per_l;
    thread_local std::vector<double> lg;
    const bool tj = p.model == ActivityModel::truesdell_jones;
    auto log10_at = [&](double i_m) {
        if (tj)
            return truesdell_jones_log10(p, i_m, lg);
        sit_log10(p, c, i_m, lg);
        return 0.0;
    };
    g.resize(p.n_flat);
    if (p.complexes.empty()) {
        log10_at(i_stoich);
        for (int k = 0; k < p.n_flat; ++k)
            g[k] = std::exp(ln10 * lg[k]);
        return;
    }
    const size_t n_cx = p.complexes.size();
    thread_local std::vector<double> x, kc, f, bound;
    x.assign(n_cx, 0.0);
    kc.assign(n_cx, 0.0);
    f.assign(p.n_flat, 1.0);
    bound.assign(p.n_flat, 0.0);
    for (int pass = 0; pass < 200; ++pass) {
        double i_m = i_stoich;
        for (size_t q = 0; q < n_cx; ++q) {
            const auto& a = p.complexes[q];
            double z2 = 0;
            for (int j = 0; j < a.n; ++j)
                z2 += a.count[j] * p.flat_charge[a.member[j]] * p.flat_charge[a.member[j]];
            i_m += 0.5 * (a.charge * a.charge - z2) * x[q];
        }
        i_m = std::max(i_m, 0.0);
        const double phi = log10_at(i_m);
        double change = 0;
        std::fill(bound.begin(), bound.end(), 0.0);
        for (size_t q = 0; q < n_cx; ++q) {
            const auto& a = p.complexes[q];
            const double lg_complex =
                tj ? truesdell_jones_raw_log10_gamma(p.a_molal, p.b_molal, a.charge,
                                                     default_ion_size_angstrom, 0.0, i_m) -
                         a.charge * phi
                   : -a.charge * a.charge * sit_debye_huckel(p.a_molal, i_m);
            double lx = std::log10(a.k) - lg_complex;
            bool present = true;
            for (int j = 0; j < a.n; ++j) {
                const int k = a.member[j];
                const double m_free = c[k] / p.kg_per_l * f[k];
                if (!(m_free > 0)) {
                    present = false;
                    break;
                }
                lx += a.count[j] * (lg[k] + std::log10(m_free));
            }
            const double next = present ? std::exp(ln10 * lx) : 0.0;
            change = std::max(change, std::abs(next - x[q]) / std::max(next, 1e-300));
            x[q] = next;
            for (int j = 0; j < a.n; ++j)
                bound[a.member[j]] += a.count[j] * next;
        }
        // f_k from the balance m_f,k + bound_k = m_k with x ∝ f_k^ν, solved as
        // f ← f m / (f m + bound), geometrically damped after the first passes.
        for (int k = 0; k < p.n_flat; ++k) {
            if (bound[k] <= 0)
                continue;
            const double m = c[k] / p.kg_per_l, fm = f[k] * m;
            const double target = f[k] * m / (fm + bound[k]);
            f[k] = pass < 20 ? target : std::sqrt(f[k] * target);
        }
        if (change <= 1e-13)
            break;
    }
    for (int k = 0; k < p.n_flat; ++k)
        g[k] = std::exp(ln10 * lg[k]) * f[k];
}

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
        const double a = std::max(ph_low, guess - half_width),
                     b = std::min(ph_high, guess + half_width);
        const double fa = f(a);
        if (fa >= 0) {
            const double fb = f(b);
            if (fb <= 0) {
                lo = a;
                hi = b;
                flo = fa;
                fhi = fb;
                bracketed = true;
            }
        }
    }
    if (!bracketed) {
        flo = f(lo);
        fhi = f(hi);
    }
    if (flo == 0)
        return lo;
    if (fhi == 0)
        return hi;
    if (!(flo > 0 && fhi < 0))
        throw Error("components", "the charge balance has no root between pH " +
                                      format_number(ph_low) + " and " + format_number(ph_high));
    std::uintmax_t max_iter = 200;
    auto r = boost::math::tools::toms748_solve(
        f, lo, hi, flo, fhi, boost::math::tools::eps_tolerance<double>(42), max_iter);
    return 0.5 * (r.first + r.second);
}

/// pH at fixed γ from a nearby `guess` (finite) by Newton's method on the charge balance,
/// safeguarded by bisection inside the bracket [ph_low, ph_high] that shrinks with each sign
/// seen (Press et al., Numerical Recipes, 3rd ed. 2007, §9.4 "rtsafe"). The balance is strictly
/// decreasing with a slope known in closed form, so from a neighbouring solution two to four
/// steps reach the root to 1e-12 pH, where TOMS 748 needs eight to ten evaluations. A root at
/// an end of the bracket (none inside) goes to solve_ph, which checks the signs and says so.
double solve_ph_newton(const AtFixedGamma& balance, double guess) {
    double lo = ph_low, hi = ph_high;
    double x = std::clamp(guess, ph_low, ph_high);
    for (int it = 0; it < 200; ++it) {
        double q = 0, dq = 0;
        balance.charge_and_slope(x, q, dq);
        if (q == 0)
            return x;
        if (q > 0)
            lo = x;
        else
            hi = x;
        const double step = dq < 0 ? q / dq : std::numeric_limits<double>::quiet_NaN();
        if (std::abs(step) <= 1e-12) // quadratic convergence: the error is now far below that
            return x - step;
        double next = x - step;
        if (!(next > lo && next < hi)) // also a NaN step: bisect
            next = 0.5 * (lo + hi);
        x = next;
        if (hi - lo <= 1e-12)
            break;
    }
    if (x - ph_low < 1e-6 || ph_high - x < 1e-6)
        return solve_ph(balance, x, 0.05);
    return x;
}

} // namespace

void Problem::set_amounts(const std::vector<double>& mol_per_l) {
    for (auto& s : systems)
        s.total_mol_per_l = 0;
    for (auto& i : ions)
        i.total_mol_per_l = 0;
    for (size_t k = 0; k < feeds.size() && k < mol_per_l.size(); ++k) {
        for (const auto& [idx, n] : feeds[k].systems)
            systems[idx].total_mol_per_l += n * mol_per_l[k];
        for (const auto& [idx, n] : feeds[k].ions)
            ions[idx].total_mol_per_l += n * mol_per_l[k];
    }
}

void Problem::index_species(const Library& lib) {
    sys_offset.clear();
    flat_charge.clear();
    sys_offset.reserve(systems.size());
    flat_charge.reserve(systems.size() * (max_steps + 1) + ions.size() + 2);
    for (const auto& s : systems) {
        sys_offset.push_back(static_cast<int>(flat_charge.size()));
        for (int j = 0; j <= s.steps; ++j)
            flat_charge.push_back(s.z0 - j);
    }
    ion_offset = static_cast<int>(flat_charge.size());
    for (const auto& ion : ions)
        flat_charge.push_back(ion.charge);
    h_index = static_cast<int>(flat_charge.size());
    flat_charge.push_back(1);
    oh_index = static_cast<int>(flat_charge.size());
    flat_charge.push_back(-1);
    n_flat = static_cast<int>(flat_charge.size());
    sit_eps.clear();
    tj_size.clear();
    tj_b.clear();
    complexes.clear();
    if (model == ActivityModel::davies)
        return; // Davies needs the charges only
    std::vector<const std::string*> names;
    for (const auto& s : systems)
        for (int j = 0; j <= s.steps; ++j)
            names.push_back(&s.def->species[j]);
    for (const auto& ion : ions)
        names.push_back(&ion.name);
    static const std::string h = "H+", oh = "OH-";
    names.push_back(&h);
    names.push_back(&oh);
    for (const Complex& cx : lib.complexes()) {
        if (std::find(cx.models.begin(), cx.models.end(), model) == cx.models.end())
            continue;
        Assoc a;
        a.k = std::pow(10.0, cx.log10_k);
        bool all = true;
        for (const auto& [member, count] : cx.formed_from) {
            int found = -1;
            for (int k = 0; k < n_flat && found < 0; ++k)
                if (*names[k] == member)
                    found = k;
            if (found < 0 || a.n >= 4) {
                all = false;
                break;
            }
            a.member[a.n] = found;
            a.count[a.n] = count;
            a.charge += count * flat_charge[found];
            ++a.n;
        }
        if (all)
            complexes.push_back(a);
    }
    if (model == ActivityModel::truesdell_jones) {
        tj_size.assign(n_flat, default_ion_size_angstrom);
        tj_b.assign(n_flat, 0.0);
        for (int k = 0; k < n_flat; ++k)
            if (const IonSize* e = lib.ion_size(*names[k])) {
                tj_size[k] = e->size_angstrom;
                tj_b[k] = e->b_kg_per_mol;
            }
        if (const IonSize* cl = lib.ion_size("Cl-")) {
            tj_chloride_size = cl->size_angstrom;
            tj_chloride_b = cl->b_kg_per_mol;
        }
        return;
    }
    sit_eps.assign(static_cast<size_t>(n_flat) * n_flat, 0.0);
    for (int k = 0; k < n_flat; ++k)
        for (int l = 0; l < n_flat; ++l)
            if (flat_charge[k] > 0 && flat_charge[l] < 0)
                sit_eps[static_cast<size_t>(k) * n_flat + l] =
                    lib.sit_epsilon(*names[k], *names[l]);
            else if (flat_charge[k] < 0 && flat_charge[l] > 0)
                sit_eps[static_cast<size_t>(k) * n_flat + l] =
                    lib.sit_epsilon(*names[l], *names[k]);
}

Problem build_problem(const Library& lib, const std::vector<Component>& components,
                      double temperature_c, ActivityModel model) {
    if (!std::isfinite(temperature_c) || temperature_c < min_temperature_c ||
        temperature_c > max_temperature_c)
        throw Error("temperature_c", format_number(temperature_c) + " °C is outside " +
                                         format_number(min_temperature_c) + " to " +
                                         format_number(max_temperature_c) + " °C");
    if (components.empty())
        throw Error("components", "at least one component is needed");
    Problem p;
    p.temperature_k = to_kelvin(temperature_c);
    p.kw = std::pow(10.0, -pkw(p.temperature_k));
    p.a_dh = debye_huckel_a(p.temperature_k);
    p.model = model;
    p.a_molal = debye_huckel_a_molal(p.temperature_k);
    p.b_molal = debye_huckel_b_molal(p.temperature_k);
    p.kg_per_l = water_density_g_per_ml(p.temperature_k);
    std::vector<double> amounts;
    amounts.reserve(components.size());
    p.feeds.reserve(components.size());
    // Running total per distinct reagent, and the systems and ions met so far: linear scans, as
    // their number is bounded by the library's size (not by the number of components, which a
    // document may repeat thousands of times), and a handful in practice.
    std::vector<std::pair<const Reagent*, double>> reagent_totals;
    reagent_totals.reserve(components.size());
    p.systems.reserve(components.size() + 1);
    p.ions.reserve(components.size() + 1);
    // The component's path, made only for a message.
    auto field_of = [](size_t k) { return "components[" + std::to_string(k) + "]"; };
    for (size_t k = 0; k < components.size(); ++k) {
        const auto& c = components[k];
        if (!c.reagent)
            throw Error(field_of(k) + ".reagent", "no reagent given");
        if (!std::isfinite(c.mol_per_l) || c.mol_per_l <= 0)
            throw Error(field_of(k) + ".mol_per_l",
                        format_number(c.mol_per_l) + " is not a positive amount");
        if (c.mol_per_l > max_concentration_mol_per_l)
            throw Error(field_of(k) + ".mol_per_l",
                        format_number(c.mol_per_l) + " mol/L is above " +
                            format_number(max_concentration_mol_per_l) +
                            " mol/L, beyond any solution this tool models");
        // The limit holds for the reagent's total too: the same reagent listed twice (or 2000
        // times) is one amount, and 50 mol/L of it would pass unnoticed entry by entry.
        auto total = std::find_if(reagent_totals.begin(), reagent_totals.end(),
                                  [&](const auto& t) { return t.first == c.reagent; });
        if (total == reagent_totals.end())
            total = reagent_totals.insert(reagent_totals.end(), {c.reagent, 0.0});
        const double reagent_total = total->second += c.mol_per_l;
        if (reagent_total > max_concentration_mol_per_l * (1 + 1e-12))
            throw Error(field_of(k) + ".mol_per_l",
                        "brings " + c.reagent->id + " to " + format_number(reagent_total) +
                            " mol/L in all, above " + format_number(max_concentration_mol_per_l) +
                            " mol/L, beyond any solution this tool models");
        Problem::Feed feed;
        feed.systems.reserve(c.reagent->systems.size());
        feed.ions.reserve(c.reagent->spectators.size());
        for (const auto& share : c.reagent->systems) {
            const AcidBaseSystem* def = lib.find_system(share.system);
            if (!def) // throws, naming the field and the nearest ids
                def = &lib.system(share.system, field_of(k) + ".reagent");
            if (def->steps() > max_steps)
                throw Error(field_of(k) + ".reagent", "system \"" + def->id + "\" has more than " +
                                                          std::to_string(max_steps) + " steps");
            auto found = std::find_if(p.systems.begin(), p.systems.end(),
                                      [&](const Problem::System& s) { return s.def == def; });
            if (found == p.systems.end()) {
                Problem::System s;
                s.def = def;
                s.steps = def->steps();
                s.z0 = def->charge_fully_protonated;
                for (int j = 0; j < s.steps; ++j)
                    s.ka[j] = std::pow(10.0, -def->pka_at(j, p.temperature_k));
                found = p.systems.insert(p.systems.end(), s);
            }
            feed.systems.emplace_back(static_cast<int>(found - p.systems.begin()), share.count);
        }
        for (const auto& sp : c.reagent->spectators) {
            if (std::abs(sp.charge) > max_charge)
                throw Error(field_of(k) + ".reagent", "ion " + sp.ion + " has too high a charge");
            auto found = std::find_if(p.ions.begin(), p.ions.end(),
                                      [&](const Problem::Ion& i) { return i.name == sp.ion; });
            if (found == p.ions.end())
                found = p.ions.insert(p.ions.end(), {sp.ion, sp.charge, 0});
            feed.ions.emplace_back(static_cast<int>(found - p.ions.begin()), sp.count);
        }
        p.feeds.push_back(std::move(feed));
        amounts.push_back(c.mol_per_l);
    }
    p.set_amounts(amounts);
    p.index_species(lib);
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
        for (const auto& ion : p.ions)
            ionic += 0.5 * ion.charge * ion.charge * ion.total_mol_per_l;
    }
    double width = 0.05;
    int evaluations = 0;
    // Scratch reused across solves on this thread (a trace solves a hundred points in a row).
    thread_local std::vector<std::array<double, max_steps>> kc;
    thread_local std::vector<double> g;
    if (p.model != ActivityModel::davies) {
        // γ depends on each counter-ion's molality (SIT) or each ion's size (Truesdell–Jones),
        // not on I alone: a fixed point on the species' concentrations. It starts from the Davies γ
        // at the guess (or spectators') I; after 30 plain steps the update is damped by half (never
        // needed for the buffers here).
        davies_gammas(p, ionic, g);
        std::vector<double> c, g_new;
        for (int cycle = 0; cycle < 200; ++cycle) {
            const AtFixedGamma balance(p, g, kc);
            const double new_ph =
                std::isfinite(ph) ? solve_ph_newton(balance, ph) : solve_ph(balance, ph, width);
            if (std::isfinite(ph))
                width = std::clamp(4 * std::abs(new_ph - ph), 1e-7, 0.05);
            ph = new_ph;
            ++evaluations;
            balance.concentrations(ph, c);
            extended_gammas(p, c, g_new);
            double change = 0;
            for (int k = 0; k < p.n_flat; ++k)
                change = std::max(change, std::abs(std::log(g_new[k] / g[k])));
            if (change <= 1e-11)
                return State{ph, balance.ionic_strength(ph), evaluations};
            const double damp = cycle < 30 ? 1.0 : 0.5;
            for (int k = 0; k < p.n_flat; ++k)
                g[k] = std::pow(g[k], 1 - damp) * std::pow(g_new[k], damp);
        }
        throw Error("components", std::string("the activity coefficients (") +
                                      activity_model_name(p.model) +
                                      ") did not converge; the mixture is too concentrated for "
                                      "the model");
    }
    auto step = [&](double i_in) {
        davies_gammas(p, i_in, g);
        const AtFixedGamma balance(p, g, kc);
        const double new_ph =
            std::isfinite(ph) ? solve_ph_newton(balance, ph) : solve_ph_newton(balance, 7.0);
        if (std::isfinite(ph))
            width = std::clamp(4 * std::abs(new_ph - ph), 1e-7, 0.05);
        ph = new_ph;
        ++evaluations;
        return balance.ionic_strength(ph);
    };
    auto converged = [](double a, double b) {
        return std::abs(a - b) <= 1e-14 + 1e-10 * std::abs(b);
    };
    for (int cycle = 0; cycle < 100; ++cycle) {
        const double i1 = step(ionic);
        if (converged(i1, ionic))
            return State{ph, i1, evaluations};
        const double i2 = step(i1);
        if (converged(i2, i1))
            return State{ph, i2, evaluations};
        const double d = i2 - 2 * i1 + ionic;
        double next = i2;
        if (std::abs(d) > 1e-300) {
            const double accelerated = ionic - (i1 - ionic) * (i1 - ionic) / d;
            if (std::isfinite(accelerated) && accelerated >= 0)
                next = accelerated;
        }
        ionic = next;
    }
    throw Error("components", "the ionic strength did not converge (last " + format_number(ionic) +
                                  " mol/L); the mixture is too concentrated "
                                  "for the Davies model");
}

State solve_state_near(const Problem& p, const State& guess) {
    // Near a known solution the two loops of solve_state (a fixed point on I around a root search
    // in pH) become one Newton iteration on both unknowns: F1 = q(pH, L(I)) = 0 and
    // F2 = Ic(pH, L(I)) − I = 0, with L the Davies log10 γ of a singly charged ion,
    // L = −A (√I/(1 + √I) − 0.3 I) and dL/dI = −A (1/(2 √I (1 + √I)²) − 0.3) (Davies 1962).
    // It converges quadratically: from the neighbouring point of a trace, three passes of one
    // exponential for γ and one for [H+]. Anything unusual goes back to solve_state.
    if (p.model != ActivityModel::davies || !std::isfinite(guess.ph) ||
        !std::isfinite(guess.ionic_strength_mol_per_l) || !(guess.ionic_strength_mol_per_l > 1e-12))
        return solve_state(p, &guess);
    thread_local std::vector<std::array<double, max_steps>> kc;
    thread_local std::vector<double> g;
    double ph = guess.ph, ionic = guess.ionic_strength_mol_per_l;
    for (int pass = 1; pass <= 20; ++pass) {
        davies_gammas(p, ionic, g);
        const AtFixedGamma balance(p, g, kc);
        const auto t = balance.davies_terms(ph);
        const double r = std::sqrt(ionic);
        const double dl = -p.a_dh * (0.5 / (r * (1 + r) * (1 + r)) - 0.3);
        const double j11 = t.q_ph, j12 = t.q_l * dl, j21 = t.ic_ph, j22 = t.ic_l * dl - 1;
        const double f1 = t.q, f2 = t.ic - ionic;
        const double det = j11 * j22 - j12 * j21;
        if (!std::isfinite(det) || det == 0)
            break;
        const double d_ph = (-f1 * j22 + j12 * f2) / det;
        const double d_i = (-j11 * f2 + j21 * f1) / det;
        if (!(std::abs(d_ph) < 0.5) || !(ionic + d_i > 0.5 * ionic))
            break; // too far for Newton: the bracketed search
        ph += d_ph;
        ionic += d_i;
        // Quadratic convergence: after a step this small the error is far below 1e-12.
        if (std::abs(d_ph) <= 1e-8 && std::abs(d_i) <= 1e-8 * ionic && ph > ph_low && ph < ph_high)
            return State{ph, ionic, pass};
    }
    return solve_state(p, &guess);
}

std::vector<double> gammas_at(const Problem& p, const State& st) {
    std::vector<double> g;
    davies_gammas(p, st.ionic_strength_mol_per_l, g);
    if (p.model != ActivityModel::davies) {
        // Iterate to the fixed point the solver stopped at (it converged, so this is stable).
        std::vector<std::array<double, max_steps>> kc;
        std::vector<double> c, g_new;
        for (int k = 0; k < 200; ++k) {
            const AtFixedGamma balance(p, g, kc);
            balance.concentrations(st.ph, c);
            extended_gammas(p, c, g_new);
            double change = 0;
            for (int q = 0; q < p.n_flat; ++q)
                change = std::max(change, std::abs(std::log(g_new[q] / g[q])));
            g.swap(g_new);
            if (change <= 1e-13)
                break;
        }
    }
    return g;
}

/// ionic-strength-high: I in mol/kg (SIT, Truesdell–Jones) or mol/L (Davies) past the model's
/// range.
static Warning ionic_strength_high(Severity severity, const char* model, double ionic_strength,
                                   bool molal) {
    Finding f;
    f.kind = FindingKind::ionic_strength_high;
    f.severity = severity;
    f.number(molal ? "ionic_strength_mol_per_kg" : "ionic_strength_mol_per_l", ionic_strength);
    f.detail_text("model", model);
    return warning_of(std::move(f));
}

Speciation report(const Problem& p, const State& st) {
    Speciation out;
    out.temperature_c = to_celsius(p.temperature_k);
    out.ph = st.ph;
    out.ionic_strength_mol_per_l = st.ionic_strength_mol_per_l;
    out.iterations = st.iterations;
    out.activity_model = p.model;
    out.species.reserve(static_cast<size_t>(p.n_flat));
    const std::vector<double> g = gammas_at(p, st);
    std::vector<std::array<double, max_steps>> kc;
    const AtFixedGamma balance(p, g, kc);
    const double h = std::pow(10.0, -st.ph);
    const double c_h = balance.h_mol_per_l(h), c_oh = balance.oh_mol_per_l(h);
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
                                   s.total_mol_per_l * alpha, g[p.sys_offset[i] + j]});
        }
        // dn̄/dpH = -ln10 · Var(protons removed): the generalised Van Slyke buffer value.
        beta += s.total_mol_per_l * (mean2 - mean * mean);
    }
    out.buffer_capacity_mol_per_l = ln10 * beta;
    for (size_t k = 0; k < p.ions.size(); ++k)
        out.species.push_back(
            {p.ions[k].name, "", p.ions[k].charge, p.ions[k].total_mol_per_l, g[p.ion_offset + k]});
    out.species.push_back({"H+", "", 1, c_h, g[p.h_index]});
    out.species.push_back({"OH-", "", -1, c_oh, g[p.oh_index]});

    const double i = st.ionic_strength_mol_per_l;
    if (p.model == ActivityModel::sit) {
        const double i_m = i / p.kg_per_l;
        if (i_m > 3.5)
            out.warnings.push_back(ionic_strength_high(Severity::warning, "sit", i_m, true));
        return out;
    }
    if (p.model == ActivityModel::truesdell_jones) {
        const double i_m = i / p.kg_per_l;
        if (i_m > 1.0)
            out.warnings.push_back(
                ionic_strength_high(Severity::warning, "truesdell-jones", i_m, true));
        return out;
    }
    if (i > 0.5)
        out.warnings.push_back(ionic_strength_high(Severity::warning, "davies", i, false));
    else if (i > 0.1)
        out.warnings.push_back(ionic_strength_high(Severity::caution, "davies", i, false));
    return out;
}

} // namespace detail

Speciation solve(const Library& lib, const std::vector<Component>& components, double temperature_c,
                 ActivityModel model) {
    const detail::Problem p = detail::build_problem(lib, components, temperature_c, model);
    const detail::State st = detail::solve_state(p, nullptr);
    Speciation out = detail::report(p, st);
    // Where Davies leaves its range, compare with the other model (up to 0.1 mol/L the two agree
    // within 0.01 on the IUPAC standards, and the second solve would double the cost).
    if (st.ionic_strength_mol_per_l > 0.1) {
        const ActivityModel other =
            model == ActivityModel::davies ? ActivityModel::sit : ActivityModel::davies;
        detail::Problem q = detail::build_problem(lib, components, temperature_c, other);
        try {
            const double ph_other = detail::solve_state(q, &st).ph;
            const double davies_ph = model == ActivityModel::davies ? st.ph : ph_other;
            const double extended_ph = model == ActivityModel::davies ? ph_other : st.ph;
            const bool tj = model == ActivityModel::truesdell_jones;
            if (std::abs(davies_ph - extended_ph) > 0.02) {
                Finding f;
                f.kind = FindingKind::activity_model_differs;
                f.severity = Severity::caution;
                f.number("davies_ph", davies_ph);
                f.number("extended_ph", extended_ph);
                f.number("ionic_strength_mol_per_l", st.ionic_strength_mol_per_l);
                f.detail_text("model", tj ? "truesdell-jones" : "sit");
                out.warnings.push_back(warning_of(std::move(f)));
            }
        } catch (const Error&) {
            // The other model not converging says nothing about this result.
        }
    }
    return out;
}

} // namespace chem
