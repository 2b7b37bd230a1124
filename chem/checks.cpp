// The sequence checks: check_sequence runs them all (one file per seam: detector, mixing, eluent,
// budget).
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

std::vector<Finding> check_sequence(const SequenceCheckInput& c) {
    if (!c.solvents || !c.input || !c.plan)
        throw Error("(checks)", "incomplete check input");
    std::vector<Finding> out;
    std::vector<EluentTrace> own;
    SequenceCheckInput with = c;
    // One set of solved eluent points for the traces and the precipitation check.
    std::optional<EluentPoints> points;
    if (!with.eluent_points && with.reagents) {
        points.emplace(c, EluentPoints::BorrowProfiles{});
        with.eluent_points = &*points;
    }
    if (!with.traces && with.reagents) {
        own = eluent_traces(with);
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

std::vector<Finding> check_line(const SolventLibrary& solvents, const LineProfile& profile,
                                const std::string& name, const std::optional<Detector>& detector,
                                const std::optional<ColumnLimits>& column,
                                const Library* reagents) {
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
    c.detector = detector;
    c.column = column;
    c.reagents = reagents;
    c.lone_line = true;
    std::optional<EluentPoints> points;
    if (reagents) {
        points.emplace(c, EluentPoints::BorrowProfiles{});
        c.eluent_points = &*points;
    }
    std::vector<Finding> out;
    for (auto f : {check_uv_cutoff, check_immiscible, check_precipitation, check_ms_nonvolatile,
                   check_column_ph}) {
        auto w = f(c);
        for (auto& x : w) {
            // The bottle is the whole story for a lone line: drop the mixer's copy of it.
            if (x.kind == FindingKind::precipitation && x.where.kind != Subject::Kind::line)
                continue;
            // A lone line has no "line A" of a sequence: describe() names it by its own name.
            x.alone = true;
            out.push_back(std::move(x));
        }
    }
    return out;
}

} // namespace chem
