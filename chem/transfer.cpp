#include "chem/transfer.h"

#include "chem/error.h"
#include "chem/finding_text.h"

#include <cmath>

namespace chem {

namespace {

/// A finding about the moved method (the one method of the document).
Finding about_method(FindingKind kind, Severity severity) {
    Finding f;
    f.kind = kind;
    f.severity = severity;
    f.subject = Subject::of_method("");
    return f;
}

} // namespace

TransferResult transfer_method(const TransferRequest& r) {
    validate_column(r.from.column);
    validate_column(r.to.column);
    validate_method(r.method, {true, true, true, true});
    if (r.injection_ul)
        require_positive(*r.injection_ul, 1e4, "injection_ul", "µL");
    if (r.sequence_injections < 1 || r.sequence_injections > 1000000)
        throw Error("sequence_injections",
                    std::to_string(r.sequence_injections) + " is outside 1 to 1000000 injections");
    if (r.to.flow_ml_min)
        require_positive(*r.to.flow_ml_min, 100, "to.flow_ml_min", "mL/min");
    for (const auto* c : {&r.from, &r.to})
        if (c->dwell_ml)
            require_range(*c->dwell_ml, 0, 100, c->column.field + ".dwell_ml", "mL");

    const Column& c1 = r.from.column;
    const Column& c2 = r.to.column;
    const double f1 = r.method.flow_ml_min;
    const double area_ratio = (c2.id_mm * c2.id_mm) / (c1.id_mm * c1.id_mm);
    const double volume_ratio = area_ratio * c2.length_mm / c1.length_mm;

    TransferResult out;
    out.scaled_flow_ml_min = f1 * area_ratio * c1.particle_um / c2.particle_um;
    out.flow_ml_min = r.to.flow_ml_min.value_or(out.scaled_flow_ml_min);
    out.time_factor = (f1 / out.flow_ml_min) * volume_ratio;
    if (r.injection_ul)
        out.injection_ul = *r.injection_ul * volume_ratio;
    out.l_over_dp_change = (c2.length_mm / c2.particle_um) / (c1.length_mm / c1.particle_um) - 1.0;
    // The band −25 % to +50 %, with a little room for rounding.
    out.within_allowed_adjustment =
        out.l_over_dp_change >= -0.25 - 1e-9 && out.l_over_dp_change <= 0.50 + 1e-9;
    out.plates_from = plates_estimate(c1);
    out.plates_to = plates_estimate(c2);

    Method m = r.method;
    m.flow_ml_min = out.flow_ml_min;
    for (GradientRow& g : m.gradient)
        g.t_min *= out.time_factor;
    m.run_min *= out.time_factor;
    m.equilibration_min *= out.time_factor;

    if (r.from.dwell_ml && r.to.dwell_ml) {
        const double hold =
            (*r.from.dwell_ml / f1) * out.time_factor - *r.to.dwell_ml / out.flow_ml_min;
        if (hold > 1e-9) {
            // Shift every row after the first; the first row's composition holds meanwhile.
            const bool starts_at_zero = m.gradient.front().t_min <= 0;
            for (std::size_t i = starts_at_zero ? 1 : 0; i < m.gradient.size(); ++i)
                m.gradient[i].t_min += hold;
            m.run_min += hold;
            out.hold_added_min = hold;
        } else if (hold < -1e-9) {
            Finding f = about_method(FindingKind::dwell_too_large, Severity::caution);
            f.number("delay_min", -hold);
            out.warnings.push_back(warning_of(std::move(f)));
        }
    }

    out.solvent_from_ml = f1 * r.method.injection_min();
    out.solvent_to_ml = out.flow_ml_min * m.injection_min();
    out.solvent_from_sequence_ml = out.solvent_from_ml * r.sequence_injections;
    out.solvent_to_sequence_ml = out.solvent_to_ml * r.sequence_injections;
    out.saving_fraction = 1.0 - out.solvent_to_ml / out.solvent_from_ml;
    out.method = std::move(m);

    if (!out.within_allowed_adjustment) {
        Finding f = about_method(FindingKind::outside_allowed_adjustment, Severity::warning);
        f.number("l_over_dp_change", out.l_over_dp_change);
        out.warnings.push_back(warning_of(std::move(f)));
    }
    if (r.to.flow_ml_min) {
        const double off = *r.to.flow_ml_min / out.scaled_flow_ml_min - 1.0;
        if (std::abs(off) > 0.005) {
            Finding f = about_method(FindingKind::flow_not_scaled, Severity::info);
            f.number("flow_ml_min", *r.to.flow_ml_min);
            f.number("scaled_flow_ml_min", out.scaled_flow_ml_min);
            f.number("deviation_fraction", off);
            out.warnings.push_back(warning_of(std::move(f)));
        }
    }
    if (out.injection_ul && *out.injection_ul < 0.5) {
        Finding f = about_method(FindingKind::small_injection, Severity::caution);
        f.number("injection_ul", *out.injection_ul);
        out.warnings.push_back(warning_of(std::move(f)));
    }
    return out;
}

} // namespace chem
