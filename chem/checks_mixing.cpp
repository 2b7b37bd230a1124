// The checks of lines that meet in the mixer: immiscible lines and salt precipitating as organic
// rises.
#include "chem/checks.h"
#include "chem/checks_common.h"

#include "chem/error.h"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <deque>
#include <limits>
#include <map>
#include <memory>
#include <set>

namespace chem {

using namespace checks_internal;

namespace {

/// Miscibility of two lines from their solvents (buffers count as water): the worst pair.
struct Contact {
    Miscibility worst = Miscibility::miscible;
    std::string a, b; ///< the solvents of the worst pair
};
Contact worst_pair(const SolventLibrary& lib, const LineProfile& x, const LineProfile& y) {
    Contact c;
    for (const auto& [sa, fa] : x.solvent_fraction_v)
        for (const auto& [sb, fb] : y.solvent_fraction_v) {
            const auto m = lib.miscibility(sa, sb);
            if (m && static_cast<int>(*m) > static_cast<int>(c.worst)) {
                c.worst = *m;
                c.a = sa;
                c.b = sb;
            }
        }
    return c;
}

void immiscible_within(const SequenceCheckInput& ci, const LineProfile& p, int line,
                       std::vector<Finding>& out) {
    const SolventLibrary& lib = *ci.solvents;
    Contact c;
    for (auto i = p.solvent_fraction_v.begin(); i != p.solvent_fraction_v.end(); ++i)
        for (auto j = std::next(i); j != p.solvent_fraction_v.end(); ++j) {
            const auto m = lib.miscibility(i->first, j->first);
            if (m && static_cast<int>(*m) > static_cast<int>(c.worst))
                c = {*m, i->first, j->first};
        }
    if (c.worst == Miscibility::miscible)
        return;
    const bool imm = c.worst == Miscibility::immiscible;
    Finding w = make(FindingKind::immiscible_in_line, imm ? Sev::warning : Sev::caution,
                     Subject::of_line(line));
    w.text("solvent_a", c.a);
    w.text("solvent_b", c.b);
    w.text("miscibility", miscibility_name(c.worst));
    w.number("fraction_a_v", p.solvent_fraction_v.at(c.a));
    w.number("fraction_b_v", p.solvent_fraction_v.at(c.b));
    out.push_back(w);
}

std::map<std::string, double> group_mmol(const SolventLibrary& lib, const LineProfile& p) {
    std::map<std::string, double> g;
    for (const Solute& s : p.solutes)
        if (const Additive* a = lib.find_additive(s.reagent))
            if (!a->solubility_group.empty())
                g[a->solubility_group] += s.mmol_per_l;
    return g;
}

struct WorstLoad {
    SaltLoad load;
    std::string where; ///< "in method assay at 18.89 min" (the contract's "where" field)
    Subject place;     ///< the same, typed: a method, the standby, or a line's bottle
    double t_min = 0;
    bool found = false;
};

void precipitation_warning(const WorstLoad& w, std::vector<Finding>& out) {
    const double r = w.load.ratio();
    if (r <= 0.8)
        return;
    const bool over = r > 1.0;
    // In a bottle the finding is about its line; in the mixer about the method (or standby).
    Finding cw = make(FindingKind::precipitation, over ? Sev::warning : Sev::caution, w.place);
    cw.where = w.place;
    cw.text("group", w.load.group);
    cw.text("organic", w.load.organic);
    cw.text("where", w.where);
    cw.text("basis", w.load.basis);
    cw.text("source", w.load.source);
    cw.number("mmol_per_l", w.load.mmol_per_l);
    cw.number("limit_mmol_per_l", w.load.limit_mmol_per_l);
    cw.number("organic_fraction_v", w.load.organic_fraction_v);
    if (w.place.kind == Subject::Kind::method)
        cw.number("t_min", w.t_min);
    if (!w.load.form.empty()) {
        // The form that limits: its share of the group at the eluent's pH (or the whole group,
        // counted as the least soluble form, when the pH is not known).
        cw.text("form", w.load.form);
        cw.text("system", w.load.system);
        cw.number("form_mmol_per_l", w.load.form_mmol_per_l);
        cw.number("form_limit_mmol_per_l", w.load.form_limit_mmol_per_l);
        if (w.load.speciated)
            cw.number("ph_s_s", w.load.ph_s_s);
        cw.detail("speciated", w.load.speciated ? 1 : 0);
    }
    out.push_back(cw);
}

void consider(WorstLoad& worst, const SaltLoad& l, const std::string& where, const Subject& place,
              double t) {
    if (!worst.found || l.ratio() > worst.load.ratio()) {
        worst.load = l;
        worst.where = where;
        worst.place = place;
        worst.t_min = t;
        worst.found = true;
    }
}

/// The tables to use among `all` (one per organic) for the organics present: each present
/// organic's own; if one present organic has none, or none is present (water alone, where the
/// tables meet at the salt's water solubility), every table (the most restrictive wins:
/// conservative).
template <class Find>
std::vector<const SolubilityTable*> tables_for(const std::map<std::string, double>& organic,
                                               const std::vector<const SolubilityTable*>& all,
                                               Find&& find) {
    std::vector<const SolubilityTable*> use;
    for (const auto& [s, f] : organic) {
        if (f <= 0)
            continue;
        if (const SolubilityTable* t = find(s))
            use.push_back(t);
        else
            return all;
    }
    return use.empty() ? all : use;
}

/// The lowest limit among `use` at the organic fraction, with its table; none if no table covers
/// the fraction.
std::pair<const SolubilityTable*, double>
lowest_limit(const std::vector<const SolubilityTable*>& use, double organic_fraction_v) {
    const SolubilityTable* best = nullptr;
    double limit = 0;
    for (const SolubilityTable* t : use) {
        const auto lim = t->limit_mmol_per_l(organic_fraction_v);
        if (lim && (!best || *lim < limit)) {
            best = t;
            limit = *lim;
        }
    }
    return {best, limit};
}

/// A group with form tables at one point (see SaltLoad). False when no form table covers the
/// organic fraction.
bool form_load(const SolventLibrary& lib, const std::string& g, double c,
               const std::map<std::string, double>& organic, double organic_total,
               const SpeciesShares* sp, SaltLoad& out) {
    const auto all = lib.solubility_form_tables(g);
    struct Form {
        const SolubilityTable* table = nullptr; ///< the table that gave the limit
        double limit = 0;                       ///< mmol/L at organic_total
    };
    std::map<int, Form> forms; // protons removed → the form's lowest limit
    std::set<std::string> seen;
    for (const SolubilityTable* t : all) {
        if (!seen.insert(t->form).second)
            continue;
        std::vector<const SolubilityTable*> of_form;
        for (const SolubilityTable* u : all)
            if (u->form == t->form)
                of_form.push_back(u);
        const auto use = tables_for(organic, of_form, [&](const std::string& s) {
            return lib.solubility_form(g, s, t->form);
        });
        const auto [table, limit] = lowest_limit(use, organic_total);
        if (table)
            forms[t->protons_removed] = {table, limit};
    }
    if (forms.empty())
        return false;
    const std::string& system = all.front()->system;
    // The lowest limit of any form: for species without a table, and without a speciation.
    const Form* lowest = nullptr;
    for (const auto& [k, f] : forms)
        if (!lowest || f.limit < lowest->limit)
            lowest = &f;
    auto term = [](double cf, double limit) {
        if (cf <= 0)
            return 0.0;
        return limit > 0 ? cf / limit : std::numeric_limits<double>::infinity();
    };
    double r = 0, worst_term = -1;
    const Form* worst = lowest;
    double worst_c = c;
    const std::vector<double>* alpha = nullptr;
    if (sp) {
        const auto it = sp->fractions.find(system);
        if (it != sp->fractions.end())
            alpha = &it->second;
    }
    if (alpha) {
        for (std::size_t k = 1; k < alpha->size(); ++k) {
            const double cf = c * (*alpha)[k];
            const auto f = forms.find(static_cast<int>(k));
            const Form& form = f != forms.end() ? f->second : *lowest;
            const double x = term(cf, form.limit);
            r += x;
            if (x > worst_term) {
                worst_term = x;
                worst = &form;
                worst_c = cf;
            }
        }
    } else {
        r = term(c, lowest->limit);
    }
    out.group = g;
    out.mmol_per_l = c;
    out.limit_mmol_per_l = r > 0 ? c / r : std::numeric_limits<double>::infinity();
    out.organic_fraction_v = organic_total;
    out.organic = worst->table->organic;
    out.basis = worst->table->basis;
    out.source = worst->table->source;
    out.form = worst->table->form;
    out.system = system;
    out.form_mmol_per_l = worst_c;
    out.form_limit_mmol_per_l = worst->limit;
    out.speciated = alpha != nullptr;
    out.ph_s_s = alpha ? sp->ph_s_s : 0;
    return true;
}

/// The eluent's speciation at pump compositions, each solved once (chem::EluentPoints at one
/// temperature: the check run's shared one when it is at that temperature, so the traces' solves
/// serve here too, else its own, made at the first point asked). None without a reagent library,
/// without form tables among the groups present, or where the eluent cannot be solved: the check
/// then counts conservatively (SaltLoad).
class SpeciesSource {
  public:
    SpeciesSource(const SequenceCheckInput& c, double temperature_c) : c_(c) {
        if (!c.reagents)
            return;
        bool forms = false;
        for (int l = 0; l < max_lines; ++l) {
            const LineProfile* p = c.profiles[l];
            if (!p || !p->described)
                continue;
            for (const auto& [g, mm] : group_mmol(*c.solvents, *p))
                if (!c.solvents->solubility_form_tables(g).empty())
                    forms = forms_line_[l] = true;
        }
        if (!forms)
            return;
        active_ = true;
        if (c.eluent_points && c.eluent_points->temperature_c() == temperature_c)
            points_ = c.eluent_points;
        temperature_c_ = temperature_c;
    }

    bool active() const { return active_; }

    const SpeciesShares* at(const LineValues& p) {
        if (!active_)
            return nullptr;
        // Only the groups with form tables read the speciation.
        bool forms = false;
        for (int l = 0; l < max_lines; ++l)
            forms = forms || (p[l] > 0 && forms_line_[l]);
        if (!forms)
            return nullptr;
        // No cache of its own: check_precipitation asks once per composition (its loads_at).
        if (!points_) {
            SequenceCheckInput at_t = c_;
            if (!at_t.column)
                at_t.column.emplace();
            at_t.column->temperature_c = temperature_c_;
            own_ = std::make_unique<EluentPoints>(at_t, EluentPoints::BorrowProfiles{});
            points_ = own_.get();
        }
        if (!points_->model())
            return nullptr;
        try {
            // The pH solve of the eluent trace (EluentModel::point), with the species; from the
            // last point solved when new (the check walks the gradient).
            const EluentPoint& pt = points_->species(p, fractions_);
            // The same systems at every point: each entry is overwritten or erased, so the map's
            // nodes and vectors are reused from the last point.
            current_.ph_s_s = pt.ph_s_s;
            const auto& systems = points_->model()->systems();
            for (std::size_t i = 0; i < systems.size(); ++i) {
                if (i < fractions_.size() && !fractions_[i].empty())
                    current_.fractions[systems[i]->id] = fractions_[i];
                else
                    current_.fractions.erase(systems[i]->id);
            }
        } catch (const Error&) {
            // An eluent that cannot be solved: no speciation here (conservative count).
            return nullptr;
        }
        return &current_;
    }

  private:
    const SequenceCheckInput& c_;
    bool active_ = false;
    std::array<bool, max_lines> forms_line_{}; ///< the line carries a group with form tables
    double temperature_c_ = 25;
    EluentPoints* points_ = nullptr;             ///< the shared points, or own_
    std::unique_ptr<EluentPoints> own_;          ///< made at the first point asked when not shared
    std::vector<std::vector<double>> fractions_; ///< scratch of EluentPoints::species
    SpeciesShares current_; ///< the last point's speciation, valid until the next at()
};

} // namespace

SpeciesShares species_shares_of(const EluentResult& eluent) {
    SpeciesShares sp;
    sp.ph_s_s = eluent.ph_s_s;
    std::map<std::string, std::vector<double>> pka;
    for (const EluentPka& p : eluent.pka) {
        auto& v = pka[p.system];
        if (static_cast<int>(v.size()) < p.step)
            v.resize(p.step, 0);
        v[p.step - 1] = p.s_s_conditional;
    }
    for (const auto& [system, steps] : pka) {
        // log10 of species k relative to the acid: k·pH − Σ_{i≤k} pKa′_i, normalised.
        std::vector<double> lg(steps.size() + 1, 0);
        for (std::size_t k = 1; k <= steps.size(); ++k)
            lg[k] = lg[k - 1] + eluent.ph_s_s - steps[k - 1];
        const double top = *std::max_element(lg.begin(), lg.end());
        double sum = 0;
        for (double& x : lg) {
            x = std::pow(10.0, x - top);
            sum += x;
        }
        for (double& x : lg)
            x /= sum;
        sp.fractions[system] = std::move(lg);
    }
    return sp;
}

double SaltLoad::ratio() const {
    if (limit_mmol_per_l <= 0)
        return mmol_per_l > 0 ? std::numeric_limits<double>::infinity() : 0;
    return mmol_per_l / limit_mmol_per_l;
}

std::vector<SaltLoad> salt_loads(const SolventLibrary& lib,
                                 const std::array<const LineProfile*, max_lines>& profiles,
                                 const LineValues& percent, const SpeciesShares* speciation) {
    std::map<std::string, double> groups;
    std::map<std::string, double> organic; // solvent id → volume fraction of the mixture
    double organic_total = 0;
    for (int l = 0; l < max_lines; ++l) {
        const LineProfile* p = profiles[l];
        if (!p || !p->described || percent[l] <= 0)
            continue;
        const double share = percent[l] / 100.0;
        for (const auto& [g, c] : group_mmol(lib, *p))
            groups[g] += share * c;
        for (const auto& [s, f] : p->solvent_fraction_v) {
            const Solvent* sv = lib.find_solvent(s);
            if (sv && sv->aqueous)
                continue;
            organic[s] += share * f;
            organic_total += share * f;
        }
    }
    std::vector<SaltLoad> out;
    for (const auto& [g, c] : groups) {
        if (c <= 0)
            continue;
        if (!lib.solubility_form_tables(g).empty()) {
            // Form tables start in water (0 % organic), so a bottle without organic is checked
            // too.
            SaltLoad l;
            if (form_load(lib, g, c, organic, organic_total, speciation, l))
                out.push_back(l);
            continue;
        }
        std::vector<const SolubilityTable*> tables;
        for (const SolubilityTable* t : lib.solubility_tables(g))
            if (t->form.empty())
                tables.push_back(t);
        if (tables.empty())
            continue;
        const std::string& group = g; // a structured binding is not captured before C++20
        const auto use = tables_for(organic, tables,
                                    [&](const std::string& s) { return lib.solubility(group, s); });
        SaltLoad best;
        bool have = false;
        for (const SolubilityTable* t : use) {
            const auto lim = t->limit_mmol_per_l(organic_total);
            if (!lim)
                continue;
            if (!have || *lim < best.limit_mmol_per_l) {
                best.limit_mmol_per_l = *lim;
                best.organic = t->organic;
                best.basis = t->basis;
                best.source = t->source;
                have = true;
            }
        }
        if (!have)
            continue;
        best.group = g;
        best.mmol_per_l = c;
        best.organic_fraction_v = organic_total;
        out.push_back(best);
    }
    return out;
}

std::vector<Finding> check_immiscible(const SequenceCheckInput& c) {
    std::vector<Finding> out;
    const auto used = lines_in_use(*c.input, *c.plan);
    for (int l = 0; l < max_lines; ++l)
        if (used[l] && c.profiles[l] && c.profiles[l]->described)
            immiscible_within(c, *c.profiles[l], l, out);

    struct Meeting {
        bool met = false;
        std::string where;
        Subject place;
        double t_min = 0;
        double pa = 0, pb = 0; ///< percentages at the first meeting (segment midpoint)
    };
    std::map<std::pair<int, int>, Meeting> meetings;
    for (const auto& ns : all_stretches(*c.input, *c.plan)) {
        const Stretch& s = ns.s;
        for (int a = 0; a < max_lines; ++a)
            for (int b = a + 1; b < max_lines; ++b) {
                // Two linear, non-negative percentages are both above 0 inside the stretch exactly
                // when each is above 0 at one of its ends.
                const bool pa = s.percent_start[a] > 0 || s.percent_end[a] > 0;
                const bool pb = s.percent_start[b] > 0 || s.percent_end[b] > 0;
                if (!pa || !pb)
                    continue;
                Meeting& m = meetings[{a, b}];
                if (m.met)
                    continue;
                m.met = true;
                m.where = ns.where;
                m.place = ns.place();
                m.t_min = s.start_min;
                m.pa = 0.5 * (s.percent_start[a] + s.percent_end[a]);
                m.pb = 0.5 * (s.percent_start[b] + s.percent_end[b]);
            }
    }
    for (const auto& [ab, m] : meetings) {
        const auto [a, b] = ab;
        const LineProfile* pa = c.profiles[a];
        const LineProfile* pb = c.profiles[b];
        if (!pa || !pb || !pa->described || !pb->described)
            continue;
        const Contact k = worst_pair(*c.solvents, *pa, *pb);
        if (k.worst == Miscibility::miscible)
            continue;
        const bool imm = k.worst == Miscibility::immiscible;
        Finding w = make(FindingKind::immiscible_lines, imm ? Sev::warning : Sev::caution,
                         Subject::of_lines(a, b));
        w.where = m.place;
        w.text("line_a", letter(a));
        w.text("line_b", letter(b));
        w.text("solvent_a", k.a);
        w.text("solvent_b", k.b);
        w.text("miscibility", miscibility_name(k.worst));
        w.text("where", m.where);
        w.number("t_min", m.t_min);
        w.number("percent_a", m.pa);
        w.number("percent_b", m.pb);
        out.push_back(w);
    }
    return out;
}

// (c) Salt above its solubility limit anywhere the sequence's eluent goes, and in each bottle.
std::vector<Finding> check_precipitation(const SequenceCheckInput& c) {
    std::vector<Finding> out;
    const auto used = lines_in_use(*c.input, *c.plan);
    // The speciation of the form tables: each bottle at 25 °C (as made and stored), the mixed
    // eluent at the column's temperature (as eluent_traces).
    SpeciesSource bottle_species(c, 25.0);
    SpeciesSource eluent_species(c, c.column && c.column->temperature_c ? *c.column->temperature_c
                                                                        : 25.0);
    // The bottles themselves.
    for (int l = 0; l < max_lines; ++l) {
        if (!used[l] || !c.profiles[l] || !c.profiles[l]->described)
            continue;
        std::array<const LineProfile*, max_lines> one{};
        one[l] = c.profiles[l];
        LineValues p{};
        p[l] = 100;
        std::map<std::string, WorstLoad> worst;
        // A lone line (check_line) has only its bottle.
        const std::string where =
            c.lone_line ? std::string("in the bottle") : "in the bottle of line " + letter(l);
        for (const auto& load : salt_loads(*c.solvents, one, p, bottle_species.at(p)))
            consider(worst[load.group], load, where, Subject::of_line(l), 0);
        for (const auto& [g, w] : worst)
            precipitation_warning(w, out);
    }
    // The mixed eluent: per stretch, the ends and the points where the organic fraction crosses a
    // row of a table (concentration and organic fraction are linear in time within a stretch and
    // the limit is piecewise linear in the organic fraction, so the worst ratio of a group table
    // lies on one of them). The speciation of form tables is not linear: with it, every 5 % of
    // organic crossed is a point too (a sample: the species shift slowly with the organic
    // fraction, and every 1 % tripled the check's time in bench_sequence).
    std::set<double> knots;
    for (int l = 0; l < max_lines; ++l) {
        if (!c.profiles[l] || !c.profiles[l]->described)
            continue;
        for (const auto& [g, mm] : group_mmol(*c.solvents, *c.profiles[l]))
            for (const SolubilityTable* t : c.solvents->solubility_tables(g))
                for (const auto& pt : t->points)
                    knots.insert(pt.first);
    }
    if (knots.empty())
        return out;
    if (eluent_species.active())
        for (int k = 1; k < 20; ++k)
            knots.insert(k / 20.0);
    auto organic_of = [&](const LineValues& p) {
        double o = 0;
        for (int l = 0; l < max_lines; ++l)
            if (c.profiles[l] && c.profiles[l]->described)
                o += p[l] / 100.0 * c.profiles[l]->organic_fraction_v;
        return o;
    };
    const std::vector<double> knot_list(knots.begin(), knots.end()); // ascending
    std::map<std::string, WorstLoad> worst;
    struct Loads {
        std::vector<SaltLoad> loads;
        std::vector<WorstLoad*> worst; ///< each load's entry in `worst` (its group)
    };
    std::map<std::array<long long, max_lines>, Loads> loads_at;
    std::vector<double> at;
    for (const auto& ns : all_stretches(*c.input, *c.plan)) {
        const Stretch& s = ns.s;
        at.assign({0.0, 1.0});
        const double o0 = organic_of(s.percent_start), o1 = organic_of(s.percent_end);
        if (o1 != o0) {
            // Only the knots between the two ends can fall inside (the test below still decides).
            const auto first =
                std::lower_bound(knot_list.begin(), knot_list.end(), std::min(o0, o1));
            const auto last = std::upper_bound(first, knot_list.end(), std::max(o0, o1));
            for (auto k = first; k != last; ++k) {
                const double u = (*k - o0) / (o1 - o0);
                if (u > 0 && u < 1)
                    at.push_back(u);
            }
        }
        for (double u : at) {
            LineValues p{};
            for (int l = 0; l < max_lines; ++l)
                p[l] = s.percent_start[l] + (s.percent_end[l] - s.percent_start[l]) * u;
            const double t = s.start_min + u * s.duration_min;
            // Methods repeat compositions (the same gradient at other times): loads per
            // composition, worked out once.
            std::array<long long, max_lines> key{};
            for (int l = 0; l < max_lines; ++l)
                key[l] = std::llround(p[l] * 1e6);
            auto known = loads_at.find(key);
            if (known == loads_at.end()) {
                Loads l;
                l.loads = salt_loads(*c.solvents, c.profiles, p, eluent_species.at(p));
                for (const SaltLoad& load : l.loads)
                    l.worst.push_back(&worst[load.group]);
                known = loads_at.emplace(key, std::move(l)).first;
            }
            for (std::size_t i = 0; i < known->second.loads.size(); ++i) {
                const SaltLoad& load = known->second.loads[i];
                WorstLoad& w = *known->second.worst[i];
                if (w.found && !(load.ratio() > w.load.ratio()))
                    continue; // the place's words only for a new worst
                const std::string where =
                    ns.standby ? "in the standby"
                               : "in method " + ns.where + " at " + fmt(t, 2) + " min";
                consider(w, load, where, ns.place(), t);
            }
        }
    }
    for (const auto& [g, w] : worst)
        precipitation_warning(w, out);
    return out;
}

// (d) Non-volatile buffers and additives with a detector that evaporates the eluent.

} // namespace chem
