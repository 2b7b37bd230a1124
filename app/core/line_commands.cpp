#include "core/line_commands.h"
#include "core/line_commands_internal.h"

#include "chem/error.h"
#include "chem/note_text.h"
#include "chem/units.h"
#include "core/chem_json.h"
#include "core/date_time.h"
#include "core/json_util.h"
#include "core/pressure_commands.h"

#include <QJsonDocument>
#include <QTimeZone>

#include <algorithm>
#include <cmath>
#include <map>

namespace phaseplan {

namespace line_internal {

QString qs(const std::string& s) {
    return QString::fromStdString(s);
}

QJsonValue opt(const std::optional<double>& v) {
    return v ? QJsonValue(*v) : QJsonValue(QJsonValue::Null);
}

QJsonArray strings(const std::vector<std::string>& v) {
    QJsonArray a;
    for (const auto& s : v)
        a.append(qs(s));
    return a;
}

QJsonObject per_line(const chem::LineValues& v, const std::array<bool, chem::max_lines>& defined) {
    QJsonObject o;
    for (int l = 0; l < chem::max_lines; ++l)
        if (defined[l])
            o[QString(QChar(chem::line_letter(l)))] = v[l];
    return o;
}

/// Wraps a chem error of a nested document (fields relative to it) with the document's path.
[[noreturn]] void rethrow_within(const chem::Error& e, const std::string& root) {
    if (root.empty())
        throw e;
    throw e.within(root);
}

/// An optional "temperature_c" within the aqueous models' range (0–60 °C).
std::optional<double> optional_temperature_c(const QJsonObject& o, const std::string& at) {
    const auto t = json::optional_number(o, "temperature_c", at);
    if (t && (*t < chem::min_temperature_c || *t > chem::max_temperature_c))
        throw chem::Error(json::path(at, "temperature_c"),
                          chem::format_number(*t) + " °C is outside " +
                              chem::format_number(chem::min_temperature_c) + " to " +
                              chem::format_number(chem::max_temperature_c) + " °C");
    return t;
}

std::optional<chem::Detector> detector_from_json(const QJsonObject& doc, const std::string& root) {
    if (!doc.contains("detector") || doc.value("detector").isNull())
        return std::nullopt;
    const std::string at = json::path(root, "detector");
    const QJsonObject o = json::require_object(doc, "detector", root);
    json::reject_near_misses(o, {"type", "wavelength_nm", "margin_nm"}, at);
    chem::Detector d;
    std::string type = json::require_string(o, "type", at);
    std::transform(type.begin(), type.end(), type.begin(),
                   [](unsigned char ch) { return std::tolower(ch); });
    const auto parsed = chem::detector_type_from_name(type);
    if (!parsed) {
        std::string known;
        for (const chem::DetectorType t : chem::detector_types())
            known += (known.empty() ? "" : ", ") + std::string(chem::detector_type_name(t));
        throw chem::Error(json::path(at, "type"),
                          "\"" + type + "\" is not a detector type (" + known + ")");
    }
    d.type = *parsed;
    if (chem::detector_reads_uv(d.type)) {
        const double wl = json::require_number(o, "wavelength_nm", at);
        if (wl < 180 || wl > 900)
            throw chem::Error(json::path(at, "wavelength_nm"),
                              chem::format_number(wl) + " nm is outside 180 to 900 nm");
        d.wavelength_nm = wl;
    }
    if (auto m = json::optional_number(o, "margin_nm", at)) {
        if (*m < 0 || *m > 100)
            throw chem::Error(json::path(at, "margin_nm"),
                              chem::format_number(*m) + " nm is outside 0 to 100 nm");
        d.margin_nm = *m;
    }
    return d;
}

} // namespace line_internal

using namespace line_internal;

std::optional<chem::ColumnLimits> column_from_json(const QJsonObject& doc,
                                                   const std::string& root) {
    if (!doc.contains("column") || doc.value("column").isNull())
        return std::nullopt;
    const std::string at = json::path(root, "column");
    const QJsonObject o = json::require_object(doc, "column", root);
    json::reject_near_misses(o, {"ph_min", "ph_max", "temperature_c"}, at);
    // A column given for its pressure only (dimensions, no pH range) has no pH check.
    if (!o.contains("ph_min") && !o.contains("ph_max"))
        return std::nullopt;
    chem::ColumnLimits c;
    c.ph_min = json::require_number(o, "ph_min", at);
    c.ph_max = json::require_number(o, "ph_max", at);
    for (auto [key, v] : {std::pair{"ph_min", c.ph_min}, std::pair{"ph_max", c.ph_max}})
        if (v < 0 || v > 14)
            throw chem::Error(json::path(at, key),
                              chem::format_number(v) + " is outside pH 0 to 14");
    c.temperature_c = optional_temperature_c(o, at);
    if (c.ph_min >= c.ph_max)
        throw chem::Error(json::path(at, "ph_max"), chem::format_number(c.ph_max) +
                                                        " is not above ph_min " +
                                                        chem::format_number(c.ph_min));
    return c;
}

namespace {

QJsonObject solvent_properties(const chem::Solvent& s) {
    QJsonObject src;
    for (const auto& [k, v] : s.sources)
        src[qs(k)] = qs(v);
    QJsonObject o{{"solvent", qs(s.id)},
                  {"name", qs(s.name)},
                  {"density_g_per_ml", s.density_g_per_ml},
                  {"density_temperature_c", s.density_temperature_c},
                  {"viscosity_mpa_s", s.viscosity_mpa_s},
                  {"viscosity_temperature_c", s.viscosity_temperature_c},
                  {"uv_cutoff_nm", s.uv_cutoff_nm},
                  {"boiling_point_c", s.boiling_point_c},
                  {"flash_point_c", opt(s.flash_point_c)},
                  {"ghs_hazards", strings(s.ghs_hazards)},
                  {"ghs_pictograms", strings(s.ghs_pictograms)},
                  {"sources", src}};
    if (!s.uv_absorbance.empty()) {
        QJsonArray rows;
        for (const chem::UvAbsorbancePoint& p : s.uv_absorbance)
            rows.append(
                QJsonObject{{"wavelength_nm", p.wavelength_nm}, {"absorbance", p.absorbance}});
        o["uv_absorbance"] = rows;
    }
    return o;
}

QJsonObject profile_to_json(const chem::LineProfile& p) {
    QJsonObject solvents;
    for (const auto& [id, f] : p.solvent_fraction_v)
        solvents[qs(id)] = f;
    QJsonArray solutes;
    for (const auto& s : p.solutes)
        solutes.append(QJsonObject{{"reagent", qs(s.reagent)},
                                   {"mmol_per_l", s.mmol_per_l},
                                   {"from", QLatin1String(chem::solute_source_name(s.from))}});
    return QJsonObject{{"aqueous_fraction_v", p.aqueous_fraction_v},
                       {"organic_fraction_v", p.organic_fraction_v},
                       {"solvents", solvents},
                       {"solutes", solutes},
                       {"uv_cutoff_nm", p.uv_cutoff_nm},
                       {"uv_limited_by", qs(p.uv_limited_by)},
                       {"ph", opt(p.ph)},
                       {"ph_basis", QString::fromUtf8(chem::ph_basis_name(p.ph_basis))},
                       {"nonvolatile", strings(p.nonvolatile)},
                       {"shelf_kind", QLatin1String(chem::shelf_kind_name(p))},
                       {"shelf_life_h", p.shelf_life_h}};
}

/// The parts and additives without buffer volumes: equal for lines made from one batch.
QString recipe_key_of(const QJsonObject& line, const std::string& name) {
    if (!line.contains("parts"))
        return QStringLiteral("name:") + qs(name);
    QJsonArray parts = line.value("parts").toArray();
    for (int i = 0; i < parts.size(); ++i) {
        QJsonObject p = parts.at(i).toObject();
        if (p.contains("buffer")) {
            QJsonObject b = p.value("buffer").toObject();
            b.remove("volume_ml");
            p["buffer"] = b;
        }
        parts[i] = p;
    }
    const QJsonObject key{{"parts", parts}, {"additives", line.value("additives")}};
    return QString::fromUtf8(QJsonDocument(key).toJson(QJsonDocument::Compact));
}

} // namespace

chem::NameLookup library_names(const AppData& data) {
    return [&data](const std::string& id) -> std::string {
        if (const chem::Reagent* r = data.reagents.find_reagent(id))
            return r->name;
        if (const chem::Solvent* s = data.solvents.find_solvent(id))
            return s->name;
        return id;
    };
}

QJsonObject eluent_traces_to_json(const std::vector<chem::EluentTrace>& traces) {
    QJsonObject out;
    for (const auto& tr : traces) {
        QJsonArray pts;
        for (const auto& p : tr.points)
            pts.append(QJsonObject{{"t_min", p.t_min},
                                   {"organic_fraction_v", p.organic_fraction_v},
                                   {"ph_s_w", p.ph_s_w},
                                   {"ph_s_s", p.ph_s_s},
                                   {"extrapolated", p.extrapolated}});
        out[qs(tr.method)] = QJsonObject{{"temperature_c", tr.temperature_c}, {"points", pts}};
    }
    return out;
}

QString Clock::iso(double minutes) const {
    // To the nearest second.
    return ContractClockText(start, has_offset).text(std::llround(minutes * 60.0));
}

std::string Clock::text(double minutes) const {
    const QDateTime t = start.addMSecs(static_cast<qint64>(std::llround(minutes * 60000.0)));
    if (words)
        return words(t).toStdString();
    return minute_text(t).toStdString();
}

QDateTime datetime_from_json(const QJsonObject& o, const QString& key, const std::string& parent,
                             bool* has_offset) {
    const std::string s = json::require_string(o, key, parent);
    QDateTime t = QDateTime::fromString(qs(s), Qt::ISODate);
    if (!t.isValid())
        throw chem::Error(json::path(parent, key),
                          "\"" + s + "\" is not an ISO date and time (like 2026-12-01T18:00:00)");
    // Clock times are printed as ISO dates, which have four-digit years: a start in 9999 would
    // end in year 10000 and print as an empty string.
    if (t.date().year() < 1900 || t.date().year() > 9000)
        throw chem::Error(json::path(parent, key),
                          "\"" + s + "\" is outside the years 1900 to 9000");
    const bool offset = t.timeSpec() != Qt::LocalTime;
    if (has_offset)
        *has_offset = offset;
    // Wall-clock arithmetic: no daylight-saving jumps in the middle of a night's sequence.
    if (!offset)
        t = QDateTime(t.date(), t.time(), QTimeZone::utc());
    return t;
}

ParsedLine line_from_json(const AppData& data, const QJsonObject& o, const std::string& path,
                          double volume_ml, bool bottle_required,
                          std::vector<chem::Warning>* notes) {
    ParsedLine pl;
    pl.spec.field = path;
    json::reject_near_misses(o,
                             {"name", "bottle_ml", "residue_ml", "parts", "additives",
                              "prepared_at", "shelf_life_h", "volume_ml", "detector", "column",
                              "temperature_c", "activity_model"},
                             path);
    pl.spec.activity_model = activity_model_from_json(o, path);
    if (auto t = optional_temperature_c(o, path))
        pl.spec.temperature_c = *t;
    const std::string fallback_name = path.empty() ? "line" : path.substr(path.rfind('.') + 1);
    pl.spec.name = json::optional_string(o, "name", path).value_or(fallback_name);
    if (bottle_required) {
        pl.bottle_ml = json::require_number(o, "bottle_ml", path);
        pl.residue_ml = json::optional_number(o, "residue_ml", path).value_or(0.0);
        if (volume_ml <= 0)
            volume_ml = pl.bottle_ml;
    } else {
        pl.bottle_ml = json::optional_number(o, "bottle_ml", path).value_or(0.0);
        pl.residue_ml = json::optional_number(o, "residue_ml", path).value_or(0.0);
    }
    if (o.contains("parts")) {
        const std::string list = json::path(path, "parts");
        const QJsonArray parts = json::require_array(o, "parts", path);
        if (parts.isEmpty())
            throw chem::Error(list, "needs at least one part");
        for (int i = 0; i < parts.size(); ++i) {
            const std::string at = json::path(list, i);
            const QJsonObject po = json::element_object(parts, i, list);
            // "buffer_ref": the name of the saved buffer the part follows in the app (the app keeps
            // "buffer" up to date with it); informational here.
            json::reject_near_misses(po, {"solvent", "buffer", "buffer_ref", "fraction_v"}, at);
            const bool has_solvent = po.contains("solvent"), has_buffer = po.contains("buffer");
            if (has_solvent == has_buffer)
                throw chem::Error(at, "give either \"solvent\" or \"buffer\", not both or neither");
            chem::LinePart part;
            part.fraction_v = json::require_number(po, "fraction_v", at);
            if (part.fraction_v <= 0 || part.fraction_v > 1)
                throw chem::Error(json::path(at, "fraction_v"),
                                  chem::format_number(part.fraction_v) + " is outside (0, 1]");
            if (has_solvent) {
                part.solvent = json::require_string(po, "solvent", at);
                data.solvents.solvent(part.solvent, json::path(at, "solvent"));
            } else {
                const std::string bat = json::path(at, "buffer");
                QJsonObject b = json::require_object(po, "buffer", at);
                const double needed = std::max(1.0, volume_ml) * part.fraction_v;
                if (!b.contains("volume_ml"))
                    b["volume_ml"] = needed;
                // The line's activity model reaches its buffer unless the buffer names its own.
                if (o.contains("activity_model") && !b.contains("activity_model"))
                    b["activity_model"] = o.value("activity_model");
                chem::RecipeRequest req = recipe_request_from_json(data.reagents, b, bat);
                if (req.volume_ml < needed * (1 - 1e-9)) {
                    if (notes) {
                        chem::Finding f;
                        f.kind = chem::FindingKind::buffer_scaled;
                        f.severity = chem::Severity::info;
                        f.number("needed_ml", needed);
                        f.number("requested_ml", req.volume_ml);
                        f.detail_text("line_name", pl.spec.name);
                        notes->push_back(chem::warning_of(std::move(f)));
                    }
                    req.volume_ml = needed;
                }
                try {
                    part.buffer = chem::design_recipe(data.reagents, req);
                } catch (const chem::Error& e) {
                    rethrow_within(e, bat);
                }
            }
            pl.spec.parts.push_back(std::move(part));
        }
    }
    if (o.contains("additives")) {
        const std::string list = json::path(path, "additives");
        const QJsonArray adds = json::require_array(o, "additives", path);
        for (int i = 0; i < adds.size(); ++i) {
            const std::string at = json::path(list, i);
            const QJsonObject ao = json::element_object(adds, i, list);
            json::reject_near_misses(ao, {"additive", "percent_v", "percent_w", "mmol_per_l"}, at);
            chem::LineAdditive a;
            a.additive = json::require_string(ao, "additive", at);
            int given = 0;
            for (auto [key, unit] : {std::pair{"percent_v", chem::AmountUnit::percent_v},
                                     std::pair{"percent_w", chem::AmountUnit::percent_w},
                                     std::pair{"mmol_per_l", chem::AmountUnit::mmol_per_l}})
                if (ao.contains(key)) {
                    ++given;
                    a.unit = unit;
                    a.amount = json::require_number(ao, key, at);
                }
            if (given != 1)
                throw chem::Error(at, "give exactly one of percent_v, percent_w, mmol_per_l");
            pl.spec.additives.push_back(a);
        }
    }
    if (o.contains("prepared_at") && !o.value("prepared_at").isNull())
        pl.prepared_at = datetime_from_json(o, "prepared_at", path, nullptr);
    if (auto h = json::optional_positive(o, "shelf_life_h", path, 24.0 * 365)) {
        // Six minutes is far below any mobile phase's shelf life; below it batch counts overflow.
        if (*h < 0.1)
            throw chem::Error(json::path(path, "shelf_life_h"),
                              chem::format_number(*h) + " h is below 0.1 h");
        pl.spec.shelf_life_h = *h;
    }
    pl.recipe_key = recipe_key_of(o, pl.spec.name);
    return pl;
}

chem::Method method_from_json(const QJsonObject& mo, const std::string& name,
                              const std::string& mpath) {
    json::reject_near_misses(
        mo, {"flow_ml_min", "gradient", "run_min", "equilibration_min", "column"}, mpath);
    chem::Method m;
    m.name = name;
    m.flow_ml_min = json::require_number(mo, "flow_ml_min", mpath);
    const QJsonArray g = json::require_array(mo, "gradient", mpath);
    const std::string gpath = json::path(mpath, "gradient");
    for (int i = 0; i < g.size(); ++i) {
        const std::string rpath = json::path(gpath, i);
        const QJsonObject ro = json::element_object(g, i, gpath);
        chem::GradientRow row;
        row.t_min = json::require_number(ro, "t_min", rpath);
        row.percent = percent_from_json(ro, rpath, {"t_min"});
        m.gradient.push_back(row);
    }
    m.run_min = json::require_number(mo, "run_min", mpath);
    m.equilibration_min = json::optional_number(mo, "equilibration_min", mpath).value_or(0.0);
    return m;
}

chem::LineValues percent_from_json(const QJsonObject& o, const std::string& path,
                                   std::initializer_list<const char*> other_keys) {
    chem::LineValues p{};
    for (auto k = o.begin(); k != o.end(); ++k) {
        bool other = false;
        for (const char* key : other_keys)
            other |= k.key() == QLatin1String(key);
        if (other)
            continue;
        const int l = chem::line_index(k.key().toStdString());
        if (l < 0)
            throw chem::Error(json::path(path, k.key()),
                              other_keys.size() == 1
                                  ? "is neither " + std::string(*other_keys.begin()) +
                                        " nor a line (A, B, C, D)"
                                  : std::string("is neither a field here nor a line (A, B, C, D)"));
        p[l] = json::require_number(o, k.key(), path);
    }
    return p;
}

QVariantMap finding_references(const chem::Finding& f) {
    auto ref = [](const chem::Subject& s) {
        return QVariantMap{{"kind", QLatin1String(chem::subject_kind_name(s.kind))},
                           {"id", qs(s.id)},
                           {"other", qs(s.other)}};
    };
    return QVariantMap{{"subject", ref(f.subject)}, {"place", ref(f.where)}};
}

QJsonObject finding_to_json(const chem::Finding& w, const chem::RenderContext& words,
                            const Clock* clock) {
    QJsonObject o{{"code", QLatin1String(w.code())},
                  {"severity", chem::severity_name(w.severity)},
                  {"message", qs(chem::describe(w, words))}};
    if (!w.alone && !w.subject.line_letters().empty())
        o["line"] = qs(w.subject.line_letters());
    for (const auto& [k, v] : w.numbers) {
        o[qs(k)] = v;
        const std::string suffix = "_at_min";
        if (clock && k.size() > suffix.size() &&
            k.compare(k.size() - suffix.size(), suffix.size(), suffix) == 0)
            o[qs(k.substr(0, k.size() - 4))] = clock->iso(v);
    }
    for (const auto& [k, v] : w.texts)
        if (!o.contains(qs(k)))
            o[qs(k)] = qs(v);
    return o;
}

// ---------------------------------------------------------------------------------------------
// line

QJsonArray note_texts(const std::vector<chem::LineNote>& notes,
                      const chem::SolventLibrary& solvents) {
    QJsonArray out;
    for (const chem::LineNote& n : notes)
        out.append(qs(chem::describe(n, solvents)));
    return out;
}

LineResult line_result(const AppData& data, const QJsonObject& input) {
    LineResult res;
    // volume_ml is the contract; a line document that gives only its bottle_ml is made for that.
    res.volume_ml = !input.contains("volume_ml") && input.contains("bottle_ml")
                        ? json::require_positive(input, "bottle_ml", "", 1.0e6)
                        : json::require_positive(input, "volume_ml", "", 1.0e6);
    res.parsed = line_from_json(data, input, "", res.volume_ml, false, &res.notes);
    if (res.parsed.spec.parts.empty())
        throw chem::Error("parts", "is required for a line recipe");
    const auto detector = detector_from_json(input, "");
    const auto column = column_from_json(input, "");
    res.recipe = chem::prepare_line(data.solvents, data.reagents, res.parsed.spec, res.volume_ml);
    if (res.recipe.buffer)
        res.notes.insert(res.notes.end(), res.recipe.buffer->warnings.begin(),
                         res.recipe.buffer->warnings.end());
    res.words.name_of = library_names(data);
    res.words.line_names[0] = res.parsed.spec.name;
    res.findings = chem::check_line(data.solvents, res.recipe.profile, res.parsed.spec.name,
                                    detector, column, &data.reagents);
    return res;
}

QString line_shelf_source(const AppData& data, const LineResult& res) {
    if (res.parsed.spec.shelf_life_h)
        return QStringLiteral("set on the line");
    const chem::LineProfile& p = res.recipe.profile;
    const chem::ShelfLife* entry = p.shelf_kind ? data.solvents.shelf_life(*p.shelf_kind) : nullptr;
    return entry ? qs(entry->source) : QString();
}

QJsonObject line_to_json(const AppData& data, const LineResult& res) {
    const chem::LineRecipe& r = res.recipe;
    const ParsedLine& pl = res.parsed;
    QJsonArray items;
    for (const auto& it : r.items) {
        QJsonObject o{{"part", qs(it.part)},
                      {"kind", QLatin1String(chem::line_item_kind_name(it.kind))},
                      {"volume_ml", opt(it.volume_ml)},
                      {"mass_g", opt(it.mass_g)}};
        if (it.kind != chem::LineItemKind::additive)
            o["fraction_v"] = it.fraction_v;
        if (it.density_g_per_ml > 0)
            o["density_g_per_ml"] = it.density_g_per_ml;
        if (it.density_g_per_ml > 0 && it.kind != chem::LineItemKind::additive)
            o["density_temperature_c"] = it.density_temperature_c;
        o["density_basis"] = qs(it.density_basis);
        items.append(o);
    }
    QJsonArray props;
    for (const auto& part : pl.spec.parts)
        if (!part.buffer)
            props.append(solvent_properties(data.solvents.solvent(part.solvent)));

    QJsonArray warnings;
    for (const auto& w : res.notes)
        warnings.append(warning_to_json(w));
    for (const auto& f : res.findings)
        warnings.append(finding_to_json(f, res.words, nullptr));

    QJsonObject out{
        {"name", qs(pl.spec.name)},
        {"volume_ml", res.volume_ml},
        {"items", items},
        {"uv_cutoff_nm", r.profile.uv_cutoff_nm},
        {"uv_limited_by", qs(r.profile.uv_limited_by)},
        {"ph", opt(r.profile.ph)},
        {"ph_basis", QString::fromUtf8(chem::ph_basis_name(r.profile.ph_basis))},
        {"mixed_volume_ml", r.mixed_volume_ml},
        {"contraction_ml", r.contraction_ml},
        {"contraction_sources", strings(r.contraction_sources)},
        {"composition", profile_to_json(r.profile)},
        {"solvents", props},
        {"shelf_life", QJsonObject{{"kind", QLatin1String(chem::shelf_kind_name(r.profile))},
                                   {"hours", r.profile.shelf_life_h},
                                   {"source", line_shelf_source(data, res)}}},
        {"steps", strings(chem::numbered_step_texts(r.steps))},
        {"notes", note_texts(r.notes, data.solvents)},
        {"cautions", strings(r.cautions)},
        {"warnings", warnings}};
    if (r.buffer)
        out["buffer"] = recipe_to_json(*r.buffer);
    return out;
}

QJsonObject command_line(const AppData& data, const QJsonObject& input, const CommandOptions&) {
    return line_to_json(data, line_result(data, input));
}

} // namespace phaseplan
