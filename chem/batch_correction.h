#pragma once
// What to do about a weighing outside its band: what to add so that every amount comes back
// within its band, or, when the vessel cannot take it, a remake.
//
// A weighed solid (or a poured liquid) cannot be taken back out. So:
//   - when a part is over its band, the whole batch is scaled up by s = (its actual / its target)
//     (the largest such ratio): every other part is topped up to s × its target where it would
//     otherwise fall outside the band around s × target, and the final volume becomes s × V;
//   - when parts are only under their bands (s = 1), the missing amount is added to each;
//   - parts not weighed yet are weighed at s × their target;
//   - when s × V is more than the vessel holds (container_ml), the batch cannot be corrected in
//     place: remake it.
// No Qt, no I/O. Amounts are in the unit of each check ("g" or "mL").
#include "chem/batch.h"

#include <optional>
#include <string>
#include <vector>

namespace chem {

struct CorrectionStep {
    std::string reagent;   ///< reagent or part id, as in the check
    std::string unit;      ///< "g" or "mL"
    double target = 0;     ///< the plan's amount, in unit
    double new_target = 0; ///< target × scale, in unit
    bool entered = false;  ///< an actual amount had been weighed
    double actual = 0;     ///< what was weighed, in unit (0 when not entered)
    /// What to add now, in unit: new_target − actual when the part would fall outside the band
    /// around new_target; 0 when it is within that band. For a part not weighed yet: new_target.
    double add = 0;
    /// The amount after the correction, in unit (actual + add).
    double after = 0;
};

struct Correction {
    bool needed = false;          ///< some entered amount lies outside its band
    bool remake = false;          ///< the scaled volume does not fit the container: remake
    double scale = 1;             ///< s ≥ 1
    double planned_volume_ml = 0; ///< V
    double final_volume_ml = 0;   ///< s × V: make up to this volume
    std::optional<double> container_ml;
    std::vector<CorrectionStep> steps; ///< one per check, in the checks' order
    // Worded by chem::describe and chem::remake_reason (chem/note_text.h), at render time.
};

/// The correction for `checks` (AmountCheck of evaluate_batch or check_amount) with the relative
/// tolerance `tolerance_fraction`, planned final volume `planned_volume_ml` (mL) and, when known,
/// the largest volume the vessel holds `container_ml` (mL). Throws
/// chem::Error("batch.container_ml") for a non-positive container, ("batch.final_volume_ml") for a
/// non-positive volume.
Correction suggest_correction(const std::vector<AmountCheck>& checks, double tolerance_fraction,
                              double planned_volume_ml, std::optional<double> container_ml);

} // namespace chem
