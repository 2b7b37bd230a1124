#pragma once
// The bottles' levels and the waste container's fill through the night, for the plan's chart.
//
// A bottle starts full, loses its priming at once (hour 0), then each sequence row's volume by
// the end of that row. Within a row every injection draws the same volume in the same time, so
// the straight line between row ends is exact at every injection boundary. A standby after the
// last injection ends at the totals (bottle − required, all the waste). The waste container
// gains what the bottles lose. Times are hours from the sequence start (chem/ has no clock: the
// app converts its clock times before calling).
#include "chem/sequence.h"

#include <array>
#include <optional>
#include <vector>

namespace chem {

/// One point of a level curve.
struct LevelPoint {
    double hours = 0; ///< from the sequence start
    double ml = 0;    ///< volume in the bottle (may go below 0: drawn past empty) or in the waste
};

/// One defined line's bottle.
struct BottleLevelLine {
    double bottle_ml = 0;   ///< volume on hand at the start
    double residue_ml = 0;  ///< unusable below the inlet filter (the run-dry point's level)
    double prime_ml = 0;    ///< purged at hour 0
    double required_ml = 0; ///< prime + everything pumped, standby included
    /// When the bottle runs dry, in hours from the start; absent when it lasts (or the time is
    /// unknown). A time before the start draws no point.
    std::optional<double> dry_at_hours;
};

/// One sequence row's draw.
struct BottleLevelRow {
    double end_hours = 0;   ///< the row's end; a row that ends before the start is left out
    LineValues volume_ml{}; ///< drawn from each line over the row
};

struct BottleLevelsInput {
    std::array<std::optional<BottleLevelLine>, max_lines> lines; ///< defined lines, A..D
    std::vector<BottleLevelRow> rows;
    /// End of the standby after the last injection, hours from the start; absent: no standby.
    std::optional<double> standby_end_hours;
    double waste_ml = 0;          ///< everything to waste (priming + pumped): the standby's end
    double waste_capacity_ml = 0; ///< free volume of the waste container (0: not checked)
};

struct BottleLevels {
    std::array<std::vector<LevelPoint>, max_lines> level; ///< per line; empty for undefined lines
    std::array<std::optional<LevelPoint>, max_lines> dry; ///< (dry time, residue) per line
    std::vector<LevelPoint> waste;
    double chart_hours = 1;    ///< whole hours ≥ 1 covering every level point
    double chart_max_ml = 100; ///< ≥ 100 mL, every bottle, every waste point and the capacity
};

/// The level curves of `in` as described at the top of this header.
BottleLevels bottle_levels(const BottleLevelsInput& in);

} // namespace chem
