#include "print/sheet_parts.h"

#include "chem/error.h"
#include "core/json_util.h"

#include "core/date_time.h"
#include "core/line_commands.h"

#include <QJsonArray>

namespace phaseplan::print {

using namespace sheet_parts;

// ---- sequence ---------------------------------------------------------------------------------

PrintJob sequence_job(const AppData& data, const BatchDocument& doc, const QJsonObject& input,
                      const QString& printed_at, const BatchRelease& release) {
    const SequenceResult& result = *doc.sequence;
    const PlanResult& out = result.plans.front(); // batch_document_kind refuses "plans"
    const chem::Batch& batch = doc.batch;

    PrintJob job = start_job(doc, "sequence", QStringLiteral("Sequence solvent plan"), printed_at);
    SheetDocument& d = job.sheet;

    QList<KeyValue> head = {
        {"Batch id", qs(batch.id)},
        {"Purpose", purpose_of(input)},
        {"Prepared by", qs(batch.prepared_by)},
        {"Prepared at", iso_minute_text(qs(batch.prepared_at))},
        {"Start", iso_minute_text(out.start)},
        {"End of the last injection", iso_minute_text(out.end)},
        {"Injections", QString::number(out.injections)},
        {"Run time", duration_h_min_text(out.total_min)},
    };
    if (out.standby_min > 0)
        head << KeyValue{"Standby flow until", iso_minute_text(out.standby_end)};
    head << KeyValue{"Checked by", qs(batch.checked_by)};
    d.blocks << heading("Sequence") << fields_block(head);

    // Each line: what to prepare and whether the bottle on the instrument lasts.
    Block lines;
    lines.kind = Block::Kind::table;
    lines.table.headers = {
        "Line",   "Contents",  "Needed (priming incl.)", "Prepare at least", "Bottle on hand",
        "Lasts?", "Shelf life"};
    lines.table.weights = {0.8, 2.6, 1.6, 1.8, 1.7, 2.6, 1.4};
    for (const SequenceLineResult& l : out.lines) {
        const chem::LinePlan& lp = l.plan;
        QString lasts;
        if (lp.runs_dry)
            lasts = "NO: runs dry during injection " +
                    QString::number(lp.dry_after_injection.value_or(0)) + ", at " +
                    iso_minute_text(lp.dry_at_min ? l.dry_at : QString());
        else
            lasts = "yes, " + format_amount(lp.spare_ml) + " mL spare";
        lines.table.rows << QStringList{
            l.letter(),
            l.name,
            format_amount(lp.required_ml) + " mL",
            format_amount(lp.min_bottle_ml) +
                " mL\n(bottle: " + format_amount(lp.suggested_bottle_ml) + " mL)",
            format_amount(l.bottle_ml) + " mL\n(residue " + format_amount(l.residue_ml) + " mL)",
            lasts,
            qs(chem::format_number(l.profile ? l.profile->shelf_life_h : 0.0)) + " h"};
        lines.table.flagged << lp.runs_dry;
    }
    d.blocks << heading("Lines: volume to prepare and bottles") << lines;
    d.blocks << bullets(
        {QStringLiteral("\"Prepare at least\" adds the safety margin and the residue below the "
                        "inlet filter to what the sequence needs.")});

    // One batch per line recipe across the plan.
    if (!result.batches.empty()) {
        Block batches;
        batches.kind = Block::Kind::table;
        batches.table.headers = {"Line recipe", "Lines",    "Prepare",
                                 "First use",   "Last use", "One batch lasts?"};
        batches.table.weights = {3, 0.9, 1.6, 1.9, 1.9, 1.6};
        for (const SequenceBatch& b : result.batches) {
            // A batch without a known shelf life (a volumes-only line) is not said to last.
            const bool lasts = b.shelf_life_h > 0 && b.span_h <= b.shelf_life_h;
            batches.table.rows << QStringList{b.recipe,
                                              b.lines.join(", "),
                                              format_amount(b.prepare_ml) + " mL",
                                              iso_minute_text(wall_clock_iso(b.first_use)),
                                              iso_minute_text(wall_clock_iso(b.last_use)),
                                              lasts ? QStringLiteral("yes")
                                                    : QStringLiteral("no: make a fresh batch")};
            batches.table.flagged << !lasts;
        }
        d.blocks << heading("Batches per line recipe") << batches;
    }

    // Waste.
    const double waste = out.waste_ml;
    QList<KeyValue> waste_fields = {
        {"Waste to collect (priming included)", format_amount(waste) + " mL"},
        {"Waste container, free volume", out.waste_capacity_ml
                                             ? format_amount(*out.waste_capacity_ml) + " mL"
                                             : QStringLiteral("not given")},
    };
    d.blocks << heading("Waste") << fields_block(waste_fields);

    // The sequence rows with each line's volume.
    Block rows;
    rows.kind = Block::Kind::table;
    rows.table.headers = {"#", "Label", "Method", "Injections", "Start", "End"};
    for (const SequenceLineResult& l : out.lines)
        rows.table.headers << l.letter() + " (mL)";
    rows.table.weights = {0.6, 3.1, 1.5, 1.4, 1.7, 1.7};
    for (std::size_t i = 0; i < out.lines.size(); ++i)
        rows.table.weights << 1.0;
    for (std::size_t i = 0; i < out.rows.size(); ++i) {
        const chem::RowPlan& r = out.rows[i];
        QStringList cells{QString::number(i + 1),
                          qs(out.row_inputs[i].label),
                          qs(out.row_inputs[i].method),
                          QString::number(r.first_injection) + "–" +
                              QString::number(r.first_injection + r.injections - 1),
                          iso_minute_text(out.row_start(i)),
                          iso_minute_text(out.row_end(i))};
        for (const SequenceLineResult& l : out.lines)
            cells << format_amount(r.volume_ml[std::size_t(l.index)]);
        rows.table.rows << cells;
        rows.table.flagged << false;
    }
    d.blocks << heading("Sequence rows") << rows;

    d.blocks << heading("Checks") << warnings_block(doc.warnings);

    // Hazards over every line; one label per line. Each line as the sequence parsed and profiled
    // it (SequenceLineResult::spec, line_profile): no line is parsed or designed again here.
    HazardSet all;
    for (const SequenceLineResult& l : out.lines) {
        const QString key = l.letter();
        LabelData label;
        label.title = "Line " + key + ": " + l.name;
        HazardSet hz;
        add_line_hazards(data, l.spec, hz);
        add_line_hazards(data, l.spec, all);
        label.composition = line_composition(data, l.line_profile);
        if (l.profile && l.profile->ph)
            label.ph = "pH " + format_ph(*l.profile->ph) + " (aqueous part)";
        const QString id = qs(batch.id) + "-" + key;
        label.batch_id = id;
        label.qr_text = id;
        label.prepared_at = iso_minute_text(qs(batch.prepared_at));
        if (!batch.expires_at.empty())
            label.expires_at = iso_minute_text(qs(batch.expires_at));
        else if (!batch.prepared_at.empty())
            label.expires_at = iso_minute_text(qs(chem::add_hours(
                batch.prepared_at,
                l.profile ? l.profile->shelf_life_h
                          : chem::builtin_shelf_life_h(chem::ShelfKind::aqueous_buffer),
                "batch.prepared_at")));
        label.prepared_by = qs(batch.prepared_by);
        label.pictograms = sorted_pictograms(hz.pictograms);
        label.hazard_codes = hz.codes();
        set_release(label, release);
        job.labels << label;
    }
    d.blocks << heading("Hazards and cautions") << all.block()
             << bullets(cautions_with_standard({}));
    d.blocks << heading("Sign-off") << signoff(batch, release) << release_blocks(release);

    job.summary = doc.summary;
    return job;
}

} // namespace phaseplan::print
