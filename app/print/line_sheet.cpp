#include "print/sheet_parts.h"

#include "chem/error.h"
#include "chem/note_text.h"
#include "core/date_time.h"
#include "core/json_util.h"

#include <QJsonArray>

#include <set>

namespace phaseplan::print {

using namespace sheet_parts;

PrintJob line_job(const AppData& data, const BatchDocument& doc, const QJsonObject& input,
                  const QString& printed_at, const BatchRelease& release) {
    const chem::LineRecipe& lr = *doc.line;
    const double volume = lr.volume_ml;
    const chem::Batch& batch = doc.batch;
    const std::optional<chem::BatchResult>& bres = doc.result;

    PrintJob job =
        start_job(doc, "line", QStringLiteral("Mobile-phase line preparation record"), printed_at);
    const QString& title = doc.title;
    SheetDocument& d = job.sheet;
    add_deviation_blocks(data, doc, d);
    add_batch_blocks(data, doc, input,
                     lr.buffer ? std::optional<double>(lr.buffer->request.target_ph) : std::nullopt,
                     d);

    QStringList by_volume;
    for (const auto& [id, f] : lr.profile.solvent_fraction_v)
        by_volume << qs(id) + " " + percent_text(f);
    QList<KeyValue> plan = {
        {"Volume to prepare", qs(chem::format_number(volume)) + " mL"},
        {"Composition by volume", by_volume.join(", ")},
        {"UV cutoff",
         qs(chem::format_fixed(lr.profile.uv_cutoff_nm, 0)) + " nm" +
             (lr.profile.uv_limited_by.empty() ? QString()
                                               : " (set by " + qs(lr.profile.uv_limited_by) + ")")},
        {"pH of the aqueous part",
         lr.profile.ph ? format_ph(*lr.profile.ph) + " (" +
                             QString::fromUtf8(chem::ph_basis_name(lr.profile.ph_basis)) + ")"
                       : QStringLiteral("not predicted (no aqueous buffer)")},
    };
    if (lr.contraction_ml > 0)
        plan << KeyValue{"Contraction on mixing", format_amount(lr.contraction_ml) + " mL (about " +
                                                      format_amount(lr.mixed_volume_ml) +
                                                      " mL after mixing)"};
    d.blocks << heading("Plan") << fields_block(plan);

    // Parts, measured separately.
    Block parts;
    parts.kind = Block::Kind::table;
    parts.table.headers = {"Part",      "Kind",   "Target volume", "Target mass",
                           "Tolerance", "Actual", "Lot",           "Check"};
    parts.table.weights = {2.6, 1.3, 1.6, 1.6, 1.9, 1.5, 1.3, 1.3};
    for (size_t k = 0; k < lr.items.size(); ++k) {
        const auto& it = lr.items[k];
        const chem::AmountCheck& c = doc.part_checks[k];
        parts.table.rows << QStringList{
            qs(it.part),
            QLatin1String(chem::line_item_kind_name(it.kind)),
            it.volume_ml ? measure_text(*it.volume_ml, chem::MeasureUnit::ml) + " mL" : QString(),
            it.mass_g ? measure_text(*it.mass_g, chem::MeasureUnit::g) + " g" : QString(),
            band_text(c, batch),
            actual_text(c, doc.captures),
            lot_text(c),
            check_text(c)};
        parts.table.flagged << !c.within_tolerance;
    }
    d.blocks << heading("Parts: measure each separately, then combine") << parts;

    if (lr.buffer)
        d.blocks << heading("Aqueous buffer (" +
                            qs(chem::format_number(lr.buffer->request.volume_ml)) +
                            " mL): target and actual amounts")
                 << reagent_table(data.reagents, *lr.buffer, *bres, batch, doc.captures);
    for (const StepSection& s : doc.steps)
        d.blocks << heading(s.heading) << numbered(s.steps);
    if (!lr.notes.empty()) {
        QStringList notes;
        for (const chem::LineNote& n : lr.notes)
            notes << qs(chem::describe(n, data.solvents));
        d.blocks << bullets(notes);
    }
    if (lr.buffer)
        d.blocks << heading("Predicted for the aqueous buffer")
                 << predicted_table(*lr.buffer, *bres, QStringLiteral("Buffer alone"));
    d.blocks << heading("Checks") << warnings_block(doc.warnings);

    HazardSet hz;
    add_line_hazards(data, *doc.line_spec, hz);
    d.blocks << heading("Hazards and cautions") << hz.block()
             << bullets(cautions_with_standard(lr.cautions));
    d.blocks << heading("Sign-off") << signoff(batch, release) << release_blocks(release);

    LabelData label;
    label.title = title;
    label.composition = line_composition(data, lr.profile);
    if (lr.profile.ph) {
        const double ph = bres ? bres->predicted.ph : *lr.profile.ph;
        label.ph = "pH " + format_ph(ph) + " (aqueous part)";
    }
    fill_label_batch(doc, hz, d.mark, release, label);
    job.labels << label;

    job.summary = doc.summary;
    return job;
}

} // namespace phaseplan::print
