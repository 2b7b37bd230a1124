// The recipe designer: amounts against hand calculation with published molar masses, round trips
// through solve(), warnings and errors.
#include "chem/error.h"
#include "chem/note_text.h"
#include "chem/recipe.h"
#include "chem/recipe_roles.h"
#include "chem/units.h"
#include "chem/water.h"
#include "core/batch_document.h"
#include "core/chem_json.h"
#include "core/commands.h"
#include "test_support.h"

#include <QJsonArray>
#include <QRegularExpression>
#include <QtTest>

#include <cmath>
#include <map>

using phaseplan::testing::shipped_data;

namespace {
const chem::Library& lib() {
    return shipped_data().reagents;
}

QJsonObject recipe(const QJsonObject& in) {
    return phaseplan::command_recipe(shipped_data(), in, {});
}

bool has_warning(const QJsonObject& out, const QString& code) {
    for (const auto& w : out["warnings"].toArray())
        if (w.toObject()["code"].toString() == code)
            return true;
    return false;
}

QJsonObject item(const QJsonObject& out, const QString& reagent) {
    for (const auto& i : out["items"].toArray())
        if (i.toObject()["reagent"].toString() == reagent)
            return i.toObject();
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
    void weakAcidTitrationsMatchHandCalculation_data();
    void weakAcidTitrationsMatchHandCalculation();
    void neatTitrantVolumeFromAssayAndDensity();
    void basisSaysWhatIsHeldAtC();
    void basisTextAndTotalsForTheScreen();
    void titrantFitsTheWeighedReagent();
    void fittingTitrantsMovePhMonotonically();
    void pickersOfferOnlyFormsThatFit();
    void routeChangeNeverSwapsSilently();
    void routeChangeOverEveryPairKeepsTheSystem();
    void defaultNameFollowsTheInputs_data();
    void defaultNameFollowsTheInputs();
    void bufferingRangeUsesConditionalPka();
    void ionicStrengthTargetIsMetOnEveryRoute();
    void stepsStateThePhWhereItIsRead();
    void stepsAreDataNumberedOnlyWhereShown();
};

void TestRecipe::roundTripLandsOnTarget_data() {
    QTest::addColumn<QJsonObject>("request");
    auto mix = [](double ph, const char* a, const char* b, double c, double t = 25) {
        return QJsonObject{{"target_ph", ph},
                           {"temperature_c", t},
                           {"volume_ml", 1000},
                           {"route", "mix"},
                           {"acid", a},
                           {"base", b},
                           {"concentration_mol_per_l", c}};
    };
    QTest::newRow("formate pH 3.2") << mix(3.2, "formic-acid", "ammonium-formate", 0.01);
    QTest::newRow("acetate pH 4.8") << mix(4.8, "acetic-acid", "sodium-acetate", 0.02);
    QTest::newRow("acetate trihydrate pH 5.5 at 40 C")
        << mix(5.5, "acetic-acid", "sodium-acetate-trihydrate", 0.05, 40);
    QTest::newRow("phosphate hydrates pH 7.0")
        << mix(7.0, "sodium-dihydrogen-phosphate-monohydrate",
               "disodium-hydrogen-phosphate-heptahydrate", 0.025);
    QTest::newRow("phosphate pH 2.5")
        << mix(2.5, "phosphoric-acid", "potassium-dihydrogen-phosphate", 0.02);
    QTest::newRow("phosphate pH 6.8 at 5 C")
        << mix(6.8, "potassium-dihydrogen-phosphate", "dipotassium-hydrogen-phosphate", 0.05, 5);
    QTest::newRow("citrate pH 4.0")
        << mix(4.0, "citric-acid-monohydrate", "trisodium-citrate-dihydrate", 0.02);
    QTest::newRow("carbonate pH 10") << mix(10.0, "sodium-bicarbonate", "sodium-carbonate", 0.05);
    QTest::newRow("borate pH 8.8")
        << mix(8.8, "boric-acid", "sodium-tetraborate-decahydrate", 0.02);
    QTest::newRow("tris pH 7.5 at 37 C") << mix(7.5, "tris-hydrochloride", "tris", 0.05, 37);
    QTest::newRow("ammonium acetate + acetic acid pH 4.5")
        << mix(4.5, "acetic-acid", "ammonium-acetate", 0.01);
    QTest::newRow("ammonium bicarbonate + ammonia pH 9.5")
        << mix(9.5, "ammonium-bicarbonate", "ammonia", 0.01);
    QJsonObject ionic = mix(6.0, "sodium-dihydrogen-phosphate-dihydrate",
                            "disodium-hydrogen-phosphate-dodecahydrate", 0.0);
    ionic.remove("concentration_mol_per_l");
    ionic["ionic_strength_mol_per_l"] = 0.05;
    QTest::newRow("phosphate at I = 0.05") << ionic;
    auto titrate = [](double ph, const char* w, const char* t, double m, double c,
                      double temp = 25) {
        return QJsonObject{{"target_ph", ph},
                           {"temperature_c", temp},
                           {"volume_ml", 500},
                           {"route", "titrate"},
                           {"weigh", w},
                           {"titrant", t},
                           {"titrant_mol_per_l", m},
                           {"concentration_mol_per_l", c}};
    };
    QTest::newRow("tris with HCl pH 8.0") << titrate(8.0, "tris", "hydrochloric-acid", 1.0, 0.05);
    QTest::newRow("KH2PO4 with KOH pH 7.2 at 30 C")
        << titrate(7.2, "potassium-dihydrogen-phosphate", "potassium-hydroxide", 1.0, 0.05, 30);
    QTest::newRow("acetic acid with NaOH pH 5.0")
        << titrate(5.0, "acetic-acid", "sodium-hydroxide", 2.0, 0.1);
    QTest::newRow("glycine with NaOH pH 9.5")
        << titrate(9.5, "glycine", "sodium-hydroxide", 1.0, 0.05);
    QTest::newRow("NaH2PO4 with H3PO4 pH 2.5")
        << titrate(2.5, "sodium-dihydrogen-phosphate", "phosphoric-acid", 1.0, 0.02);
    QTest::newRow("ammonium formate with formic acid pH 3.0")
        << titrate(3.0, "ammonium-formate", "formic-acid", 1.0, 0.01);
    auto basis = [](QJsonObject o, const char* b) {
        o["concentration_basis"] = b;
        return o;
    };
    auto neat = [](QJsonObject o) {
        o.remove("titrant_mol_per_l");
        o["titrant_form"] = "neat";
        return o;
    };
    QTest::newRow("ammonium formate + neat formic acid pH 3.0, salt basis")
        << neat(titrate(3.0, "ammonium-formate", "formic-acid", 1.0, 0.01));
    QTest::newRow("ammonium formate + neat formic acid pH 3.0, total basis")
        << basis(neat(titrate(3.0, "ammonium-formate", "formic-acid", 1.0, 0.01)), "total");
    QTest::newRow("ammonium acetate + neat acetic acid pH 4.75")
        << neat(titrate(4.75, "ammonium-acetate", "acetic-acid", 1.0, 0.01));
    QTest::newRow("ammonium bicarbonate + neat ammonia pH 10.0 at 20 C")
        << neat(titrate(10.0, "ammonium-bicarbonate", "ammonia", 1.0, 0.01, 20));
    QTest::newRow("ammonium formate + neat TFA pH 2.7")
        << neat(titrate(2.7, "ammonium-formate", "trifluoroacetic-acid", 1.0, 0.005));
    QTest::newRow("KH2PO4 + neat phosphoric acid pH 2.5, total basis")
        << basis(neat(titrate(2.5, "potassium-dihydrogen-phosphate", "phosphoric-acid", 1.0, 0.02)),
                 "total");
    QTest::newRow("sodium tetraborate with HCl pH 9.0, total basis") << basis(
        titrate(9.0, "sodium-tetraborate-decahydrate", "hydrochloric-acid", 1.0, 0.02), "total");
    QTest::newRow("mix salt basis: ammonium formate + formic acid pH 3.2")
        << basis(mix(3.2, "formic-acid", "ammonium-formate", 0.01), "salt");
    QTest::newRow("mix salt basis: ammonium chloride + ammonia pH 9.0")
        << basis(mix(9.0, "ammonium-chloride", "ammonia", 0.02), "salt");
    QJsonObject salt_ionic =
        basis(neat(titrate(3.5, "ammonium-formate", "formic-acid", 1.0, 0.0)), "salt");
    salt_ionic.remove("concentration_mol_per_l");
    salt_ionic["ionic_strength_mol_per_l"] = 0.02;
    QTest::newRow("salt basis at I = 0.02") << salt_ionic;
    QTest::newRow("stocks salt basis: tris hydrochloride + tris pH 7.8")
        << QJsonObject{{"target_ph", 7.8},
                       {"volume_ml", 500},
                       {"route", "stocks"},
                       {"acid", "tris-hydrochloride"},
                       {"base", "tris"},
                       {"concentration_basis", "salt"},
                       {"acid_stock_mol_per_l", 1.0},
                       {"base_stock_mol_per_l", 1.0},
                       {"concentration_mol_per_l", 0.05}};
    QTest::newRow("stocks phosphate pH 7.4") << QJsonObject{{"target_ph", 7.4},
                                                            {"volume_ml", 1000},
                                                            {"route", "stocks"},
                                                            {"acid", "sodium-dihydrogen-phosphate"},
                                                            {"base", "disodium-hydrogen-phosphate"},
                                                            {"acid_stock_mol_per_l", 0.2},
                                                            {"base_stock_mol_per_l", 0.2},
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
        if (o.contains("mass_g"))
            QVERIFY(o["mass_g"].toDouble() > 0);
        if (o.contains("volume_ml"))
            QVERIFY(o["volume_ml"].toDouble() > 0);
    }
}

void TestRecipe::massesMatchHandCalculation() {
    // 1000 mL of 25 mmol/L phosphate pH 7.0 from NaH2PO4·H2O + Na2HPO4·7H2O. Molar masses
    // 137.99 and 268.07 g/mol (CRC Handbook of Chemistry and Physics, physical constants of
    // inorganic compounds, from memory). mass = c · V · M.
    const QJsonObject out = recipe({{"target_ph", 7.0},
                                    {"volume_ml", 1000},
                                    {"route", "mix"},
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
    QJsonObject req{
        {"target_ph", 7.0},
        {"volume_ml", 1000},
        {"route", "mix"},
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
    const QJsonObject out = recipe({{"target_ph", 3.5},
                                    {"volume_ml", 2000},
                                    {"route", "mix"},
                                    {"acid", "formic-acid"},
                                    {"base", "ammonium-formate"},
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
        const QJsonObject out = recipe({{"target_ph", 4.6},
                                        {"volume_ml", 1000},
                                        {"route", "mix"},
                                        {"acid", "acetic-acid"},
                                        {"base", "sodium-acetate"},
                                        {"ionic_strength_mol_per_l", target}});
        QVERIFY(std::abs(out["ionic_strength_mol_per_l"].toDouble() - target) <
                1e-6 * target + 1e-9);
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
    const QJsonObject out = recipe({{"target_ph", 8.07},
                                    {"volume_ml", 1000},
                                    {"route", "titrate"},
                                    {"weigh", "tris"},
                                    {"titrant", "hydrochloric-acid"},
                                    {"titrant_mol_per_l", 1.0},
                                    {"concentration_mol_per_l", 0.05}});
    const double ml = item(out, "hydrochloric-acid")["volume_ml"].toDouble();
    QVERIFY2(std::abs(ml - 27.0) < 0.2, qPrintable(QString::number(ml)));
    // Tris mass: 0.05 mol · 121.14 g/mol (CRC Handbook, from memory) = 6.057 g.
    QVERIFY(std::abs(item(out, "tris")["mass_g"].toDouble() - 6.057) < 0.003);
}

void TestRecipe::stocksRouteVolumes() {
    const QJsonObject out = recipe({{"target_ph", 7.2},
                                    {"volume_ml", 500},
                                    {"route", "stocks"},
                                    {"acid", "potassium-dihydrogen-phosphate"},
                                    {"base", "dipotassium-hydrogen-phosphate"},
                                    {"acid_stock_mol_per_l", 0.5},
                                    {"base_stock_mol_per_l", 1.0},
                                    {"concentration_mol_per_l", 0.1}});
    const QJsonObject a = item(out, "potassium-dihydrogen-phosphate");
    const QJsonObject b = item(out, "dipotassium-hydrogen-phosphate");
    // volume = c · V / stock molarity.
    QVERIFY(std::abs(a["volume_ml"].toDouble() - a["mol_per_l"].toDouble() * 500 / 0.5) < 1e-9);
    QVERIFY(std::abs(b["volume_ml"].toDouble() - b["mol_per_l"].toDouble() * 500 / 1.0) < 1e-9);
    // Too dilute stocks cannot fit in the flask.
    try {
        recipe({{"target_ph", 7.2},
                {"volume_ml", 500},
                {"route", "stocks"},
                {"acid", "potassium-dihydrogen-phosphate"},
                {"base", "dipotassium-hydrogen-phosphate"},
                {"acid_stock_mol_per_l", 0.05},
                {"base_stock_mol_per_l", 0.05},
                {"concentration_mol_per_l", 0.1}});
        QFAIL("dilute stocks accepted");
    } catch (const chem::Error& e) {
        QVERIFY(QString::fromStdString(e.field()).endsWith("_stock_mol_per_l"));
    }
}

void TestRecipe::warnings() {
    // Outside pKa ± 1 (phosphate pKa 2.15 and 7.20; pH 4.4 is over 2 units from both).
    QVERIFY(has_warning(recipe({{"target_ph", 4.4},
                                {"route", "mix"},
                                {"acid", "phosphoric-acid"},
                                {"base", "potassium-dihydrogen-phosphate"},
                                {"concentration_mol_per_l", 0.05}}),
                        "ph-outside-pka-range"));
    QVERIFY(!has_warning(recipe({{"target_ph", 2.5},
                                 {"route", "mix"},
                                 {"acid", "phosphoric-acid"},
                                 {"base", "potassium-dihydrogen-phosphate"},
                                 {"concentration_mol_per_l", 0.05}}),
                         "ph-outside-pka-range"));
    // Low buffer capacity: 1 mmol/L acetate at its pKa has β ≈ ln10 · 0.001/4 = 0.6 mmol/L/pH.
    QVERIFY(has_warning(recipe({{"target_ph", 4.76},
                                {"route", "mix"},
                                {"acid", "acetic-acid"},
                                {"base", "sodium-acetate"},
                                {"concentration_mol_per_l", 0.001}}),
                        "low-buffer-capacity"));
    QVERIFY(!has_warning(recipe({{"target_ph", 4.76},
                                 {"route", "mix"},
                                 {"acid", "acetic-acid"},
                                 {"base", "sodium-acetate"},
                                 {"concentration_mol_per_l", 0.05}}),
                         "low-buffer-capacity"));
    // Below a balance's reach: 10 mL of 1 mmol/L acetate needs under 1 mg of sodium acetate.
    QVERIFY(has_warning(recipe({{"target_ph", 4.76},
                                {"volume_ml", 10},
                                {"route", "mix"},
                                {"acid", "acetic-acid"},
                                {"base", "sodium-acetate"},
                                {"concentration_mol_per_l", 0.001}}),
                        "small-amount"));
    QVERIFY(!has_warning(recipe({{"target_ph", 4.76},
                                 {"volume_ml", 1000},
                                 {"route", "mix"},
                                 {"acid", "acetic-acid"},
                                 {"base", "sodium-acetate"},
                                 {"concentration_mol_per_l", 0.05}}),
                         "small-amount"));
}

void TestRecipe::unreachableTargetIsAnError_data() {
    QTest::addColumn<QJsonObject>("request");
    QTest::addColumn<QString>("field");
    QTest::newRow("pH 9 from acetate") << QJsonObject{{"target_ph", 9.0},
                                                      {"route", "mix"},
                                                      {"acid", "acetic-acid"},
                                                      {"base", "sodium-acetate"},
                                                      {"concentration_mol_per_l", 0.02}}
                                       << "target_ph";
    QTest::newRow("base titrant cannot lower pH")
        << QJsonObject{{"target_ph", 3.0},
                       {"route", "titrate"},
                       {"weigh", "potassium-dihydrogen-phosphate"},
                       {"titrant", "sodium-hydroxide"},
                       {"titrant_mol_per_l", 1.0},
                       {"concentration_mol_per_l", 0.05}}
        << "target_ph";
    QTest::newRow("swapped acid and base") << QJsonObject{{"target_ph", 7.0},
                                                          {"route", "mix"},
                                                          {"acid", "disodium-hydrogen-phosphate"},
                                                          {"base", "sodium-dihydrogen-phosphate"},
                                                          {"concentration_mol_per_l", 0.02}}
                                           << "base";
    QTest::newRow("not a conjugate pair") << QJsonObject{{"target_ph", 5.0},
                                                         {"route", "mix"},
                                                         {"acid", "acetic-acid"},
                                                         {"base", "disodium-hydrogen-phosphate"},
                                                         {"concentration_mol_per_l", 0.02}}
                                          << "base";
    QTest::newRow("titrant of another system") << QJsonObject{{"target_ph", 3.0},
                                                              {"route", "titrate"},
                                                              {"weigh", "ammonium-formate"},
                                                              {"titrant", "acetic-acid"},
                                                              {"titrant_mol_per_l", 1.0},
                                                              {"concentration_mol_per_l", 0.01}}
                                               << "titrant";
    QTest::newRow("neat solid titrant")
        << QJsonObject{{"target_ph", 8.0},       {"route", "titrate"},
                       {"weigh", "tris"},        {"titrant", "sodium-hydroxide"},
                       {"titrant_form", "neat"}, {"concentration_mol_per_l", 0.05}}
        << "titrant_form";
    QTest::newRow("salt basis with two salts")
        << QJsonObject{{"target_ph", 7.0},
                       {"route", "mix"},
                       {"acid", "sodium-dihydrogen-phosphate"},
                       {"base", "disodium-hydrogen-phosphate"},
                       {"concentration_basis", "salt"},
                       {"concentration_mol_per_l", 0.02}}
        << "concentration_basis";
    QTest::newRow("salt basis: partner cannot reach")
        << QJsonObject{{"target_ph", 8.0},
                       {"route", "mix"},
                       {"acid", "formic-acid"},
                       {"base", "ammonium-formate"},
                       {"concentration_basis", "salt"},
                       {"concentration_mol_per_l", 0.01}}
        << "target_ph";
    QTest::newRow("both concentration and ionic strength")
        << QJsonObject{{"target_ph", 5.0},
                       {"route", "mix"},
                       {"acid", "acetic-acid"},
                       {"base", "sodium-acetate"},
                       {"concentration_mol_per_l", 0.02},
                       {"ionic_strength_mol_per_l", 0.02}}
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
    const QJsonObject out = recipe({{"target_ph", 2.5},
                                    {"route", "mix"},
                                    {"acid", "phosphoric-acid"},
                                    {"base", "potassium-dihydrogen-phosphate"},
                                    {"concentration_mol_per_l", 0.02}});
    QString all;
    for (const auto& c : out["cautions"].toArray())
        all += c.toString() + "\n";
    QVERIFY(all.contains("H314"));
    QVERIFY(all.contains("safety data sheet"));
    QVERIFY(all.contains("rules and licensed practice"));
    QVERIFY(all.contains("never water to it"));
    // Never call a preparation safe.
    QString everything = all;
    for (const auto& s : out["steps"].toArray())
        everything += s.toString();
    QVERIFY(!everything.contains(
        QRegularExpression("\\bsafe\\b", QRegularExpression::CaseInsensitiveOption)));
}

// ---- concentration basis, titrants, pickers, route changes, default names ----------------------

void TestRecipe::weakAcidTitrationsMatchHandCalculation_data() {
    // Each row: the salt weighed at 10 mmol/L (salt basis), the titrant added as supplied, the
    // amount of titrant a hand calculation gives (mol/L of final solution), 25 °C.
    //
    // Hand calculations: charge balance with Davies activity coefficients,
    // log10 γ(z) = −A z² (√I/(1+√I) − 0.3 I), A = 0.509 (Robinson & Stokes, Electrolyte Solutions,
    // 1959, from memory); pKw 13.995 (Harned & Robinson 1940, from memory); iterated on I until it
    // no longer changes in the fourth figure. pKa values from Goldberg, Kishore & Lennen, J. Phys.
    // Chem. Ref. Data 31 (2002) 231 (from memory): formic acid 3.745, acetic acid 4.756,
    // ammonium 9.245, carbonic acid 6.351 and 10.329. The library's formate pKa is 3.752 (Harned &
    // Embree 1934, from memory); the 0.007 difference moves the pH by under 0.008, inside the 0.01
    // checked below.
    QTest::addColumn<QJsonObject>("request");
    QTest::addColumn<QString>("held");
    QTest::addColumn<QString>("titrant");
    QTest::addColumn<double>("hand_mol_per_l");
    auto row = [](double ph, const char* weigh, const char* titrant) {
        return QJsonObject{{"target_ph", ph},
                           {"temperature_c", 25},
                           {"volume_ml", 1000},
                           {"route", "titrate"},
                           {"weigh", weigh},
                           {"titrant", titrant},
                           {"titrant_form", "neat"},
                           {"concentration_basis", "salt"},
                           {"concentration_mol_per_l", 0.01}};
    };
    // 10 mM ammonium formate + formic acid to pH 3.00.
    //   [NH4+] + [H+] = [HCOO−] + [OH−]; at pH 3 [NH3]/[NH4+] = 10^(3 − 9.245): [NH4+] = 0.0100.
    //   I ≈ 0.01111: √I = 0.10542, log10 γ1 = −0.509·(0.10542/1.10542 − 0.00333) = −0.04685,
    //   γ1 = 0.8977. [H+] = 10^−3/0.8977 = 0.001114; [OH−] ≈ 1e−11.
    //   [HCOO−] = 0.0100 + 0.001114 = 0.011114 (I = ½(0.0100 + 0.001114 + 0.011114) = 0.011114).
    //   [HCOO−]/[HCOOH] = Ka/(a_H γ1) = 10^−3.745/(10^−3 · 0.8977) = 0.2004;
    //   [HCOOH] = 0.011114/0.2004 = 0.05547; formate in all 0.06658; formic acid added
    //   0.06658 − 0.0100 = 0.05658 mol/L.
    QTest::newRow("ammonium formate + formic acid pH 3.00")
        << row(3.00, "ammonium-formate", "formic-acid") << "ammonium-formate"
        << "formic-acid" << 0.05658;
    // 10 mM ammonium acetate + acetic acid to pH 4.75.
    //   [NH4+] = 0.0100 (NH3 fraction 3e−5); I ≈ 0.01002: log10 γ1 = −0.04478, γ1 = 0.9020.
    //   [H+] = 10^−4.75/0.9020 = 1.971e−5; [CH3COO−] = 0.0100 + 0.0000197 = 0.010020.
    //   [CH3COO−]/[CH3COOH] = 10^−4.756/(10^−4.75 · 0.9020) = 1.0934;
    //   [CH3COOH] = 0.010020/1.0934 = 0.009164; acetate in all 0.019184; acetic acid added
    //   0.009184 mol/L.
    QTest::newRow("ammonium acetate + acetic acid pH 4.75")
        << row(4.75, "ammonium-acetate", "acetic-acid") << "ammonium-acetate"
        << "acetic-acid" << 0.009184;
    // 10 mM ammonium hydrogen carbonate + ammonia solution to pH 9.50.
    //   I ≈ 0.01351: log10 γ1 = −0.05094, γ1 = 0.8893, γ2 = γ1⁴ = 0.6255.
    //   Carbonate: [HCO3−]/[H2CO3] = 10^−6.351/(a_H γ1) = 1585;
    //   [CO3−2]/[HCO3−] = 10^−10.329 γ1/(a_H γ2) = 0.2108 → fractions HCO3− 0.8255, CO3−2 0.1740.
    //   [NH4+] = 0.0100·(0.8255 + 2·0.1740) + [OH−] − [H+] = 0.011735 + 3.60e−5 − 3.6e−10 =
    //   0.011771. [NH3]/[NH4+] = 10^−9.245 γ1/a_H = 1.5998 → ammonia in all 0.030601; added
    //   0.020601 mol/L. I = ½([NH4+] + [HCO3−] + 4[CO3−2] + [OH−]) = 0.01351.
    QTest::newRow("ammonium hydrogen carbonate + ammonia pH 9.50")
        << row(9.50, "ammonium-bicarbonate", "ammonia") << "ammonium-bicarbonate"
        << "ammonia" << 0.020601;
    // The same to pH 10.00: I ≈ 0.01834, γ1 = 0.8752, γ2 = 0.5866; HCO3− 0.5884, CO3−2 0.4115;
    //   [NH4+] = 0.0100·(0.5884 + 0.8230) + 1.156e−4 = 0.014230; [NH3]/[NH4+] = 4.9783;
    //   ammonia in all 0.085070; added 0.075070 mol/L.
    QTest::newRow("ammonium hydrogen carbonate + ammonia pH 10.00")
        << row(10.00, "ammonium-bicarbonate", "ammonia") << "ammonium-bicarbonate"
        << "ammonia" << 0.075070;
}

void TestRecipe::weakAcidTitrationsMatchHandCalculation() {
    QFETCH(QJsonObject, request);
    QFETCH(QString, held);
    QFETCH(QString, titrant);
    QFETCH(double, hand_mol_per_l);
    const QJsonObject out = recipe(request);
    const double designed = item(out, titrant)["mol_per_l"].toDouble();
    QCOMPARE(item(out, held)["mol_per_l"].toDouble(), 0.01);
    // The hand calculation's mixture, solved by the program, lands within 0.01 pH of the target,
    // and the designed amount is within 2 % of the hand amount (a 0.005 pKa difference is 1.2 %).
    const auto solved = chem::solve(lib(),
                                    {{&lib().reagent(held.toStdString()), 0.01},
                                     {&lib().reagent(titrant.toStdString()), hand_mol_per_l}},
                                    25);
    const double target = request["target_ph"].toDouble();
    QVERIFY2(std::abs(solved.ph - target) <= 0.01, qPrintable(QString::number(solved.ph, 'f', 4)));
    QVERIFY2(std::abs(designed / hand_mol_per_l - 1) < 0.02,
             qPrintable(QString::number(designed, 'g', 6)));
    QVERIFY(std::abs(out["ph"].toDouble() - target) < 1e-4);
}

void TestRecipe::neatTitrantVolumeFromAssayAndDensity() {
    // Ammonia solution as supplied: volume = n · V · M / (assay · ρ), mass = volume · ρ, with
    // M(NH3) = 17.0305 g/mol (python3-periodictable) and the library's 25 % w/w, 0.907 g/mL.
    const QJsonObject out = recipe({{"target_ph", 9.5},
                                    {"volume_ml", 1000},
                                    {"route", "titrate"},
                                    {"weigh", "ammonium-bicarbonate"},
                                    {"titrant", "ammonia"},
                                    {"titrant_form", "neat"},
                                    {"concentration_mol_per_l", 0.01}});
    const QJsonObject t = item(out, "ammonia");
    const chem::Reagent& r = lib().reagent("ammonia");
    QCOMPARE(t["as"].toString(), QString("titrant, neat"));
    const double n_mol = t["mol_per_l"].toDouble() * 1.0;
    const double ml = n_mol * 17.0305 / (r.assay_fraction * r.density_g_per_ml);
    QVERIFY2(std::abs(t["volume_ml"].toDouble() - ml) < 1e-4 * ml,
             qPrintable(QString::number(t["volume_ml"].toDouble())));
    QVERIFY(std::abs(t["mass_g"].toDouble() - ml * r.density_g_per_ml) < 1e-4 * ml);
    // About 1.55 mL for the hand calculation's 0.0206 mol/L (see weakAcidTitrations…).
    QVERIFY(std::abs(t["volume_ml"].toDouble() - 1.547) < 0.03);
    QCOMPARE(out["titrant_form"].toString(), QString("neat"));
    bool says_neat = false;
    for (const auto& st : out["steps"].toArray())
        says_neat |= st.toString().contains("as supplied (neat)");
    QVERIFY(says_neat);
}

void TestRecipe::basisSaysWhatIsHeldAtC() {
    // Formic acid + ammonium formate at pH 3.0, 10 mmol/L: the total basis holds the formate
    // at 10 mM (ammonium well under it); the salt basis holds ammonium formate at 10 mM (formate
    // far over it). Same pH, different buffers.
    auto totals = [](const QJsonObject& out) {
        std::map<QString, double> m;
        for (const auto& t : out["totals"].toArray())
            m[t.toObject()["family"].toString()] = t.toObject()["mol_per_l"].toDouble();
        return m;
    };
    QJsonObject req{{"target_ph", 3.0},
                    {"route", "mix"},
                    {"acid", "formic-acid"},
                    {"base", "ammonium-formate"},
                    {"concentration_mol_per_l", 0.01}};
    const auto total = totals(recipe(req));
    QVERIFY(std::abs(total.at("formate") - 0.01) < 1e-12);
    QVERIFY(total.at("ammonium") < 0.002);
    req["concentration_basis"] = "salt";
    const auto salt = totals(recipe(req));
    QVERIFY(std::abs(salt.at("ammonium") - 0.01) < 1e-12);
    QVERIFY(salt.at("formate") > 0.06);
    // The titrate route on the total basis with formic acid as the titrant is the same solution
    // as the mix on the total basis (invariant: the basis, not the route, fixes the composition).
    const QJsonObject titrated = recipe({{"target_ph", 3.0},
                                         {"route", "titrate"},
                                         {"weigh", "ammonium-formate"},
                                         {"titrant", "formic-acid"},
                                         {"titrant_form", "neat"},
                                         {"concentration_basis", "total"},
                                         {"concentration_mol_per_l", 0.01}});
    const auto t = totals(titrated);
    QVERIFY(std::abs(t.at("formate") - 0.01) < 1e-12);
    QVERIFY(std::abs(t.at("ammonium") / total.at("ammonium") - 1) < 1e-6);
    // Without a basis, each route keeps its old meaning: mix total, titrate the weighed reagent.
    QCOMPARE(recipe({{"target_ph", 3.0},
                     {"route", "mix"},
                     {"acid", "formic-acid"},
                     {"base", "ammonium-formate"},
                     {"concentration_mol_per_l", 0.01}})["concentration_basis"]
                 .toString(),
             QString("total"));
    const QJsonObject old_titrate = recipe({{"target_ph", 8.0},
                                            {"route", "titrate"},
                                            {"weigh", "tris"},
                                            {"titrant", "hydrochloric-acid"},
                                            {"titrant_mol_per_l", 1.0},
                                            {"concentration_mol_per_l", 0.05}});
    QCOMPARE(old_titrate["concentration_basis"].toString(), QString("salt"));
    QCOMPARE(item(old_titrate, "tris")["mol_per_l"].toDouble(), 0.05);
    // Borax on the total basis counts boron: 20 mM borate is 5 mM Na2B4O7·10H2O (4 B per unit).
    const QJsonObject borax = recipe({{"target_ph", 9.0},
                                      {"route", "titrate"},
                                      {"weigh", "sodium-tetraborate-decahydrate"},
                                      {"titrant", "hydrochloric-acid"},
                                      {"titrant_mol_per_l", 1.0},
                                      {"concentration_basis", "total"},
                                      {"concentration_mol_per_l", 0.02}});
    QVERIFY(std::abs(item(borax, "sodium-tetraborate-decahydrate")["mol_per_l"].toDouble() -
                     0.005) < 1e-12);
}

void TestRecipe::basisTextAndTotalsForTheScreen() {
    const QJsonObject phosphate =
        recipe(phaseplan::testing::read_json(SOURCE_DIR "/data/demo/buffer-phosphate-ph2.5.json"));
    QCOMPARE(phosphate["basis"].toObject()["text"].toString(),
             QString("20 mmol/L total phosphate"));
    const QJsonObject lcms = recipe({{"target_ph", 3.0},
                                     {"route", "titrate"},
                                     {"weigh", "ammonium-formate"},
                                     {"titrant", "formic-acid"},
                                     {"titrant_form", "neat"},
                                     {"concentration_mol_per_l", 0.01}});
    const QJsonObject b = lcms["basis"].toObject();
    // Formate in all: 67.5 mmol/L with the library's pKa 3.752 (Harned & Embree 1934, from memory):
    // [HCOO−]/[HCOOH] = 10^−3.752/(10^−3 · 0.8977) = 0.1972, [HCOOH] = 0.011114/0.1972 = 0.05636,
    // 0.0100 + 0.001114 + 0.05636 = 0.0675 (66.6 with 3.745, see the hand
    // calculation above).
    QCOMPARE(b["text"].toString(), QString("10 mmol/L ammonium formate, brought to pH 3.00 with "
                                           "formic acid: formate 67.5 mmol/L in all"));
    QCOMPARE(b["held_reagent"].toString(), QString("ammonium-formate"));
    QCOMPARE(b["adjusting_reagent"].toString(), QString("formic-acid"));
    QCOMPARE(b["system"].toString(), QString("formate"));
    const QJsonArray totals = lcms["totals"].toArray();
    QCOMPARE(totals.size(), 2);
    QCOMPARE(totals[0].toObject()["family"].toString(),
             QString("formate")); // the buffer system first
    QCOMPARE(totals[1].toObject()["name"].toString(), QString("ammonium"));
    // Invariant: the totals are the composition's, system by system and ion by ion.
    const QJsonObject na = recipe({{"target_ph", 4.8},
                                   {"route", "mix"},
                                   {"acid", "acetic-acid"},
                                   {"base", "sodium-acetate-trihydrate"},
                                   {"concentration_mol_per_l", 0.05}});
    double sodium = 0, acetate = 0;
    for (const auto& t : na["totals"].toArray()) {
        if (t.toObject()["family"].toString() == "Na+") {
            sodium = t.toObject()["mol_per_l"].toDouble();
            QCOMPARE(t.toObject()["name"].toString(), QString("sodium"));
            QCOMPARE(t.toObject()["kind"].toString(), QString("ion"));
        }
        if (t.toObject()["family"].toString() == "acetate")
            acetate = t.toObject()["mol_per_l"].toDouble();
    }
    QVERIFY(std::abs(sodium - item(na, "sodium-acetate-trihydrate")["mol_per_l"].toDouble()) <
            1e-15);
    QVERIFY(std::abs(acetate - 0.05) < 1e-12);
    const QJsonObject tris = recipe({{"target_ph", 8.0},
                                     {"route", "titrate"},
                                     {"weigh", "tris"},
                                     {"titrant", "hydrochloric-acid"},
                                     {"titrant_mol_per_l", 1.0},
                                     {"concentration_basis", "total"},
                                     {"concentration_mol_per_l", 0.05}});
    QCOMPARE(tris["basis"].toObject()["text"].toString(),
             QString("50 mmol/L total tris: tris(hydroxymethyl)aminomethane brought to pH 8.00 "
                     "with hydrochloric acid"));
}

void TestRecipe::titrantFitsTheWeighedReagent() {
    auto fit = [](const char* w, const char* t) {
        return chem::titrant_fit(lib(), lib().reagent(w), lib().reagent(t));
    };
    auto f = fit("ammonium-formate", "formic-acid");
    QVERIFY(f && f->direction == chem::PhDirection::lowers && f->shared_system == "formate");
    f = fit("ammonium-formate", "ammonia");
    QVERIFY(f && f->direction == chem::PhDirection::raises && f->shared_system == "ammonium");
    f = fit("ammonium-formate", "trifluoroacetic-acid"); // pKa 0.52: strong for titration
    QVERIFY(f && f->direction == chem::PhDirection::lowers && f->shared_system.empty());
    f = fit("potassium-dihydrogen-phosphate", "phosphoric-acid");
    QVERIFY(f && f->direction == chem::PhDirection::lowers);
    f = fit("potassium-dihydrogen-phosphate", "potassium-hydroxide");
    QVERIFY(f && f->direction == chem::PhDirection::raises && f->shared_system.empty());
    QVERIFY(!fit("ammonium-formate", "acetic-acid"));      // another system, weak
    QVERIFY(!fit("ammonium-formate", "sodium-formate"));   // the same form of formate
    QVERIFY(!fit("ammonium-formate", "ammonium-formate")); // itself
    QVERIFY(!fit("tris", "sodium-chloride"));              // neither acid nor base
}

void TestRecipe::fittingTitrantsMovePhMonotonically() {
    // Property behind the titrant search: for every titrant that fits, the pH moves one way only
    // as more is added (checked on a geometric grid 1e-5 to 1 mol/L, 10 mM weighed, 25 °C).
    for (const char* weighed : {"ammonium-formate", "ammonium-acetate", "ammonium-bicarbonate",
                                "potassium-dihydrogen-phosphate", "tris",
                                "sodium-tetraborate-decahydrate", "citric-acid", "glycine"}) {
        const chem::Reagent& w = lib().reagent(weighed);
        for (const chem::Reagent& t : lib().reagents()) {
            const auto fit = chem::titrant_fit(lib(), w, t);
            if (!fit)
                continue;
            double last = chem::solve(lib(), {{&w, 0.01}}, 25).ph;
            for (double n = 1e-5; n <= 1.0; n *= 1.5) {
                const double ph = chem::solve(lib(), {{&w, 0.01}, {&t, n}}, 25).ph;
                const bool ok = fit->direction == chem::PhDirection::raises ? ph >= last - 1e-9
                                                                            : ph <= last + 1e-9;
                QVERIFY2(ok, qPrintable(QString("%1 + %2 at %3 mol/L: pH %4 after %5")
                                            .arg(weighed, QString::fromStdString(t.id))
                                            .arg(n)
                                            .arg(ph)
                                            .arg(last)));
                last = ph;
            }
        }
    }
}

void TestRecipe::pickersOfferOnlyFormsThatFit() {
    auto ids = [](const std::vector<chem::RoleChoice>& l) {
        QStringList out;
        for (const auto& c : l)
            out << QString::fromStdString(c.reagent);
        return out;
    };
    const auto mix = chem::reagent_choices(lib(), "formate", chem::Route::mix);
    QCOMPARE(ids(mix.acid_forms), QStringList{"formic-acid"});
    QVERIFY(ids(mix.base_forms).contains("ammonium-formate") &&
            ids(mix.base_forms).contains("sodium-formate"));
    QVERIFY(!ids(mix.base_forms).contains("formic-acid"));
    QCOMPARE(ids(mix.salts), (QStringList{"ammonium-formate", "sodium-formate"}));
    QVERIFY(mix.weighable.empty() && mix.titrants.empty());
    for (const auto& c : mix.base_forms)
        QVERIFY(!c.formula.empty());
    // Phosphate with KH2PO4 as the acid: only the more basic forms are offered as its base.
    const auto phos = chem::reagent_choices(lib(), "phosphate", chem::Route::mix,
                                            "potassium-dihydrogen-phosphate");
    QVERIFY(ids(phos.base_forms).contains("dipotassium-hydrogen-phosphate"));
    QVERIFY(!ids(phos.base_forms).contains("phosphoric-acid"));
    QVERIFY(!ids(phos.base_forms).contains("sodium-dihydrogen-phosphate"));
    QVERIFY(
        !ids(phos.acid_forms).contains("trisodium-phosphate")); // the most basic form has no base
    // Titrate: every form may be weighed; titrants fit the weighed reagent, with their direction,
    // the system's own forms first.
    const auto tit =
        chem::reagent_choices(lib(), "formate", chem::Route::titrate, "", "ammonium-formate");
    QVERIFY(ids(tit.weighable).contains("formic-acid") &&
            ids(tit.weighable).contains("ammonium-formate"));
    const QStringList t = ids(tit.titrants);
    for (const char* id : {"formic-acid", "ammonia", "trifluoroacetic-acid", "hydrochloric-acid",
                           "sodium-hydroxide"})
        QVERIFY2(t.contains(id), id);
    QVERIFY(!t.contains("acetic-acid") && !t.contains("sodium-formate") &&
            !t.contains("ammonium-formate"));
    QCOMPARE(t.front(), QString("formic-acid"));
    for (const auto& c : tit.titrants) {
        QVERIFY(c.direction.has_value());
        // Strong: fully dissociated acids (pKa below 1: TFA 0.5, heptafluorobutyric about 0.4,
        // from memory) and the mineral acids and hydroxides.
        static const QStringList strong = {"trifluoroacetic-acid",    "hydrochloric-acid",
                                           "perchloric-acid",         "methanesulfonic-acid",
                                           "heptafluorobutyric-acid", "sodium-hydroxide",
                                           "potassium-hydroxide"};
        QVERIFY2(c.strong == strong.contains(QString::fromStdString(c.reagent)), c.reagent.c_str());
        if (c.reagent == "ammonia")
            QVERIFY(*c.direction == chem::PhDirection::raises);
        if (c.reagent == "formic-acid")
            QVERIFY(*c.direction == chem::PhDirection::lowers);
    }
    // A half-typed screen state gives empty lists, not an error.
    QVERIFY(chem::reagent_choices(lib(), "formiate", chem::Route::mix).acid_forms.empty());
    QVERIFY(chem::reagent_choices(lib(), "formate", chem::Route::titrate, "", "nothing")
                .titrants.empty());
    // And the JSON the app's models read.
    const QJsonObject j = phaseplan::role_choices_to_json(tit);
    QCOMPARE(j["titrants"].toArray()[0].toObject()["direction"].toString(), QString("lowers"));
    QCOMPARE(j["titrants"].toArray()[0].toObject()["formula"].toString(), QString("HCOOH"));
}

void TestRecipe::routeChangeNeverSwapsSilently() {
    using chem::Route;
    chem::RouteReagents mix;
    mix.acid = "formic-acid";
    mix.base = "ammonium-formate";
    // Mix → titrate: weigh the salt, titrate with its own acid, as supplied.
    auto ch = chem::map_reagents_to_route(lib(), "formate", Route::mix, Route::titrate, mix);
    QCOMPARE(ch.reagents.weigh, std::string("ammonium-formate"));
    QCOMPARE(ch.reagents.titrant, std::string("formic-acid"));
    QVERIFY(ch.reagents.titrant_form == chem::TitrantForm::neat);
    QVERIFY(ch.complete);
    QVERIFY(ch.reagents.basis == chem::ConcentrationBasis::total); // the user's basis stays
    // …and back.
    auto back =
        chem::map_reagents_to_route(lib(), "formate", Route::titrate, Route::mix, ch.reagents);
    QCOMPARE(back.reagents.acid, std::string("formic-acid"));
    QCOMPARE(back.reagents.base, std::string("ammonium-formate"));
    QVERIFY(back.complete && back.notes.empty());
    // Titrate KH2PO4 with KOH → mix: KOH is not a form of phosphate; its potassium form is used,
    // and the note says so.
    chem::RouteReagents tit;
    tit.weigh = "potassium-dihydrogen-phosphate";
    tit.titrant = "potassium-hydroxide";
    ch = chem::map_reagents_to_route(lib(), "phosphate", Route::titrate, Route::mix, tit);
    QCOMPARE(ch.reagents.acid, std::string("potassium-dihydrogen-phosphate"));
    QCOMPARE(ch.reagents.base, std::string("dipotassium-hydrogen-phosphate"));
    QCOMPARE(ch.notes.size(), size_t(1));
    QCOMPARE(ch.notes[0].field, std::string("base"));
    // Tris + HCl → stocks: Tris hydrochloride (its chloride form) as the acid.
    tit.weigh = "tris";
    tit.titrant = "hydrochloric-acid";
    ch = chem::map_reagents_to_route(lib(), "tris", Route::titrate, Route::stocks, tit);
    QCOMPARE(ch.reagents.acid, std::string("tris-hydrochloride"));
    QCOMPARE(ch.reagents.base, std::string("tris"));
    // Glycine + NaOH → mix: the library has no glycinate; nothing is substituted, and the note
    // says nothing fits.
    tit.weigh = "glycine";
    tit.titrant = "sodium-hydroxide";
    ch = chem::map_reagents_to_route(lib(), "glycine", Route::titrate, Route::mix, tit);
    QCOMPARE(ch.reagents.acid, std::string("glycine"));
    QVERIFY(ch.reagents.base.empty());
    QVERIFY(!ch.complete);
    QCOMPARE(ch.notes.size(), size_t(1));
    QVERIFY(ch.notes[0].kind == chem::RouteNoteKind::no_form_made_with);
    QVERIFY(chem::describe(ch.notes[0], lib()).find("Nothing in the library") != std::string::npos);
    // Two salts → titrate: the acid salt is weighed and the other stays as the titrant.
    mix.acid = "sodium-dihydrogen-phosphate";
    mix.base = "disodium-hydrogen-phosphate";
    mix.basis = chem::ConcentrationBasis::salt;
    ch = chem::map_reagents_to_route(lib(), "phosphate", Route::mix, Route::titrate, mix);
    QCOMPARE(ch.reagents.weigh, std::string("sodium-dihydrogen-phosphate"));
    QCOMPARE(ch.reagents.titrant, std::string("disodium-hydrogen-phosphate"));
    QVERIFY(ch.reagents.titrant_form == chem::TitrantForm::solution);
    // …and the salt basis cannot hold one of two salts in the stocks route: basis total, with a
    // note.
    ch = chem::map_reagents_to_route(lib(), "phosphate", Route::mix, Route::stocks, mix);
    QVERIFY(ch.reagents.basis == chem::ConcentrationBasis::total);
    QCOMPARE(ch.notes.at(0).field, std::string("concentration_basis"));
    const QJsonObject j = phaseplan::route_change_to_json(ch, lib());
    QCOMPARE(j["concentration_basis"].toString(), QString("total"));
    QCOMPARE(j["notes"].toArray()[0].toObject()["field"].toString(),
             QString("concentration_basis"));
}

void TestRecipe::routeChangeOverEveryPairKeepsTheSystem() {
    // Property: for every system and every conjugate pair of its forms, mix → titrate → mix keeps
    // the pair, and the titrant is always one of the two (never a reagent the user did not pick).
    for (const chem::AcidBaseSystem& sys : lib().systems()) {
        const auto roles = chem::reagent_choices(lib(), sys.id, chem::Route::mix);
        for (const auto& a : roles.acid_forms)
            for (const auto& b :
                 chem::reagent_choices(lib(), sys.id, chem::Route::mix, a.reagent).base_forms) {
                chem::RouteReagents mix;
                mix.acid = a.reagent;
                mix.base = b.reagent;
                const auto t = chem::map_reagents_to_route(lib(), sys.id, chem::Route::mix,
                                                           chem::Route::titrate, mix);
                const QString what = QString::fromStdString(a.reagent + " + " + b.reagent);
                QVERIFY2(t.complete, qPrintable(what));
                QVERIFY2((t.reagents.weigh == a.reagent && t.reagents.titrant == b.reagent) ||
                             (t.reagents.weigh == b.reagent && t.reagents.titrant == a.reagent),
                         qPrintable(what));
                const auto m = chem::map_reagents_to_route(lib(), sys.id, chem::Route::titrate,
                                                           chem::Route::mix, t.reagents);
                QVERIFY2(m.reagents.acid == a.reagent && m.reagents.base == b.reagent,
                         qPrintable(what));
            }
    }
}

void TestRecipe::defaultNameFollowsTheInputs_data() {
    QTest::addColumn<QJsonObject>("request");
    QTest::addColumn<QString>("name");
    QTest::newRow("demo phosphate")
        << phaseplan::testing::read_json(SOURCE_DIR "/data/demo/buffer-phosphate-ph2.5.json")
        << "20 mM sodium phosphate pH 2.5";
    QTest::newRow("LC-MS salt basis") << QJsonObject{{"target_ph", 3.0},
                                                     {"route", "titrate"},
                                                     {"weigh", "ammonium-formate"},
                                                     {"titrant", "formic-acid"},
                                                     {"titrant_form", "neat"},
                                                     {"concentration_mol_per_l", 0.01}}
                                      << "10 mM ammonium formate pH 3.0 (salt basis)";
    QTest::newRow("same pair, total basis") << QJsonObject{{"target_ph", 3.0},
                                                           {"route", "mix"},
                                                           {"acid", "formic-acid"},
                                                           {"base", "ammonium-formate"},
                                                           {"concentration_mol_per_l", 0.01}}
                                            << "10 mM ammonium formate pH 3.0";
    QTest::newRow("strong titrant: both bases agree")
        << QJsonObject{{"target_ph", 8.05},        {"route", "titrate"},
                       {"weigh", "tris"},          {"titrant", "hydrochloric-acid"},
                       {"titrant_mol_per_l", 1.0}, {"concentration_mol_per_l", 0.05}}
        << "50 mM tris pH 8.05";
    QTest::newRow("ionic strength target") << QJsonObject{{"target_ph", 4.6},
                                                          {"route", "mix"},
                                                          {"acid", "acetic-acid"},
                                                          {"base", "sodium-acetate"},
                                                          {"ionic_strength_mol_per_l", 0.05}}
                                           << "Sodium acetate pH 4.6, I = 50 mM";
    QTest::newRow("unknown reagent") << QJsonObject{{"target_ph", 7.0},
                                                    {"route", "mix"},
                                                    {"acid", "vinegar"},
                                                    {"base", "sodium-acetate"},
                                                    {"concentration_mol_per_l", 0.02}}
                                     << "20 mM buffer pH 7.0";
}

void TestRecipe::defaultNameFollowsTheInputs() {
    QFETCH(QJsonObject, request);
    QFETCH(QString, name);
    // Built without recipe_request_from_json where the ids are unknown: the name never throws.
    chem::RecipeRequest req;
    req.target_ph = request["target_ph"].toDouble();
    const QString route = request["route"].toString();
    req.route = route == "titrate"  ? chem::Route::titrate
                : route == "stocks" ? chem::Route::stocks
                                    : chem::Route::mix;
    req.acid = request["acid"].toString().toStdString();
    req.base = request["base"].toString().toStdString();
    req.weigh = request["weigh"].toString().toStdString();
    req.titrant = request["titrant"].toString().toStdString();
    if (request.contains("concentration_mol_per_l"))
        req.concentration_mol_per_l = request["concentration_mol_per_l"].toDouble();
    if (request.contains("ionic_strength_mol_per_l"))
        req.ionic_strength_mol_per_l = request["ionic_strength_mol_per_l"].toDouble();
    QCOMPARE(QString::fromStdString(chem::default_buffer_name(lib(), req)), name);
}

// A recipe asked for by ionic strength is made at the concentration that gives it: the solution as
// made (the predicted speciation, solved afresh) has that ionic strength to 1e-9, whichever
// route designs it (the search over the concentration is the recipe's own, so this holds it to
// its definition; no outside value is involved).
void TestRecipe::ionicStrengthTargetIsMetOnEveryRoute() {
    const QList<QJsonObject> requests = {{{"target_ph", 4.6},
                                          {"route", "mix"},
                                          {"acid", "acetic-acid"},
                                          {"base", "sodium-acetate"},
                                          {"ionic_strength_mol_per_l", 0.05}},
                                         {{"target_ph", 2.5},
                                          {"route", "mix"},
                                          {"acid", "phosphoric-acid"},
                                          {"base", "potassium-dihydrogen-phosphate"},
                                          {"ionic_strength_mol_per_l", 0.02}},
                                         {{"target_ph", 7.0},
                                          {"route", "mix"},
                                          {"acid", "potassium-dihydrogen-phosphate"},
                                          {"base", "dipotassium-hydrogen-phosphate"},
                                          {"ionic_strength_mol_per_l", 0.15}},
                                         {{"target_ph", 8.1},
                                          {"route", "titrate"},
                                          {"weigh", "tris"},
                                          {"titrant", "hydrochloric-acid"},
                                          {"titrant_mol_per_l", 1.0},
                                          {"ionic_strength_mol_per_l", 0.03}}};
    for (const QJsonObject& req : requests) {
        const QJsonObject out = recipe(req);
        const double want = req["ionic_strength_mol_per_l"].toDouble();
        const double got = out["ionic_strength_mol_per_l"].toDouble();
        QVERIFY2(std::abs(got - want) <= 1e-9 * want,
                 qPrintable(QString("%1: %2 against %3")
                                .arg(QJsonDocument(req).toJson(QJsonDocument::Compact))
                                .arg(got, 0, 'g', 15)
                                .arg(want)));
        QVERIFY(std::abs(out["ph"].toDouble() - req["target_ph"].toDouble()) < 0.005);
    }
}

void TestRecipe::bufferingRangeUsesConditionalPka() {
    // Phosphate pK2 7.20 (Goldberg et al. 2002, from memory) becomes pKa′ = pK2 + 3·log10 γ(1)
    // ≈ 6.88 at I = 0.1 mol/L (Davies). pH 5.95 lies 1.25 below pK2 (outside ±1 by the
    // thermodynamic value) but 0.93 below pKa′ at about I = 0.1: no warning; pH 8.1 lies
    // within 1 of pK2 but 1.2 above pKa′: warned.
    const auto r = [](double ph, double c) {
        return recipe({{"target_ph", ph},
                       {"route", "mix"},
                       {"acid", "potassium-dihydrogen-phosphate"},
                       {"base", "dipotassium-hydrogen-phosphate"},
                       {"concentration_mol_per_l", c}});
    };
    const QJsonObject high = r(8.1, 0.05);
    QVERIFY(has_warning(high, "ph-outside-pka-range"));
    for (const auto& w : high["warnings"].toArray())
        if (w.toObject()["code"] == "ph-outside-pka-range")
            QVERIFY2(w.toObject()["message"].toString().contains("pKa′"),
                     qPrintable(w.toObject()["message"].toString()));
    QVERIFY(!has_warning(r(5.95, 0.1), "ph-outside-pka-range"));
}

void TestRecipe::stepsStateThePhWhereItIsRead() {
    // Titrate tris with HCl to pH 8.1: the meter is read in about 80 % of the volume plus the
    // titrant, where the buffer is more concentrated. The step states the pH predicted there,
    // which must equal solve() of the composition scaled to that volume, and the final pH.
    const QJsonObject in{{"target_ph", 8.1},         {"route", "titrate"},
                         {"weigh", "tris"},          {"titrant", "hydrochloric-acid"},
                         {"titrant_mol_per_l", 1.0}, {"concentration_mol_per_l", 0.05},
                         {"volume_ml", 1000}};
    const QJsonObject out = recipe(in);
    const double titrant_ml = item(out, "hydrochloric-acid")["volume_ml"].toDouble();
    const double check_ml = std::round(800.0 + titrant_ml);
    QJsonArray comp = out["composition"].toArray();
    for (int i = 0; i < comp.size(); ++i) {
        QJsonObject c = comp[i].toObject();
        c["mol_per_l"] = c["mol_per_l"].toDouble() * 1000.0 / (800.0 + titrant_ml);
        comp[i] = c;
    }
    const QJsonObject s =
        phaseplan::command_solve(shipped_data(), {{"temperature_c", 25}, {"components", comp}}, {});
    const QString expected = QString("meter reads pH %1").arg(s["ph"].toDouble(), 0, 'f', 2);
    bool found = false;
    for (const auto& st : out["steps"].toArray()) {
        const QString t = st.toString();
        if (t.contains("meter reads")) {
            found = true;
            QVERIFY2(t.contains(expected), qPrintable(t + " / " + expected));
            QVERIFY2(t.contains("pH 8.10 after making up"), qPrintable(t));
            QVERIFY2(t.contains(QString::number(check_ml, 'f', 0) + " mL"), qPrintable(t));
        }
    }
    QVERIFY(found);
    // The stocks route is made up first and read at the final volume.
    const QJsonObject stocks = recipe({{"target_ph", 7.0},
                                       {"route", "stocks"},
                                       {"volume_ml", 250},
                                       {"acid", "potassium-dihydrogen-phosphate"},
                                       {"base", "dipotassium-hydrogen-phosphate"},
                                       {"acid_stock_mol_per_l", 0.5},
                                       {"base_stock_mol_per_l", 0.5},
                                       {"concentration_mol_per_l", 0.05}});
    const QJsonArray st = stocks["steps"].toArray();
    int make_up = -1, check = -1;
    for (int i = 0; i < st.size(); ++i) {
        if (st[i].toString().startsWith("Make up"))
            make_up = i;
        if (st[i].toString().startsWith("Check the pH"))
            check = i;
    }
    QVERIFY(make_up >= 0 && check > make_up);
}

void TestRecipe::stepsAreDataNumberedOnlyWhereShown() {
    // chem::Step carries its kind and the amount it measures; the sentence is unnumbered and
    // each place that shows steps numbers them once. The demo line (a phosphate buffer part and
    // acetonitrile) as a batch: its buffer's steps and its own, as the screen and the sheet list
    // them. Common practice, no source: a step list is numbered once, by what shows it.
    QFile f(SOURCE_DIR "/data/demo/line-phosphate-acetonitrile.json");
    QVERIFY(f.open(QIODevice::ReadOnly));
    QJsonObject in = QJsonDocument::fromJson(f.readAll()).object();
    in["batch"] = QJsonObject{
        {"id", "T-1"}, {"prepared_by", "T. Tester"}, {"prepared_at", "2026-12-02T16:30:00"}};
    const phaseplan::BatchDocument d = phaseplan::read_batch_document(shipped_data(), in);
    QVERIFY(d.line && d.line->buffer);
    const auto& line_steps = d.line->steps;
    QCOMPARE(line_steps.front().kind, chem::StepKind::prepare_buffer);
    QCOMPARE(line_steps.back().kind, chem::StepKind::mix_degas_and_label);
    QCOMPARE(d.steps.size(), 2);
    static const QRegularExpression numbered("^\\s*\\d+\\.");
    for (const auto& section : d.steps)
        for (const QString& s : section.steps)
            QVERIFY2(!numbered.match(s).hasMatch(), qPrintable(section.heading + ": " + s));
    QCOMPARE(d.steps[1].steps.size(), qsizetype(line_steps.size()));
    // The command line's `line` output keeps its "1. …" numbering.
    QCOMPARE(chem::numbered_step_texts(line_steps).front(), "1. " + line_steps.front().text);

    // The buffer part's weighing and measuring steps name the reagent and carry the amount of
    // the recipe's item; the degassing step the sheet adds goes before the label step.
    const chem::Recipe& buffer = *d.line->buffer;
    int measured = 0;
    for (const chem::Step& st : buffer.steps) {
        if (st.kind != chem::StepKind::dissolve_solid && st.kind != chem::StepKind::add_liquid)
            continue;
        ++measured;
        bool matched = false;
        for (const chem::RecipeItem& it : buffer.items)
            if (it.reagent == st.reagent) {
                matched = true;
                QCOMPARE(st.mass_g, it.mass_g);
                if (st.kind == chem::StepKind::add_liquid)
                    QCOMPARE(st.volume_ml, it.volume_ml);
            }
        QVERIFY2(matched, st.reagent.c_str());
    }
    QCOMPARE(measured, 2); // phosphoric acid (liquid) and the dihydrogen phosphate (solid)
    const QStringList shown = phaseplan::recipe_steps(buffer);
    QCOMPARE(shown.size(), qsizetype(buffer.steps.size() + 1));
    const int degas = shown.indexOf(QRegularExpression("^Degas before use.*"));
    QVERIFY(degas >= 0);
    QCOMPARE(shown.at(degas + 1), QString::fromStdString(buffer.steps.back().text));
    QCOMPARE(buffer.steps.back().kind, chem::StepKind::label);
}

QTEST_GUILESS_MAIN(TestRecipe)
#include "tst_recipe.moc"
