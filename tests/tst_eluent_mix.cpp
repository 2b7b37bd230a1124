// mix_lines: blending line profiles by the pump's percentages.
#include "chem/eluent_mix.h"
#include "chem/error.h"
#include "core/app_data.h"

#include "test_support.h"

#include <QtTest>

using namespace chem;

class TestEluentMix : public QObject {
    Q_OBJECT
    SolventLibrary solvents_;

    static LineProfile neat(const std::string& id, bool aqueous) {
        return phaseplan::testing::neat_line(id, aqueous);
    }

  private slots:
    void initTestCase() {
        solvents_ = phaseplan::load_app_data(QStringLiteral(SOURCE_DIR "/data")).solvents;
    }

    // Volume fractions are the pump's shares; solutes are diluted by the share and by the
    // contraction. Arithmetic by hand: 20 mmol/L × 0.6 = 12 mmol/L before contraction.
    void dilutesAndBlends() {
        LineProfile a = neat("water", true);
        a.solutes.push_back({"sodium-dihydrogen-phosphate", 20.0, "buffer"});
        LineProfile b = neat("acetonitrile", false);
        const EluentMix m = mix_lines(solvents_, {{&a, 60}, {&b, 40}});
        QCOMPARE(m.solvent_fraction_v.at("water"), 0.6);
        QCOMPARE(m.solvent_fraction_v.at("acetonitrile"), 0.4);
        QCOMPARE(m.organic_fraction_v, 0.4);
        QVERIFY(m.contraction_fraction > 0.0 && m.contraction_fraction < 0.05);
        QCOMPARE(m.solutes.size(), std::size_t(1));
        QCOMPARE(m.solutes[0].mmol_per_l, 12.0 / (1.0 - m.contraction_fraction));
        // Mole fraction of acetonitrile at 40 % v/v: n = V·ρ/M; ρ(MeCN, 20 °C) ≈ 0.7857 g/mL,
        // M = 41.05 g/mol (CRC Handbook, from memory); water 0.9982 g/mL, 18.015 g/mol.
        const double n_o = 0.4 * 0.7857 / 41.053, n_w = 0.6 * 0.9982 / 18.015;
        QVERIFY(std::abs(m.mole_fraction.at("acetonitrile") - n_o / (n_o + n_w)) < 0.002);
    }

    void refusesBadPercentages() {
        LineProfile a = neat("water", true), b = neat("methanol", false);
        QVERIFY_THROWS_EXCEPTION(Error, mix_lines(solvents_, {{&a, 60}, {&b, 30}}));
        QVERIFY_THROWS_EXCEPTION(Error, mix_lines(solvents_, {{&a, -10}, {&b, 110}}));
        QVERIFY_THROWS_EXCEPTION(Error, mix_lines(solvents_, {{&a, NAN}, {&b, 100}}));
        LineProfile undescribed;
        QVERIFY_THROWS_EXCEPTION(Error, mix_lines(solvents_, {{&undescribed, 50}, {&b, 50}}));
        // A line at 0 % needs no description.
        QCOMPARE(mix_lines(solvents_, {{&undescribed, 0}, {&b, 100}}).organic_fraction_v, 1.0);
    }
};

QTEST_GUILESS_MAIN(TestEluentMix)
#include "tst_eluent_mix.moc"
