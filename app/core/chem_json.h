#pragma once
// JSON <-> chem types for the command-line contract (field names are fixed: extend, rename nothing).
#include "chem/equilibrium.h"
#include "chem/recipe.h"

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

/// A recipe document (see README "recipe") -> request. Throws chem::Error naming the field.
chem::RecipeRequest recipe_request_from_json(const chem::Library& lib, const QJsonObject& doc,
                                             const std::string& parent);
QJsonObject recipe_to_json(const chem::Recipe& r);

} // namespace phaseplan
