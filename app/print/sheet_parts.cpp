#include "print/sheet_parts.h"

#include "chem/error.h"
#include "chem/measure_band.h"
#include "core/date_time.h"

#include <QJsonArray>
#include <QRegularExpression>

#include <cmath>
#include <set>

namespace phaseplan::print::sheet_parts {

QString qs(const std::string& s) {
    return QString::fromStdString(s);
}

/// The usual cautions that close every hazard section (issue 5 §2). Never a claim of safety.
const QStringList standard_cautions = {
    QStringLiteral("Work in a well-ventilated place; open, pour and mix volatile, corrosive or "
                   "flammable liquids in a fume hood."),
    QStringLiteral("Wear eye protection, chemical-resistant gloves and a lab coat while preparing "
                   "and handling the solution."),
    QStringLiteral("Read the safety data sheet of every reagent and solvent before use."),
    QStringLiteral("Follow your laboratory's rules, local regulations and licensed practice; this "
                   "sheet does not replace them."),
};

const QString footer_note = QStringLiteral(
    "The hazard information lists the parts as supplied (reagents, solvents); the classification "
    "of "
    "the finished solution depends on its concentrations. It does not replace the safety data "
    "sheets, local rules or licensed practice.");

/// The formula of what is dissolved: a hydrate's water is just water once in solution.
QString dissolved_formula(const chem::Reagent& r) {
    QString f = qs(r.formula);
    static const QRegularExpression hydrate(QStringLiteral("(\\(H2O\\)\\d*|[·.]\\d*H2O)$"));
    f.remove(hydrate);
    return f;
}

QString route_text(const chem::RecipeRequest& q) {
    switch (q.route) {
    case chem::Route::mix:
        return QStringLiteral("mix: %1 + %2").arg(qs(q.acid), qs(q.base));
    case chem::Route::titrate:
        if (q.titrant_form == chem::TitrantForm::neat)
            return QStringLiteral("titrate: weigh %1, adjust with %2 as supplied (neat)")
                .arg(qs(q.weigh), qs(q.titrant));
        return QStringLiteral("titrate: weigh %1, adjust with %2 %3 mol/L")
            .arg(qs(q.weigh), qs(q.titrant), qs(chem::format_number(q.titrant_mol_per_l)));
    case chem::Route::stocks:
        return QStringLiteral("stocks: %1 %2 mol/L + %3 %4 mol/L")
            .arg(qs(q.acid), qs(chem::format_number(q.acid_stock_mol_per_l)), qs(q.base),
                 qs(chem::format_number(q.base_stock_mol_per_l)));
    }
    return {};
}

QString form_text(const chem::Reagent& r, const chem::RecipeItem& it,
                  const chem::RecipeRequest& q) {
    const double purity = chem::purity_of(q, r);
    if (it.kind == chem::ItemKind::solid) {
        return purity < 1 ? QStringLiteral("solid, %1 %").arg(qs(chem::format_number(purity * 100)))
                          : QStringLiteral("solid");
    }
    if (it.kind == chem::ItemKind::liquid)
        return QStringLiteral("liquid, %1 % w/w, %2 g/mL")
            .arg(qs(chem::format_number(purity * 100)),
                 qs(chem::format_number(r.density_g_per_ml)));
    return qs(chem::item_as_text(it));
}

Block heading(const QString& text) {
    Block b;
    b.kind = Block::Kind::heading;
    b.text = text;
    return b;
}

Block fields_block(const QList<KeyValue>& kv) {
    Block b;
    b.kind = Block::Kind::fields;
    b.fields = kv;
    return b;
}

QStringList cautions_with_standard(const std::vector<std::string>& own) {
    QStringList out;
    for (const auto& c : own)
        out << qs(c);
    for (const QString& s : standard_cautions) {
        // The recipe's own cautions already end with the SDS and local-rules sentence: do not
        // print the same advice twice.
        const bool sds = s.contains("safety data sheet");
        const bool rules = s.contains("licensed practice");
        bool covered = false;
        for (const QString& o : out)
            covered |= (sds && o.contains("safety data sheet")) ||
                       (rules && o.contains("licensed practice") && !sds);
        if (!covered)
            out << s;
    }
    return out;
}

QList<KeyValue> batch_fields(const chem::Batch& b, const QString& recipe, const QString& purpose,
                             const QString& expires, const QString& shelf_note) {
    auto blank = [](const std::string& s) { return qs(s); };
    return {
        {"Batch id", qs(b.id)},
        {"Recipe", recipe},
        {"Purpose", purpose},
        {"Prepared by", blank(b.prepared_by)},
        {"Prepared at", iso_minute_text(qs(b.prepared_at))},
        {"Expires at",
         expires.isEmpty() ? QStringLiteral("prepared at + shelf life") : iso_minute_text(expires)},
        {"Shelf life", shelf_note},
        {"Checked by", blank(b.checked_by)},
        {"Tolerance",
         "± " + qs(chem::format_number(b.tolerance_fraction * 100)) + " % on every amount"},
    };
}

QString shelf_note_text(double hours, std::optional<chem::ShelfKind> kind, const QString& source,
                        bool given) {
    if (given)
        return QStringLiteral("expiry entered with the batch");
    QString h = qs(chem::format_number(hours)) + " h";
    if (hours >= 48 && std::fmod(hours, 24) == 0)
        h += " (" + qs(chem::format_number(hours / 24)) + " days)";
    if (kind)
        h += ", " + QString::fromUtf8(chem::shelf_kind_words(*kind));
    return h + (source.isEmpty() ? QString() : " — " + source);
}

// ---- shared pieces ------------------------------------------------------------------------------

QString tolerance_text(const chem::Batch& b) {
    return "± " + qs(chem::format_number(b.tolerance_fraction * 100)) + " %";
}

QString check_text(const chem::AmountCheck& c) {
    if (!c.entered)
        return {};
    const QString dev = (c.deviation_fraction >= 0 ? "+" : "") +
                        QString::number(c.deviation_fraction * 100, 'f', 1) + " %";
    return (c.within_tolerance ? "OK\n" : "OUT\n") + dev;
}

QString band_text(const chem::AmountCheck& c, const chem::Batch& b) {
    // With the target's decimals (chem::measure_decimals), so the band reads on the same balance
    // or pipette as the target beside it.
    const auto unit = c.unit == "g" ? chem::MeasureUnit::g : chem::MeasureUnit::ml;
    return tolerance_text(b) + "\n" + qs(chem::format_measure_band(c.low, c.high, c.target, unit)) +
           " " + qs(c.unit);
}

/// The reagents table of a recipe with its batch: target, tolerance, actual, lot, check.
/// The actual amount and where it came from: "3.161 g\nfrom balance BAL-03" or "…\ntyped".
QString actual_text(const chem::AmountCheck& c, const QJsonObject& captures) {
    if (!c.entered)
        return QString();
    // As recorded: the digits entered, never fewer than the target's (chem::format_recorded).
    const auto unit = c.unit == "g" ? chem::MeasureUnit::g : chem::MeasureUnit::ml;
    return qs(chem::format_recorded(c.actual, unit)) + " " + qs(c.unit) + "\n" +
           capture_source_text(captures.value(qs(c.reagent)).toObject());
}

Block reagent_table(const chem::Library& lib, const chem::Recipe& recipe,
                    const chem::BatchResult& res, const chem::Batch& batch,
                    const QJsonObject& captures) {
    Block table;
    table.kind = Block::Kind::table;
    table.table.headers = {"Reagent", "Form", "Target", "Tolerance", "Actual", "Lot", "Check"};
    table.table.weights = {3.4, 1.8, 1.6, 1.9, 1.5, 1.4, 1.4};
    for (size_t k = 0; k < recipe.items.size(); ++k) {
        const chem::RecipeItem& it = recipe.items[k];
        const chem::AmountCheck& c = res.checks[k];
        const chem::Reagent& r = lib.reagent(it.reagent);
        // The target as the steps write it (chem::measure_decimals).
        QString target =
            measure_text(c.target, c.unit == "g" ? chem::MeasureUnit::g : chem::MeasureUnit::ml) +
            " " + qs(c.unit);
        if (it.kind == chem::ItemKind::liquid && it.mass_g && it.volume_ml) {
            const QString g = measure_text(*it.mass_g, chem::MeasureUnit::g) + " g";
            const QString ml = measure_text(*it.volume_ml, chem::MeasureUnit::ml) + " mL";
            target = c.unit == "g" ? g + "\n(" + ml + ")" : ml + "\n(" + g + ")";
        }
        if (chem::is_titrant(it.kind))
            target += "\n(predicted)";
        table.table.rows << QStringList{qs(r.name) + "\n" + qs(r.formula) + ", " +
                                            QString::number(r.molar_mass_g_per_mol, 'f', 2) +
                                            " g/mol",
                                        form_text(r, it, recipe.request),
                                        target,
                                        band_text(c, batch),
                                        actual_text(c, captures),
                                        lot_text(c),
                                        check_text(c)};
        table.table.flagged << !c.within_tolerance;
    }
    return table;
}

/// pH, ionic strength, β and the composition: as planned and from the actual amounts.
Block predicted_table(const chem::Recipe& recipe, const chem::BatchResult& res,
                      const QString& what) {
    const auto& req = recipe.request;
    Block pred;
    pred.kind = Block::Kind::table;
    pred.table.headers = {what + " at " + qs(chem::format_number(req.temperature_c)) + " °C",
                          "As planned", "From the actual amounts"};
    pred.table.weights = {3, 2, 2};
    pred.table.rows << QStringList{"pH", format_ph(recipe.predicted.ph),
                                   format_ph(res.predicted.ph)};
    pred.table.rows << QStringList{"Ionic strength",
                                   format_mmol_per_l(recipe.predicted.ionic_strength_mol_per_l),
                                   format_mmol_per_l(res.predicted.ionic_strength_mol_per_l)};
    pred.table.rows << QStringList{
        "Buffer capacity β",
        format_mmol_per_l(recipe.predicted.buffer_capacity_mol_per_l) + " per pH",
        format_mmol_per_l(res.predicted.buffer_capacity_mol_per_l) + " per pH"};
    for (size_t i = 0; i < recipe.composition.size(); ++i)
        pred.table.rows << QStringList{qs(recipe.composition[i].reagent->name),
                                       format_mmol_per_l(recipe.composition[i].mol_per_l),
                                       format_mmol_per_l(res.composition[i].mol_per_l)};
    for (int i = 0; i < pred.table.rows.size(); ++i)
        pred.table.flagged << false;
    pred.table.flagged[0] = std::abs(res.predicted.ph - req.target_ph) > 0.05;
    return pred;
}

/// The warnings of a BatchDocument as a block.
Block warnings_block(const QJsonArray& warnings) {
    Block b;
    b.kind = Block::Kind::warnings;
    for (const QJsonValue& v : warnings) {
        const QJsonObject w = v.toObject();
        b.warnings << WarningLine{w.value("severity").toString(), w.value("code").toString(),
                                  w.value("message").toString()};
    }
    return b;
}

Block numbered(const QStringList& items) {
    Block b;
    b.kind = Block::Kind::numbered;
    b.items = items; // unnumbered sentences (chem::Step): the page numbers them
    return b;
}

Block bullets(const QStringList& items) {
    Block b;
    b.kind = Block::Kind::bullets;
    b.items = items;
    return b;
}

Block signoff(const chem::Batch& batch, const BatchRelease& release) {
    Block sign;
    sign.kind = Block::Kind::signoff;
    // Released: the second person is the one whose electronic review holds, not a typed name.
    sign.fields = {{"Prepared by", qs(batch.prepared_by)},
                   {"Checked by", release.released() ? release.reviewed_by : qs(batch.checked_by)}};
    return sign;
}

QList<Block> release_blocks(const BatchRelease& release) {
    QList<Block> out;
    out << heading("Electronic signatures and release");
    Block sigs;
    sigs.kind = Block::Kind::bullets;
    sigs.items = release.signature_lines;
    if (sigs.items.isEmpty())
        sigs.items << QStringLiteral("None recorded in the lab's database.");
    out << sigs;
    if (release.released()) {
        Block r;
        r.kind = Block::Kind::paragraph;
        r.text = release.released_line;
        out << r;
    } else {
        Block n;
        n.kind = Block::Kind::notice;
        n.text = QStringLiteral("NOT RELEASED FOR USE");
        n.items << QStringLiteral("A second person, not the preparer, signs it as reviewed in the "
                                  "lab's database before the batch is used.");
        out << n;
    }
    return out;
}

void set_release(LabelData& label, const BatchRelease& release) {
    label.released = release.released();
    label.release = release.released()
                        ? release.released_line.section(QStringLiteral(": "), 1)
                              .prepend(QStringLiteral("Released: "))
                        : QStringLiteral("NOT RELEASED — awaiting review by a second person");
}

QString purpose_of(const QJsonObject& input) {
    return input.value("batch").toObject().value("purpose").toString(
        input.value("purpose").toString());
}

QString percent_text(double fraction) {
    return QString::number(fraction * 100, 'f',
                           fraction * 100 == std::round(fraction * 100) ? 0 : 1) +
           " %";
}

// ---- the out-of-tolerance mark, the deviation and the correction ------------------------------

/// The words boxed on every page and label of an out-of-tolerance batch (PhasePlan's own wording).
const QString out_of_tolerance_mark = QStringLiteral("OUT OF TOLERANCE — see the deviation note");

/// The mark, the reasons, the deviation note (who, when) and the suggested correction.
void add_deviation_blocks(const AppData& data, const BatchDocument& doc, SheetDocument& d) {
    if (!doc.out_of_tolerance)
        return;
    d.mark = out_of_tolerance_mark;
    Block notice;
    notice.kind = Block::Kind::notice;
    notice.text = out_of_tolerance_mark;
    notice.items = out_of_tolerance_texts(data, doc);
    d.blocks << notice;
    const chem::Batch& b = doc.batch;
    d.blocks << heading(QStringLiteral("Deviation"));
    d.blocks << fields_block({
        {"Deviation note",
         b.deviation_note.empty() ? QStringLiteral("none recorded") : qs(b.deviation_note)},
        {"Recorded by", qs(b.deviation_by)},
        {"Recorded at", iso_minute_text(qs(b.deviation_at))},
    });
    if (!doc.correction_text.isEmpty())
        d.blocks << heading(QStringLiteral("Suggested correction")) << bullets(doc.correction_text);
}

/// Measured at the bench: the pH meter's reading, the instruments and a comment.
QList<KeyValue> bench_fields(const chem::Batch& b, std::optional<double> target_ph,
                             const QJsonObject& ph_capture) {
    QString ph = b.measured_ph ? format_ph(*b.measured_ph) : QString();
    if (b.measured_ph && target_ph) {
        const double dev = *b.measured_ph - *target_ph;
        ph += " (" + QString(dev >= 0 ? "+" : "") + QString::number(dev, 'f', 2) +
              " from the target, ± " + qs(chem::format_number(b.ph_tolerance)) + " allowed)";
    }
    if (b.measured_ph)
        ph += ", " + capture_source_text(ph_capture);
    return {{"Measured pH", ph},
            {"pH meter", qs(b.ph_meter_id)},
            {"Balance", qs(b.balance_id)},
            {"Comment", qs(b.comment)}};
}

// ---- line -------------------------------------------------------------------------------------

/// Pictograms and H codes of a line's parts: its solvents, additives and buffer reagents.
void add_line_hazards(const AppData& data, const chem::LineSpec& spec, HazardSet& hz) {
    for (const auto& part : spec.parts) {
        if (part.buffer) {
            std::set<std::string> seen;
            for (const auto& it : part.buffer->items)
                if (seen.insert(it.reagent).second) {
                    const chem::Reagent& r = data.reagents.reagent(it.reagent);
                    hz.add(qs(r.name), r.ghs_hazards, r.ghs_pictograms);
                }
        } else if (const chem::Solvent* s = data.solvents.find_solvent(part.solvent)) {
            hz.add(qs(s->name), s->ghs_hazards, s->ghs_pictograms);
        }
    }
    for (const auto& a : spec.additives)
        if (const chem::Reagent* r = data.reagents.find_reagent(a.additive))
            hz.add(qs(r->name), r->ghs_hazards, r->ghs_pictograms);
}

/// "Acetonitrile 90 % v/v" lines and dissolved reagents in mmol/L, for a label.
QStringList line_composition(const AppData& data, const chem::LineProfile& p) {
    QStringList out;
    for (const auto& [id, f] : p.solvent_fraction_v) {
        const chem::Solvent* s = data.solvents.find_solvent(id);
        out << (s ? qs(s->name) : qs(id)) + " " + percent_text(f) + " v/v";
    }
    for (const auto& so : p.solutes) {
        const chem::Reagent* r = data.reagents.find_reagent(so.reagent);
        out << (r ? dissolved_formula(*r) : qs(so.reagent)) + " " +
                   QString::number(so.mmol_per_l, 'f', 2) + " mmol/L";
    }
    return out;
}

PrintJob start_job(const BatchDocument& doc, const QString& kind, const QString& kind_title,
                   const QString& printed_at) {
    PrintJob job;
    job.kind = kind;
    job.copies = doc.copies;
    job.title = doc.title + " — batch " + qs(doc.batch.id);
    SheetDocument& d = job.sheet;
    d.kind_title = kind_title;
    d.title = doc.title;
    d.batch_id = qs(doc.batch.id);
    d.footer = "Printed " + printed_at + " by PhasePlan from the plan. " + footer_note;
    return job;
}

void add_batch_blocks(const AppData& data, const BatchDocument& doc, const QJsonObject& input,
                      std::optional<double> target_ph, SheetDocument& d) {
    const chem::Batch& batch = doc.batch;
    const QString shelf_note = shelf_note_text(doc.shelf_life_h, doc.shelf_kind, doc.shelf_source,
                                               !batch.expires_at.empty());
    QList<KeyValue> fields =
        batch_fields(batch, doc.title, purpose_of(input), doc.expires_at, shelf_note);
    if (doc.expiry_limit)
        for (KeyValue& kv : fields)
            if (kv.key == QLatin1String("Expires at"))
                kv.value += "\nlimited by " + expiry_limit_text(data, doc);
    d.blocks << heading("Batch")
             << fields_block(fields + bench_fields(batch, target_ph, doc.ph_capture));
    if (!doc.lot_override_text.isEmpty())
        d.blocks << heading("Expired lots used by an approver's override")
                 << bullets(doc.lot_override_text);
}

QString lot_text(const chem::AmountCheck& c) {
    if (c.lot_expires_on.empty())
        return qs(c.lot);
    return qs(c.lot) + "\nexp. " + qs(c.lot_expires_on) +
           (c.lot_override ? QStringLiteral("\nEXPIRED: override") : QString());
}

void fill_label_batch(const BatchDocument& doc, const HazardSet& hz, const QString& mark,
                      const BatchRelease& release, LabelData& label) {
    const chem::Batch& batch = doc.batch;
    label.batch_id = qs(batch.id);
    label.prepared_at = iso_minute_text(qs(batch.prepared_at));
    label.expires_at = iso_minute_text(doc.expires_at);
    if (doc.expiry_limited_by >= 0 && doc.expiry_limited_by < int(batch.actual.size()))
        label.expires_at += " (lot " + qs(batch.actual[size_t(doc.expiry_limited_by)].lot) + ")";
    label.prepared_by = qs(batch.prepared_by);
    label.pictograms = sorted_pictograms(hz.pictograms);
    label.hazard_codes = hz.codes();
    label.qr_text = qs(batch.id);
    label.mark = mark;
    if (!doc.lot_override_text.isEmpty()) {
        const QString note = QStringLiteral("EXPIRED LOT USED BY OVERRIDE — see the sheet");
        label.mark = label.mark.isEmpty() ? note : label.mark + "\n" + note;
    }
    set_release(label, release);
}

} // namespace phaseplan::print::sheet_parts
