// The equilibrium solver's iteration budget (chem/equilibrium.cpp): how many charge-balance
// solves (`Speciation::iterations`, the CLI's `solver_iterations`) one pH takes. The budget is the
// solver's speed contract without any timing: Steffensen's acceleration of the ionic-strength fixed
// point (Davies) converges in a few solves, and the SIT fixed point on the species' concentrations
// in a few more. A change that loses the acceleration or the warm bracket shows here as a count.
// Budgets: measured on the shipped library when the test was written (Davies at most 7, SIT at
// most 12 over the grid below), with head room; common practice, no source.
#include "chem/equilibrium.h"
#include "chem/error.h"
#include "shipped_library.h"

#include <gtest/gtest.h>

#include <string>
#include <tuple>

using chem::testing::shipped_library;

namespace {

constexpr int davies_budget = 10; ///< charge-balance solves per pH, Davies
constexpr int sit_budget = 20;    ///< charge-balance solves per pH, SIT

int budget_of(chem::ActivityModel model) {
    return model == chem::ActivityModel::davies ? davies_budget : sit_budget;
}

class EveryReagentAlone : public ::testing::TestWithParam<chem::ActivityModel> {};

// Each reagent of the library with an acid-base system, alone in water at 1 mmol/L to 0.1 mol/L
// and 5 to 50 °C: the solve converges within the budget, and takes at least one solve.
TEST_P(EveryReagentAlone, WithinBudget) {
    const chem::ActivityModel model = GetParam();
    const chem::Library& lib = shipped_library();
    int most = 0, solves = 0;
    std::string worst;
    for (const chem::Reagent& r : lib.reagents()) {
        if (r.systems.empty())
            continue;
        for (double c : {0.001, 0.01, 0.1}) {
            for (double t : {5.0, 25.0, 50.0}) {
                const chem::Speciation s = chem::solve(lib, {{&r, c}}, t, model);
                ASSERT_GE(s.iterations, 1) << r.id;
                ++solves;
                if (s.iterations > most) {
                    most = s.iterations;
                    worst =
                        r.id + " " + std::to_string(c) + " mol/L at " + std::to_string(t) + " C";
                }
            }
        }
    }
    EXPECT_GT(solves, 100);
    std::printf("%d solves, at most %d charge-balance solves per pH (%s)\n", solves, most,
                worst.c_str());
    EXPECT_LE(most, budget_of(model)) << most << " solves per pH for " << worst;
}

INSTANTIATE_TEST_SUITE_P(Models, EveryReagentAlone,
                         ::testing::Values(chem::ActivityModel::davies, chem::ActivityModel::sit),
                         [](const auto& info) {
                             return std::string(info.param == chem::ActivityModel::davies ? "davies"
                                                                                          : "sit");
                         });

class Buffers : public ::testing::TestWithParam<std::tuple<const char*, const char*, const char*>> {
};

// Buffers at 10 to 100 mmol/L, the acid and base in ratios 1:9 to 9:1, both models.
TEST_P(Buffers, WithinBudget) {
    const auto& [row, acid, base] = GetParam();
    const chem::Library& lib = shipped_library();
    const chem::Reagent* a = lib.find_reagent(acid);
    const chem::Reagent* b = lib.find_reagent(base);
    ASSERT_TRUE(a && b) << row << ": reagent ids as in data/reagents.json";
    for (auto model : {chem::ActivityModel::davies, chem::ActivityModel::sit}) {
        for (double total : {0.01, 0.05, 0.1}) {
            for (double share : {0.1, 0.5, 0.9}) {
                const chem::Speciation s =
                    chem::solve(lib, {{a, total * share}, {b, total * (1 - share)}}, 25, model);
                EXPECT_GE(s.iterations, 1);
                EXPECT_LE(s.iterations, budget_of(model))
                    << s.iterations << " solves at " << total << " mol/L, share " << share;
            }
        }
    }
}

INSTANTIATE_TEST_SUITE_P(
    Reagents, Buffers,
    ::testing::Values(std::make_tuple("phosphate", "potassium-dihydrogen-phosphate",
                                      "disodium-hydrogen-phosphate"),
                      std::make_tuple("acetate", "acetic-acid", "sodium-acetate"),
                      std::make_tuple("formate", "formic-acid", "ammonium-formate"),
                      std::make_tuple("tris", "tris", "hydrochloric-acid"),
                      std::make_tuple("citrate", "citric-acid", "trisodium-citrate-dihydrate")),
    [](const auto& info) { return std::string(std::get<0>(info.param)); });

} // namespace
