// The checks of the night's budget: shelf life, bottles running dry, the waste container and the
// pressure limit.
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

std::vector<Finding> check_shelf_life(const SequenceCheckInput& c) {
    std::vector<Finding> out;
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
        Finding w = make(FindingKind::shelf_life, Sev::warning, Subject::of_line(l));
        w.detail("injections", c.plan->injections);
        w.text("kind", shelf_kind_name(*p));
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
std::vector<Finding> check_runs_dry(const SequenceCheckInput& c) {
    std::vector<Finding> out;
    const double margin = c.input->safety_margin_fraction;
    for (int l = 0; l < max_lines; ++l) {
        const LinePlan& lp = c.plan->lines[l];
        if (!lp.defined)
            continue;
        if (lp.runs_dry) {
            Finding w = make(FindingKind::runs_dry, Sev::warning, Subject::of_line(l));
            w.detail("margin_fraction", margin);
            w.detail("injections", c.plan->injections);
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
            Finding w = make(FindingKind::runs_low, Sev::caution, Subject::of_line(l));
            w.detail("margin_fraction", margin);
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

std::vector<Finding> check_waste_overflow(const SequenceCheckInput& c) {
    std::vector<Finding> out;
    if (!c.input->waste_capacity_ml)
        return out;
    const double cap = *c.input->waste_capacity_ml;
    const double waste = c.plan->waste_ml;
    if (waste > cap) {
        const auto t = c.plan->time_waste_reaches(cap);
        Finding w = make(FindingKind::waste_overflow, Sev::warning, Subject{});
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
        Finding w = make(FindingKind::waste_nearly_full, Sev::caution, Subject{});
        w.number("waste_ml", waste);
        w.number("capacity_ml", cap);
        out.push_back(w);
    }
    return out;
}

// (i) The pressure peak of each method run against the lower of the two limits.
std::optional<Finding> pressure_limit_warning(const std::string& method, const PressureTrace& tr) {
    if (!tr.limit || !(tr.max_pressure_bar >= 0.9 * tr.limit->bar))
        return std::nullopt;
    const bool over = tr.max_pressure_bar > tr.limit->bar;
    // An empty `method`: a one-method document (pressure, transfer), "The method" in words.
    Finding w = make(FindingKind::pressure_limit, over ? Sev::warning : Sev::caution,
                     Subject::of_method(method));
    for (int l = 0; l < max_lines; ++l)
        if (tr.inlet_percent_at_max[l] > 0)
            w.detail("line_percent_" + letter(l), tr.inlet_percent_at_max[l]);
    w.number("max_pressure_bar", tr.max_pressure_bar);
    w.number("limit_bar", tr.limit->bar);
    w.number("peak_t_min", tr.max_at_t_min);
    w.number("organic_fraction_v", tr.organic_fraction_v_at_max);
    w.text("method", method);
    w.text("limited_by", limit_source_name(tr.limit->source));
    return w;
}

std::vector<Finding> check_pressure_limit(const SequenceCheckInput& c) {
    std::vector<Finding> out;
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

} // namespace chem
