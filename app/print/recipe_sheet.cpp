#include "print/sheet_parts.h"

#include "chem/error.h"
#include "core/date_time.h"

#include <set>

namespace phaseplan::print {

using namespace sheet_parts;

// ---- recipe -----------------------------------------------------------------------------------

PrintJob recipe_job(const AppData& data, const BatchDocument& doc, const QJsonObject& input,
                    const QString& printed_at, const BatchRelease& release) {
    const chem::Library& lib = data.reagents;
    const chem::Recipe& recipe = *doc.recipe;
    const chem::RecipeRequest& req = recipe.request;
    const chem::Batch& batch = doc.batch;
    const chem::BatchResult& res = *doc.result;

    PrintJob job =
        start_job(doc, "recipe", QStringLiteral("Buffer preparation record"), printed_at);
    const QString& title = doc.title;
    SheetDocument& d = job.sheet;
    add_deviation_blocks(data, doc, d);
    add_batch_blocks(data, doc, input, req.target_ph, d);

    QList<KeyValue> plan = {
        {"Target pH",
         format_ph(req.target_ph) + " at " + qs(chem::format_number(req.temperature_c)) + " °C"},
        {"Final volume",
         qs(chem::format_number(req.volume_ml)) + " mL" +
             (batch.final_volume_ml
                  ? "  (made: " + qs(chem::format_number(*batch.final_volume_ml)) + " mL)"
                  : QString())},
        {"Route", route_text(req)},
        {req.concentration_mol_per_l ? "Buffer concentration" : "Ionic strength",
         format_mmol_per_l(req.concentration_mol_per_l ? *req.concentration_mol_per_l
                                                       : *req.ionic_strength_mol_per_l)},
        {"Concentration basis", qs(recipe.basis.text)},
    };
    d.blocks << heading("Plan") << fields_block(plan);

    d.blocks << heading("Reagents: target and actual amounts")
             << reagent_table(lib, recipe, res, batch, doc.captures);
    for (const StepSection& s : doc.steps)
        d.blocks << heading(s.heading) << numbered(s.steps);
    d.blocks << heading("Predicted pH, ionic strength and buffer capacity")
             << predicted_table(recipe, res, QStringLiteral("Predicted"));
    d.blocks << heading("Checks") << warnings_block(doc.warnings);

    HazardSet hz;
    std::set<std::string> seen;
    for (const auto& it : recipe.items) {
        if (!seen.insert(it.reagent).second)
            continue;
        const chem::Reagent& r = lib.reagent(it.reagent);
        hz.add(qs(r.name), r.ghs_hazards, r.ghs_pictograms);
    }
    d.blocks << heading("Hazards and cautions") << hz.block()
             << bullets(cautions_with_standard(recipe.cautions));
    d.blocks << heading("Sign-off") << signoff(batch, release) << release_blocks(release);

    LabelData label;
    label.title = title;
    for (size_t i = 0; i < res.composition.size(); ++i)
        label.composition << dissolved_formula(*res.composition[i].reagent) + " " +
                                 format_mmol_per_l(res.composition[i].mol_per_l);
    label.ph = "pH " + format_ph(res.predicted.ph) + " at " +
               qs(chem::format_number(req.temperature_c)) + " °C";
    fill_label_batch(doc, hz, d.mark, release, label);
    job.labels << label;

    job.summary = doc.summary;
    return job;
}

} // namespace phaseplan::print
