#include "chem/eluent.h"

#include "chem/error.h"
#include "chem/finding_text.h"
#include "chem/units.h"
#include "chem/water.h"

#include <algorithm>
#include <array>
#include <cmath>
#include <limits>

namespace chem {

namespace {

/// The two organics with published parameters. Other organics borrow one (estimated).
enum class Basis { acetonitrile, methanol };
constexpr int n_basis = 2;
const char* basis_id(Basis b) {
    return b == Basis::acetonitrile ? "acetonitrile" : "methanol";
}

/// Alcohols behave like methanol (amphiprotic), everything else like acetonitrile (aprotic); only
/// acetonitrile and methanol themselves are published.
Basis basis_of(const std::string& id, bool* estimated) {
    *estimated = !(id == "acetonitrile" || id == "methanol");
    if (id == "methanol" || id == "ethanol" || id == "2-propanol" || id == "1-propanol")
        return Basis::methanol;
    return Basis::acetonitrile;
}

/// Relative permittivity of water + `organic` at volume fraction f and 25 °C, linear in the
/// volume fraction (an approximation within a few units of measured values; common practice,
/// no source). Used only to extrapolate tables in 1/ε.
double eps_25(const EluentSolvent& organic, double f) {
    static const double water_25 = water_permittivity(reference_temperature_k);
    return (1 - f) * water_25 + f * organic.permittivity_25c;
}

/// 1/ε at the last two rows of a shift table (rows xs), for table_at's extrapolation: the same
/// for every point, so worked out once per table (EluentModel's constructor).
detail::ShiftEnds shift_ends(const std::vector<double>& xs, const EluentSolvent& organic) {
    detail::ShiftEnds e;
    if (xs.empty())
        return e;
    const size_t n = xs.size();
    e.inv1 = 1 / eps_25(organic, xs[n - 1]);
    e.inv0 = 1 / eps_25(organic, n > 1 ? xs[n - 2] : 0.0);
    return e;
}

/// A tabulated shift y(φ) with y(0) = 0: linear between rows; above the last row, linear in 1/ε
/// through the last two rows (the Born-type dependence of a pKa shift on the permittivity);
/// `ends` from shift_ends(xs, organic).
double table_at(const std::vector<double>& xs, const std::vector<double>& ys, double f,
                const EluentSolvent& organic, const detail::ShiftEnds& ends, bool* beyond) {
    if (f <= 0 || xs.empty())
        return 0;
    if (f <= xs.back()) {
        double x0 = 0, y0 = 0;
        for (size_t i = 0; i < xs.size(); ++i) {
            if (f <= xs[i])
                return y0 + (ys[i] - y0) * (f - x0) / (xs[i] - x0);
            x0 = xs[i];
            y0 = ys[i];
        }
    }
    *beyond = true;
    const size_t n = xs.size();
    const double y1 = ys[n - 1];
    const double y0 = n > 1 ? ys[n - 2] : 0.0;
    const double inv = 1 / eps_25(organic, f), inv1 = ends.inv1, inv0 = ends.inv0;
    return y1 + (y1 - y0) / (inv1 - inv0) * (inv - inv1);
}

/// Where an organic fraction f (> 0) lies among a table's rows xs (not empty): the first row
/// at or above f, or past the last row (row −1), with 1/ε at f for table_at's extrapolation.
/// The tables of one organic share their rows, so prepare() finds this once per set of rows.
struct RowPair {
    int row = -1;
    double inv = 0;
};
RowPair row_pair(const std::vector<double>& xs, double f, const EluentSolvent& organic) {
    RowPair r;
    if (f <= xs.back()) {
        for (size_t i = 0; i < xs.size(); ++i)
            if (f <= xs[i]) {
                r.row = static_cast<int>(i);
                return r;
            }
    }
    r.inv = 1 / eps_25(organic, f);
    return r;
}

/// table_at with the rows around f found by row_pair (f > 0): the same arithmetic.
double table_at(const std::vector<double>& xs, const std::vector<double>& ys, double f,
                const RowPair& at, const detail::ShiftEnds& ends, bool* beyond) {
    if (at.row >= 0) {
        const size_t i = static_cast<size_t>(at.row);
        const double x0 = i > 0 ? xs[i - 1] : 0.0, y0 = i > 0 ? ys[i - 1] : 0.0;
        return y0 + (ys[i] - y0) * (f - x0) / (xs[i] - x0);
    }
    *beyond = true;
    const size_t n = xs.size();
    const double y1 = ys[n - 1];
    const double y0 = n > 1 ? ys[n - 2] : 0.0;
    const double inv = at.inv, inv1 = ends.inv1, inv0 = ends.inv0;
    return y1 + (y1 - y0) / (inv1 - inv0) * (inv - inv1);
}

const OrganicShift* shift_table(const AcidBaseSystem& def, Basis b, int step) {
    for (const auto& t : def.eluent_shift)
        if (t.organic == basis_id(b) && step < static_cast<int>(t.dpka.front().size()))
            return &t;
    return nullptr;
}

/// The system used in place of one without a table: the same charge type of the acid form
/// (cationic acids like NH4+, neutral acids like acetic acid, anionic acids like H2PO4-).
const AcidBaseSystem* analogue(const Library& lib, int acid_charge, int* step) {
    if (acid_charge >= 1) {
        *step = 0;
        return lib.find_system("ammonium");
    }
    if (acid_charge == 0) {
        *step = 0;
        return lib.find_system("acetate");
    }
    *step = 1;
    return lib.find_system("phosphate");
}

} // namespace

struct EluentModel::Prepared {
    std::vector<std::pair<const Solvent*, double>> fractions;
    double water_v = 0, organic_v = 0;
    std::array<double, n_basis> share{}; ///< of the organic, by basis
    bool other_organic = false;          ///< an organic without published parameters
    std::vector<std::string> other_ids;
    double contraction = 0;
    double eps = 78.4;
    double rho = 1;
    double dpkw = 0, delta = 0;
    bool beyond = false;
    std::vector<RowPair> rows; ///< per EluentModel::table_rows_ at this point's organic fraction
    std::vector<double> amounts;
    std::vector<std::array<double, detail::max_steps>> pka_ss;
    std::vector<std::array<bool, detail::max_steps>> estimated;
};

EluentModel::EluentModel(const SolventLibrary& solvents, const Library& reagents,
                         const std::vector<const LineProfile*>& profiles, double temperature_c,
                         ActivityModel model)
    : solvents_(solvents), reagents_(reagents), profiles_(profiles), temperature_c_(temperature_c),
      model_(model) {
    if (!std::isfinite(temperature_c) || temperature_c < min_temperature_c ||
        temperature_c > max_temperature_c)
        throw Error("temperature_c", format_number(temperature_c) + " °C is outside " +
                                         format_number(min_temperature_c) + " to " +
                                         format_number(max_temperature_c) + " °C");
    temperature_k_ = to_kelvin(temperature_c);
    for (const LineProfile* p : profiles_) {
        if (!p || !p->described)
            continue;
        for (const Solute& s : p->solutes) {
            const Reagent* r = &reagents.reagent(s.reagent, "composition");
            if (std::none_of(components_.begin(), components_.end(),
                             [&](const Component& c) { return c.reagent == r; }))
                components_.push_back({r, 1e-6});
        }
    }
    line_mol_per_l_.assign(profiles_.size(), std::vector<double>(components_.size(), 0.0));
    for (size_t l = 0; l < profiles_.size(); ++l) {
        const LineProfile* p = profiles_[l];
        if (!p || !p->described)
            continue;
        for (const Solute& s : p->solutes)
            for (size_t k = 0; k < components_.size(); ++k)
                if (components_[k].reagent->id == s.reagent)
                    line_mol_per_l_[l][k] += s.mmol_per_l / 1000.0;
    }
    for (int b = 0; b < n_basis; ++b) {
        basis_data_[b] = reagents.eluent_solvent(basis_id(static_cast<Basis>(b)));
        if (basis_data_[b])
            dpkw_ends_[b] = shift_ends(basis_data_[b]->fraction_v, *basis_data_[b]);
        if (basis_data_[b] && !basis_data_[b]->fraction_v.empty())
            dpkw_rows_[b] = rows_of(basis_data_[b]->fraction_v, b);
    }
    line_solvents_.resize(profiles_.size());
    for (size_t l = 0; l < profiles_.size(); ++l) {
        const LineProfile* p = profiles_[l];
        if (!p || !p->described)
            continue;
        for (const auto& [id, frac] : p->solvent_fraction_v) {
            LineSolvent ls;
            ls.solvent = &solvents.solvent(id, "composition");
            ls.fraction_v = frac;
            ls.basis = static_cast<int>(basis_of(id, &ls.estimated));
            ls.density_g_per_ml = ls.solvent->density_at(temperature_c);
            const EluentSolvent* es = basis_data_[ls.basis];
            ls.permittivity = ls.solvent->aqueous || !es
                                  ? water_permittivity(to_kelvin(temperature_c))
                                  : es->permittivity_25c;
            line_solvents_[l].push_back(ls);
            if (!ls.solvent->aqueous &&
                std::none_of(organic_excess_.begin(), organic_excess_.end(),
                             [&](const OrganicExcess& o) { return o.solvent == ls.solvent; }))
                organic_excess_.push_back(
                    {ls.solvent, solvents.excess_volume("water", ls.solvent->id),
                     ls.solvent->density_g_per_ml / ls.solvent->molar_mass_g_per_mol});
        }
    }
    if (const Solvent* w = solvents.find_solvent("water"))
        water_mol_per_ml_ = w->density_g_per_ml / w->molar_mass_g_per_mol;
    has_components_ = !components_.empty();
    if (has_components_) {
        problem_ = detail::build_problem(reagents, components_, temperature_c, model);
        for (const auto& s : problem_.systems) {
            system_defs_.push_back(s.def);
            std::vector<double> w;
            for (int j = 0; j < s.steps; ++j)
                w.push_back(s.def->pka_at(j, temperature_k_));
            pka_w_w_.push_back(w);
            // Each step's table in each organic: its own, or that of a system whose acid form
            // has the same charge (estimated).
            step_offset_.push_back(static_cast<int>(step_shifts_.size()) / n_basis);
            for (int j = 0; j < s.steps; ++j)
                for (int b = 0; b < n_basis; ++b) {
                    StepShift sh;
                    const AcidBaseSystem* use = s.def;
                    int use_step = j;
                    const OrganicShift* t = shift_table(*s.def, static_cast<Basis>(b), j);
                    if (!t) {
                        sh.estimated = true;
                        use = analogue(reagents, s.def->charge_of(j), &use_step);
                        t = use ? shift_table(*use, static_cast<Basis>(b), use_step) : nullptr;
                    }
                    if (t) {
                        sh.fraction_v = &t->fraction_v;
                        for (const auto& row : t->dpka)
                            sh.dpka.push_back(row[use_step]);
                        if (basis_data_[b]) {
                            sh.ends = shift_ends(t->fraction_v, *basis_data_[b]);
                            if (!t->fraction_v.empty())
                                sh.rows = rows_of(t->fraction_v, b);
                        }
                    }
                    step_shifts_.push_back(std::move(sh));
                }
        }
        scratch_ = problem_;
    }
    prepared_ = std::make_unique<Prepared>();
}

EluentModel::~EluentModel() = default;

int EluentModel::rows_of(const std::vector<double>& fraction_v, int basis) {
    for (size_t k = 0; k < table_rows_.size(); ++k)
        if (table_rows_[k].basis == basis && *table_rows_[k].fraction_v == fraction_v)
            return static_cast<int>(k);
    table_rows_.push_back({&fraction_v, basis});
    return static_cast<int>(table_rows_.size()) - 1;
}

double EluentModel::organic_fraction_v(const double* percent, std::size_t count) const {
    double o = 0;
    for (size_t l = 0; l < profiles_.size() && l < count; ++l)
        if (profiles_[l] && profiles_[l]->described)
            o += percent[l] / 100.0 * profiles_[l]->organic_fraction_v;
    return o;
}

double
EluentModel::contraction_of(const std::vector<std::pair<const Solvent*, double>>& fractions) const {
    // contraction_fraction (chem/eluent_mix) with the lookups done once: each organic with its
    // share of the water, ΔV = −(n_w + n_o) V^E(x_o) (mixing_contraction_ml).
    double water = 0, organic = 0;
    for (const auto& f : fractions)
        (f.first->aqueous ? water : organic) += f.second;
    if (organic <= 0 || water <= 0 || water_mol_per_ml_ <= 0)
        return 0;
    double c = 0;
    for (const auto& f : fractions) {
        if (f.first->aqueous || f.second <= 0)
            continue;
        for (const OrganicExcess& o : organic_excess_)
            if (o.solvent == f.first && o.excess)
                c += o.excess->contraction_ml(water * f.second / organic * water_mol_per_ml_,
                                              f.second * o.mol_per_ml);
    }
    return c;
}

void EluentModel::prepare(const double* percent, std::size_t count, Prepared& out) const {
    // Blend the solvents (fractions of the unmixed volume).
    auto& fractions = out.fractions;
    fractions.clear();
    out.water_v = out.organic_v = 0;
    out.share = {};
    out.other_organic = false;
    out.other_ids.clear();
    double eps_sum = 0, mass = 0, volume = 0;
    for (size_t l = 0; l < line_solvents_.size() && l < count; ++l) {
        if (percent[l] <= 0)
            continue;
        const double f = percent[l] / 100.0;
        for (const LineSolvent& ls : line_solvents_[l]) {
            const double v = f * ls.fraction_v;
            auto it = std::find_if(fractions.begin(), fractions.end(),
                                   [&](const auto& x) { return x.first == ls.solvent; });
            if (it == fractions.end())
                fractions.emplace_back(ls.solvent, v);
            else
                it->second += v;
            volume += v;
            mass += v * ls.density_g_per_ml;
            eps_sum += v * ls.permittivity;
            if (ls.solvent->aqueous) {
                out.water_v += v;
                continue;
            }
            out.organic_v += v;
            out.share[ls.basis] += v;
            if (ls.estimated && std::find(out.other_ids.begin(), out.other_ids.end(),
                                          ls.solvent->id) == out.other_ids.end()) {
                out.other_organic = true;
                out.other_ids.push_back(ls.solvent->id);
            }
        }
    }
    out.contraction = contraction_of(fractions);
    if (out.organic_v > 0)
        for (double& s : out.share)
            s /= out.organic_v;
    out.eps = volume > 0 ? eps_sum / volume : water_permittivity(temperature_k_);
    out.rho = volume > 0 ? mass / (volume * (1 - out.contraction)) : 1.0;

    // The solutes in the mixed volume.
    const double mixed = 1 - out.contraction;
    out.amounts.assign(components_.size(), 0.0);
    for (size_t l = 0; l < profiles_.size() && l < count; ++l)
        if (percent[l] > 0)
            for (size_t k = 0; k < components_.size(); ++k)
                out.amounts[k] += percent[l] / 100.0 * line_mol_per_l_[l][k] / mixed;

    // pKw, δ and each pKa, the shifts of the two organics weighted by their share.
    const double phi = out.organic_v;
    out.beyond = false;
    out.dpkw = out.delta = 0;
    // Each set of table rows searched once at phi (only an organic present reads its tables).
    out.rows.resize(table_rows_.size());
    if (phi > 0)
        for (size_t k = 0; k < table_rows_.size(); ++k)
            if (out.share[table_rows_[k].basis] > 0)
                out.rows[k] =
                    row_pair(*table_rows_[k].fraction_v, phi, *basis_data_[table_rows_[k].basis]);
    for (int bi = 0; bi < n_basis; ++bi) {
        const EluentSolvent* es = basis_data_[bi];
        if (out.share[bi] <= 0 || !es)
            continue;
        out.dpkw +=
            out.share[bi] *
            (dpkw_rows_[bi] >= 0 && phi > 0
                 ? table_at(es->fraction_v, es->dpkw, phi, out.rows[dpkw_rows_[bi]], dpkw_ends_[bi],
                            &out.beyond)
                 : table_at(es->fraction_v, es->dpkw, phi, *es, dpkw_ends_[bi], &out.beyond));
        out.delta += out.share[bi] * es->delta(phi);
        if (phi > es->delta_max_fraction_v)
            out.beyond = true;
    }
    out.pka_ss.resize(system_defs_.size());
    out.estimated.resize(system_defs_.size());
    for (size_t i = 0; i < system_defs_.size(); ++i)
        for (int j = 0; j < system_defs_[i]->steps(); ++j) {
            double d = 0;
            bool estimated = false;
            for (int bi = 0; bi < n_basis; ++bi) {
                if (out.share[bi] <= 0 || phi <= 0 || !basis_data_[bi])
                    continue;
                const StepShift& sh = step_shifts_[(step_offset_[i] + j) * n_basis + bi];
                estimated = estimated || sh.estimated;
                if (sh.rows >= 0)
                    d += out.share[bi] * table_at(*sh.fraction_v, sh.dpka, phi, out.rows[sh.rows],
                                                  sh.ends, &out.beyond);
                else if (sh.fraction_v)
                    d += out.share[bi] * table_at(*sh.fraction_v, sh.dpka, phi, *basis_data_[bi],
                                                  sh.ends, &out.beyond);
            }
            out.pka_ss[i][j] = pka_w_w_[i][j] + d;
            out.estimated[i][j] = estimated;
        }
}

namespace {

/// The solver's problem at one point: the s_s constants, the mixture's Debye–Hückel A and the
/// solvent's density for molalities.
void eluent_problem(detail::Problem& p, const std::vector<double>& amounts,
                    const std::vector<std::array<double, detail::max_steps>>& pka_ss, double pkw_ss,
                    double eps, double rho, double temperature_k) {
    p.set_amounts(amounts);
    for (size_t i = 0; i < p.systems.size(); ++i)
        for (int j = 0; j < p.systems[i].steps; ++j)
            p.systems[i].ka[j] = std::exp(-ln10 * pka_ss[i][j]);
    p.kw = std::exp(-ln10 * pkw_ss);
    p.a_dh = debye_huckel_a_for(eps, temperature_k);
    p.a_molal = p.a_dh * std::sqrt(rho);
    p.b_molal = debye_huckel_b_for(eps, temperature_k) * std::sqrt(rho);
    p.kg_per_l = rho;
}

/// Nearest s_s pKa′ (conditional, at the solved ionic strength) to the solved pH; each step's
/// pKa′ into `conditional` when given (flat by system and step, NaN for a system absent here).
void nearest_pka(const detail::Problem& p, const detail::State& st,
                 const std::vector<std::array<double, detail::max_steps>>& pka_ss, EluentPoint& out,
                 double* conditional = nullptr) {
    out.nearest_pka_gap = std::numeric_limits<double>::infinity();
    out.nearest_system = -1;
    // Davies: log10 γ(z) = z² log10 γ(1), so pKa′ = pKa − log10 γ(1) · (z_j² − z_{j+1}²) needs no
    // per-species γ; SIT and Truesdell–Jones take them from the solved state.
    const bool davies = p.model == ActivityModel::davies;
    const double log10_g1 =
        davies ? davies_log10_gamma(p.a_dh, 1, st.ionic_strength_mol_per_l) : 0.0;
    const std::vector<double> g = davies ? std::vector<double>{} : detail::gammas_at(p, st);
    double* next = conditional;
    for (size_t i = 0; i < p.systems.size(); ++i) {
        if (p.systems[i].total_mol_per_l <= 0) {
            if (next)
                next =
                    std::fill_n(next, p.systems[i].steps, std::numeric_limits<double>::quiet_NaN());
            continue;
        }
        const int o = p.sys_offset[i];
        for (int j = 0; j < p.systems[i].steps; ++j) {
            const int za = p.flat_charge[o + j], zb = p.flat_charge[o + j + 1];
            const double cond =
                davies ? pka_ss[i][j] - log10_g1 * (za * za - zb * zb)
                       : pka_ss[i][j] - std::log10(g[o + j]) + std::log10(g[o + j + 1]);
            if (next)
                *next++ = cond;
            if (std::abs(st.ph - cond) < out.nearest_pka_gap) {
                out.nearest_pka_gap = std::abs(st.ph - cond);
                out.nearest_pka = cond;
                out.nearest_system = static_cast<int>(i);
            }
        }
    }
}

} // namespace

EluentPoint EluentModel::point(const std::vector<double>& percent, const EluentPoint* guess) const {
    return point(percent.data(), percent.size(), guess);
}

EluentPoint EluentModel::point(const double* percent, std::size_t count,
                               const EluentPoint* guess) const {
    return point(percent, count, guess, nullptr);
}

EluentPoint EluentModel::point(const double* percent, std::size_t count, const EluentPoint* guess,
                               double* pka_conditional) const {
    Prepared& pr = *prepared_;
    prepare(percent, count, pr);
    EluentPoint out;
    out.organic_fraction_v = pr.organic_v;
    const double pkw_ss = pkw(temperature_k_) + pr.dpkw;
    if (!has_components_) {
        out.ph_s_s = pkw_ss / 2;
        out.nearest_pka_gap = std::numeric_limits<double>::infinity();
    } else {
        detail::Problem& p = scratch_;
        eluent_problem(p, pr.amounts, pr.pka_ss, pkw_ss, pr.eps, pr.rho, temperature_k_);
        detail::State g0;
        if (guess) {
            g0.ph = guess->ph_s_s;
            g0.ionic_strength_mol_per_l = guess->ionic_strength_mol_per_l;
        }
        const detail::State st = guess ? detail::solve_state_near(p, g0) : detail::solve_state(p);
        out.ph_s_s = st.ph;
        out.ionic_strength_mol_per_l = st.ionic_strength_mol_per_l;
        nearest_pka(p, st, pr.pka_ss, out, pka_conditional);
    }
    out.ph_s_w = out.ph_s_s + pr.delta;
    out.extrapolated = pr.beyond || pr.other_organic || (pr.share[0] > 0 && pr.share[1] > 0) ||
                       estimate_matters(pr, out.ph_s_s);
    return out;
}

EluentPoint EluentModel::point_species(const double* percent, std::size_t count,
                                       std::vector<std::vector<double>>& fractions,
                                       const EluentPoint* guess) const {
    std::vector<double> conditional(step_count());
    const EluentPoint out = point(percent, count, guess, conditional.data());
    species_fractions(out, conditional.data(), fractions);
    return out;
}

int EluentModel::step_count() const {
    return static_cast<int>(step_shifts_.size()) / n_basis;
}

void EluentModel::species_fractions(const EluentPoint& point, const double* pka_conditional,
                                    std::vector<std::vector<double>>& fractions) const {
    fractions.resize(system_defs_.size());
    for (auto& f : fractions)
        f.clear();
    if (!has_components_)
        return;
    for (size_t i = 0; i < system_defs_.size(); ++i) {
        const int steps = system_defs_[i]->steps();
        const double* cond = pka_conditional + step_offset_[i];
        if (steps <= 0 || std::isnan(cond[0]))
            continue; // the system is absent at this composition
        std::vector<double>& f = fractions[i];
        f.assign(steps + 1, 0.0);
        // log10 of species k against the acid: Σ_{j<k} (pH − pKa′_j), normalised below.
        for (int j = 0; j < steps; ++j)
            f[j + 1] = f[j] + point.ph_s_s - cond[j];
        const double top = *std::max_element(f.begin(), f.end());
        double sum = 0;
        for (double& x : f) {
            x = std::pow(10.0, x - top);
            sum += x;
        }
        for (double& x : f)
            x /= sum;
    }
}

bool EluentModel::estimate_matters(const Prepared& pr, double ph_s_s) const {
    // A borrowed shift matters only for a step near enough to the pH to take part.
    for (size_t i = 0; i < system_defs_.size(); ++i)
        for (int j = 0; j < system_defs_[i]->steps(); ++j)
            if (pr.estimated[i][j] && std::abs(pr.pka_ss[i][j] - ph_s_s) < relevant_pka_gap)
                return true;
    return false;
}

EluentResult EluentModel::solve(const std::vector<double>& percent) const {
    std::vector<LineShare> shares;
    for (size_t l = 0; l < profiles_.size() && l < percent.size(); ++l)
        shares.push_back({profiles_[l], percent[l]});
    if (percent.size() > profiles_.size())
        for (size_t l = profiles_.size(); l < percent.size(); ++l)
            if (percent[l] > 0)
                throw Error("composition", "a line without a profile is above 0 %");
    EluentResult out;
    out.mix = mix_lines(solvents_, shares); // validates the percentages
    out.temperature_c = temperature_c_;
    out.activity_model = model_;
    Prepared pr;
    prepare(percent.data(), percent.size(), pr);
    out.organic_fraction_v = pr.organic_v;
    out.permittivity = pr.eps;
    out.solvent_density_g_per_ml = pr.rho;
    out.delta = pr.delta;
    const double pkw_ss = pkw(temperature_k_) + pr.dpkw;

    if (!has_components_) {
        out.ph_s_s = pkw_ss / 2;
        const double c = std::pow(10.0, -out.ph_s_s);
        out.ionic_strength_mol_per_l = c;
        out.buffer_capacity_mol_per_l = ln10 * 2 * c;
        if (pr.water_v > 0)
            out.ph_w_w = pkw(temperature_k_) / 2;
    } else {
        detail::Problem& p = scratch_;
        eluent_problem(p, pr.amounts, pr.pka_ss, pkw_ss, pr.eps, pr.rho, temperature_k_);
        const detail::State st = detail::solve_state(p, nullptr);
        const Speciation sp = detail::report(p, st);
        out.ph_s_s = st.ph;
        out.ionic_strength_mol_per_l = st.ionic_strength_mol_per_l;
        out.buffer_capacity_mol_per_l = sp.buffer_capacity_mol_per_l;
        for (const auto& w : sp.warnings)
            out.warnings.push_back(w);
        const std::vector<double> g = detail::gammas_at(p, st);
        for (size_t i = 0; i < p.systems.size(); ++i)
            for (int j = 0; j < p.systems[i].steps; ++j) {
                const int o = p.sys_offset[i];
                EluentPka k;
                k.system = system_defs_[i]->id;
                k.step = j + 1;
                k.w_w = pka_w_w_[i][j];
                k.s_s = pr.pka_ss[i][j];
                k.s_s_conditional = k.s_s - std::log10(g[o + j]) + std::log10(g[o + j + 1]);
                k.estimated = pr.estimated[i][j] && pr.organic_v > 0;
                out.pka.push_back(k);
            }
        // The aqueous part alone: the solutes in the water they came with.
        if (pr.water_v > 0) {
            std::vector<Component> aq;
            for (size_t k = 0; k < components_.size(); ++k)
                if (pr.amounts[k] > 0)
                    aq.push_back({components_[k].reagent,
                                  std::min(max_concentration_mol_per_l,
                                           pr.amounts[k] * (1 - pr.contraction) / pr.water_v)});
            if (aq.empty())
                out.ph_w_w = pkw(temperature_k_) / 2;
            else
                out.ph_w_w = chem::solve(reagents_, aq, temperature_c_, model_).ph;
        }
    }
    out.ph_s_w = out.ph_s_s + pr.delta;

    // How the estimate was made, when it is one: the data of eluent-ph-extrapolated (worded by
    // chem::describe).
    Finding est;
    est.kind = FindingKind::eluent_ph_extrapolated;
    est.severity = Severity::caution;
    est.number("organic_fraction_v", pr.organic_v);
    bool estimate = false;
    if (pr.share[0] > 0 && pr.share[1] > 0) {
        est.detail("mixed_organics", 1);
        estimate = true;
    }
    for (const auto& id : pr.other_ids) {
        bool est_basis = false;
        est.detail_text("other_organic", id);
        est.detail_text("other_organic_basis", basis_id(basis_of(id, &est_basis)));
        estimate = true;
    }
    if (pr.beyond) {
        est.detail("beyond_published_range", 1);
        estimate = true;
    }
    for (size_t i = 0; i < system_defs_.size() && pr.organic_v > 0; ++i)
        for (int j = 0; j < system_defs_[i]->steps(); ++j)
            if (pr.estimated[i][j] && std::abs(pr.pka_ss[i][j] - out.ph_s_s) < relevant_pka_gap) {
                int st = 0;
                const AcidBaseSystem* a = analogue(reagents_, system_defs_[i]->charge_of(j), &st);
                est.detail_text("estimated_system", system_defs_[i]->id);
                est.detail("estimated_step", j + 1);
                est.detail_text("analogue_system", a ? a->id : std::string());
                est.detail("analogue_step", st + 1);
                estimate = true;
            }
    if (estimate)
        out.warnings.push_back(warning_of(std::move(est)));
    if (pr.organic_v > 0 && std::abs(temperature_c_ - 25) > 5) {
        Finding f;
        f.kind = FindingKind::eluent_temperature;
        f.severity = Severity::info;
        f.number("temperature_c", temperature_c_);
        out.warnings.push_back(warning_of(std::move(f)));
    }
    return out;
}

EluentResult solve_eluent(const SolventLibrary& solvents, const Library& reagents,
                          const std::vector<const LineProfile*>& profiles,
                          const std::vector<double>& percent, double temperature_c,
                          ActivityModel model) {
    return EluentModel(solvents, reagents, profiles, temperature_c, model).solve(percent);
}

} // namespace chem
