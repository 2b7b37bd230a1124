#include "chem/titration_curve.h"

#include "chem/equilibrium_detail.h"
#include "chem/error.h"
#include "chem/units.h"

#include <algorithm>
#include <cmath>

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
    // One problem for the whole curve: the fixed components, then the rising and the falling
    // reagent, whose amounts change from point to point (Problem::set_amounts). Each point starts
    // from its neighbour's solution (solve_state_near), as a gradient trace does. Built with
    // placeholder amounts; a curve the solver refuses outright (the temperature) has no points.
    std::vector<Component> comps = fixed;
    const std::size_t up_at = comps.size();
    comps.push_back({up_reagent, 1e-3});
    const std::size_t down_at = comps.size();
    if (down_reagent)
        comps.push_back({down_reagent, 1e-3});
    detail::Problem p;
    try {
        p = detail::build_problem(lib, comps, request.temperature_c);
    } catch (const Error&) {
        return out; // every point would be refused: none is invented
    }
    std::vector<double> amounts(comps.size(), 0.0);
    for (std::size_t k = 0; k < fixed.size(); ++k)
        amounts[k] = fixed[k].mol_per_l;
    detail::State previous;
    bool have_previous = false;
    for (int i = 0; i < request.points; ++i) {
        const double f = double(i) / (request.points - 1);
        const double up = titrant ? f * up_max : f * total;
        const double down = titrant ? 0 : (1 - f) * total;
        if (fixed.empty() && !(up > 0) && !(down > 0))
            continue; // nothing in the flask
        // The same limits a solve of these components would apply (chem::solve refuses them).
        if (up > max_concentration_mol_per_l || down > max_concentration_mol_per_l)
            continue;
        amounts[up_at] = up;
        if (down_reagent)
            amounts[down_at] = down;
        try {
            p.set_amounts(amounts);
            const detail::State st =
                have_previous ? detail::solve_state_near(p, previous) : detail::solve_state(p);
            const Speciation s = detail::report(p, st);
            out.points.push_back(
                {f * out.x_end, s.ph, s.buffer_capacity_mol_per_l, s.ionic_strength_mol_per_l});
            previous = st;
            have_previous = true;
        } catch (const Error&) {
            // a point the core refuses is left out, not invented
            have_previous = false;
        }
    }
    return out;
}

} // namespace chem
