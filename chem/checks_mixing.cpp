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

} // namespace

double SaltLoad::ratio() const {
    if (limit_mmol_per_l <= 0)
        return mmol_per_l > 0 ? std::numeric_limits<double>::infinity() : 0;
    return mmol_per_l / limit_mmol_per_l;
}

std::vector<SaltLoad> salt_loads(const SolventLibrary& lib,
                                 const std::array<const LineProfile*, max_lines>& profiles,
                                 const LineValues& percent) {
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
        if (c <= 0 || organic_total <= 0)
            continue;
        const auto tables = lib.solubility_tables(g);
        if (tables.empty())
            continue;
        // The tables of the organics present; if one present organic has none, every table of
        // the group (the most restrictive wins: conservative).
        std::vector<const SolubilityTable*> use;
        bool missing = false;
        for (const auto& [s, f] : organic) {
            if (f <= 0)
                continue;
            if (const SolubilityTable* t = lib.solubility(g, s))
                use.push_back(t);
            else
                missing = true;
        }
        if (missing)
            use = tables;
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
        for (const auto& load : salt_loads(*c.solvents, one, p))
            consider(worst[load.group], load, where, Subject::of_line(l), 0);
        for (const auto& [g, w] : worst)
            precipitation_warning(w, out);
    }
    // The mixed eluent: per stretch, the ends and the points where the organic fraction crosses a
    // row of a table (concentration and organic fraction are linear in time within a stretch and
    // the limit is piecewise linear in the organic fraction, so the worst ratio lies on one of
    // them).
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
    auto organic_of = [&](const LineValues& p) {
        double o = 0;
        for (int l = 0; l < max_lines; ++l)
            if (c.profiles[l] && c.profiles[l]->described)
                o += p[l] / 100.0 * c.profiles[l]->organic_fraction_v;
        return o;
    };
    std::map<std::string, WorstLoad> worst;
    for (const auto& ns : all_stretches(*c.input, *c.plan)) {
        const Stretch& s = ns.s;
        std::vector<double> at = {0.0, 1.0};
        const double o0 = organic_of(s.percent_start), o1 = organic_of(s.percent_end);
        if (o1 != o0)
            for (double k : knots) {
                const double u = (k - o0) / (o1 - o0);
                if (u > 0 && u < 1)
                    at.push_back(u);
            }
        for (double u : at) {
            LineValues p{};
            for (int l = 0; l < max_lines; ++l)
                p[l] = s.percent_start[l] + (s.percent_end[l] - s.percent_start[l]) * u;
            const double t = s.start_min + u * s.duration_min;
            const std::string where = ns.standby
                                          ? "in the standby"
                                          : "in method " + ns.where + " at " + fmt(t, 2) + " min";
            for (const auto& load : salt_loads(*c.solvents, c.profiles, p))
                consider(worst[load.group], load, where, ns.place(), t);
        }
    }
    for (const auto& [g, w] : worst)
        precipitation_warning(w, out);
    return out;
}

// (d) Non-volatile buffers and additives with a detector that evaporates the eluent.

} // namespace chem
