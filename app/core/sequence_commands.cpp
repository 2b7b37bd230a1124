// The `sequence` subcommand: plan one or several instruments' nights (chem::plan_sequence), run
// the checks, and write the contract's JSON with clock times and the recipes to batch. The line
// readers and writers it shares with `line` are in line_commands.cpp (line_internal).
#include "core/line_commands.h"
#include "core/line_commands_internal.h"
#include "core/sequence_result.h"

#include "chem/error.h"
#include "chem/units.h"
#include "core/chem_json.h"
#include "core/date_time.h"
#include "core/json_util.h"
#include "core/json_writer.h"
#include "core/pressure_commands.h"

#include <QJsonDocument>
#include <QTimeZone>

#include <algorithm>
#include <cmath>
#include <map>

namespace phaseplan {

using namespace line_internal;

// ---------------------------------------------------------------------------------------------
// sequence

namespace {

/// `text` as json::require_string returns it, when it passes without a word: not empty, no
/// blank at either end, no surrogate (so no lone one), at most `max_chars` UTF-16 units.
bool plain_text(const QString& text, std::size_t max_chars, std::string& out) {
    if (text.isEmpty() || static_cast<std::size_t>(text.size()) > max_chars ||
        text.front().isSpace() || text.back().isSpace())
        return false;
    // ASCII (the usual method names and labels) is copied as it is; other text goes through
    // toStdString (UTF-8).
    out.resize(static_cast<std::size_t>(text.size()));
    bool ascii = true;
    for (qsizetype i = 0; i < text.size(); ++i) {
        const char16_t c = text[i].unicode();
        if (QChar::isSurrogate(c))
            return false;
        ascii &= c < 0x80;
        out[static_cast<std::size_t>(i)] = static_cast<char>(c);
    }
    if (!ascii)
        out = text.toStdString();
    return true;
}

/// A sequence row that the general readers below would accept without a word ({"method",
/// "injections", "label"} and nothing else, each well formed), read without spelling out its
/// path; anything else (an error to report, an extra key) goes the general way.
std::optional<chem::SequenceRow> plain_row(const QJsonValue& v) {
    if (!v.isObject())
        return std::nullopt;
    const QJsonObject ro = v.toObject();
    const QJsonValue method = ro.value(QLatin1StringView("method"));
    const QJsonValue injections = ro.value(QLatin1StringView("injections"));
    const QJsonValue label = ro.value(QLatin1StringView("label"));
    if (ro.size() != 2 + (label.isUndefined() ? 0 : 1) || !method.isString() ||
        !injections.isDouble() || !(label.isUndefined() || label.isNull() || label.isString()))
        return std::nullopt;
    chem::SequenceRow r;
    const double n = injections.toDouble();
    if (n != std::floor(n) || n < 1 || n > 1000000)
        return std::nullopt;
    r.injections = static_cast<int>(n);
    if (!plain_text(method.toString(), chem::guard::max_text_chars, r.method))
        return std::nullopt;
    if (label.isString() && !plain_text(label.toString(), chem::guard::max_text_chars, r.label))
        return std::nullopt;
    return r;
}

/// The solved eluent points for the check input `c` (lines, column and reagents set): from
/// options.eluent_memo when an entry matches the eluent's inputs, else new (and kept there).
std::shared_ptr<chem::EluentPoints> eluent_points_for(const AppData& data,
                                                      const chem::SequenceCheckInput& c,
                                                      const CommandOptions& options) {
    if (!options.eluent_memo)
        return std::make_shared<chem::EluentPoints>(c);
    EluentMemo& memo = *options.eluent_memo;
    // The key: every input of chem::EluentPoints, as bytes.
    std::string key;
    auto put = [&key](const auto& v) { key.append(reinterpret_cast<const char*>(&v), sizeof v); };
    auto put_text = [&](const std::string& t) {
        put(t.size());
        key += t;
    };
    put(&data);
    put(memo.library_revision);
    put(c.column && c.column->temperature_c ? *c.column->temperature_c : 25.0);
    for (const chem::LineProfile* p : c.profiles) {
        const bool described = p && p->described;
        put(described);
        if (!described)
            continue;
        put(p->organic_fraction_v);
        put(p->solutes.size());
        for (const chem::Solute& s : p->solutes) {
            put_text(s.reagent);
            put(s.mmol_per_l);
        }
        put(p->solvent_fraction_v.size());
        for (const auto& [id, f] : p->solvent_fraction_v) {
            put_text(id);
            put(f);
        }
    }
    for (auto& [k, points] : memo.entries)
        if (k == key)
            return points;
    auto points = std::make_shared<chem::EluentPoints>(c);
    constexpr std::size_t kept = 4; // a document of a few plans
    if (memo.entries.size() >= kept)
        memo.entries.erase(memo.entries.begin());
    memo.entries.emplace_back(std::move(key), points);
    return points;
}

PlanResult plan_one(const AppData& data, const QJsonObject& doc, const std::string& root,
                    const CommandOptions& options) {
    auto P = [&](const char* key) { return json::path(root, key); };
    chem::SequenceInput in;
    json::reject_near_misses(doc,
                             {"lines", "methods", "sequence", "prime_ml", "start", "waste_ml",
                              "detector", "column", "standby", "safety_margin", "plans",
                              "instrument"},
                             root);
    Clock clock;
    clock.start = datetime_from_json(doc, "start", root, &clock.has_offset);
    clock.words = options.clock_words;

    // lines
    const QJsonObject lines = json::require_object(doc, "lines", root);
    if (lines.isEmpty())
        throw chem::Error(P("lines"), "no line defined (give at least one of A, B, C, D)");
    std::array<std::optional<ParsedLine>, chem::max_lines> parsed;
    std::array<bool, chem::max_lines> defined{};
    std::vector<chem::Warning> notes;
    for (auto it = lines.begin(); it != lines.end(); ++it) {
        const std::string lpath = json::path(P("lines"), it.key());
        const int l = chem::line_index(it.key().toStdString());
        if (l < 0)
            throw chem::Error(lpath, "is not a line name (A, B, C or D)");
        const QJsonObject lo = json::require_object(lines, it.key(), P("lines"));
        parsed[l] = line_from_json(data, lo, lpath, -1, true, &notes);
        defined[l] = true;
        chem::BottleSpec b;
        b.name = parsed[l]->spec.name;
        b.bottle_ml = parsed[l]->bottle_ml;
        b.residue_ml = parsed[l]->residue_ml;
        in.lines[l] = b;
    }
    if (doc.contains("prime_ml")) {
        const QJsonObject prime = json::require_object(doc, "prime_ml", root);
        for (auto it = prime.begin(); it != prime.end(); ++it) {
            const int l = chem::line_index(it.key().toStdString());
            const std::string at = json::path(P("prime_ml"), it.key());
            if (l < 0 || !defined[l])
                throw chem::Error(at,
                                  "line " + it.key().toStdString() + " is not defined in lines");
            in.lines[l]->prime_ml = json::require_number(prime, it.key(), P("prime_ml"));
        }
    }

    // methods
    const QJsonObject methods = json::require_object(doc, "methods", root);
    if (methods.isEmpty())
        throw chem::Error(P("methods"), "no method defined");
    for (auto it = methods.begin(); it != methods.end(); ++it) {
        const std::string mpath = json::path(P("methods"), it.key());
        const QJsonObject mo = json::require_object(methods, it.key(), P("methods"));
        chem::Method m = method_from_json(mo, it.key().toStdString(), mpath);
        in.methods.push_back(std::move(m));
    }

    // sequence rows
    const QJsonArray rows = json::require_array(doc, "sequence", root);
    const std::string spath = P("sequence");
    in.rows.reserve(static_cast<std::size_t>(rows.size()));
    for (int i = 0; i < rows.size(); ++i) {
        if (auto r = plain_row(rows.at(i))) {
            in.rows.push_back(std::move(*r));
            continue;
        }
        const std::string at = json::path(spath, i);
        const QJsonObject ro = json::element_object(rows, i, spath);
        json::reject_near_misses(ro, {"method", "injections", "label"}, at);
        chem::SequenceRow r;
        r.method = json::require_string(ro, "method", at);
        r.injections = json::require_int(ro, "injections", at, 1, 1000000);
        r.label = json::optional_string(ro, "label", at).value_or("");
        in.rows.push_back(std::move(r));
    }
    in.waste_capacity_ml = json::optional_number(doc, "waste_ml", root);
    in.safety_margin_fraction = json::optional_number(doc, "safety_margin", root).value_or(0.10);
    const auto detector = detector_from_json(doc, root);
    const auto column = column_from_json(doc, root);

    std::optional<QDateTime> standby_until;
    std::optional<QTime>
        standby_until_time; ///< "07:30": the first such time after the last injection
    if (doc.contains("standby") && !doc.value("standby").isNull()) {
        const std::string at = P("standby");
        const QJsonObject so = json::require_object(doc, "standby", root);
        json::reject_near_misses(so, {"flow_ml_min", "duration_min", "until", "A", "B", "C", "D"},
                                 at);
        chem::Standby sb;
        sb.flow_ml_min = json::require_number(so, "flow_ml_min", at);
        const bool has_d = so.contains("duration_min"), has_u = so.contains("until");
        if (has_d == has_u)
            throw chem::Error(at, "give either duration_min or until");
        if (has_d)
            sb.duration_min = json::require_number(so, "duration_min", at);
        else if (const QTime tod = time_of_day(so.value("until").toString()); tod.isValid())
            standby_until_time = tod;
        else
            standby_until = datetime_from_json(so, "until", at, nullptr);
        chem::LineValues p{};
        bool any = false;
        for (auto k = so.begin(); k != so.end(); ++k) {
            const int l = chem::line_index(k.key().toStdString());
            if (l < 0)
                continue;
            p[l] = json::require_number(so, k.key(), at);
            any = true;
        }
        if (any)
            sb.percent = p;
        in.standby = sb;
    }

    // profiles (validates parts and additives), then the plan
    std::array<chem::LineProfile, chem::max_lines> profiles;
    chem::SequenceCheckInput c;
    chem::RenderContext words; // how the findings are worded: line names, clock, library names
    for (int l = 0; l < chem::max_lines; ++l) {
        if (!parsed[l])
            continue;
        profiles[l] = chem::profile_line(data.solvents, data.reagents, parsed[l]->spec);
        if (profiles[l].described)
            c.profiles[l] = &profiles[l];
        words.line_names[l] = parsed[l]->spec.name;
        if (parsed[l]->prepared_at) {
            c.prepared_at_min[l] = clock.start.msecsTo(*parsed[l]->prepared_at) / 60000.0;
            // A bottle on the instrument is made before the run; a later date is a typing slip
            // that would silently pass the shelf-life check.
            if (*c.prepared_at_min[l] > 0)
                throw chem::Error(parsed[l]->spec.field + ".prepared_at",
                                  clock.text(*c.prepared_at_min[l]) +
                                      " is after the sequence start " + clock.text(0));
        }
    }
    chem::SequencePlan plan;
    try {
        if (standby_until_time) {
            // A time of day moves with the start: the first such time at or after the end of the
            // last injection (the morning after a night's run).
            auto probe = in;
            probe.standby.reset();
            const double end = chem::plan_sequence(probe).total_min;
            const QDateTime end_at =
                clock.start.addMSecs(static_cast<qint64>(std::llround(end * 60000.0)));
            QDateTime until(end_at.date(), *standby_until_time, end_at.timeZone());
            if (until < end_at)
                until = until.addDays(1);
            in.standby->duration_min = clock.start.msecsTo(until) / 60000.0 - end;
        } else if (standby_until) {
            // The standby runs from the end of the last injection until the given time.
            auto probe = in;
            probe.standby.reset();
            const double end = chem::plan_sequence(probe).total_min;
            const double until_min = clock.start.msecsTo(*standby_until) / 60000.0;
            if (until_min < end)
                throw chem::Error("standby.until", // the catch below adds the plan's path
                                  clock.text(until_min) + " is before the last injection ends at " +
                                      clock.text(end));
            in.standby->duration_min = until_min - end;
        }
        plan = chem::plan_sequence(in);
    } catch (const chem::Error& e) {
        rethrow_within(e, root);
    }
    c.solvents = &data.solvents;
    c.input = &in;
    c.plan = &plan;
    c.detector = detector;
    c.column = column;
    // A method's own column (methods.<name>.column) with a pH range replaces the plan's for it.
    const QJsonObject methods_doc = doc.value("methods").toObject();
    for (const chem::Method& m : in.methods) {
        const QString name = QString::fromStdString(m.name);
        if (auto own = column_from_json(methods_doc.value(name).toObject(),
                                        json::path(json::path(root, "methods"), name)))
            c.method_columns[m.name] = *own;
    }
    words.clock = [&clock](double m) { return clock.text(m); };
    words.name_of = library_names(data);
    QJsonArray pressure_notes;
    const auto pressure = sequence_pressure(data, doc, root, in, c.profiles, &pressure_notes);
    if (!pressure.empty())
        c.pressure = &pressure;
    c.reagents = &data.reagents;
    // The traces' eluent solves serve the precipitation check too.
    const std::shared_ptr<chem::EluentPoints> eluent_points = eluent_points_for(data, c, options);
    c.eluent_points = eluent_points.get();
    const std::vector<chem::EluentTrace> traces = chem::eluent_traces(c);
    c.traces = &traces;
    const auto checks = chem::check_sequence(c);

    // the typed result
    PlanResult res;
    for (int l = 0; l < chem::max_lines; ++l) {
        if (!defined[l])
            continue;
        const chem::LinePlan& lp = plan.lines[l];
        SequenceLineResult lr;
        lr.index = l;
        lr.name = qs(parsed[l]->spec.name);
        lr.bottle_ml = in.lines[l]->bottle_ml;
        lr.residue_ml = in.lines[l]->residue_ml;
        lr.plan = lp;
        if (lp.dry_at_min)
            lr.dry_at = clock.iso(*lp.dry_at_min);
        if (c.profiles[l])
            lr.profile =
                SequenceLineResult::Profile{profiles[l].uv_cutoff_nm, profiles[l].ph,
                                            profiles[l].shelf_kind, profiles[l].shelf_life_h};
        res.lines.push_back(std::move(lr));

        SequenceBatchUse u;
        u.key = parsed[l]->recipe_key;
        u.name = qs(parsed[l]->spec.name);
        u.label = root.empty() ? QString(QChar(chem::line_letter(l)))
                               : qs(root) + "." + QChar(chem::line_letter(l));
        u.required_ml = lp.required_ml;
        u.prepare_ml = lp.min_bottle_ml;
        u.first_use = clock.start;
        u.last_use =
            clock.start.addMSecs(static_cast<qint64>(std::llround(plan.total_min * 60000.0)));
        u.shelf_life_h = c.profiles[l] ? profiles[l].shelf_life_h : 0;
        if (c.profiles[l])
            u.shelf_kind = profiles[l].shelf_kind;
        res.uses.push_back(u);
    }
    for (std::size_t i = 0; i < plan.methods.size(); ++i) {
        SequenceMethodResult m;
        m.flow_ml_min = in.methods[i].flow_ml_min;
        m.plan = plan.methods[i];
        if (i < pressure.size() && pressure[i])
            m.pressure = *pressure[i];
        res.methods.push_back(std::move(m));
    }
    for (const auto& w : notes)
        res.warnings.push_back({warning_to_json(w), std::nullopt});
    for (int l = 0; l < chem::max_lines; ++l)
        if (parsed[l])
            for (const auto& part : parsed[l]->spec.parts)
                if (part.buffer)
                    for (const auto& w : part.buffer->warnings) {
                        QJsonObject o = warning_to_json(w);
                        o["line"] = QString(QChar(chem::line_letter(l)));
                        res.warnings.push_back({o, std::nullopt});
                    }
    for (const auto& n : pressure_notes)
        res.warnings.push_back({n.toObject(), std::nullopt});
    for (const auto& w : checks)
        res.warnings.push_back({finding_to_json(w, words, &clock), w});

    res.start = clock.iso(0);
    res.end = clock.iso(plan.total_min);
    res.standby_end = clock.iso(plan.total_min + plan.standby_min);
    res.total_min = plan.total_min;
    res.standby_min = plan.standby_min;
    res.injections = plan.injections;
    res.waste_ml = plan.waste_ml;
    res.pumped_ml = plan.pumped_ml;
    res.prime_ml = plan.prime_ml;
    res.waste_capacity_ml = in.waste_capacity_ml;
    res.eluent = traces;
    res.rows = std::move(plan.rows);
    res.row_inputs = std::move(in.rows);
    res.defined = defined;
    res.clock = clock;
    // The parsed lines and their profiles go with the result (nothing reads them here after the
    // checks and the warnings above).
    for (SequenceLineResult& lr : res.lines) {
        lr.spec = std::move(parsed[lr.index]->spec);
        lr.line_profile = std::move(profiles[lr.index]);
    }
    return res;
}

QJsonArray warnings_to_json(const std::vector<SequenceWarning>& ws) {
    QJsonArray out;
    for (const SequenceWarning& w : ws)
        out.append(w.json);
    return out;
}

QJsonArray batches_to_json(const std::vector<SequenceBatch>& batches) {
    QJsonArray out;
    for (const SequenceBatch& s : batches) {
        QJsonObject b{{"recipe", s.recipe},
                      {"lines", QJsonArray::fromStringList(s.lines)},
                      {"required_ml", s.required_ml},
                      {"prepare_ml", s.prepare_ml},
                      {"suggested_bottle_ml", s.suggested_bottle_ml > 0
                                                  ? QJsonValue(s.suggested_bottle_ml)
                                                  : QJsonValue()},
                      {"first_use", wall_clock_iso(s.first_use)},
                      {"last_use", wall_clock_iso(s.last_use)},
                      {"span_h", s.span_h}};
        if (s.shelf_life_h > 0) {
            b["shelf_life_h"] = s.shelf_life_h;
            b["shelf_kind"] =
                s.shelf_kind ? QLatin1String(chem::shelf_kind_name(*s.shelf_kind)) : QString();
            b["one_batch_lasts"] = s.span_h <= s.shelf_life_h;
        }
        out.append(b);
    }
    return out;
}

/// Every field of a plan's JSON but "rows"; `batches` for a one-plan document.
QJsonObject plan_fields_to_json(const PlanResult& p, const std::vector<SequenceBatch>* batches) {
    QJsonObject lines_out;
    for (const SequenceLineResult& lr : p.lines) {
        const chem::LinePlan& lp = lr.plan;
        QJsonObject o{{"name", lr.name},
                      {"required_ml", lp.required_ml},
                      {"usable_ml", lp.usable_ml},
                      {"runs_dry", lp.runs_dry},
                      {"dry_after_injection",
                       lp.dry_after_injection ? QJsonValue(*lp.dry_after_injection) : QJsonValue()},
                      {"dry_at", lp.dry_at_min ? QJsonValue(lr.dry_at) : QJsonValue()},
                      {"dry_at_min", opt(lp.dry_at_min)},
                      {"dry_during",
                       lp.runs_dry ? QJsonValue(chem::dry_phase_name(lp.dry_phase)) : QJsonValue()},
                      {"bottle_ml", lr.bottle_ml},
                      {"residue_ml", lr.residue_ml},
                      {"prime_ml", lp.prime_ml},
                      {"pumped_ml", lp.pumped_ml},
                      {"spare_ml", lp.spare_ml},
                      {"min_bottle_ml", lp.min_bottle_ml},
                      {"suggested_bottle_ml", lp.suggested_bottle_ml > 0
                                                  ? QJsonValue(lp.suggested_bottle_ml)
                                                  : QJsonValue()}};
        if (lr.profile) {
            o["uv_cutoff_nm"] = lr.profile->uv_cutoff_nm;
            o["ph"] = opt(lr.profile->ph);
            o["shelf_kind"] = QLatin1String(
                lr.profile->shelf_kind ? chem::shelf_kind_name(*lr.profile->shelf_kind) : "");
            o["shelf_life_h"] = lr.profile->shelf_life_h;
        }
        lines_out[lr.letter()] = o;
    }
    QJsonObject methods_out;
    for (const SequenceMethodResult& m : p.methods) {
        const chem::MethodPlan& mp = m.plan;
        QJsonObject mo{{"flow_ml_min", m.flow_ml_min},
                       {"injection_min", mp.injection_min},
                       {"per_injection_ml", per_line(mp.per_injection_ml, p.defined)},
                       {"pumped_per_injection_ml", mp.pumped_per_injection_ml}};
        if (m.pressure) {
            mo["max_pressure_bar"] = m.pressure->max_pressure_bar;
            mo["max_pressure_at_t_min"] = m.pressure->max_at_t_min;
            mo["pressure"] = pressure_trace_to_json(*m.pressure);
        }
        methods_out[qs(mp.name)] = mo;
    }
    QJsonObject out{{"start", p.start},
                    {"end", p.end},
                    {"total_min", p.total_min},
                    {"injections", p.injections},
                    {"lines", lines_out},
                    {"waste_ml", p.waste_ml},
                    {"pumped_ml", p.pumped_ml},
                    {"prime_ml", p.prime_ml},
                    {"standby_min", p.standby_min},
                    {"standby_end", p.standby_end},
                    {"methods", methods_out},
                    {"warnings", warnings_to_json(p.warnings)}};
    if (p.waste_capacity_ml)
        out["waste_capacity_ml"] = *p.waste_capacity_ml;
    out["eluent_trace"] = eluent_traces_to_json(p.eluent);
    if (batches)
        out["batches"] = batches_to_json(*batches);
    return out;
}

/// The "rows" of a plan as QJsonObjects.
QJsonArray rows_to_json(const PlanResult& p) {
    const ContractClockText clock(p.clock.start, p.clock.has_offset);
    QJsonArray rows_out;
    for (std::size_t i = 0; i < p.rows.size(); ++i) {
        const auto& rp = p.rows[i];
        rows_out.append(QJsonObject{{"method", qs(p.row_inputs[i].method)},
                                    {"label", qs(p.row_inputs[i].label)},
                                    {"injections", rp.injections},
                                    {"first_injection", rp.first_injection},
                                    {"last_injection", rp.first_injection + rp.injections - 1},
                                    {"start", clock.text(std::llround(rp.start_min * 60.0))},
                                    {"end", clock.text(std::llround(rp.end_min * 60.0))},
                                    {"volume_ml", per_line(rp.volume_ml, p.defined)}});
    }
    return rows_out;
}

QJsonObject plan_to_json(const PlanResult& p, const std::vector<SequenceBatch>* batches) {
    QJsonObject out = plan_fields_to_json(p, batches);
    out["rows"] = rows_to_json(p);
    return out;
}

/// The same rows as rows_to_json, written straight to text (keys in QJsonObject's order).
void write_rows(json::IndentedWriter& w, const PlanResult& p, const std::string& at) {
    const ContractClockText clock(p.clock.start, p.clock.has_offset);
    std::string time;
    w.key("rows");
    w.begin_array();
    for (std::size_t i = 0; i < p.rows.size(); ++i) {
        const auto& rp = p.rows[i];
        const auto& ri = p.row_inputs[i];
        w.begin_object();
        w.key("end");
        time.clear();
        clock.append(std::llround(rp.end_min * 60.0), time);
        w.string(time);
        w.key("first_injection");
        w.integer(rp.first_injection);
        w.key("injections");
        w.integer(rp.injections);
        w.key("label");
        w.string(ri.label);
        w.key("last_injection");
        w.integer(rp.first_injection + rp.injections - 1);
        w.key("method");
        w.string(ri.method);
        w.key("start");
        time.clear();
        clock.append(std::llround(rp.start_min * 60.0), time);
        w.string(time);
        w.key("volume_ml");
        w.begin_object();
        for (int l = 0; l < chem::max_lines; ++l) {
            if (!p.defined[l])
                continue;
            const char letter[2] = {chem::line_letter(l), 0};
            w.key(letter);
            w.number(rp.volume_ml[l], [&] {
                return json::path(json::path(json::path(at, static_cast<int>(i)), "volume_ml"),
                                  QString::fromLatin1(letter));
            });
        }
        w.end_object();
        w.end_object();
    }
    w.end_array();
}

/// plan_to_json(p) as text, each number checked as json::check_output checks it, in its order.
void write_plan(json::IndentedWriter& w, const PlanResult& p, const std::string& at,
                const std::vector<SequenceBatch>* batches) {
    const QJsonObject out = plan_fields_to_json(p, batches);
    w.begin_object();
    bool rows_done = false;
    const QString rows_key = QStringLiteral("rows");
    for (auto it = out.constBegin(); it != out.constEnd(); ++it) {
        if (!rows_done && rows_key < it.key()) {
            write_rows(w, p, json::path(at, rows_key));
            rows_done = true;
        }
        w.key(it.key().toStdString());
        w.value(it.value(), json::path(at, it.key()));
    }
    if (!rows_done)
        write_rows(w, p, json::path(at, rows_key));
    w.end_object();
}

/// Sums the lines that share a recipe; warns when one batch would outlive its shelf life.
std::vector<SequenceBatch> batches_of(const std::vector<SequenceBatchUse>& uses,
                                      std::vector<SequenceWarning>* warnings) {
    std::vector<QString> order;
    std::map<QString, std::vector<const SequenceBatchUse*>> by_key;
    for (const auto& u : uses) {
        if (!by_key.count(u.key))
            order.push_back(u.key);
        by_key[u.key].push_back(&u);
    }
    std::vector<SequenceBatch> out;
    for (const QString& key : order) {
        const auto& list = by_key[key];
        SequenceBatch b;
        b.recipe = list.front()->name;
        b.first_use = list.front()->first_use;
        b.last_use = list.front()->last_use;
        for (const SequenceBatchUse* u : list) {
            b.required_ml += u->required_ml;
            b.prepare_ml += u->prepare_ml;
            b.first_use = std::min(b.first_use, u->first_use);
            b.last_use = std::max(b.last_use, u->last_use);
            b.lines.append(u->label);
        }
        for (double s : chem::common_bottle_sizes_ml())
            if (s >= b.prepare_ml) {
                b.suggested_bottle_ml = s;
                break;
            }
        b.span_h = b.first_use.msecsTo(b.last_use) / 3.6e6;
        const double shelf = list.front()->shelf_life_h;
        if (shelf > 0) {
            b.shelf_life_h = shelf;
            b.shelf_kind = list.front()->shelf_kind;
            if (b.span_h > shelf && warnings && list.size() > 1) {
                const long long batches =
                    chem::guard::count_up(b.span_h / shelf, "batches", "number of batches");
                chem::Finding f;
                f.kind = chem::FindingKind::batch_shelf_life;
                f.severity = chem::Severity::warning;
                f.subject = chem::Subject::of_batch(b.recipe.toStdString());
                f.text("recipe", b.recipe.toStdString());
                f.number("span_h", b.span_h);
                f.number("shelf_life_h", shelf);
                f.number("batches", static_cast<double>(batches));
                f.detail("bottles", static_cast<double>(list.size()));
                f.detail_text("kind", b.shelf_kind ? chem::shelf_kind_name(*b.shelf_kind) : "");
                warnings->push_back({finding_to_json(f, chem::RenderContext{}, nullptr), f});
            }
        }
        out.push_back(std::move(b));
    }
    return out;
}

} // namespace

const SequenceLineResult* PlanResult::line(int index) const {
    for (const SequenceLineResult& l : lines)
        if (l.index == index)
            return &l;
    return nullptr;
}

const chem::PressureTrace* PlanResult::pressure(const std::string& method) const {
    for (const SequenceMethodResult& m : methods)
        if (m.plan.name == method)
            return m.pressure ? &*m.pressure : nullptr;
    return nullptr;
}

const chem::EluentTrace* PlanResult::eluent_of(const std::string& method) const {
    const chem::EluentTrace* found = nullptr;
    for (const chem::EluentTrace& e : eluent)
        if (e.method == method)
            found = &e;
    return found;
}

QString PlanResult::row_start(std::size_t i) const {
    return ContractClockText(clock.start, clock.has_offset)
        .text(std::llround(rows.at(i).start_min * 60.0));
}

QString PlanResult::row_end(std::size_t i) const {
    return ContractClockText(clock.start, clock.has_offset)
        .text(std::llround(rows.at(i).end_min * 60.0));
}

SequenceResult sequence_result(const AppData& data, const QJsonObject& input,
                               const CommandOptions& options) {
    SequenceResult res;
    if (!input.contains("plans")) {
        res.plans.push_back(plan_one(data, input, "", options));
        res.batches = batches_of(res.plans.front().uses, nullptr);
        return res;
    }
    res.several = true;
    const QJsonArray plans = json::require_array(input, "plans", "");
    if (plans.isEmpty())
        throw chem::Error("plans", "needs at least one plan");
    std::vector<SequenceBatchUse> uses;
    for (int i = 0; i < plans.size(); ++i) {
        const std::string at = json::path("plans", i);
        PlanResult r = plan_one(data, json::element_object(plans, i, "plans"), at, options);
        uses.insert(uses.end(), r.uses.begin(), r.uses.end());
        res.plans.push_back(std::move(r));
    }
    res.batches = batches_of(uses, &res.warnings);
    return res;
}

QJsonObject to_json(const SequenceResult& r) {
    if (!r.several)
        return plan_to_json(r.plans.front(), &r.batches);
    QJsonArray outs;
    for (const PlanResult& p : r.plans)
        outs.append(plan_to_json(p, nullptr));
    return QJsonObject{{"plans", outs},
                       {"batches", batches_to_json(r.batches)},
                       {"warnings", warnings_to_json(r.warnings)}};
}

QJsonObject command_sequence(const AppData& data, const QJsonObject& input,
                             const CommandOptions& options) {
    return to_json(sequence_result(data, input, options));
}

QByteArray command_sequence_text(const AppData& data, const QJsonObject& input,
                                 const CommandOptions& options) {
    const SequenceResult r = sequence_result(data, input, options);
    json::IndentedWriter w;
    std::size_t rows = 0;
    for (const PlanResult& p : r.plans)
        rows += p.rows.size();
    w.reserve(rows * 420 + (1 << 18)); // about 400 bytes a row with four lines
    if (!r.several) {
        write_plan(w, r.plans.front(), "", &r.batches);
        return w.take();
    }
    w.begin_object();
    w.key("batches");
    w.value(batches_to_json(r.batches), "batches");
    w.key("plans");
    w.begin_array();
    for (std::size_t i = 0; i < r.plans.size(); ++i)
        write_plan(w, r.plans[i], json::path("plans", static_cast<int>(i)), nullptr);
    w.end_array();
    w.key("warnings");
    w.value(warnings_to_json(r.warnings), "warnings");
    w.end_object();
    return w.take();
}

} // namespace phaseplan
