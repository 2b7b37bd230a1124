#include "chem/batch_correction.h"

#include "chem/error.h"
#include "chem/units.h"

#include <algorithm>
#include <cmath>

namespace chem {

namespace {

/// The same edge rule as check_amount: an amount typed exactly at the band's edge is inside.
bool within(double actual, double target, double tol) {
    if (target <= 0)
        return true;
    return std::abs(actual / target - 1) <= tol * (1 + 1e-9) + 1e-12;
}

} // namespace

Correction suggest_correction(const std::vector<AmountCheck>& checks, double tol,
                              double planned_volume_ml, std::optional<double> container_ml) {
    if (!std::isfinite(planned_volume_ml) || planned_volume_ml <= 0)
        throw Error("batch.final_volume_ml",
                    format_number(planned_volume_ml) + " is not a positive volume");
    if (container_ml && (!std::isfinite(*container_ml) || *container_ml <= 0))
        throw Error("batch.container_ml",
                    format_number(*container_ml) + " is not a positive volume");

    Correction out;
    out.planned_volume_ml = planned_volume_ml;
    out.container_ml = container_ml;
    double scale = 1;
    for (const AmountCheck& c : checks) {
        if (!c.entered || c.target <= 0)
            continue;
        if (!within(c.actual, c.target, tol))
            out.needed = true;
        // Over the band: everything else follows this part up.
        if (c.actual > c.target && !within(c.actual, c.target, tol))
            scale = std::max(scale, c.actual / c.target);
    }
    out.scale = scale;
    out.final_volume_ml = planned_volume_ml * scale;
    for (const AmountCheck& c : checks) {
        CorrectionStep s;
        s.reagent = c.reagent;
        s.unit = c.unit;
        s.target = c.target;
        s.new_target = c.target * scale;
        s.entered = c.entered;
        s.actual = c.entered ? c.actual : 0;
        if (!c.entered)
            s.add = s.new_target;
        else if (!within(c.actual, s.new_target, tol))
            s.add = std::max(0.0, s.new_target - c.actual);
        s.after = s.actual + s.add;
        out.steps.push_back(s);
    }
    if (out.needed && container_ml && out.final_volume_ml > *container_ml * (1 + 1e-12))
        out.remake = true;
    return out;
}

} // namespace chem
