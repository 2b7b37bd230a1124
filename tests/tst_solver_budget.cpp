// The equilibrium solver's iteration budget (chem/equilibrium.cpp): how many charge-balance
// solves (`Speciation::iterations`, the CLI's `solver_iterations`) one pH takes. The budget is the
// solver's speed contract without any timing: Steffensen's acceleration of the ionic-strength fixed
// point (Davies) converges in a few solves, and the SIT fixed point on the species' concentrations
// in a few more. A change that loses the acceleration or the warm bracket shows here as a count.
// Budgets: measured on the shipped library when the test was written (Davies at most 7, SIT at
// most 12 over the grid below), with head room; common practice, no source.
#include "chem/equilibrium.h"
#include "chem/error.h"
#include "test_support.h"

#include <QtTest>

#include <algorithm>
#include <string>
#include <vector>

using phaseplan::testing::shipped_data;

namespace {
constexpr int davies_budget = 10; ///< charge-balance solves per pH, Davies
constexpr int sit_budget = 20;    ///< charge-balance solves per pH, SIT
} // namespace

class TestSolverBudget : public QObject {
    Q_OBJECT
  private slots:
    void everyReagentAloneWithinBudget_data();
    void everyReagentAloneWithinBudget();
    void buffersWithinBudget_data();
    void buffersWithinBudget();
};

void TestSolverBudget::everyReagentAloneWithinBudget_data() {
    QTest::addColumn<int>("model");
    QTest::addColumn<int>("budget");
    QTest::newRow("davies") << static_cast<int>(chem::ActivityModel::davies) << davies_budget;
    QTest::newRow("sit") << static_cast<int>(chem::ActivityModel::sit) << sit_budget;
}

// Each reagent of the library with an acid-base system, alone in water at 1 mmol/L to 0.1 mol/L
// and 5 to 50 °C: the solve converges within the budget, and takes at least one solve.
void TestSolverBudget::everyReagentAloneWithinBudget() {
    QFETCH(int, model);
    QFETCH(int, budget);
    const chem::Library& lib = shipped_data().reagents;
    int most = 0, solves = 0;
    std::string worst;
    for (const chem::Reagent& r : lib.reagents()) {
        if (r.systems.empty())
            continue;
        for (double c : {0.001, 0.01, 0.1}) {
            for (double t : {5.0, 25.0, 50.0}) {
                const chem::Speciation s =
                    chem::solve(lib, {{&r, c}}, t, static_cast<chem::ActivityModel>(model));
                QVERIFY2(s.iterations >= 1, r.id.c_str());
                ++solves;
                if (s.iterations > most) {
                    most = s.iterations;
                    worst =
                        r.id + " " + std::to_string(c) + " mol/L at " + std::to_string(t) + " C";
                }
            }
        }
    }
    QVERIFY(solves > 100);
    qInfo("%d solves, at most %d charge-balance solves per pH (%s)", solves, most, worst.c_str());
    QVERIFY2(most <= budget, qPrintable(QString("%1 solves per pH for %2; budget %3")
                                            .arg(most)
                                            .arg(QString::fromStdString(worst))
                                            .arg(budget)));
}

void TestSolverBudget::buffersWithinBudget_data() {
    QTest::addColumn<QString>("acid");
    QTest::addColumn<QString>("base");
    QTest::newRow("phosphate") << "potassium-dihydrogen-phosphate"
                               << "disodium-hydrogen-phosphate";
    QTest::newRow("acetate") << "acetic-acid"
                             << "sodium-acetate";
    QTest::newRow("formate") << "formic-acid"
                             << "ammonium-formate";
    QTest::newRow("tris") << "tris"
                          << "hydrochloric-acid";
    QTest::newRow("citrate") << "citric-acid"
                             << "trisodium-citrate-dihydrate";
}

// Buffers at 10 to 100 mmol/L, the acid and base in ratios 1:9 to 9:1, both models.
void TestSolverBudget::buffersWithinBudget() {
    QFETCH(QString, acid);
    QFETCH(QString, base);
    const chem::Library& lib = shipped_data().reagents;
    const chem::Reagent* a = lib.find_reagent(acid.toStdString());
    const chem::Reagent* b = lib.find_reagent(base.toStdString());
    QVERIFY2(a && b, "reagent ids as in data/reagents.json");
    for (auto model : {chem::ActivityModel::davies, chem::ActivityModel::sit}) {
        const int budget = model == chem::ActivityModel::davies ? davies_budget : sit_budget;
        for (double total : {0.01, 0.05, 0.1}) {
            for (double share : {0.1, 0.5, 0.9}) {
                const chem::Speciation s =
                    chem::solve(lib, {{a, total * share}, {b, total * (1 - share)}}, 25, model);
                QVERIFY(s.iterations >= 1);
                QVERIFY2(s.iterations <= budget,
                         qPrintable(QString("%1 solves at %2 mol/L, share %3")
                                        .arg(s.iterations)
                                        .arg(total)
                                        .arg(share)));
            }
        }
    }
}

QTEST_GUILESS_MAIN(TestSolverBudget)
#include "tst_solver_budget.moc"
