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
    const QJsonObject& out = doc.sequence_out;
    const chem::Batch& batch = doc.batch;
    QJsonObject lines_in = input.value("lines").toObject();
    const QJsonObject lines_out = out.value("lines").toObject();

    PrintJob job = start_job(doc, "sequence", QStringLiteral("Sequence solvent plan"), printed_at);
    SheetDocument& d = job.sheet;

    QList<KeyValue> head = {
        {"Batch id", qs(batch.id)},
        {"Purpose", purpose_of(input)},
        {"Prepared by", qs(batch.prepared_by)},
        {"Prepared at", iso_minute_text(qs(batch.prepared_at))},
        {"Start", iso_minute_text(out.value("start").toString())},
        {"End of the last injection", iso_minute_text(out.value("end").toString())},
        {"Injections", QString::number(out.value("injections").toInt())},
        {"Run time", duration_h_min_text(out.value("total_min").toDouble())},
    };
    if (out.contains("standby_end"))
        head << KeyValue{"Standby flow until",
                         iso_minute_text(out.value("standby_end").toString())};
    head << KeyValue{"Checked by", qs(batch.checked_by)};
    d.blocks << heading("Sequence") << fields_block(head);

    // Each line: what to prepare and whether the bottle on the instrument lasts.
    Block lines;
    lines.kind = Block::Kind::table;
    lines.table.headers = {
        "Line",   "Contents",  "Needed (priming incl.)", "Prepare at least", "Bottle on hand",
        "Lasts?", "Shelf life"};
    lines.table.weights = {0.8, 2.6, 1.6, 1.8, 1.7, 2.6, 1.4};
    for (const QString& key : lines_out.keys()) {
        const QJsonObject l = lines_out.value(key).toObject();
        QString lasts;
        if (l.value("runs_dry").toBool())
            lasts = "NO: runs dry during injection " +
                    QString::number(l.value("dry_after_injection").toInt()) + ", at " +
                    iso_minute_text(l.value("dry_at").toString());
        else
            lasts = "yes, " + format_amount(l.value("spare_ml").toDouble()) + " mL spare";
        lines.table.rows << QStringList{
            key,
            l.value("name").toString(),
            format_amount(l.value("required_ml").toDouble()) + " mL",
            format_amount(l.value("min_bottle_ml").toDouble()) + " mL\n(bottle: " +
                format_amount(l.value("suggested_bottle_ml").toDouble()) + " mL)",
            format_amount(l.value("bottle_ml").toDouble()) + " mL\n(residue " +
                format_amount(l.value("residue_ml").toDouble()) + " mL)",
            lasts,
            qs(chem::format_number(l.value("shelf_life_h").toDouble())) + " h"};
        lines.table.flagged << l.value("runs_dry").toBool();
    }
    d.blocks << heading("Lines: volume to prepare and bottles") << lines;
    d.blocks << bullets(
        {QStringLiteral("\"Prepare at least\" adds the safety margin and the residue below the "
                        "inlet filter to what the sequence needs.")});

    // One batch per line recipe across the plan.
    if (!out.value("batches").toArray().isEmpty()) {
        Block batches;
        batches.kind = Block::Kind::table;
        batches.table.headers = {"Line recipe", "Lines",    "Prepare",
                                 "First use",   "Last use", "One batch lasts?"};
        batches.table.weights = {3, 0.9, 1.6, 1.9, 1.9, 1.6};
        for (const QJsonValue& v : out.value("batches").toArray()) {
            const QJsonObject b = v.toObject();
            batches.table.rows << QStringList{
                b.value("recipe").toString(),
                json::strings_of(b.value("lines")).join(", "),
                format_amount(b.value("prepare_ml").toDouble()) + " mL",
                iso_minute_text(b.value("first_use").toString()),
                iso_minute_text(b.value("last_use").toString()),
                b.value("one_batch_lasts").toBool() ? QStringLiteral("yes")
                                                    : QStringLiteral("no: make a fresh batch")};
            batches.table.flagged << !b.value("one_batch_lasts").toBool();
        }
        d.blocks << heading("Batches per line recipe") << batches;
    }

    // Waste.
    const double waste = out.value("waste_ml").toDouble();
    QList<KeyValue> waste_fields = {
        {"Waste to collect (priming included)", format_amount(waste) + " mL"},
        {"Waste container, free volume",
         out.value("waste_capacity_ml").isDouble()
             ? format_amount(out.value("waste_capacity_ml").toDouble()) + " mL"
             : QStringLiteral("not given")},
    };
    d.blocks << heading("Waste") << fields_block(waste_fields);

    // The sequence rows with each line's volume.
    Block rows;
    rows.kind = Block::Kind::table;
    rows.table.headers = {"#", "Label", "Method", "Injections", "Start", "End"};
    const QStringList keys = lines_out.keys();
    for (const QString& k : keys)
        rows.table.headers << k + " (mL)";
    rows.table.weights = {0.6, 3.1, 1.5, 1.4, 1.7, 1.7};
    for (int i = 0; i < keys.size(); ++i)
        rows.table.weights << 1.0;
    int n = 0;
    for (const QJsonValue& v : out.value("rows").toArray()) {
        const QJsonObject r = v.toObject();
        QStringList cells{QString::number(++n),
                          r.value("label").toString(),
                          r.value("method").toString(),
                          QString::number(r.value("first_injection").toInt()) + "–" +
                              QString::number(r.value("last_injection").toInt()),
                          iso_minute_text(r.value("start").toString()),
                          iso_minute_text(r.value("end").toString())};
        for (const QString& k : keys)
            cells << format_amount(r.value("volume_ml").toObject().value(k).toDouble());
        rows.table.rows << cells;
        rows.table.flagged << false;
    }
    d.blocks << heading("Sequence rows") << rows;

    d.blocks << heading("Checks") << warnings_block(doc.warnings);

    // Hazards over every line; one label per line.
    HazardSet all;
    for (const QString& key : keys) {
        const QJsonObject lo = lines_in.value(key).toObject();
        const QJsonObject l = lines_out.value(key).toObject();
        LabelData label;
        label.title = "Line " + key + ": " + l.value("name").toString();
        HazardSet hz;
        if (lo.contains("parts")) {
            const ParsedLine pl = line_from_json(data, lo, ("lines." + key).toStdString(),
                                                 l.value("required_ml").toDouble(), false, nullptr);
            add_line_hazards(data, pl.spec, hz);
            add_line_hazards(data, pl.spec, all);
            label.composition =
                line_composition(data, chem::profile_line(data.solvents, data.reagents, pl.spec));
        }
        if (l.value("ph").isDouble())
            label.ph = "pH " + format_ph(l.value("ph").toDouble()) + " (aqueous part)";
        const QString id = qs(batch.id) + "-" + key;
        label.batch_id = id;
        label.qr_text = id;
        label.prepared_at = iso_minute_text(qs(batch.prepared_at));
        if (!batch.expires_at.empty())
            label.expires_at = iso_minute_text(qs(batch.expires_at));
        else if (!batch.prepared_at.empty())
            label.expires_at = iso_minute_text(qs(chem::add_hours(
                batch.prepared_at,
                l.value("shelf_life_h")
                    .toDouble(chem::builtin_shelf_life_h(chem::ShelfKind::aqueous_buffer)),
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
