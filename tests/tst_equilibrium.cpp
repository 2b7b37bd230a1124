// The speciation solver against published reference values and its own invariants.
#include "chem/equilibrium.h"
#include "chem/error.h"
#include "chem/units.h"
#include "chem/water.h"
#include "core/chem_json.h"
#include "test_support.h"

#include <QJsonArray>
#include <QtTest>

#include <cmath>

using phaseplan::testing::shipped_data;

namespace {
const chem::Library& lib() {
    return shipped_data().reagents;
}
const chem::Reagent* R(const char* id) {
    return &lib().reagent(id);
}
} // namespace

class TestEquilibrium : public QObject {
    Q_OBJECT
  private slots:
    void referenceBuffers_data();
    void referenceBuffers();
    void waterIonProduct_data();
    void waterIonProduct();
    void debyeHuckelA_data();
    void debyeHuckelA();
    void pureWaterIsNeutral();
    void dilutePhosphateApproachesHendersonHasselbalch();
    void limitingLawSlope();
    void hydrochloricAcidActivity();
    void phRisesMonotonicallyWithStrongBase();
    void chargeAndMassBalanceHold_data();
    void chargeAndMassBalanceHold();
    void bufferCapacityMatchesFiniteDifference();
    void extremeInputsNeverGiveNaN();
    void badInputNamesTheField();
    void sitReferenceBuffers_data();
    void sitReferenceBuffers();
    void sitMeanActivityCoefficients_data();
    void sitMeanActivityCoefficients();
    void daviesAndSitDisagreementIsWarned();
    void molalAndMolarA();
    void goodsBuffersAgainstGoldberg_data();
    void goodsBuffersAgainstGoldberg();
    void newReagentsSolve();
    void standardsPkaFollowTheirEquations_data();
    void standardsPkaFollowTheirEquations();
};

// IUPAC/NIST primary pH reference buffers (rows from tests/data/reference_buffers.json; the
// source is named in that file). The Davies model holds to ~0.02 pH at I <= 0.1 mol/L.
void TestEquilibrium::referenceBuffers_data() {
    QTest::addColumn<QJsonArray>("components");
    QTest::addColumn<double>("temperature_c");
    QTest::addColumn<double>("published_ph");
    QTest::addColumn<double>("tolerance");
    const QJsonObject doc = phaseplan::testing::read_json(TESTS_DATA_DIR "/reference_buffers.json");
    const double tol = doc["tolerance_ph"].toDouble();
    for (const auto& b : doc["buffers"].toArray()) {
        const QJsonObject o = b.toObject();
        const QJsonObject ph = o["ph"].toObject();
        for (auto it = ph.begin(); it != ph.end(); ++it) {
            const QByteArray tag = (o["name"].toString() + " @ " + it.key() + " C").toUtf8();
            QTest::newRow(tag.constData())
                << o["components"].toArray() << it.key().toDouble() << it.value().toDouble() << tol;
        }
    }
}

void TestEquilibrium::referenceBuffers() {
    QFETCH(QJsonArray, components);
    QFETCH(double, temperature_c);
    QFETCH(double, published_ph);
    QFETCH(double, tolerance);
    double t = 0;
    QJsonObject doc{{"temperature_c", temperature_c}, {"components", components}};
    const auto comps = phaseplan::components_from_json(lib(), doc, "", &t);
    const chem::Speciation s = chem::solve(lib(), comps, t);
    QVERIFY2(s.ionic_strength_mol_per_l <= 0.1 + 1e-6, "reference buffers here have I <= 0.1");
    QVERIFY2(
        std::abs(s.ph - published_ph) <= tolerance,
        qPrintable(QString("computed pH %1, published %2").arg(s.ph, 0, 'f', 4).arg(published_ph)));
}

// pKw of water: H. S. Harned & B. B. Owen, The Physical Chemistry of Electrolytic Solutions,
// 3rd ed. (1958), Table 15-2-1A (from memory). Our formula is the Harned & Robinson (1940) fit.
void TestEquilibrium::waterIonProduct_data() {
    QTest::addColumn<double>("temperature_c");
    QTest::addColumn<double>("published_pkw");
    QTest::newRow("0 C") << 0.0 << 14.9435;
    QTest::newRow("10 C") << 10.0 << 14.5346;
    QTest::newRow("20 C") << 20.0 << 14.1669;
    QTest::newRow("25 C") << 25.0 << 13.9965;
    QTest::newRow("30 C") << 30.0 << 13.8330;
    QTest::newRow("40 C") << 40.0 << 13.5348;
    QTest::newRow("50 C") << 50.0 << 13.2617;
    QTest::newRow("60 C") << 60.0 << 13.0171;
}

void TestEquilibrium::waterIonProduct() {
    QFETCH(double, temperature_c);
    QFETCH(double, published_pkw);
    const double pkw = chem::pkw(chem::to_kelvin(temperature_c));
    QVERIFY2(std::abs(pkw - published_pkw) < 0.01, qPrintable(QString::number(pkw, 'f', 4)));
}

// Debye–Hückel A for log10 γ: R. A. Robinson & R. H. Stokes, Electrolyte Solutions, 2nd ed.
// (1959), Appendix 7.1 (from memory); tolerance 0.005 covers the permittivity data used.
void TestEquilibrium::debyeHuckelA_data() {
    QTest::addColumn<double>("temperature_c");
    QTest::addColumn<double>("published_a");
    QTest::newRow("0 C") << 0.0 << 0.4918;
    QTest::newRow("25 C") << 25.0 << 0.5115;
    QTest::newRow("50 C") << 50.0 << 0.5373;
}

void TestEquilibrium::debyeHuckelA() {
    QFETCH(double, temperature_c);
    QFETCH(double, published_a);
    const double a = chem::debye_huckel_a(chem::to_kelvin(temperature_c));
    QVERIFY2(std::abs(a - published_a) < 0.005, qPrintable(QString::number(a, 'f', 4)));
}

void TestEquilibrium::pureWaterIsNeutral() {
    // A trace of a neutral salt: pH = pKw/2 (activity scale) at 25 and 50 °C.
    for (double t : {25.0, 50.0}) {
        const auto s = chem::solve(lib(), {{R("sodium-chloride"), 1e-9}}, t);
        QVERIFY(std::abs(s.ph - chem::pkw(chem::to_kelvin(t)) / 2) < 1e-4);
    }
}

void TestEquilibrium::dilutePhosphateApproachesHendersonHasselbalch() {
    // Henderson–Hasselbalch limit: as I -> 0 (and with the buffer far above [H+], [OH-]),
    // pH -> pKa2 + log10(c_base / c_acid). pKa2 is the library's own value, so this checks the
    // solver, not the data.
    const double pka2 = lib().system("phosphate").pka_at(1, chem::reference_temperature_k);
    const double ratio = 1.0;
    double previous_gap = 1;
    for (double c : {1e-2, 1e-3, 1e-4, 1e-5}) {
        const auto s = chem::solve(lib(),
                                   {{R("potassium-dihydrogen-phosphate"), c},
                                    {R("disodium-hydrogen-phosphate"), ratio * c}},
                                   25);
        const double gap = std::abs(s.ph - (pka2 + std::log10(ratio)));
        QVERIFY2(gap < previous_gap, "the deviation from Henderson-Hasselbalch must shrink with I");
        previous_gap = gap;
    }
    QVERIFY2(previous_gap < 0.02, qPrintable(QString::number(previous_gap)));
}

void TestEquilibrium::limitingLawSlope() {
    // Debye–Hückel limiting law (P. Debye & E. Hückel, Phys. Z. 24 (1923) 185): for the
    // H2PO4-/HPO4-2 pair, pH − pKa2 − log10(cb/ca) = log γ(HPO4-2) − log γ(H2PO4-) → −3A√I.
    const double a = chem::debye_huckel_a(chem::reference_temperature_k);
    const double pka2 = lib().system("phosphate").pka_at(1, chem::reference_temperature_k);
    const double c = 2e-4;
    const auto s = chem::solve(
        lib(), {{R("potassium-dihydrogen-phosphate"), c}, {R("disodium-hydrogen-phosphate"), c}},
        25);
    const double ratio = s.concentration_of("HPO4-2") / s.concentration_of("H2PO4-");
    const double shift = s.ph - pka2 - std::log10(ratio);
    const double limiting = -3 * a * std::sqrt(s.ionic_strength_mol_per_l);
    QVERIFY2(std::abs(shift / limiting - 1) < 0.05, qPrintable(QString::number(shift / limiting)));
}

void TestEquilibrium::hydrochloricAcidActivity() {
    // 0.01 mol/kg HCl: mean activity coefficient 0.904 at 25 °C (Harned & Owen 1958, Table 11-4-1A,
    // from memory), so pH = −log10(0.01 · 0.904) = 2.044.
    const auto s = chem::solve(lib(), {{R("hydrochloric-acid"), 0.01}}, 25);
    QVERIFY2(std::abs(s.ph - 2.044) < 0.005, qPrintable(QString::number(s.ph, 'f', 4)));
}

void TestEquilibrium::phRisesMonotonicallyWithStrongBase() {
    double last = -100;
    for (int i = 0; i <= 60; ++i) {
        std::vector<chem::Component> comps = {{R("potassium-dihydrogen-phosphate"), 0.05},
                                              {R("citric-acid"), 0.01}};
        if (i > 0)
            comps.push_back({R("sodium-hydroxide"), 0.0025 * i});
        const auto s = chem::solve(lib(), comps, 25);
        QVERIFY2(s.ph > last,
                 qPrintable(QString("step %1: pH %2 after %3").arg(i).arg(s.ph).arg(last)));
        last = s.ph;
    }
}

void TestEquilibrium::chargeAndMassBalanceHold_data() {
    QTest::addColumn<QStringList>("ids");
    QTest::addColumn<QList<double>>("amounts");
    QTest::addColumn<double>("temperature_c");
    QTest::newRow("three systems")
        << QStringList{"ammonium-acetate", "sodium-dihydrogen-phosphate", "tris"}
        << QList<double>{0.01, 0.02, 0.015} << 25.0;
    QTest::newRow("borax + glycine at 5 C")
        << QStringList{"sodium-tetraborate-decahydrate", "glycine"} << QList<double>{0.01, 0.03}
        << 5.0;
    QTest::newRow("citrate + HCl at 55 C")
        << QStringList{"trisodium-citrate-dihydrate", "hydrochloric-acid"}
        << QList<double>{0.05, 0.04} << 55.0;
    QTest::newRow("carbonate + ammonia")
        << QStringList{"ammonium-bicarbonate", "ammonia"} << QList<double>{0.01, 0.01} << 25.0;
}

void TestEquilibrium::chargeAndMassBalanceHold() {
    QFETCH(QStringList, ids);
    QFETCH(QList<double>, amounts);
    QFETCH(double, temperature_c);
    std::vector<chem::Component> comps;
    for (int i = 0; i < ids.size(); ++i)
        comps.push_back({R(ids[i].toUtf8().constData()), amounts[i]});
    const auto s = chem::solve(lib(), comps, temperature_c);
    double charge = 0, scale = 0, ionic = 0;
    for (const auto& sp : s.species) {
        charge += sp.charge * sp.mol_per_l;
        scale += std::abs(sp.charge) * sp.mol_per_l;
        ionic += 0.5 * sp.charge * sp.charge * sp.mol_per_l;
        QVERIFY(std::isfinite(sp.mol_per_l) && sp.mol_per_l >= 0);
        QVERIFY(sp.activity_coefficient > 0 && sp.activity_coefficient <= 1);
    }
    QVERIFY2(std::abs(charge) <= 1e-9 * scale, qPrintable(QString::number(charge)));
    QVERIFY(std::abs(ionic - s.ionic_strength_mol_per_l) <= 1e-8 * ionic);
    // Mass balance per system.
    for (const auto& c : comps)
        for (const auto& share : c.reagent->systems) {
            double expected = 0;
            for (const auto& c2 : comps)
                if (const auto* sh = c2.reagent->share(share.system))
                    expected += sh->count * c2.mol_per_l;
            double found = 0;
            for (const auto& sp : s.species)
                if (sp.system == share.system)
                    found += sp.mol_per_l;
            QVERIFY2(std::abs(found - expected) <= 1e-12 + 1e-10 * expected, share.system.c_str());
        }
}

void TestEquilibrium::bufferCapacityMatchesFiniteDifference() {
    // β = dC_base/dpH: compare the analytic value with a small NaOH addition.
    const std::vector<chem::Component> base = {{R("sodium-acetate"), 0.02},
                                               {R("acetic-acid"), 0.02}};
    const auto s0 = chem::solve(lib(), base, 25);
    const double delta = 1e-6;
    auto more = base;
    more.push_back({R("sodium-hydroxide"), delta});
    const auto s1 = chem::solve(lib(), more, 25);
    const double beta_fd = delta / (s1.ph - s0.ph);
    // β is defined at constant activity coefficients (Van Slyke's buffer value); the real addition
    // also raises I, which at I = 0.02 mol/L moves the pH by about 3 % of the step. Hence 5 %.
    QVERIFY2(std::abs(beta_fd / s0.buffer_capacity_mol_per_l - 1) < 0.05,
             qPrintable(QString("%1 vs %2").arg(beta_fd).arg(s0.buffer_capacity_mol_per_l)));
    // Van Slyke at the pKa with γ ignored: β ≈ ln10 · C/4 = 0.0230 mol/L for C = 0.04.
    QVERIFY(std::abs(s0.buffer_capacity_mol_per_l - 0.0230) < 0.002);
}

void TestEquilibrium::extremeInputsNeverGiveNaN() {
    const std::vector<std::vector<chem::Component>> cases = {
        {{R("hydrochloric-acid"), 10}},
        {{R("sodium-hydroxide"), 10}},
        {{R("acetic-acid"), 1e-12}},
        {{R("phosphoric-acid"), 5}, {R("sodium-hydroxide"), 9}, {R("tris"), 3}},
        {{R("trifluoroacetic-acid"), 1}, {R("triethylamine"), 1}},
    };
    for (const auto& c : cases) {
        for (double t : {0.0, 60.0}) {
            try {
                const auto s = chem::solve(lib(), c, t);
                QVERIFY(std::isfinite(s.ph) && std::isfinite(s.ionic_strength_mol_per_l) &&
                        std::isfinite(s.buffer_capacity_mol_per_l));
            } catch (const chem::Error& e) {
                QVERIFY(!e.field().empty());
            }
        }
    }
}

void TestEquilibrium::badInputNamesTheField() {
    auto expect = [](auto fn, const std::string& field) {
        try {
            fn();
            QFAIL(("no error for " + field).c_str());
        } catch (const chem::Error& e) {
            QCOMPARE(QString::fromStdString(e.field()), QString::fromStdString(field));
        }
    };
    expect([] { chem::solve(lib(), {{R("tris"), 0.01}}, 61); }, "temperature_c");
    expect([] { chem::solve(lib(), {{R("tris"), 0.01}}, -1); }, "temperature_c");
    expect(
        [] {
            chem::solve(lib(), {{R("tris"), 0.01}, {R("tris"), -0.2}}, 25);
        },
        "components[1].mol_per_l");
    expect([] { chem::solve(lib(), {{R("tris"), 11}}, 25); }, "components[0].mol_per_l");
    expect([] { chem::solve(lib(), {{R("tris"), std::nan("")}}, 25); }, "components[0].mol_per_l");
    expect([] { chem::solve(lib(), {}, 25); }, "components");
}

// The IUPAC/NIST primary standards (tests/data/reference_buffers.json, source named there) with the
// SIT model. The standards are molal: c = m · ρ_w(T), which the solver turns back into m. Their
// pH values rest on the Bates–Guggenheim convention, the Debye–Hückel term of SIT.
void TestEquilibrium::sitReferenceBuffers_data() {
    QTest::addColumn<QJsonArray>("components");
    QTest::addColumn<double>("temperature_c");
    QTest::addColumn<double>("published_ph");
    QTest::addColumn<double>("tolerance");
    const QJsonObject doc = phaseplan::testing::read_json(TESTS_DATA_DIR "/reference_buffers.json");
    const QJsonObject tol = doc["tolerance_ph_sit"].toObject();
    for (const auto& b : doc["buffers"].toArray()) {
        const QJsonObject o = b.toObject();
        const double t_ok = tol.contains(o["name"].toString())
                                ? tol[o["name"].toString()].toDouble()
                                : tol["default"].toDouble();
        const QJsonObject ph = o["ph"].toObject();
        for (auto it = ph.begin(); it != ph.end(); ++it) {
            const QByteArray tag = (o["name"].toString() + " @ " + it.key() + " C").toUtf8();
            QTest::newRow(tag.constData()) << o["components"].toArray() << it.key().toDouble()
                                           << it.value().toDouble() << t_ok;
        }
    }
}

void TestEquilibrium::sitReferenceBuffers() {
    QFETCH(QJsonArray, components);
    QFETCH(double, temperature_c);
    QFETCH(double, published_ph);
    QFETCH(double, tolerance);
    const double rho = chem::water_density_g_per_ml(chem::to_kelvin(temperature_c));
    std::vector<chem::Component> comps;
    for (const auto& c : components)
        comps.push_back({R(c.toObject()["reagent"].toString().toUtf8().constData()),
                         c.toObject()["mol_per_l"].toDouble() * rho});
    const chem::Speciation s = chem::solve(lib(), comps, temperature_c, chem::ActivityModel::sit);
    QVERIFY2(
        std::abs(s.ph - published_ph) <= tolerance,
        qPrintable(QString("computed pH %1, published %2").arg(s.ph, 0, 'f', 4).arg(published_ph)));
}

// Mean activity coefficients at 25 °C: R. A. Robinson & R. H. Stokes, Electrolyte Solutions, 2nd
// ed. (1959), Appendix 8.10 (from memory); Na2HPO4 0.1 mol/kg 0.463 as quoted in issue 11 (its
// 0.5 and 1 mol/kg values are not recalled). SIT with the NEA-TDB ε (data/reagents.json) holds
// NaCl and KCl within 4 %; NaH2PO4 is 11 % high at 1 mol/kg (the ε of -0.08 kg/mol does not carry
// the salt's association), still far closer than Davies (+69 %). Rows at 0.5 and 1 mol/kg also
// check that SIT beats Davies.
void TestEquilibrium::sitMeanActivityCoefficients_data() {
    QTest::addColumn<QString>("salt");
    QTest::addColumn<double>("mol_per_kg");
    QTest::addColumn<double>("published");
    QTest::addColumn<double>("relative_tolerance");
    QTest::newRow("NaCl 0.1") << "sodium-chloride" << 0.1 << 0.778 << 0.02;
    QTest::newRow("NaCl 0.5") << "sodium-chloride" << 0.5 << 0.681 << 0.03;
    QTest::newRow("NaCl 1.0") << "sodium-chloride" << 1.0 << 0.657 << 0.03;
    QTest::newRow("KCl 0.1") << "potassium-chloride" << 0.1 << 0.770 << 0.02;
    QTest::newRow("KCl 0.5") << "potassium-chloride" << 0.5 << 0.649 << 0.04;
    QTest::newRow("KCl 1.0") << "potassium-chloride" << 1.0 << 0.604 << 0.04;
    QTest::newRow("NaH2PO4 0.1") << "sodium-dihydrogen-phosphate" << 0.1 << 0.744 << 0.03;
    QTest::newRow("NaH2PO4 0.5") << "sodium-dihydrogen-phosphate" << 0.5 << 0.563 << 0.09;
    QTest::newRow("NaH2PO4 1.0") << "sodium-dihydrogen-phosphate" << 1.0 << 0.468 << 0.12;
    QTest::newRow("Na2HPO4 0.1") << "disodium-hydrogen-phosphate" << 0.1 << 0.463 << 0.03;
}

void TestEquilibrium::sitMeanActivityCoefficients() {
    QFETCH(QString, salt);
    QFETCH(double, mol_per_kg);
    QFETCH(double, published);
    QFETCH(double, relative_tolerance);
    const double rho = chem::water_density_g_per_ml(chem::reference_temperature_k);
    const chem::Reagent* r = R(salt.toUtf8().constData());
    auto mean = [&](chem::ActivityModel m) {
        const auto s = chem::solve(lib(), {{r, mol_per_kg * rho}}, 25, m);
        // The salt's own ions: the cation and the anion present in the largest amount.
        double log_sum = 0, n = 0;
        const chem::SpeciesAmount* anion = nullptr;
        for (const auto& sp : s.species)
            if (sp.charge < 0 && sp.species != "OH-" && (!anion || sp.mol_per_l > anion->mol_per_l))
                anion = &sp;
        for (const auto& sp : r->spectators)
            if (sp.charge > 0) {
                for (const auto& x : s.species)
                    if (x.species == sp.ion) {
                        log_sum += sp.count * std::log(x.activity_coefficient);
                        n += sp.count;
                    }
            }
        log_sum += std::log(anion->activity_coefficient);
        n += 1;
        return std::exp(log_sum / n);
    };
    const double sit = mean(chem::ActivityModel::sit), davies = mean(chem::ActivityModel::davies);
    QVERIFY2(std::abs(sit / published - 1) <= relative_tolerance,
             qPrintable(QString("SIT %1, published %2").arg(sit, 0, 'f', 4).arg(published)));
    if (mol_per_kg >= 0.5) // at 0.1 mol/kg both lie within 1 %
        QVERIFY2(std::abs(sit - published) < std::abs(davies - published),
                 qPrintable(QString("SIT %1 not closer than Davies %2").arg(sit).arg(davies)));
}

void TestEquilibrium::daviesAndSitDisagreementIsWarned() {
    auto has = [](const chem::Speciation& s) {
        for (const auto& w : s.warnings)
            if (w.code == "activity-model-differs")
                return true;
        return false;
    };
    // 0.5 mol/L phosphate buffer: the models part by several hundredths.
    const std::vector<chem::Component> strong = {{R("potassium-dihydrogen-phosphate"), 0.25},
                                                 {R("disodium-hydrogen-phosphate"), 0.25}};
    const auto a = chem::solve(lib(), strong, 25, chem::ActivityModel::davies);
    const auto b = chem::solve(lib(), strong, 25, chem::ActivityModel::sit);
    QVERIFY2(std::abs(a.ph - b.ph) > 0.02, qPrintable(QString::number(a.ph - b.ph)));
    QVERIFY(has(a) && has(b));
    QCOMPARE(b.activity_model, chem::ActivityModel::sit);
    // 10 mmol/L acetate: they agree, no warning.
    const std::vector<chem::Component> weak = {{R("acetic-acid"), 0.01},
                                               {R("sodium-acetate"), 0.01}};
    QVERIFY(!has(chem::solve(lib(), weak, 25, chem::ActivityModel::davies)));
    QVERIFY(!has(chem::solve(lib(), weak, 25, chem::ActivityModel::sit)));
}

void TestEquilibrium::molalAndMolarA() {
    // A on the molar scale with Malmberg & Maryott's permittivity reproduces Robinson & Stokes'
    // (molar) table within 0.001; the molal A is A·√ρ_w (0.5107 at 25 °C).
    const double t = chem::reference_temperature_k;
    QVERIFY(std::abs(chem::debye_huckel_a(t) - 0.5115) < 0.001);
    QVERIFY(std::abs(chem::debye_huckel_a_molal(t) -
                     chem::debye_huckel_a(t) * std::sqrt(chem::water_density_g_per_ml(t))) < 1e-12);
    QVERIFY(std::abs(chem::debye_huckel_a_molal(t) - 0.5107) < 0.0005);

    // The molal A from the fundamental constants (CODATA 2018, exact SI values for e, k and N_A;
    // ε0 = 8.8541878128e-12 F/m): A_m = (2π N_A ρ_w)^1/2 (e²/(4π ε0 ε_r k T))^3/2 / ln 10 with ρ_w
    // in kg/m³ and I in mol/kg, ε_r and ρ_w from the same water functions. This pins the
    // constant 1.82483e6 and the √ρ_w that turns the molar A into the molal one.
    for (const double tc : {0.0, 25.0, 50.0}) {
        const double tk = chem::to_kelvin(tc);
        const double e = 1.602176634e-19, k = 1.380649e-23, na = 6.02214076e23,
                     eps0 = 8.8541878128e-12;
        const double bjerrum_m =
            e * e / (4 * M_PI * eps0 * chem::water_permittivity(tk) * k * tk); // m
        const double a_m = std::sqrt(2 * M_PI * na * 1000 * chem::water_density_g_per_ml(tk)) *
                           std::pow(bjerrum_m, 1.5) / std::log(10.0);
        QVERIFY2(std::abs(chem::debye_huckel_a_molal(tk) / a_m - 1) < 2e-5,
                 qPrintable(QString("%1 °C: %2 against %3")
                                .arg(tc)
                                .arg(chem::debye_huckel_a_molal(tk), 0, 'f', 5)
                                .arg(a_m, 0, 'f', 5)));
        // The molar A is the same constant per litre of solution: A_m / √ρ_w.
        QVERIFY(std::abs(chem::debye_huckel_a(tk) -
                         a_m / std::sqrt(chem::water_density_g_per_ml(tk))) < 2e-5);
    }
    // Published molal values at 25 °C. The differences come from water's permittivity: Malmberg &
    // Maryott give 78.30, Archer & Wang 78.38 and Helgeson & Kirkham about 78.47.
    // - Archer & Wang, J. Phys. Chem. Ref. Data 19 (1990) 371: A_φ = 0.3915 (kg/mol)^1/2, so
    //   A = 3 A_φ / ln 10 = 0.5101 (from memory).
    QVERIFY(std::abs(chem::debye_huckel_a_molal(t) - 0.5101) < 0.001);
    // - OECD NEA TDB (Grenthe et al. 1992; Guillaumont et al. 2003, appendix B, the A of its SIT):
    //   A = 0.5091 (kg/mol)^1/2 at 25 °C (from memory); 0.3 % below, the permittivity again.
    QVERIFY(std::abs(chem::debye_huckel_a_molal(t) - 0.5091) < 0.002);
    // Neither published molal value matches the molar one within the 0.001 above: the two scales
    // are not interchangeable at this precision.
    QVERIFY(std::abs(chem::debye_huckel_a(t) - 0.5101) > 0.0005);
}

// Good's buffers at 25 °C, infinite dilution: R. N. Goldberg, N. Kishore & R. M. Lennen,
// J. Phys. Chem. Ref. Data 31 (2002) 231, Table 2 (from memory). The library's pKa(T) must
// reproduce pKa(25 °C) and the van 't Hoff slope −ΔH/(R ln10 T²) at 25 °C.
void TestEquilibrium::goodsBuffersAgainstGoldberg_data() {
    QTest::addColumn<QString>("system");
    QTest::addColumn<double>("pka");
    QTest::addColumn<double>("enthalpy_kj_per_mol");
    QTest::newRow("MES") << "mes" << 6.270 << 14.8;
    QTest::newRow("HEPES") << "hepes" << 7.564 << 20.4;
    QTest::newRow("MOPS") << "mops" << 7.184 << 21.1;
    QTest::newRow("Bis-Tris") << "bis-tris" << 6.484 << 28.4;
}

void TestEquilibrium::goodsBuffersAgainstGoldberg() {
    QFETCH(QString, system);
    QFETCH(double, pka);
    QFETCH(double, enthalpy_kj_per_mol);
    const chem::AcidBaseSystem& s = lib().system(system.toStdString());
    const double t0 = chem::reference_temperature_k;
    QVERIFY(std::abs(s.pka_at(0, t0) - pka) < 1e-9);
    const double h = 1e-3;
    const double slope = (s.pka_at(0, t0 + h) - s.pka_at(0, t0 - h)) / (2 * h);
    const double dh = -slope * chem::gas_constant_j_per_mol_k * chem::ln10 * t0 * t0 / 1000;
    QVERIFY2(std::abs(dh - enthalpy_kj_per_mol) < 0.05, qPrintable(QString::number(dh)));
}

void TestEquilibrium::newReagentsSolve() {
    // Every reagent added for issue 11 solves alone at 10 mmol/L, 10 and 50 °C, with the charge
    // balance holding.
    for (const char* id :
         {"mes", "hepes", "mops", "bis-tris", "ammonium-dihydrogen-phosphate",
          "diammonium-hydrogen-phosphate", "perchloric-acid", "sodium-perchlorate", "sulfuric-acid",
          "methanesulfonic-acid", "difluoroacetic-acid", "heptafluorobutyric-acid",
          "hexafluoro-2-propanol", "diisopropylethylamine", "diethylamine", "ammonium-fluoride",
          "sodium-hexanesulfonate", "sodium-octanesulfonate",
          "tetrabutylammonium-hydrogen-sulfate"})
        for (double t : {10.0, 50.0}) {
            const auto s = chem::solve(lib(), {{R(id), 0.01}}, t);
            double charge = 0, scale = 0;
            for (const auto& sp : s.species) {
                charge += sp.charge * sp.mol_per_l;
                scale += std::abs(sp.charge) * sp.mol_per_l;
            }
            QVERIFY2(std::abs(charge) <= 1e-9 * scale, id);
        }
    // 10 mmol/L sulfuric acid: HSO4- pKa 1.99 leaves part of the second proton bound; pH ≈ 1.87
    // (a hand solution of the quadratic with Davies γ, not a published value).
    const auto h2so4 = chem::solve(lib(), {{R("sulfuric-acid"), 0.01}}, 25);
    QVERIFY2(h2so4.ph > 1.75 && h2so4.ph < 1.95, qPrintable(QString::number(h2so4.ph)));
}

QTEST_GUILESS_MAIN(TestEquilibrium)
// The pKa(T) of the two primary standards that SIT misses (carbonate, phthalate) against the
// equations the data were taken from, 0–50 °C: the library keeps pKa(25 °C), ΔrH° and a constant
// ΔrCp° (van 't Hoff), the papers fit pK = a/T + b + c·T. Agreement here rules out the temperature
// data as the cause of the standards' misses (README, IUPAC standards):
// - carbonate step 2: Harned & Scholes, J. Am. Chem. Soc. 63 (1941) 1706,
//   pK2 = 2902.39/T − 6.4980 + 0.02379 T (from memory);
// - phthalate: Hamer, Pinching & Acree, J. Res. NBS 35 (1945) 539 and Hamer & Acree, J. Res.
//   NBS 35 (1945) 381, pK1 = 561.57/T − 1.2843 + 0.0078833 T and
//   pK2 = 2175.83/T − 9.55294 + 0.025694 T (from memory).
void TestEquilibrium::standardsPkaFollowTheirEquations_data() {
    QTest::addColumn<QString>("system");
    QTest::addColumn<int>("step");
    QTest::addColumn<double>("a");
    QTest::addColumn<double>("b");
    QTest::addColumn<double>("c");
    QTest::addColumn<double>("tolerance");
    // The carbonate row allows 0.012: the library's ΔrCp° (Goldberg 2002) bends less than the
    // 1941 fit below 10 °C (0.010 at 0 °C), where the standard misses by the same 0.02 as at
    // 25 °C, so it is not the cause.
    QTest::newRow("carbonate pK2") << "carbonate" << 1 << 2902.39 << -6.4980 << 0.02379 << 0.012;
    QTest::newRow("phthalate pK1") << "phthalate" << 0 << 561.57 << -1.2843 << 0.0078833 << 0.003;
    QTest::newRow("phthalate pK2") << "phthalate" << 1 << 2175.83 << -9.55294 << 0.025694 << 0.005;
}

void TestEquilibrium::standardsPkaFollowTheirEquations() {
    QFETCH(QString, system);
    QFETCH(int, step);
    QFETCH(double, a);
    QFETCH(double, b);
    QFETCH(double, c);
    QFETCH(double, tolerance);
    const chem::AcidBaseSystem& s = lib().system(system.toStdString());
    for (const double tc : {0.0, 10.0, 20.0, 25.0, 30.0, 40.0, 50.0}) {
        const double tk = chem::to_kelvin(tc);
        const double published = a / tk + b + c * tk;
        const double ours = s.pka_at(step, tk);
        QVERIFY2(std::abs(ours - published) <= tolerance,
                 qPrintable(QString("%1 °C: %2 against %3")
                                .arg(tc)
                                .arg(ours, 0, 'f', 4)
                                .arg(published, 0, 'f', 4)));
    }
}

#include "tst_equilibrium.moc"
