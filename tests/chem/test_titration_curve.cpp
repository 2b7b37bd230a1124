// chem::titration_curve: the buffer designer's pH and β curves, on a small acetate library built
// here (no data files: the test reads nothing).
#include "chem/titration_curve.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>

namespace {

/// Acetic acid, thermodynamic pKa 4.756 at 25 °C: Harned & Ehlers, J. Am. Chem. Soc. 55 (1933)
/// 652 (from memory), the value data/reagents.json carries too.
constexpr double acetate_pka = 4.756;

chem::Library acetate_library() {
    chem::Library lib;
    chem::AcidBaseSystem acetate;
    acetate.id = "acetate";
    acetate.name = "Acetate";
    acetate.species = {"CH3COOH", "CH3COO-"};
    acetate.pka_25c = {acetate_pka};
    lib.add_system(acetate);
    chem::Reagent acid;
    acid.id = "acetic-acid";
    acid.name = "Acetic acid";
    acid.molar_mass_g_per_mol = 60.052; // C2H4O2, IUPAC weights (from memory)
    acid.systems = {{"acetate", 1, 0}};
    lib.add_reagent(acid);
    chem::Reagent salt;
    salt.id = "sodium-acetate";
    salt.name = "Sodium acetate";
    salt.molar_mass_g_per_mol = 82.034; // C2H3NaO2 (from memory)
    salt.spectators = {{"Na+", 1, 1}};
    salt.systems = {{"acetate", 1, 1}};
    lib.add_reagent(salt);
    chem::Reagent naoh;
    naoh.id = "sodium-hydroxide";
    naoh.name = "Sodium hydroxide";
    naoh.molar_mass_g_per_mol = 39.997; // (from memory)
    naoh.spectators = {{"Na+", 1, 1}};
    lib.add_reagent(naoh);
    return lib;
}

/// Davies: log10 γ± of a singly charged ion = −A (√I / (1 + √I) − 0.3 I), A ≈ 0.51 (mol/L)^−½
/// in water at 25 °C (Davies, Ion Association, 1962; from memory).
double davies_log_gamma1(double ionic_strength_mol_per_l) {
    const double s = std::sqrt(ionic_strength_mol_per_l);
    return -0.51 * (s / (1 + s) - 0.3 * ionic_strength_mol_per_l);
}

/// A mix-route request: acetic acid and sodium acetate, `total` mol/L together, half each.
chem::TitrationCurveRequest acetate_mix(const chem::Library& lib, double total_mol_per_l) {
    chem::TitrationCurveRequest req;
    req.route = chem::CurveRoute::base_fraction;
    req.rising = lib.find_reagent("sodium-acetate");
    req.falling = lib.find_reagent("acetic-acid");
    req.composition = {{req.falling, total_mol_per_l / 2}, {req.rising, total_mol_per_l / 2}};
    req.temperature_c = 25;
    req.points = 41;
    return req;
}

TEST(TitrationCurve, HalfNeutralisationIsPkaPrime) {
    const chem::Library lib = acetate_library();
    const chem::TitrationCurve c = chem::titration_curve(lib, acetate_mix(lib, 0.1));
    ASSERT_EQ(c.points.size(), 41u);
    EXPECT_EQ(c.x_end, 1);
    EXPECT_DOUBLE_EQ(c.x_recipe, 0.5);
    const chem::TitrationPoint& half = c.points[20];
    EXPECT_DOUBLE_EQ(half.x, 0.5);
    // Henderson–Hasselbalch with activities (from memory): at [A−] = [HA] the pH is
    // pKa' = pKa + log10 γ(A−) (HA neutral, γ = 1). I ≈ 0.05 mol/L (Na+ and A− at 0.05 each).
    // Tolerance 0.005 pH: [H+] ≈ 2e-5 mol/L shifts the ratio by < 0.001 pH, and A is recalled.
    EXPECT_NEAR(half.ionic_strength_mol_per_l, 0.05, 1e-3);
    const double pka_prime = acetate_pka + davies_log_gamma1(half.ionic_strength_mol_per_l);
    EXPECT_NEAR(half.ph, pka_prime, 0.005);
    // The curve rises with the base form (a property of any titration curve).
    for (size_t i = 1; i < c.points.size(); ++i)
        EXPECT_GT(c.points[i].ph, c.points[i - 1].ph) << "point " << i;
}

TEST(TitrationCurve, BetaPeaksNearPka) {
    const chem::Library lib = acetate_library();
    const chem::TitrationCurve c = chem::titration_curve(lib, acetate_mix(lib, 0.1));
    const auto peak = std::max_element(c.points.begin(), c.points.end(), [](auto& a, auto& b) {
        return a.buffer_capacity_mol_per_l < b.buffer_capacity_mol_per_l;
    });
    ASSERT_NE(peak, c.points.end());
    // Van Slyke (1922): a single weak acid's β peaks at pH = pKa' (from memory). The points are
    // 0.025 apart in base fraction, about 0.045 pH near the middle: the peak is within one step.
    const double pka_prime = acetate_pka + davies_log_gamma1(peak->ionic_strength_mol_per_l);
    EXPECT_NEAR(peak->ph, pka_prime, 0.05);
    // At the peak β ≈ 2.303 · C / 4 = 0.0576 mol/L per pH for C = 0.1 mol/L (Van Slyke, from
    // memory); water's own terms add < 1e-4 there.
    EXPECT_NEAR(peak->buffer_capacity_mol_per_l, 2.302585 * 0.1 / 4, 0.001);
}

TEST(TitrationCurve, BetaIsVanSlykeAtAChosenPoint) {
    const chem::Library lib = acetate_library();
    const double c_total = 0.01;
    const chem::TitrationCurve c = chem::titration_curve(lib, acetate_mix(lib, c_total));
    ASSERT_EQ(c.points.size(), 41u);
    const chem::TitrationPoint& p = c.points[10]; // a quarter of the way to the base form
    // Van Slyke, J. Biol. Chem. 52 (1922) 525 (from memory), in concentrations at fixed γ:
    // β = 2.303 ([H+] + [OH−] + C Ka[H+] / (Ka + [H+])²), Ka the concentration constant
    // Ka / γ±² and [H+] = 10^−pH / γ±, Kw = 10^−13.995 at 25 °C (Harned & Robinson, from memory).
    const double lg = davies_log_gamma1(p.ionic_strength_mol_per_l);
    const double gamma = std::pow(10.0, lg);
    const double h = std::pow(10.0, -p.ph) / gamma;
    const double ka = std::pow(10.0, -acetate_pka) / (gamma * gamma);
    const double oh = std::pow(10.0, -13.995) / (gamma * gamma) / h;
    const double beta = 2.302585 * (h + oh + c_total * ka * h / ((ka + h) * (ka + h)));
    EXPECT_NEAR(p.buffer_capacity_mol_per_l, beta, 0.005 * beta); // within 0.5 %
}

TEST(TitrationCurve, TitrantAxisAndEquivalencePoint) {
    const chem::Library lib = acetate_library();
    chem::TitrationCurveRequest req;
    req.route = chem::CurveRoute::titrant;
    req.rising = lib.find_reagent("sodium-hydroxide");
    // The recipe: 0.01 mol/L acetic acid half neutralised by 0.005 mol/L NaOH, given as 5 mL
    // of 1 mol/L NaOH into 1 L: 5 mL / 0.005 mol/L = 1000 mL per mol/L.
    req.composition = {{lib.find_reagent("acetic-acid"), 0.01}, {req.rising, 0.005}};
    req.x_per_mol_per_l = 1000;
    const chem::TitrationCurve c = chem::titration_curve(lib, req);
    // Worked by hand: the axis runs to twice the recipe's titrant, 2 × 0.005 × 1000 = 10 mL;
    // the recipe sits at 5 mL.
    EXPECT_DOUBLE_EQ(c.x_end, 10);
    EXPECT_DOUBLE_EQ(c.x_recipe, 5);
    ASSERT_EQ(c.points.size(), 41u);
    // Half neutralisation at 5 mL (point 20): pKa' as above, I ≈ 0.005 mol/L. Tolerance 0.01:
    // [H+] ≈ 2e-5 is 0.4 % of [A−] here.
    EXPECT_DOUBLE_EQ(c.points[20].x, 5);
    EXPECT_NEAR(c.points[20].ph,
                acetate_pka + davies_log_gamma1(c.points[20].ionic_strength_mol_per_l), 0.01);
    // Equivalence at 10 mL: 0.01 mol/L sodium acetate, pH = 7 + pKa/2 + log10(C)/2 = 8.38
    // (weak base of a weak acid, textbook approximation, from memory); within 0.05.
    EXPECT_NEAR(c.points.back().ph, 7 + acetate_pka / 2 + std::log10(0.01) / 2, 0.05);
}

TEST(TitrationCurve, RefusedPointsAreLeftOutAndNothingToVaryGivesNoCurve) {
    const chem::Library lib = acetate_library();
    chem::TitrationCurveRequest req = acetate_mix(lib, 0.1);
    req.temperature_c = 95; // outside the solver's 0–60 °C: every point is refused
    const chem::TitrationCurve hot = chem::titration_curve(lib, req);
    EXPECT_TRUE(hot.points.empty());
    EXPECT_EQ(hot.x_end, 1);
    req = acetate_mix(lib, 0.1);
    req.composition.clear(); // neither form in the recipe: no total to share out
    EXPECT_EQ(chem::titration_curve(lib, req).x_end, 0);
}

} // namespace
