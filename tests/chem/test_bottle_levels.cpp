// chem::bottle_levels: the bottles' levels and the waste through the night.
// Every expected value below is worked by hand from flow × time × share of the line.
#include "chem/bottle_levels.h"

#include <gtest/gtest.h>

namespace {

constexpr double tol_ml = 1e-9;

/// Lines A (1000 mL bottle, 30 mL residue, 20 mL priming) and B (500, 20, 10).
/// Row 1: 4 injections of 30 min at 1 mL/min, 60 % A / 40 % B → 120 min, ends at 2 h;
///        A draws 0.6 × 1 × 120 = 72 mL, B 0.4 × 1 × 120 = 48 mL.
/// Row 2: 2 injections of 60 min at 0.5 mL/min, 100 % A → 120 min, ends at 4 h;
///        A draws 1.0 × 0.5 × 120 = 60 mL, B nothing.
/// Standby: 150 min at 0.2 mL/min, 50 / 50 → 15 mL each, ends at 4 h + 2.5 h = 6.5 h.
/// required A = 20 + 72 + 60 + 15 = 167 mL, B = 10 + 48 + 15 = 73 mL;
/// waste = 30 (priming) + 120 + 60 + 30 = 240 mL.
chem::BottleLevelsInput two_rows_and_standby() {
    chem::BottleLevelsInput in;
    in.lines[0] = chem::BottleLevelLine{1000, 30, 20, 167, std::nullopt};
    in.lines[1] = chem::BottleLevelLine{500, 20, 10, 73, std::nullopt};
    in.rows.push_back({2.0, {72, 48, 0, 0}});
    in.rows.push_back({4.0, {60, 0, 0, 0}});
    in.standby_end_hours = 6.5;
    in.waste_ml = 240;
    return in;
}

void expect_points(const std::vector<chem::LevelPoint>& got,
                   const std::vector<chem::LevelPoint>& want) {
    ASSERT_EQ(got.size(), want.size());
    for (size_t i = 0; i < want.size(); ++i) {
        EXPECT_NEAR(got[i].hours, want[i].hours, tol_ml) << "point " << i;
        EXPECT_NEAR(got[i].ml, want[i].ml, tol_ml) << "point " << i;
    }
}

TEST(BottleLevels, DrainRowByRowThenStandby) {
    const chem::BottleLevels out = chem::bottle_levels(two_rows_and_standby());
    // Worked by hand: A 1000 − 20 = 980 at 0 h, − 72 = 908 at 2 h, − 60 = 848 at 4 h,
    // 1000 − 167 = 833 at 6.5 h.
    expect_points(out.level[0], {{0, 980}, {2, 908}, {4, 848}, {6.5, 833}});
    // Worked by hand: B 500 − 10 = 490, − 48 = 442, 442 (row 2 draws no B), 500 − 73 = 427.
    expect_points(out.level[1], {{0, 490}, {2, 442}, {4, 442}, {6.5, 427}});
    EXPECT_TRUE(out.level[2].empty());
    EXPECT_TRUE(out.level[3].empty());
    // Worked by hand: waste 20 + 10 = 30 at 0 h, + 120 = 150 at 2 h, + 60 = 210, 240 at 6.5 h.
    expect_points(out.waste, {{0, 30}, {2, 150}, {4, 210}, {6.5, 240}});
    EXPECT_FALSE(out.dry[0]);
    EXPECT_FALSE(out.dry[1]);
    // Worked by hand: the last point is at 6.5 h → 7 whole hours; the largest volume is A's
    // 1000 mL bottle.
    EXPECT_EQ(out.chart_hours, 7);
    EXPECT_EQ(out.chart_max_ml, 1000);
}

TEST(BottleLevels, WasteCapacityWidensTheChart) {
    chem::BottleLevelsInput in = two_rows_and_standby();
    in.waste_capacity_ml = 4000;
    EXPECT_EQ(chem::bottle_levels(in).chart_max_ml, 4000);
}

TEST(BottleLevels, WithoutStandbyTheLastRowEnds) {
    chem::BottleLevelsInput in = two_rows_and_standby();
    in.standby_end_hours.reset();
    const chem::BottleLevels out = chem::bottle_levels(in);
    // Worked by hand: the same as above without the 6.5 h point; the last point at 4 h.
    expect_points(out.level[0], {{0, 980}, {2, 908}, {4, 848}});
    expect_points(out.waste, {{0, 30}, {2, 150}, {4, 210}});
    EXPECT_EQ(out.chart_hours, 4);
}

TEST(BottleLevels, RunsDryAndRowsBeforeTheStartAreLeftOut) {
    // Line C: 100 mL bottle, 5 mL residue, 10 mL priming; one row of 120 min at 1 mL/min of
    // 100 % C ends at 2 h and draws 120 mL. Usable after priming: 100 − 5 − 10 = 85 mL, gone
    // after 85 min = 85/60 h.
    chem::BottleLevelsInput in;
    in.lines[2] = chem::BottleLevelLine{100, 5, 10, 130, 85.0 / 60.0};
    in.rows.push_back({-0.5, {0, 0, 999, 0}}); // ends before the start: left out
    in.rows.push_back({2.0, {0, 0, 120, 0}});
    in.waste_ml = 130;
    const chem::BottleLevels out = chem::bottle_levels(in);
    // Worked by hand: 100 − 10 = 90 at 0 h; 90 − 120 = −30 at 2 h (drawn past empty; the chart
    // floors it).
    expect_points(out.level[2], {{0, 90}, {2, -30}});
    expect_points(out.waste, {{0, 10}, {2, 130}});
    ASSERT_TRUE(out.dry[2]);
    EXPECT_NEAR(out.dry[2]->hours, 85.0 / 60.0, 1e-12);
    EXPECT_EQ(out.dry[2]->ml, 5);
    // Worked by hand: the waste's 130 mL at 2 h tops the 100 mL bottle.
    EXPECT_EQ(out.chart_max_ml, 130);
    EXPECT_EQ(out.chart_hours, 2);
}

TEST(BottleLevels, ADryTimeBeforeTheStartDrawsNoPoint) {
    chem::BottleLevelsInput in;
    in.lines[0] = chem::BottleLevelLine{50, 5, 60, 60, -1.0}; // unreadable clock time → −1 h
    EXPECT_FALSE(chem::bottle_levels(in).dry[0]);
}

} // namespace
