// The checks on the eluent as the column sees it: its pH against the column range, and buffering
// along the gradient.
#include "chem/checks.h"
#include "chem/checks_common.h"

#include "chem/error.h"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdint>
#include <deque>
#include <limits>
#include <map>
#include <memory>
#include <set>

namespace chem {

using namespace checks_internal;

/// The compositions of a check run, each solved once: gradients repeat the same rows and the
/// same whole percents of organic across methods, and the precipitation check samples the same
/// points as the traces. An open-addressing table keyed on the percentages rounded to 1e-6 %
/// (a std::map here cost as much as the solves it saved).
struct EluentPoints::Table {
    using Key = std::array<long long, max_lines>;
    static_assert(max_lines == 4, "the key comparison in find() spells out four lines");
    struct Slot {
        Key key{};
        int index = -1;
    };
    std::vector<Slot> slots = std::vector<Slot>(256);
    std::deque<EluentPoint> points; ///< stable addresses while the table grows
    std::vector<double> pka;        ///< per point, the model's step_count() pKa′ values
    int steps = 0;
    int last = -1; ///< the point solved last

    static Key key_of(const LineValues& p) {
        Key key{};
        for (int l = 0; l < max_lines; ++l)
            key[l] = static_cast<long long>(p[l] * 1e6 + 0.5); // percentages are ≥ 0
        return key;
    }
    /// The slot of `key`: its own, or the empty one where it goes.
    Slot& find(const Key& key) {
        const std::size_t mask = slots.size() - 1;
        for (std::size_t i = hash(key) & mask;; i = (i + 1) & mask) {
            Slot& s = slots[i];
            if (s.index < 0 || (s.key[0] == key[0] && s.key[1] == key[1] && s.key[2] == key[2] &&
                                s.key[3] == key[3]))
                return s;
        }
    }
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
        std::vector<Slot> old(slots.size() * 2);
        old.swap(slots);
        const std::size_t mask = slots.size() - 1;
        for (const Slot& s : old) {
            if (s.index < 0)
                continue;
            std::size_t i = hash(s.key) & mask;
            while (slots[i].index >= 0)
                i = (i + 1) & mask;
            slots[i] = s;
        }
    }
};

EluentPoints::EluentPoints(const SequenceCheckInput& c) : table_(std::make_unique<Table>()) {
    init(c, true);
}

EluentPoints::EluentPoints(const SequenceCheckInput& c, BorrowProfiles)
    : table_(std::make_unique<Table>()) {
    init(c, false);
}

void EluentPoints::init(const SequenceCheckInput& c, bool copy_profiles) {
    temperature_c_ = c.column && c.column->temperature_c ? *c.column->temperature_c : 25.0;
    if (!c.reagents || !c.solvents)
        return;
    // The model keeps pointers to the profiles: it gets this object's own copies, so that the
    // points can outlive the check input (the app keeps them for its next recompute), unless
    // the caller keeps the profiles for as long.
    std::vector<const LineProfile*> profiles(max_lines, nullptr);
    for (int l = 0; l < max_lines; ++l)
        if (c.profiles[l] && c.profiles[l]->described)
            profiles[l] = copy_profiles ? &profiles_[l].emplace(*c.profiles[l]) : c.profiles[l];
    try {
        model_ = std::make_unique<EluentModel>(*c.solvents, *c.reagents, profiles, temperature_c_);
        table_->steps = model_->step_count();
    } catch (const Error& e) {
        error_ = e;
    }
}

EluentPoints::~EluentPoints() = default;

std::size_t EluentPoints::index_of(const LineValues& p, const EluentPoint* guess) {
    if (!model_)
        throw *error_;
    Table& t = *table_;
    const Table::Key key = Table::key_of(p);
    Table::Slot* s = &t.find(key);
    if (s->index >= 0)
        return static_cast<std::size_t>(s->index);
    if (!guess && t.last >= 0)
        guess = &t.points[t.last];
    const std::size_t at = t.pka.size();
    t.pka.resize(at + t.steps);
    try {
        t.points.push_back(model_->point(p.data(), p.size(), guess, t.pka.data() + at));
    } catch (...) {
        t.pka.resize(at);
        throw;
    }
    s->key = key;
    s->index = static_cast<int>(t.points.size()) - 1;
    t.last = s->index;
    if (2 * t.points.size() > t.slots.size())
        t.grow();
    return static_cast<std::size_t>(t.last);
}

const EluentPoint* EluentPoints::find(const LineValues& percent) const {
    const Table::Slot& s = table_->find(Table::key_of(percent));
    return s.index >= 0 ? &table_->points[s.index] : nullptr;
}

const EluentPoint& EluentPoints::at(const LineValues& percent, const EluentPoint* guess) {
    return table_->points[index_of(percent, guess)];
}

const EluentPoint& EluentPoints::species(const LineValues& percent,
                                         std::vector<std::vector<double>>& fractions) {
    const std::size_t i = index_of(percent, nullptr);
    const EluentPoint& pt = table_->points[i];
    model_->species_fractions(pt, table_->pka.data() + i * table_->steps, fractions);
    return pt;
}

std::vector<EluentTrace> eluent_traces(const SequenceCheckInput& c) {
    std::vector<EluentTrace> out;
    if (!c.reagents || !c.solvents || !c.input || !c.plan)
        return out;
    const std::vector<int> run = methods_run(*c.plan);
    const auto used = lines_in_use(*c.plan, run);
    for (int l = 0; l < max_lines; ++l)
        if (used[l] && !(c.profiles[l] && c.profiles[l]->described))
            return out; // a volumes-only line in use: its make-up is unknown
    std::unique_ptr<EluentPoints> own;
    EluentPoints* solved = c.eluent_points;
    if (!solved) {
        own = std::make_unique<EluentPoints>(c);
        solved = own.get();
    }
    if (!solved->model())
        throw *solved->error();
    const EluentModel& model = *solved->model();
    const double t_c = solved->temperature_c();
    auto at = [&](const LineValues& p, const EluentPoint* guess) -> const EluentPoint& {
        return solved->at(p, guess);
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
        // The last three points of this trace, newest first.
        std::array<const EluentPoint*, 3> recent{};
        const EluentPoint* last = nullptr;
        auto add = [&](std::size_t si, double u) {
            const Stretch& s = ss[si];
            LineValues p{};
            for (int l = 0; l < max_lines; ++l)
                p[l] = s.percent_start[l] + (s.percent_end[l] - s.percent_start[l]) * u;
            // The solver's start for a new point: the pH and ionic strength of the last points
            // carried on by the organic fraction, along the parabola through the three last
            // (the line through two where there are two) when they lie on the same side; else
            // the last point itself. A closer start saves Newton passes; the solution is the
            // same.
            const EluentPoint* known = solved->find(p);
            EluentPoint guess;
            const EluentPoint* from = last;
            if (!known && recent[0] && recent[1]) {
                const double o = model.organic_fraction_v(p.data(), p.size());
                const double o0 = recent[0]->organic_fraction_v, o1 = recent[1]->organic_fraction_v;
                const double span = o0 - o1;
                const double r = std::abs(span) > 1e-9 ? (o - o0) / span : 0;
                if (r > 0 && r <= 2) {
                    // Lagrange weights of the points at o0, o1 (and o2) for the value at o.
                    double w0 = 1 + r, w1 = -r, w2 = 0;
                    if (recent[2]) {
                        const double o2 = recent[2]->organic_fraction_v;
                        if ((o1 - o2) * span > 0 && std::abs(o1 - o2) > 1e-9) {
                            w0 = (o - o1) * (o - o2) / ((o0 - o1) * (o0 - o2));
                            w1 = (o - o0) * (o - o2) / ((o1 - o0) * (o1 - o2));
                            w2 = (o - o0) * (o - o1) / ((o2 - o0) * (o2 - o1));
                        }
                    }
                    auto at_o = [&](double EluentPoint::*f) {
                        return w0 * recent[0]->*f + w1 * recent[1]->*f +
                               (w2 != 0 ? w2 * recent[2]->*f : 0.0);
                    };
                    guess = *recent[0];
                    guess.ph_s_s = at_o(&EluentPoint::ph_s_s);
                    const double i = at_o(&EluentPoint::ionic_strength_mol_per_l);
                    if (i > 0.5 * recent[0]->ionic_strength_mol_per_l)
                        guess.ionic_strength_mol_per_l = i;
                    from = &guess;
                }
            }
            const EluentPoint& previous = known ? *known : at(p, from);
            last = &previous;
            recent = {last, recent[0], recent[1]};
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

/// Where in the gradient an eluent warning applies: the worst point and the stretch around it.
void add_where(Finding& w, const EluentTrace& tr, const EluentTracePoint& first,
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
std::vector<Finding> check_column_ph(const SequenceCheckInput& c) {
    std::vector<Finding> out;
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
            // Below and above the range in one walk: per side the first and last point outside
            // and the worst.
            struct Side {
                const EluentTracePoint* worst = nullptr;
                const EluentTracePoint* first = nullptr;
                const EluentTracePoint* last = nullptr;
            };
            std::array<Side, 2> sides{}; // below, above
            auto note = [](Side& side, const EluentTracePoint& p, bool below) {
                if (!side.first)
                    side.first = &p;
                side.last = &p;
                if (!side.worst ||
                    (below ? p.ph_s_w < side.worst->ph_s_w : p.ph_s_w > side.worst->ph_s_w))
                    side.worst = &p;
            };
            for (const auto& p : tr.points) {
                if (p.ph_s_w < limits->ph_min)
                    note(sides[0], p, true);
                if (p.ph_s_w > limits->ph_max)
                    note(sides[1], p, false);
            }
            for (const bool low : {true, false}) {
                const Side& side = sides[low ? 0 : 1];
                const EluentTracePoint* worst = side.worst;
                const EluentTracePoint* first = side.first;
                const EluentTracePoint* last = side.last;
                if (!worst)
                    continue;
                Finding w = make(FindingKind::column_ph_eluent, Sev::warning,
                                 Subject::of_method(tr.method));
                w.detail("below", low ? 1 : 0);
                w.detail("method_column", own != c.method_columns.end() ? 1 : 0);
                w.detail("extrapolated", worst->extrapolated ? 1 : 0);
                w.number("ph", worst->ph_s_w);
                w.number("ph_s_s", worst->ph_s_s);
                w.number("ph_min", limits->ph_min);
                w.number("ph_max", limits->ph_max);
                add_where(w, tr, *first, *last, *worst);
                w.text("ph_basis", ph_basis_name(PhBasis::eluent_s_w));
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
        Finding w = make(FindingKind::column_ph_line, Sev::warning, Subject::of_line(l));
        w.number("ph", ph);
        w.number("ph_min", c.column->ph_min);
        w.number("ph_max", c.column->ph_max);
        w.text("ph_basis", ph_basis_name(p->ph_basis));
        out.push_back(w);
    }
    return out;
}

// (e2) Stretches of the gradient where the eluent is not buffered: its s_s pH more than one unit
// from every s_s pKa′ of the acid-base systems present.
std::vector<Finding> check_buffer_range(const SequenceCheckInput& c) {
    std::vector<Finding> out;
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
            Finding w =
                make(FindingKind::buffer_range, Sev::caution, Subject::of_method(tr.method));
            w.detail("extrapolated", worst->extrapolated ? 1 : 0);
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

} // namespace chem
