// chem/pressure: Darcy with the Kozeny–Carman resistance against a hand calculation, its scaling
// with flow, length, i.d. and particle size, the calibration, the lag of the gradient through the
// dwell and column volumes, the pressure-limit check, and bad input naming its field.
#include "chem/checks.h"
#include "chem/error.h"
#include "chem/finding_text.h"
#include "chem/pressure.h"
#include "chem/units.h"
#include "chem/viscosity.h"
#include "line_profiles.h"
#include "shipped_library.h"

#include <gtest/gtest.h>

#include <cmath>
#include <random>
#include <string>
#include <vector>

using namespace chem;

class Pressure : public ::testing::Test {
  protected:
    const SolventLibrary& solvents_ = chem::testing::shipped_solvents();
    LineProfile water_ = neat("water", true);
    LineProfile methanol_ = neat("methanol", false);
    LineProfile acetonitrile_ = neat("acetonitrile", false);

    static LineProfile neat(const std::string& id, bool aqueous) {
        return chem::testing::neat_line(id, aqueous);
    }
    std::array<const LineProfile*, max_lines> lines(const LineProfile& b) const {
        return {&water_, &b, nullptr, nullptr};
    }
    static Method isocratic(double flow, double b_percent, double run = 5) {
        Method m;
        m.name = "iso";
        m.flow_ml_min = flow;
        m.gradient = {{0, {100 - b_percent, b_percent, 0, 0}}};
        m.run_min = run;
        return m;
    }
    static Method gradient(double flow) {
        Method m;
        m.name = "grad";
        m.flow_ml_min = flow;
        m.gradient = {{0, {100, 0, 0, 0}}, {20, {0, 100, 0, 0}}};
        m.run_min = 25;
        m.equilibration_min = 10;
        return m;
    }
    static Column column(double l, double id, double dp) {
        Column c;
        c.length_mm = l;
        c.id_mm = id;
        c.particle_um = dp;
        return c;
    }
    double iso_bar(const Column& c, double flow, double b = 0, const Instrument& in = {}) const {
        return pressure_trace(solvents_, lines(methanol_), isocratic(flow, b), c, in)
            .max_pressure_bar;
    }
};

// Darcy with Kozeny–Carman by hand (Carman 1937; Bird, Stewart & Lightfoot §6.4):
// Φ = 180·0.6²/0.4³ = 1012.5; water at 25 °C η = 0.89002 mPa·s (IAPWS 2008);
// 4.6 × 250 mm, 5 µm, 1 mL/min: u_s = 1e-6/60 / (π·0.0046²/4) m/s;
// ΔP = Φ η L u_s / dp² = 1012.5 · 0.89002e-3 · 0.25 · u_s / (5e-6)² Pa ≈ 90.3 bar.
TEST_F(Pressure, DarcyByHand) {
    EXPECT_DOUBLE_EQ(kozeny_carman_resistance(0.4), 1012.5);
    const double us = 1e-6 / 60 / (3.14159265358979 * 0.0046 * 0.0046 / 4);
    const double expected_bar = 1012.5 * 0.89002e-3 * 0.25 * us / (5e-6 * 5e-6) / 1e5;
    const double got = iso_bar(column(250, 4.6, 5), 1.0);
    EXPECT_LT(std::abs(got / expected_bar - 1), 0.001) << got;
    EXPECT_TRUE(std::abs(expected_bar - 90.3) < 0.1);
}

// ΔP ∝ F, ∝ L, ∝ 1/dc², ∝ 1/dp² (Darcy): exact ratios.
TEST_F(Pressure, Scaling) {
    const double base = iso_bar(column(150, 4.6, 5), 1.0, 30);
    EXPECT_TRUE(std::abs(iso_bar(column(150, 4.6, 5), 2.0, 30) / base - 2) < 1e-9);
    EXPECT_TRUE(std::abs(iso_bar(column(300, 4.6, 5), 1.0, 30) / base - 2) < 1e-9);
    EXPECT_TRUE(std::abs(iso_bar(column(150, 2.3, 5), 1.0, 30) / base - 4) < 1e-9);
    const double ratio = iso_bar(column(150, 4.6, 1.7), 1.0, 30) / base;
    EXPECT_TRUE(std::abs(ratio - (5 / 1.7) * (5 / 1.7)) < 1e-9);
}

// A measured reference pressure calibrates Φ: the same conditions give the same pressure
// back, and other conditions scale from it. The system pressure is subtracted first.
TEST_F(Pressure, Calibration) {
    Column c = column(150, 4.6, 5);
    c.reference = ReferencePressure{150.0, 1.0, {50, 50, 0, 0}, std::nullopt};
    Instrument in;
    in.system_pressure_bar = 10;
    in.system_flow_ml_min = 1.0;
    const PressureTrace t = pressure_trace(solvents_, lines(methanol_), isocratic(1.0, 50), c, in);
    EXPECT_TRUE(t.calibrated);
    EXPECT_TRUE(std::abs(t.max_pressure_bar - 150.0) < 1e-6);
    const double at_half =
        pressure_trace(solvents_, lines(methanol_), isocratic(0.5, 50), c, in).max_pressure_bar;
    EXPECT_TRUE(std::abs(at_half - 75.0) < 1e-6); // column and system both ∝ F
    // A reference at or below the system's own pressure is refused, naming the field.
    c.reference->pressure_bar = 5;
    try {
        pressure_trace(solvents_, lines(methanol_), isocratic(1.0, 50), c, in);
        FAIL() << "accepted";
    } catch (const Error& e) {
        EXPECT_EQ(e.field(), std::string("column.reference.pressure_bar"));
    }
}

// Water–methanol gradient: the peak comes mid-gradient, not at either end, about 1.8 times
// the water pressure (Mikhail & Kimel 1961: η max ≈ 1.6 mPa·s vs 0.89 for water; from memory).
TEST_F(Pressure, MethanolPeakMidGradient) {
    const PressureTrace t =
        pressure_trace(solvents_, lines(methanol_), gradient(1.0), column(150, 4.6, 3), {});
    const double water = t.points.front().pressure_bar;
    EXPECT_TRUE(t.max_at_t_min > 5 && t.max_at_t_min < 15);
    EXPECT_TRUE(t.max_pressure_bar / water > 1.6 && t.max_pressure_bar / water < 2.0);
    EXPECT_TRUE(t.organic_fraction_v_at_max > 0.3 && t.organic_fraction_v_at_max < 0.55);
    EXPECT_EQ(t.points.size(), std::size_t(351)); // 35 min at 0.1 min
}

// The composition in the column lags the mixer by the dwell and spreads over the column
// volume: a dwell of 2 mL at 1 mL/min moves the peak by 2 min.
TEST_F(Pressure, LagByDwellAndColumn) {
    const Column c = column(150, 4.6, 3);
    Instrument in;
    const PressureTrace t0 = pressure_trace(solvents_, lines(methanol_), gradient(1.0), c, in);
    in.dwell_ml = 2.0;
    const PressureTrace t2 = pressure_trace(solvents_, lines(methanol_), gradient(1.0), c, in);
    EXPECT_TRUE(std::abs(t2.max_at_t_min - t0.max_at_t_min - 2.0) < 0.11);
    EXPECT_TRUE(std::abs(t2.max_pressure_bar - t0.max_pressure_bar) < 0.5);
    EXPECT_DOUBLE_EQ(t2.dwell_min, 2.0);
    // Column volume ε_T π dc²/4 L = 0.65 · π · 0.46²/4 · 15 mL.
    EXPECT_TRUE(std::abs(t0.column_volume_ml - 0.65 * 3.14159265 * 0.46 * 0.46 / 4 * 15) < 1e-6);
    // At t = 0 the column still holds the previous injection's re-equilibration: pure A.
    EXPECT_TRUE(t0.points.front().organic_fraction_v < 1e-12);
    // Mean over the column: at 10 min (no dwell) the column holds 10 − V_m/F … 10 min, so
    // the mean organic fraction is 5 %/min × (10 − t_col/2).
    const double expect = 0.05 * (10 - t0.column_min / 2);
    EXPECT_TRUE(std::abs(t0.points[100].organic_fraction_v - expect) < 1e-3);
}

// Plates N ≈ 3000 · L(cm) / dp(µm), common practice: 250 mm, 5 µm → 15 000.
TEST_F(Pressure, Plates) {
    EXPECT_DOUBLE_EQ(plates_estimate(column(250, 4.6, 5)), 15000.0);
}

// pressure-limit: a warning above the lower limit, a caution within 10 %, quiet below.
TEST_F(Pressure, PressureLimitCheck) {
    Column c = column(50, 2.1, 1.7);
    const PressureTrace free_run =
        pressure_trace(solvents_, lines(methanol_), gradient(0.4), c, {});
    EXPECT_FALSE(pressure_limit_warning("grad", free_run)); // no limit given
    const double peak = free_run.max_pressure_bar;
    Instrument in;
    in.max_pressure_bar = peak * 0.95; // instrument lower than the column
    c.max_pressure_bar = peak * 1.5;
    auto w = pressure_limit_warning(
        "grad", pressure_trace(solvents_, lines(methanol_), gradient(0.4), c, in));
    EXPECT_TRUE(w);
    EXPECT_EQ(std::string(w->code()), "pressure-limit");
    EXPECT_EQ(w->severity, Warning::Severity::warning);
    EXPECT_TRUE(describe(*w, RenderContext{}).find("instrument") != std::string::npos);
    EXPECT_EQ(w->subject, Subject::of_method("grad"));
    in.max_pressure_bar = peak * 1.05;
    w = pressure_limit_warning("grad",
                               pressure_trace(solvents_, lines(methanol_), gradient(0.4), c, in));
    EXPECT_TRUE(w);
    EXPECT_EQ(w->severity, Warning::Severity::caution);
    in.max_pressure_bar = peak * 1.2;
    EXPECT_FALSE(pressure_limit_warning(
        "grad", pressure_trace(solvents_, lines(methanol_), gradient(0.4), c, in)));
}

// Bad input names the field.
TEST_F(Pressure, BadInput) {
    struct Row {
        const char* name;
        std::string field;
    };
    const std::vector<Row> rows = {
        {"length", "column.length_mm"},           {"id", "column.id_mm"},
        {"particle small", "column.particle_um"}, {"particle large", "column.particle_um"},
        {"porosity", "column.porosity"},          {"temperature", "column.temperature_c"},
        {"flow", "methods.grad.flow_ml_min"},     {"dwell", "instrument.dwell_ml"},
        {"undescribed line", "lines.B.parts"}};
    for (const Row& r : rows) {
        SCOPED_TRACE(r.name);
        Column c = column(150, 4.6, 5);
        Instrument in;
        Method m = gradient(1.0);
        auto prof = lines(methanol_);
        const std::string row = r.name;
        if (row == "length")
            c.length_mm = 0;
        if (row == "id")
            c.id_mm = -4.6;
        if (row == "particle small")
            c.particle_um = 0.4;
        if (row == "particle large")
            c.particle_um = 60;
        if (row == "porosity")
            c.porosity = 0.95;
        if (row == "temperature")
            c.temperature_c = 120;
        if (row == "flow")
            m.flow_ml_min = 0;
        if (row == "dwell")
            in.dwell_ml = -1;
        if (row == "undescribed line")
            prof[1] = nullptr;
        try {
            pressure_trace(solvents_, prof, m, c, in);
            ADD_FAILURE() << "accepted";
        } catch (const Error& e) {
            EXPECT_EQ(e.field(), r.field);
        }
    }
}

// Never NaN, never negative, over random valid columns, flows, temperatures and gradients.
TEST_F(Pressure, FiniteAndPositive) {
    std::mt19937 rng(12);
    auto u = [&](double lo, double hi) { return std::uniform_real_distribution<>(lo, hi)(rng); };
    for (int i = 0; i < 300; ++i) {
        Column c = column(u(10, 300), u(0.5, 10), u(0.5, 50));
        c.porosity = u(0.2, 0.9);
        c.total_porosity = u(c.porosity + 0.01, 0.95);
        c.temperature_c = u(0, 90);
        Instrument in;
        in.dwell_ml = u(0, 5);
        if (i % 2) {
            in.system_pressure_bar = u(0, 50);
            in.system_flow_ml_min = u(0.1, 2);
        }
        Method m = gradient(u(0.01, 5));
        m.equilibration_min = u(0, 10);
        const PressureTrace t =
            pressure_trace(solvents_, lines(i % 3 ? methanol_ : acetonitrile_), m, c, in);
        for (const PressurePoint& p : t.points)
            EXPECT_TRUE(std::isfinite(p.pressure_bar) && p.pressure_bar > 0 &&
                        std::isfinite(p.viscosity_mpa_s) && p.viscosity_mpa_s > 0 &&
                        p.organic_fraction_v >= -1e-12 && p.organic_fraction_v <= 1 + 1e-12);
    }
}
