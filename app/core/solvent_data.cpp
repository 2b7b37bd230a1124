#include "core/solvent_data.h"

#include "chem/error.h"
#include "chem/formula.h"
#include "core/json_util.h"

#include <QJsonArray>
#include <QJsonObject>

namespace phaseplan {

namespace {

chem::Solvent solvent_from_json(const QJsonObject& o, const std::string& at) {
    chem::Solvent s;
    s.id = json::require_string(o, "id", at);
    s.name = json::optional_string(o, "name", at).value_or(s.id);
    s.formula = json::require_string(o, "formula", at);
    try {
        s.molar_mass_g_per_mol = chem::molar_mass_g_per_mol(s.formula);
    } catch (const chem::Error& e) {
        throw chem::Error(json::path(at, "formula"), e.message());
    }
    s.aqueous = json::optional_bool(o, "aqueous", at, false);
    s.density_g_per_ml = json::require_positive(o, "density_g_per_ml", at, 5.0);
    s.density_temperature_c = json::require_number(o, "density_temperature_c", at);
    if (auto a = json::optional_number(o, "expansion_per_k", at)) {
        if (*a < 0 || *a > 0.01)
            throw chem::Error(json::path(at, "expansion_per_k"),
                              chem::format_number(*a) + " 1/K is outside 0 to 0.01 1/K");
        s.expansion_per_k = *a;
        s.sources["expansion"] = json::require_string(o, "expansion_source", at);
    }
    if (auto m = json::optional_string(o, "density_model", at)) {
        if (*m != "tanaka-2001")
            throw chem::Error(json::path(at, "density_model"),
                              "\"" + *m + "\" is not a density model (tanaka-2001)");
        s.density_from_water_model = true;
    }
    s.viscosity_mpa_s = json::require_positive(o, "viscosity_mpa_s", at, 100.0);
    s.viscosity_temperature_c = json::require_number(o, "viscosity_temperature_c", at);
    s.uv_cutoff_nm = json::require_positive(o, "uv_cutoff_nm", at, 1000.0);
    if (o.contains("uv_absorbance") && !o.value("uv_absorbance").isNull()) {
        // A published table: rows ascending in wavelength, each absorbance above 0 (it is
        // interpolated on a log scale), with its source.
        const std::string uat = json::path(at, "uv_absorbance");
        const QJsonObject uv = json::require_object(o, "uv_absorbance", at);
        const QJsonArray pts = json::require_array(uv, "points", uat);
        const std::string pat = json::path(uat, "points");
        if (pts.isEmpty())
            throw chem::Error(pat, "needs at least one row");
        for (int i = 0; i < pts.size(); ++i) {
            const QJsonObject p = json::element_object(pts, i, pat);
            const std::string at_i = json::path(pat, i);
            chem::UvAbsorbancePoint pt;
            pt.wavelength_nm = json::require_positive(p, "wavelength_nm", at_i, 1000.0);
            pt.absorbance = json::require_positive(p, "absorbance", at_i, 10.0);
            if (!s.uv_absorbance.empty() &&
                pt.wavelength_nm <= s.uv_absorbance.back().wavelength_nm)
                throw chem::Error(
                    json::path(at_i, "wavelength_nm"),
                    chem::format_number(pt.wavelength_nm) + " nm is not above the row before (" +
                        chem::format_number(s.uv_absorbance.back().wavelength_nm) + " nm)");
            s.uv_absorbance.push_back(pt);
        }
        s.sources["uv_absorbance"] = json::require_string(uv, "source", uat);
    }
    s.boiling_point_c = json::require_number(o, "boiling_point_c", at);
    s.flash_point_c = json::optional_number(o, "flash_point_c", at);
    for (const char* q : {"density", "viscosity", "uv_cutoff", "boiling_point", "flash_point"}) {
        const QString key = QString::fromLatin1(q) + "_source";
        s.sources[q] = json::require_string(o, key, at); // a number without its source is refused
    }
    const QJsonObject ghs = json::require_object(o, "ghs", at);
    s.ghs_hazards = json::optional_string_list(ghs, "hazards", json::path(at, "ghs"));
    s.ghs_pictograms = json::optional_string_list(ghs, "pictograms", json::path(at, "ghs"));
    s.sources["ghs"] = json::require_string(ghs, "source", json::path(at, "ghs"));
    s.note = json::optional_string(o, "note", at).value_or("");
    return s;
}

chem::AmountUnit unit_from(const std::string& u, const std::string& field) {
    if (u == "percent_v")
        return chem::AmountUnit::percent_v;
    if (u == "percent_w")
        return chem::AmountUnit::percent_w;
    if (u == "mmol_per_l")
        return chem::AmountUnit::mmol_per_l;
    throw chem::Error(field, "\"" + u + "\" is not a unit (percent_v, percent_w, mmol_per_l)");
}

chem::Additive additive_from_json(const QJsonObject& o, const std::string& at) {
    chem::Additive a;
    a.id = json::require_string(o, "id", at);
    const QJsonValue vol = o.value("ms_volatile");
    if (!vol.isBool())
        throw chem::Error(json::path(at, "ms_volatile"), "must be true or false");
    a.ms_volatile = vol.toBool();
    a.volatility_source = json::require_string(o, "volatility_source", at);
    if (o.contains("uv") && !o.value("uv").isNull()) {
        const std::string uat = json::path(at, "uv");
        const QJsonObject uv = json::require_object(o, "uv", at);
        chem::UvTable t;
        t.unit = unit_from(json::require_string(uv, "unit", uat), json::path(uat, "unit"));
        const QJsonArray pts = json::require_array(uv, "points", uat);
        const std::string pat = json::path(uat, "points");
        for (int i = 0; i < pts.size(); ++i) {
            const QJsonObject p = json::element_object(pts, i, pat);
            const std::string at_i = json::path(pat, i);
            chem::UvPoint pt;
            pt.amount = json::require_positive(p, "amount", at_i, 10000.0);
            pt.cutoff_nm = json::require_positive(p, "cutoff_nm", at_i, 1000.0);
            pt.source = json::require_string(p, "source", at_i);
            t.points.push_back(pt);
        }
        a.uv = t;
    }
    a.solubility_group = json::optional_string(o, "solubility_group", at).value_or("");
    a.short_lived = json::optional_bool(o, "short_lived", at, false);
    if (auto c = json::optional_string(o, "ms_caution", at)) {
        a.ms_caution = *c;
        a.ms_caution_source = json::require_string(o, "ms_caution_source", at);
    }
    a.note = json::optional_string(o, "note", at).value_or("");
    return a;
}

chem::SolubilityTable solubility_from_json(const QJsonObject& o, const std::string& at) {
    chem::SolubilityTable t;
    t.group = json::require_string(o, "group", at);
    t.organic = json::require_string(o, "organic", at);
    t.basis = json::require_string(o, "basis", at);
    if (t.basis != "published" && t.basis != "rule-of-thumb")
        throw chem::Error(json::path(at, "basis"),
                          "\"" + t.basis + "\" is neither \"published\" nor \"rule-of-thumb\"");
    t.source = json::require_string(o, "source", at);
    const QJsonArray pts = json::require_array(o, "points", at);
    const std::string pat = json::path(at, "points");
    if (pts.isEmpty())
        throw chem::Error(pat, "needs at least one row");
    for (int i = 0; i < pts.size(); ++i) {
        const QJsonObject p = json::element_object(pts, i, pat);
        const std::string at_i = json::path(pat, i);
        const double f = json::require_number(p, "fraction_v", at_i);
        if (f < 0 || f > 1)
            throw chem::Error(json::path(at_i, "fraction_v"),
                              chem::format_number(f) + " is outside 0 to 1");
        const double m = json::require_number(p, "max_mmol_per_l", at_i);
        if (m < 0)
            throw chem::Error(json::path(at_i, "max_mmol_per_l"),
                              chem::format_number(m) + " is negative");
        t.points.emplace_back(f, m);
    }
    // A form table (one species form of an acid-base system, chem::SolubilityTable): the form,
    // its system and which species it is, all three or none.
    if (auto form = json::optional_string(o, "form", at)) {
        if (form->empty())
            throw chem::Error(json::path(at, "form"), "is empty");
        t.form = *form;
        t.system = json::require_string(o, "system", at);
        t.protons_removed = json::require_int(o, "protons_removed", at, 1, 6);
    } else if (o.contains("system") || o.contains("protons_removed")) {
        throw chem::Error(json::path(at, "form"),
                          "is missing: \"system\" and \"protons_removed\" belong to a form table");
    }
    return t;
}

template <class F> void each(const QJsonObject& doc, const char* key, bool required, F&& f) {
    if (!required && !doc.contains(key))
        return;
    const QJsonArray a = json::require_array(doc, key, "");
    for (int i = 0; i < a.size(); ++i) {
        const std::string at = json::path(key, i);
        try {
            f(json::element_object(a, i, key), at);
        } catch (const chem::Error& e) {
            throw e.field().rfind(key, 0) == 0 ? e : e.within(at);
        }
    }
}

} // namespace

void load_solvents_json(const QByteArray& bytes, const std::string& origin,
                        chem::SolventLibrary& lib) {
    try {
        const QJsonObject doc = json::parse_document(bytes);
        each(doc, "solvents", true, [&](const QJsonObject& o, const std::string& at) {
            chem::Solvent s = solvent_from_json(o, at);
            if (lib.find_solvent(s.id))
                throw chem::Error(json::path(at, "id"), "\"" + s.id + "\" appears twice");
            lib.add_solvent(std::move(s));
        });
        if (doc.contains("miscibility")) {
            const QJsonObject m = json::require_object(doc, "miscibility", "");
            lib.set_miscibility_source(json::require_string(m, "source", "miscibility"));
            const QJsonArray pairs = json::require_array(m, "pairs", "miscibility");
            for (int i = 0; i < pairs.size(); ++i) {
                const std::string at = json::path("miscibility.pairs", i);
                const QJsonArray p = pairs.at(i).toArray();
                if (!pairs.at(i).isArray() || p.size() != 3 || !p.at(0).isString() ||
                    !p.at(1).isString() || !p.at(2).isString())
                    throw chem::Error(
                        at, "must be [solvent, solvent, \"miscible\"|\"partly\"|\"immiscible\"]");
                const std::string kind = p.at(2).toString().toStdString();
                chem::Miscibility mk;
                if (kind == "miscible")
                    mk = chem::Miscibility::miscible;
                else if (kind == "partly")
                    mk = chem::Miscibility::partly;
                else if (kind == "immiscible")
                    mk = chem::Miscibility::immiscible;
                else
                    throw chem::Error(at, "\"" + kind + "\" is not miscible, partly or immiscible");
                try {
                    lib.set_miscibility(p.at(0).toString().toStdString(),
                                        p.at(1).toString().toStdString(), mk);
                } catch (const chem::Error& e) {
                    throw chem::Error(at, e.message());
                }
            }
            lib.check_complete();
        }
        each(doc, "excess_volume", false, [&](const QJsonObject& o, const std::string& at) {
            chem::ExcessVolume e;
            e.aqueous = json::require_string(o, "aqueous", at);
            e.organic = json::require_string(o, "organic", at);
            lib.solvent(e.aqueous, json::path(at, "aqueous"));
            lib.solvent(e.organic, json::path(at, "organic"));
            e.temperature_c = json::require_number(o, "temperature_c", at);
            const std::string model = json::require_string(o, "model", at);
            if (model != "redlich-kister")
                throw chem::Error(json::path(at, "model"),
                                  "\"" + model + "\" is not a known model (redlich-kister)");
            const QJsonArray c = json::require_array(o, "coefficients_cm3_per_mol", at);
            for (int i = 0; i < c.size(); ++i) {
                if (!c.at(i).isDouble())
                    throw chem::Error(json::path(json::path(at, "coefficients_cm3_per_mol"), i),
                                      "must be a number");
                e.rk_cm3_per_mol.push_back(c.at(i).toDouble());
            }
            e.source = json::require_string(o, "source", at);
            lib.add_excess_volume(std::move(e));
        });
        each(doc, "additives", false, [&](const QJsonObject& o, const std::string& at) {
            chem::Additive a = additive_from_json(o, at);
            if (lib.find_additive(a.id))
                throw chem::Error(json::path(at, "id"), "\"" + a.id + "\" appears twice");
            lib.add_additive(std::move(a));
        });
        each(doc, "solubility", false, [&](const QJsonObject& o, const std::string& at) {
            chem::SolubilityTable t = solubility_from_json(o, at);
            lib.solvent(t.organic, json::path(at, "organic"));
            try {
                lib.add_solubility(std::move(t));
            } catch (const chem::Error& e) {
                throw e.within(at);
            }
        });
        each(doc, "shelf_life", false, [&](const QJsonObject& o, const std::string& at) {
            chem::ShelfLife s;
            const std::string kind = json::require_string(o, "kind", at);
            const auto parsed = chem::shelf_kind_from_name(kind);
            if (!parsed) {
                std::string known;
                for (const chem::ShelfKind k : chem::shelf_kinds())
                    known += (known.empty() ? "" : ", ") + std::string(chem::shelf_kind_name(k));
                throw chem::Error(json::path(at, "kind"),
                                  "\"" + kind + "\" is not a shelf-life kind (" + known + ")");
            }
            s.kind = *parsed;
            s.hours = json::require_positive(o, "hours", at, 24.0 * 365);
            s.source = json::require_string(o, "source", at);
            s.description = json::optional_string(o, "description", at).value_or("");
            lib.add_shelf_life(std::move(s));
        });
    } catch (const chem::Error& e) {
        throw chem::Error(origin + ": " + e.field(), e.message());
    }
}

} // namespace phaseplan
