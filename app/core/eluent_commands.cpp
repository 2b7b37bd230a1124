#include "core/eluent_commands.h"

#include "chem/error.h"
#include "chem/sequence.h"
#include "core/chem_json.h"
#include "core/json_util.h"
#include "core/line_commands.h"

#include <QJsonArray>

#include <array>
#include <optional>

namespace phaseplan {

namespace {
QString qs(const std::string& s) {
    return QString::fromStdString(s);
}
} // namespace

QJsonObject eluent_result_to_json(const chem::EluentResult& r) {
    QJsonArray solvents;
    for (const auto& [id, f] : r.mix.solvent_fraction_v) {
        const auto x = r.mix.mole_fraction.find(id);
        solvents.append(
            QJsonObject{{"solvent", qs(id)},
                        {"fraction_v", f},
                        {"mole_fraction", x != r.mix.mole_fraction.end() ? x->second : 0.0}});
    }
    QJsonArray solutes;
    for (const auto& s : r.mix.solutes)
        solutes.append(QJsonObject{{"reagent", qs(s.reagent)},
                                   {"mmol_per_l", s.mmol_per_l},
                                   {"from", QLatin1String(chem::solute_source_name(s.from))}});
    QJsonArray pka;
    for (const auto& k : r.pka)
        pka.append(QJsonObject{{"system", qs(k.system)},
                               {"step", k.step},
                               {"w_w", k.w_w},
                               {"s_s", k.s_s},
                               {"s_s_conditional", k.s_s_conditional},
                               {"estimated", k.estimated}});
    return QJsonObject{{"temperature_c", r.temperature_c},
                       {"activity_model", chem::activity_model_name(r.activity_model)},
                       {"organic_fraction_v", r.organic_fraction_v},
                       {"solvents", solvents},
                       {"contraction_fraction", r.mix.contraction_fraction},
                       {"solutes", solutes},
                       {"ph_w_w", r.ph_w_w ? QJsonValue(*r.ph_w_w) : QJsonValue(QJsonValue::Null)},
                       {"ph_s_s", r.ph_s_s},
                       {"ph_s_w", r.ph_s_w},
                       {"delta", r.delta},
                       {"ionic_strength_mol_per_l", r.ionic_strength_mol_per_l},
                       {"buffer_capacity_mol_per_l", r.buffer_capacity_mol_per_l},
                       {"permittivity", r.permittivity},
                       {"solvent_density_g_per_ml", r.solvent_density_g_per_ml},
                       {"pka", pka},
                       {"warnings", warnings_to_json(r.warnings)}};
}

QJsonObject command_eluent(const AppData& data, const QJsonObject& input, const CommandOptions&) {
    json::reject_near_misses(input, {"lines", "composition", "temperature_c", "activity_model"},
                             "");
    const double t = json::optional_number(input, "temperature_c", "").value_or(25.0);
    const chem::ActivityModel model = activity_model_from_json(input, "");
    const QJsonObject lines = json::require_object(input, "lines", "");
    if (lines.isEmpty())
        throw chem::Error("lines", "no line defined");
    std::array<std::optional<ParsedLine>, chem::max_lines> parsed;
    std::array<chem::LineProfile, chem::max_lines> profiles;
    for (auto it = lines.begin(); it != lines.end(); ++it) {
        const int l = chem::line_index(it.key().toStdString());
        const std::string at = json::path("lines", it.key());
        if (l < 0)
            throw chem::Error(at, "is not a line (A, B, C, D)");
        parsed[l] =
            line_from_json(data, json::require_object(lines, it.key(), "lines"), at, 1000.0, false);
        profiles[l] = chem::profile_line(data.solvents, data.reagents, parsed[l]->spec);
        if (!profiles[l].described)
            throw chem::Error(json::path(at, "parts"), "is required to work out the eluent");
    }
    const QJsonObject comp = json::require_object(input, "composition", "");
    std::vector<double> percent(chem::max_lines, 0.0);
    for (auto it = comp.begin(); it != comp.end(); ++it) {
        const int l = chem::line_index(it.key().toStdString());
        const std::string at = json::path("composition", it.key());
        if (l < 0)
            throw chem::Error(at, "is not a line (A, B, C, D)");
        const double v = json::require_number(comp, it.key(), "composition");
        if (v < 0 || v > 100)
            throw chem::Error(at, chem::format_number(v) + " is outside 0 to 100 %");
        if (v > 0 && !parsed[l])
            throw chem::Error(at, "line " + it.key().toStdString() + " is not defined in lines");
        percent[l] = v;
    }
    std::vector<const chem::LineProfile*> ptrs(chem::max_lines, nullptr);
    for (int l = 0; l < chem::max_lines; ++l)
        if (parsed[l])
            ptrs[l] = &profiles[l];
    return eluent_result_to_json(
        chem::solve_eluent(data.solvents, data.reagents, ptrs, percent, t, model));
}

} // namespace phaseplan
