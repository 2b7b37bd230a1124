// chem/transfer: the USP <621> (harmonised 2022) geometric scaling of a gradient method against
// the worked example of issue 12 and hand arithmetic from the standard's formulas (from memory).
#include "chem/error.h"
#include "chem/transfer.h"
#include "transfer_example.h"

#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <string>

using namespace chem;

namespace {

/// The shared example, for a night of 40 injections.
TransferRequest example(double to_particle_um, std::optional<double> to_flow) {
    TransferRequest r = chem::testing::transfer_example(to_particle_um, to_flow);
    r.sequence_injections = 40;
    return r;
}

/// Two decimals, as a page prints them.
std::string fixed2(double v) {
    char buf[32];
    std::snprintf(buf, sizeof buf, "%.2f", v);
    return buf;
}

// The worked example: 4.6 × 250 mm at 1.0 mL/min with a 10 min gradient, moved to
// 2.1 × 50 mm at 0.2 mL/min: t₂ = 10 · (1.0/0.2) · (50 · 2.1²)/(250 · 4.6²) = 2.084 min.
TEST(Transfer, WorkedExample) {
    const TransferResult r = transfer_method(example(5, 0.2));
    EXPECT_DOUBLE_EQ(r.flow_ml_min, 0.2);
    EXPECT_TRUE(std::abs(r.method.gradient[1].t_min - 2.084) < 0.001);
    EXPECT_EQ(fixed2(r.method.gradient[1].t_min), "2.08");
    // Injection ∝ L·dc²: 10 µL · (50 · 4.41)/(250 · 21.16) = 0.4168 µL.
    EXPECT_TRUE(std::abs(*r.injection_ul - 0.41682) < 1e-4);
    // The chosen 0.2 mL/min is 4 % below the scaled 0.2084 mL/min: noted.
    EXPECT_TRUE(std::abs(r.scaled_flow_ml_min - 1.0 * 4.41 / 21.16) < 1e-9);
    bool noted = false;
    for (const auto& w : r.warnings)
        noted |= w.code == "flow-not-scaled";
    EXPECT_TRUE(noted);
}

// Flow for the same move from 5 µm to 1.7 µm: F₂ = F₁ · (dc₂² dp₁)/(dc₁² dp₂)
// = 1.0 · (4.41 · 5)/(21.16 · 1.7) = 0.6130 mL/min; the gradient then lasts
// 10 · (1/0.6130) · 0.041682 = 0.680 min.
TEST(Transfer, FlowForSmallerParticles) {
    const TransferResult r = transfer_method(example(1.7, std::nullopt));
    EXPECT_TRUE(std::abs(r.flow_ml_min - 0.61297) < 1e-4);
    EXPECT_TRUE(std::abs(r.method.gradient[1].t_min - 0.680) < 0.001);
    // L/dp: 250/5 = 50 000 → 50/1.7 = 29 412: −41 %, outside −25 % … +50 %.
    EXPECT_TRUE(std::abs(r.l_over_dp_change - (-0.41176)) < 1e-4);
    EXPECT_FALSE(r.within_allowed_adjustment);
}

// 4.6 → 2.1 mm at the same length and particle size saves 1 − 2.1²/4.6² = 79.2 % of the
// solvent (the "about 79 %"), gradient times unchanged.
TEST(Transfer, SavingSameLength) {
    TransferRequest q = example(5, std::nullopt);
    q.to.column.length_mm = 250;
    const TransferResult r = transfer_method(q);
    EXPECT_TRUE(std::abs(r.saving_fraction - (1 - 4.41 / 21.16)) < 1e-9);
    EXPECT_TRUE(std::abs(r.method.gradient[1].t_min - 10) < 1e-9);
    EXPECT_TRUE(std::abs(r.solvent_from_ml - 17.0) < 1e-9); // 1 mL/min × (12 + 5) min
    EXPECT_TRUE(std::abs(r.solvent_from_sequence_ml - 40 * 17.0) < 1e-9);
    EXPECT_TRUE(r.within_allowed_adjustment); // L/dp unchanged
}

// L/dp band of the allowed adjustments: 150 mm/5 µm → 100 mm/3 µm is +11 %, inside;
// 150/5 → 150/2.5 is +100 %, outside.
TEST(Transfer, AllowedBand) {
    TransferRequest q = example(3, std::nullopt);
    q.from.column.length_mm = 150;
    q.to.column.length_mm = 100;
    EXPECT_TRUE(transfer_method(q).within_allowed_adjustment);
    q.to.column.length_mm = 150;
    q.to.column.particle_um = 2.5;
    EXPECT_FALSE(transfer_method(q).within_allowed_adjustment);
}

// Dwell correction: keep the delay in column volumes. From 1.0 mL dwell at 1 mL/min on the old
// column, k_t = 0.2: old delay scaled 0.2 min; new system 0.02 mL at 0.2084 mL/min = 0.096 min,
// so a hold of 0.104 min is added before the gradient.
TEST(Transfer, DwellCorrection) {
    TransferRequest q = example(5, std::nullopt);
    q.from.dwell_ml = 1.0;
    q.to.dwell_ml = 0.02;
    const TransferResult r = transfer_method(q);
    const double kt = r.time_factor;
    EXPECT_TRUE(std::abs(kt - 0.2) < 1e-9);
    const double hold = 1.0 * kt - 0.02 / r.flow_ml_min;
    EXPECT_TRUE(std::abs(r.hold_added_min - hold) < 1e-9);
    EXPECT_DOUBLE_EQ(r.method.gradient[0].t_min, 0.0);
    EXPECT_TRUE(std::abs(r.method.gradient[1].t_min - (10 * kt + hold)) < 1e-9);
    // A larger dwell on the new system cannot be hidden by a hold: a caution says so.
    q.to.dwell_ml = 1.0;
    const TransferResult big = transfer_method(q);
    EXPECT_DOUBLE_EQ(big.hold_added_min, 0.0);
    EXPECT_EQ(big.warnings.front().code, std::string("dwell-too-large"));
}

TEST(Transfer, BadInput) {
    TransferRequest q = example(5, std::nullopt);
    q.to.column.particle_um = 0.3;
    try {
        transfer_method(q);
        FAIL() << "accepted";
    } catch (const Error& e) {
        EXPECT_EQ(e.field(), std::string("to.particle_um"));
    }
    q = example(5, 0.0);
    try {
        transfer_method(q);
        FAIL() << "accepted";
    } catch (const Error& e) {
        EXPECT_EQ(e.field(), std::string("to.flow_ml_min"));
    }
}

} // namespace
