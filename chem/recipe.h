#pragma once
// The recipe designer: from a target pH, temperature, final volume and a preparation route, the
// amounts to weigh or pipette before making up to volume.
#include "chem/equilibrium.h"

#include <optional>
#include <string>
#include <vector>

namespace chem {

enum class Route {
    mix,      ///< acid form + conjugate-base form of one system, weighed or pipetted neat
    titrate,  ///< weigh one form, adjust with a titrant (strong acid or base) of given molarity
    stocks,   ///< acid form and base form from stock solutions of given molarity
};

struct RecipeRequest {
    double target_ph = 7;
    double temperature_c = 25;
    double volume_ml = 1000;          ///< final volume after making up with water
    Route route = Route::mix;
    // mix and stocks
    std::string acid;                 ///< reagent id of the acid form
    std::string base;                 ///< reagent id of the conjugate-base form
    double acid_stock_mol_per_l = 0;  ///< stocks route: molarity of the acid-form stock
    double base_stock_mol_per_l = 0;  ///< stocks route: molarity of the base-form stock
    // titrate
    std::string weigh;                ///< reagent id weighed (or pipetted) in
    std::string titrant;              ///< reagent id of the titrant (e.g. sodium-hydroxide)
    double titrant_mol_per_l = 0;     ///< molarity of the titrant solution
    /// Exactly one of these two: total concentration of the buffer system (mix, stocks: the
    /// shared system; titrate: the weighed reagent), or the ionic strength of the finished buffer.
    std::optional<double> concentration_mol_per_l;
    std::optional<double> ionic_strength_mol_per_l;
    /// Purity (mass fraction) overrides per reagent id; absent → the library's assay_fraction.
    std::vector<std::pair<std::string, double>> purity_overrides;
};

struct RecipeItem {
    std::string reagent;                 ///< reagent id
    std::optional<double> mass_g;        ///< solids (and liquids: mass of material as supplied)
    std::optional<double> volume_ml;     ///< liquids as supplied, or a stock / titrant solution
    double mol_per_l = 0;                ///< formula units per litre of final solution
    std::string as;                      ///< "solid", "liquid", "stock 0.2 mol/L", "titrant 1 mol/L"
};

struct Recipe {
    RecipeRequest request;
    std::vector<RecipeItem> items;
    std::vector<Component> composition;  ///< the solution as made, ready to feed back into solve()
    Speciation predicted;                ///< solve() of composition at the request's temperature
    std::vector<std::string> steps;      ///< in order
    std::vector<std::string> cautions;   ///< from the reagents' hazards; defers to the SDS and local rules
    std::vector<Warning> warnings;
};

/// Designs the recipe. Throws chem::Error naming the request field for bad input, and for an
/// unreachable target ("target_ph": "pH 9.00 cannot be reached by mixing acetic-acid and
/// sodium-acetate at 25 °C: the mix spans pH 2.9 to 8.3").
Recipe design_recipe(const Library& lib, const RecipeRequest& request);

} // namespace chem
