#include "chem/titration_curve.h"

#include "chem/error.h"

#include <algorithm>

namespace chem {

TitrationCurve titration_curve(const Library& lib, const TitrationCurveRequest& request) {
    TitrationCurve out;
    const bool titrant = request.route == CurveRoute::titrant;
    const Reagent* up_reagent = request.rising;
    const Reagent* down_reagent = titrant ? nullptr : request.falling;
    if (!up_reagent || request.points < 2)
        return out;
    double c_up = 0, c_down = 0;
    std::vector<Component> fixed;
    for (const Component& c : request.composition) {
        if (c.reagent == up_reagent)
            c_up += c.mol_per_l;
        else if (down_reagent && c.reagent == down_reagent)
            c_down += c.mol_per_l;
        else
            fixed.push_back(c);
    }
    const double total = c_up + c_down;
    double up_max = 0;
    if (titrant) {
        up_max = std::max(2.0 * c_up, 1e-4);
        out.x_end = up_max * request.x_per_mol_per_l;
        out.x_recipe = c_up * request.x_per_mol_per_l;
    } else {
        out.x_end = 1;
        out.x_recipe = total > 0 ? c_up / total : 0;
    }
    if (!(out.x_end > 0) || (!titrant && !(total > 0))) {
        out.x_end = 0;
        return out;
    }
    for (int i = 0; i < request.points; ++i) {
        const double f = double(i) / (request.points - 1);
        std::vector<Component> comps = fixed;
        const double up = titrant ? f * up_max : f * total;
        const double down = titrant ? 0 : (1 - f) * total;
        if (up > 0)
            comps.push_back({up_reagent, up});
        if (down > 0)
            comps.push_back({down_reagent, down});
        if (comps.empty())
            continue;
        try {
            const Speciation s = solve(lib, comps, request.temperature_c);
            out.points.push_back(
                {f * out.x_end, s.ph, s.buffer_capacity_mol_per_l, s.ionic_strength_mol_per_l});
        } catch (const Error&) {
            // a point the core refuses is left out, not invented
        }
    }
    return out;
}

} // namespace chem
