#include "chem/bottle_levels.h"

#include <algorithm>
#include <cmath>

namespace chem {

BottleLevels bottle_levels(const BottleLevelsInput& in) {
    BottleLevels out;
    LineValues level{};
    double waste_ml = 0;
    for (int l = 0; l < max_lines; ++l) {
        if (!in.lines[l])
            continue;
        const BottleLevelLine& b = *in.lines[l];
        level[l] = b.bottle_ml - b.prime_ml;
        waste_ml += b.bottle_ml - level[l];
        out.level[l].push_back({0, level[l]});
        out.chart_max_ml = std::max(out.chart_max_ml, b.bottle_ml);
    }
    out.waste.push_back({0, waste_ml});
    for (const BottleLevelRow& row : in.rows) {
        if (row.end_hours < 0)
            continue;
        for (int l = 0; l < max_lines; ++l) {
            if (!in.lines[l])
                continue;
            level[l] -= row.volume_ml[l];
            waste_ml += row.volume_ml[l];
            out.level[l].push_back({row.end_hours, level[l]});
        }
        out.waste.push_back({row.end_hours, waste_ml});
    }
    if (in.standby_end_hours) {
        for (int l = 0; l < max_lines; ++l)
            if (in.lines[l])
                out.level[l].push_back(
                    {*in.standby_end_hours, in.lines[l]->bottle_ml - in.lines[l]->required_ml});
        out.waste.push_back({*in.standby_end_hours, in.waste_ml});
    }
    for (int l = 0; l < max_lines; ++l)
        if (in.lines[l] && in.lines[l]->dry_at_hours && *in.lines[l]->dry_at_hours >= 0)
            out.dry[l] = LevelPoint{*in.lines[l]->dry_at_hours, in.lines[l]->residue_ml};
    for (const LevelPoint& p : out.waste)
        out.chart_max_ml = std::max(out.chart_max_ml, p.ml);
    out.chart_max_ml = std::max(out.chart_max_ml, in.waste_capacity_ml);
    double last_hours = 0;
    for (const auto& pts : out.level)
        if (!pts.empty())
            last_hours = std::max(last_hours, pts.back().hours);
    out.chart_hours = std::max(1.0, std::ceil(last_hours));
    return out;
}

} // namespace chem
