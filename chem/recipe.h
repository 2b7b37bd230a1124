#pragma once
// The recipe designer: from a target pH, temperature, final volume and a preparation route, the
// amounts to weigh or pipette before making up to volume.
#include "chem/equilibrium.h"
#include "chem/step.h"

#include <optional>
#include <string>
#include <vector>

namespace chem {

enum class Route {
    mix,     ///< acid form + conjugate-base form of one system, weighed or pipetted neat
    titrate, ///< weigh one form, adjust with a titrant (see titrant_fit) as a solution or neat
    stocks,  ///< acid form and base form from stock solutions of given molarity
};

/// What concentration_mol_per_l counts.
enum class ConcentrationBasis {
    /// The buffer system's total over all its forms ("20 mmol/L total phosphate"), whichever
    /// reagent brings it. The default of the mix and stocks routes.
    total,
    /// The reagent held at c, in formula units per litre, brought to the target pH by the other
    /// reagent, which adds what it brings on top ("10 mmol/L ammonium formate, brought to pH 3.00
    /// with formic acid"), as LC-MS methods are usually written. Titrate: the weighed reagent
    /// (the route's default, and its meaning before the basis was explicit); mix and stocks: the
    /// one of the pair that carries a counter-ion (the salt).
    salt,
};
const char* basis_name(ConcentrationBasis basis); ///< "total", "salt"
std::optional<ConcentrationBasis>
basis_from_name(const std::string& name);      ///< inverse; nullopt otherwise
ConcentrationBasis default_basis(Route route); ///< total for mix and stocks, salt for titrate

/// How the titrant of the titrate route is supplied.
enum class TitrantForm {
    solution, ///< a solution of titrant_mol_per_l, measured by volume
    neat,     ///< the liquid as supplied (library assay and density): a volume, with its mass
};
const char* titrant_form_name(TitrantForm form); ///< "solution", "neat"
std::optional<TitrantForm> titrant_form_from_name(const std::string& name);

/// What adding a titrant does to the pH of the weighed reagent's solution.
enum class PhDirection { lowers, raises };
const char* direction_name(PhDirection direction); ///< "lowers", "raises"

struct RecipeRequest {
    double target_ph = 7;
    double temperature_c = 25;
    double volume_ml = 1000; ///< final volume after making up with water
    Route route = Route::mix;
    // mix and stocks
    std::string acid;                ///< reagent id of the acid form
    std::string base;                ///< reagent id of the conjugate-base form
    double acid_stock_mol_per_l = 0; ///< stocks route: molarity of the acid-form stock
    double base_stock_mol_per_l = 0; ///< stocks route: molarity of the base-form stock
    // titrate
    std::string weigh;   ///< reagent id weighed (or pipetted) in
    std::string titrant; ///< reagent id of the titrant (e.g. sodium-hydroxide)
    TitrantForm titrant_form = TitrantForm::solution;
    double titrant_mol_per_l = 0; ///< molarity of the titrant solution; 0 for a neat titrant
    /// Exactly one of these two: total concentration of the buffer system (mix, stocks: the
    /// shared system; titrate: the weighed reagent), or the ionic strength of the finished buffer.
    std::optional<double> concentration_mol_per_l;
    std::optional<double> ionic_strength_mol_per_l;
    /// What concentration_mol_per_l counts (and, for an ionic-strength target, what the search
    /// varies); absent → default_basis(route).
    std::optional<ConcentrationBasis> basis;
    /// Activity coefficients of the prediction and of every search (Davies by default).
    ActivityModel activity_model = ActivityModel::davies;
    /// Purity (mass fraction) overrides per reagent id; absent → the library's assay_fraction.
    std::vector<std::pair<std::string, double>> purity_overrides;
};

/// The mass fraction of `r` this request uses: its purity override, else the library's
/// assay_fraction (0–1).
double purity_of(const RecipeRequest& req, const Reagent& r);

/// How a recipe item is measured.
enum class ItemKind {
    solid,            ///< weighed
    liquid,           ///< pipetted as supplied (volume, with its mass)
    stock,            ///< pipetted from a stock solution of the request's molarity
    titrant_solution, ///< added until the meter reads the target; a solution of titrant_mol_per_l
    titrant_neat,     ///< added until the meter reads the target; the liquid as supplied
};
/// "solid", "liquid", "stock", "titrant", "titrant, neat": the kind in words for the contract
/// (item_as_text adds a solution's molarity).
const char* item_kind_name(ItemKind kind);
/// A titrant, as a solution or neat (added until the meter reads the target).
inline bool is_titrant(ItemKind kind) {
    return kind == ItemKind::titrant_solution || kind == ItemKind::titrant_neat;
}

struct RecipeItem {
    std::string reagent; ///< reagent id
    ItemKind kind = ItemKind::solid;
    std::optional<double> mass_g;    ///< solids (and liquids: mass of material as supplied)
    std::optional<double> volume_ml; ///< liquids as supplied, or a stock / titrant solution
    double mol_per_l = 0;            ///< formula units per litre of final solution
    /// The molarity of the stock or titrant solution measured, mol/L (stock and
    /// titrant_solution only; 0 otherwise).
    double solution_mol_per_l = 0;
};
/// The item's kind in words for the contract ("as"): "solid", "liquid", "stock 0.2 mol/L",
/// "titrant 1 mol/L", "titrant, neat".
std::string item_as_text(const RecipeItem& item);

/// One family of species in the solution as made, summed over its forms: an acid-base system
/// (all formate: HCOOH + HCOO−) or a spectator ion (Na+).
struct FamilyTotal {
    enum class Kind { system, ion };
    Kind kind = Kind::system;
    std::string id;       ///< system id ("formate") or ion ("Na+")
    std::string name;     ///< in words for the screen: "formate", "ammonium", "sodium"
    double mol_per_l = 0; ///< per litre of final solution
};

/// The concentration basis of a designed recipe, resolved and in words.
struct BasisStatement {
    ConcentrationBasis basis = ConcentrationBasis::total;
    std::string system; ///< id of the buffer system c refers to (total) or that is adjusted (salt)
    std::string held_reagent; ///< salt basis: the reagent at c; "" for total
    std::string
        adjusting_reagent; ///< what brings the pH to target: the titrant or the partner form
    double concentration_mol_per_l = 0; ///< c, as given or as found for an ionic-strength target
    /// One sentence for the screen and the sheet: "20 mmol/L total phosphate";
    /// "10 mmol/L ammonium formate, brought to pH 3.00 with formic acid: formate 67.2 mmol/L in
    /// all".
    std::string text;
};

struct Recipe {
    RecipeRequest request;
    std::vector<RecipeItem> items;
    std::vector<Component> composition; ///< the solution as made, ready to feed back into solve()
    Speciation predicted;               ///< solve() of composition at the request's temperature
    std::vector<Step> steps;            ///< in bench order
    std::vector<std::string>
        cautions; ///< from the reagents' hazards; defers to the SDS and local rules
    std::vector<Warning> warnings;
    BasisStatement basis;
    /// Every system and spectator ion of the solution as made: the buffer system first, then the
    /// other systems, then the ions; so the screen can show either reading of "10 mM".
    std::vector<FamilyTotal> totals;
};

/// Designs the recipe. Throws chem::Error naming the request field for bad input, and for an
/// unreachable target ("target_ph": "pH 9.00 cannot be reached by mixing acetic-acid and
/// sodium-acetate at 25 °C: the mix spans pH 2.9 to 8.3").
/// Titrate route: "titrant" for a titrant that does not fit the weighed reagent (titrant_fit),
/// "titrant_form" for a neat solid, "titrant_mol_per_l" for a molarity given with a neat titrant.
/// Salt basis in mix or stocks: "concentration_basis" unless exactly one of the pair is a salt.
Recipe design_recipe(const Library& lib, const RecipeRequest& request);

/// How a titrant fits a weighed reagent.
struct TitrantFit {
    PhDirection direction = PhDirection::lowers;
    /// The acid-base system the titrant shares with the weighed reagent ("formate"); "" for a
    /// strong acid or base.
    std::string shared_system;
};
/// A titrant fits when it shares an acid-base system with the weighed reagent and carries more
/// protons (lowers the pH) or fewer (raises it) in every system they share (formic acid or
/// ammonia for ammonium formate, phosphoric acid for KH2PO4), or when it is a strong acid or base:
/// no system of its own (HCl, NaOH), or an acid whose every pKa at 25 °C is below 1 (TFA; fully
/// dissociated across the buffer range, common practice, no source). std::nullopt otherwise
/// (acetic acid for ammonium formate, or the weighed reagent itself).
std::optional<TitrantFit> titrant_fit(const Library& lib, const Reagent& weighed,
                                      const Reagent& titrant);

} // namespace chem
