// A solvent's UV absorbance against wavelength: a published table where data/solvents.json has one
// (log-linear between its rows), the cutoff model where not; a line's cutoff and absorbance from
// its parts (absorbance adds).
#include "chem/line.h"
#include "shipped_library.h"

#include <gtest/gtest.h>

#include <cmath>
#include <random>

using namespace chem;

using chem::testing::solvents;

namespace {

UvPart neat(const std::string& id, double fraction = 1.0) {
    const Solvent& s = solvents().solvent(id, "(test)");
    return {s.id, s.uv_cutoff_nm, fraction, s.uv_absorbance};
}

LineProfile line_of(std::vector<std::pair<std::string, double>> parts) {
    LineSpec spec;
    spec.field = "lines.A";
    for (const auto& [id, f] : parts)
        spec.parts.push_back({id, std::nullopt, f});
    return profile_line(solvents(), chem::testing::shipped_library(), spec);
}

// The acetonitrile rows as published: maximum absorbance 0.12 at 195 nm, 0.032 at 200 nm and
// 0.0044 at 230, 235, 250 and 400 nm (ChemicalBook acetonitrile property page, CAS 75-05-8, a
// supplier's UV/HPLC grade specification reproduced there; read). At a tabulated wavelength the
// model returns the published figure itself.
TEST(UvAbsorbance, AcetonitrileReturnsThePublishedRows) {
    const UvPart acn = neat("acetonitrile");
    ASSERT_EQ(acn.table.size(), std::size_t(6));
    const std::pair<double, double> published[] = {{195, 0.12},   {200, 0.032},  {230, 0.0044},
                                                   {235, 0.0044}, {250, 0.0044}, {400, 0.0044}};
    for (const auto& [nm, a] : published)
        EXPECT_DOUBLE_EQ(uv_part_absorbance(acn, nm), a) << nm << " nm";
    EXPECT_NE(solvents().solvent("acetonitrile", "").sources.count("uv_absorbance"), 0u);
}

// Between rows the absorbance is log-linear in wavelength: halfway from 200 to 230 nm it is the
// geometric mean of the two published figures (ChemicalBook rows above, read).
TEST(UvAbsorbance, LogLinearBetweenRows) {
    const UvPart acn = neat("acetonitrile");
    EXPECT_NEAR(uv_part_absorbance(acn, 215), std::sqrt(0.032 * 0.0044), 1e-15);
    // A third of the way from 200 to 230 nm, at 210 nm: 0.032 · (0.0044/0.032)^(1/3) = 0.0165,
    // above the 0.010 the cutoff model alone gave (one decade per 10 nm above 190 nm).
    EXPECT_NEAR(uv_part_absorbance(acn, 210), 0.032 * std::cbrt(0.0044 / 0.032), 1e-15);
    // Never rising with wavelength, from far below the cutoff to past the table.
    double last = uv_part_absorbance(acn, 150);
    for (double nm = 150.5; nm <= 600; nm += 0.5) {
        const double a = uv_part_absorbance(acn, nm);
        EXPECT_LE(a, last * (1 + 1e-12)) << nm << " nm";
        last = a;
    }
}

// The cutoff (absorbance 1 at 190 nm, Snyder, Kirkland & Dolan 2010, from memory) joins the table
// below its first row (0.12 at 195 nm, read): log-linear from 1 to 0.12 between 190 and 195 nm,
// and a decade per 10 nm below 190 nm. Above the last row (400 nm) the published maximum holds.
TEST(UvAbsorbance, CutoffJoinsTheTableAndTheLastRowHolds) {
    const UvPart acn = neat("acetonitrile");
    EXPECT_DOUBLE_EQ(uv_part_absorbance(acn, 190), 1.0);
    EXPECT_NEAR(uv_part_absorbance(acn, 192.5), std::sqrt(0.12), 1e-15);
    EXPECT_NEAR(uv_part_absorbance(acn, 180), 10.0, 1e-12);
    EXPECT_DOUBLE_EQ(uv_part_absorbance(acn, 600), 0.0044);
    // A neat acetonitrile line's cutoff stays the published 190 nm.
    const LineProfile p = line_of({{"acetonitrile", 1.0}});
    EXPECT_NEAR(p.uv_cutoff_nm, 190.0, 1e-8);
    EXPECT_EQ(p.uv_limited_by, "acetonitrile");
}

// Where no table was found the cutoff model stands: methanol, cutoff 205 nm (Snyder, Kirkland &
// Dolan 2010, from memory), absorbs 10^((205 − 215)/10) = 0.1 at 215 nm.
TEST(UvAbsorbance, NoTableFollowsTheCutoffModel) {
    const UvPart meoh = neat("methanol");
    EXPECT_TRUE(meoh.table.empty());
    EXPECT_NEAR(uv_part_absorbance(meoh, 215), 0.1, 1e-15);
    const LineProfile p = line_of({{"methanol", 1.0}});
    EXPECT_NEAR(p.uv_cutoff_nm, 205.0, 1e-12);
}

// Absorbance adds by volume fraction (Beer–Lambert). Half acetonitrile, half water at 200 nm:
// 0.5 · 0.032 (ChemicalBook row, read) + 0.5 · 10^((190 − 200)/10) (water, cutoff 190 nm,
// Snyder, Kirkland & Dolan 2010, from memory) = 0.066. At 190 nm both absorb 1, so the line's
// cutoff stays 190 nm (0.5·1 + 0.5·1).
TEST(UvAbsorbance, AbsorbanceAddsByFraction) {
    const LineProfile p = line_of({{"water", 0.5}, {"acetonitrile", 0.5}});
    EXPECT_NEAR(uv_absorbance(p.uv_parts, 200), 0.5 * 0.032 + 0.5 * 0.1, 1e-15);
    EXPECT_NEAR(p.uv_cutoff_nm, 190.0, 1e-8);
    // Acetonitrile with 5 % tetrahydrofuran (cutoff 212 nm, Snyder, Kirkland & Dolan 2010, from
    // memory): the sum at the line's cutoff is 1, whichever model each part follows, and the THF
    // (0.05 · 10^((212 − 199)/10) ≈ 1 near 199 nm) brings most of it.
    const LineProfile q = line_of({{"acetonitrile", 0.95}, {"tetrahydrofuran", 0.05}});
    EXPECT_NEAR(uv_absorbance(q.uv_parts, q.uv_cutoff_nm), 1.0, 1e-9);
    EXPECT_GT(q.uv_cutoff_nm, 198.0);
    EXPECT_LT(q.uv_cutoff_nm, 200.0);
    EXPECT_EQ(q.uv_limited_by, "tetrahydrofuran");
}

// The cutoff solves Σ s_i·A_i(λ) = 1 for any mixture with a table (a property, no source): 200
// random mixtures of acetonitrile, water, methanol and acetone at random scales.
TEST(UvAbsorbance, CutoffIsWhereTheSumReachesOne) {
    std::mt19937 rng(11);
    std::uniform_real_distribution<double> u(0.0, 1.0);
    for (int trial = 0; trial < 200; ++trial) {
        std::vector<UvPart> parts = {neat("acetonitrile", u(rng)), neat("water", u(rng)),
                                     neat("methanol", 0.2 * u(rng)),
                                     neat("acetone", 0.001 * u(rng))};
        std::string who;
        const double cut = line_uv_cutoff_nm(parts, &who);
        EXPECT_NEAR(uv_absorbance(parts, cut), 1.0, 1e-8) << "trial " << trial;
        EXPECT_FALSE(who.empty());
    }
    // Without a table the closed form and the absorbance agree as before.
    const std::vector<UvPart> plain = {neat("methanol", 0.5), neat("water", 0.5)};
    EXPECT_NEAR(uv_absorbance(plain, line_uv_cutoff_nm(plain, nullptr)), 1.0, 1e-12);
}

} // namespace
