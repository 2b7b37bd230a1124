#pragma once
// The buffer designer's curves: the pH of the recipe's solution as its base form replaces its
// acid form (mix and stocks), or as titrant is added (titrate), and the buffer capacity β at
// each point. Each point is one charge-balance solve (chem::solve, Davies) of the recipe's
// composition with the varied reagent(s) set for that point; the other components stay as the
// recipe has them.
#include "chem/equilibrium.h"
#include "chem/reagent.h"

#include <vector>

namespace chem {

enum class CurveRoute {
    base_fraction, ///< mix, stocks: x = base form / (acid + base form), 0 → 1, total held
    titrant,       ///< titrate: x = titrant added (mL or g), 0 → twice the recipe's amount
};

struct TitrationCurveRequest {
    CurveRoute route = CurveRoute::base_fraction;
    /// The recipe's solution, every component (Recipe::composition), in mol/L of final solution.
    std::vector<Component> composition;
    /// The reagent whose share grows along x: the base form (base_fraction) or the titrant.
    const Reagent* rising = nullptr;
    /// base_fraction: the acid form, whose share shrinks; unused for titrant.
    const Reagent* falling = nullptr;
    /// titrant: x units (mL or g of titrant as supplied) per mol/L of titrant in the final
    /// solution; the x axis is the titrant's amount times this.
    double x_per_mol_per_l = 0;
    double temperature_c = 25;
    int points = 41; ///< ≥ 2, evenly spaced in x
};

struct TitrationPoint {
    double x = 0;                         ///< base fraction (0–1), or titrant in mL or g
    double ph = 0;                        ///< activity scale
    double buffer_capacity_mol_per_l = 0; ///< β in mol/L per pH unit
    double ionic_strength_mol_per_l = 0;
};

struct TitrationCurve {
    /// Ascending x. A point the solver refuses (chem::Error) is left out, not invented.
    std::vector<TitrationPoint> points;
    /// x at the last point; 0 when there is no curve (no titrant scale, nothing to vary).
    double x_end = 0;
    double x_recipe = 0; ///< the recipe's own x
};

/// The curve of `request` (see the header comment). Titrant: from none to twice the recipe's
/// titrant (at least 1e-4 mol/L). Base fraction: the recipe's acid + base total held, from all
/// acid form to all base form.
TitrationCurve titration_curve(const Library& lib, const TitrationCurveRequest& request);

} // namespace chem
