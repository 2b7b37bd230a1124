#include "chem/checks.h"

#include "chem/error.h"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <deque>
#include <limits>
#include <map>
#include <set>

namespace chem {

namespace {

using Sev = Warning::Severity;

std::string fmt(double v, int decimals = 1) {
    const double scale = std::pow(10.0, decimals);
    return format_number(std::round(v * scale) / scale);
}

std::string letter(int l) {
    return std::string(1, line_letter(l));
}

std::string line_title(const SequenceCheckInput& c, int l) {
    const std::string& n = c.names[l];
    return "Line " + letter(l) + (n.empty() || n == letter(l) ? "" : " (" + n + ")");
}

/// An id as the message shows it: the library's name when the app gave a lookup.
std::string named(const SequenceCheckInput& c, const std::string& id) {
    return c.name_of ? c.name_of(id) : id;
}
std::vector<std::string> named(const SequenceCheckInput& c, const std::vector<std::string>& ids) {
    std::vector<std::string> out;
    for (const auto& id : ids)
        out.push_back(named(c, id));
    return out;
}
/// A salt group id ("potassium-phosphate") in words ("potassium phosphate").
std::string group_words(std::string g) {
    std::replace(g.begin(), g.end(), '-', ' ');
    return g;
}
/// "in method “assay”, 18 min 53 s into each injection"; "in the standby".
std::string where_words(const std::string& where, double t_min) {
    if (where == "standby")
        return "in the standby";
    return "in method \u201c" + where + "\u201d, " + method_time_words(t_min) +
           " into each injection";
}

std::string join(const std::vector<std::string>& v) {
    std::string out;
    for (std::size_t i = 0; i < v.size(); ++i)
        out += (i ? ", " : "") + v[i];
    return out;
}

CheckWarning make(const char* code, Sev sev, std::string line, std::string message) {
    CheckWarning w;
    w.code = code;
    w.severity = sev;
    w.line = std::move(line);
    w.message = std::move(message);
    return w;
}

/// The methods the sequence runs (indices into plan.methods), each once.
std::vector<int> methods_run(const SequencePlan& plan) {
    // One pass over the rows with a flag per method, stopping once every method has been seen
    // (a plan has 10,000 rows and a few methods).
    std::vector<int> out;
    std::vector<char> seen(plan.methods.size(), 0);
    for (const auto& r : plan.rows) {
        if (out.size() == seen.size())
            break;
        if (r.method >= 0 && static_cast<std::size_t>(r.method) < seen.size() && !seen[r.method]) {
            seen[r.method] = 1;
            out.push_back(r.method);
        }
    }
    return out;
}

/// Every linear stretch the sequence runs through, with the method's name (standby included).
struct NamedStretch {
    std::string where; ///< method name or "standby"
    Stretch s;
};
std::vector<NamedStretch> all_stretches(const SequenceInput& in, const SequencePlan& plan) {
    std::vector<NamedStretch> out;
    for (int mi : methods_run(plan))
        for (const auto& s : stretches(in.methods[mi]))
            out.push_back({in.methods[mi].name, s});
    if (plan.standby_min > 0)
        out.push_back(
            {"standby", {0, plan.standby_min, plan.standby_percent, plan.standby_percent}});
    return out;
}

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

void immiscible_within(const SequenceCheckInput& ci, const LineProfile& p, const std::string& line,
                       const std::string& title, std::vector<CheckWarning>& out) {
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
    CheckWarning w =
        make("immiscible", imm ? Sev::warning : Sev::caution, line,
             title + " mixes " + named(ci, c.a) + " (" + fmt(100 * p.solvent_fraction_v.at(c.a)) +
                 " %) with " + named(ci, c.b) + " (" + fmt(100 * p.solvent_fraction_v.at(c.b)) +
                 " %), which are " +
                 (imm ? "immiscible: the bottle separates into two phases."
                      : "only partly miscible: check that the bottle stays one clear phase."));
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
    std::string where;      ///< "in method assay at 18.89 min" (the warning's "where" field)
    std::string where_text; ///< the same in words for the message
    double t_min = 0;
    bool found = false;
};

void precipitation_warning(const WorstLoad& w, const std::string& line, const NameLookup& name_of,
                           std::vector<CheckWarning>& out) {
    const double r = w.load.ratio();
    if (r <= 0.8)
        return;
    const bool over = r > 1.0;
    std::string msg =
        (over ? "Buffer salt " : "Buffer salt near its limit: ") + group_words(w.load.group) +
        " reaches " + fmt(w.load.mmol_per_l, 2) + " mmol/L at " +
        fmt(100 * w.load.organic_fraction_v) + " % organic " + w.where_text + ", " +
        (over ? "above" : "close to") + " the limit of " + fmt(w.load.limit_mmol_per_l, 2) +
        " mmol/L in water–" + (name_of ? name_of(w.load.organic) : w.load.organic) + " (" +
        (w.load.basis == "published" ? "published data" : "a conservative rule of thumb") + ").";
    if (over)
        msg += " It may precipitate in the mixer, the column or the check valves: lower the salt "
               "or the organic end.";
    CheckWarning cw = make("precipitation", over ? Sev::warning : Sev::caution, line, msg);
    cw.text("group", w.load.group);
    cw.text("organic", w.load.organic);
    cw.text("where", w.where);
    cw.text("basis", w.load.basis);
    cw.text("source", w.load.source);
    cw.number("mmol_per_l", w.load.mmol_per_l);
    cw.number("limit_mmol_per_l", w.load.limit_mmol_per_l);
    cw.number("organic_fraction_v", w.load.organic_fraction_v);
    if (w.where.rfind("in method", 0) == 0)
        cw.number("t_min", w.t_min);
    out.push_back(cw);
}

void consider(WorstLoad& worst, const SaltLoad& l, const std::string& where,
              const std::string& where_text, double t) {
    if (!worst.found || l.ratio() > worst.load.ratio()) {
        worst.load = l;
        worst.where = where;
        worst.where_text = where_text;
        worst.t_min = t;
        worst.found = true;
    }
}

} // namespace

bool detector_reads_uv(const std::string& t) {
    return t == "uv" || t == "dad" || t == "pda" || t == "uv-ms";
}
bool detector_needs_volatile(const std::string& t) {
    return t == "ms" || t == "uv-ms" || t == "elsd" || t == "cad";
}
const std::vector<std::string>& detector_types() {
    static const std::vector<std::string> t = {"uv",   "dad", "pda",          "uv-ms", "ms",
                                               "elsd", "cad", "fluorescence", "ri"};
    return t;
}

std::string default_clock(double minutes) {
    return "t+" + fmt(minutes, 1) + " min";
}

std::string method_time_words(double minutes) {
    const long long total_s = std::llround(std::max(0.0, minutes) * 60.0);
    const long long m = total_s / 60, sec = total_s % 60;
    if (m == 0)
        return std::to_string(sec) + " s";
    if (sec == 0)
        return std::to_string(m) + " min";
    return std::to_string(m) + " min " + std::to_string(sec) + " s";
}

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

std::array<bool, max_lines> lines_in_use(const SequencePlan& plan, const std::vector<int>& run) {
    std::array<bool, max_lines> used{};
    for (int mi : run)
        for (int l = 0; l < max_lines; ++l)
            if (plan.methods[mi].max_percent[l] > 0)
                used[l] = true;
    if (plan.standby_min > 0)
        for (int l = 0; l < max_lines; ++l)
            if (plan.standby_percent[l] > 0)
                used[l] = true;
    return used;
}

std::array<bool, max_lines> lines_in_use(const SequenceInput& in, const SequencePlan& plan) {
    (void)in;
    return lines_in_use(plan, methods_run(plan));
}

// (a) The eluent's absorbance at the detector wavelength. Absorbance adds (Beer–Lambert), so at a
// pump composition the eluent absorbs A(λ) = Σ_l φ_l A_l(λ), each line's A_l(λ) from its parts
// (line_uv_cutoff_nm's model); the mixing contraction, which concentrates by 2–3 % at most, is
// left out. A is linear in the composition and the composition linear along a stretch, so the
// ends of the stretches the sequence runs (standby included) hold the worst case exactly. On the
// same model, A ≥ 1 means the detector reads below the eluent's cutoff (warning) and
// A ≥ 10^(−margin/w) within the margin of it (caution); a line at 100 % gives its own cutoff.
std::vector<CheckWarning> check_uv_cutoff(const SequenceCheckInput& c) {
    std::vector<CheckWarning> out;
    if (!c.detector || !detector_reads_uv(c.detector->type) || !c.detector->wavelength_nm)
        return out;
    const double wl = *c.detector->wavelength_nm;
    const double margin = c.detector->margin_nm;
    const auto used = lines_in_use(*c.input, *c.plan);
    LineValues line_a{}; // each line's absorbance at wl
    for (int l = 0; l < max_lines; ++l)
        if (used[l] && c.profiles[l] && c.profiles[l]->described)
            line_a[l] = uv_absorbance(c.profiles[l]->uv_parts, wl);
    struct Worst {
        double a = -1;
        std::string where;
        double t_min = 0;
        LineValues percent{};
    } worst;
    for (const NamedStretch& ns : all_stretches(*c.input, *c.plan))
        for (const bool end : {false, true}) {
            const LineValues& pc = end ? ns.s.percent_end : ns.s.percent_start;
            double a = 0;
            for (int l = 0; l < max_lines; ++l)
                a += pc[l] / 100.0 * line_a[l];
            if (a > worst.a + 1e-12) {
                worst = {a, ns.where, ns.s.start_min + (end ? ns.s.duration_min : 0.0), pc};
            }
        }
    const double caution_a = std::pow(10.0, -margin / uv_decade_nm);
    if (worst.a >= caution_a) {
        // The line, and the part of it, that brings most of the absorbance there.
        int top_line = -1;
        double top_a = -1;
        std::string part;
        for (int l = 0; l < max_lines; ++l) {
            if (!c.profiles[l] || worst.percent[l] <= 0)
                continue;
            for (const UvPart& u : c.profiles[l]->uv_parts) {
                const double a = worst.percent[l] / 100.0 * uv_absorbance({u}, wl);
                if (a > top_a) {
                    top_a = a;
                    top_line = l;
                    part = u.who;
                }
            }
        }
        const double cut = wl + uv_decade_nm * std::log10(worst.a);
        const bool below = worst.a >= 1;
        std::string where;
        if (!c.lone_line) {
            std::string mix;
            for (int l = 0; l < max_lines; ++l)
                if (worst.percent[l] > 0)
                    mix += (mix.empty() ? "" : ", ") + fmt(worst.percent[l], 0) + " % " + letter(l);
            where = worst.where == "standby"
                        ? " at standby (" + mix + ")"
                        : " in method " + worst.where + " at " + fmt(worst.t_min, 2) +
                              " min of each injection (" + mix + ")";
        }
        const std::string who =
            top_line >= 0 ? named(c, part) + (c.lone_line ? "" : " in " + line_title(c, top_line))
                          : std::string("its parts");
        CheckWarning w = make(
            "uv-cutoff", below ? Sev::warning : Sev::caution, top_line >= 0 ? letter(top_line) : "",
            std::string(c.lone_line ? "The line" : "The eluent") + where + " absorbs " +
                fmt(worst.a, 2) + " (1 cm) at " + fmt(wl, 0) + " nm, mostly from " + who +
                ": its UV cutoff there is " + fmt(cut, 0) + " nm; the detector reads at " +
                fmt(wl, 0) + " nm, " +
                (below ? "below the cutoff: expect a high baseline and a drifting gradient."
                       : "within " + fmt(margin, 0) +
                             " nm of it: expect baseline drift over the gradient."));
        w.number("wavelength_nm", wl);
        w.number("cutoff_nm", cut);
        w.number("absorbance", worst.a);
        w.number("margin_nm", margin);
        w.text("limited_by", part);
        if (!c.lone_line) {
            w.text("method", worst.where);
            w.number("t_min", worst.t_min);
        }
        out.push_back(w);
    }
    for (int l = 0; l < max_lines; ++l) {
        const LineProfile* p = c.profiles[l];
        if (!used[l] || !p || !p->described)
            continue;
        if (!p->uv_unknown.empty()) {
            CheckWarning w = make("uv-cutoff", Sev::caution, letter(l),
                                  line_title(c, l) + ": no UV cutoff figure for " +
                                      join(named(c, p->uv_unknown)) + "; check its absorbance at " +
                                      fmt(wl, 0) + " nm before the run.");
            w.number("wavelength_nm", wl);
            w.text("unknown", join(p->uv_unknown));
            out.push_back(w);
        }
        if (!p->uv_beyond_table.empty()) {
            CheckWarning w =
                make("uv-cutoff", Sev::info, letter(l),
                     line_title(c, l) + ": " + join(named(c, p->uv_beyond_table)) +
                         " is above the highest concentration in its UV table; the cutoff used (" +
                         fmt(p->uv_cutoff_nm, 0) + " nm) is a lower bound.");
            w.number("cutoff_nm", p->uv_cutoff_nm);
            out.push_back(w);
        }
    }
    return out;
}

// (b) Lines that meet in the mixer (both above 0 % at the same time) and do not mix; and parts of
// one line that do not mix.
std::vector<CheckWarning> check_immiscible(const SequenceCheckInput& c) {
    std::vector<CheckWarning> out;
    const auto used = lines_in_use(*c.input, *c.plan);
    for (int l = 0; l < max_lines; ++l)
        if (used[l] && c.profiles[l] && c.profiles[l]->described)
            immiscible_within(c, *c.profiles[l], letter(l), line_title(c, l), out);

    struct Meeting {
        bool met = false;
        std::string where;
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
        const std::string where = m.where == "standby"
                                      ? "in the standby"
                                      : "in method \u201c" + m.where + "\u201d from " +
                                            method_time_words(m.t_min) + " into each injection";
        CheckWarning w =
            make("immiscible", imm ? Sev::warning : Sev::caution, letter(a) + letter(b),
                 "Lines " + letter(a) + " and " + letter(b) + " meet in the mixer " + where +
                     " (about " + fmt(m.pa) + " % " + letter(a) + " with " + fmt(m.pb) + " % " +
                     letter(b) + "): " + named(c, k.a) + " and " + named(c, k.b) + " are " +
                     (imm ? "immiscible, so the eluent separates into two phases."
                          : "only partly miscible: check the proportions stay within their mutual "
                            "solubility."));
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
std::vector<CheckWarning> check_precipitation(const SequenceCheckInput& c) {
    std::vector<CheckWarning> out;
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
        for (const auto& load : salt_loads(*c.solvents, one, p))
            consider(worst[load.group], load, "in the bottle of line " + letter(l),
                     "in the bottle of line " + letter(l), 0);
        for (const auto& [g, w] : worst)
            precipitation_warning(w, letter(l), c.name_of, out);
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
            const std::string where = ns.where == "standby"
                                          ? "in the standby"
                                          : "in method " + ns.where + " at " + fmt(t, 2) + " min";
            for (const auto& load : salt_loads(*c.solvents, c.profiles, p))
                consider(worst[load.group], load, where, where_words(ns.where, t), t);
        }
    }
    for (const auto& [g, w] : worst)
        precipitation_warning(w, "", c.name_of, out);
    return out;
}

// (d) Non-volatile buffers and additives with a detector that evaporates the eluent.
std::vector<CheckWarning> check_ms_nonvolatile(const SequenceCheckInput& c) {
    std::vector<CheckWarning> out;
    if (!c.detector || !detector_needs_volatile(c.detector->type))
        return out;
    const auto used = lines_in_use(*c.input, *c.plan);
    for (int l = 0; l < max_lines; ++l) {
        const LineProfile* p = c.profiles[l];
        if (!used[l] || !p || !p->described)
            continue;
        if (!p->nonvolatile.empty()) {
            std::vector<std::string> parts;
            for (const auto& id : p->nonvolatile)
                for (const auto& s : p->solutes)
                    if (s.reagent == id)
                        parts.push_back(named(c, id) + " " + fmt(s.mmol_per_l, 2) + " mmol/L");
            CheckWarning w =
                make("ms-nonvolatile", Sev::warning, letter(l),
                     line_title(c, l) + " carries non-volatile " + join(parts) + " into the " +
                         c.detector->type +
                         " detector: it deposits in the source and suppresses the signal. Use a "
                         "volatile "
                         "buffer (formate, acetate, ammonium bicarbonate) or divert the flow.");
            for (const auto& s : p->solutes)
                if (std::find(p->nonvolatile.begin(), p->nonvolatile.end(), s.reagent) !=
                    p->nonvolatile.end())
                    w.number(s.reagent + "_mmol_per_l", s.mmol_per_l);
            w.text("detector", c.detector->type);
            w.text("nonvolatile", join(p->nonvolatile));
            out.push_back(w);
        }
        for (const Solute& s : p->solutes) {
            const Additive* add = c.solvents->find_additive(s.reagent);
            if (!add || add->ms_caution.empty())
                continue;
            CheckWarning w =
                make("ms-nonvolatile", Sev::caution, letter(l),
                     line_title(c, l) + " carries " + s.reagent + " (" + fmt(s.mmol_per_l, 2) +
                         " mmol/L) into the " + c.detector->type + " detector: " + add->ms_caution +
                         " (" + add->ms_caution_source + ").");
            w.text("detector", c.detector->type);
            w.text("additive", s.reagent);
            out.push_back(w);
        }
        if (!p->volatility_unknown.empty()) {
            CheckWarning w =
                make("ms-nonvolatile", Sev::caution, letter(l),
                     line_title(c, l) + ": volatility of " + join(named(c, p->volatility_unknown)) +
                         " is not recorded; check it suits the " + c.detector->type + " detector.");
            w.text("detector", c.detector->type);
            w.text("unknown", join(p->volatility_unknown));
            out.push_back(w);
        }
    }
    return out;
}

namespace {

/// The compositions of a set of traces, each solved once: gradients repeat the same rows and the
/// same whole percents of organic across methods. An open-addressing table keyed on the
/// percentages rounded to 1e-6 % (a std::map here cost as much as the solves it saved).
class PointCache {
  public:
    explicit PointCache(const EluentModel& model) : model_(model), slots_(256) {}

    const EluentPoint& at(const LineValues& p, const EluentPoint* guess) {
        Key key{};
        for (int l = 0; l < max_lines; ++l)
            key[l] = static_cast<long long>(p[l] * 1e6 + 0.5); // percentages are ≥ 0
        const std::size_t mask = slots_.size() - 1;
        for (std::size_t i = hash(key) & mask;; i = (i + 1) & mask) {
            Slot& s = slots_[i];
            if (s.index < 0) {
                s.key = key;
                s.index = static_cast<int>(points_.size());
                points_.push_back(model_.point(p.data(), p.size(), guess));
                if (2 * points_.size() > slots_.size())
                    grow();
                return points_.back();
            }
            if (s.key[0] == key[0] && s.key[1] == key[1] && s.key[2] == key[2] &&
                s.key[3] == key[3])
                return points_[s.index];
        }
    }

  private:
    using Key = std::array<long long, max_lines>;
    static_assert(max_lines == 4, "the key comparison in at() spells out four lines");
    struct Slot {
        Key key{};
        int index = -1;
    };
    /// The four rounded percentages, each multiplied by its own odd constant (Knuth's
    /// multiplicative hashing) and folded with one shift, so that the low bits used as the slot
    /// depend on every percentage.
    static std::size_t hash(const Key& key) {
        std::uint64_t h = static_cast<std::uint64_t>(key[0]) * 0x9e3779b97f4a7c15ULL ^
                          static_cast<std::uint64_t>(key[1]) * 0xc2b2ae3d27d4eb4fULL ^
                          static_cast<std::uint64_t>(key[2]) * 0x165667b19e3779f9ULL ^
                          static_cast<std::uint64_t>(key[3]) * 0xd6e8feb86659fd93ULL;
        h ^= h >> 29;
        h *= 0xbf58476d1ce4e5b9ULL;
        h ^= h >> 32;
        return static_cast<std::size_t>(h);
    }
    void grow() {
        std::vector<Slot> old(slots_.size() * 2);
        old.swap(slots_);
        const std::size_t mask = slots_.size() - 1;
        for (const Slot& s : old) {
            if (s.index < 0)
                continue;
            std::size_t i = hash(s.key) & mask;
            while (slots_[i].index >= 0)
                i = (i + 1) & mask;
            slots_[i] = s;
        }
    }
    const EluentModel& model_;
    std::vector<Slot> slots_;
    std::deque<EluentPoint> points_; ///< stable addresses while the table grows
};

} // namespace

std::vector<EluentTrace> eluent_traces(const SequenceCheckInput& c) {
    std::vector<EluentTrace> out;
    if (!c.reagents || !c.solvents || !c.input || !c.plan)
        return out;
    const std::vector<int> run = methods_run(*c.plan);
    const auto used = lines_in_use(*c.plan, run);
    std::vector<const LineProfile*> profiles(max_lines, nullptr);
    for (int l = 0; l < max_lines; ++l) {
        if (c.profiles[l] && c.profiles[l]->described)
            profiles[l] = c.profiles[l];
        else if (used[l])
            return out; // a volumes-only line in use: its make-up is unknown
    }
    const double t_c = c.column && c.column->temperature_c ? *c.column->temperature_c : 25.0;
    const EluentModel model(*c.solvents, *c.reagents, profiles, t_c);
    PointCache solved(model);
    auto at = [&](const LineValues& p, const EluentPoint* guess) -> const EluentPoint& {
        return solved.at(p, guess);
    };
    // Methods that run the same composition program (the same stretches' compositions, at any
    // times and flows) have the same trace points; only the times differ. Each program is traced
    // once, with each point's place (stretch, fraction of it) kept to time the copies.
    struct Program {
        std::vector<double> compositions; ///< percent_start and percent_end of every stretch
        std::size_t trace = 0;            ///< index into out
        std::vector<std::pair<std::size_t, double>> where; ///< per point: stretch, fraction
    };
    std::vector<Program> programs;
    std::vector<double> key;
    for (int mi : run) {
        const Method& m = c.input->methods[mi];
        const auto ss = stretches(m);
        key.clear();
        for (const Stretch& s : ss) {
            key.insert(key.end(), s.percent_start.begin(), s.percent_start.end());
            key.insert(key.end(), s.percent_end.begin(), s.percent_end.end());
        }
        EluentTrace tr;
        tr.method = m.name;
        tr.temperature_c = t_c;
        tr.has_systems = model.has_systems();
        for (const AcidBaseSystem* sys : model.systems())
            tr.systems.push_back(sys->id);
        const auto same = std::find_if(programs.begin(), programs.end(),
                                       [&](const Program& p) { return p.compositions == key; });
        if (same != programs.end()) {
            tr.points = out[same->trace].points;
            for (std::size_t k = 0; k < tr.points.size(); ++k) {
                const Stretch& s = ss[same->where[k].first];
                tr.points[k].t_min = s.start_min + same->where[k].second * s.duration_min;
            }
            out.push_back(std::move(tr));
            continue;
        }
        Program program;
        program.compositions = key;
        program.trace = out.size();
        const EluentPoint* last = nullptr;
        auto add = [&](std::size_t si, double u) {
            const Stretch& s = ss[si];
            LineValues p{};
            for (int l = 0; l < max_lines; ++l)
                p[l] = s.percent_start[l] + (s.percent_end[l] - s.percent_start[l]) * u;
            const EluentPoint& previous = at(p, last);
            last = &previous;
            EluentTracePoint tp;
            tp.t_min = s.start_min + u * s.duration_min;
            tp.organic_fraction_v = previous.organic_fraction_v;
            tp.ph_s_w = previous.ph_s_w;
            tp.ph_s_s = previous.ph_s_s;
            tp.nearest_pka_gap = previous.nearest_pka_gap;
            tp.nearest_pka = previous.nearest_pka;
            tp.nearest_system = previous.nearest_system;
            tp.extrapolated = previous.extrapolated;
            tr.points.push_back(tp);
            program.where.emplace_back(si, u);
        };
        tr.points.reserve(ss.size() + 101);
        program.where.reserve(ss.size() + 101);
        std::vector<double> us;
        for (std::size_t si = 0; si < ss.size(); ++si) {
            const Stretch& s = ss[si];
            add(si, 0.0);
            // Every whole percent of organic crossed inside the stretch.
            const double o0 =
                model.organic_fraction_v(s.percent_start.data(), s.percent_start.size());
            const double o1 = model.organic_fraction_v(s.percent_end.data(), s.percent_end.size());
            if (std::abs(o1 - o0) > 1e-9) {
                const double lo = std::min(o0, o1) * 100, hi = std::max(o0, o1) * 100;
                us.clear();
                for (double k = std::floor(lo) + 1; k < hi - 1e-9; k += 1)
                    us.push_back((k / 100 - o0) / (o1 - o0));
                std::sort(us.begin(), us.end());
                for (double u : us)
                    if (u > 1e-12 && u < 1 - 1e-12)
                        add(si, u);
            }
        }
        if (!ss.empty())
            add(ss.size() - 1, 1.0);
        programs.push_back(std::move(program));
        out.push_back(std::move(tr));
    }
    return out;
}

namespace {

const std::vector<EluentTrace>& traces_of(const SequenceCheckInput& c,
                                          std::vector<EluentTrace>& own) {
    if (c.traces)
        return *c.traces;
    own = eluent_traces(c);
    return own;
}

std::string pct(double fraction) {
    return fmt(100 * fraction, 0) + " % organic";
}

/// Where in the gradient an eluent warning applies: the worst point and the stretch around it.
void add_where(CheckWarning& w, const EluentTrace& tr, const EluentTracePoint& first,
               const EluentTracePoint& last, const EluentTracePoint& worst) {
    w.number("t_min", worst.t_min);
    w.number("organic_fraction_v", worst.organic_fraction_v);
    w.number("from_t_min", first.t_min);
    w.number("to_t_min", last.t_min);
    w.number("from_organic_fraction_v", first.organic_fraction_v);
    w.number("to_organic_fraction_v", last.organic_fraction_v);
    w.number("temperature_c", tr.temperature_c);
    w.text("method", tr.method);
}

} // namespace

// (e) The pH the column sees outside its stated range: the eluent's s_w pH along each method's
// gradient at the column temperature (or, without the reagent library, each line's own pH).
std::vector<CheckWarning> check_column_ph(const SequenceCheckInput& c) {
    std::vector<CheckWarning> out;
    if (!c.column && c.method_columns.empty())
        return out;
    std::vector<EluentTrace> own;
    const auto& traces = traces_of(c, own);
    if (!traces.empty()) {
        for (const EluentTrace& tr : traces) {
            const auto own = c.method_columns.find(tr.method);
            const ColumnLimits* limits = own != c.method_columns.end() ? &own->second
                                         : c.column                    ? &*c.column
                                                                       : nullptr;
            if (!limits)
                continue;
            for (const bool low : {true, false}) {
                const EluentTracePoint* worst = nullptr;
                const EluentTracePoint* first = nullptr;
                const EluentTracePoint* last = nullptr;
                for (const auto& p : tr.points) {
                    const bool outside =
                        low ? p.ph_s_w < limits->ph_min : p.ph_s_w > limits->ph_max;
                    if (!outside)
                        continue;
                    if (!first)
                        first = &p;
                    last = &p;
                    if (!worst || (low ? p.ph_s_w < worst->ph_s_w : p.ph_s_w > worst->ph_s_w))
                        worst = &p;
                }
                if (!worst)
                    continue;
                const std::string where =
                    c.lone_line ? "The line's eluent" : "In method " + tr.method + ", the eluent";
                const std::string span =
                    c.lone_line ? ""
                                : " from " + fmt(first->t_min, 2) + " to " + fmt(last->t_min, 2) +
                                      " min of each injection (" + pct(first->organic_fraction_v) +
                                      " to " + pct(last->organic_fraction_v) + "), worst at " +
                                      fmt(worst->t_min, 2) + " min";
                CheckWarning w =
                    make("column-ph", Sev::warning, "",
                         where + " has s_w pH " + fmt(worst->ph_s_w, 2) + " at " +
                             pct(worst->organic_fraction_v) + " and " + fmt(tr.temperature_c, 0) +
                             " °C" + span + ", " + (low ? "below" : "above") +
                             (own != c.method_columns.end() ? " the method's column's range of pH "
                                                            : " the column's range of pH ") +
                             fmt(limits->ph_min, 1) + " to " + fmt(limits->ph_max, 1) + ": " +
                             (low ? "the bonded phase hydrolyses." : "the silica dissolves.") +
                             " The organic moves the pH away from the aqueous buffer's; use a "
                             "column rated "
                             "for this pH or change the buffer." +
                             (worst->extrapolated ? " (The eluent pH there is an estimate.)" : ""));
                w.number("ph", worst->ph_s_w);
                w.number("ph_s_s", worst->ph_s_s);
                w.number("ph_min", limits->ph_min);
                w.number("ph_max", limits->ph_max);
                add_where(w, tr, *first, *last, *worst);
                w.text("ph_basis", "eluent s_w pH");
                out.push_back(w);
            }
        }
        return out;
    }
    if (!c.column)
        return out;
    const auto used = lines_in_use(*c.input, *c.plan);
    for (int l = 0; l < max_lines; ++l) {
        const LineProfile* p = c.profiles[l];
        if (!used[l] || !p || !p->ph)
            continue;
        const double ph = *p->ph;
        if (ph >= c.column->ph_min && ph <= c.column->ph_max)
            continue;
        const bool low = ph < c.column->ph_min;
        CheckWarning w =
            make("column-ph", Sev::warning, letter(l),
                 line_title(c, l) + " has pH " + fmt(ph, 2) + " (" + p->ph_basis + "), " +
                     (low ? "below" : "above") + " the column's range of pH " +
                     fmt(c.column->ph_min, 1) + " to " + fmt(c.column->ph_max, 1) + ": " +
                     (low ? "the bonded phase hydrolyses." : "the silica dissolves.") +
                     " Use a column rated for this pH or change the buffer.");
        w.number("ph", ph);
        w.number("ph_min", c.column->ph_min);
        w.number("ph_max", c.column->ph_max);
        w.text("ph_basis", p->ph_basis);
        out.push_back(w);
    }
    return out;
}

// (e2) Stretches of the gradient where the eluent is not buffered: its s_s pH more than one unit
// from every s_s pKa′ of the acid-base systems present.
std::vector<CheckWarning> check_buffer_range(const SequenceCheckInput& c) {
    std::vector<CheckWarning> out;
    std::vector<EluentTrace> own;
    const auto& traces = traces_of(c, own);
    for (const EluentTrace& tr : traces) {
        if (!tr.has_systems)
            continue;
        const auto& pts = tr.points;
        for (std::size_t i = 0; i < pts.size();) {
            // No acid-base system at this point (a wash of water and organic): nothing to judge.
            auto unbuffered = [](const EluentTracePoint& p) {
                return p.nearest_pka_gap > 1.0 && std::isfinite(p.nearest_pka_gap);
            };
            if (!unbuffered(pts[i])) {
                ++i;
                continue;
            }
            std::size_t j = i;
            const EluentTracePoint* worst = &pts[i];
            while (j + 1 < pts.size() && unbuffered(pts[j + 1])) {
                ++j;
                if (pts[j].nearest_pka_gap > worst->nearest_pka_gap)
                    worst = &pts[j];
            }
            const std::string where =
                c.lone_line ? "The line's eluent"
                            : "In method " + tr.method + ", from " + fmt(pts[i].t_min, 2) + " to " +
                                  fmt(pts[j].t_min, 2) + " min of each injection (" +
                                  pct(pts[i].organic_fraction_v) + " to " +
                                  pct(pts[j].organic_fraction_v) + "), the eluent";
            CheckWarning w = make(
                "buffer-range", Sev::caution, "",
                where + " has s_s pH " + fmt(worst->ph_s_s, 2) + " at " +
                    pct(worst->organic_fraction_v) + ", " + fmt(worst->nearest_pka_gap, 2) +
                    " units from the nearest s_s pKa′ (" + tr.systems[worst->nearest_system] + " " +
                    fmt(worst->nearest_pka, 2) + ")" +
                    ": outside pKa′ ± 1 the eluent buffers poorly, so the sample or the column can "
                    "shift its pH and retention. Choose a buffer whose pKa′ in the eluent lies "
                    "within one unit of its pH." +
                    (worst->extrapolated ? " (The eluent pH there is an estimate.)" : ""));
            w.number("ph_s_s", worst->ph_s_s);
            w.number("ph_s_w", worst->ph_s_w);
            w.number("nearest_pka", worst->nearest_pka);
            w.number("gap", worst->nearest_pka_gap);
            w.text("nearest_system", tr.systems[worst->nearest_system]);
            add_where(w, tr, pts[i], pts[j], *worst);
            out.push_back(w);
            i = j + 1;
        }
    }
    return out;
}

// (f) A line past its shelf life (lab-set default for its kind) before the sequence ends.
std::vector<CheckWarning> check_shelf_life(const SequenceCheckInput& c) {
    std::vector<CheckWarning> out;
    const auto used = lines_in_use(*c.input, *c.plan);
    for (int l = 0; l < max_lines; ++l) {
        const LineProfile* p = c.profiles[l];
        if (!used[l] || !p || !p->described || p->shelf_life_h <= 0)
            continue;
        // Without prepared_at the best case is a line made at the start: a sequence longer than
        // the shelf life is still caught.
        const bool known = c.prepared_at_min[l].has_value();
        const double prepared = known ? *c.prepared_at_min[l] : 0.0;
        const double expires = prepared + p->shelf_life_h * 60.0;
        if (expires >= c.plan->total_min)
            continue;
        const bool already = expires <= 0;
        std::string msg =
            line_title(c, l) + " (" + p->shelf_kind + ", shelf life " + fmt(p->shelf_life_h, 0) +
            " h, a lab-set default) " +
            (known ? "was prepared at " + c.clock(prepared)
                   : "even if prepared at the start, " + c.clock(0)) +
            ", and " +
            (already ? "is past its shelf life before the sequence starts."
                     : "passes its shelf life at " + c.clock(expires) + ", during injection " +
                           std::to_string(c.plan->injection_at(expires)) + " of " +
                           std::to_string(c.plan->injections) + ".") +
            " Prepare it fresh.";
        CheckWarning w = make("shelf-life", Sev::warning, letter(l), msg);
        w.text("kind", p->shelf_kind);
        w.number("shelf_life_h", p->shelf_life_h);
        if (known)
            w.number("prepared_at_min", prepared);
        else
            w.text("prepared_at", "not given: assumed at the start");
        w.number("expires_at_min", expires);
        if (!already)
            w.number("expires_during_injection", c.plan->injection_at(expires));
        out.push_back(w);
    }
    return out;
}

// (g) Bottles that run dry, or have less spare than the safety margin.
std::vector<CheckWarning> check_runs_dry(const SequenceCheckInput& c) {
    std::vector<CheckWarning> out;
    const double margin = c.input->safety_margin_fraction;
    for (int l = 0; l < max_lines; ++l) {
        const LinePlan& lp = c.plan->lines[l];
        if (!lp.defined)
            continue;
        const std::string need = "the sequence needs " + fmt(lp.required_ml, 0) +
                                 " mL (priming included), the bottle has " + fmt(lp.usable_ml, 0) +
                                 " mL usable above the residue";
        const std::string suggest =
            "Prepare at least " + fmt(std::ceil(lp.min_bottle_ml), 0) + " mL (" +
            fmt(100 * margin, 0) + " % spare plus the residue)" +
            (lp.suggested_bottle_ml > 0
                 ? ", e.g. a " + fmt(lp.suggested_bottle_ml, 0) + " mL bottle."
                 : ".");
        if (lp.runs_dry) {
            std::string when;
            if (lp.dry_phase == DryPhase::priming)
                when = "already during priming";
            else if (lp.dry_phase == DryPhase::standby)
                when = "during the standby after injection " +
                       std::to_string(*lp.dry_after_injection) + ", at " + c.clock(*lp.dry_at_min);
            else
                when = "during injection " + std::to_string(*lp.dry_after_injection) + " of " +
                       std::to_string(c.plan->injections) + ", at " + c.clock(*lp.dry_at_min);
            CheckWarning w = make("runs-dry", Sev::warning, letter(l),
                                  line_title(c, l) + " runs dry " + when + ": " + need +
                                      ". The pump then draws air. " + suggest);
            w.number("required_ml", lp.required_ml);
            w.number("usable_ml", lp.usable_ml);
            w.number("shortfall_ml", -lp.spare_ml);
            if (lp.dry_after_injection)
                w.number("dry_after_injection", *lp.dry_after_injection);
            if (lp.dry_at_min)
                w.number("dry_at_min", *lp.dry_at_min);
            w.number("min_bottle_ml", lp.min_bottle_ml);
            if (lp.suggested_bottle_ml > 0)
                w.number("suggested_bottle_ml", lp.suggested_bottle_ml);
            w.text("phase", dry_phase_name(lp.dry_phase));
            out.push_back(w);
        } else if (lp.required_ml > 0 && lp.spare_ml < margin * lp.required_ml) {
            CheckWarning w =
                make("runs-dry", Sev::caution, letter(l),
                     line_title(c, l) + " lasts, but with only " + fmt(lp.spare_ml, 0) +
                         " mL to spare (" + fmt(100 * lp.spare_ml / lp.required_ml, 1) +
                         " %, less than the " + fmt(100 * margin, 0) + " % margin): " + need +
                         ". " + suggest);
            w.number("required_ml", lp.required_ml);
            w.number("usable_ml", lp.usable_ml);
            w.number("spare_ml", lp.spare_ml);
            w.number("min_bottle_ml", lp.min_bottle_ml);
            if (lp.suggested_bottle_ml > 0)
                w.number("suggested_bottle_ml", lp.suggested_bottle_ml);
            out.push_back(w);
        }
    }
    return out;
}

std::vector<CheckWarning> check_waste_overflow(const SequenceCheckInput& c) {
    std::vector<CheckWarning> out;
    if (!c.input->waste_capacity_ml)
        return out;
    const double cap = *c.input->waste_capacity_ml;
    const double waste = c.plan->waste_ml;
    if (waste > cap) {
        const auto t = c.plan->time_waste_reaches(cap);
        std::string when = "";
        if (t) {
            if (*t <= 0)
                when = " during priming";
            else if (*t > c.plan->total_min)
                when = " during the standby, at " + c.clock(*t);
            else
                when = " during injection " + std::to_string(c.plan->injection_at(*t)) + ", at " +
                       c.clock(*t);
        }
        CheckWarning w =
            make("waste-overflow", Sev::warning, "",
                 "The waste container overfills" + when + ": the sequence sends " + fmt(waste, 0) +
                     " mL to waste (priming included) into " + fmt(cap, 0) +
                     " mL of free volume. Empty it first or use a larger one (at least " +
                     fmt(std::ceil(waste * 1.1), 0) + " mL with 10 % spare).");
        w.number("waste_ml", waste);
        w.number("capacity_ml", cap);
        w.number("excess_ml", waste - cap);
        if (t) {
            w.number("full_at_min", *t);
            if (*t > 0 && *t <= c.plan->total_min)
                w.number("full_during_injection", c.plan->injection_at(*t));
        }
        out.push_back(w);
    } else if (waste > 0.9 * cap) {
        CheckWarning w = make("waste-overflow", Sev::caution, "",
                              "The waste container will be " + fmt(100 * waste / cap, 0) +
                                  " % full (" + fmt(waste, 0) + " of " + fmt(cap, 0) +
                                  " mL): little room for a rerun or a spill.");
        w.number("waste_ml", waste);
        w.number("capacity_ml", cap);
        out.push_back(w);
    }
    return out;
}

// (i) The pressure peak of each method run against the lower of the two limits.
std::optional<CheckWarning> pressure_limit_warning(const std::string& method,
                                                   const PressureTrace& tr) {
    if (!tr.limit || !(tr.max_pressure_bar >= 0.9 * tr.limit->bar))
        return std::nullopt;
    const bool over = tr.max_pressure_bar > tr.limit->bar;
    std::string inlet;
    for (int l = 0; l < max_lines; ++l)
        if (tr.inlet_percent_at_max[l] > 0)
            inlet += (inlet.empty() ? "" : "/") + letter(l) + " " +
                     fmt(tr.inlet_percent_at_max[l], 0) + " %";
    const std::string where = "peaks at " + fmt(tr.max_pressure_bar, 0) + " bar " +
                              fmt(tr.max_at_t_min, 1) + " min into each injection, with " +
                              fmt(100 * tr.organic_fraction_v_at_max, 0) +
                              " % v/v organic in the column (" + inlet + " entering it)";
    const std::string limit =
        fmt(tr.limit->bar, 0) + " bar limit of the " + limit_source_name(tr.limit->source);
    // A one-method document (pressure, transfer) has no method name to give.
    const std::string subject = method.empty() ? "The method" : "Method " + method;
    CheckWarning w =
        over ? make("pressure-limit", Sev::warning, "",
                    subject + " " + where + ", above the " + limit +
                        ": the pump would stop the sequence. Lower the flow, raise the column "
                        "temperature or use a column with larger particles.")
             : make("pressure-limit", Sev::caution, "",
                    subject + " " + where + ", within 10 % of the " + limit +
                        ": a partly blocked frit or a colder room could trip it.");
    w.number("max_pressure_bar", tr.max_pressure_bar);
    w.number("limit_bar", tr.limit->bar);
    w.number("peak_t_min", tr.max_at_t_min);
    w.number("organic_fraction_v", tr.organic_fraction_v_at_max);
    w.text("method", method);
    w.text("limited_by", limit_source_name(tr.limit->source));
    return w;
}

std::vector<CheckWarning> check_pressure_limit(const SequenceCheckInput& c) {
    std::vector<CheckWarning> out;
    if (!c.pressure)
        return out;
    for (int mi : methods_run(*c.plan)) {
        if (mi >= static_cast<int>(c.pressure->size()) || !(*c.pressure)[mi])
            continue;
        auto w = pressure_limit_warning(c.plan->methods[mi].name, *(*c.pressure)[mi]);
        if (!w)
            continue;
        // The first time it happens in the night.
        for (const RowPlan& r : c.plan->rows)
            if (r.method == mi) {
                w->number("first_peak_at_min", r.start_min + (*c.pressure)[mi]->max_at_t_min);
                break;
            }
        out.push_back(std::move(*w));
    }
    return out;
}

std::vector<CheckWarning> check_sequence(const SequenceCheckInput& c) {
    if (!c.solvents || !c.input || !c.plan)
        throw Error("(checks)", "incomplete check input");
    std::vector<CheckWarning> out;
    std::vector<EluentTrace> own;
    SequenceCheckInput with = c;
    if (!with.traces && with.reagents) {
        own = eluent_traces(c);
        with.traces = &own;
    }
    for (auto f : {check_uv_cutoff, check_immiscible, check_precipitation, check_ms_nonvolatile,
                   check_column_ph, check_buffer_range, check_shelf_life, check_runs_dry,
                   check_waste_overflow, check_pressure_limit}) {
        auto w = f(with);
        out.insert(out.end(), std::make_move_iterator(w.begin()), std::make_move_iterator(w.end()));
    }
    return out;
}

std::vector<CheckWarning> check_line(const SolventLibrary& solvents, const LineProfile& profile,
                                     const std::string& name,
                                     const std::optional<Detector>& detector,
                                     const std::optional<ColumnLimits>& column,
                                     const Library* reagents, const NameLookup& name_of) {
    // A one-line, one-method "sequence" at 100 % of line A reuses the sequence checks.
    SequenceInput in;
    BottleSpec b;
    b.name = name;
    b.bottle_ml = 1;
    in.lines[0] = b;
    Method m;
    m.name = "line";
    m.flow_ml_min = 1;
    GradientRow row;
    row.percent[0] = 100;
    m.gradient.push_back(row);
    m.run_min = 1;
    in.methods.push_back(m);
    in.rows.push_back({"line", 1, ""});
    const SequencePlan plan = plan_sequence(in);
    SequenceCheckInput c;
    c.solvents = &solvents;
    c.input = &in;
    c.plan = &plan;
    c.profiles[0] = &profile;
    c.names[0] = name;
    c.detector = detector;
    c.column = column;
    c.name_of = name_of;
    c.reagents = reagents;
    c.lone_line = true;
    std::vector<CheckWarning> out;
    for (auto f : {check_uv_cutoff, check_immiscible, check_precipitation, check_ms_nonvolatile,
                   check_column_ph}) {
        auto w = f(c);
        for (auto& x : w) {
            // The bottle is the whole story for a lone line: drop the mixer's copy of it.
            bool mixer = false;
            for (const auto& [k, v] : x.texts)
                if (k == "where" && v.rfind("in the bottle", 0) != 0)
                    mixer = true;
            if (x.code == "precipitation" && mixer)
                continue;
            for (auto& [k, v] : x.texts)
                if (k == "where")
                    v = "in the bottle";
            const std::string bottle = "in the bottle of line A";
            if (auto pos = x.message.find(bottle); pos != std::string::npos)
                x.message.replace(pos, bottle.size(), "in the bottle");
            // A lone line has no "line A" of a sequence: name it by its own name.
            x.line.clear();
            const std::string from = "Line A (" + name + ")";
            if (x.message.rfind(from, 0) == 0)
                x.message = "The line " + name + x.message.substr(from.size());
            else if (x.message.rfind("Line A", 0) == 0)
                x.message = "The line" + x.message.substr(6);
            out.push_back(std::move(x));
        }
    }
    return out;
}

} // namespace chem
