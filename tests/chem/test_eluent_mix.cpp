// mix_lines: blending line profiles by the pump's percentages.
#include "chem/eluent_mix.h"
#include "chem/error.h"
#include "line_profiles.h"
#include "shipped_library.h"

#include <gtest/gtest.h>

#include <cmath>

using namespace chem;
using chem::testing::neat_line;

using chem::testing::solvents;

namespace {

// Volume fractions are the pump's shares; solutes are diluted by the share and by the
// contraction. Arithmetic by hand: 20 mmol/L × 0.6 = 12 mmol/L before contraction.
TEST(EluentMix, DilutesAndBlends) {
    LineProfile a = neat_line("water", true);
    a.solutes.push_back({"sodium-dihydrogen-phosphate", 20.0, SoluteSource::buffer});
    LineProfile b = neat_line("acetonitrile", false);
    const EluentMix m = mix_lines(solvents(), {{&a, 60}, {&b, 40}});
    EXPECT_DOUBLE_EQ(m.solvent_fraction_v.at("water"), 0.6);
    EXPECT_DOUBLE_EQ(m.solvent_fraction_v.at("acetonitrile"), 0.4);
    EXPECT_DOUBLE_EQ(m.organic_fraction_v, 0.4);
    EXPECT_TRUE(m.contraction_fraction > 0.0 && m.contraction_fraction < 0.05);
    ASSERT_EQ(m.solutes.size(), std::size_t(1));
    EXPECT_DOUBLE_EQ(m.solutes[0].mmol_per_l, 12.0 / (1.0 - m.contraction_fraction));
    EXPECT_EQ(m.solutes[0].from, SoluteSource::buffer); // one line brings it, as a buffer
    // Mole fraction of acetonitrile at 40 % v/v: n = V·ρ/M; ρ(MeCN, 20 °C) ≈ 0.7857 g/mL,
    // M = 41.05 g/mol (CRC Handbook, from memory); water 0.9982 g/mL, 18.015 g/mol.
    const double n_o = 0.4 * 0.7857 / 41.053, n_w = 0.6 * 0.9982 / 18.015;
    EXPECT_LT(std::abs(m.mole_fraction.at("acetonitrile") - n_o / (n_o + n_w)), 0.002);
}

// A reagent a buffer part brings on one line and an additive on the other comes from both
// (by definition of SoluteSource, chem/line.h); one from an additive alone stays an additive.
TEST(EluentMix, SolutesKeepWhereTheyComeFrom) {
    LineProfile a = neat_line("water", true);
    a.solutes.push_back({"formic-acid", 10.0, SoluteSource::buffer});
    LineProfile b = neat_line("acetonitrile", false);
    b.solutes.push_back({"formic-acid", 26.5, SoluteSource::additive});
    b.solutes.push_back({"trifluoroacetic-acid", 13.0, SoluteSource::additive});
    const EluentMix m = mix_lines(solvents(), {{&a, 50}, {&b, 50}});
    ASSERT_EQ(m.solutes.size(), std::size_t(2));
    EXPECT_EQ(m.solutes[0].reagent, "formic-acid");
    EXPECT_EQ(m.solutes[0].from, SoluteSource::buffer_and_additive);
    EXPECT_EQ(m.solutes[1].from, SoluteSource::additive);
    EXPECT_STREQ(solute_source_name(m.solutes[0].from), "buffer+additive");
}

TEST(EluentMix, RefusesBadPercentages) {
    LineProfile a = neat_line("water", true), b = neat_line("methanol", false);
    EXPECT_THROW(mix_lines(solvents(), {{&a, 60}, {&b, 30}}), Error);
    EXPECT_THROW(mix_lines(solvents(), {{&a, -10}, {&b, 110}}), Error);
    EXPECT_THROW(mix_lines(solvents(), {{&a, NAN}, {&b, 100}}), Error);
    LineProfile undescribed;
    EXPECT_THROW(mix_lines(solvents(), {{&undescribed, 50}, {&b, 50}}), Error);
    // A line at 0 % needs no description.
    EXPECT_DOUBLE_EQ(mix_lines(solvents(), {{&undescribed, 0}, {&b, 100}}).organic_fraction_v, 1.0);
}

} // namespace
