#pragma once
// JSON <-> chem types for the command-line contract (field names are fixed: extend, rename
// nothing).
#include "chem/equilibrium.h"
#include "chem/recipe.h"
#include "chem/recipe_roles.h"

#include <QJsonObject>

#include <string>

namespace phaseplan {

QJsonObject warning_to_json(const chem::Warning& w);
QJsonArray warnings_to_json(const std::vector<chem::Warning>& ws);

/// {"temperature_c": 25, "components": [{"reagent": id, "mol_per_l": c}]} -> components.
/// Throws chem::Error naming the field (unknown reagent ids list the nearest known ids).
std::vector<chem::Component> components_from_json(const chem::Library& lib, const QJsonObject& doc,
                                                  const std::string& parent, double* temperature_c);
QJsonObject speciation_to_json(const chem::Speciation& s);

/// The optional "activity_model" of a document ("davies", "sit" or "truesdell-jones"); Davies when
/// absent. Throws chem::Error naming parent.activity_model for any other value.
chem::ActivityModel activity_model_from_json(const QJsonObject& doc, const std::string& parent);

/// A recipe document (see README "recipe") -> request. Throws chem::Error naming the field.
chem::RecipeRequest recipe_request_from_json(const chem::Library& lib, const QJsonObject& doc,
                                             const std::string& parent);
QJsonObject recipe_to_json(const chem::Recipe& r);

/// The pickers' lists as JSON, for the app's models: {"acid_forms": [{reagent, name, formula,
/// form, protons_removed_per_unit, salt, direction?, strong?}], "base_forms", "salts",
/// "weighable", "titrants"}.
QJsonObject role_choices_to_json(const chem::RoleChoices& choices);
/// A route change as JSON: {acid, base, weigh, titrant, titrant_form, concentration_basis,
/// notes: [{field, message}], complete}.
/// The notes worded by chem::describe(note, lib).
QJsonObject route_change_to_json(const chem::RouteChange& change, const chem::Library& lib);

} // namespace phaseplan
