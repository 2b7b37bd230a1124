// phaseplan-cli pressure, transfer, and the pressure in `sequence`, run as a user runs them: the
// contract's fields, the worked transfer example of issue 12, and pressure-limit firing and quiet.
#include "test_support.h"

#include <QJsonArray>
#include <QJsonDocument>
#include <QtTest>

#include <cmath>

using phaseplan::testing::run_cli;
using phaseplan::testing::verify_rejected;

namespace {

QJsonObject run_ok(const QString& command, const QJsonObject& doc) {
    const auto r = run_cli({command, "-"}, QJsonDocument(doc).toJson());
    if (r.exit_code != 0)
        qWarning("%s", r.err.constData());
    return r.exit_code == 0 ? QJsonDocument::fromJson(r.out).object() : QJsonObject{};
}

QJsonObject lines() {
    return QJsonObject{
        {"A",
         QJsonObject{{"name", "water"},
                     {"bottle_ml", 1000},
                     {"parts", QJsonArray{QJsonObject{{"solvent", "water"}, {"fraction_v", 1}}}}}},
        {"B", QJsonObject{
                  {"name", "methanol"},
                  {"bottle_ml", 1000},
                  {"parts", QJsonArray{QJsonObject{{"solvent", "methanol"}, {"fraction_v", 1}}}}}}};
}

QJsonObject method(double flow) {
    return QJsonObject{{"flow_ml_min", flow},
                       {"gradient", QJsonArray{QJsonObject{{"t_min", 0}, {"A", 95}, {"B", 5}},
                                               QJsonObject{{"t_min", 10}, {"A", 5}, {"B", 95}}}},
                       {"run_min", 12},
                       {"equilibration_min", 5}};
}

QJsonArray codes(const QJsonObject& doc) {
    QJsonArray out;
    for (const auto& w : doc["warnings"].toArray())
        out.append(w.toObject()["code"]);
    return out;
}

} // namespace

class TestCliPressure : public QObject {
    Q_OBJECT
  private slots:
    // The fixed contract of `pressure`: trace points with t_min, organic_fraction_v,
    // viscosity_mpa_s, pressure_bar; max_pressure_bar, max_at_t_min, plates_estimate, warnings.
    void pressureContract() {
        const QJsonObject out = run_ok(
            "pressure",
            QJsonObject{{"lines", lines()},
                        {"method", method(1.0)},
                        {"column", QJsonObject{{"length_mm", 150},
                                               {"id_mm", 4.6},
                                               {"particle_um", 5},
                                               {"max_pressure_bar", 400}}},
                        {"instrument", QJsonObject{{"max_pressure_bar", 600}, {"dwell_ml", 1.0}}}});
        QVERIFY(!out.isEmpty());
        const QJsonArray trace = out["trace"].toArray();
        QCOMPARE(trace.size(), 171); // 17 min at 0.1 min
        double peak = 0;
        for (const auto& p : trace) {
            const QJsonObject o = p.toObject();
            for (const char* k : {"t_min", "organic_fraction_v", "viscosity_mpa_s", "pressure_bar"})
                QVERIFY2(o[k].isDouble(), k);
            peak = std::max(peak, o["pressure_bar"].toDouble());
        }
        QCOMPARE(out["max_pressure_bar"].toDouble(), peak);
        QVERIFY(out["max_at_t_min"].toDouble() > 1 && out["max_at_t_min"].toDouble() < 11);
        QCOMPARE(out["plates_estimate"].toDouble(), 9000.0); // 3000 · 15 cm / 5 µm
        QVERIFY(out["warnings"].isArray());
        QCOMPARE(out["limited_by"].toString(), QStringLiteral("column"));
    }

    // The worked example through the CLI: 4.6 × 250 → 2.1 × 50 at 0.2 mL/min, a 10 min gradient
    // becomes 2.08 min; the scaled method feeds `sequence` as it is.
    void transferContract() {
        const QJsonObject out = run_ok(
            "transfer",
            QJsonObject{
                {"method", method(1.0)},
                {"from", QJsonObject{{"length_mm", 250}, {"id_mm", 4.6}, {"particle_um", 5}}},
                {"to", QJsonObject{{"length_mm", 50},
                                   {"id_mm", 2.1},
                                   {"particle_um", 5},
                                   {"flow_ml_min", 0.2},
                                   {"max_pressure_bar", 400}}},
                {"injection_ul", 10},
                {"sequence_injections", 40},
                {"lines", lines()}});
        QVERIFY(!out.isEmpty());
        const QJsonObject m = out["method"].toObject();
        QCOMPARE(m["flow_ml_min"].toDouble(), 0.2);
        QCOMPARE(QString::number(m["gradient"].toArray()[1].toObject()["t_min"].toDouble(), 'f', 2),
                 QStringLiteral("2.08"));
        QVERIFY(std::abs(out["injection_ul"].toDouble() - 0.4168) < 1e-3);
        const QJsonObject solvent = out["solvent_ml_per_injection"].toObject();
        QCOMPARE(solvent["from"].toDouble(), 17.0);
        QVERIFY(solvent["to"].toDouble() < solvent["from"].toDouble());
        QVERIFY(out["saving_fraction"].toDouble() > 0.9);
        QVERIFY(std::abs(out["l_over_dp_change"].toDouble() + 0.8) < 1e-9);
        QCOMPARE(out["within_allowed_adjustment"].toBool(), false);
        QVERIFY(out["pressure"].toObject()["max_pressure_bar"].toDouble() > 0);
        // Straight into sequence.
        const QJsonObject seq =
            run_ok("sequence",
                   QJsonObject{{"lines", lines()},
                               {"methods", QJsonObject{{"moved", m}}},
                               {"sequence",
                                QJsonArray{QJsonObject{{"method", "moved"}, {"injections", 40}}}},
                               {"start", "2026-12-01T18:00:00"}});
        QVERIFY(seq["total_min"].toDouble() > 0);
    }

    // The sequence document takes the column and instrument; each method gains max_pressure_bar
    // and its trace; pressure-limit fires above the lower limit, cautions within 10 %, stays
    // quiet below, and gives the clock time of the first peak.
    void sequencePressureLimit() {
        QJsonObject doc{{"lines", lines()},
                        {"methods", QJsonObject{{"m", method(1.0)}}},
                        {"sequence", QJsonArray{QJsonObject{{"method", "m"}, {"injections", 3}}}},
                        {"start", "2026-12-01T18:00:00"},
                        {"column", QJsonObject{{"ph_min", 2},
                                               {"ph_max", 8},
                                               {"length_mm", 150},
                                               {"id_mm", 4.6},
                                               {"particle_um", 3}}},
                        {"instrument", QJsonObject{{"max_pressure_bar", 1000}}}};
        const QJsonObject free_run = run_ok("sequence", doc);
        const QJsonObject m = free_run["methods"].toObject()["m"].toObject();
        const double peak = m["max_pressure_bar"].toDouble();
        QVERIFY(peak > 50);
        QVERIFY(m["pressure"].toObject()["trace"].toArray().size() > 100);
        QVERIFY(!codes(free_run).contains(QStringLiteral("pressure-limit")));

        QJsonObject column = doc["column"].toObject();
        column["max_pressure_bar"] = peak * 0.9;
        doc["column"] = column;
        const QJsonObject over = run_ok("sequence", doc);
        QJsonObject w;
        for (const auto& x : over["warnings"].toArray())
            if (x.toObject()["code"] == QStringLiteral("pressure-limit"))
                w = x.toObject();
        QCOMPARE(w["severity"].toString(), QStringLiteral("warning"));
        QCOMPARE(w["limited_by"].toString(), QStringLiteral("column"));
        QCOMPARE(w["method"].toString(), QStringLiteral("m"));
        QVERIFY(w["peak_t_min"].isDouble() && w["organic_fraction_v"].isDouble());
        QVERIFY(w["first_peak_at"].toString().startsWith("2026-12-01T18:"));
        QVERIFY2(w["message"].toString().startsWith("Method m peaks at"),
                 qPrintable(w["message"].toString()));
        // A one-method document (pressure) has no method name: "The method peaks at ...".
        const QJsonObject one =
            run_ok("pressure", QJsonObject{{"lines", doc["lines"]},
                                           {"method", doc["methods"].toObject()["m"]},
                                           {"column", column}});
        QString one_message;
        for (const auto& x : one["warnings"].toArray())
            if (x.toObject()["code"] == QStringLiteral("pressure-limit"))
                one_message = x.toObject()["message"].toString();
        QVERIFY2(one_message.startsWith("The method peaks at"), qPrintable(one_message));

        column["max_pressure_bar"] = peak * 1.05;
        doc["column"] = column;
        const QJsonObject near = run_ok("sequence", doc);
        bool caution = false;
        for (const auto& x : near["warnings"].toArray())
            caution |= x.toObject()["code"] == QStringLiteral("pressure-limit") &&
                       x.toObject()["severity"] == QStringLiteral("caution");
        QVERIFY(caution);
        // The column-ph check still reads the same column.
        QCOMPARE(near["methods"].toObject()["m"].toObject()["max_pressure_bar"].toDouble(), peak);
    }

    // A method may carry its own column (the app copies a library column into the method): it
    // wins over the plan's column for that method's pressure; the other methods keep the plan's.
    // Darcy's law (chem/pressure.h): at the same flow, length and composition, ΔP ∝ 1/(d_c² d_p²),
    // so 2.1 mm, 1.7 µm against 4.6 mm, 3 µm is (4.6/2.1)²·(3/1.7)² ≈ 14.9 times the column's
    // pressure (the instrument adds none here).
    void methodOwnColumn() {
        QJsonObject own = method(1.0);
        own["column"] = QJsonObject{{"name", "narrow"},
                                    {"length_mm", 150},
                                    {"id_mm", 2.1},
                                    {"particle_um", 1.7},
                                    {"max_pressure_bar", 1200}};
        QJsonObject doc{
            {"lines", lines()},
            {"methods", QJsonObject{{"plain", method(1.0)}, {"own", own}}},
            {"sequence", QJsonArray{QJsonObject{{"method", "plain"}, {"injections", 1}},
                                    QJsonObject{{"method", "own"}, {"injections", 1}}}},
            {"start", "2026-12-01T18:00:00"},
            {"column", QJsonObject{{"length_mm", 150}, {"id_mm", 4.6}, {"particle_um", 3}}}};
        const QJsonObject out = run_ok("sequence", doc);
        const QJsonObject plain = out["methods"].toObject()["plain"].toObject();
        const QJsonObject mine = out["methods"].toObject()["own"].toObject();
        const double ratio = mine["pressure"].toObject()["max_column_pressure_bar"].toDouble() /
                             plain["pressure"].toObject()["max_column_pressure_bar"].toDouble();
        const double expected = (4.6 / 2.1) * (4.6 / 2.1) * (3 / 1.7) * (3 / 1.7);
        QVERIFY2(std::abs(ratio / expected - 1) < 0.02, qPrintable(QString::number(ratio)));
        QCOMPARE(mine["pressure"].toObject()["limit_bar"].toDouble(), 1200.0);
        QVERIFY(plain["pressure"].toObject()["limit_bar"].isNull());

        // Without a plan column, only the method with its own column has a pressure.
        doc.remove("column");
        const QJsonObject alone = run_ok("sequence", doc);
        QVERIFY(alone["methods"].toObject()["own"].toObject().contains("pressure"));
        QVERIFY(!alone["methods"].toObject()["plain"].toObject().contains("pressure"));

        // A bad field of the method's column is named with its path.
        own["column"] = QJsonObject{{"length_mm", 150}, {"id_mm", 2.1}, {"particle_um", 0.1}};
        doc["methods"] = QJsonObject{{"own", own}};
        doc["sequence"] = QJsonArray{QJsonObject{{"method", "own"}, {"injections", 1}}};
        verify_rejected(run_cli({"sequence", "-"}, QJsonDocument(doc).toJson()),
                        "methods.own.column.particle_um", "0.1");
    }
};

QTEST_GUILESS_MAIN(TestCliPressure)
#include "tst_cli_pressure.moc"
