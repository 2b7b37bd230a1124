#pragma once
// Moving a gradient method to another column by the geometric rules of USP <621>
// (Chromatography, harmonised standard, official 1 December 2022), "allowed adjustments":
//   flow       F₂ = F₁ · (d_c2² · d_p1) / (d_c1² · d_p2)      (constant reduced velocity;
//                                                               d_c² alone if d_p is unchanged)
//   times      t₂ = t₁ · (F₁/F₂) · (L₂ d_c2²) / (L₁ d_c1²)    (gradient table, run,
//   re-equilibration) injection  V₂ = V₁ · (L₂ d_c2²) / (L₁ d_c1²) L/d_p      may change by −25 %
//   to +50 % within the allowed adjustments.
// Optional dwell-volume correction: the gradient's delay is kept in column volumes by an initial
// isocratic hold on the new system, t_hold = (V_D1/F₁)·k_t − V_D2/F₂ (k_t the time factor);
// when that is negative, the new system's dwell is too large to hide and a warning says so.
// (Formulas as recalled from the standard, from memory.)
#include "chem/equilibrium.h"
#include "chem/pressure.h"
#include "chem/sequence.h"

#include <optional>
#include <vector>

namespace chem {

struct TransferColumn {
    Column column;                     ///< length, i.d., particle size (and for the pressure)
    std::optional<double> flow_ml_min; ///< to: the flow chosen; default the scaled flow
    std::optional<double> dwell_ml;    ///< the dwell volume of the system it runs on
};

struct TransferRequest {
    Method method;
    TransferColumn from, to;
    std::optional<double> injection_ul; ///< on the original column
    int sequence_injections = 1;        ///< for the per-sequence volumes
};

struct TransferResult {
    Method method;                      ///< on the new column (same name)
    double flow_ml_min = 0;             ///< the new flow
    double scaled_flow_ml_min = 0;      ///< the flow by the rule (before any chosen flow)
    double time_factor = 0;             ///< k_t
    std::optional<double> injection_ul; ///< on the new column
    double hold_added_min = 0;          ///< initial isocratic hold from the dwell correction
    double solvent_from_ml = 0;         ///< per injection, re-equilibration included
    double solvent_to_ml = 0;
    double solvent_from_sequence_ml = 0; ///< × sequence_injections
    double solvent_to_sequence_ml = 0;
    double saving_fraction = 0;  ///< 1 − to/from
    double l_over_dp_change = 0; ///< (L₂/d_p2)/(L₁/d_p1) − 1
    bool within_allowed_adjustment = false;
    double plates_from = 0, plates_to = 0; ///< N ≈ 3000 L(cm)/d_p(µm) (common practice)
    std::vector<Warning> warnings;
};

/// Validates (fields "from.length_mm", "to.flow_ml_min", "injection_ul",
/// "sequence_injections", "method.…") and scales. Throws chem::Error.
TransferResult transfer_method(const TransferRequest& r);

} // namespace chem
