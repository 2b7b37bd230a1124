// The chemistry tests' copy of the shipped library (tests/chem/shipped_library.h, generated at
// build time) is the library the programs load from data/: same systems, reagents, SIT
// coefficients and eluent data, and the same pH for every reagent alone (bit for bit).
#include "chem/equilibrium.h"
#include "shipped_library.h"
#include "test_support.h"

#include <QtTest>

using phaseplan::testing::shipped_data;

class TestShippedLibrary : public QObject {
    Q_OBJECT
  private slots:
    void same_entries() {
        const chem::Library& app = shipped_data().reagents;
        const chem::Library& gen = chem::testing::shipped_library();
        QCOMPARE(gen.systems().size(), app.systems().size());
        for (size_t i = 0; i < app.systems().size(); ++i) {
            const chem::AcidBaseSystem &a = app.systems()[i], &g = gen.systems()[i];
            QCOMPARE(g.id, a.id);
            QCOMPARE(g.species, a.species);
            QCOMPARE(g.pka_25c, a.pka_25c);
            QCOMPARE(g.enthalpy_kj_per_mol, a.enthalpy_kj_per_mol);
            QCOMPARE(g.heat_capacity_j_per_mol_k, a.heat_capacity_j_per_mol_k);
            QCOMPARE(g.dpka_per_k, a.dpka_per_k);
            QCOMPARE(g.eluent_shift.size(), a.eluent_shift.size());
            for (size_t k = 0; k < a.eluent_shift.size(); ++k)
                QCOMPARE(g.eluent_shift[k].dpka, a.eluent_shift[k].dpka);
            for (double t : {278.15, 310.15, 333.15})
                QCOMPARE(g.pka_at(0, t), a.pka_at(0, t));
        }
        QCOMPARE(gen.reagents().size(), app.reagents().size());
        for (size_t i = 0; i < app.reagents().size(); ++i) {
            const chem::Reagent &a = app.reagents()[i], &g = gen.reagents()[i];
            QCOMPARE(g.id, a.id);
            QCOMPARE(g.name, a.name);
            QCOMPARE(g.molar_mass_g_per_mol, a.molar_mass_g_per_mol);
            QCOMPARE(g.assay_fraction, a.assay_fraction);
            QCOMPARE(g.density_g_per_ml, a.density_g_per_ml);
            QCOMPARE(g.ghs_hazards, a.ghs_hazards);
            QCOMPARE(g.spectators.size(), a.spectators.size());
            QCOMPARE(g.systems.size(), a.systems.size());
        }
        QCOMPARE(gen.sit_epsilons().size(), app.sit_epsilons().size());
        for (size_t i = 0; i < app.sit_epsilons().size(); ++i)
            QCOMPARE(gen.sit_epsilons()[i].kg_per_mol, app.sit_epsilons()[i].kg_per_mol);
        QCOMPARE(gen.eluent_solvents().size(), app.eluent_solvents().size());
        for (size_t i = 0; i < app.eluent_solvents().size(); ++i)
            for (double phi : {0.1, 0.3, 0.6})
                QCOMPARE(gen.eluent_solvents()[i].delta(phi), app.eluent_solvents()[i].delta(phi));
    }

    void same_ph_for_every_reagent() {
        const chem::Library& app = shipped_data().reagents;
        const chem::Library& gen = chem::testing::shipped_library();
        for (size_t i = 0; i < app.reagents().size(); ++i)
            for (auto model : {chem::ActivityModel::davies, chem::ActivityModel::sit}) {
                const double a = chem::solve(app, {{&app.reagents()[i], 0.01}}, 25, model).ph;
                const double g = chem::solve(gen, {{&gen.reagents()[i], 0.01}}, 25, model).ph;
                QCOMPARE(g, a);
            }
    }
};

QTEST_GUILESS_MAIN(TestShippedLibrary)
#include "tst_shipped_library.moc"
