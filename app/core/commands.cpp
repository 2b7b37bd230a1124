#include "core/commands.h"

#include "chem/recipe.h"
#include "core/chem_json.h"

#include <QJsonArray>

namespace phaseplan {

QJsonObject command_solve(const AppData& data, const QJsonObject& input, const CommandOptions&) {
    double t = 25;
    const auto components = components_from_json(data.reagents, input, "", &t);
    const chem::ActivityModel model = activity_model_from_json(input, "");
    return speciation_to_json(chem::solve(data.reagents, components, t, model));
}

QJsonObject command_recipe(const AppData& data, const QJsonObject& input, const CommandOptions&) {
    const chem::RecipeRequest req = recipe_request_from_json(data.reagents, input, "");
    return recipe_to_json(chem::design_recipe(data.reagents, req));
}

QJsonObject command_reagents(const AppData& data, const QJsonObject&, const CommandOptions&) {
    QJsonArray list;
    for (const auto& r : data.reagents.reagents()) {
        QJsonArray hazards, pictograms, systems;
        for (const auto& h : r.ghs_hazards)
            hazards.append(QString::fromStdString(h));
        for (const auto& p : r.ghs_pictograms)
            pictograms.append(QString::fromStdString(p));
        for (const auto& s : r.systems)
            systems.append(QString::fromStdString(s.system));
        QJsonObject o{{"id", QString::fromStdString(r.id)},
                      {"name", QString::fromStdString(r.name)},
                      {"formula", QString::fromStdString(r.formula)},
                      {"molar_mass_g_per_mol", r.molar_mass_g_per_mol},
                      {"form", r.form == chem::PhysicalForm::solid ? "solid" : "liquid"},
                      {"assay_percent", r.assay_fraction * 100},
                      {"ghs_hazards", hazards},
                      {"ghs_pictograms", pictograms},
                      {"systems", systems}};
        if (r.form == chem::PhysicalForm::liquid)
            o["density_g_per_ml"] = r.density_g_per_ml;
        list.append(o);
    }
    return QJsonObject{{"reagents", list}};
}

} // namespace phaseplan
