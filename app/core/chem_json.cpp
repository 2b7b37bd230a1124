#include "core/chem_json.h"

#include "chem/error.h"
#include "chem/note_text.h"
#include "chem/recipe_roles.h"
#include "core/json_util.h"

#include <QJsonArray>

namespace phaseplan {

QJsonObject warning_to_json(const chem::Warning& w) {
    return QJsonObject{{"code", QString::fromStdString(w.code)},
                       {"severity", chem::severity_name(w.severity)},
                       {"message", QString::fromStdString(w.message)}};
}

QJsonArray warnings_to_json(const std::vector<chem::Warning>& ws) {
    QJsonArray a;
    for (const auto& w : ws)
        a.append(warning_to_json(w));
    return a;
}

std::vector<chem::Component> components_from_json(const chem::Library& lib, const QJsonObject& doc,
                                                  const std::string& parent,
                                                  double* temperature_c) {
    json::reject_near_misses(doc, {"temperature_c", "components", "activity_model"}, parent);
    if (temperature_c)
        *temperature_c = json::optional_number(doc, "temperature_c", parent).value_or(25.0);
    const QJsonArray a = json::require_array(doc, "components", parent);
    const std::string list = json::path(parent, "components");
    if (a.isEmpty())
        throw chem::Error(list, "needs at least one component");
    std::vector<chem::Component> out;
    for (int i = 0; i < a.size(); ++i) {
        const std::string at = json::path(list, i);
        const QJsonObject c = json::element_object(a, i, list);
        json::reject_near_misses(c, {"reagent", "mol_per_l"}, at);
        const std::string id = json::require_string(c, "reagent", at);
        const chem::Reagent& r = lib.reagent(id, json::path(at, "reagent"));
        const double m = json::require_number(c, "mol_per_l", at);
        out.push_back({&r, m});
    }
    return out;
}

chem::ActivityModel activity_model_from_json(const QJsonObject& doc, const std::string& parent) {
    const auto name = json::optional_string(doc, "activity_model", parent);
    if (!name)
        return chem::ActivityModel::davies;
    if (const auto m = chem::activity_model_from_name(*name))
        return *m;
    throw chem::Error(json::path(parent, "activity_model"),
                      "\"" + *name +
                          "\" is not an activity model (davies, sit or truesdell-jones)");
}

QJsonObject speciation_to_json(const chem::Speciation& s) {
    QJsonArray species;
    for (const auto& sp : s.species) {
        QJsonObject o{{"species", QString::fromStdString(sp.species)},
                      {"charge", sp.charge},
                      {"mol_per_l", sp.mol_per_l},
                      {"activity_coefficient", sp.activity_coefficient}};
        if (!sp.system.empty())
            o["system"] = QString::fromStdString(sp.system);
        species.append(o);
    }
    return QJsonObject{{"temperature_c", s.temperature_c},
                       {"ph", s.ph},
                       {"ionic_strength_mol_per_l", s.ionic_strength_mol_per_l},
                       {"buffer_capacity_mol_per_l", s.buffer_capacity_mol_per_l},
                       {"species", species},
                       {"solver_iterations", s.iterations},
                       {"activity_model", chem::activity_model_name(s.activity_model)},
                       {"warnings", warnings_to_json(s.warnings)}};
}

chem::RecipeRequest recipe_request_from_json(const chem::Library& lib, const QJsonObject& doc,
                                             const std::string& parent) {
    chem::RecipeRequest r;
    json::reject_near_misses(doc,
                             {"target_ph", "temperature_c", "volume_ml", "route", "acid", "base",
                              "weigh", "titrant", "titrant_mol_per_l", "acid_stock_mol_per_l",
                              "base_stock_mol_per_l", "concentration_mol_per_l",
                              "ionic_strength_mol_per_l", "purity_percent", "concentration_basis",
                              "titrant_form", "activity_model"},
                             parent);
    r.activity_model = activity_model_from_json(doc, parent);
    r.target_ph = json::require_number(doc, "target_ph", parent);
    r.temperature_c = json::optional_number(doc, "temperature_c", parent).value_or(25.0);
    r.volume_ml = json::optional_number(doc, "volume_ml", parent).value_or(1000.0);
    const std::string route = json::require_string(doc, "route", parent);
    if (route == "mix")
        r.route = chem::Route::mix;
    else if (route == "titrate")
        r.route = chem::Route::titrate;
    else if (route == "stocks")
        r.route = chem::Route::stocks;
    else
        throw chem::Error(json::path(parent, "route"),
                          "\"" + route + "\" is not a route (mix, titrate or stocks)");
    auto reagent_id = [&](const char* key) {
        const std::string id = json::require_string(doc, key, parent);
        lib.reagent(id,
                    json::path(parent, key)); // unknown ids: error naming the field + nearest ids
        return id;
    };
    if (r.route == chem::Route::titrate) {
        r.weigh = reagent_id("weigh");
        r.titrant = reagent_id("titrant");
        const std::string form =
            json::optional_string(doc, "titrant_form", parent).value_or("solution");
        const auto titrant_form = chem::titrant_form_from_name(form);
        if (!titrant_form)
            throw chem::Error(json::path(parent, "titrant_form"),
                              "\"" + form + "\" is not a titrant form (solution or neat)");
        r.titrant_form = *titrant_form;
        // A neat titrant has no molarity; one given anyway is refused by the designer, by name.
        if (r.titrant_form == chem::TitrantForm::solution)
            r.titrant_mol_per_l = json::require_number(doc, "titrant_mol_per_l", parent);
        else
            r.titrant_mol_per_l =
                json::optional_number(doc, "titrant_mol_per_l", parent).value_or(0.0);
    } else {
        r.acid = reagent_id("acid");
        r.base = reagent_id("base");
        if (r.route == chem::Route::stocks) {
            r.acid_stock_mol_per_l = json::require_number(doc, "acid_stock_mol_per_l", parent);
            r.base_stock_mol_per_l = json::require_number(doc, "base_stock_mol_per_l", parent);
        }
    }
    r.concentration_mol_per_l = json::optional_number(doc, "concentration_mol_per_l", parent);
    r.ionic_strength_mol_per_l = json::optional_number(doc, "ionic_strength_mol_per_l", parent);
    if (const auto basis = json::optional_string(doc, "concentration_basis", parent)) {
        r.basis = chem::basis_from_name(*basis);
        if (!r.basis)
            throw chem::Error(json::path(parent, "concentration_basis"),
                              "\"" + *basis + "\" is not a concentration basis (total or salt)");
    }
    if (doc.contains("purity_percent")) {
        const QJsonObject p = json::require_object(doc, "purity_percent", parent);
        for (auto it = p.begin(); it != p.end(); ++it) {
            const std::string id = it.key().toStdString();
            lib.reagent(id, json::path(json::path(parent, "purity_percent"), it.key()));
            const double pct =
                json::require_number(p, it.key(), json::path(parent, "purity_percent"));
            // 1 % is far below any reagent grade; below it the amounts run to tonnes (or inf).
            if (pct < 1 || pct > 100)
                throw chem::Error(json::path(json::path(parent, "purity_percent"), it.key()),
                                  chem::format_number(pct) + " % is outside 1 to 100 %");
            r.purity_overrides.emplace_back(id, pct / 100.0);
        }
    }
    return r;
}

QJsonObject recipe_to_json(const chem::Recipe& r) {
    QJsonArray items;
    for (const auto& it : r.items) {
        QJsonObject o{{"reagent", QString::fromStdString(it.reagent)},
                      {"mol_per_l", it.mol_per_l},
                      {"as", QString::fromStdString(chem::item_as_text(it))}};
        if (it.mass_g)
            o["mass_g"] = *it.mass_g;
        if (it.volume_ml)
            o["volume_ml"] = *it.volume_ml;
        items.append(o);
    }
    QJsonArray composition;
    for (const auto& c : r.composition)
        composition.append(QJsonObject{{"reagent", QString::fromStdString(c.reagent->id)},
                                       {"mol_per_l", c.mol_per_l}});
    QJsonArray steps, cautions;
    for (const auto& s : r.steps)
        steps.append(QString::fromStdString(s.text));
    for (const auto& s : r.cautions)
        cautions.append(QString::fromStdString(s));
    QJsonObject out{{"items", items},
                    {"composition", composition},
                    {"temperature_c", r.request.temperature_c},
                    {"volume_ml", r.request.volume_ml},
                    {"target_ph", r.request.target_ph},
                    {"ph", r.predicted.ph},
                    {"ionic_strength_mol_per_l", r.predicted.ionic_strength_mol_per_l},
                    {"buffer_capacity_mol_per_l", r.predicted.buffer_capacity_mol_per_l},
                    {"activity_model", chem::activity_model_name(r.request.activity_model)},
                    {"steps", steps},
                    {"cautions", cautions},
                    {"warnings", warnings_to_json(r.warnings)}};
    out["concentration_basis"] = chem::basis_name(r.basis.basis);
    QJsonObject basis{{"basis", chem::basis_name(r.basis.basis)},
                      {"system", QString::fromStdString(r.basis.system)},
                      {"concentration_mol_per_l", r.basis.concentration_mol_per_l},
                      {"text", QString::fromStdString(r.basis.text)}};
    if (!r.basis.held_reagent.empty())
        basis["held_reagent"] = QString::fromStdString(r.basis.held_reagent);
    if (!r.basis.adjusting_reagent.empty())
        basis["adjusting_reagent"] = QString::fromStdString(r.basis.adjusting_reagent);
    out["basis"] = basis;
    QJsonArray totals;
    for (const auto& f : r.totals)
        totals.append(
            QJsonObject{{"family", QString::fromStdString(f.id)},
                        {"kind", f.kind == chem::FamilyTotal::Kind::system ? "system" : "ion"},
                        {"name", QString::fromStdString(f.name)},
                        {"mol_per_l", f.mol_per_l}});
    out["totals"] = totals;
    if (r.request.route == chem::Route::titrate)
        out["titrant_form"] = chem::titrant_form_name(r.request.titrant_form);
    return out;
}

namespace {
QJsonArray role_list(const std::vector<chem::RoleChoice>& list) {
    QJsonArray a;
    for (const auto& c : list) {
        QJsonObject o{{"reagent", QString::fromStdString(c.reagent)},
                      {"name", QString::fromStdString(c.name)},
                      {"formula", QString::fromStdString(c.formula)},
                      {"form", c.form == chem::PhysicalForm::liquid ? "liquid" : "solid"},
                      {"protons_removed_per_unit", c.protons_removed_per_unit},
                      {"salt", c.salt}};
        if (c.direction) {
            o["direction"] = chem::direction_name(*c.direction);
            o["strong"] = c.strong;
        }
        a.append(o);
    }
    return a;
}
} // namespace

QJsonObject role_choices_to_json(const chem::RoleChoices& c) {
    return QJsonObject{{"acid_forms", role_list(c.acid_forms)},
                       {"base_forms", role_list(c.base_forms)},
                       {"salts", role_list(c.salts)},
                       {"weighable", role_list(c.weighable)},
                       {"titrants", role_list(c.titrants)}};
}

QJsonObject route_change_to_json(const chem::RouteChange& ch, const chem::Library& lib) {
    const auto& r = ch.reagents;
    QJsonArray notes;
    for (const auto& n : ch.notes)
        notes.append(QJsonObject{{"field", QString::fromStdString(n.field)},
                                 {"message", QString::fromStdString(chem::describe(n, lib))}});
    return QJsonObject{{"acid", QString::fromStdString(r.acid)},
                       {"base", QString::fromStdString(r.base)},
                       {"weigh", QString::fromStdString(r.weigh)},
                       {"titrant", QString::fromStdString(r.titrant)},
                       {"titrant_form", chem::titrant_form_name(r.titrant_form)},
                       {"concentration_basis", chem::basis_name(r.basis)},
                       {"notes", notes},
                       {"complete", ch.complete}};
}

} // namespace phaseplan
