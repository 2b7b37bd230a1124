// The speciation solver against published reference values and its own invariants.
#include "chem/equilibrium.h"
#include "chem/error.h"
#include "chem/units.h"
#include "chem/water.h"
#include "shipped_library.h"
#include "table_reader.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <iostream>
#include <string>
#include <vector>

using chem::testing::Json;

using chem::testing::lib;

namespace {

const chem::Reagent* R(const std::string& id) {
    return &lib().reagent(id);
}

/// One published pH of a reference buffer (tests/data/reference_buffers.json).
struct ReferenceRow {
    std::string name;
    std::vector<chem::Component> components; ///< as in the table (mol/L, or mol/kg for SIT)
    double temperature_c = 25;
    double published_ph = 7;
    double tolerance = 0;     ///< Davies (tolerance_ph)
    double tolerance_sit = 0; ///< SIT (tolerance_ph_sit, per buffer or default)
    double tolerance_tj = 0;  ///< Truesdell–Jones (tolerance_ph_truesdell_jones, likewise)
};

std::vector<ReferenceRow> reference_rows() {
    const Json doc = chem::testing::read_table(TESTS_DATA_DIR "/reference_buffers.json");
    const Json& sit = doc["tolerance_ph_sit"];
    const Json& tj = doc["tolerance_ph_truesdell_jones"];
    std::vector<ReferenceRow> rows;
    for (const Json& b : doc["buffers"].array) {
        const std::string name = b["name"].string;
        std::vector<chem::Component> comps;
        for (const Json& c : b["components"].array)
            comps.push_back({R(c["reagent"].string), c["mol_per_l"].number});
        for (const auto& [t, ph] : b["ph"].object)
            rows.push_back({name, comps, std::stod(t), ph.number, doc["tolerance_ph"].number,
                            sit.has(name) ? sit[name].number : sit["default"].number,
                            tj.has(name) ? tj[name].number : tj["default"].number});
    }
    return rows;
}

} // namespace

// IUPAC/NIST primary pH reference buffers (rows from tests/data/reference_buffers.json; the
// source is named in that file). The Davies model holds to ~0.02 pH at I <= 0.1 mol/L.
TEST(Equilibrium, ReferenceBuffers) {
    const std::vector<ReferenceRow> rows = reference_rows();
    ASSERT_FALSE(rows.empty());
    for (const ReferenceRow& r : rows) {
        SCOPED_TRACE(r.name + " @ " + std::to_string(r.temperature_c) + " C");
        const chem::Speciation s = chem::solve(lib(), r.components, r.temperature_c);
        EXPECT_LE(s.ionic_strength_mol_per_l, 0.1 + 1e-6) << "reference buffers here have I <= 0.1";
        EXPECT_LE(std::abs(s.ph - r.published_ph), r.tolerance)
            << "computed pH " << s.ph << ", published " << r.published_ph;
    }
}

// pKw of water: H. S. Harned & B. B. Owen, The Physical Chemistry of Electrolytic Solutions,
// 3rd ed. (1958), Table 15-2-1A (from memory). Our formula is the Harned & Robinson (1940) fit.
TEST(Equilibrium, WaterIonProduct) {
    const std::vector<std::pair<double, double>> rows = {
        {0.0, 14.9435},  {10.0, 14.5346}, {20.0, 14.1669}, {25.0, 13.9965},
        {30.0, 13.8330}, {40.0, 13.5348}, {50.0, 13.2617}, {60.0, 13.0171}};
    for (const auto& [temperature_c, published_pkw] : rows) {
        const double pkw = chem::pkw(chem::to_kelvin(temperature_c));
        EXPECT_LT(std::abs(pkw - published_pkw), 0.01) << temperature_c << " C: " << pkw;
    }
}

// Debye–Hückel A for log10 γ: R. A. Robinson & R. H. Stokes, Electrolyte Solutions, 2nd ed.
// (1959), Appendix 7.1 (from memory); tolerance 0.005 covers the permittivity data used.
TEST(Equilibrium, DebyeHuckelA) {
    const std::vector<std::pair<double, double>> rows = {
        {0.0, 0.4918}, {25.0, 0.5115}, {50.0, 0.5373}};
    for (const auto& [temperature_c, published_a] : rows) {
        const double a = chem::debye_huckel_a(chem::to_kelvin(temperature_c));
        EXPECT_LT(std::abs(a - published_a), 0.005) << temperature_c << " C: " << a;
    }
}

TEST(Equilibrium, PureWaterIsNeutral) {
    // A trace of a neutral salt: pH = pKw/2 (activity scale) at 25 and 50 °C.
    for (double t : {25.0, 50.0}) {
        const auto s = chem::solve(lib(), {{R("sodium-chloride"), 1e-9}}, t);
        EXPECT_LT(std::abs(s.ph - chem::pkw(chem::to_kelvin(t)) / 2), 1e-4);
    }
}

TEST(Equilibrium, DilutePhosphateApproachesHendersonHasselbalch) {
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
        EXPECT_LT(gap, previous_gap)
            << "the deviation from Henderson-Hasselbalch must shrink with I";
        previous_gap = gap;
    }
    EXPECT_LT(previous_gap, 0.02);
}

TEST(Equilibrium, LimitingLawSlope) {
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
    EXPECT_LT(std::abs(shift / limiting - 1), 0.05) << shift / limiting;
}

TEST(Equilibrium, HydrochloricAcidActivity) {
    // 0.01 mol/kg HCl: mean activity coefficient 0.904 at 25 °C (Harned & Owen 1958, Table 11-4-1A,
    // from memory), so pH = −log10(0.01 · 0.904) = 2.044.
    const auto s = chem::solve(lib(), {{R("hydrochloric-acid"), 0.01}}, 25);
    EXPECT_LT(std::abs(s.ph - 2.044), 0.005) << s.ph;
}

TEST(Equilibrium, PhRisesMonotonicallyWithStrongBase) {
    double last = -100;
    for (int i = 0; i <= 60; ++i) {
        std::vector<chem::Component> comps = {{R("potassium-dihydrogen-phosphate"), 0.05},
                                              {R("citric-acid"), 0.01}};
        if (i > 0)
            comps.push_back({R("sodium-hydroxide"), 0.0025 * i});
        const auto s = chem::solve(lib(), comps, 25);
        EXPECT_GT(s.ph, last) << "step " << i << ": pH " << s.ph << " after " << last;
        last = s.ph;
    }
}

namespace {
struct BalanceCase {
    const char* name;
    std::vector<std::string> ids;
    std::vector<double> amounts;
    double temperature_c;
};
} // namespace

TEST(Equilibrium, ChargeAndMassBalanceHold) {
    const std::vector<BalanceCase> cases = {
        {"three systems",
         {"ammonium-acetate", "sodium-dihydrogen-phosphate", "tris"},
         {0.01, 0.02, 0.015},
         25.0},
        {"borax + glycine at 5 C",
         {"sodium-tetraborate-decahydrate", "glycine"},
         {0.01, 0.03},
         5.0},
        {"citrate + HCl at 55 C",
         {"trisodium-citrate-dihydrate", "hydrochloric-acid"},
         {0.05, 0.04},
         55.0},
        {"carbonate + ammonia", {"ammonium-bicarbonate", "ammonia"}, {0.01, 0.01}, 25.0},
    };
    for (const BalanceCase& bc : cases) {
        SCOPED_TRACE(bc.name);
        std::vector<chem::Component> comps;
        for (size_t i = 0; i < bc.ids.size(); ++i)
            comps.push_back({R(bc.ids[i]), bc.amounts[i]});
        const auto s = chem::solve(lib(), comps, bc.temperature_c);
        double charge = 0, scale = 0, ionic = 0;
        for (const auto& sp : s.species) {
            charge += sp.charge * sp.mol_per_l;
            scale += std::abs(sp.charge) * sp.mol_per_l;
            ionic += 0.5 * sp.charge * sp.charge * sp.mol_per_l;
            EXPECT_TRUE(std::isfinite(sp.mol_per_l) && sp.mol_per_l >= 0);
            EXPECT_TRUE(sp.activity_coefficient > 0 && sp.activity_coefficient <= 1);
        }
        EXPECT_LE(std::abs(charge), 1e-9 * scale) << charge;
        EXPECT_LE(std::abs(ionic - s.ionic_strength_mol_per_l), 1e-8 * ionic);
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
                EXPECT_LE(std::abs(found - expected), 1e-12 + 1e-10 * expected) << share.system;
            }
    }
}

TEST(Equilibrium, BufferCapacityMatchesFiniteDifference) {
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
    EXPECT_LT(std::abs(beta_fd / s0.buffer_capacity_mol_per_l - 1), 0.05)
        << beta_fd << " vs " << s0.buffer_capacity_mol_per_l;
    // Van Slyke at the pKa with γ ignored: β ≈ ln10 · C/4 = 0.0230 mol/L for C = 0.04.
    EXPECT_LT(std::abs(s0.buffer_capacity_mol_per_l - 0.0230), 0.002);
}

TEST(Equilibrium, ExtremeInputsNeverGiveNaN) {
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
                EXPECT_TRUE(std::isfinite(s.ph) && std::isfinite(s.ionic_strength_mol_per_l) &&
                            std::isfinite(s.buffer_capacity_mol_per_l));
            } catch (const chem::Error& e) {
                EXPECT_FALSE(e.field().empty());
            }
        }
    }
}

TEST(Equilibrium, BadInputNamesTheField) {
    auto expect = [](auto fn, const std::string& field) {
        try {
            fn();
            ADD_FAILURE() << "no error for " << field;
        } catch (const chem::Error& e) {
            EXPECT_EQ(e.field(), field);
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
TEST(Equilibrium, SitReferenceBuffers) {
    const std::vector<ReferenceRow> rows = reference_rows();
    ASSERT_FALSE(rows.empty());
    for (const ReferenceRow& r : rows) {
        SCOPED_TRACE(r.name + " @ " + std::to_string(r.temperature_c) + " C");
        const double rho = chem::water_density_g_per_ml(chem::to_kelvin(r.temperature_c));
        std::vector<chem::Component> comps;
        for (const chem::Component& c : r.components)
            comps.push_back({c.reagent, c.mol_per_l * rho});
        const chem::Speciation s =
            chem::solve(lib(), comps, r.temperature_c, chem::ActivityModel::sit);
        EXPECT_LE(std::abs(s.ph - r.published_ph), r.tolerance_sit)
            << "computed pH " << s.ph << ", published " << r.published_ph;
    }
}

// The mean activity coefficient of one salt alone at mol_per_kg, 25 °C, under model m: the
// geometric mean over the salt's cation(s) and its most abundant anion.
double mean_activity_coefficient(const chem::Reagent* r, double mol_per_kg, chem::ActivityModel m) {
    const double rho = chem::water_density_g_per_ml(chem::reference_temperature_k);
    const auto s = chem::solve(lib(), {{r, mol_per_kg * rho}}, 25, m);
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
}

// Mean activity coefficients at 25 °C: R. A. Robinson & R. H. Stokes, Electrolyte Solutions, 2nd
// ed. (1959), Appendix 8.10 (from memory); Na2HPO4 0.1 mol/kg 0.463 as quoted in issue 11 (its
// 0.5 and 1 mol/kg values are not recalled). Each row gives the relative tolerance per model
// (0: not checked for that model).
struct MeanGammaRow {
    const char* name;
    const char* salt;
    double mol_per_kg, published, sit_tolerance, tj_tolerance;
};
const std::vector<MeanGammaRow>& robinson_stokes_rows() {
    static const std::vector<MeanGammaRow> rows = {
        {"NaCl 0.1", "sodium-chloride", 0.1, 0.778, 0.02, 0.02},
        {"NaCl 0.5", "sodium-chloride", 0.5, 0.681, 0.03, 0.03},
        {"NaCl 1.0", "sodium-chloride", 1.0, 0.657, 0.03, 0.03},
        {"KCl 0.1", "potassium-chloride", 0.1, 0.770, 0.02, 0.02},
        {"KCl 0.5", "potassium-chloride", 0.5, 0.649, 0.04, 0.06},
        {"KCl 1.0", "potassium-chloride", 1.0, 0.604, 0.04, 0.06},
        {"NaH2PO4 0.1", "sodium-dihydrogen-phosphate", 0.1, 0.744, 0.03, 0.06},
        {"NaH2PO4 0.5", "sodium-dihydrogen-phosphate", 0.5, 0.563, 0.09, 0},
        {"NaH2PO4 1.0", "sodium-dihydrogen-phosphate", 1.0, 0.468, 0.12, 0},
        {"Na2HPO4 0.1", "disodium-hydrogen-phosphate", 0.1, 0.463, 0.03, 0.06},
    };
    return rows;
}

// SIT against those rows: with the NEA-TDB ε (data/reagents.json) holds
// NaCl and KCl within 4 %; NaH2PO4 is 11 % high at 1 mol/kg (the ε of -0.08 kg/mol does not carry
// the salt's association), still far closer than Davies (+69 %). Rows at 0.5 and 1 mol/kg also
// check that SIT beats Davies.
TEST(Equilibrium, SitMeanActivityCoefficients) {
    for (const MeanGammaRow& row : robinson_stokes_rows()) {
        SCOPED_TRACE(row.name);
        const chem::Reagent* r = R(row.salt);
        const double mol_per_kg = row.mol_per_kg;
        auto mean = [&](chem::ActivityModel m) {
            return mean_activity_coefficient(r, mol_per_kg, m);
        };
        const double sit = mean(chem::ActivityModel::sit);
        const double davies = mean(chem::ActivityModel::davies);
        EXPECT_LE(std::abs(sit / row.published - 1), row.sit_tolerance)
            << "SIT " << sit << ", published " << row.published;
        if (mol_per_kg >= 0.5) { // at 0.1 mol/kg both lie within 1 %
            EXPECT_LT(std::abs(sit - row.published), std::abs(davies - row.published))
                << "SIT " << sit << " not closer than Davies " << davies;
        }
    }
}

TEST(Equilibrium, DaviesAndSitDisagreementIsWarned) {
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
    EXPECT_GT(std::abs(a.ph - b.ph), 0.02) << a.ph - b.ph;
    EXPECT_TRUE(has(a) && has(b));
    EXPECT_EQ(b.activity_model, chem::ActivityModel::sit);
    // 10 mmol/L acetate: they agree, no warning.
    const std::vector<chem::Component> weak = {{R("acetic-acid"), 0.01},
                                               {R("sodium-acetate"), 0.01}};
    EXPECT_FALSE(has(chem::solve(lib(), weak, 25, chem::ActivityModel::davies)));
    EXPECT_FALSE(has(chem::solve(lib(), weak, 25, chem::ActivityModel::sit)));
}

TEST(Equilibrium, MolalAndMolarA) {
    // A on the molar scale with Malmberg & Maryott's permittivity reproduces Robinson & Stokes'
    // (molar) table within 0.001; the molal A is A·√ρ_w (0.5107 at 25 °C).
    const double t = chem::reference_temperature_k;
    EXPECT_LT(std::abs(chem::debye_huckel_a(t) - 0.5115), 0.001);
    EXPECT_LT(std::abs(chem::debye_huckel_a_molal(t) -
                       chem::debye_huckel_a(t) * std::sqrt(chem::water_density_g_per_ml(t))),
              1e-12);
    EXPECT_LT(std::abs(chem::debye_huckel_a_molal(t) - 0.5107), 0.0005);

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
        EXPECT_LT(std::abs(chem::debye_huckel_a_molal(tk) / a_m - 1), 2e-5)
            << tc << " °C: " << chem::debye_huckel_a_molal(tk) << " against " << a_m;
        // The molar A is the same constant per litre of solution: A_m / √ρ_w.
        EXPECT_LT(
            std::abs(chem::debye_huckel_a(tk) - a_m / std::sqrt(chem::water_density_g_per_ml(tk))),
            2e-5);
    }
    // Published molal values at 25 °C. The differences come from water's permittivity: Malmberg &
    // Maryott give 78.30, Archer & Wang 78.38 and Helgeson & Kirkham about 78.47.
    // - Archer & Wang, J. Phys. Chem. Ref. Data 19 (1990) 371: A_φ = 0.3915 (kg/mol)^1/2, so
    //   A = 3 A_φ / ln 10 = 0.5101 (from memory).
    EXPECT_LT(std::abs(chem::debye_huckel_a_molal(t) - 0.5101), 0.001);
    // - OECD NEA TDB (Grenthe et al. 1992; Guillaumont et al. 2003, appendix B, the A of its SIT):
    //   A = 0.5091 (kg/mol)^1/2 at 25 °C (from memory); 0.3 % below, the permittivity again.
    EXPECT_LT(std::abs(chem::debye_huckel_a_molal(t) - 0.5091), 0.002);
    // Neither published molal value matches the molar one within the 0.001 above: the two scales
    // are not interchangeable at this precision.
    EXPECT_GT(std::abs(chem::debye_huckel_a(t) - 0.5101), 0.0005);
}

// Good's buffers at 25 °C, infinite dilution: R. N. Goldberg, N. Kishore & R. M. Lennen,
// J. Phys. Chem. Ref. Data 31 (2002) 231, Table 2 (from memory). The library's pKa(T) must
// reproduce pKa(25 °C) and the van 't Hoff slope −ΔH/(R ln10 T²) at 25 °C.
TEST(Equilibrium, GoodsBuffersAgainstGoldberg) {
    struct Row {
        const char* system;
        double pka, enthalpy_kj_per_mol;
    };
    for (const Row& row : {Row{"mes", 6.270, 14.8}, Row{"hepes", 7.564, 20.4},
                           Row{"mops", 7.184, 21.1}, Row{"bis-tris", 6.484, 28.4}}) {
        SCOPED_TRACE(row.system);
        const chem::AcidBaseSystem& s = lib().system(row.system);
        const double t0 = chem::reference_temperature_k;
        EXPECT_LT(std::abs(s.pka_at(0, t0) - row.pka), 1e-9);
        const double h = 1e-3;
        const double slope = (s.pka_at(0, t0 + h) - s.pka_at(0, t0 - h)) / (2 * h);
        const double dh = -slope * chem::gas_constant_j_per_mol_k * chem::ln10 * t0 * t0 / 1000;
        EXPECT_LT(std::abs(dh - row.enthalpy_kj_per_mol), 0.05) << dh;
    }
}

TEST(Equilibrium, NewReagentsSolve) {
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
            EXPECT_LE(std::abs(charge), 1e-9 * scale) << id;
        }
    // 10 mmol/L sulfuric acid: HSO4- pKa 1.99 leaves part of the second proton bound; pH ≈ 1.87
    // (a hand solution of the quadratic with Davies γ, not a published value).
    const auto h2so4 = chem::solve(lib(), {{R("sulfuric-acid"), 0.01}}, 25);
    EXPECT_TRUE(h2so4.ph > 1.75 && h2so4.ph < 1.95) << h2so4.ph;
}

// The pKa(T) of the two primary standards that SIT misses (carbonate, phthalate) against the
// equations the data were taken from, 0–50 °C: the library keeps pKa(25 °C), ΔrH° and a constant
// ΔrCp° (van 't Hoff), the papers fit pK = a/T + b + c·T. Agreement here rules out the temperature
// data as the cause of the standards' misses (README, IUPAC standards):
// - carbonate step 2: Harned & Scholes, J. Am. Chem. Soc. 63 (1941) 1706,
//   pK2 = 2902.39/T − 6.4980 + 0.02379 T (from memory);
// - phthalate: Hamer, Pinching & Acree, J. Res. NBS 35 (1945) 539 and Hamer & Acree, J. Res.
//   NBS 35 (1945) 381, pK1 = 561.57/T − 1.2843 + 0.0078833 T and
//   pK2 = 2175.83/T − 9.55294 + 0.025694 T (from memory).
TEST(Equilibrium, StandardsPkaFollowTheirEquations) {
    struct Row {
        const char* name;
        const char* system;
        int step;
        double a, b, c, tolerance;
    };
    // The carbonate row allows 0.004: the library's ΔrH° and ΔrCp° come from the WATEQ4F
    // expression (CarbonatePk2AgainstWateq4f), which lies within 0.003 of the 1941 fit.
    const std::vector<Row> rows = {
        {"carbonate pK2", "carbonate", 1, 2902.39, -6.4980, 0.02379, 0.004},
        {"phthalate pK1", "phthalate", 0, 561.57, -1.2843, 0.0078833, 0.003},
        {"phthalate pK2", "phthalate", 1, 2175.83, -9.55294, 0.025694, 0.005},
        // Manov, DeLollis & Acree, J. Res. NBS 33 (1944) 287 (equation read in the abstract): the
        // library takes its ΔrH° and ΔrCp° at 25 °C but keeps Goldberg's 9.237 there (0.002
        // above the equation's 9.235), hence 0.004.
        {"boric acid", "borate", 0, 2237.94, -3.305, 0.016883, 0.004},
    };
    for (const Row& row : rows) {
        SCOPED_TRACE(row.name);
        const chem::AcidBaseSystem& s = lib().system(row.system);
        for (const double tc : {0.0, 10.0, 20.0, 25.0, 30.0, 40.0, 50.0}) {
            const double tk = chem::to_kelvin(tc);
            const double published = row.a / tk + row.b + row.c * tk;
            const double ours = s.pka_at(row.step, tk);
            EXPECT_LE(std::abs(ours - published), row.tolerance)
                << tc << " °C: " << ours << " against " << published;
        }
    }
}

// The Truesdell–Jones model (ion sizes and b in data/reagents.json, sources named there) on the
// IUPAC/NIST primary standards (tests/data/reference_buffers.json), 0–50 °C: within 0.015 pH,
// carbonate included (SIT's gap; 0.002–0.010 low with the WATEQ4F pK2(T)), phthalate (0.005,
// with the K+ phthalate pair of PhthalatePairAgainstReyCastro; 0.024–0.029 high without it) and
// borax (0.012, with Manov's borate ΔrH° and the polyborates of BoraxPolyborates; 0.016 high at
// 50 °C before); reasons in the data file.
TEST(Equilibrium, TruesdellJonesReferenceBuffers) {
    const std::vector<ReferenceRow> rows = reference_rows();
    ASSERT_FALSE(rows.empty());
    double worst = 0;
    std::vector<std::pair<std::string, double>> per_standard; // largest signed miss, for the log
    for (const ReferenceRow& r : rows) {
        SCOPED_TRACE(r.name + " @ " + std::to_string(r.temperature_c) + " C");
        const double rho = chem::water_density_g_per_ml(chem::to_kelvin(r.temperature_c));
        std::vector<chem::Component> comps;
        for (const chem::Component& c : r.components)
            comps.push_back({c.reagent, c.mol_per_l * rho});
        const chem::Speciation s =
            chem::solve(lib(), comps, r.temperature_c, chem::ActivityModel::truesdell_jones);
        if (per_standard.empty() || per_standard.back().first != r.name)
            per_standard.push_back({r.name, 0.0});
        if (std::abs(s.ph - r.published_ph) > std::abs(per_standard.back().second))
            per_standard.back().second = s.ph - r.published_ph;
        EXPECT_EQ(s.activity_model, chem::ActivityModel::truesdell_jones);
        EXPECT_LE(std::abs(s.ph - r.published_ph), r.tolerance_tj)
            << "computed pH " << s.ph << ", published " << r.published_ph;
        if (r.tolerance_tj <= 0.015)
            worst = std::max(worst, std::abs(s.ph - r.published_ph));
    }
    for (const auto& [name, miss] : per_standard)
        std::cout << "Truesdell–Jones, " << name << ": largest miss " << miss << " pH\n";
    std::cout << "Truesdell–Jones, worst miss on the standards held to 0.015: " << worst << " pH\n";
}

// The pH is on the convention of the standards: in any solution the model's γ(Cl−) is the
// Bates–Guggenheim value, log10 γ = −A_m √I/(1 + 1.5 √I) (Buck et al., Pure Appl. Chem. 74 (2002)
// 2169, from memory), and the convention leaves neutral combinations alone: γ(Na+)·γ(Cl−) is the
// Truesdell–Jones value of the pair (Truesdell & Jones 1974 form, parameters from the data file).
TEST(Equilibrium, TruesdellJonesConvention) {
    for (const double tc : {5.0, 25.0, 45.0}) {
        SCOPED_TRACE(tc);
        const double tk = chem::to_kelvin(tc);
        const double rho = chem::water_density_g_per_ml(tk);
        const auto s = chem::solve(lib(),
                                   {{R("sodium-chloride"), 0.05 * rho},
                                    {R("potassium-dihydrogen-phosphate"), 0.02 * rho},
                                    {R("disodium-hydrogen-phosphate"), 0.02 * rho}},
                                   tc, chem::ActivityModel::truesdell_jones);
        const double i_m = s.ionic_strength_mol_per_l / rho;
        const double a = chem::debye_huckel_a_molal(tk), b = chem::debye_huckel_b_molal(tk);
        double g_na = 0, g_cl = 0;
        for (const auto& x : s.species) {
            if (x.species == "Cl-")
                g_cl = x.activity_coefficient;
            if (x.species == "Na+")
                g_na = x.activity_coefficient;
        }
        const double sq = std::sqrt(i_m);
        EXPECT_NEAR(std::log10(g_cl), -a * sq / (1 + 1.5 * sq), 1e-9);
        const chem::IonSize* na = lib().ion_size("Na+");
        const chem::IonSize* cl = lib().ion_size("Cl-");
        ASSERT_TRUE(na && cl);
        const double pair = -a * sq / (1 + b * na->size_angstrom * sq) + na->b_kg_per_mol * i_m -
                            a * sq / (1 + b * cl->size_angstrom * sq) + cl->b_kg_per_mol * i_m;
        EXPECT_NEAR(std::log10(g_na) + std::log10(g_cl), pair, 1e-9);
    }
}

// Debye–Hückel B: from the CODATA 2018 constants, B = (2 N_A e² ρ_w / (ε0 ε_r k T))^1/2, and the
// published 25 °C value 0.3291 Å⁻¹ (kg/mol)^1/2 (Robinson & Stokes, Electrolyte Solutions,
// Appendix 7.1, from memory; the small difference is the permittivity).
TEST(Equilibrium, DebyeHuckelB) {
    for (const double tc : {0.0, 25.0, 50.0}) {
        const double tk = chem::to_kelvin(tc);
        const double e = 1.602176634e-19, k = 1.380649e-23, na = 6.02214076e23,
                     eps0 = 8.8541878128e-12;
        const double b_per_m = std::sqrt(2 * na * e * e * 1000 * chem::water_density_g_per_ml(tk) /
                                         (eps0 * chem::water_permittivity(tk) * k * tk));
        EXPECT_LT(std::abs(chem::debye_huckel_b_molal(tk) / (b_per_m * 1e-10) - 1), 2e-5) << tc;
    }
    EXPECT_LT(std::abs(chem::debye_huckel_b_molal(chem::reference_temperature_k) - 0.3291), 0.001);
}

// Mean activity coefficients at 25 °C under Truesdell–Jones against Robinson & Stokes (the rows
// above): the chlorides, which Truesdell & Jones fitted,
// within 6 %; the phosphates, whose anions carry Kielland's size and b = 0, at 0.1 mol/kg
// within 6 % (they read 5–6 % high: no b term, no ion pairs). Above 0.1 mol/kg choose SIT for
// phosphate; the README says so.
TEST(Equilibrium, TruesdellJonesMeanActivityCoefficients) {
    for (const MeanGammaRow& row : robinson_stokes_rows()) {
        if (row.tj_tolerance <= 0)
            continue; // above 0.1 mol/kg phosphate is SIT's (README)
        SCOPED_TRACE(row.name);
        const double tj = mean_activity_coefficient(R(row.salt), row.mol_per_kg,
                                                    chem::ActivityModel::truesdell_jones);
        EXPECT_LE(std::abs(tj / row.published - 1), row.tj_tolerance)
            << "Truesdell–Jones " << tj << ", published " << row.published;
        std::cout << row.name << ": Truesdell–Jones " << tj << ", published " << row.published
                  << "\n";
    }
}

// The Truesdell–Jones å (Å) and b (kg/mol) of data/reagents.json against the WATEQ4F database
// (Ball & Nordstrom, U.S. Geol. Surv. Open-File Report 91-183, 1991), as the PHREEQC distribution
// carries it in database/wateq4f.dat ("-gamma å b" of each species; read). The model takes them
// for Na+, K+, Cl- (and H+, Kielland's 9 Å there too). HCO3-, CO3-2 and SO4-2 keep Kielland's
// sizes: WATEQ4F gives them 5.4, 5.4 and 5.0 Å beside ion pairs (NaCO3-, NaHCO3, NaSO4-, KSO4-)
// that this model has not, and with 5.4 Å and no pairs the carbonate standard reads up to 0.017
// high.
TEST(Equilibrium, TruesdellJonesParametersAgainstWateq4f) {
    struct Row {
        const char* species;
        double size_angstrom, b_kg_per_mol;
    };
    for (const Row& row : {Row{"H+", 9.0, 0.0}, Row{"Na+", 4.0, 0.075}, Row{"K+", 3.5, 0.015},
                           Row{"Cl-", 3.5, 0.015}, Row{"HCO3-", 4.5, 0.0}, Row{"CO3-2", 4.5, 0.0},
                           Row{"SO4-2", 4.0, 0.0}}) {
        SCOPED_TRACE(row.species);
        const chem::IonSize* e = lib().ion_size(row.species);
        ASSERT_NE(e, nullptr);
        EXPECT_EQ(e->size_angstrom, row.size_angstrom);
        EXPECT_EQ(e->b_kg_per_mol, row.b_kg_per_mol);
    }
}

// Carbonate's second step against the same WATEQ4F file (read): H+ + CO3-2 = HCO3-, log_k 10.329,
// "-analytical 107.8871 0.03252849 -5151.79 -38.92561 563713.9", i.e.
// log K = 107.8871 + 0.03252849 T − 5151.79/T − 38.92561 log10 T + 563713.9/T² (T in K; after
// Plummer & Busenberg 1982, from memory). The library's pKa 10.329 with ΔrH° 14.9 kJ/mol and ΔrCp°
// −290 J/(K·mol), taken from that expression at 25 °C, follow it within 0.001 from 0 to 50 °C
// (Goldberg 2002's 14.7 and −249, recalled, were 0.012 off at 0 °C).
TEST(Equilibrium, CarbonatePk2AgainstWateq4f) {
    const chem::AcidBaseSystem& s = lib().system("carbonate");
    for (const double tc : {0.0, 10.0, 20.0, 25.0, 30.0, 40.0, 50.0}) {
        const double t = chem::to_kelvin(tc);
        const double log_k =
            107.8871 + 0.03252849 * t - 5151.79 / t - 38.92561 * std::log10(t) + 563713.9 / (t * t);
        EXPECT_LE(std::abs(s.pka_at(1, t) - log_k), 0.001) << tc << " °C: " << s.pka_at(1, t);
    }
}

// Every charged species of the shipped library that Kielland's table or Truesdell & Jones cover
// has its own entry; the rest fall back to 4.5 Å (data/reagents.json, truesdell_jones_note). This
// fails when a system is added to a standard's chemistry without its size.
TEST(Equilibrium, TruesdellJonesCoversTheStandards) {
    for (const char* species : {"Na+", "K+", "Cl-", "H+", "OH-", "H2PO4-", "HPO4-2", "PO4-3",
                                "HCO3-", "CO3-2", "Phth-2", "H2Cit-", "HCit-2", "Cit-3"})
        EXPECT_NE(lib().ion_size(species), nullptr) << species;
    // A model name round trip and the refusal of others.
    EXPECT_EQ(chem::activity_model_from_name("truesdell-jones"),
              chem::ActivityModel::truesdell_jones);
    EXPECT_STREQ(chem::activity_model_name(chem::ActivityModel::truesdell_jones),
                 "truesdell-jones");
    EXPECT_FALSE(chem::activity_model_from_name("pitzer").has_value());
}

// The residual table of the IUPAC/NIST primary standards (tests/data/reference_buffers.json,
// sources named there): model pH minus the standard's pH(S), per standard, temperature and
// activity model, printed for the record
// (`build/chem_equilibrium --gtest_filter='*StandardsResidualTable*'`). Each row is held to the
// tolerance of its model (the same bounds as the three tests above), so the table printed is the
// table tested. The extended models take the standards as molal (c = m · ρ_w).
TEST(Equilibrium, StandardsResidualTable) {
    std::vector<ReferenceRow> rows = reference_rows();
    ASSERT_FALSE(rows.empty());
    // Each standard's rows in rising temperature (the table file keys them as text: "5" after
    // "45"), the standards in the file's order.
    std::vector<std::string> order;
    for (const ReferenceRow& r : rows)
        if (std::find(order.begin(), order.end(), r.name) == order.end())
            order.push_back(r.name);
    auto rank = [&order](const ReferenceRow& r) {
        return std::find(order.begin(), order.end(), r.name) - order.begin();
    };
    std::stable_sort(
        rows.begin(), rows.end(), [&rank](const ReferenceRow& a, const ReferenceRow& b) {
            return rank(a) != rank(b) ? rank(a) < rank(b) : a.temperature_c < b.temperature_c;
        });
    std::printf("%-52s %5s %8s %8s %8s %8s\n", "standard", "t/°C", "pH(S)", "davies", "sit", "t-j");
    for (const ReferenceRow& r : rows) {
        SCOPED_TRACE(r.name + " @ " + std::to_string(r.temperature_c) + " C");
        const double rho = chem::water_density_g_per_ml(chem::to_kelvin(r.temperature_c));
        std::vector<chem::Component> molal;
        for (const chem::Component& c : r.components)
            molal.push_back({c.reagent, c.mol_per_l * rho});
        const double davies = chem::solve(lib(), r.components, r.temperature_c).ph - r.published_ph;
        const double sit = chem::solve(lib(), molal, r.temperature_c, chem::ActivityModel::sit).ph -
                           r.published_ph;
        const double tj =
            chem::solve(lib(), molal, r.temperature_c, chem::ActivityModel::truesdell_jones).ph -
            r.published_ph;
        std::printf("%-52s %5.0f %8.3f %+8.4f %+8.4f %+8.4f\n", r.name.c_str(), r.temperature_c,
                    r.published_ph, davies, sit, tj);
        EXPECT_LE(std::abs(davies), r.tolerance);
        EXPECT_LE(std::abs(sit), r.tolerance_sit);
        EXPECT_LE(std::abs(tj), r.tolerance_tj);
    }
}

// The Truesdell–Jones ion pair Na+ + Phth-2 (data/reagents.json, complexes) was
// derived from one published measurement: the stoichiometric (molal) constants of phthalic acid
// in 0.101 mol/kg NaCl at 25 °C, pK1' = 2.730 and pK2' = 4.948 (Rey-Castro, Castro-Varela,
// Herrero & Sastre de Vicente, Talanta 61 (2003) 93, abstract, read). pK2' was used to derive
// log10 K° = 0.73, so its check only guards the derivation (it fails if the pair, the sizes or
// the solver's folding of the pair change); pK1' was not used, and the model (HPhth- at the
// 4.5 Å fallback, no pair for it) meets it within 0.03. The independent test of the pair is the
// potassium hydrogen phthalate standard (TruesdellJonesReferenceBuffers), with K+ not Na+.
TEST(Equilibrium, PhthalatePairAgainstReyCastro) {
    const double rho = chem::water_density_g_per_ml(chem::reference_temperature_k);
    // A trace of phthalate half neutralised in the NaCl medium (I stays 0.1013 mol/kg).
    const chem::Speciation s = chem::solve(lib(),
                                           {{R("sodium-chloride"), 0.101 * rho},
                                            {R("potassium-hydrogen-phthalate"), 2e-4 * rho},
                                            {R("sodium-hydroxide"), 1e-4 * rho}},
                                           25.0, chem::ActivityModel::truesdell_jones);
    const double m_h = s.concentration_of("H+") / rho, m_h2 = s.concentration_of("H2Phth") / rho,
                 m_h1 = s.concentration_of("HPhth-") / rho,
                 m_0 = s.concentration_of("Phth-2") / rho;
    ASSERT_GT(m_h2, 0);
    ASSERT_GT(m_0, 0);
    const double pk1 = -std::log10(m_h * m_h1 / m_h2), pk2 = -std::log10(m_h * m_0 / m_h1);
    std::cout << "Truesdell–Jones in 0.101 mol/kg NaCl, 25 °C: pK1' " << pk1
              << " (Rey-Castro 2.730), pK2' " << pk2 << " (4.948)\n";
    EXPECT_NEAR(pk2, 4.948, 0.005);
    EXPECT_NEAR(pk1, 2.730, 0.03);
    // Without the pair (K° made negligible in a copy of the library) the same model reads pK2'
    // about 0.09 high (5.036 by hand): the pair is what closes the gap.
    chem::Library unpaired = lib();
    for (const char* cation : {"Na+", "K+"})
        unpaired.add_complex({std::string(cation[0] == 'N' ? "NaPhth-" : "KPhth-"),
                              {{cation, 1}, {"Phth-2", 1}},
                              -20.0,
                              {chem::ActivityModel::truesdell_jones},
                              "test: no pair"});
    const chem::Speciation u =
        chem::solve(unpaired,
                    {{&unpaired.reagent("sodium-chloride"), 0.101 * rho},
                     {&unpaired.reagent("potassium-hydrogen-phthalate"), 2e-4 * rho},
                     {&unpaired.reagent("sodium-hydroxide"), 1e-4 * rho}},
                    25.0, chem::ActivityModel::truesdell_jones);
    const double pk2_unpaired =
        -std::log10(u.concentration_of("H+") / rho * u.concentration_of("Phth-2") /
                    u.concentration_of("HPhth-"));
    EXPECT_GT(pk2_unpaired - pk2, 0.07) << pk2_unpaired;
}

// The phthalate pair is folded into the ions' activity coefficients, not into their amounts: the
// species reported stay totals (free ion plus pair), so the phthalate and potassium balances
// hold exactly; γ(Phth-2), free γ times free fraction (K+ + Phth-2 ⇌ KPhth-, data file), falls
// as the solution concentrates.
// Up to 1 mol/L dipotassium phthalate (the model's limit) the fixed point converges.
TEST(Equilibrium, TruesdellJonesPairKeepsTheBalances) {
    double previous_gamma = 2;
    for (const double c : {0.01, 0.1, 0.5}) {
        SCOPED_TRACE(c);
        const chem::Speciation s = chem::solve(
            lib(), {{R("potassium-hydrogen-phthalate"), c}, {R("potassium-hydroxide"), c}}, 25.0,
            chem::ActivityModel::truesdell_jones);
        ASSERT_TRUE(std::isfinite(s.ph));
        const double phthalate = s.concentration_of("H2Phth") + s.concentration_of("HPhth-") +
                                 s.concentration_of("Phth-2");
        EXPECT_NEAR(phthalate, c, 1e-12 * c);
        EXPECT_NEAR(s.concentration_of("K+"), 2 * c, 1e-12 * c);
        double gamma = 0;
        for (const auto& sp : s.species)
            if (sp.species == "Phth-2")
                gamma = sp.activity_coefficient;
        EXPECT_LT(gamma, previous_gamma);
        previous_gamma = gamma;
    }
}

// Borax with the polyborates of the extended models (data/reagents.json, complexes: constants of
// PHREEQC's pitzer.dat, read). Checked against a published pH set other than the IUPAC values of
// the residual table: Manov, DeLollis, Lindvall & Acree, J. Res. NBS 36 (1946) 543, pH of 0.01
// mol/kg borax = 2331.7/T + 0.017433 T − 3.840, 0–60 °C (equation read in the paper's abstract),
// within 0.015 from 0 to 50 °C with Truesdell–Jones. The polyborates raise the pH by about 0.008
// (a hand calculation with Bates–Guggenheim γ gives 0.0083 at 25 °C) and leave the boron balance
// exact (a triborate counts as two B(OH)3 and one B(OH)4-).
TEST(Equilibrium, BoraxPolyborates) {
    chem::Library monomers = lib();
    monomers.add_complex({"B3O3(OH)4-",
                          {{"B(OH)3", 2}, {"B(OH)4-", 1}},
                          -20.0,
                          {chem::ActivityModel::sit, chem::ActivityModel::truesdell_jones},
                          "test: none"});
    monomers.add_complex({"B4O5(OH)4-2",
                          {{"B(OH)3", 2}, {"B(OH)4-", 2}},
                          -20.0,
                          {chem::ActivityModel::sit, chem::ActivityModel::truesdell_jones},
                          "test: none"});
    for (const double tc : {0.0, 5.0, 10.0, 15.0, 20.0, 25.0, 30.0, 35.0, 40.0, 45.0, 50.0}) {
        SCOPED_TRACE(tc);
        const double tk = chem::to_kelvin(tc);
        const double rho = chem::water_density_g_per_ml(tk);
        const double c = 0.01 * rho;
        const chem::Speciation s = chem::solve(lib(), {{R("sodium-tetraborate-decahydrate"), c}},
                                               tc, chem::ActivityModel::truesdell_jones);
        const double manov_1946 = 2331.7 / tk + 0.017433 * tk - 3.840;
        EXPECT_LE(std::abs(s.ph - manov_1946), 0.015) << s.ph << " against " << manov_1946;
        EXPECT_NEAR(s.concentration_of("B(OH)3") + s.concentration_of("B(OH)4-"), 4 * c, 1e-12);
        for (const chem::ActivityModel m :
             {chem::ActivityModel::sit, chem::ActivityModel::truesdell_jones}) {
            const double with =
                chem::solve(lib(), {{R("sodium-tetraborate-decahydrate"), c}}, tc, m).ph;
            const double without =
                chem::solve(monomers, {{&monomers.reagent("sodium-tetraborate-decahydrate"), c}},
                            tc, m)
                    .ph;
            EXPECT_GT(with - without, 0.006);
            EXPECT_LT(with - without, 0.011);
        }
    }
    // Davies has no associated species: the library refuses to give it one.
    chem::Library copy = lib();
    EXPECT_THROW(
        copy.add_complex({"X-", {{"B(OH)4-", 1}}, 1.0, {chem::ActivityModel::davies}, "test"}),
        chem::Error);
}
