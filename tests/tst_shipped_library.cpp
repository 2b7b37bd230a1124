// The chemistry tests' copy of the shipped libraries (tests/chem/shipped_library.h, generated at
// build time) is what the programs load from data/: same systems, reagents, SIT coefficients and
// eluent data, and the same pH for every reagent alone (bit for bit); same solvents,
// miscibility, additives, solubility, shelf lives and excess volumes.
#include "chem/equilibrium.h"
#include "chem/error.h"
#include "core/solvent_data.h"
#include "shipped_library.h"
#include "test_support.h"

#include <QFile>
#include <QJsonArray>
#include <QJsonDocument>
#include <QJsonObject>
#include <QtTest>

using phaseplan::testing::shipped_data;

class TestShippedLibrary : public QObject {
    Q_OBJECT
  private slots:
    void same_entries() {
        const chem::Library& app = shipped_data().reagents;
        const chem::Library& gen = chem::testing::shipped_library();
        QCOMPARE(gen.systems().size(), app.systems().size());
        for (size_t i = 0; i < app.systems().size(); ++i) {
            const chem::AcidBaseSystem &a = app.systems()[i], &g = gen.systems()[i];
            QCOMPARE(g.id, a.id);
            QCOMPARE(g.species, a.species);
            QCOMPARE(g.pka_25c, a.pka_25c);
            QCOMPARE(g.enthalpy_kj_per_mol, a.enthalpy_kj_per_mol);
            QCOMPARE(g.heat_capacity_j_per_mol_k, a.heat_capacity_j_per_mol_k);
            QCOMPARE(g.dpka_per_k, a.dpka_per_k);
            QCOMPARE(g.eluent_shift.size(), a.eluent_shift.size());
            for (size_t k = 0; k < a.eluent_shift.size(); ++k)
                QCOMPARE(g.eluent_shift[k].dpka, a.eluent_shift[k].dpka);
            for (double t : {278.15, 310.15, 333.15})
                QCOMPARE(g.pka_at(0, t), a.pka_at(0, t));
        }
        QCOMPARE(gen.reagents().size(), app.reagents().size());
        for (size_t i = 0; i < app.reagents().size(); ++i) {
            const chem::Reagent &a = app.reagents()[i], &g = gen.reagents()[i];
            QCOMPARE(g.id, a.id);
            QCOMPARE(g.name, a.name);
            QCOMPARE(g.molar_mass_g_per_mol, a.molar_mass_g_per_mol);
            QCOMPARE(g.assay_fraction, a.assay_fraction);
            QCOMPARE(g.density_g_per_ml, a.density_g_per_ml);
            QCOMPARE(g.ghs_hazards, a.ghs_hazards);
            QCOMPARE(g.spectators.size(), a.spectators.size());
            QCOMPARE(g.systems.size(), a.systems.size());
        }
        QCOMPARE(gen.sit_epsilons().size(), app.sit_epsilons().size());
        for (size_t i = 0; i < app.sit_epsilons().size(); ++i)
            QCOMPARE(gen.sit_epsilons()[i].kg_per_mol, app.sit_epsilons()[i].kg_per_mol);
        QCOMPARE(gen.ion_sizes().size(), app.ion_sizes().size());
        for (size_t i = 0; i < app.ion_sizes().size(); ++i) {
            QCOMPARE(gen.ion_sizes()[i].species, app.ion_sizes()[i].species);
            QCOMPARE(gen.ion_sizes()[i].size_angstrom, app.ion_sizes()[i].size_angstrom);
            QCOMPARE(gen.ion_sizes()[i].b_kg_per_mol, app.ion_sizes()[i].b_kg_per_mol);
        }
        QCOMPARE(gen.complexes().size(), app.complexes().size());
        for (size_t i = 0; i < app.complexes().size(); ++i) {
            QCOMPARE(gen.complexes()[i].species, app.complexes()[i].species);
            QCOMPARE(gen.complexes()[i].formed_from, app.complexes()[i].formed_from);
            QCOMPARE(gen.complexes()[i].log10_k, app.complexes()[i].log10_k);
            QCOMPARE(gen.complexes()[i].models, app.complexes()[i].models);
        }
        QCOMPARE(gen.eluent_solvents().size(), app.eluent_solvents().size());
        for (size_t i = 0; i < app.eluent_solvents().size(); ++i)
            for (double phi : {0.1, 0.3, 0.6})
                QCOMPARE(gen.eluent_solvents()[i].delta(phi), app.eluent_solvents()[i].delta(phi));
    }

    void same_solvents() {
        const chem::SolventLibrary& app = shipped_data().solvents;
        const chem::SolventLibrary& gen = chem::testing::shipped_solvents();
        QCOMPARE(gen.solvents().size(), app.solvents().size());
        for (size_t i = 0; i < app.solvents().size(); ++i) {
            const chem::Solvent &a = app.solvents()[i], &g = gen.solvents()[i];
            QCOMPARE(g.id, a.id);
            QCOMPARE(g.molar_mass_g_per_mol, a.molar_mass_g_per_mol);
            QCOMPARE(g.viscosity_mpa_s, a.viscosity_mpa_s);
            QCOMPARE(g.uv_cutoff_nm, a.uv_cutoff_nm);
            QCOMPARE(g.uv_absorbance.size(), a.uv_absorbance.size());
            for (size_t k = 0; k < a.uv_absorbance.size(); ++k) {
                QCOMPARE(g.uv_absorbance[k].wavelength_nm, a.uv_absorbance[k].wavelength_nm);
                QCOMPARE(g.uv_absorbance[k].absorbance, a.uv_absorbance[k].absorbance);
            }
            QCOMPARE(g.flash_point_c, a.flash_point_c);
            QCOMPARE(g.sources, a.sources);
            for (double t : {5.0, 25.0, 45.0})
                QCOMPARE(g.density_at(t), a.density_at(t));
            for (const chem::Solvent& other : app.solvents())
                QCOMPARE(gen.miscibility(a.id, other.id), app.miscibility(a.id, other.id));
        }
        QCOMPARE(gen.additives().size(), app.additives().size());
        for (size_t i = 0; i < app.additives().size(); ++i) {
            const chem::Additive &a = app.additives()[i], &g = gen.additives()[i];
            QCOMPARE(g.id, a.id);
            QCOMPARE(g.uv.has_value(), a.uv.has_value());
            if (a.uv)
                for (double amount : {0.05, 0.1, 1.0, 10.0})
                    QCOMPARE(g.uv->at(amount).cutoff_nm, a.uv->at(amount).cutoff_nm);
        }
        QCOMPARE(gen.solubility_tables().size(), app.solubility_tables().size());
        for (size_t i = 0; i < app.solubility_tables().size(); ++i) {
            QCOMPARE(gen.solubility_tables()[i].points, app.solubility_tables()[i].points);
            QCOMPARE(gen.solubility_tables()[i].form, app.solubility_tables()[i].form);
            QCOMPARE(gen.solubility_tables()[i].protons_removed,
                     app.solubility_tables()[i].protons_removed);
        }
        QCOMPARE(gen.shelf_lives().size(), app.shelf_lives().size());
        for (size_t i = 0; i < app.shelf_lives().size(); ++i) {
            QVERIFY(gen.shelf_lives()[i].kind == app.shelf_lives()[i].kind);
            QCOMPARE(gen.shelf_lives()[i].hours, app.shelf_lives()[i].hours);
        }
        QCOMPARE(gen.excess_volumes().size(), app.excess_volumes().size());
        for (size_t i = 0; i < app.excess_volumes().size(); ++i)
            QCOMPARE(gen.excess_volumes()[i].at(0.3), app.excess_volumes()[i].at(0.3));
    }

    void same_ph_for_every_reagent() {
        const chem::Library& app = shipped_data().reagents;
        const chem::Library& gen = chem::testing::shipped_library();
        for (size_t i = 0; i < app.reagents().size(); ++i)
            for (auto model : {chem::ActivityModel::davies, chem::ActivityModel::sit}) {
                const double a = chem::solve(app, {{&app.reagents()[i], 0.01}}, 25, model).ph;
                const double g = chem::solve(gen, {{&gen.reagents()[i], 0.01}}, 25, model).ph;
                QCOMPARE(g, a);
            }
    }

    // A solvent's published UV table is read with its rows checked: a row not above the one
    // before, an absorbance of 0 (it is interpolated on a log scale) and a table without its
    // source are refused, each with the path of the field.
    void uv_absorbance_table_checked_data() {
        QTest::addColumn<QString>("change");
        QTest::addColumn<QString>("field");
        QTest::newRow("descending") << "descending"
                                    << "solvents.json: solvents[1].uv_absorbance.points[1]."
                                       "wavelength_nm";
        QTest::newRow("zero") << "zero"
                              << "solvents.json: solvents[1].uv_absorbance.points[0].absorbance";
        QTest::newRow("no source") << "no source"
                                   << "solvents.json: solvents[1].uv_absorbance.source";
        QTest::newRow("empty") << "empty"
                               << "solvents.json: solvents[1].uv_absorbance.points";
    }
    void uv_absorbance_table_checked() {
        QFETCH(QString, change);
        QFETCH(QString, field);
        QFile f(QStringLiteral(SOURCE_DIR "/data/solvents.json"));
        QVERIFY(f.open(QIODevice::ReadOnly));
        QJsonObject doc = QJsonDocument::fromJson(f.readAll()).object();
        QJsonArray solvents = doc["solvents"].toArray();
        QJsonObject acn = solvents[1].toObject();
        QCOMPARE(acn["id"].toString(), QString("acetonitrile"));
        QJsonObject uv = acn["uv_absorbance"].toObject();
        QJsonArray pts = uv["points"].toArray();
        if (change == "descending") {
            QJsonObject p = pts[1].toObject();
            p["wavelength_nm"] = 190;
            pts[1] = p;
        } else if (change == "zero") {
            QJsonObject p = pts[0].toObject();
            p["absorbance"] = 0;
            pts[0] = p;
        } else if (change == "no source") {
            uv.remove("source");
        } else {
            pts = QJsonArray{};
        }
        uv["points"] = pts;
        acn["uv_absorbance"] = uv;
        solvents[1] = acn;
        doc["solvents"] = solvents;
        chem::SolventLibrary lib;
        try {
            phaseplan::load_solvents_json(QJsonDocument(doc).toJson(), "solvents.json", lib);
            QFAIL("the broken table was accepted");
        } catch (const chem::Error& e) {
            QCOMPARE(QString::fromStdString(e.field()), field);
        }
    }

    // A solubility table is read with its fields checked: a species form needs its system and
    // which species it is (≥ 1 proton removed), a system needs a form, a group's forms share one
    // system, fractions lie in 0–1 and appear once, limits are not negative, the basis is one of
    // the two words. Each refusal names the field's path.
    void solubility_table_checked_data() {
        QTest::addColumn<QString>("change");
        QTest::addColumn<QString>("field");
        const QString at = "solvents.json: solubility[0].";
        QTest::newRow("form without system") << "no system" << at + "system";
        QTest::newRow("acid form") << "protons 0" << at + "protons_removed";
        QTest::newRow("system without form") << "no form" << at + "form";
        QTest::newRow("empty form") << "empty form" << at + "form";
        QTest::newRow("two systems") << "two systems"
                                     << "solvents.json: solubility[1].system";
        QTest::newRow("fraction above 1") << "fraction" << at + "points[2].fraction_v";
        QTest::newRow("fraction twice") << "twice" << at + "points";
        QTest::newRow("negative limit") << "negative" << at + "points[1].max_mmol_per_l";
        QTest::newRow("basis") << "basis" << at + "basis";
    }
    void solubility_table_checked() {
        QFETCH(QString, change);
        QFETCH(QString, field);
        QFile f(QStringLiteral(SOURCE_DIR "/data/solvents.json"));
        QVERIFY(f.open(QIODevice::ReadOnly));
        QJsonObject doc = QJsonDocument::fromJson(f.readAll()).object();
        QJsonArray tables = doc["solubility"].toArray();
        QJsonObject t = tables[0].toObject();
        QCOMPARE(t["form"].toString(), QString("dihydrogen-phosphate"));
        QJsonArray pts = t["points"].toArray();
        auto set_point = [&](int i, const char* key, double v) {
            QJsonObject p = pts[i].toObject();
            p[key] = v;
            pts[i] = p;
        };
        if (change == "no system")
            t.remove("system");
        else if (change == "protons 0")
            t["protons_removed"] = 0;
        else if (change == "no form")
            t.remove("form");
        else if (change == "empty form")
            t["form"] = "";
        else if (change == "two systems") {
            QJsonObject u = tables[1].toObject();
            u["system"] = "citrate";
            tables[1] = u;
        } else if (change == "fraction")
            set_point(2, "fraction_v", 1.5);
        else if (change == "twice")
            set_point(1, "fraction_v", 0);
        else if (change == "negative")
            set_point(1, "max_mmol_per_l", -5);
        else
            t["basis"] = "measured";
        t["points"] = pts;
        tables[0] = t;
        doc["solubility"] = tables;
        chem::SolventLibrary lib;
        try {
            phaseplan::load_solvents_json(QJsonDocument(doc).toJson(), "solvents.json", lib);
            QFAIL("the broken table was accepted");
        } catch (const chem::Error& e) {
            QCOMPARE(QString::fromStdString(e.field()), field);
        }
    }

    // A document of the former format (group tables only, no "form") still loads, and its
    // tables are group tables.
    void solubility_group_tables_still_load() {
        QFile f(QStringLiteral(SOURCE_DIR "/data/solvents.json"));
        QVERIFY(f.open(QIODevice::ReadOnly));
        QJsonObject doc = QJsonDocument::fromJson(f.readAll()).object();
        QJsonArray kept;
        for (const QJsonValue v : doc["solubility"].toArray())
            if (!v.toObject().contains("form"))
                kept.append(v);
        QVERIFY(!kept.isEmpty());
        QJsonObject old{
            {"group", "potassium-phosphate"},
            {"organic", "acetonitrile"},
            {"basis", "rule-of-thumb"},
            {"source", "a former group table"},
            {"points", QJsonArray{QJsonObject{{"fraction_v", 0.5}, {"max_mmol_per_l", 50}}}}};
        kept.append(old);
        doc["solubility"] = kept;
        chem::SolventLibrary lib;
        phaseplan::load_solvents_json(QJsonDocument(doc).toJson(), "solvents.json", lib);
        const chem::SolubilityTable* t = lib.solubility("potassium-phosphate", "acetonitrile");
        QVERIFY(t);
        QVERIFY(t->form.empty());
        QCOMPARE(*t->limit_mmol_per_l(0.5), 50.0);
        QVERIFY(lib.solubility_form_tables("potassium-phosphate").empty());
    }
};

QTEST_GUILESS_MAIN(TestShippedLibrary)
#include "tst_shipped_library.moc"
