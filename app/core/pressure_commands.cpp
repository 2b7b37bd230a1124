#include "core/pressure_commands.h"

#include "chem/checks.h"
#include "chem/error.h"
#include "chem/pressure.h"
#include "chem/transfer.h"
#include "core/chem_json.h"
#include "core/json_util.h"
#include "core/line_commands.h"

#include <algorithm>

namespace phaseplan {

namespace {

QString qs(const std::string& s) {
    return QString::fromStdString(s);
}

QJsonObject per_line(const chem::LineValues& v) {
    QJsonObject o;
    for (int l = 0; l < chem::max_lines; ++l)
        if (v[l] > 0)
            o[QString(QChar(chem::line_letter(l)))] = v[l];
    return o;
}

/// chem names a method's fields "methods.<name>.…"; a document with one "method" names them
/// "method.…".
[[noreturn]] void rethrow_for_single_method(const chem::Error& e, const std::string& name) {
    // The name is read as the path text reads it (a dotted name is several keys on both sides).
    const chem::Path prefix = chem::Path::parse("methods." + name);
    if (e.path().within(prefix))
        throw chem::Error(e.path().tail(prefix.size()).under(chem::Path::parse("method")),
                          e.message());
    throw e;
}

/// Lines of a `pressure` or `transfer` document, profiled (bottles not needed).
struct Lines {
    std::array<std::optional<ParsedLine>, chem::max_lines> parsed;
    std::array<chem::LineProfile, chem::max_lines> profiles;
    std::array<bool, chem::max_lines> defined{};
    /// The described profiles, by line. Computed on each call, not stored: a stored pointer into
    /// `profiles` dangled once a Lines was moved (into a std::optional; found by ASan).
    std::array<const chem::LineProfile*, chem::max_lines> pointers() const {
        std::array<const chem::LineProfile*, chem::max_lines> p{};
        for (int l = 0; l < chem::max_lines; ++l)
            if (defined[l] && profiles[l].described)
                p[l] = &profiles[l];
        return p;
    }
};

Lines lines_from_json(const AppData& data, const QJsonObject& doc) {
    Lines out;
    const QJsonObject lines = json::require_object(doc, "lines", "");
    if (lines.isEmpty())
        throw chem::Error("lines", "no line defined (give at least one of A, B, C, D)");
    for (auto it = lines.begin(); it != lines.end(); ++it) {
        const std::string at = json::path("lines", it.key());
        const int l = chem::line_index(it.key().toStdString());
        if (l < 0)
            throw chem::Error(at, "is not a line name (A, B, C or D)");
        out.parsed[l] =
            line_from_json(data, json::require_object(lines, it.key(), "lines"), at, -1, false);
        out.profiles[l] = chem::profile_line(data.solvents, data.reagents, out.parsed[l]->spec);
        out.defined[l] = true;
    }
    return out;
}

chem::Method single_method(const QJsonObject& doc,
                           const std::array<bool, chem::max_lines>& defined) {
    chem::Method m = method_from_json(json::require_object(doc, "method", ""), "method", "method");
    try {
        chem::validate_method(m, defined);
    } catch (const chem::Error& e) {
        rethrow_for_single_method(e, m.name);
    }
    return m;
}

/// The notes that go with every trace: the viscosity's basis and an uncalibrated resistance.
void trace_notes(const chem::PressureTrace& t, const std::string& method, QJsonArray& warnings) {
    if (auto w = chem::pressure_limit_warning(method, t))
        warnings.append(finding_to_json(*w, chem::RenderContext{}, nullptr));
    for (const chem::Finding& f : chem::pressure_notes(t, method))
        warnings.append(finding_to_json(f, chem::RenderContext{}, nullptr));
}

} // namespace

QJsonObject method_to_json(const chem::Method& m) {
    chem::LineValues used{};
    for (const auto& r : m.gradient)
        for (int l = 0; l < chem::max_lines; ++l)
            used[l] = std::max(used[l], r.percent[l]);
    QJsonArray rows;
    for (const auto& r : m.gradient) {
        QJsonObject o{{"t_min", r.t_min}};
        for (int l = 0; l < chem::max_lines; ++l)
            if (used[l] > 0)
                o[QString(QChar(chem::line_letter(l)))] = r.percent[l];
        rows.append(o);
    }
    return QJsonObject{{"flow_ml_min", m.flow_ml_min},
                       {"gradient", rows},
                       {"run_min", m.run_min},
                       {"equilibration_min", m.equilibration_min}};
}

std::optional<chem::Column> pressure_column_from_json(const QJsonObject& doc, const char* key,
                                                      const std::string& root) {
    if (!doc.contains(key) || doc.value(key).isNull())
        return std::nullopt;
    const std::string at = json::path(root, key);
    const QJsonObject o = json::require_object(doc, key, root);
    json::reject_near_misses(o,
                             {"length_mm", "id_mm", "particle_um", "porosity", "total_porosity",
                              "flow_resistance", "temperature_c", "max_pressure_bar", "reference",
                              "ph_min", "ph_max", "flow_ml_min", "dwell_ml", "name"},
                             at);
    if (!o.contains("length_mm") && !o.contains("id_mm") && !o.contains("particle_um"))
        return std::nullopt;
    chem::Column c;
    c.field = at;
    c.length_mm = json::require_number(o, "length_mm", at);
    c.id_mm = json::require_number(o, "id_mm", at);
    c.particle_um = json::require_number(o, "particle_um", at);
    if (auto v = json::optional_number(o, "porosity", at))
        c.porosity = *v;
    if (auto v = json::optional_number(o, "total_porosity", at))
        c.total_porosity = *v;
    c.flow_resistance = json::optional_number(o, "flow_resistance", at);
    if (auto v = json::optional_number(o, "temperature_c", at))
        c.temperature_c = *v;
    c.max_pressure_bar = json::optional_number(o, "max_pressure_bar", at);
    if (o.contains("reference") && !o.value("reference").isNull()) {
        const std::string rat = json::path(at, "reference");
        const QJsonObject ro = json::require_object(o, "reference", at);
        json::reject_near_misses(ro, {"pressure_bar", "flow_ml_min", "temperature_c"}, rat);
        chem::ReferencePressure r;
        r.pressure_bar = json::require_number(ro, "pressure_bar", rat);
        r.flow_ml_min = json::require_number(ro, "flow_ml_min", rat);
        r.temperature_c = json::optional_number(ro, "temperature_c", rat);
        r.percent = percent_from_json(ro, rat, {"pressure_bar", "flow_ml_min", "temperature_c"});
        c.reference = r;
    }
    chem::validate_column(c);
    return c;
}

chem::Instrument instrument_from_json(const QJsonObject& doc, const std::string& root) {
    chem::Instrument in;
    in.field = json::path(root, "instrument");
    if (!doc.contains("instrument") || doc.value("instrument").isNull())
        return in;
    const QJsonObject o = json::require_object(doc, "instrument", root);
    json::reject_near_misses(
        o, {"max_pressure_bar", "system_pressure_bar", "system_flow_ml_min", "dwell_ml", "name"},
        in.field);
    in.max_pressure_bar = json::optional_number(o, "max_pressure_bar", in.field);
    in.system_pressure_bar = json::optional_number(o, "system_pressure_bar", in.field);
    if (in.system_pressure_bar)
        in.system_flow_ml_min = json::require_number(o, "system_flow_ml_min", in.field);
    in.dwell_ml = json::optional_number(o, "dwell_ml", in.field).value_or(0.0);
    chem::validate_instrument(in);
    return in;
}

QJsonObject pressure_trace_to_json(const chem::PressureTrace& t) {
    QJsonArray points;
    for (const auto& p : t.points)
        points.append(QJsonObject{{"t_min", p.t_min},
                                  {"organic_fraction_v", p.organic_fraction_v},
                                  {"viscosity_mpa_s", p.viscosity_mpa_s},
                                  {"pressure_bar", p.pressure_bar},
                                  {"column_pressure_bar", p.column_pressure_bar}});
    QJsonObject out{
        {"trace", points},
        {"max_pressure_bar", t.max_pressure_bar},
        {"max_at_t_min", t.max_at_t_min},
        {"max_column_pressure_bar", t.max_column_pressure_bar},
        {"organic_fraction_v_at_max", t.organic_fraction_v_at_max},
        {"inlet_percent_at_max", per_line(t.inlet_percent_at_max)},
        {"plates_estimate", t.plates_estimate},
        {"plates_basis", "N ≈ 3000 · L(cm) / dp(µm), a rule of thumb (common practice)"},
        {"flow_resistance", t.flow_resistance},
        {"flow_resistance_basis",
         t.calibrated ? "calibrated on the reference pressure" : "Kozeny–Carman or as given"},
        {"calibrated", t.calibrated},
        {"column_volume_ml", t.column_volume_ml},
        {"dwell_min", t.dwell_min},
        {"column_min", t.column_min},
        {"viscosity_basis", chem::viscosity_basis_name(t.viscosity_basis)},
        {"limit_bar", t.limit ? QJsonValue(t.limit->bar) : QJsonValue()},
        {"limited_by",
         t.limit ? QJsonValue(chem::limit_source_name(t.limit->source)) : QJsonValue()}};
    return out;
}

std::vector<std::optional<chem::PressureTrace>>
sequence_pressure(const AppData& data, const QJsonObject& doc, const std::string& root,
                  const chem::SequenceInput& in,
                  const std::array<const chem::LineProfile*, chem::max_lines>& profiles,
                  QJsonArray* notes) {
    std::vector<std::optional<chem::PressureTrace>> out;
    auto column = pressure_column_from_json(doc, "column", root);
    chem::Instrument instrument = instrument_from_json(doc, root);
    // A method may carry its own column ("methods.<name>.column", the same fields): it wins over
    // the plan's column for that method's pressure.
    const QJsonObject methods_doc = doc.value("methods").toObject();
    std::vector<std::optional<chem::Column>> own(in.methods.size());
    bool any = column.has_value();
    for (std::size_t i = 0; i < in.methods.size(); ++i) {
        const QString name = qs(in.methods[i].name);
        own[i] = pressure_column_from_json(methods_doc.value(name).toObject(), "column",
                                           json::path(json::path(root, "methods"), name));
        if (own[i]) {
            own[i]->field = json::path(json::path("methods", name), "column");
            any = true;
        }
    }
    if (!any)
        return out;
    // Fields relative to the plan; the catch below adds the plan's path once.
    if (column)
        column->field = "column";
    instrument.field = "instrument";
    for (std::size_t i = 0; i < in.methods.size(); ++i) {
        const chem::Method& m = in.methods[i];
        const std::optional<chem::Column>& col = own[i] ? own[i] : column;
        if (!col) {
            out.emplace_back();
            continue;
        }
        std::vector<int> undescribed;
        for (const auto& r : m.gradient)
            for (int l = 0; l < chem::max_lines; ++l)
                if (r.percent[l] > 0 && !profiles[l] &&
                    std::find(undescribed.begin(), undescribed.end(), l) == undescribed.end())
                    undescribed.push_back(l);
        if (!undescribed.empty()) {
            out.emplace_back();
            if (notes)
                notes->append(finding_to_json(chem::pressure_unknown(m.name, undescribed),
                                              chem::RenderContext{}, nullptr));
            continue;
        }
        try {
            out.emplace_back(chem::pressure_trace(data.solvents, profiles, m, *col, instrument));
        } catch (const chem::Error& e) {
            if (root.empty())
                throw;
            throw e.within(root);
        }
    }
    return out;
}

// ---------------------------------------------------------------------------------------------

QJsonObject command_pressure(const AppData& data, const QJsonObject& input, const CommandOptions&) {
    json::reject_near_misses(input, {"lines", "method", "column", "instrument", "step_min"}, "");
    const Lines lines = lines_from_json(data, input);
    const chem::Method m = single_method(input, lines.defined);
    const auto column = pressure_column_from_json(input, "column", "");
    if (!column)
        throw chem::Error("column", "needs length_mm, id_mm and particle_um");
    const chem::Instrument instrument = instrument_from_json(input, "");
    const double step = json::optional_number(input, "step_min", "").value_or(0.1);
    chem::PressureTrace t;
    try {
        t = chem::pressure_trace(data.solvents, lines.pointers(), m, *column, instrument, step);
    } catch (const chem::Error& e) {
        rethrow_for_single_method(e, m.name);
    }
    QJsonObject out = pressure_trace_to_json(t);
    QJsonArray warnings;
    trace_notes(t, "", warnings); // one method, no name of its own
    out["warnings"] = warnings;
    return out;
}

TransferCommandResult transfer_result(const AppData& data, const QJsonObject& input) {
    json::reject_near_misses(input,
                             {"method", "from", "to", "injection_ul", "sequence_injections",
                              "lines", "instrument", "step_min"},
                             "");
    std::optional<Lines> lines;
    if (input.contains("lines"))
        lines = lines_from_json(data, input);
    TransferCommandResult res;
    chem::TransferRequest& req = res.request;
    req.method = single_method(
        input, lines ? lines->defined : std::array<bool, chem::max_lines>{true, true, true, true});
    for (auto [key, side] : {std::pair{"from", &req.from}, std::pair{"to", &req.to}}) {
        const auto c = pressure_column_from_json(input, key, "");
        if (!c)
            throw chem::Error(key, "needs length_mm, id_mm and particle_um");
        side->column = *c;
        const QJsonObject o = input.value(key).toObject();
        side->dwell_ml = json::optional_number(o, "dwell_ml", key);
        if (side == &req.to)
            side->flow_ml_min = json::optional_number(o, "flow_ml_min", key);
    }
    req.injection_ul = json::optional_number(input, "injection_ul", "");
    if (input.contains("sequence_injections"))
        req.sequence_injections = json::require_int(input, "sequence_injections", "", 1, 1000000);
    try {
        res.result = chem::transfer_method(req);
    } catch (const chem::Error& e) {
        rethrow_for_single_method(e, req.method.name);
    }
    if (lines) {
        chem::Instrument instrument = instrument_from_json(input, "");
        if (req.to.dwell_ml)
            instrument.dwell_ml = *req.to.dwell_ml;
        const double step = json::optional_number(input, "step_min", "").value_or(0.1);
        try {
            res.pressure = chem::pressure_trace(data.solvents, lines->pointers(), res.result.method,
                                                req.to.column, instrument, step);
        } catch (const chem::Error& e) {
            rethrow_for_single_method(e, res.result.method.name);
        }
        if (auto w = chem::pressure_limit_warning("", *res.pressure))
            res.pressure_findings.push_back(*w);
        for (chem::Finding& f : chem::pressure_notes(*res.pressure, ""))
            res.pressure_findings.push_back(std::move(f));
    }
    return res;
}

QJsonObject transfer_to_json(const TransferCommandResult& res) {
    const chem::TransferResult& r = res.result;
    QJsonArray warnings;
    for (const auto& w : r.warnings)
        warnings.append(warning_to_json(w));
    QJsonObject out{
        {"method", method_to_json(r.method)},
        {"flow_ml_min", r.flow_ml_min},
        {"scaled_flow_ml_min", r.scaled_flow_ml_min},
        {"time_factor", r.time_factor},
        {"injection_ul", r.injection_ul ? QJsonValue(*r.injection_ul) : QJsonValue()},
        {"hold_added_min", r.hold_added_min},
        {"solvent_ml_per_injection",
         QJsonObject{{"from", r.solvent_from_ml}, {"to", r.solvent_to_ml}}},
        {"solvent_ml_per_sequence",
         QJsonObject{{"from", r.solvent_from_sequence_ml}, {"to", r.solvent_to_sequence_ml}}},
        {"sequence_injections", res.request.sequence_injections},
        {"saving_fraction", r.saving_fraction},
        {"l_over_dp_change", r.l_over_dp_change},
        {"within_allowed_adjustment", r.within_allowed_adjustment},
        {"plates_estimate", QJsonObject{{"from", r.plates_from}, {"to", r.plates_to}}},
        {"rules", "USP <621> (harmonised 2022) allowed adjustments for gradient elution"}};
    if (res.pressure) {
        out["pressure"] = pressure_trace_to_json(*res.pressure);
        for (const chem::Finding& f : res.pressure_findings)
            warnings.append(finding_to_json(f, chem::RenderContext{}, nullptr));
    }
    out["warnings"] = warnings;
    return out;
}

QJsonObject command_transfer(const AppData& data, const QJsonObject& input, const CommandOptions&) {
    return transfer_to_json(transfer_result(data, input));
}

} // namespace phaseplan
