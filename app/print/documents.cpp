#include "print/documents.h"

#include "chem/error.h"
#include "chem/recipe.h"
#include "core/chem_json.h"
#include "core/json_util.h"
#include "print/ghs.h"

#include <QDir>
#include <QFile>
#include <QJsonArray>
#include <QJsonDocument>
#include <QRegularExpression>

#include <cmath>
#include <map>
#include <set>

namespace phaseplan::print {

namespace {

QString qs(const std::string& s) { return QString::fromStdString(s); }

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
    "The hazard information lists the parts as supplied (reagents, solvents); the classification of "
    "the finished solution depends on its concentrations. It does not replace the safety data "
    "sheets, local rules or licensed practice.");

QString system_label(const chem::Library& lib, const std::string& reagent_id) {
    const chem::Reagent* r = lib.find_reagent(reagent_id);
    if (!r || r->systems.empty()) return {};
    const chem::AcidBaseSystem* s = lib.find_system(r->systems.front().system);
    if (!s) return {};
    QString name = qs(s->name);
    const int cut = name.indexOf(" (");
    return cut > 0 ? name.left(cut) : name;
}

/// The formula of what is dissolved: a hydrate's water is just water once in solution.
QString dissolved_formula(const chem::Reagent& r) {
    QString f = qs(r.formula);
    static const QRegularExpression hydrate(QStringLiteral("(\\(H2O\\)\\d*|[·.]\\d*H2O)$"));
    f.remove(hydrate);
    return f;
}

QString recipe_title(const chem::Library& lib, const chem::Recipe& r, const QJsonObject& input) {
    if (input.value("name").isString() && !input.value("name").toString().trimmed().isEmpty())
        return input.value("name").toString().trimmed();
    const auto& q = r.request;
    QString sys = system_label(lib, q.route == chem::Route::titrate ? q.weigh : q.acid);
    if (sys.isEmpty()) sys = QStringLiteral("Buffer");
    QString t = sys + " buffer pH " + format_ph(q.target_ph);
    if (q.concentration_mol_per_l) t += ", " + format_mmol_per_l(*q.concentration_mol_per_l);
    else if (q.ionic_strength_mol_per_l) t += ", I = " + format_mmol_per_l(*q.ionic_strength_mol_per_l);
    return t;
}

QString route_text(const chem::RecipeRequest& q) {
    switch (q.route) {
    case chem::Route::mix: return QStringLiteral("mix: %1 + %2").arg(qs(q.acid), qs(q.base));
    case chem::Route::titrate:
        return QStringLiteral("titrate: weigh %1, adjust with %2 %3 mol/L")
            .arg(qs(q.weigh), qs(q.titrant), qs(chem::format_number(q.titrant_mol_per_l)));
    case chem::Route::stocks:
        return QStringLiteral("stocks: %1 %2 mol/L + %3 %4 mol/L")
            .arg(qs(q.acid), qs(chem::format_number(q.acid_stock_mol_per_l)), qs(q.base),
                 qs(chem::format_number(q.base_stock_mol_per_l)));
    }
    return {};
}

QString form_text(const chem::Reagent& r, const chem::RecipeItem& it, const chem::RecipeRequest& q) {
    if (it.as == "solid") {
        double purity = r.assay_fraction;
        for (const auto& [id, p] : q.purity_overrides)
            if (id == r.id) purity = p;
        return purity < 1 ? QStringLiteral("solid, %1 %").arg(qs(chem::format_number(purity * 100)))
                          : QStringLiteral("solid");
    }
    if (it.as == "liquid")
        return QStringLiteral("liquid, %1 % w/w, %2 g/mL")
            .arg(qs(chem::format_number(r.assay_fraction * 100)), qs(chem::format_number(r.density_g_per_ml)));
    return qs(it.as);
}

QJsonObject check_to_json(const chem::AmountCheck& c) {
    QJsonObject o{{"reagent", qs(c.reagent)},
                  {"unit", qs(c.unit)},
                  {"target", c.target},
                  {"low", c.low},
                  {"high", c.high},
                  {"entered", c.entered},
                  {"within_tolerance", c.within_tolerance},
                  {"target_mol_per_l", c.target_mol_per_l},
                  {"actual_mol_per_l", c.actual_mol_per_l}};
    if (c.entered) {
        o["actual"] = c.actual;
        o["deviation_percent"] = c.deviation_fraction * 100;
    }
    if (!c.lot.empty()) o["lot"] = qs(c.lot);
    return o;
}

/// A warning as JSON; amount warnings carry their numbers as fields too.
QJsonObject warning_json(const chem::Warning& w, const chem::AmountCheck* c = nullptr) {
    QJsonObject o = warning_to_json(w);
    if (c) {
        o["reagent"] = qs(c->reagent);
        o["unit"] = qs(c->unit);
        o["target"] = c->target;
        o["actual"] = c->actual;
        o["deviation_percent"] = c->deviation_fraction * 100;
    }
    return o;
}

WarningLine warning_line(const chem::Warning& w) {
    return {QString::fromLatin1(chem::severity_name(w.severity)), qs(w.code), qs(w.message)};
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
        for (const auto& p : pictos) pictograms << qs(p);
        for (const auto& h : hazards) {
            QStringList& l = from[qs(h)];
            if (!l.contains(part)) l << part;
        }
    }
    QStringList codes() const {
        QStringList c;
        for (const auto& [k, v] : from) c << k;
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
            b.text = QStringLiteral("Hazard statements: UN GHS wording (from memory); the safety data "
                                    "sheet of the product in hand is the authority.");
        return b;
    }
};

QStringList cautions_with_standard(const std::vector<std::string>& own) {
    QStringList out;
    for (const auto& c : own) out << qs(c);
    for (const QString& s : standard_cautions) {
        // The recipe's own cautions already end with the SDS and local-rules sentence: do not
        // print the same advice twice.
        const bool sds = s.contains("safety data sheet");
        const bool rules = s.contains("licensed practice");
        bool covered = false;
        for (const QString& o : out)
            covered |= (sds && o.contains("safety data sheet")) || (rules && o.contains("licensed practice") && !sds);
        if (!covered) out << s;
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
        {"Expires at", expires.isEmpty() ? QStringLiteral("prepared at + shelf life") : format_datetime(expires)},
        {"Shelf life", shelf_note},
        {"Checked by", blank(b.checked_by)},
        {"Tolerance", "± " + qs(chem::format_number(b.tolerance_fraction * 100)) + " % on every amount"},
    };
}

QString shelf_note_text(double hours, const QString& kind, const QString& source, bool given) {
    if (given) return QStringLiteral("expiry entered with the batch");
    QString h = qs(chem::format_number(hours)) + " h";
    if (hours >= 48 && std::fmod(hours, 24) == 0) h += " (" + qs(chem::format_number(hours / 24)) + " days)";
    return h + ", " + kind + (source.isEmpty() ? QString() : " — " + source);
}

// ---- recipe -----------------------------------------------------------------------------------

PrintJob recipe_job(const AppData& data, const QJsonObject& input, const QString& printed_at) {
    const chem::Library& lib = data.reagents;
    const chem::RecipeRequest req = recipe_request_from_json(lib, input, "");
    const chem::Recipe recipe = chem::design_recipe(lib, req);

    std::optional<int> copies;
    std::optional<double> shelf_override;
    const chem::Batch batch = batch_from_json(input, &copies, &shelf_override);
    QString shelf_source;
    const double shelf_h = shelf_override.value_or(default_shelf_life_h(data, "aqueous-buffer", &shelf_source));
    const chem::BatchResult res = chem::evaluate_batch(lib, recipe, batch, shelf_h);

    PrintJob job;
    job.kind = "recipe";
    job.copies = copies;
    const QString title = recipe_title(lib, recipe, input);
    const QString purpose = input.value("batch").toObject().value("purpose").toString(
        input.value("purpose").toString());
    job.title = title + " — batch " + qs(batch.id);

    SheetDocument& d = job.sheet;
    d.kind_title = QStringLiteral("Buffer preparation record");
    d.title = title;
    d.batch_id = qs(batch.id);
    d.footer = "Printed " + printed_at + " by PhasePlan from the plan. " + footer_note;

    const QString shelf_note = shelf_note_text(shelf_h, QStringLiteral("an aqueous buffer"),
                                               shelf_override ? QStringLiteral("entered") : shelf_source,
                                               !batch.expires_at.empty());
    d.blocks << heading("Batch")
             << fields_block(batch_fields(batch, title, purpose, qs(res.expires_at), shelf_note));

    QList<KeyValue> plan = {
        {"Target pH", format_ph(req.target_ph) + " at " + qs(chem::format_number(req.temperature_c)) + " °C"},
        {"Final volume", qs(chem::format_number(req.volume_ml)) + " mL" +
                             (batch.final_volume_ml ? "  (made: " + qs(chem::format_number(*batch.final_volume_ml)) + " mL)" : QString())},
        {"Route", route_text(req)},
        {req.concentration_mol_per_l ? "Buffer concentration" : "Ionic strength",
         format_mmol_per_l(req.concentration_mol_per_l ? *req.concentration_mol_per_l : *req.ionic_strength_mol_per_l)},
    };
    d.blocks << heading("Plan") << fields_block(plan);

    // Reagents: target, tolerance, actual, lot.
    Block table;
    table.kind = Block::Kind::table;
    table.table.headers = {"Reagent", "Form", "Target", "Tolerance", "Actual", "Lot", "Check"};
    table.table.weights = {3.4, 1.8, 1.6, 1.9, 1.5, 1.4, 1.4};
    QJsonArray checks_json;
    QJsonArray all_warnings;
    for (size_t k = 0; k < recipe.items.size(); ++k) {
        const chem::RecipeItem& it = recipe.items[k];
        const chem::AmountCheck& c = res.checks[k];
        const chem::Reagent& r = lib.reagent(it.reagent);
        QString target = format_amount(c.target) + " " + qs(c.unit);
        if (it.as == "liquid" && it.mass_g && it.volume_ml)
            target = c.unit == "g" ? format_amount(*it.mass_g) + " g\n(" + format_amount(*it.volume_ml) + " mL)"
                                   : format_amount(*it.volume_ml) + " mL\n(" + format_amount(*it.mass_g) + " g)";
        if (it.as.rfind("titrant", 0) == 0) target += "\n(predicted)";
        const QString tol = "± " + qs(chem::format_number(batch.tolerance_fraction * 100)) + " %\n" +
                            format_amount(c.low) + "–" + format_amount(c.high) + " " + qs(c.unit);
        const QString actual = c.entered ? format_amount(c.actual) + " " + qs(c.unit) : QString();
        QString check;
        if (c.entered) {
            const QString dev = (c.deviation_fraction >= 0 ? "+" : "") +
                                QString::number(c.deviation_fraction * 100, 'f', 1) + " %";
            check = (c.within_tolerance ? "OK\n" : "OUT\n") + dev;
        }
        table.table.rows << QStringList{qs(r.name) + "\n" + qs(r.formula) + ", " +
                                            QString::number(r.molar_mass_g_per_mol, 'f', 2) + " g/mol",
                                        form_text(r, it, req), target, tol, actual, qs(c.lot), check};
        table.table.flagged << !c.within_tolerance;
        checks_json.append(check_to_json(c));
    }
    d.blocks << heading("Reagents: target and actual amounts") << table;

    // Steps, with degassing when the designer's steps leave it out (the line sheet adds organic).
    Block steps;
    steps.kind = Block::Kind::numbered;
    bool degas = false;
    for (const auto& s : recipe.steps) {
        steps.items << qs(s);
        degas |= qs(s).contains("degas", Qt::CaseInsensitive);
    }
    if (!degas) {
        const int label_step = steps.items.indexOf(QRegularExpression("^Label the bottle.*"));
        const QString text = QStringLiteral("Degas before use (helium sparge, vacuum or ultrasound) "
                                            "unless the pump degasses in line.");
        if (label_step >= 0) steps.items.insert(label_step, text);
        else steps.items << text;
    }
    d.blocks << heading("Steps") << steps;

    // Predicted: as planned and from the actual amounts.
    Block pred;
    pred.kind = Block::Kind::table;
    pred.table.headers = {"Predicted at " + qs(chem::format_number(req.temperature_c)) + " °C",
                          "As planned", "From the actual amounts"};
    pred.table.weights = {3, 2, 2};
    pred.table.rows << QStringList{"pH", format_ph(recipe.predicted.ph), format_ph(res.predicted.ph)};
    pred.table.rows << QStringList{"Ionic strength",
                                   format_mmol_per_l(recipe.predicted.ionic_strength_mol_per_l),
                                   format_mmol_per_l(res.predicted.ionic_strength_mol_per_l)};
    pred.table.rows << QStringList{"Buffer capacity β",
                                   format_mmol_per_l(recipe.predicted.buffer_capacity_mol_per_l) + " per pH",
                                   format_mmol_per_l(res.predicted.buffer_capacity_mol_per_l) + " per pH"};
    QJsonArray composition_json;
    for (size_t i = 0; i < recipe.composition.size(); ++i) {
        const chem::Reagent& r = *recipe.composition[i].reagent;
        pred.table.rows << QStringList{qs(r.name), format_mmol_per_l(recipe.composition[i].mol_per_l),
                                       format_mmol_per_l(res.composition[i].mol_per_l)};
        composition_json.append(QJsonObject{{"reagent", qs(r.id)}, {"mol_per_l", res.composition[i].mol_per_l}});
    }
    for (int i = 0; i < pred.table.rows.size(); ++i) pred.table.flagged << false;
    pred.table.flagged[0] = std::abs(res.predicted.ph - req.target_ph) > 0.05;
    d.blocks << heading("Predicted pH, ionic strength and buffer capacity") << pred;

    // Checks: the designer's warnings, then the batch's.
    Block warnings;
    warnings.kind = Block::Kind::warnings;
    for (const auto& w : recipe.warnings) {
        warnings.warnings << warning_line(w);
        all_warnings.append(warning_json(w));
    }
    for (const auto& w : res.warnings) {
        warnings.warnings << warning_line(w);
        const chem::AmountCheck* c = nullptr;
        if (w.code == "amount-out-of-tolerance")
            for (const auto& ck : res.checks)
                if (!ck.within_tolerance && w.message.rfind(ck.reagent + ":", 0) == 0) c = &ck;
        all_warnings.append(warning_json(w, c));
    }
    d.blocks << heading("Checks") << warnings;

    // Hazards of the reagents handled.
    HazardSet hz;
    std::set<std::string> seen;
    for (const auto& it : recipe.items) {
        if (!seen.insert(it.reagent).second) continue;
        const chem::Reagent& r = lib.reagent(it.reagent);
        hz.add(qs(r.name), r.ghs_hazards, r.ghs_pictograms);
    }
    Block cautions;
    cautions.kind = Block::Kind::bullets;
    cautions.items = cautions_with_standard(recipe.cautions);
    d.blocks << heading("Hazards and cautions") << hz.block() << cautions;

    Block sign;
    sign.kind = Block::Kind::signoff;
    sign.fields = {{"Prepared by", qs(batch.prepared_by)}, {"Checked by", qs(batch.checked_by)}};
    d.blocks << heading("Sign-off") << sign;

    // The bottle label.
    LabelData label;
    label.title = title;
    for (size_t i = 0; i < res.composition.size(); ++i)
        label.composition << dissolved_formula(*res.composition[i].reagent) + " " +
                                 format_mmol_per_l(res.composition[i].mol_per_l);
    label.ph = "pH " + format_ph(res.predicted.ph) + " at " + qs(chem::format_number(req.temperature_c)) + " °C";
    label.batch_id = qs(batch.id);
    label.prepared_at = format_datetime(qs(batch.prepared_at));
    label.expires_at = format_datetime(qs(res.expires_at));
    label.prepared_by = qs(batch.prepared_by);
    label.pictograms = sorted_pictograms(hz.pictograms);
    label.hazard_codes = hz.codes();
    label.qr_text = qs(batch.id);
    job.labels << label;

    QJsonObject b{{"id", qs(batch.id)},
                  {"tolerance_percent", batch.tolerance_fraction * 100},
                  {"final_volume_ml", res.final_volume_ml},
                  {"shelf_life_h", shelf_h},
                  {"checks", checks_json},
                  {"composition", composition_json},
                  {"ph", res.predicted.ph},
                  {"ionic_strength_mol_per_l", res.predicted.ionic_strength_mol_per_l},
                  {"buffer_capacity_mol_per_l", res.predicted.buffer_capacity_mol_per_l}};
    if (!batch.prepared_by.empty()) b["prepared_by"] = qs(batch.prepared_by);
    if (!batch.prepared_at.empty()) b["prepared_at"] = qs(batch.prepared_at);
    if (!res.expires_at.empty()) b["expires_at"] = qs(res.expires_at);
    if (!batch.checked_by.empty()) b["checked_by"] = qs(batch.checked_by);
    job.summary = QJsonObject{{"document", job.kind},
                              {"title", title},
                              {"target_ph", req.target_ph},
                              {"planned_ph", recipe.predicted.ph},
                              {"batch", b},
                              {"warnings", all_warnings}};
    return job;
}

} // namespace

// ---- formats ----------------------------------------------------------------------------------

QString format_amount(double v) {
    const double a = std::abs(v);
    const int decimals = a >= 100 ? 1 : a >= 10 ? 2 : a >= 1 ? 3 : 4;
    return QString::number(v, 'f', decimals);
}

QString format_ph(double ph) { return QString::number(ph, 'f', 2); }

QString format_mmol_per_l(double mol_per_l) {
    return QString::number(mol_per_l * 1000.0, 'f', 2) + " mmol/L";
}

QString format_datetime(const QString& iso) {
    if (iso.isEmpty()) return {};
    QString s = iso.left(16);
    s.replace('T', ' ');
    return s;
}

// ---- inputs -----------------------------------------------------------------------------------

QString document_kind(const QJsonObject& input) {
    if (input.contains("lines") && input.contains("sequence")) return QStringLiteral("sequence");
    if (input.contains("parts") || input.contains("bottle_ml")) return QStringLiteral("line");
    return QStringLiteral("recipe");
}

chem::Batch batch_from_json(const QJsonObject& input, std::optional<int>* copies,
                            std::optional<double>* shelf_life_h) {
    const QJsonObject o = json::require_object(input, "batch", "");
    const std::string at = "batch";
    chem::Batch b;
    b.id = json::require_string(o, "id", at);
    b.prepared_by = json::optional_string(o, "prepared_by", at).value_or("");
    b.prepared_at = json::optional_string(o, "prepared_at", at).value_or("");
    b.expires_at = json::optional_string(o, "expires_at", at).value_or("");
    b.checked_by = json::optional_string(o, "checked_by", at).value_or("");
    if (auto t = json::optional_number(o, "tolerance_percent", at)) b.tolerance_fraction = *t / 100.0;
    b.final_volume_ml = json::optional_positive(o, "final_volume_ml", at, 1.0e6);
    if (o.contains("copies") && !o.value("copies").isNull()) {
        const int n = json::require_int(o, "copies", at, 1, 200);
        if (copies) *copies = n;
    }
    if (auto h = json::optional_positive(o, "shelf_life_h", at, 1.0e5))
        if (shelf_life_h) *shelf_life_h = *h;
    if (o.contains("actual") && !o.value("actual").isNull()) {
        const QJsonArray a = json::require_array(o, "actual", at);
        const std::string list = json::path(at, "actual");
        for (int i = 0; i < a.size(); ++i) {
            const std::string ai = json::path(list, i);
            const QJsonObject e = json::element_object(a, i, list);
            chem::ActualAmount x;
            x.reagent = json::require_string(e, "reagent", ai);
            x.mass_g = json::optional_positive(e, "mass_g", ai, 1.0e6);
            x.volume_ml = json::optional_positive(e, "volume_ml", ai, 1.0e6);
            if (!x.mass_g && !x.volume_ml)
                throw chem::Error(json::path(ai, "mass_g"), "give mass_g or volume_ml");
            if (x.mass_g && x.volume_ml)
                throw chem::Error(json::path(ai, "volume_ml"), "give mass_g or volume_ml, not both");
            x.lot = json::optional_string(e, "lot", ai).value_or("");
            b.actual.push_back(std::move(x));
        }
    }
    return b;
}

double default_shelf_life_h(const AppData& data, const QString& kind, QString* source) {
    QFile f(QDir(data.data_dir).filePath(QStringLiteral("solvents.json")));
    if (f.open(QIODevice::ReadOnly)) {
        const QJsonObject doc = QJsonDocument::fromJson(f.readAll()).object();
        for (const QJsonValue& v : doc.value("shelf_life").toArray()) {
            const QJsonObject e = v.toObject();
            if (e.value("kind").toString() == kind && e.value("hours").toDouble() > 0) {
                if (source) *source = e.value("source").toString();
                return e.value("hours").toDouble();
            }
        }
    }
    const chem::ShelfLifeDefaults d;
    if (source) *source = QStringLiteral("built-in default, common practice, no source");
    if (kind.startsWith("aqueous")) return d.hours_for(chem::SolutionKind::aqueous_buffer);
    if (kind.contains("organic") && kind.contains("buffer")) return d.hours_for(chem::SolutionKind::mixed);
    return d.hours_for(chem::SolutionKind::organic);
}

PrintJob build_print_job(const AppData& data, const QJsonObject& input, const QString& printed_at) {
    const QString kind = document_kind(input);
    if (kind == "recipe") return recipe_job(data, input, printed_at);
    throw chem::Error("(document)", "printing a " + kind.toStdString() + " is not available yet");
}

} // namespace phaseplan::print
