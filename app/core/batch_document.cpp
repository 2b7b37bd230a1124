#include "core/batch_document.h"

#include "chem/finding_text.h"
#include "chem/note_text.h"

#include "chem/error.h"
#include "chem/guard.h"
#include "chem/recipe_roles.h"
#include "core/chem_json.h"
#include "core/json_util.h"
#include "core/line_commands.h"
#include "core/sequence_result.h"

#include <QDateTime>
#include <QJsonDocument>
#include <QSet>

#include <cmath>
#include <map>
#include <set>

namespace phaseplan {

namespace {

QString qs(const std::string& s) {
    return QString::fromStdString(s);
}

QString recipe_title(const chem::Library& lib, const chem::Recipe& r, const QJsonObject& input) {
    if (input.value("name").isString() && !input.value("name").toString().trimmed().isEmpty())
        return input.value("name").toString().trimmed();
    // The same default name the buffer screen shows until the user names the buffer.
    return qs(chem::default_buffer_name(lib, r.request));
}

QJsonObject check_to_json(const chem::AmountCheck& c, const QString& name) {
    QJsonObject o{{"reagent", qs(c.reagent)},
                  {"name", name},
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
    if (!c.lot.empty())
        o["lot"] = qs(c.lot);
    if (!c.lot_expires_on.empty())
        o["lot_expires_on"] = qs(c.lot_expires_on);
    return o;
}

/// Every warning once; an amount warning names its part by the screens' name and carries its
/// numbers as fields too.
struct WarningList {
    std::vector<BatchWarning> list;
    QSet<QString> seen;
    const AppData* data = nullptr;

    void add(const chem::Warning& w, const std::vector<chem::AmountCheck>* checks = nullptr) {
        QJsonObject o = warning_to_json(w);
        // An amount's finding is about its part (a typed reference): it is worded again with the
        // screens' name for the part, and its check's numbers go with it.
        using K = chem::FindingKind;
        const chem::Finding* f = w.finding ? &*w.finding : nullptr;
        const bool about_amount =
            f && (f->kind == K::amount_out_of_tolerance || f->kind == K::amount_not_entered);
        if (checks && about_amount)
            for (const auto& c : *checks) {
                if (c.reagent != f->subject.id)
                    continue;
                chem::RenderContext words;
                words.name_of = [this](const std::string& id) {
                    return part_display_name(*data, id).toStdString();
                };
                o["message"] = qs(chem::describe(*f, words));
                if (w.code == "amount-out-of-tolerance" && !c.within_tolerance) {
                    o["reagent"] = qs(c.reagent);
                    o["unit"] = qs(c.unit);
                    o["target"] = c.target;
                    o["actual"] = c.actual;
                    o["deviation_percent"] = c.deviation_fraction * 100;
                }
                break;
            }
        add(o);
    }
    void add(const QJsonObject& w) {
        const QString key = w.value("code").toString() + "\n" + w.value("message").toString();
        if (seen.contains(key))
            return;
        seen.insert(key);
        list.push_back({w.value("code").toString(), w.value("severity").toString(),
                        w.value("message").toString(), w});
    }
};

void add_reasons(const std::vector<chem::AmountCheck>& checks, double tolerance_fraction,
                 BatchDocument& d) {
    for (const auto& c : checks)
        if (c.entered && !c.within_tolerance) {
            d.out_of_tolerance = true;
            d.out_of_tolerance_reasons.push_back(chem::amount_reason(c, tolerance_fraction));
        }
}

void add_ph_reason(const chem::BatchResult& r, const chem::Batch& b, double target_ph,
                   BatchDocument& d) {
    if (!r.measured_ph_out || !b.measured_ph)
        return;
    d.out_of_tolerance = true;
    d.out_of_tolerance_reasons.push_back(
        chem::measured_ph_reason(*b.measured_ph, target_ph, b.ph_tolerance));
}

/// The screens' names for the batch's parts (part_display_name), for chem::describe.
chem::RenderContext part_words(const AppData& data) {
    chem::RenderContext words;
    words.name_of = [&data](const std::string& id) {
        return part_display_name(data, id).toStdString();
    };
    return words;
}

/// The correction in words (chem::describe, parts by the screens' names); `prefix` names the part
/// of a line it is for ("" for a recipe). `made_up`: the volume is made up to the mark (a buffer),
/// not the sum of parts (a line).
QStringList correction_words(const AppData& data, const chem::Correction& c, const QString& prefix,
                             bool made_up = true) {
    QStringList out;
    for (const std::string& sentence : chem::describe(c, part_words(data).name_of, made_up))
        out << prefix + qs(sentence);
    return out;
}

QJsonObject correction_json(const AppData& data, const chem::Correction& c,
                            const QStringList& text) {
    QJsonArray steps;
    for (const auto& s : c.steps) {
        QJsonObject o{{"reagent", qs(s.reagent)},
                      {"name", part_display_name(data, s.reagent)},
                      {"unit", qs(s.unit)},
                      {"target", s.target},
                      {"new_target", s.new_target},
                      {"entered", s.entered},
                      {"add", s.add},
                      {"after", s.after}};
        if (s.entered)
            o["actual"] = s.actual;
        steps.append(o);
    }
    QJsonObject o{{"remake", c.remake},
                  {"scale", c.scale},
                  {"planned_volume_ml", c.planned_volume_ml},
                  {"final_volume_ml", c.final_volume_ml},
                  {"steps", steps},
                  {"text", QJsonArray::fromStringList(text)}};
    if (c.container_ml)
        o["container_ml"] = *c.container_ml;
    if (c.remake)
        o["remake_reason"] = qs(chem::remake_reason(c));
    return o;
}

QJsonObject batch_summary(const chem::Batch& batch, const QString& expires_at, double shelf_h) {
    QJsonObject b{{"id", qs(batch.id)},
                  {"tolerance_percent", batch.tolerance_fraction * 100},
                  {"shelf_life_h", shelf_h},
                  {"ph_tolerance", batch.ph_tolerance}};
    auto put = [&](const char* key, const std::string& v) {
        if (!v.empty())
            b[key] = qs(v);
    };
    put("prepared_by", batch.prepared_by);
    put("prepared_at", batch.prepared_at);
    if (!expires_at.isEmpty())
        b["expires_at"] = expires_at;
    put("checked_by", batch.checked_by);
    put("ph_meter_id", batch.ph_meter_id);
    put("balance_id", batch.balance_id);
    put("comment", batch.comment);
    if (batch.measured_ph)
        b["measured_ph"] = *batch.measured_ph;
    if (batch.container_ml)
        b["container_ml"] = *batch.container_ml;
    if (!batch.deviation_note.empty()) {
        QJsonObject dev{{"note", qs(batch.deviation_note)}};
        if (!batch.deviation_by.empty())
            dev["by"] = qs(batch.deviation_by);
        if (!batch.deviation_at.empty())
            dev["at"] = qs(batch.deviation_at);
        b["deviation"] = dev;
    }
    return b;
}

QJsonArray steps_json(const QList<StepSection>& sections) {
    QJsonArray a;
    for (const StepSection& s : sections)
        a.append(
            QJsonObject{{"heading", s.heading}, {"steps", QJsonArray::fromStringList(s.steps)}});
    return a;
}

/// Runs a batch against a sub-recipe (a line's buffer) whose amounts are a subset of the batch's:
/// errors name the entry's index in the whole "batch.actual" list.
chem::BatchResult evaluate_subset(const chem::Library& lib, const chem::Recipe& recipe,
                                  const chem::Batch& whole, const std::vector<int>& indexes,
                                  double shelf_h) {
    chem::Batch sub = whole;
    sub.actual.clear();
    for (int i : indexes)
        sub.actual.push_back(whole.actual[i]);
    try {
        return chem::evaluate_batch(lib, recipe, sub, shelf_h);
    } catch (const chem::Error& e) {
        static const chem::Path actual = chem::Path::parse("batch.actual");
        const auto at = chem::subscript_of(e.path(), actual);
        const int k = at ? at->index() : -1;
        if (k < 0)
            throw;
        const int original = k < int(indexes.size()) ? indexes[k] : k;
        chem::Path renumbered = actual;
        renumbered /= chem::PathSegment::index(static_cast<std::size_t>(original));
        throw chem::Error(at->rest_path.under(renumbered), e.message());
    }
}

void finish_tolerance(const AppData& data, const BatchDocument& d, QJsonObject& b) {
    b["out_of_tolerance"] = d.out_of_tolerance;
    b["out_of_tolerance_reasons"] = QJsonArray::fromStringList(out_of_tolerance_texts(data, d));
    if (d.correction && d.correction->needed)
        b["correction"] = correction_json(data, *d.correction, d.correction_text);
    b["steps"] = steps_json(d.steps);
}

// ---- recipe -----------------------------------------------------------------------------------

void read_recipe(const AppData& data, const QJsonObject& input, BatchDocument& d) {
    const chem::Library& lib = data.reagents;
    const chem::RecipeRequest req = recipe_request_from_json(lib, input, "");
    d.recipe = chem::design_recipe(lib, req);
    d.batch = batch_from_json(input, &d.copies, &d.shelf_override);
    d.shelf_life_h = d.shelf_override.value_or(
        default_shelf_life_h(data, chem::ShelfKind::aqueous_buffer, &d.shelf_source));
    if (d.shelf_override)
        d.shelf_source = QStringLiteral("entered");
    d.shelf_kind = chem::ShelfKind::aqueous_buffer;
    d.result = chem::evaluate_batch(lib, *d.recipe, d.batch, d.shelf_life_h);
    const chem::BatchResult& res = *d.result;
    d.expires_at = qs(res.expires_at);
    d.expiry_limited_by = res.expiry_limited_by;
    d.title = recipe_title(lib, *d.recipe, input);
    d.steps << StepSection{QStringLiteral("Steps"), recipe_steps(*d.recipe)};

    add_reasons(res.checks, d.batch.tolerance_fraction, d);
    add_ph_reason(res, d.batch, req.target_ph, d);
    d.correction = chem::suggest_correction(res.checks, d.batch.tolerance_fraction, req.volume_ml,
                                            d.batch.container_ml);
    d.correction_text = correction_words(data, *d.correction, {});

    WarningList warnings{{}, {}, &data};
    for (const auto& w : d.recipe->warnings)
        warnings.add(w);
    for (const auto& w : res.warnings)
        warnings.add(w, &res.checks);
    BatchEvaluation& ev = d.evaluation;
    ev.warnings = std::move(warnings.list);
    for (const auto& c : res.checks)
        ev.checks.push_back({c, part_display_name(data, c.reagent)});
    for (const auto& c : res.composition)
        ev.composition.push_back({c.reagent->id, c.mol_per_l});
    ev.final_volume_ml = res.final_volume_ml;
    ev.ph = res.predicted.ph;
    ev.ionic_strength_mol_per_l = res.predicted.ionic_strength_mol_per_l;
    ev.buffer_capacity_mol_per_l = res.predicted.buffer_capacity_mol_per_l;
    ev.target_ph = req.target_ph;
    ev.planned_ph = d.recipe->predicted.ph;
    ev.shelf_life_h = d.shelf_life_h;
}

// ---- line -------------------------------------------------------------------------------------

void read_line(const AppData& data, const QJsonObject& input_in, BatchDocument& d) {
    QJsonObject input = input_in;
    if (!input.contains("volume_ml") && input.value("bottle_ml").isDouble())
        input["volume_ml"] = input.value("bottle_ml"); // a sheet for the whole bottle by default
    QJsonObject doc = input;
    doc.remove("batch");
    // The line parsed, prepared and checked once; its JSON (for the warnings, worded as the
    // `line` command words them) rendered from that.
    const LineResult line = line_result(data, doc);
    d.line_out = line_to_json(data, line);
    d.line_spec = line.parsed.spec;
    d.line = line.recipe;
    const chem::LineRecipe& lr = *d.line;

    d.batch = batch_from_json(input, &d.copies, &d.shelf_override);
    const chem::Batch& batch = d.batch;
    d.shelf_life_h = d.shelf_override.value_or(lr.profile.shelf_life_h);
    d.shelf_source = d.shelf_override ? QStringLiteral("entered") : line_shelf_source(data, line);
    d.shelf_kind = lr.profile.shelf_kind;
    const chem::UseBy use = chem::use_by(batch, d.shelf_life_h);
    d.expires_at = qs(use.expires_at);
    d.expiry_limited_by = use.limited_by;
    d.title = QString::fromStdString(line.parsed.spec.name);

    // Each actual amount names a part (solvent id, "buffer", additive id) or, "buffer.<id>" or a
    // plain reagent id, a reagent of the line's buffer.
    std::map<std::string, int> part_entry;
    std::vector<int> buffer_entries;
    std::set<std::string> buffer_ids;
    if (lr.buffer)
        for (const auto& it : lr.buffer->items)
            buffer_ids.insert(it.reagent);
    std::set<std::string> part_ids;
    std::string known;
    for (const auto& it : lr.items)
        if (part_ids.insert(it.part).second)
            known += (known.empty() ? "" : ", ") + it.part;
    for (const auto& id : buffer_ids)
        known += ", buffer." + id;
    chem::Batch batch_for_buffer = batch;
    for (size_t i = 0; i < batch.actual.size(); ++i) {
        const std::string& r = batch.actual[i].reagent;
        const std::string at = "batch.actual[" + std::to_string(i) + "].reagent";
        if (r.rfind("buffer.", 0) == 0 && buffer_ids.count(r.substr(7))) {
            batch_for_buffer.actual[i].reagent = r.substr(7);
            buffer_entries.push_back(int(i));
        } else if (part_ids.count(r)) {
            if (part_entry.count(r))
                throw chem::Error(at, "\"" + r + "\" is given twice");
            part_entry[r] = int(i);
        } else if (buffer_ids.count(r)) {
            buffer_entries.push_back(int(i));
        } else {
            throw chem::Error(at, "\"" + r + "\" is not a part of this line (its parts: " + known +
                                      ")");
        }
    }

    // Parts, measured separately.
    WarningList warnings{{}, {}, &data};
    for (const auto& it : lr.items) {
        std::optional<double> actual;
        std::string unit = it.volume_ml ? "mL" : "g";
        std::string lot, lot_expires_on;
        bool lot_override = false;
        if (auto e = part_entry.find(it.part); e != part_entry.end()) {
            const chem::ActualAmount& a = batch.actual[e->second];
            const std::string at = "batch.actual[" + std::to_string(e->second) + "]";
            unit = a.mass_g ? "g" : "mL";
            if (unit == "g" && !it.mass_g)
                throw chem::Error(at + ".mass_g", it.part + " has no target mass: give volume_ml");
            if (unit == "mL" && !it.volume_ml)
                throw chem::Error(at + ".volume_ml",
                                  it.part + " has no target volume: give mass_g");
            actual = a.mass_g ? a.mass_g : a.volume_ml;
            lot = a.lot;
            lot_expires_on = a.lot_expires_on;
            lot_override = a.lot_override;
        }
        const double target = unit == "g" ? *it.mass_g : *it.volume_ml;
        chem::AmountCheck c =
            chem::check_amount(it.part, unit, target, actual, batch.tolerance_fraction);
        c.lot = lot;
        c.lot_expires_on = lot_expires_on;
        c.lot_override = lot_override;
        d.part_checks.push_back(c);
    }
    for (const auto& c : d.part_checks)
        if (!c.within_tolerance)
            warnings.add(chem::out_of_tolerance_warning(c, batch.tolerance_fraction),
                         &d.part_checks);
    add_reasons(d.part_checks, batch.tolerance_fraction, d);

    if (lr.buffer) {
        d.result = evaluate_subset(data.reagents, *lr.buffer, batch_for_buffer, buffer_entries,
                                   d.shelf_life_h);
        add_reasons(d.result->checks, batch.tolerance_fraction, d);
        add_ph_reason(*d.result, batch, lr.buffer->request.target_ph, d);
        d.steps << StepSection{QStringLiteral("Buffer steps"), step_sentences(lr.buffer->steps)};
    }
    d.steps << StepSection{lr.buffer ? QStringLiteral("Line steps") : QStringLiteral("Steps"),
                           step_sentences(lr.steps)};

    // Corrections: the parts against the bottle, the buffer against its container.
    const std::optional<double> bottle =
        batch.container_ml ? batch.container_ml
                           : (input.value("bottle_ml").isDouble()
                                  ? std::optional<double>(input.value("bottle_ml").toDouble())
                                  : std::nullopt);
    chem::Correction parts =
        chem::suggest_correction(d.part_checks, batch.tolerance_fraction, line.volume_ml, bottle);
    if (parts.needed) {
        d.correction = parts;
        d.correction_text << correction_words(data, parts, {}, false);
    }
    if (d.result) {
        chem::Correction buf =
            chem::suggest_correction(d.result->checks, batch.tolerance_fraction,
                                     lr.buffer->request.volume_ml, batch.container_ml);
        if (buf.needed) {
            if (!d.correction)
                d.correction = buf;
            d.correction_text << correction_words(data, buf, QStringLiteral("Aqueous buffer: "));
        }
    }

    for (const QJsonValue& w : d.line_out.value("warnings").toArray())
        warnings.add(w.toObject());
    if (lr.buffer) {
        for (const auto& w : lr.buffer->warnings)
            warnings.add(w);
        for (const auto& w : d.result->warnings)
            warnings.add(w, &d.result->checks);
    }
    BatchEvaluation& ev = d.evaluation;
    ev.warnings = std::move(warnings.list);
    for (const auto& c : d.part_checks)
        ev.checks.push_back({c, part_display_name(data, c.reagent)});
    if (d.result) {
        for (const auto& c : d.result->checks)
            ev.checks.push_back({c, part_display_name(data, c.reagent)});
        for (const auto& c : d.result->composition)
            ev.composition.push_back({c.reagent->id, c.mol_per_l});
        ev.composition_of_buffer = true;
        ev.ph = d.result->predicted.ph;
        ev.ionic_strength_mol_per_l = d.result->predicted.ionic_strength_mol_per_l;
        ev.buffer_capacity_mol_per_l = d.result->predicted.buffer_capacity_mol_per_l;
    }
    ev.volume_ml = line.volume_ml;
    if (lr.buffer)
        ev.target_ph = lr.buffer->request.target_ph;
    ev.shelf_life_h = d.shelf_life_h;
}

// ---- sequence ---------------------------------------------------------------------------------

void read_sequence(const AppData& data, const QJsonObject& input, BatchDocument& d) {
    QJsonObject doc = input;
    doc.remove("batch");
    d.sequence = sequence_result(data, doc, {});
    const SequenceResult& sr = *d.sequence;
    d.batch = batch_from_json(input, &d.copies, &d.shelf_override);
    if (!d.batch.actual.empty())
        throw chem::Error("batch.actual",
                          "a sequence sheet takes no amounts: print each line's own sheet "
                          "(phaseplan-cli sheet on the line) to record them");
    const PlanResult& plan = sr.plans.front(); // batch_document_kind refuses "plans"
    double shortest = 1e9;
    for (const SequenceLineResult& l : plan.lines)
        if (l.profile)
            shortest = std::min(shortest, l.profile->shelf_life_h);
    // No line with a shelf life: an aqueous buffer's, the shortest common one.
    const double fallback_h = chem::builtin_shelf_life_h(chem::ShelfKind::aqueous_buffer);
    d.shelf_life_h = d.shelf_override.value_or(shortest < 1e9 ? shortest : fallback_h);
    d.expires_at = qs(chem::check_batch_fields(d.batch, d.shelf_life_h));
    d.title = input.value("name").isString()
                  ? input.value("name").toString()
                  : "Sequence from " + QString(plan.start).left(16).replace('T', ' ') + ", " +
                        QString::number(plan.injections) + " injections";
    WarningList warnings{{}, {}, &data};
    for (const SequenceWarning& w : plan.warnings)
        warnings.add(w.json);
    BatchEvaluation& ev = d.evaluation;
    ev.warnings = std::move(warnings.list);
    ev.shelf_life_h = shortest < 1e9 ? shortest : fallback_h;
    ev.end = plan.end;
}

} // namespace

QJsonObject read_capture(const QJsonValue& v, const std::string& at) {
    if (!v.isObject())
        throw chem::Error(at, "must be an object {device_id, raw, received_at, …}");
    const QJsonObject c = v.toObject();
    for (const char* k : {"device_id", "raw", "received_at"})
        if (!c.value(k).isString() || c.value(k).toString().trimmed().isEmpty())
            throw chem::Error(
                at + "." + k,
                "is required: a captured value names its instrument, the line it sent and when");
    for (const char* k : {"device_kind", "device_name", "calibration_due", "calibration_caution"})
        if (c.contains(k) && !c.value(k).isString())
            throw chem::Error(at + "." + k, "must be a string");
    for (const char* k : {"stable", "accepted_unstable"})
        if (c.contains(k) && !c.value(k).isBool())
            throw chem::Error(at + "." + k, "must be true or false");
    return c;
}

QString batch_document_kind(const QJsonObject& input) {
    if (input.contains("plans"))
        throw chem::Error("plans",
                          "a sheet or labels print one plan: give one entry of plans[] as its own "
                          "sequence document, with its batch");
    if (input.contains("lines") && input.contains("sequence"))
        return QStringLiteral("sequence");
    if (input.contains("parts") || input.contains("bottle_ml"))
        return QStringLiteral("line");
    return QStringLiteral("recipe");
}

chem::Batch batch_from_json(const QJsonObject& input, std::optional<int>* copies,
                            std::optional<double>* shelf_life_h) {
    const QJsonObject o = json::require_object(input, "batch", "");
    const std::string at = "batch";
    chem::Batch b;
    b.id = json::require_string(o, "id", at, chem::guard::max_id_chars);
    b.prepared_by = json::optional_string(o, "prepared_by", at).value_or("");
    b.prepared_at = json::optional_string(o, "prepared_at", at).value_or("");
    b.expires_at = json::optional_string(o, "expires_at", at).value_or("");
    b.checked_by = json::optional_string(o, "checked_by", at).value_or("");
    if (auto t = json::optional_number(o, "tolerance_percent", at))
        b.tolerance_fraction = *t / 100.0;
    b.final_volume_ml = json::optional_positive(o, "final_volume_ml", at, 1.0e6);
    b.measured_ph = json::optional_number(o, "measured_ph", at);
    if (auto t = json::optional_number(o, "ph_tolerance", at))
        b.ph_tolerance = *t;
    b.ph_meter_id = json::optional_string(o, "ph_meter_id", at).value_or("");
    b.balance_id = json::optional_string(o, "balance_id", at).value_or("");
    b.comment = json::optional_string(o, "comment", at).value_or("");
    b.container_ml = json::optional_positive(o, "container_ml", at, 1.0e6);
    if (o.contains("deviation") && !o.value("deviation").isNull()) {
        const QJsonObject dv = json::require_object(o, "deviation", at);
        const std::string dat = json::path(at, "deviation");
        b.deviation_note = json::optional_string(dv, "note", dat).value_or("");
        b.deviation_by = json::optional_string(dv, "by", dat).value_or("");
        b.deviation_at = json::optional_string(dv, "at", dat).value_or("");
        if (QString::fromStdString(b.deviation_note).trimmed().isEmpty())
            throw chem::Error(
                json::path(dat, "note"),
                "is empty: say why the batch is used although it is out of tolerance");
    }
    if (o.contains("copies") && !o.value("copies").isNull()) {
        const int n = json::require_int(o, "copies", at, 1, 200);
        if (copies)
            *copies = n;
    }
    if (auto h = json::optional_positive(o, "shelf_life_h", at, 1.0e5))
        if (shelf_life_h)
            *shelf_life_h = *h;
    if (o.contains("actual") && !o.value("actual").isNull()) {
        const QJsonArray a = json::require_array(o, "actual", at);
        const std::string list = json::path(at, "actual");
        for (int i = 0; i < a.size(); ++i) {
            const std::string ai = json::path(list, i);
            const QJsonObject e = json::element_object(a, i, list);
            chem::ActualAmount x;
            x.reagent = json::require_string(e, "reagent", ai, chem::guard::max_id_chars);
            x.mass_g = json::optional_positive(e, "mass_g", ai, 1.0e6);
            x.volume_ml = json::optional_positive(e, "volume_ml", ai, 1.0e6);
            if (!x.mass_g && !x.volume_ml)
                throw chem::Error(json::path(ai, "mass_g"), "give mass_g or volume_ml");
            if (x.mass_g && x.volume_ml)
                throw chem::Error(json::path(ai, "volume_ml"),
                                  "give mass_g or volume_ml, not both");
            x.lot = json::optional_string(e, "lot", ai).value_or("");
            x.lot_expires_on = json::optional_string(e, "lot_expires_on", ai).value_or("");
            if (!x.lot_expires_on.empty() && x.lot.empty())
                throw chem::Error(json::path(ai, "lot"),
                                  "is required with lot_expires_on: which lot expires then?");
            if (e.contains("lot_override") && !e.value("lot_override").isNull()) {
                const QJsonObject ov = json::require_object(e, "lot_override", ai);
                const std::string oat = json::path(ai, "lot_override");
                for (const char* k : {"by", "reason"})
                    if (QString::fromStdString(json::optional_string(ov, k, oat).value_or(""))
                            .trimmed()
                            .isEmpty())
                        throw chem::Error(json::path(oat, k),
                                          "is required: an expired lot is used only when an "
                                          "approver says who accepts it and why");
                (void)json::optional_string(ov, "name", oat);
                (void)json::optional_string(ov, "at", oat);
                x.lot_override = true;
            }
            b.actual.push_back(std::move(x));
        }
    }
    return b;
}

double default_shelf_life_h(const AppData& data, chem::ShelfKind kind, QString* source) {
    std::string from;
    const double hours = data.solvents.shelf_life_h(kind, &from);
    if (source)
        *source = qs(from);
    return hours;
}

QStringList step_sentences(const std::vector<chem::Step>& steps) {
    QStringList out;
    for (const chem::Step& s : steps)
        out << qs(s.text);
    return out;
}

QStringList recipe_steps(const chem::Recipe& recipe) {
    QStringList steps;
    bool degas = false;
    int label_step = -1;
    for (const chem::Step& s : recipe.steps) {
        if (s.kind == chem::StepKind::label && label_step < 0)
            label_step = static_cast<int>(steps.size());
        steps << qs(s.text);
        degas |= chem::degasses(s.kind);
    }
    if (!degas) {
        const QString text =
            QStringLiteral("Degas before use (helium sparge, vacuum or ultrasound) "
                           "unless the pump degasses in line.");
        if (label_step >= 0)
            steps.insert(label_step, text);
        else
            steps << text;
    }
    return steps;
}

QString part_display_name(const AppData& data, const std::string& id) {
    if (const chem::Reagent* r = data.reagents.find_reagent(id))
        return qs(r->name);
    if (const chem::Solvent* s = data.solvents.find_solvent(id))
        return qs(s->name);
    if (id == "buffer")
        return QStringLiteral("Aqueous buffer");
    return qs(id);
}

QString capture_source_text(const QJsonObject& c) {
    if (c.isEmpty())
        return QStringLiteral("typed");
    const QString kind = c.value("device_kind").toString();
    const QString what = kind == QLatin1String("ph_meter")  ? QStringLiteral("pH meter")
                         : kind == QLatin1String("balance") ? QStringLiteral("balance")
                                                            : QStringLiteral("instrument");
    return "from " + what + " " + c.value("device_id").toString();
}

namespace {

/// A finding of the batch as a warning: its JSON (finding_to_json, worded with the parts'
/// names) and the finding itself.
BatchWarning batch_warning(const AppData& data, chem::Finding f) {
    const QJsonObject o = finding_to_json(f, part_words(data), nullptr);
    return {o.value("code").toString(), o.value("severity").toString(),
            o.value("message").toString(), o, std::move(f)};
}

/// The finding for a value taken from an instrument that was past its calibration-due date on
/// the day of the reading; nullopt when it was not (or no date is recorded). `subject`: the
/// amount's part, or none for the measured pH.
std::optional<chem::Finding> capture_caution(const QJsonObject& c, chem::Subject subject) {
    const QDate due = QDate::fromString(c.value("calibration_due").toString(), Qt::ISODate);
    if (!due.isValid())
        return std::nullopt;
    const QDateTime at =
        QDateTime::fromString(c.value("received_at").toString(), Qt::ISODateWithMs);
    const QDate day = at.isValid() ? at.toLocalTime().date() : QDate::currentDate();
    if (due > day)
        return std::nullopt;
    chem::Finding f;
    f.kind = chem::FindingKind::reading_calibration_due;
    f.severity = chem::Severity::caution;
    f.subject = std::move(subject);
    const std::string device = c.value("device_id").toString().toStdString();
    f.where = chem::Subject::of_device(device);
    f.text("device", device);
    f.text("calibration_due", due.toString(Qt::ISODate).toStdString());
    f.detail_text("device_kind", c.value("device_kind").toString().toStdString());
    return f;
}

/// Reads the capture records of `input`'s batch into `d`, marks the summary's checks with them
/// and adds a caution for each instrument past its calibration date.
void read_captures(const AppData& data, const QJsonObject& input, BatchDocument& d) {
    const QJsonObject b = input.value("batch").toObject();
    const QJsonArray actual = b.value("actual").toArray();
    std::vector<chem::Finding> cautions;
    for (int i = 0; i < actual.size(); ++i) {
        const QJsonObject e = actual[i].toObject();
        if (!e.contains("capture") || e.value("capture").isNull())
            continue;
        const QJsonObject c =
            read_capture(e.value("capture"), "batch.actual[" + std::to_string(i) + "].capture");
        QString reagent = e.value("reagent").toString();
        if (reagent.startsWith("buffer."))
            reagent = reagent.mid(7);
        d.captures[reagent] = c;
        if (auto w = capture_caution(c, chem::Subject::of_reagent(reagent.toStdString())))
            cautions.push_back(std::move(*w));
    }
    if (b.contains("measured_ph_capture") && !b.value("measured_ph_capture").isNull()) {
        d.ph_capture = read_capture(b.value("measured_ph_capture"), "batch.measured_ph_capture");
        if (!b.value("measured_ph").isDouble())
            throw chem::Error("batch.measured_ph_capture", "is given without measured_ph");
        if (auto w = capture_caution(d.ph_capture, chem::Subject{}))
            cautions.push_back(std::move(*w));
    }
    for (chem::Finding& f : cautions)
        d.evaluation.warnings.push_back(batch_warning(data, std::move(f)));
}

/// The lot that limits the use-by and the expired lots used by override, from the document's
/// batch, into `d` and its summary (only when there are any, so older documents read as before).
void read_lots(const AppData& data, const QJsonObject& input, BatchDocument& d) {
    const QJsonArray actual = input.value("batch").toObject().value("actual").toArray();
    auto reagent_of = [](const QJsonObject& e) {
        QString r = e.value("reagent").toString();
        return r.startsWith("buffer.") ? r.mid(7) : r;
    };
    if (d.expiry_limited_by >= 0 && d.expiry_limited_by < actual.size()) {
        const QJsonObject e = actual[d.expiry_limited_by].toObject();
        d.expiry_limit =
            chem::UseByLimit{reagent_of(e).toStdString(), e.value("lot").toString().toStdString(),
                             e.value("lot_expires_on").toString().toStdString()};
    }
    for (const QJsonValue& v : actual) {
        const QJsonObject e = v.toObject();
        const QJsonObject ov = e.value("lot_override").toObject();
        if (ov.isEmpty())
            continue;
        const QString r = reagent_of(e);
        chem::Finding f;
        f.kind = chem::FindingKind::expired_lot_override;
        f.severity = chem::Severity::warning;
        f.subject = chem::Subject::of_reagent(r.toStdString());
        f.detail_text("lot", e.value("lot").toString().toStdString());
        f.detail_text("lot_expires_on", e.value("lot_expires_on").toString().toStdString());
        for (const char* k : {"by", "name", "at", "reason"})
            f.detail_text(k, ov.value(k).toString().toStdString());
        BatchWarning w = batch_warning(data, std::move(f));
        d.lot_override_text << w.message;
        QJsonObject o = ov;
        o["reagent"] = r;
        o["lot"] = e.value("lot").toString();
        o["lot_expires_on"] = e.value("lot_expires_on").toString();
        o["text"] = w.message;
        d.lot_overrides.append(o);
        d.evaluation.warnings.push_back(std::move(w));
    }
}

} // namespace

BatchDocument read_batch_document(const AppData& data, const QJsonObject& input) {
    BatchDocument d;
    d.kind = batch_document_kind(input);
    if (d.kind == "line")
        read_line(data, input, d);
    else if (d.kind == "sequence")
        read_sequence(data, input, d);
    else
        read_recipe(data, input, d);
    read_captures(data, input, d);
    read_lots(data, input, d);
    for (const BatchWarning& w : d.evaluation.warnings)
        d.warnings.append(w.json);
    d.summary = summary_to_json(data, d);
    return d;
}

QJsonObject summary_to_json(const AppData& data, const BatchDocument& d) {
    const BatchEvaluation& ev = d.evaluation;
    QJsonObject b = batch_summary(d.batch, d.expires_at, ev.shelf_life_h);
    if (d.kind != QLatin1String("sequence")) {
        QJsonArray checks;
        for (const BatchCheckRow& r : ev.checks) {
            QJsonObject c = check_to_json(r.check, r.name);
            const QString reagent = qs(r.check.reagent);
            if (r.check.entered && d.captures.contains(reagent))
                c["capture"] = d.captures.value(reagent);
            checks.append(c);
        }
        b["checks"] = checks;
    }
    if (ev.final_volume_ml)
        b["final_volume_ml"] = *ev.final_volume_ml;
    if (ev.ph) {
        QJsonArray comp;
        for (const BatchEvaluation::Component& c : ev.composition)
            comp.append(QJsonObject{{"reagent", qs(c.reagent)}, {"mol_per_l", c.mol_per_l}});
        b[ev.composition_of_buffer ? QStringLiteral("buffer_composition")
                                   : QStringLiteral("composition")] = comp;
        b["ph"] = *ev.ph;
        b["ionic_strength_mol_per_l"] = ev.ionic_strength_mol_per_l.value_or(0);
        b["buffer_capacity_mol_per_l"] = ev.buffer_capacity_mol_per_l.value_or(0);
    }
    finish_tolerance(data, d, b);
    if (!d.ph_capture.isEmpty())
        b["measured_ph_capture"] = d.ph_capture;
    if (const auto& limit = d.expiry_limit)
        b["expires_limited_by"] = QJsonObject{{"reagent", qs(limit->reagent)},
                                              {"lot", qs(limit->lot)},
                                              {"lot_expires_on", qs(limit->lot_expires_on)},
                                              {"text", expiry_limit_text(data, d)}};
    if (!d.lot_overrides.isEmpty())
        b["lot_overrides"] = d.lot_overrides;
    QJsonObject s{{"document", d.kind}, {"title", d.title}, {"batch", b}, {"warnings", d.warnings}};
    if (ev.target_ph)
        s["target_ph"] = *ev.target_ph;
    if (ev.planned_ph)
        s["planned_ph"] = *ev.planned_ph;
    if (ev.volume_ml)
        s["volume_ml"] = *ev.volume_ml;
    if (d.kind == QLatin1String("sequence"))
        s["end"] = ev.end;
    return s;
}

QString expiry_limit_text(const AppData& data, const BatchDocument& d) {
    return d.expiry_limit ? qs(chem::describe(*d.expiry_limit, part_words(data).name_of))
                          : QString();
}

QStringList out_of_tolerance_texts(const AppData& data, const BatchDocument& d) {
    const chem::NameLookup names = part_words(data).name_of;
    QStringList out;
    for (const chem::ReleaseReason& r : d.out_of_tolerance_reasons)
        out << qs(chem::describe(r, names));
    return out;
}

void require_deviation_note(const AppData& data, const BatchDocument& doc) {
    if (!doc.out_of_tolerance)
        return;
    if (!QString::fromStdString(doc.batch.deviation_note).trimmed().isEmpty())
        return;
    throw chem::Error("batch.deviation.note",
                      "is required: the batch is out of tolerance (" +
                          out_of_tolerance_texts(data, doc).join("; ").toStdString() +
                          "); record a deviation note saying why it is still used, or remake it");
}

} // namespace phaseplan
