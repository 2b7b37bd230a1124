// phaseplan-cli as a user runs it: the JSON contract of solve/recipe/reagents and the bad-input
// rule (status 2, one line on stderr naming the field, nothing on stdout).
#include "test_support.h"

#include <QJsonArray>
#include <QJsonDocument>
#include <QTemporaryDir>
#include <QtTest>

#include <cmath>

using phaseplan::testing::run_cli;

class TestCli : public QObject {
    Q_OBJECT
  private slots:
    void badInputIsRejected_data();
    void badInputIsRejected();
    void missingFileAndUnknownCommand();
    void solveEquimolarPhosphateReferenceBuffer();
    void recipeFromFileMatchesStdin();
    void recipeOutputFeedsBackIntoSolve();
    void recipeStatesItsBasis();
    void reagentsListsEveryRequiredId();
};

void TestCli::badInputIsRejected_data() {
    QTest::addColumn<QString>("command");
    QTest::addColumn<QByteArray>("input");
    QTest::addColumn<QString>("field");
    QTest::addColumn<QString>("contains");
    const QJsonObject doc = phaseplan::testing::read_json(TESTS_DATA_DIR "/cli_bad_input.json");
    for (const auto& c : doc["cases"].toArray()) {
        const QJsonObject o = c.toObject();
        QTest::newRow(o["name"].toString().toUtf8().constData())
            << o["command"].toString() << o["input"].toString().toUtf8() << o["field"].toString()
            << o["contains"].toString();
    }
}

void TestCli::badInputIsRejected() {
    QFETCH(QString, command);
    QFETCH(QByteArray, input);
    QFETCH(QString, field);
    QFETCH(QString, contains);
    // An empty document must still reach the parser: send it through a file, not stdin.
    QTemporaryDir dir;
    const QString path = dir.filePath("in.json");
    QFile f(path);
    QVERIFY(f.open(QIODevice::WriteOnly));
    f.write(input);
    f.close();
    const auto r = run_cli({command, path});
    QCOMPARE(r.exit_code, 2);
    QVERIFY2(r.out.isEmpty(), r.out.constData());
    const QString err = QString::fromUtf8(r.err).trimmed();
    QVERIFY2(!err.contains('\n'), qPrintable(err));
    QVERIFY2(err.contains(field + ":"), qPrintable(err));
    if (!contains.isEmpty())
        QVERIFY2(err.contains(contains), qPrintable(err));
}

void TestCli::missingFileAndUnknownCommand() {
    auto r = run_cli({"solve", "/nonexistent/input.json"});
    QCOMPARE(r.exit_code, 2);
    QVERIFY(r.out.isEmpty());
    QVERIFY(r.err.contains("input"));
    r = run_cli({"dissolve", "-"}, "{}");
    QCOMPARE(r.exit_code, 2);
    QVERIFY(r.err.contains("command"));
    r = run_cli({"solve"});
    QCOMPARE(r.exit_code, 2);
}

void TestCli::solveEquimolarPhosphateReferenceBuffer() {
    // 0.025 mol/kg KH2PO4 + 0.025 mol/kg Na2HPO4: pH 6.865 at 25 °C (IUPAC 2002, Buck et al.,
    // Pure Appl. Chem. 74, 2169; NIST SRM 186; from memory).
    const auto r = run_cli({"solve", "-"},
                           R"({"temperature_c": 25, "components": [
                                {"reagent": "potassium-dihydrogen-phosphate", "mol_per_l": 0.025},
                                {"reagent": "disodium-hydrogen-phosphate", "mol_per_l": 0.025}]})");
    QCOMPARE(r.exit_code, 0);
    const QJsonObject out = QJsonDocument::fromJson(r.out).object();
    QVERIFY(std::abs(out["ph"].toDouble() - 6.865) < 0.02);
    QVERIFY(out["ionic_strength_mol_per_l"].toDouble() > 0.09);
    QVERIFY(out["buffer_capacity_mol_per_l"].toDouble() > 0);
    bool found = false;
    for (const auto& s : out["species"].toArray()) {
        const QJsonObject o = s.toObject();
        QVERIFY(o.contains("mol_per_l") && o.contains("activity_coefficient"));
        found |= o["species"].toString() == "HPO4-2";
    }
    QVERIFY(found);
    QVERIFY(out["warnings"].isArray());
}

void TestCli::recipeFromFileMatchesStdin() {
    const QString demo = QStringLiteral(SOURCE_DIR "/data/demo/buffer-phosphate-ph2.5.json");
    QFile f(demo);
    QVERIFY(f.open(QIODevice::ReadOnly));
    const QByteArray bytes = f.readAll();
    const auto from_file = run_cli({"recipe", demo});
    const auto from_stdin = run_cli({"recipe", "-"}, bytes);
    QCOMPARE(from_file.exit_code, 0);
    QCOMPARE(from_file.out, from_stdin.out);
}

void TestCli::recipeOutputFeedsBackIntoSolve() {
    const auto r =
        run_cli({"recipe", "-"},
                R"({"target_ph": 3.0, "temperature_c": 20, "volume_ml": 2000, "route": "mix",
                               "acid": "formic-acid", "base": "ammonium-formate", "concentration_mol_per_l": 0.01})");
    QCOMPARE(r.exit_code, 0);
    const QJsonObject out = QJsonDocument::fromJson(r.out).object();
    const QJsonObject solve_in{{"temperature_c", 20}, {"components", out["composition"]}};
    const auto s = run_cli({"solve", "-"}, QJsonDocument(solve_in).toJson());
    QCOMPARE(s.exit_code, 0);
    QVERIFY(std::abs(QJsonDocument::fromJson(s.out).object()["ph"].toDouble() - 3.0) < 0.005);
}

void TestCli::recipeStatesItsBasis() {
    // An LC-MS buffer as usually written: the salt at 10 mM, brought to pH with its own acid
    // added as supplied. The output says so in words and gives both readings (formate in all,
    // ammonium).
    const auto r = run_cli(
        {"recipe", "-"},
        R"({"target_ph": 3.0, "volume_ml": 500, "route": "titrate", "weigh": "ammonium-formate",
                               "titrant": "formic-acid", "titrant_form": "neat", "concentration_basis": "salt",
                               "concentration_mol_per_l": 0.01})");
    QCOMPARE(r.exit_code, 0);
    const QJsonObject out = QJsonDocument::fromJson(r.out).object();
    QCOMPARE(out["concentration_basis"].toString(), QString("salt"));
    QCOMPARE(out["titrant_form"].toString(), QString("neat"));
    QVERIFY(out["basis"].toObject()["text"].toString().startsWith(
        "10 mmol/L ammonium formate, brought to pH 3.00 with formic acid"));
    QStringList families;
    for (const auto& t : out["totals"].toArray())
        families << t.toObject()["family"].toString();
    QCOMPARE(families, (QStringList{"formate", "ammonium"}));
    for (const auto& i : out["items"].toArray())
        if (i.toObject()["reagent"] == "formic-acid") {
            QCOMPARE(i.toObject()["as"].toString(), QString("titrant, neat"));
            QVERIFY(i.toObject()["volume_ml"].toDouble() > 0 &&
                    i.toObject()["mass_g"].toDouble() > 0);
        }
}

void TestCli::reagentsListsEveryRequiredId() {
    const auto r = run_cli({"reagents"});
    QCOMPARE(r.exit_code, 0);
    QStringList ids;
    for (const auto& x : QJsonDocument::fromJson(r.out).object()["reagents"].toArray())
        ids << x.toObject()["id"].toString();
    for (const char* id : {"potassium-dihydrogen-phosphate",
                           "dipotassium-hydrogen-phosphate",
                           "sodium-dihydrogen-phosphate",
                           "sodium-dihydrogen-phosphate-monohydrate",
                           "sodium-dihydrogen-phosphate-dihydrate",
                           "disodium-hydrogen-phosphate",
                           "disodium-hydrogen-phosphate-dihydrate",
                           "disodium-hydrogen-phosphate-heptahydrate",
                           "disodium-hydrogen-phosphate-dodecahydrate",
                           "phosphoric-acid",
                           "acetic-acid",
                           "sodium-acetate",
                           "sodium-acetate-trihydrate",
                           "ammonium-acetate",
                           "formic-acid",
                           "ammonium-formate",
                           "sodium-formate",
                           "citric-acid",
                           "citric-acid-monohydrate",
                           "trisodium-citrate",
                           "trisodium-citrate-dihydrate",
                           "potassium-dihydrogen-citrate",
                           "potassium-hydrogen-phthalate",
                           "sodium-tetraborate",
                           "sodium-tetraborate-decahydrate",
                           "boric-acid",
                           "sodium-bicarbonate",
                           "sodium-carbonate",
                           "ammonium-bicarbonate",
                           "tris",
                           "tris-hydrochloride",
                           "glycine",
                           "hydrochloric-acid",
                           "sodium-hydroxide",
                           "potassium-hydroxide",
                           "ammonia",
                           "sodium-chloride",
                           "potassium-chloride",
                           "trifluoroacetic-acid",
                           "triethylamine",
                           "mes",
                           "hepes",
                           "mops",
                           "bis-tris",
                           "ammonium-dihydrogen-phosphate",
                           "diammonium-hydrogen-phosphate",
                           "perchloric-acid",
                           "sodium-perchlorate",
                           "sulfuric-acid",
                           "methanesulfonic-acid",
                           "difluoroacetic-acid",
                           "heptafluorobutyric-acid",
                           "hexafluoro-2-propanol",
                           "diisopropylethylamine",
                           "diethylamine",
                           "ammonium-fluoride",
                           "sodium-hexanesulfonate",
                           "sodium-octanesulfonate",
                           "tetrabutylammonium-hydrogen-sulfate"})
        QVERIFY2(ids.contains(id), id);
}

QTEST_GUILESS_MAIN(TestCli)
#include "tst_cli.moc"
