#include "print/documents.h"

#include "chem/error.h"
#include "chem/recipe.h"
#include "chem/recipe_roles.h"
#include "core/batch_document.h"
#include "core/chem_json.h"
#include "core/date_time.h"
#include "core/json_util.h"
#include "core/line_commands.h"
#include "print/ghs.h"

#include <QDir>
#include <QFile>
#include <QJsonArray>
#include <QJsonDocument>
#include <QRegularExpression>
#include <QSet>

#include <cmath>
#include <map>
#include <set>

namespace phaseplan::print {

namespace {

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
    if (it.as == "solid") {
        return purity < 1 ? QStringLiteral("solid, %1 %").arg(qs(chem::format_number(purity * 100)))
                          : QStringLiteral("solid");
    }
    if (it.as == "liquid")
        return QStringLiteral("liquid, %1 % w/w, %2 g/mL")
            .arg(qs(chem::format_number(purity * 100)),
                 qs(chem::format_number(r.density_g_per_ml)));
    return qs(it.as);
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

/// Pictograms and H statements of the parts, each statement naming the parts that carry it.
struct HazardSet {
    QStringList pictograms;
    std::map<QString, QStringList> from; ///< H code -> part names
    void add(const QString& part, const std::vector<std::string>& hazards,
             const std::vector<std::string>& pictos) {
        for (const auto& p : pictos)
            pictograms << qs(p);
        for (const auto& h : hazards) {
            QStringList& l = from[qs(h)];
            if (!l.contains(part))
                l << part;
        }
    }
    QStringList codes() const {
        QStringList c;
        for (const auto& [k, v] : from)
            c << k;
        return sorted_hazard_codes(c);
    }
    Block block() const {
        Block b;
        b.kind = Block::Kind::hazards;
        b.pictograms = sorted_pictograms(pictograms);
        for (const QString& code : codes())
            b.hazard_lines << HazardLine{code, hazard_statement(code), from.at(code).join(", ")};
        if (b.pictograms.isEmpty() && b.hazard_lines.isEmpty())
            b.text = QStringLiteral(
                "No GHS hazard codes are recorded in the library for these parts. That is not a "
                "statement that the preparation is without hazard: check each safety data sheet.");
        else
            b.text =
                QStringLiteral("Hazard statements: UN GHS wording (from memory); the safety data "
                               "sheet of the product in hand is the authority.");
        return b;
    }
};

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
        {"Prepared at", format_datetime(qs(b.prepared_at))},
        {"Expires at",
         expires.isEmpty() ? QStringLiteral("prepared at + shelf life") : format_datetime(expires)},
        {"Shelf life", shelf_note},
        {"Checked by", blank(b.checked_by)},
        {"Tolerance",
         "± " + qs(chem::format_number(b.tolerance_fraction * 100)) + " % on every amount"},
    };
}

QString shelf_note_text(double hours, const QString& kind, const QString& source, bool given) {
    if (given)
        return QStringLiteral("expiry entered with the batch");
    QString h = qs(chem::format_number(hours)) + " h";
    if (hours >= 48 && std::fmod(hours, 24) == 0)
        h += " (" + qs(chem::format_number(hours / 24)) + " days)";
    return h + ", " + kind + (source.isEmpty() ? QString() : " — " + source);
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
    return tolerance_text(b) + "\n" + format_amount(c.low) + "–" + format_amount(c.high) + " " +
           qs(c.unit);
}

/// The reagents table of a recipe with its batch: target, tolerance, actual, lot, check.
/// The actual amount and where it came from: "3.161 g\nfrom balance BAL-03" or "…\ntyped".
QString actual_text(const chem::AmountCheck& c, const QJsonObject& captures) {
    if (!c.entered)
        return QString();
    return format_amount(c.actual) + " " + qs(c.unit) + "\n" +
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
        QString target = format_amount(c.target) + " " + qs(c.unit);
        if (it.as == "liquid" && it.mass_g && it.volume_ml)
            target =
                c.unit == "g"
                    ? format_amount(*it.mass_g) + " g\n(" + format_amount(*it.volume_ml) + " mL)"
                    : format_amount(*it.volume_ml) + " mL\n(" + format_amount(*it.mass_g) + " g)";
        if (it.as.rfind("titrant", 0) == 0)
            target += "\n(predicted)";
        table.table.rows << QStringList{qs(r.name) + "\n" + qs(r.formula) + ", " +
                                            QString::number(r.molar_mass_g_per_mol, 'f', 2) +
                                            " g/mol",
                                        form_text(r, it, recipe.request),
                                        target,
                                        band_text(c, batch),
                                        actual_text(c, captures),
                                        qs(c.lot),
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
    static const QRegularExpression lead_number(QStringLiteral("^\\s*\\d+\\.\\s+"));
    for (QString s : items)
        b.items << s.remove(lead_number);
    return b;
}

Block bullets(const QStringList& items) {
    Block b;
    b.kind = Block::Kind::bullets;
    b.items = items;
    return b;
}

Block signoff(const chem::Batch& batch) {
    Block sign;
    sign.kind = Block::Kind::signoff;
    sign.fields = {{"Prepared by", qs(batch.prepared_by)}, {"Checked by", qs(batch.checked_by)}};
    return sign;
}

QStringList strings_of(const QJsonValue& v) {
    QStringList out;
    for (const QJsonValue& x : v.toArray())
        out << x.toString();
    return out;
}

std::vector<std::string> std_strings(const QJsonValue& v) {
    std::vector<std::string> out;
    for (const QJsonValue& x : v.toArray())
        out.push_back(x.toString().toStdString());
    return out;
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
void add_deviation_blocks(const BatchDocument& doc, SheetDocument& d) {
    if (!doc.out_of_tolerance)
        return;
    d.mark = out_of_tolerance_mark;
    Block notice;
    notice.kind = Block::Kind::notice;
    notice.text = out_of_tolerance_mark;
    notice.items = doc.out_of_tolerance_reasons;
    d.blocks << notice;
    const chem::Batch& b = doc.batch;
    d.blocks << heading(QStringLiteral("Deviation"));
    d.blocks << fields_block({
        {"Deviation note",
         b.deviation_note.empty() ? QStringLiteral("none recorded") : qs(b.deviation_note)},
        {"Recorded by", qs(b.deviation_by)},
        {"Recorded at", format_datetime(qs(b.deviation_at))},
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

// ---- recipe -----------------------------------------------------------------------------------

PrintJob recipe_job(const AppData& data, const BatchDocument& doc, const QJsonObject& input,
                    const QString& printed_at) {
    const chem::Library& lib = data.reagents;
    const chem::Recipe& recipe = *doc.recipe;
    const chem::RecipeRequest& req = recipe.request;
    const chem::Batch& batch = doc.batch;
    const chem::BatchResult& res = *doc.result;

    PrintJob job;
    job.kind = "recipe";
    job.copies = doc.copies;
    const QString title = doc.title;
    job.title = title + " — batch " + qs(batch.id);

    SheetDocument& d = job.sheet;
    d.kind_title = QStringLiteral("Buffer preparation record");
    d.title = title;
    d.batch_id = qs(batch.id);
    d.footer = "Printed " + printed_at + " by PhasePlan from the plan. " + footer_note;
    add_deviation_blocks(doc, d);

    const QString shelf_note = shelf_note_text(doc.shelf_life_h, doc.shelf_kind, doc.shelf_source,
                                               !batch.expires_at.empty());
    d.blocks << heading("Batch")
             << fields_block(
                    batch_fields(batch, title, purpose_of(input), doc.expires_at, shelf_note) +
                    bench_fields(batch, req.target_ph, doc.ph_capture));

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
    d.blocks << heading("Sign-off") << signoff(batch);

    LabelData label;
    label.title = title;
    for (size_t i = 0; i < res.composition.size(); ++i)
        label.composition << dissolved_formula(*res.composition[i].reagent) + " " +
                                 format_mmol_per_l(res.composition[i].mol_per_l);
    label.ph = "pH " + format_ph(res.predicted.ph) + " at " +
               qs(chem::format_number(req.temperature_c)) + " °C";
    label.batch_id = qs(batch.id);
    label.prepared_at = format_datetime(qs(batch.prepared_at));
    label.expires_at = format_datetime(doc.expires_at);
    label.prepared_by = qs(batch.prepared_by);
    label.pictograms = sorted_pictograms(hz.pictograms);
    label.hazard_codes = hz.codes();
    label.qr_text = qs(batch.id);
    label.mark = d.mark;
    job.labels << label;

    job.summary = doc.summary;
    return job;
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

PrintJob line_job(const AppData& data, const BatchDocument& doc, const QJsonObject& input,
                  const QString& printed_at) {
    const QJsonObject& out = doc.line_out;
    const double volume = out.value("volume_ml").toDouble();
    const chem::LineRecipe& lr = *doc.line;
    const chem::Batch& batch = doc.batch;
    const std::optional<chem::BatchResult>& bres = doc.result;

    PrintJob job;
    job.kind = "line";
    job.copies = doc.copies;
    const QString title = doc.title;
    job.title = title + " — batch " + qs(batch.id);
    SheetDocument& d = job.sheet;
    d.kind_title = QStringLiteral("Mobile-phase line preparation record");
    d.title = title;
    d.batch_id = qs(batch.id);
    d.footer = "Printed " + printed_at + " by PhasePlan from the plan. " + footer_note;
    add_deviation_blocks(doc, d);
    const QString shelf_note = shelf_note_text(doc.shelf_life_h, doc.shelf_kind, doc.shelf_source,
                                               !batch.expires_at.empty());
    d.blocks << heading("Batch")
             << fields_block(
                    batch_fields(batch, title, purpose_of(input), doc.expires_at, shelf_note) +
                    bench_fields(batch,
                                 lr.buffer ? std::optional<double>(lr.buffer->request.target_ph)
                                           : std::nullopt,
                                 doc.ph_capture));

    QStringList by_volume;
    for (const auto& [id, f] : lr.profile.solvent_fraction_v)
        by_volume << qs(id) + " " + percent_text(f);
    QList<KeyValue> plan = {
        {"Volume to prepare", qs(chem::format_number(volume)) + " mL"},
        {"Composition by volume", by_volume.join(", ")},
        {"UV cutoff",
         qs(chem::format_number(lr.profile.uv_cutoff_nm)) + " nm" +
             (lr.profile.uv_limited_by.empty() ? QString()
                                               : " (set by " + qs(lr.profile.uv_limited_by) + ")")},
        {"pH of the aqueous part",
         lr.profile.ph ? format_ph(*lr.profile.ph) + " (" + qs(lr.profile.ph_basis) + ")"
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
        parts.table.rows << QStringList{qs(it.part),
                                        qs(it.kind),
                                        it.volume_ml ? format_amount(*it.volume_ml) + " mL"
                                                     : QString(),
                                        it.mass_g ? format_amount(*it.mass_g) + " g" : QString(),
                                        band_text(c, batch),
                                        actual_text(c, doc.captures),
                                        qs(c.lot),
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
    if (!out.value("notes").toArray().isEmpty())
        d.blocks << bullets(strings_of(out.value("notes")));
    if (lr.buffer)
        d.blocks << heading("Predicted for the aqueous buffer")
                 << predicted_table(*lr.buffer, *bres, QStringLiteral("Buffer alone"));
    d.blocks << heading("Checks") << warnings_block(doc.warnings);

    HazardSet hz;
    add_line_hazards(data, *doc.line_spec, hz);
    d.blocks << heading("Hazards and cautions") << hz.block()
             << bullets(cautions_with_standard(std_strings(out.value("cautions"))));
    d.blocks << heading("Sign-off") << signoff(batch);

    LabelData label;
    label.title = title;
    label.composition = line_composition(data, lr.profile);
    if (lr.profile.ph) {
        const double ph = bres ? bres->predicted.ph : *lr.profile.ph;
        label.ph = "pH " + format_ph(ph) + " (aqueous part)";
    }
    label.batch_id = qs(batch.id);
    label.prepared_at = format_datetime(qs(batch.prepared_at));
    label.expires_at = format_datetime(doc.expires_at);
    label.prepared_by = qs(batch.prepared_by);
    label.pictograms = sorted_pictograms(hz.pictograms);
    label.hazard_codes = hz.codes();
    label.qr_text = qs(batch.id);
    label.mark = d.mark;
    job.labels << label;

    job.summary = doc.summary;
    return job;
}

// ---- sequence ---------------------------------------------------------------------------------

PrintJob sequence_job(const AppData& data, const BatchDocument& doc, const QJsonObject& input,
                      const QString& printed_at) {
    const QJsonObject& out = doc.sequence_out;
    const chem::Batch& batch = doc.batch;
    QJsonObject lines_in = input.value("lines").toObject();
    const QJsonObject lines_out = out.value("lines").toObject();

    PrintJob job;
    job.kind = "sequence";
    job.copies = doc.copies;
    const QString title = doc.title;
    job.title = title + " — batch " + qs(batch.id);
    SheetDocument& d = job.sheet;
    d.kind_title = QStringLiteral("Sequence solvent plan");
    d.title = title;
    d.batch_id = qs(batch.id);
    d.footer = "Printed " + printed_at + " by PhasePlan from the plan. " + footer_note;

    QList<KeyValue> head = {
        {"Batch id", qs(batch.id)},
        {"Purpose", purpose_of(input)},
        {"Prepared by", qs(batch.prepared_by)},
        {"Prepared at", format_datetime(qs(batch.prepared_at))},
        {"Start", format_datetime(out.value("start").toString())},
        {"End of the last injection", format_datetime(out.value("end").toString())},
        {"Injections", QString::number(out.value("injections").toInt())},
        {"Run time", duration_h_min_text(out.value("total_min").toDouble())},
    };
    if (out.contains("standby_end"))
        head << KeyValue{"Standby flow until",
                         format_datetime(out.value("standby_end").toString())};
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
                    format_datetime(l.value("dry_at").toString());
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
                strings_of(b.value("lines")).join(", "),
                format_amount(b.value("prepare_ml").toDouble()) + " mL",
                format_datetime(b.value("first_use").toString()),
                format_datetime(b.value("last_use").toString()),
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
                          format_datetime(r.value("start").toString()),
                          format_datetime(r.value("end").toString())};
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
        label.prepared_at = format_datetime(qs(batch.prepared_at));
        if (!batch.expires_at.empty())
            label.expires_at = format_datetime(qs(batch.expires_at));
        else if (!batch.prepared_at.empty())
            label.expires_at = format_datetime(qs(chem::add_hours(
                batch.prepared_at, l.value("shelf_life_h").toDouble(48), "batch.prepared_at")));
        label.prepared_by = qs(batch.prepared_by);
        label.pictograms = sorted_pictograms(hz.pictograms);
        label.hazard_codes = hz.codes();
        job.labels << label;
    }
    d.blocks << heading("Hazards and cautions") << all.block()
             << bullets(cautions_with_standard({}));
    d.blocks << heading("Sign-off") << signoff(batch);

    job.summary = doc.summary;
    return job;
}

} // namespace

// ---- formats ----------------------------------------------------------------------------------

QString format_amount(double v) {
    return QString::fromStdString(chem::format_amount(v));
}

QString format_ph(double ph) {
    return QString::number(ph, 'f', 2);
}

QString format_mmol_per_l(double mol_per_l) {
    return QString::number(mol_per_l * 1000.0, 'f', 2) + " mmol/L";
}

QString format_datetime(const QString& iso) {
    if (iso.isEmpty())
        return {};
    QString s = iso.left(16);
    s.replace('T', ' ');
    return s;
}

PrintJob build_print_job(const AppData& data, const QJsonObject& input, const QString& printed_at) {
    // Texts that only the paper shows: held to the same limit as every text field.
    for (const char* key : {"name", "purpose"})
        if (input.value(key).isString())
            json::check_text(input.value(key).toString(), key, chem::guard::max_text_chars);
    const QJsonValue purpose = input.value("batch").toObject().value("purpose");
    if (purpose.isString())
        json::check_text(purpose.toString(), "batch.purpose", chem::guard::max_text_chars);
    const BatchDocument doc = read_batch_document(data, input);
    require_deviation_note(doc);
    if (doc.kind == "line")
        return line_job(data, doc, input, printed_at);
    if (doc.kind == "sequence")
        return sequence_job(data, doc, input, printed_at);
    return recipe_job(data, doc, input, printed_at);
}

} // namespace phaseplan::print
