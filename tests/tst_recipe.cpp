// The recipe designer: amounts against hand calculation with published molar masses, round trips
// through solve(), warnings and errors.
#include "chem/error.h"
#include "chem/recipe.h"
#include "chem/units.h"
#include "chem/water.h"
#include "core/chem_json.h"
#include "core/commands.h"
#include "test_support.h"

#include <QJsonArray>
#include <QRegularExpression>
#include <QtTest>

#include <cmath>

using phaseplan::testing::shipped_data;

namespace {
const chem::Library& lib() { return shipped_data().reagents; }

QJsonObject recipe(const QJsonObject& in) {
    return phaseplan::command_recipe(shipped_data(), in, {});
}

bool has_warning(const QJsonObject& out, const QString& code) {
    for (const auto& w : out["warnings"].toArray())
        if (w.toObject()["code"].toString() == code) return true;
    return false;
}

QJsonObject item(const QJsonObject& out, const QString& reagent) {
    for (const auto& i : out["items"].toArray())
        if (i.toObject()["reagent"].toString() == reagent) return i.toObject();
    return {};
}
} // namespace

class TestRecipe : public QObject {
    Q_OBJECT
private slots:
    void roundTripLandsOnTarget_data();
    void roundTripLandsOnTarget();
    void massesMatchHandCalculation();
    void liquidVolumeFromAssayAndDensity();
    void ionicStrengthTargetIsMet();
    void titrantVolumeMatchesHandCalculation();
    void stocksRouteVolumes();
    void warnings();
    void unreachableTargetIsAnError_data();
    void unreachableTargetIsAnError();
    void cautionsDeferToSdsAndLocalRules();
};

void TestRecipe::roundTripLandsOnTarget_data() {
    QTest::addColumn<QJsonObject>("request");
    auto mix = [](double ph, const char* a, const char* b, double c, double t = 25) {
        return QJsonObject{{"target_ph", ph}, {"temperature_c", t}, {"volume_ml", 1000},
                           {"route", "mix"}, {"acid", a}, {"base", b}, {"concentration_mol_per_l", c}};
    };
    QTest::newRow("formate pH 3.2") << mix(3.2, "formic-acid", "ammonium-formate", 0.01);
    QTest::newRow("acetate pH 4.8") << mix(4.8, "acetic-acid", "sodium-acetate", 0.02);
    QTest::newRow("acetate trihydrate pH 5.5 at 40 C")
        << mix(5.5, "acetic-acid", "sodium-acetate-trihydrate", 0.05, 40);
    QTest::newRow("phosphate hydrates pH 7.0")
        << mix(7.0, "sodium-dihydrogen-phosphate-monohydrate", "disodium-hydrogen-phosphate-heptahydrate", 0.025);
    QTest::newRow("phosphate pH 2.5") << mix(2.5, "phosphoric-acid", "potassium-dihydrogen-phosphate", 0.02);
    QTest::newRow("phosphate pH 6.8 at 5 C")
        << mix(6.8, "potassium-dihydrogen-phosphate", "dipotassium-hydrogen-phosphate", 0.05, 5);
    QTest::newRow("citrate pH 4.0") << mix(4.0, "citric-acid-monohydrate", "trisodium-citrate-dihydrate", 0.02);
    QTest::newRow("carbonate pH 10") << mix(10.0, "sodium-bicarbonate", "sodium-carbonate", 0.05);
    QTest::newRow("borate pH 8.8") << mix(8.8, "boric-acid", "sodium-tetraborate-decahydrate", 0.02);
    QTest::newRow("tris pH 7.5 at 37 C") << mix(7.5, "tris-hydrochloride", "tris", 0.05, 37);
    QTest::newRow("ammonium acetate + acetic acid pH 4.5") << mix(4.5, "acetic-acid", "ammonium-acetate", 0.01);
    QTest::newRow("ammonium bicarbonate + ammonia pH 9.5") << mix(9.5, "ammonium-bicarbonate", "ammonia", 0.01);
    QJsonObject ionic = mix(6.0, "sodium-dihydrogen-phosphate-dihydrate", "disodium-hydrogen-phosphate-dodecahydrate", 0.0);
    ionic.remove("concentration_mol_per_l");
    ionic["ionic_strength_mol_per_l"] = 0.05;
    QTest::newRow("phosphate at I = 0.05") << ionic;
    auto titrate = [](double ph, const char* w, const char* t, double m, double c, double temp = 25) {
        return QJsonObject{{"target_ph", ph}, {"temperature_c", temp}, {"volume_ml", 500},
                           {"route", "titrate"}, {"weigh", w}, {"titrant", t},
                           {"titrant_mol_per_l", m}, {"concentration_mol_per_l", c}};
    };
    QTest::newRow("tris with HCl pH 8.0") << titrate(8.0, "tris", "hydrochloric-acid", 1.0, 0.05);
    QTest::newRow("KH2PO4 with KOH pH 7.2 at 30 C")
        << titrate(7.2, "potassium-dihydrogen-phosphate", "potassium-hydroxide", 1.0, 0.05, 30);
    QTest::newRow("acetic acid with NaOH pH 5.0") << titrate(5.0, "acetic-acid", "sodium-hydroxide", 2.0, 0.1);
    QTest::newRow("glycine with NaOH pH 9.5") << titrate(9.5, "glycine", "sodium-hydroxide", 1.0, 0.05);
    QTest::newRow("NaH2PO4 with H3PO4 pH 2.5")
        << titrate(2.5, "sodium-dihydrogen-phosphate", "phosphoric-acid", 1.0, 0.02);
    QTest::newRow("ammonium formate with formic acid pH 3.0")
        << titrate(3.0, "ammonium-formate", "formic-acid", 1.0, 0.01);
    QTest::newRow("stocks phosphate pH 7.4")
        << QJsonObject{{"target_ph", 7.4}, {"volume_ml", 1000}, {"route", "stocks"},
                       {"acid", "sodium-dihydrogen-phosphate"}, {"base", "disodium-hydrogen-phosphate"},
                       {"acid_stock_mol_per_l", 0.2}, {"base_stock_mol_per_l", 0.2},
                       {"concentration_mol_per_l", 0.05}};
}

void TestRecipe::roundTripLandsOnTarget() {
    // Property: every recipe fed back into solve lands within 0.005 of its target.
    QFETCH(QJsonObject, request);
    const QJsonObject out = recipe(request);
    const QJsonObject solve_in{{"temperature_c", request["temperature_c"].toDouble(25)},
                               {"components", out["composition"]}};
    const QJsonObject solved = phaseplan::command_solve(shipped_data(), solve_in, {});
    const double target = request["target_ph"].toDouble();
    QVERIFY2(std::abs(solved["ph"].toDouble() - target) <= 0.005,
             qPrintable(QString::number(solved["ph"].toDouble(), 'f', 4)));
    QVERIFY(std::abs(out["ph"].toDouble() - target) <= 0.005);
    QVERIFY(out["steps"].toArray().size() >= 4);
    for (const auto& i : out["items"].toArray()) {
        const QJsonObject o = i.toObject();
        QVERIFY(o.contains("mass_g") || o.contains("volume_ml"));
        if (o.contains("mass_g")) QVERIFY(o["mass_g"].toDouble() > 0);
        if (o.contains("volume_ml")) QVERIFY(o["volume_ml"].toDouble() > 0);
    }
}

void TestRecipe::massesMatchHandCalculation() {
    // 1000 mL of 25 mmol/L phosphate pH 7.0 from NaH2PO4·H2O + Na2HPO4·7H2O. Molar masses
    // 137.99 and 268.07 g/mol (CRC Handbook of Chemistry and Physics, physical constants of
    // inorganic compounds, from memory). mass = c · V · M.
    const QJsonObject out = recipe({{"target_ph", 7.0}, {"volume_ml", 1000}, {"route", "mix"},
                                    {"acid", "sodium-dihydrogen-phosphate-monohydrate"},
                                    {"base", "disodium-hydrogen-phosphate-heptahydrate"},
                                    {"concentration_mol_per_l", 0.025}});
    const QJsonObject a = item(out, "sodium-dihydrogen-phosphate-monohydrate");
    const QJsonObject b = item(out, "disodium-hydrogen-phosphate-heptahydrate");
    QCOMPARE(a["as"].toString(), QString("solid"));
    QVERIFY(std::abs(a["mass_g"].toDouble() - a["mol_per_l"].toDouble() * 1.0 * 137.99) < 0.002);
    QVERIFY(std::abs(b["mass_g"].toDouble() - b["mol_per_l"].toDouble() * 1.0 * 268.07) < 0.002);
    QVERIFY(std::abs(a["mol_per_l"].toDouble() + b["mol_per_l"].toDouble() - 0.025) < 1e-12);
    // Purity override: 98 % material needs 1/0.98 as much.
    QJsonObject req{{"target_ph", 7.0}, {"volume_ml", 1000}, {"route", "mix"},
                    {"acid", "sodium-dihydrogen-phosphate-monohydrate"},
                    {"base", "disodium-hydrogen-phosphate-heptahydrate"},
                    {"concentration_mol_per_l", 0.025},
                    {"purity_percent", QJsonObject{{"disodium-hydrogen-phosphate-heptahydrate", 98}}}};
    const QJsonObject impure = item(recipe(req), "disodium-hydrogen-phosphate-heptahydrate");
    QVERIFY(std::abs(impure["mass_g"].toDouble() - b["mass_g"].toDouble() / 0.98) < 1e-9);
}

void TestRecipe::liquidVolumeFromAssayAndDensity() {
    // Formic acid as supplied: the library's assay and density; the volume must equal
    // mol · M / (assay · density) with M = 46.03 g/mol (CRC Handbook, from memory).
    const QJsonObject out = recipe({{"target_ph", 3.5}, {"volume_ml", 2000}, {"route", "mix"},
                                    {"acid", "formic-acid"}, {"base", "ammonium-formate"},
                                    {"concentration_mol_per_l", 0.01}});
    const QJsonObject f = item(out, "formic-acid");
    const chem::Reagent& r = lib().reagent("formic-acid");
    QCOMPARE(f["as"].toString(), QString("liquid"));
    const double mol = f["mol_per_l"].toDouble() * 2.0;
    const double expected_ml = mol * 46.03 / (r.assay_fraction * r.density_g_per_ml);
    QVERIFY2(std::abs(f["volume_ml"].toDouble() - expected_ml) < 1e-3 * expected_ml,
             qPrintable(QString::number(f["volume_ml"].toDouble())));
}

void TestRecipe::ionicStrengthTargetIsMet() {
    for (double target : {0.01, 0.05, 0.2}) {
        const QJsonObject out = recipe({{"target_ph", 4.6}, {"volume_ml", 1000}, {"route", "mix"},
                                        {"acid", "acetic-acid"}, {"base", "sodium-acetate"},
                                        {"ionic_strength_mol_per_l", target}});
        QVERIFY(std::abs(out["ionic_strength_mol_per_l"].toDouble() - target) < 1e-6 * target + 1e-9);
        QVERIFY(std::abs(out["ph"].toDouble() - 4.6) < 0.005);
    }
}

void TestRecipe::titrantVolumeMatchesHandCalculation() {
    // 0.05 mol/L tris, 1000 mL, titrated with 1 mol/L HCl to pH 8.07 at 25 °C.
    // Hand calculation (Henderson–Hasselbalch with Davies; tris pKa 8.072, Goldberg et al. 2002,
    // from memory): with x mol/L HCl, [TrisH+] = x, [Tris] = 0.05 − x, I = x, and
    // pH = pKa + log10((0.05 − x)/x) − log10 γ(+1) since γ(Tris) = 1.
    // First guess I = 0.025: log10 γ = −0.511·(0.1581/1.1581 − 0.0075) = −0.066,
    //   log10((0.05 − x)/x) = 8.07 − 8.072 − 0.066 = −0.068 → x = 0.0270.
    // Again at I = 0.0270: log10 γ = −0.511·(0.1643/1.1643 − 0.0081) = −0.068,
    //   log10((0.05 − x)/x) = −0.070 → x = 0.05/1.851 = 0.0270 mol/L → 27.0 mL of 1 mol/L HCl.
    const QJsonObject out = recipe({{"target_ph", 8.07}, {"volume_ml", 1000}, {"route", "titrate"},
                                    {"weigh", "tris"}, {"titrant", "hydrochloric-acid"},
                                    {"titrant_mol_per_l", 1.0}, {"concentration_mol_per_l", 0.05}});
    const double ml = item(out, "hydrochloric-acid")["volume_ml"].toDouble();
    QVERIFY2(std::abs(ml - 27.0) < 0.2, qPrintable(QString::number(ml)));
    // Tris mass: 0.05 mol · 121.14 g/mol (CRC Handbook, from memory) = 6.057 g.
    QVERIFY(std::abs(item(out, "tris")["mass_g"].toDouble() - 6.057) < 0.003);
}

void TestRecipe::stocksRouteVolumes() {
    const QJsonObject out = recipe({{"target_ph", 7.2}, {"volume_ml", 500}, {"route", "stocks"},
                                    {"acid", "potassium-dihydrogen-phosphate"},
                                    {"base", "dipotassium-hydrogen-phosphate"},
                                    {"acid_stock_mol_per_l", 0.5}, {"base_stock_mol_per_l", 1.0},
                                    {"concentration_mol_per_l", 0.1}});
    const QJsonObject a = item(out, "potassium-dihydrogen-phosphate");
    const QJsonObject b = item(out, "dipotassium-hydrogen-phosphate");
    // volume = c · V / stock molarity.
    QVERIFY(std::abs(a["volume_ml"].toDouble() - a["mol_per_l"].toDouble() * 500 / 0.5) < 1e-9);
    QVERIFY(std::abs(b["volume_ml"].toDouble() - b["mol_per_l"].toDouble() * 500 / 1.0) < 1e-9);
    // Too dilute stocks cannot fit in the flask.
    try {
        recipe({{"target_ph", 7.2}, {"volume_ml", 500}, {"route", "stocks"},
                {"acid", "potassium-dihydrogen-phosphate"}, {"base", "dipotassium-hydrogen-phosphate"},
                {"acid_stock_mol_per_l", 0.05}, {"base_stock_mol_per_l", 0.05},
                {"concentration_mol_per_l", 0.1}});
        QFAIL("dilute stocks accepted");
    } catch (const chem::Error& e) {
        QVERIFY(QString::fromStdString(e.field()).endsWith("_stock_mol_per_l"));
    }
}

void TestRecipe::warnings() {
    // Outside pKa ± 1 (phosphate pKa 2.15 and 7.20; pH 4.4 is over 2 units from both).
    QVERIFY(has_warning(recipe({{"target_ph", 4.4}, {"route", "mix"}, {"acid", "phosphoric-acid"},
                                {"base", "potassium-dihydrogen-phosphate"}, {"concentration_mol_per_l", 0.05}}),
                        "ph-outside-pka-range"));
    QVERIFY(!has_warning(recipe({{"target_ph", 2.5}, {"route", "mix"}, {"acid", "phosphoric-acid"},
                                 {"base", "potassium-dihydrogen-phosphate"}, {"concentration_mol_per_l", 0.05}}),
                         "ph-outside-pka-range"));
    // Low buffer capacity: 1 mmol/L acetate at its pKa has β ≈ ln10 · 0.001/4 = 0.6 mmol/L/pH.
    QVERIFY(has_warning(recipe({{"target_ph", 4.76}, {"route", "mix"}, {"acid", "acetic-acid"},
                                {"base", "sodium-acetate"}, {"concentration_mol_per_l", 0.001}}),
                        "low-buffer-capacity"));
    QVERIFY(!has_warning(recipe({{"target_ph", 4.76}, {"route", "mix"}, {"acid", "acetic-acid"},
                                 {"base", "sodium-acetate"}, {"concentration_mol_per_l", 0.05}}),
                         "low-buffer-capacity"));
    // Below a balance's reach: 10 mL of 1 mmol/L acetate needs under 1 mg of sodium acetate.
    QVERIFY(has_warning(recipe({{"target_ph", 4.76}, {"volume_ml", 10}, {"route", "mix"}, {"acid", "acetic-acid"},
                                {"base", "sodium-acetate"}, {"concentration_mol_per_l", 0.001}}),
                        "small-amount"));
    QVERIFY(!has_warning(recipe({{"target_ph", 4.76}, {"volume_ml", 1000}, {"route", "mix"}, {"acid", "acetic-acid"},
                                 {"base", "sodium-acetate"}, {"concentration_mol_per_l", 0.05}}),
                         "small-amount"));
}

void TestRecipe::unreachableTargetIsAnError_data() {
    QTest::addColumn<QJsonObject>("request");
    QTest::addColumn<QString>("field");
    QTest::newRow("pH 9 from acetate")
        << QJsonObject{{"target_ph", 9.0}, {"route", "mix"}, {"acid", "acetic-acid"},
                       {"base", "sodium-acetate"}, {"concentration_mol_per_l", 0.02}}
        << "target_ph";
    QTest::newRow("base titrant cannot lower pH")
        << QJsonObject{{"target_ph", 3.0}, {"route", "titrate"}, {"weigh", "potassium-dihydrogen-phosphate"},
                       {"titrant", "sodium-hydroxide"}, {"titrant_mol_per_l", 1.0}, {"concentration_mol_per_l", 0.05}}
        << "target_ph";
    QTest::newRow("swapped acid and base")
        << QJsonObject{{"target_ph", 7.0}, {"route", "mix"}, {"acid", "disodium-hydrogen-phosphate"},
                       {"base", "sodium-dihydrogen-phosphate"}, {"concentration_mol_per_l", 0.02}}
        << "base";
    QTest::newRow("not a conjugate pair")
        << QJsonObject{{"target_ph", 5.0}, {"route", "mix"}, {"acid", "acetic-acid"},
                       {"base", "disodium-hydrogen-phosphate"}, {"concentration_mol_per_l", 0.02}}
        << "base";
    QTest::newRow("both concentration and ionic strength")
        << QJsonObject{{"target_ph", 5.0}, {"route", "mix"}, {"acid", "acetic-acid"}, {"base", "sodium-acetate"},
                       {"concentration_mol_per_l", 0.02}, {"ionic_strength_mol_per_l", 0.02}}
        << "concentration_mol_per_l";
}

void TestRecipe::unreachableTargetIsAnError() {
    QFETCH(QJsonObject, request);
    QFETCH(QString, field);
    try {
        recipe(request);
        QFAIL("no error");
    } catch (const chem::Error& e) {
        QCOMPARE(QString::fromStdString(e.field()), field);
        QVERIFY(!e.message().empty());
    }
}

void TestRecipe::cautionsDeferToSdsAndLocalRules() {
    const QJsonObject out = recipe({{"target_ph", 2.5}, {"route", "mix"}, {"acid", "phosphoric-acid"},
                                    {"base", "potassium-dihydrogen-phosphate"}, {"concentration_mol_per_l", 0.02}});
    QString all;
    for (const auto& c : out["cautions"].toArray()) all += c.toString() + "\n";
    QVERIFY(all.contains("H314"));
    QVERIFY(all.contains("safety data sheet"));
    QVERIFY(all.contains("rules and licensed practice"));
    QVERIFY(all.contains("never water to it"));
    // Never call a preparation safe.
    QString everything = all;
    for (const auto& s : out["steps"].toArray()) everything += s.toString();
    QVERIFY(!everything.contains(QRegularExpression("\\bsafe\\b", QRegularExpression::CaseInsensitiveOption)));
}

QTEST_GUILESS_MAIN(TestRecipe)
#include "tst_recipe.moc"
