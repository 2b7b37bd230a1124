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
            line_title(c, l) + " (" + shelf_kind_name(*p) + ", shelf life " +
            fmt(p->shelf_life_h, 0) + " h, a lab-set default) " +
            (known ? "was prepared at " + c.clock(prepared)
                   : "even if prepared at the start, " + c.clock(0)) +
            ", and " +
            (already ? "is past its shelf life before the sequence starts."
                     : "passes its shelf life at " + c.clock(expires) + ", during injection " +
                           std::to_string(c.plan->injection_at(expires)) + " of " +
                           std::to_string(c.plan->injections) + ".") +
            " Prepare it fresh.";
        CheckWarning w = make("shelf-life", Sev::warning, letter(l), msg);
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

} // namespace chem
