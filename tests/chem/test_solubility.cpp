// The precipitation check by species form (chem::salt_loads with form tables, check_line): a
// phosphate group split at the eluent's pH into the dihydrogen and hydrogen forms, each against
// its own limit, summed as Σ c_form / limit_form; and the limits below 50 % organic, down to the
// salt's water solubility.
//
// The limits are the shipped data/solvents.json form tables: above 0 % organic a conservative
// rule of thumb (common practice, no source); the 0 % row the salt's water solubility from the
// CRC Handbook of Chemistry and Physics (from memory). Each check names the row it leans on.
#include "chem/checks.h"
#include "chem/eluent.h"
#include "chem/error.h"
#include "line_profiles.h"
#include "shipped_library.h"

#include <gtest/gtest.h>

#include <cmath>

namespace {

using namespace chem;
using chem::testing::neat_line;
using chem::testing::shipped_library;
using chem::testing::shipped_solvents;

/// An aqueous line of the given solutes (mmol/L of the finished line).
LineProfile buffer_line(const std::vector<std::pair<std::string, double>>& solutes) {
    LineProfile p = neat_line("water", true);
    for (const auto& [id, mm] : solutes)
        p.solutes.push_back({id, mm, SoluteSource::buffer});
    return p;
}

/// The load of one group at A:B = percent_a : 100 − percent_a, split at the eluent's pH.
struct Mixed {
    SaltLoad load;
    bool found = false;
    double ph_w_w = 0; ///< the aqueous line's own pH (at 25 °C)
};
Mixed mixed(const LineProfile& a, const LineProfile& b, double percent_a,
            const std::string& group) {
    const std::vector<const LineProfile*> profiles = {&a, &b};
    const EluentResult r = solve_eluent(shipped_solvents(), shipped_library(), profiles,
                                        {percent_a, 100 - percent_a}, 25);
    const EluentResult water =
        solve_eluent(shipped_solvents(), shipped_library(), profiles, {100, 0}, 25);
    const SpeciesShares sp = species_shares_of(r);
    std::array<const LineProfile*, max_lines> lines{&a, &b, nullptr, nullptr};
    LineValues pct{percent_a, 100 - percent_a, 0, 0};
    Mixed m;
    m.ph_w_w = water.ph_s_s;
    for (const SaltLoad& l : salt_loads(shipped_solvents(), lines, pct, &sp))
        if (l.group == group) {
            m.load = l;
            m.found = true;
        }
    return m;
}

// The same 60 mmol/L of potassium phosphate in the aqueous line, 30 % of it against 70 %
// acetonitrile (18 mmol/L in the eluent): at pH 7.7 (10 KH2PO4 + 50 K2HPO4, mostly
// HPO4²⁻) it passes the hydrogen form's limit of 15 mmol/L at 70 % (the shipped rule of thumb,
// common practice, no source), at pH 2.5 (60 KH2PO4 with 20 HCl, mostly H2PO4⁻) it stays well
// under the dihydrogen form's 35 mmol/L there. The former group table (one limit of 15 mmol/L
// whatever the pH) would have flagged both.
TEST(SolubilityForms, HydrogenPhosphateAtPh7PrecipitatesWhereDihydrogenAtPh25DoesNot) {
    const LineProfile acn = neat_line("acetonitrile", false);
    const LineProfile ph7 = buffer_line(
        {{"potassium-dihydrogen-phosphate", 10}, {"dipotassium-hydrogen-phosphate", 50}});
    const LineProfile ph25 =
        buffer_line({{"potassium-dihydrogen-phosphate", 60}, {"hydrochloric-acid", 20}});

    const Mixed high = mixed(ph7, acn, 30, "potassium-phosphate");
    ASSERT_TRUE(high.found);
    EXPECT_GT(high.ph_w_w, 7.0);
    EXPECT_LT(high.ph_w_w, 8.0);
    EXPECT_TRUE(high.load.speciated);
    EXPECT_EQ(high.load.form, "hydrogen-phosphate");
    EXPECT_NEAR(high.load.organic_fraction_v, 0.70, 0.005);
    EXPECT_NEAR(high.load.form_limit_mmol_per_l, 15, 0.5);            // the 70 % row, interpolated
    EXPECT_GT(high.load.form_mmol_per_l, 0.7 * high.load.mmol_per_l); // mostly HPO4²⁻
    EXPECT_GT(high.load.ratio(), 1.0);                                // fires

    const Mixed low = mixed(ph25, acn, 30, "potassium-phosphate");
    ASSERT_TRUE(low.found);
    EXPECT_NEAR(low.ph_w_w, 2.5, 0.3);
    EXPECT_TRUE(low.load.speciated);
    EXPECT_EQ(low.load.form, "dihydrogen-phosphate");
    EXPECT_NEAR(low.load.mmol_per_l, high.load.mmol_per_l, 1e-9); // the same total
    EXPECT_LT(low.load.ratio(), 0.8);                             // not even the "near" caution
}

// Without the eluent's pH the whole group counts as its least soluble form at that fraction
// (conservative): the pH 2.5 line above then reads as if it were all PO4³⁻, the lowest limit
// at 70 % acetonitrile in the shipped tables (8 mmol/L, rule of thumb, common practice, no
// source).
TEST(SolubilityForms, WithoutSpeciationTheLeastSolubleFormCounts) {
    const LineProfile acn = neat_line("acetonitrile", false);
    const LineProfile ph25 =
        buffer_line({{"potassium-dihydrogen-phosphate", 60}, {"hydrochloric-acid", 20}});
    std::array<const LineProfile*, max_lines> lines{&ph25, &acn, nullptr, nullptr};
    const auto loads = salt_loads(shipped_solvents(), lines, LineValues{30, 70, 0, 0});
    ASSERT_EQ(loads.size(), std::size_t(1));
    EXPECT_FALSE(loads[0].speciated);
    EXPECT_EQ(loads[0].form, "phosphate");
    EXPECT_NEAR(loads[0].form_limit_mmol_per_l, 8, 0.5);
    EXPECT_GT(loads[0].ratio(), 1.0);
}

// Below 50 % organic: 400 mmol/L K2HPO4 at 70 % of the flow against 30 % acetonitrile is
// 280 mmol/L at 30 % organic, past the hydrogen form's 200 mmol/L there (rule of thumb, common
// practice, no source); 100 mmol/L (70 in the eluent) is well under it. The former group tables
// said nothing below 50 %.
TEST(SolubilityForms, BelowFiftyPercentOrganic) {
    const LineProfile acn = neat_line("acetonitrile", false);
    const Mixed strong = mixed(buffer_line({{"dipotassium-hydrogen-phosphate", 400}}), acn, 70,
                               "potassium-phosphate");
    ASSERT_TRUE(strong.found);
    EXPECT_NEAR(strong.load.organic_fraction_v, 0.30, 0.005);
    EXPECT_EQ(strong.load.form, "hydrogen-phosphate");
    EXPECT_GT(strong.load.ratio(), 1.0);

    const Mixed mild = mixed(buffer_line({{"dipotassium-hydrogen-phosphate", 100}}), acn, 70,
                             "potassium-phosphate");
    ASSERT_TRUE(mild.found);
    EXPECT_LT(mild.load.ratio(), 0.8);
}

std::vector<Finding> precipitation_of(const LineProfile& p) {
    std::vector<Finding> out;
    for (Finding& f :
         check_line(shipped_solvents(), p, "A", std::nullopt, std::nullopt, &shipped_library()))
        if (f.kind == FindingKind::precipitation)
            out.push_back(f);
    return out;
}

// A bottle with no organic at all: 600 mmol/L Na2HPO4 in water is past its water solubility
// (about 7.7 g per 100 g water at 20 °C, CRC Handbook of Chemistry and Physics, from memory:
// the table's 500 mmol/L at 0 %), 300 mmol/L is not. The finding names the limiting form and
// the pH it was split at.
TEST(SolubilityForms, AqueousBottlePastTheWaterSolubility) {
    const auto over = precipitation_of(buffer_line({{"disodium-hydrogen-phosphate", 600}}));
    ASSERT_EQ(over.size(), std::size_t(1));
    EXPECT_EQ(over[0].severity, Severity::warning);
    EXPECT_EQ(over[0].text_of("form"), "hydrogen-phosphate");
    EXPECT_EQ(over[0].text_of("system"), "phosphate");
    EXPECT_NEAR(over[0].number_of("organic_fraction_v"), 0, 1e-12);
    EXPECT_NEAR(over[0].number_of("form_limit_mmol_per_l"), 500, 1e-9);
    EXPECT_TRUE(over[0].has_number("ph_s_s"));

    EXPECT_TRUE(precipitation_of(buffer_line({{"disodium-hydrogen-phosphate", 300}})).empty());
}

// The split itself: at a pH equal to a step's pKa′ the two species of the step are equal, and
// the fractions sum to 1 (Henderson–Hasselbalch; by definition of pKa′).
TEST(SolubilityForms, SpeciesSharesFromThePkaValues) {
    EluentResult r;
    r.ph_s_s = 7.5;
    r.pka = {{"phosphate", 1, 2.1, 2.6, 2.5, false},
             {"phosphate", 2, 7.2, 7.9, 7.5, false},
             {"phosphate", 3, 12.3, 13.0, 12.8, false}};
    const SpeciesShares sp = species_shares_of(r);
    const auto& f = sp.fractions.at("phosphate");
    ASSERT_EQ(f.size(), std::size_t(4));
    EXPECT_NEAR(f[1], f[2], 1e-12);
    EXPECT_NEAR(f[0] + f[1] + f[2] + f[3], 1, 1e-12);
    EXPECT_NEAR(f[1] / f[0], std::pow(10.0, 7.5 - 2.5), 1e-6 * f[1] / f[0]);
}

// The check's cheap split (EluentModel::point_species, the trace's solve) agrees with the full
// solve's (species_shares_of of EluentModel::solve): the same model, two routes.
TEST(SolubilityForms, PointSpeciesAgreesWithTheFullSolve) {
    const LineProfile acn = neat_line("acetonitrile", false);
    const LineProfile ph7 = buffer_line(
        {{"potassium-dihydrogen-phosphate", 10}, {"dipotassium-hydrogen-phosphate", 50}});
    const std::vector<const LineProfile*> profiles = {&ph7, &acn};
    const EluentModel model(shipped_solvents(), shipped_library(), profiles, 35);
    for (double a : {100.0, 60.0, 30.0}) {
        const std::vector<double> pct = {a, 100 - a};
        std::vector<std::vector<double>> fractions;
        const EluentPoint pt = model.point_species(pct.data(), pct.size(), fractions);
        const SpeciesShares full = species_shares_of(model.solve(pct));
        EXPECT_NEAR(pt.ph_s_s, full.ph_s_s, 1e-6);
        for (std::size_t i = 0; i < model.systems().size(); ++i) {
            const auto& f = full.fractions.at(model.systems()[i]->id);
            ASSERT_EQ(fractions[i].size(), f.size());
            for (std::size_t k = 0; k < f.size(); ++k)
                EXPECT_NEAR(fractions[i][k], f[k], 1e-6);
        }
    }
}

// The library refuses inconsistent form tables with the field named (chem::SolventLibrary).
TEST(SolubilityForms, LibraryRefusesInconsistentFormTables) {
    auto field_of = [](SolubilityTable t, const SolubilityTable* before = nullptr) {
        SolventLibrary lib;
        if (before)
            lib.add_solubility(*before);
        try {
            lib.add_solubility(std::move(t));
        } catch (const Error& e) {
            return e.field();
        }
        return std::string("(accepted)");
    };
    SolubilityTable ok;
    ok.group = "x-phosphate";
    ok.organic = "acetonitrile";
    ok.basis = "rule-of-thumb";
    ok.source = "test";
    ok.points = {{0, 10}};
    ok.form = "hydrogen-phosphate";
    ok.system = "phosphate";
    ok.protons_removed = 2;
    EXPECT_EQ(field_of(ok), "(accepted)");
    SolubilityTable no_system = ok;
    no_system.system.clear();
    EXPECT_EQ(field_of(no_system), "system");
    SolubilityTable acid = ok;
    acid.protons_removed = 0;
    EXPECT_EQ(field_of(acid), "protons_removed");
    SolubilityTable no_form = ok;
    no_form.form.clear();
    EXPECT_EQ(field_of(no_form), "form");
    SolubilityTable other = ok;
    other.form = "citrate";
    other.system = "citrate";
    EXPECT_EQ(field_of(other, &ok), "system");
}

} // namespace
