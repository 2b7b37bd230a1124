#pragma once
// The reagents that fit each role of a recipe (for the buffer screen's pickers), the mapping of
// the chosen reagents when the route changes, and the words for a buffer: its default name and
// the names of reagents, systems and ions in sentences. Pure functions of the library and the
// inputs; no Qt.
#include "chem/recipe.h"

#include <optional>
#include <string>
#include <vector>

namespace chem {

/// One reagent offered for a role.
struct RoleChoice {
    std::string reagent; ///< id
    std::string name;    ///< as in the library ("Formic acid 98 %")
    std::string formula; ///< as in the library ("HCOOH")
    PhysicalForm form = PhysicalForm::solid;
    /// Protons removed per unit of the system, from its fully protonated form: orders the forms
    /// from the most acidic (phosphoric acid 0, KH2PO4 1, K2HPO4 2). 0 for a strong titrant.
    double protons_removed_per_unit = 0;
    bool salt = false; ///< carries a counter-ion (a spectator ion or a second system)
    /// Titrants: what adding it does to the weighed reagent's pH.
    std::optional<PhDirection> direction;
    /// Titrants: true for a strong acid or base, false for a form of the weighed reagent's system.
    bool strong = false;
};

/// The reagents that fit each role of one route, for one acid-base system. Roles the route does
/// not use stay empty.
struct RoleChoices {
    std::vector<RoleChoice>
        acid_forms; ///< mix, stocks: forms with a more basic partner in the system
    /// mix, stocks: forms with a more acidic partner; only those more basic than `acid`, when given
    std::vector<RoleChoice> base_forms;
    std::vector<RoleChoice> salts; ///< mix, stocks: forms that can be held at c on the salt basis
    std::vector<RoleChoice> weighable; ///< titrate: every reagent of the system
    /// titrate: the titrants that fit `weigh` (titrant_fit), system forms first, then strong
    /// acids and bases; empty while no weighed reagent is chosen.
    std::vector<RoleChoice> titrants;
};

/// @param system the acid-base system id chosen on the screen ("formate"); an unknown id gives
///               empty lists, never an error (the screen may hold a half-typed state).
/// @param acid   mix and stocks: the chosen acid form, narrowing base_forms ("" = no narrowing)
/// @param weigh  titrate: the chosen weighed reagent, which the titrants must fit ("" = none)
RoleChoices reagent_choices(const Library& lib, const std::string& system, Route route,
                            const std::string& acid = {}, const std::string& weigh = {});

/// The reagent inputs of a buffer, as the screen holds them across routes.
struct RouteReagents {
    std::string acid, base;     ///< mix, stocks
    std::string weigh, titrant; ///< titrate
    TitrantForm titrant_form = TitrantForm::solution;
    ConcentrationBasis basis = ConcentrationBasis::total;
};

/// What a route-change note says, one value per wording (chem/note_text.h words it).
enum class RouteNoteKind {
    no_pair_to_carry,        ///< mix → titrate without a complete pair: choose the `field`
    weighed_with_partner,    ///< `weighed` is weighed and `partner` titrates it (`titrant_form`)
    partner_cannot_titrate,  ///< `partner` cannot bring `weighed` to pH: nothing substituted
    no_weighed_reagent,      ///< titrate → mix or stocks without a weighed reagent
    strong_titrant_replaced, ///< strong `titrant`: the `to` route uses `partner`, of `system`
    no_form_made_with,       ///< no form of `system` made with `titrant` (`direction` it moves)
    titrant_not_a_form,      ///< the titrant is not a form of `system`: choose the `field` form
    salt_basis_dropped,      ///< `acid` and `base` are not one salt and its partner: total basis
};

/// Something the screen should tell the user about a route change, beside the field it names
/// ("weigh", "titrant", "acid", "base", "concentration_basis"). Data only: the reagents and the
/// system as ids; describe(note, lib) (chem/note_text.h) makes the sentence.
struct RouteNote {
    std::string field;
    RouteNoteKind kind = RouteNoteKind::no_pair_to_carry;
    std::string weighed, partner, titrant; ///< reagent ids, as the kind uses them
    std::string acid, base;                ///< salt_basis_dropped: the pair's reagent ids
    std::string system;                    ///< an acid-base system id
    TitrantForm titrant_form = TitrantForm::solution; ///< weighed_with_partner
    PhDirection direction = PhDirection::raises;      ///< no_form_made_with: the titrant's
    Route to = Route::mix;                            ///< strong_titrant_replaced: mix or stocks
};

struct RouteChange {
    RouteReagents reagents;       ///< for the new route; a role is "" when nothing fits it
    std::vector<RouteNote> notes; ///< each role that was derived, replaced or left empty
    bool complete = false;        ///< every reagent role of the new route is filled
};

/// Maps the current reagents to another route without swapping one for an unrelated reagent:
/// - mix or stocks → titrate: the salt of the pair is weighed and its partner becomes the
///   titrant (ammonium formate + formic acid → weigh ammonium formate, titrant formic acid, neat
///   when the partner is a liquid); with two salts, the acid form is weighed.
/// - titrate → mix or stocks: a titrant of the weighed reagent's system becomes its partner; a
///   strong titrant is replaced by the form of the system that carries its ion (KOH on KH2PO4 →
///   K2HPO4; HCl on Tris → Tris hydrochloride), and a note says so; when no such form exists the
///   role is left empty and a note says that nothing fits — never a substitute.
/// - mix ↔ stocks keep acid and base.
/// The basis is kept when the new route can use it; otherwise a note says why it changes.
/// @param system the screen's system id, used to find a partner for a strong titrant.
RouteChange map_reagents_to_route(const Library& lib, const std::string& system, Route from,
                                  Route to, const RouteReagents& current);

/// The name a buffer shows until the user names it, from its inputs alone (no design):
/// "20 mM sodium phosphate pH 2.5", "10 mM ammonium formate pH 3.0 (salt basis)",
/// "Sodium acetate pH 4.8, I = 50 mM". "(salt basis)" appears only where the two bases differ
/// (the other reagent adds to the buffer system). Never throws: an unknown id falls back to the
/// words it can find ("20 mM buffer pH 7.0").
std::string default_buffer_name(const Library& lib, const RecipeRequest& request);

/// The concentration for the basis sentence: "20 mmol/L", "1.48 mmol/L", "1.5 mol/L"
/// (three significant figures, trailing zeros dropped). @param mol_per_l concentration.
std::string concentration_text(double mol_per_l);

/// A reagent's name for a sentence: the library name without its grade or remark, first letter
/// in lower case unless it starts an abbreviation ("Formic acid 98 %" → "formic acid",
/// "Sodium tetraborate decahydrate (borax)" → "sodium tetraborate decahydrate").
std::string reagent_words(const Reagent& reagent);
/// A system's name for a sentence: "Phosphate (H3PO4 / …)" → "phosphate".
std::string system_words(const AcidBaseSystem& system);
/// An ion in words: "Na+" → "sodium", "Cl-" → "chloride"; other ions as written.
std::string ion_words(const std::string& ion);

/// The reagent of a mix or stocks pair that carries a counter-ion (a spectator ion or a second
/// acid-base system), i.e. the salt held at c on the salt basis; nullptr when both or neither do.
const Reagent* salt_of_pair(const Reagent& acid, const Reagent& base, const std::string& system);

/// The acid-base system a request's concentration refers to: mix and stocks, the system the
/// pair shares (base form with fewer protons); titrate, the system the titrant shares with the
/// weighed reagent, or for a strong titrant the weighed reagent's system with the pKa nearest
/// the target. nullptr when the inputs do not say (unknown ids, no shared system).
const AcidBaseSystem* buffer_system(const Library& lib, const RecipeRequest& request);

/// The families of a composition, summed over their forms: systems (`first_system` first, then
/// in order of appearance) and then spectator ions. @return mol/L of final solution per family.
std::vector<FamilyTotal> family_totals(const Library& lib,
                                       const std::vector<Component>& composition,
                                       const std::string& first_system);

/// The basis of a designed recipe in words, from its request and its `totals` (fill those
/// first): which system, which reagent is held at c and which brings the pH, and the sentence.
BasisStatement basis_statement(const Library& lib, const Recipe& recipe);

} // namespace chem
