// The lab's columns (ColumnLibrary, ColumnStore, schema step 9), a method's own column on the
// sequence screen (Plan::methodColumn, setMethodColumn) and the "smaller column" view
// (ColumnTransfer), each on a temporary database without QML.
//
// Outside references:
// - USP <621> Chromatography (harmonised standard, official 1 December 2022), allowed
//   adjustments for gradient elution, and its worked example as quoted in issue 12: a method on
//   4.6 × 250 mm at 1.0 mL/min with a 10 min gradient, moved to 2.1 × 50 mm at 0.2 mL/min, runs
//   its gradient in 2.08 min. Flow rule F₂ = F₁ (d_c2² d_p1)/(d_c1² d_p2), time factor
//   (F₁/F₂)(L₂ d_c2²)/(L₁ d_c1²), injection ∝ L d_c², L/d_p within −25 % to +50 %.
// - The field limits (particle 0.5–50 µm, porosity 0.2–0.9, dimensions > 0) are the ones issue 12
//   sets for bad input; the messages must name the value as typed.
#include "column_library.h"
#include "column_transfer.h"
#include "gui_test_support.h"
#include "plan.h"
#include "storage/database.h"
#include "workspace.h"

#include <QFile>
#include <QJsonArray>
#include <QJsonDocument>
#include <QSqlQuery>
#include <QTemporaryDir>
#include <QTest>

#include <cmath>
#include <limits>
#include <memory>

using namespace phaseplan::gui;
using phaseplan::storage::Database;
using phaseplan::storage::DocumentKind;
using phaseplan::testing::open_workspace;

namespace {

const QString data_dir = QStringLiteral(SOURCE_DIR "/data");
constexpr double no_value = std::numeric_limits<double>::quiet_NaN();

QVariantMap draft(double length, double id, double particle) {
    return QVariantMap{{"id", 0},
                       {"name", "test column"},
                       {"length_mm", length},
                       {"id_mm", id},
                       {"particle_um", particle},
                       {"porosity", no_value},
                       {"max_pressure_bar", no_value},
                       {"ph_min", no_value},
                       {"ph_max", no_value},
                       {"reference_pressure_bar", no_value},
                       {"reference_flow_ml_min", no_value},
                       {"reference_percent_b", no_value}};
}

QVariantMap find(const QVariantList& columns, const QString& name) {
    for (const QVariant& v : columns)
        if (v.toMap().value("name").toString() == name)
            return v.toMap();
    return {};
}

/// A plan of the demo's lines with one method "long" on 4.6 × 250 mm, 5 µm: 1.0 mL/min, a 10 min
/// gradient 5 → 95 % B, run 10 min, 5 min re-equilibration, 40 injections tonight.
void load_worked_example(Plan& plan) {
    QFile f(data_dir + "/demo/overnight-sequence.json");
    QVERIFY(f.open(QIODevice::ReadOnly));
    QJsonObject doc = QJsonDocument::fromJson(f.readAll()).object();
    doc.insert(
        "methods",
        QJsonObject{
            {"long",
             QJsonObject{{"flow_ml_min", 1.0},
                         {"gradient", QJsonArray{QJsonObject{{"t_min", 0}, {"A", 95}, {"B", 5}},
                                                 QJsonObject{{"t_min", 10}, {"A", 5}, {"B", 95}}}},
                         {"run_min", 10},
                         {"equilibration_min", 5},
                         {"column", QJsonObject{{"name", "long C18"},
                                                {"length_mm", 250},
                                                {"id_mm", 4.6},
                                                {"particle_um", 5},
                                                {"max_pressure_bar", 400}}}}}});
    doc.insert("sequence", QJsonArray{QJsonObject{{"method", "long"}, {"injections", 40}}});
    plan.loadJson(doc, "worked example");
    plan.recomputeNow();
}

} // namespace

class TestGuiColumns : public QObject {
    Q_OBJECT
    QTemporaryDir dir_;
    int n_ = 0;
    QString fresh_db() { return dir_.filePath(QStringLiteral("db-%1.sqlite").arg(++n_)); }

  private slots:
    void demo_database_has_columns() {
        auto ws = open_workspace(fresh_db());
        ColumnLibrary lib;
        lib.setWorkspace(ws.get());
        QCOMPARE(lib.columns().size(), 2);
        // The demo plan's column is the library's first demo column, same sizes and limit.
        const QJsonObject plan_column = [] {
            QFile f(data_dir + "/demo/overnight-sequence.json");
            f.open(QIODevice::ReadOnly);
            return QJsonDocument::fromJson(f.readAll()).object().value("column").toObject();
        }();
        const QVariantMap c =
            find(lib.columns(), "C18, 150 x 4.6 mm, 3.5 um (invented demo column)");
        QVERIFY(!c.isEmpty());
        QCOMPARE(c.value("name").toString(), plan_column.value("name").toString());
        for (const char* k : {"length_mm", "id_mm", "particle_um", "max_pressure_bar"})
            QCOMPARE(c.value(k).toDouble(), plan_column.value(k).toDouble());
    }

    void round_trip_through_the_file() {
        const QString path = fresh_db();
        {
            auto ws = open_workspace(path);
            ColumnLibrary lib;
            lib.setWorkspace(ws.get());
            QVariantMap d = draft(100, 3.0, 2.7);
            d["name"] = "Phenyl 100×3.0 mm 2.7 µm, bench 4";
            d["porosity"] = 0.38;
            d["max_pressure_bar"] = 600.0;
            d["ph_min"] = 1.5;
            d["ph_max"] = 10.0;
            d["temperature_c"] = 40.0;
            d["reference_pressure_bar"] = 210.0;
            d["reference_flow_ml_min"] = 0.6;
            d["reference_percent_b"] = 40.0;
            d["reference_temperature_c"] = 35.0;
            QVERIFY2(lib.save(d),
                     qPrintable(QJsonDocument(QJsonObject::fromVariantMap(lib.errors())).toJson()));
            QCOMPARE(lib.columns().size(), 3);
        }
        auto ws = open_workspace(path);
        ColumnLibrary lib;
        lib.setWorkspace(ws.get());
        const QVariantMap c = find(lib.columns(), "Phenyl 100×3.0 mm 2.7 µm, bench 4");
        QVERIFY(!c.isEmpty());
        QCOMPARE(c.value("length_mm").toDouble(), 100.0);
        QCOMPARE(c.value("id_mm").toDouble(), 3.0);
        QCOMPARE(c.value("particle_um").toDouble(), 2.7);
        QCOMPARE(c.value("porosity").toDouble(), 0.38);
        QCOMPARE(c.value("max_pressure_bar").toDouble(), 600.0);
        QCOMPARE(c.value("ph_min").toDouble(), 1.5);
        QCOMPARE(c.value("ph_max").toDouble(), 10.0);
        QCOMPARE(c.value("temperature_c").toDouble(), 40.0);
        QCOMPARE(c.value("reference_pressure_bar").toDouble(), 210.0);
        QCOMPARE(c.value("reference_flow_ml_min").toDouble(), 0.6);
        QCOMPARE(c.value("reference_percent_b").toDouble(), 40.0);
        QCOMPARE(c.value("reference_temperature_c").toDouble(), 35.0);
        // The stored document is the `pressure` command's column object: line A is the rest.
        const QJsonObject ref =
            QJsonObject::fromVariantMap(c.value("document").toMap()).value("reference").toObject();
        QCOMPARE(ref.value("A").toDouble(), 60.0);

        // Edit keeps the row (same id), remove drops it.
        QVariantMap e = c;
        e["max_pressure_bar"] = 400.0;
        QVERIFY(lib.save(e));
        QCOMPARE(lib.columns().size(), 3);
        QCOMPARE(
            find(lib.columns(), c.value("name").toString()).value("max_pressure_bar").toDouble(),
            400.0);
        QVERIFY(lib.remove(c.value("id").toLongLong()));
        QCOMPARE(lib.columns().size(), 2);
    }

    void migrates_a_v8_file() {
        const QString path = fresh_db();
        {
            Database old(path, 8);
            QCOMPARE(old.schema_version(), 8);
            old.save(DocumentKind::method, "kept", QJsonObject{{"flow_ml_min", 1.0}});
            QVERIFY(!old.connection().tables().contains("columns"));
        }
        auto ws = open_workspace(path);
        QCOMPARE(ws->database()->schema_version(), phaseplan::storage::latest_schema_version());
        QVERIFY(ws->database()->load(DocumentKind::method, "kept").has_value());
        ColumnLibrary lib;
        lib.setWorkspace(ws.get());
        QCOMPARE(lib.columns().size(), 0); // the demo is seeded only into a new file
        QVariantMap d = draft(150, 4.6, 5);
        QVERIFY(lib.save(d));
        QCOMPARE(lib.columns().size(), 1);
    }

    void bad_fields_are_each_named_with_their_value() {
        auto ws = open_workspace(fresh_db());
        ColumnLibrary lib;
        lib.setWorkspace(ws.get());
        QVariantMap d = draft(-5, 0, 0.1);
        d["porosity"] = 0.95;
        d["ph_min"] = 9.0;
        d["ph_max"] = 3.0;
        QVERIFY(!lib.save(d));
        const QVariantMap e = lib.errors();
        QVERIFY2(e.value("length_mm").toString().contains("-5"),
                 qPrintable(e.value("length_mm").toString()));
        QVERIFY2(e.value("id_mm").toString().contains("0"),
                 qPrintable(e.value("id_mm").toString()));
        QVERIFY2(e.value("particle_um").toString().contains("0.1") &&
                     e.value("particle_um").toString().contains("0.5"),
                 qPrintable(e.value("particle_um").toString()));
        QVERIFY2(e.value("porosity").toString().contains("0.95"),
                 qPrintable(e.value("porosity").toString()));
        QVERIFY2(e.value("ph_max").toString().contains("3"),
                 qPrintable(e.value("ph_max").toString()));
        QCOMPARE(lib.columns().size(), 2); // nothing saved

        // A particle size above 50 µm, a name missing or taken, a reference without its flow.
        QVariantMap d2 = draft(150, 4.6, 60);
        d2["name"] = "  ";
        QVERIFY(!lib.save(d2));
        QVERIFY(lib.errors().contains("particle_um"));
        QVERIFY(lib.errors().value("particle_um").toString().contains("60"));
        QVERIFY(lib.errors().contains("name"));
        QVariantMap d3 = draft(150, 4.6, 5);
        d3["name"] = "C18, 50 x 2.1 mm, 1.7 um (invented demo column)";
        QVERIFY(!lib.save(d3));
        // name_taken_error (storage/versioning.h): who saved that name, and what to do.
        QVERIFY2(lib.errors().value("name").toString().contains("was saved by") &&
                     lib.errors().value("name").toString().contains("choose another name"),
                 qPrintable(lib.errors().value("name").toString()));
        QVariantMap d4 = draft(150, 4.6, 5);
        d4["reference_pressure_bar"] = 150.0;
        QVERIFY(!lib.save(d4));
        QVERIFY2(lib.errors().contains("reference.flow_ml_min"),
                 qPrintable(lib.errors().keys().join(",")));
    }

    void rows_over_the_limits_are_not_read_back() {
        const QString path = fresh_db();
        {
            auto ws = open_workspace(path);
            // Written behind the app's back: a 300-character name and a column that no longer
            // passes the checks (particle 0.1 µm).
            ws->database()->exec("INSERT INTO columns (name, document, created_at, updated_at) "
                                 "VALUES (?, ?, 'x', 'x')",
                                 {QString(300, QChar('n')),
                                  R"({"length_mm": 150, "id_mm": 4.6, "particle_um": 5})"});
            ws->database()->exec(
                "INSERT INTO columns (name, document, created_at, updated_at) VALUES (?, ?, 'x', "
                "'x')",
                {"broken", R"({"length_mm": 150, "id_mm": 4.6, "particle_um": 0.1})"});
        }
        auto ws = open_workspace(path);
        // The long name is set aside at open and named on the banner.
        QVERIFY2(ws->storageNotice().contains("columns"), qPrintable(ws->storageNotice()));
        ColumnLibrary lib;
        lib.setWorkspace(ws.get());
        QCOMPARE(lib.columns().size(), 2);
        QVERIFY2(lib.skippedText().contains("broken") && lib.skippedText().contains("particle_um"),
                 qPrintable(lib.skippedText()));
    }

    void a_method_keeps_its_copy_of_the_column() {
        const QString path = fresh_db();
        {
            auto ws = open_workspace(path);
            ColumnLibrary lib;
            lib.setWorkspace(ws.get());
            Plan plan;
            plan.setRestore(true);
            plan.setWorkspace(ws.get());
            plan.recomputeNow();
            const double before = plan.methodConditions("assay").value("maxBar").toDouble();
            QVERIFY(before > 0);
            QVERIFY(!plan.methodColumn("assay").value("own").toBool());
            const QString small = "C18, 50 x 2.1 mm, 1.7 um (invented demo column)";
            plan.setMethodColumn("assay", lib.document(small));
            plan.recomputeNow();
            QVERIFY(plan.valid());
            QCOMPARE(plan.methodColumn("assay").value("name").toString(), small);
            // The method's own column drives its pressure: 1.2 mL/min through 1.7 µm, 2.1 mm
            // (Darcy: ΔP ∝ F L / (d_c² d_p²)) is far above the 4.6 mm column's.
            const double after = plan.methodConditions("assay").value("maxBar").toDouble();
            QVERIFY2(after > 3 * before, qPrintable(QString("%1 vs %2").arg(after).arg(before)));
            // Other methods keep the plan's column.
            QVERIFY(!plan.methodColumn("wash").value("own").toBool());
            QCOMPARE(plan.saveAs("with small column"), QString());
            // The library row goes; the saved plan and method keep the copy.
            QVERIFY(lib.remove(find(lib.columns(), small).value("id").toLongLong()));
        }
        auto ws = open_workspace(path);
        const auto method = ws->database()->load(DocumentKind::method, "assay");
        QVERIFY(method.has_value());
        QCOMPARE(method->value("column").toObject().value("particle_um").toDouble(), 1.7);
        Plan plan;
        plan.setWorkspace(ws.get());
        QVERIFY(plan.loadSaved("with small column"));
        plan.recomputeNow();
        QVERIFY(plan.valid());
        QCOMPARE(plan.methodColumn("assay").value("document").toMap().value("id_mm").toDouble(),
                 2.1);
        // Back to the plan's column.
        plan.setMethodColumn("assay", {});
        QVERIFY(!plan.method("assay").contains("column"));
    }

    void smaller_column_matches_the_usp_worked_example() {
        auto ws = open_workspace(fresh_db());
        Plan plan;
        plan.setWorkspace(ws.get());
        load_worked_example(plan);
        QVERIFY2(plan.valid(), qPrintable(plan.errorMessage()));
        ColumnTransfer move;
        move.setPlan(&plan);
        move.setMethod("long");
        move.setInjectionUl(10);
        move.setTarget(QVariantMap{{"length_mm", 50}, {"id_mm", 2.1}, {"particle_um", 5}});
        move.setTargetFlowMlMin(0.2);
        QVERIFY2(move.valid(), qPrintable(move.problem() + move.errors().keys().join(",")));
        const QVariantMap r = move.result();
        // USP <621> (harmonised 2022) worked example: the 10 min gradient runs in 2.08 min.
        const QVariantList rows = r.value("rows").toList();
        QCOMPARE(rows.size(), 2);
        QCOMPARE(std::round(rows.back().toMap().value("toMin").toDouble() * 100) / 100, 2.08);
        // The same from the standard's formulas by hand: k = (1.0/0.2)(50·2.1²)/(250·4.6²).
        const double k = (1.0 / 0.2) * (50 * 2.1 * 2.1) / (250 * 4.6 * 4.6);
        QVERIFY(std::abs(r.value("timeFactor").toDouble() - k) < 1e-9);
        QCOMPARE(r.value("flowToMlMin").toDouble(), 0.2);
        // Flow by the rule (USP <621>): 1.0 · 2.1²/4.6² = 0.2084 mL/min.
        QVERIFY(std::abs(r.value("scaledFlowMlMin").toDouble() - 2.1 * 2.1 / (4.6 * 4.6)) < 1e-9);
        // Injection ∝ L·d_c² (USP <621>): 10 µL · (50·2.1²)/(250·4.6²) = 0.417 µL.
        QVERIFY(std::abs(r.value("injectionToUl").toDouble() -
                         10 * (50 * 2.1 * 2.1) / (250 * 4.6 * 4.6)) < 1e-9);
        // Solvent per injection = flow × (run + re-equilibration), both scaled by k.
        QVERIFY(std::abs(r.value("solventFromMl").toDouble() - 1.0 * 15) < 1e-9);
        QVERIFY(std::abs(r.value("solventToMl").toDouble() - 0.2 * 15 * k) < 1e-9);
        QVERIFY(std::abs(r.value("savingFraction").toDouble() - (1 - 0.2 * k / 1.0)) < 1e-9);
        // Per night: tonight's 40 injections of the method.
        QCOMPARE(r.value("nightInjections").toInt(), 40);
        QVERIFY(std::abs(r.value("nightFromMl").toDouble() - 40 * 15.0) < 1e-6);
        QVERIFY(std::abs(r.value("nightSavingMl").toDouble() - 40 * (15.0 - 0.2 * 15 * k)) < 1e-6);
        // L/d_p: (50/5)/(250/5) − 1 = −80 %, outside −25 %…+50 % (USP <621>).
        QVERIFY(std::abs(r.value("lOverDpChange").toDouble() + 0.8) < 1e-9);
        QVERIFY(!r.value("withinAllowed").toBool());
        // The pressure on the new column comes with the pump's limit (600 bar, the demo HPLC-07).
        QVERIFY(r.value("hasPressure").toBool());
        QVERIFY(r.value("maxBar").toDouble() > 0);
        QCOMPARE(r.value("limitBar").toDouble(), 600.0);
        // The demo instrument's 1.1 mL dwell on both sides: the hold (V_D/F₁)·k − V_D/F₂ =
        // 1.1·k − 1.1/0.2 is negative, so no hold and a caution (chem/transfer.h).
        QCOMPARE(r.value("holdAddedMin").toDouble(), 0.0);
        QVERIFY(r.value("warnings").toStringList().join(" ").contains("dwell volume"));

        // 5 µm → 1.7 µm at the same 2.1 × 50 mm: flow by the rule 1.0·(2.1²/4.6²)·(5/1.7)
        // (USP <621>, constant reduced velocity), L/d_p (50/1.7)/(250/5) − 1 = −41 %.
        move.setTargetFlowMlMin(no_value);
        move.setTarget(QVariantMap{{"length_mm", 50}, {"id_mm", 2.1}, {"particle_um", 1.7}});
        QVERIFY(move.valid());
        QVERIFY(std::abs(move.result().value("flowToMlMin").toDouble() -
                         (2.1 * 2.1) / (4.6 * 4.6) * 5 / 1.7) < 1e-9);
        QVERIFY(std::abs(move.result().value("lOverDpChange").toDouble() -
                         ((50 / 1.7) / (250 / 5.0) - 1)) < 1e-9);

        // One touch: the new method, with its column copied in.
        const QString name = move.result().value("defaultName").toString();
        QVERIFY(name.contains("long"));
        QCOMPARE(move.addAsMethod(name), QString());
        QVERIFY(plan.methodNames().contains(name));
        const QJsonObject added = plan.method(name);
        QCOMPARE(added.value("column").toObject().value("particle_um").toDouble(), 1.7);
        // Added as a pump takes it: flow to 0.001 mL/min (0.613), times to 0.01 min (common
        // practice, no source), so the method editor shows what is saved.
        const double exact_flow = (2.1 * 2.1) / (4.6 * 4.6) * 5 / 1.7;
        QVERIFY(std::abs(added.value("flow_ml_min").toDouble() -
                         std::round(exact_flow * 1000) / 1000) < 1e-12);
        double previous = -1;
        for (const QJsonValue& row : added.value("gradient").toArray()) {
            const double t = row.toObject().value("t_min").toDouble();
            QVERIFY2(std::abs(t * 100 - std::round(t * 100)) < 1e-6,
                     qPrintable(QString::number(t)));
            QVERIFY(t > previous);
            previous = t;
        }
        plan.recomputeNow();
        QVERIFY2(plan.valid(), qPrintable(plan.errorMessage()));
        QVERIFY(!move.addAsMethod(name).isEmpty()); // the name is taken now
        QVERIFY(!move.addAsMethod("  ").isEmpty());
    }

    void smaller_column_names_the_bad_field() {
        auto ws = open_workspace(fresh_db());
        Plan plan;
        plan.setWorkspace(ws.get());
        load_worked_example(plan);
        ColumnTransfer move;
        move.setPlan(&plan);
        move.setMethod("long");
        move.setTarget(QVariantMap{{"length_mm", 50}, {"id_mm", 2.1}, {"particle_um", 0.1}});
        QVERIFY(!move.valid());
        QVERIFY(move.result().value("fromText").toString().contains("250"));
        QVERIFY2(move.errors().value("particle_um").toString().contains("0.1"),
                 qPrintable(move.errors().keys().join(",")));
        move.setTarget(QVariantMap{{"length_mm", 50}, {"id_mm", 0}, {"particle_um", 1.7}});
        QVERIFY(move.errors().contains("id_mm"));
        move.setTarget(QVariantMap{{"length_mm", 50}, {"id_mm", 2.1}, {"particle_um", 1.7}});
        move.setTargetFlowMlMin(0);
        QVERIFY2(move.errors().contains("flow_ml_min"), qPrintable(move.errors().keys().join(",")));
        // A method without a column with its dimensions cannot be moved, and says so.
        move.setTargetFlowMlMin(no_value);
        plan.setMethodColumn("long", {});
        plan.setMethod("long", [&] {
            QJsonObject m = plan.method("long");
            m.remove("column");
            return m;
        }());
        QJsonObject doc = plan.json();
        doc.remove("column");
        plan.loadJson(doc, "no column");
        move.recompute();
        QVERIFY(!move.valid());
        QVERIFY2(move.problem().contains("long"), qPrintable(move.problem()));
    }
};

QTEST_MAIN(TestGuiColumns)
#include "tst_gui_columns.moc"
