#include "core/app_data.h"

#include "chem/error.h"
#include "chem/formula.h"
#include "core/json_util.h"
#include "core/solvent_data.h"

#include <QCoreApplication>
#include <QDir>
#include <QFile>
#include <QFileInfo>
#include <QJsonArray>

namespace phaseplan {

QString find_data_dir(const char* installed) {
    const QString env = qEnvironmentVariable("PHASEPLAN_DATA_DIR");
    if (!env.isEmpty())
        return env;
    QStringList candidates;
    bool build_tree = true; // no application object: a test or a tool linked in the build
    if (QCoreApplication::instance()) {
        const QString exe = QCoreApplication::applicationDirPath();
        candidates << exe + "/data" << exe + "/" + QString::fromUtf8(installed);
        // The source tree's data only for a program in the build tree: an installed program
        // finds its own copy or fails, so a broken install cannot pass for a working one.
        build_tree = QFileInfo::exists(exe + "/CMakeCache.txt");
    }
    if (build_tree)
        candidates << QStringLiteral(PHASEPLAN_SOURCE_DATA_DIR);
    for (const QString& c : candidates)
        if (QFileInfo::exists(c + "/reagents.json"))
            return QDir(c).absolutePath();
    // Nothing found: name where an installed program looks, so the error says what is missing.
    return build_tree ? QStringLiteral(PHASEPLAN_SOURCE_DATA_DIR)
                      : QDir::cleanPath(candidates.at(1));
}

namespace {

QByteArray read_file(const QString& path) {
    QFile f(path);
    if (!f.open(QIODevice::ReadOnly))
        throw chem::Error(QFileInfo(path).fileName().toStdString(),
                          "cannot open " + path.toStdString() + ": " +
                              f.errorString().toStdString());
    return f.readAll();
}

chem::AcidBaseSystem system_from_json(const QJsonObject& o, const std::string& at) {
    chem::AcidBaseSystem s;
    s.id = json::require_string(o, "id", at);
    s.name = json::optional_string(o, "name", at).value_or(s.id);
    s.species = json::optional_string_list(o, "species", at);
    s.charge_fully_protonated = json::require_int(o, "charge_fully_protonated", at, -6, 6);
    const QJsonArray steps = json::require_array(o, "steps", at);
    for (int i = 0; i < steps.size(); ++i) {
        const std::string sat = json::path(json::path(at, "steps"), i);
        const QJsonObject st = json::element_object(steps, i, json::path(at, "steps"));
        s.pka_25c.push_back(json::require_number(st, "pka_25c", sat));
        s.enthalpy_kj_per_mol.push_back(json::optional_number(st, "enthalpy_kj_per_mol", sat));
        s.heat_capacity_j_per_mol_k.push_back(
            json::optional_number(st, "heat_capacity_j_per_mol_k", sat).value_or(0.0));
        s.dpka_per_k.push_back(json::optional_number(st, "dpka_per_k", sat).value_or(0.0));
        s.sources.push_back(json::optional_string(st, "source", sat).value_or(""));
    }
    if (o.contains("eluent_shift")) {
        const QJsonArray a = json::require_array(o, "eluent_shift", at);
        for (int i = 0; i < a.size(); ++i) {
            const std::string eat = json::path(json::path(at, "eluent_shift"), i);
            const QJsonObject e = json::element_object(a, i, json::path(at, "eluent_shift"));
            chem::OrganicShift sh;
            sh.organic = json::require_string(e, "organic", eat);
            sh.source = json::require_string(e, "source", eat);
            const QJsonArray pts = json::require_array(e, "points", eat);
            if (pts.isEmpty())
                throw chem::Error(json::path(eat, "points"), "needs at least one row");
            for (int k = 0; k < pts.size(); ++k) {
                const std::string pat = json::path(json::path(eat, "points"), k);
                const QJsonObject pt = json::element_object(pts, k, json::path(eat, "points"));
                const double f = json::require_number(pt, "fraction_v", pat);
                if (!(f > 0 && f <= 1) || (!sh.fraction_v.empty() && f <= sh.fraction_v.back()))
                    throw chem::Error(json::path(pat, "fraction_v"),
                                      chem::format_number(f) +
                                          " is not in (0, 1] above the row before");
                const QJsonArray d = json::require_array(pt, "dpka", pat);
                std::vector<double> row;
                for (int q = 0; q < d.size(); ++q) {
                    if (!d.at(q).isDouble())
                        throw chem::Error(json::path(json::path(pat, "dpka"), q),
                                          "must be a number");
                    row.push_back(d.at(q).toDouble());
                }
                if (row.empty() || static_cast<int>(row.size()) > s.steps())
                    throw chem::Error(json::path(pat, "dpka"),
                                      "needs one shift per step, for up to " +
                                          std::to_string(s.steps()) + " steps");
                sh.fraction_v.push_back(f);
                sh.dpka.push_back(row);
            }
            s.eluent_shift.push_back(std::move(sh));
        }
    }
    return s;
}

chem::EluentSolvent eluent_solvent_from_json(const QJsonObject& o, const std::string& at) {
    chem::EluentSolvent e;
    e.organic = json::require_string(o, "organic", at);
    e.permittivity_25c = json::require_positive(o, "permittivity_25c", at, 200.0);
    e.permittivity_source = json::require_string(o, "permittivity_source", at);
    const QJsonArray pts = json::require_array(o, "dpkw_points", at);
    for (int k = 0; k < pts.size(); ++k) {
        const std::string pat = json::path(json::path(at, "dpkw_points"), k);
        const QJsonObject pt = json::element_object(pts, k, json::path(at, "dpkw_points"));
        e.fraction_v.push_back(json::require_number(pt, "fraction_v", pat));
        e.dpkw.push_back(json::require_number(pt, "dpkw", pat));
    }
    e.dpkw_source = json::require_string(o, "dpkw_source", at);
    const std::string dat = json::path(at, "delta");
    const QJsonObject d = json::require_object(o, "delta", at);
    for (const char* key : {"numerator", "denominator"}) {
        const QJsonArray a = json::require_array(d, key, dat);
        for (int q = 0; q < a.size(); ++q) {
            if (!a.at(q).isDouble())
                throw chem::Error(json::path(json::path(dat, key), q), "must be a number");
            (std::string(key) == "numerator" ? e.delta_numerator : e.delta_denominator)
                .push_back(a.at(q).toDouble());
        }
    }
    e.delta_max_fraction_v = json::require_number(d, "max_fraction_v", dat);
    e.delta_source = json::require_string(d, "source", dat);
    return e;
}

} // namespace

chem::Reagent reagent_from_json(const QJsonObject& o, const std::string& at) {
    chem::Reagent r;
    r.id = json::require_string(o, "id", at);
    r.name = json::optional_string(o, "name", at).value_or(r.id);
    r.formula = json::require_string(o, "formula", at);
    try {
        r.molar_mass_g_per_mol = chem::molar_mass_g_per_mol(r.formula);
    } catch (const chem::Error& e) {
        throw chem::Error(json::path(at, "formula"), e.message());
    }
    const std::string form = json::optional_string(o, "form", at).value_or("solid");
    if (form == "solid")
        r.form = chem::PhysicalForm::solid;
    else if (form == "liquid")
        r.form = chem::PhysicalForm::liquid;
    else
        throw chem::Error(json::path(at, "form"),
                          "\"" + form + "\" is neither \"solid\" nor \"liquid\"");
    r.assay_fraction = json::optional_number(o, "assay_percent", at).value_or(100.0) / 100.0;
    if (r.form == chem::PhysicalForm::liquid)
        r.density_g_per_ml = json::require_positive(o, "density_g_per_ml", at, 25.0);
    if (o.contains("ghs")) {
        const QJsonObject ghs = json::require_object(o, "ghs", at);
        r.ghs_hazards = json::optional_string_list(ghs, "hazards", json::path(at, "ghs"));
        r.ghs_pictograms = json::optional_string_list(ghs, "pictograms", json::path(at, "ghs"));
    }
    if (o.contains("spectators")) {
        const QJsonArray a = json::require_array(o, "spectators", at);
        for (int i = 0; i < a.size(); ++i) {
            const std::string sat = json::path(json::path(at, "spectators"), i);
            const QJsonObject so = json::element_object(a, i, json::path(at, "spectators"));
            chem::SpectatorIon ion;
            ion.ion = json::require_string(so, "ion", sat);
            ion.charge = json::require_int(so, "charge", sat, -6, 6);
            ion.count = json::optional_number(so, "count", sat).value_or(1.0);
            r.spectators.push_back(ion);
        }
    }
    if (o.contains("systems")) {
        const QJsonArray a = json::require_array(o, "systems", at);
        for (int i = 0; i < a.size(); ++i) {
            const std::string sat = json::path(json::path(at, "systems"), i);
            const QJsonObject so = json::element_object(a, i, json::path(at, "systems"));
            chem::SystemShare sh;
            sh.system = json::require_string(so, "system", sat);
            sh.count = json::optional_number(so, "count", sat).value_or(1.0);
            sh.protons_removed = json::optional_number(so, "protons_removed", sat).value_or(0.0);
            r.systems.push_back(sh);
        }
    }
    r.sources = json::optional_string_list(o, "sources", at);
    r.user_defined = json::optional_bool(o, "user_defined", at, false);
    return r;
}

void load_reagents_json(const QByteArray& bytes, const std::string& origin, chem::Library& lib) {
    try {
        const QJsonObject doc = json::parse_document(bytes);
        const QJsonArray systems = json::require_array(doc, "systems", "");
        for (int i = 0; i < systems.size(); ++i) {
            const std::string at = json::path("systems", i);
            try {
                lib.add_system(system_from_json(json::element_object(systems, i, "systems"), at));
            } catch (const chem::Error& e) {
                throw e.field().rfind("systems[", 0) == 0 ? e : e.within(at);
            }
        }
        if (doc.contains("eluent_solvents")) {
            const QJsonArray es = json::require_array(doc, "eluent_solvents", "");
            for (int i = 0; i < es.size(); ++i) {
                const std::string at = json::path("eluent_solvents", i);
                try {
                    lib.add_eluent_solvent(eluent_solvent_from_json(
                        json::element_object(es, i, "eluent_solvents"), at));
                } catch (const chem::Error& err) {
                    throw err.field().rfind("eluent_solvents[", 0) == 0 ? err : err.within(at);
                }
            }
        }
        // An optional list of objects: `add` reads and adds entry i at path "key[i]"; a chem error
        // about an entry is named within it.
        auto each_entry = [&doc](const char* key, const auto& add) {
            if (!doc.contains(key))
                return;
            const QJsonArray list = json::require_array(doc, key, "");
            for (int i = 0; i < list.size(); ++i) {
                const std::string at = json::path(key, i);
                const QJsonObject e = json::element_object(list, i, key);
                try {
                    add(e, at);
                } catch (const chem::Error& err) {
                    throw err.field().rfind(std::string(key) + "[", 0) == 0 ? err : err.within(at);
                }
            }
        };
        each_entry("sit_epsilon", [&lib](const QJsonObject& e, const std::string& at) {
            lib.add_sit_epsilon({json::require_string(e, "cation", at),
                                 json::require_string(e, "anion", at),
                                 json::require_number(e, "epsilon_kg_per_mol", at),
                                 json::require_string(e, "source", at)});
        });
        each_entry("truesdell_jones", [&lib](const QJsonObject& e, const std::string& at) {
            lib.add_ion_size({json::require_string(e, "species", at),
                              json::require_number(e, "size_angstrom", at),
                              json::require_number(e, "b_kg_per_mol", at),
                              json::require_string(e, "source", at)});
        });
        each_entry("complexes", [&lib](const QJsonObject& e, const std::string& at) {
            chem::Complex c;
            c.species = json::require_string(e, "species", at);
            const QJsonObject members = json::require_object(e, "formed_from", at);
            for (auto it = members.begin(); it != members.end(); ++it)
                c.formed_from.emplace_back(
                    it.key().toStdString(),
                    json::require_int(members, it.key(),
                                      json::path(at, QStringLiteral("formed_from")), 1, 4));
            c.log10_k = json::require_number(e, "log10_k", at);
            for (const std::string& name : json::optional_string_list(e, "models", at)) {
                const auto m = chem::activity_model_from_name(name);
                if (!m)
                    throw chem::Error(json::path(at, QStringLiteral("models")),
                                      "\"" + name +
                                          "\" is not an activity model (sit, truesdell-jones)");
                c.models.push_back(*m);
            }
            c.source = json::require_string(e, "source", at);
            lib.add_complex(std::move(c));
        });
        const QJsonArray reagents = json::require_array(doc, "reagents", "");
        for (int i = 0; i < reagents.size(); ++i) {
            const std::string at = json::path("reagents", i);
            try {
                lib.add_reagent(
                    reagent_from_json(json::element_object(reagents, i, "reagents"), at));
            } catch (const chem::Error& e) {
                throw e.field().rfind("reagents[", 0) == 0 ? e : e.within(at);
            }
        }
    } catch (const chem::Error& e) {
        throw chem::Error(origin + ": " + e.field(), e.message());
    }
}

AppData load_app_data(const QString& dir) {
    AppData d;
    d.data_dir = dir;
    load_reagents_json(read_file(dir + "/reagents.json"), "reagents.json", d.reagents);
    load_solvents_json(read_file(dir + "/solvents.json"), "solvents.json", d.solvents);
    return d;
}

} // namespace phaseplan
