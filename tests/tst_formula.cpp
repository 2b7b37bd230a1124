// Formula parser, atomic weights and molar masses (chem/formula.h), and the molar masses of the
// shipped reagent library (data/reagents.json) against published values.
#include "chem/error.h"
#include "chem/formula.h"
#include "core/app_data.h"

#include <QString>
#include <QStringList>
#include <QTest>

#include <cmath>
#include <limits>
#include <map>
#include <string>

namespace {

/// "Na:2 H:15 P:1 O:11" -> element counts.
std::map<std::string, double> counts_from(const QString& text) {
    std::map<std::string, double> out;
    for (const QString& item : text.split(' ', Qt::SkipEmptyParts)) {
        const QStringList kv = item.split(':');
        out[kv.at(0).toStdString()] = kv.at(1).toDouble();
    }
    return out;
}

QString describe(const std::map<std::string, double>& counts) {
    QStringList items;
    for (const auto& [symbol, n] : counts)
        items << QString::fromStdString(symbol) + ':' + QString::number(n);
    return items.join(' ');
}

} // namespace

class TestFormula : public QObject {
    Q_OBJECT

  private slots:
    void parse_data();
    void parse();
    void notations_agree();
    void rejects_data();
    void rejects();
    void atomic_weights_data();
    void atomic_weights();
    void unknown_symbol();
    void library_molar_masses_data();
    void library_molar_masses();
    void format_number_data();
    void format_number();
};

// Element counts follow from the formulas by hand (one count per atom written).
void TestFormula::parse_data() {
    QTest::addColumn<QString>("formula");
    QTest::addColumn<QString>("counts");
    QTest::newRow("plain") << "KH2PO4"
                           << "K:1 H:2 P:1 O:4";
    QTest::newRow("hydrate in parentheses") << "Na2HPO4(H2O)7"
                                            << "Na:2 H:15 P:1 O:11";
    QTest::newRow("hydrate, middle dot") << "Na2HPO4·7H2O"
                                         << "Na:2 H:15 P:1 O:11";
    QTest::newRow("hydrate, full stop") << "Na2HPO4.7H2O"
                                        << "Na:2 H:15 P:1 O:11";
    QTest::newRow("hydrate, asterisk") << "Na2HPO4*7H2O"
                                       << "Na:2 H:15 P:1 O:11";
    QTest::newRow("hydrate, spaces round dot") << "Na2HPO4 · 7H2O"
                                               << "Na:2 H:15 P:1 O:11";
    QTest::newRow("adduct without multiplier") << "C4H11NO3·HCl"
                                               << "C:4 H:12 N:1 O:3 Cl:1";
    QTest::newRow("two dots add up") << "Na2HPO4·2H2O·5H2O"
                                     << "Na:2 H:15 P:1 O:11";
    QTest::newRow("adduct and hydrate") << "C4H11NO3.HCl.H2O"
                                        << "C:4 H:14 N:1 O:4 Cl:1";
    QTest::newRow("decimal multiplier") << "CaSO4·0.5H2O"
                                        << "Ca:1 S:1 O:4.5 H:1";
    QTest::newRow("decimal multiplier, full stop") << "CaSO4.0.5H2O"
                                                   << "Ca:1 S:1 O:4.5 H:1";
    QTest::newRow("leading group") << "(CH3COO)NH4"
                                   << "C:2 H:7 N:1 O:2";
    QTest::newRow("group with count") << "Ca3(PO4)2"
                                      << "Ca:3 P:2 O:8";
    QTest::newRow("nested groups") << "((CH3)3C)2O"
                                   << "C:8 H:18 O:1";
    QTest::newRow("nested, square brackets") << "K4[Fe(CN)6]"
                                             << "K:4 Fe:1 C:6 N:6";
    QTest::newRow("two-letter symbols") << "NaCl"
                                        << "Na:1 Cl:1";
    QTest::newRow("Co is cobalt, CO is not") << "CO"
                                             << "C:1 O:1";
    QTest::newRow("multi-digit count") << "C12H22O11"
                                       << "C:12 H:22 O:11";
    QTest::newRow("borax decahydrate") << "Na2B4O7(H2O)10"
                                       << "Na:2 B:4 O:17 H:20";
    QTest::newRow("alum, group and hydrate") << "KAl(SO4)2·12H2O"
                                             << "K:1 Al:1 S:2 O:20 H:24";
}

void TestFormula::parse() {
    QFETCH(QString, formula);
    QFETCH(QString, counts);
    const auto got = chem::parse_formula(formula.toStdString());
    QCOMPARE(describe(got), describe(counts_from(counts)));
}

// The four hydrate notations give the same mass to the last bit.
void TestFormula::notations_agree() {
    const double m = chem::molar_mass_g_per_mol("Na2HPO4(H2O)7");
    QCOMPARE(chem::molar_mass_g_per_mol("Na2HPO4·7H2O"), m);
    QCOMPARE(chem::molar_mass_g_per_mol("Na2HPO4.7H2O"), m);
    QCOMPARE(chem::molar_mass_g_per_mol("Na2HPO4*7H2O"), m);
    QCOMPARE(chem::molar_mass_g_per_mol("C4H11NO3·HCl"),
             chem::molar_mass_g_per_mol("C4H11NO3") + chem::molar_mass_g_per_mol("HCl"));
}

void TestFormula::rejects_data() {
    QTest::addColumn<QString>("formula");
    QTest::addColumn<int>("position");   ///< 1-based character named in the message, 0: none
    QTest::addColumn<QString>("phrase"); ///< part of the message
    QTest::newRow("unclosed parenthesis") << "Na2(HPO4" << 4 << "never closed";
    QTest::newRow("unknown element") << "Xx2O" << 1 << "unknown element symbol \"Xx\"";
    QTest::newRow("empty") << "" << 0 << "empty";
    QTest::newRow("stray closing parenthesis") << "H2O)" << 4 << "no matching opening";
    QTest::newRow("mismatched brackets") << "(H2O]" << 5 << "expected \")\"";
    QTest::newRow("empty group") << "Na2()" << 4 << "empty brackets";
    QTest::newRow("dot at the end") << "Na2HPO4·" << 8 << "hydrate dot";
    QTest::newRow("dot at the start") << "·H2O" << 1 << "expected an element symbol";
    QTest::newRow("two dots") << "Na2HPO4..7H2O" << 9 << "expected an element symbol";
    QTest::newRow("lower-case start") << "h2o" << 1 << "expected an element symbol";
    QTest::newRow("zero count") << "H0" << 2 << "not positive";
    QTest::newRow("multiplier alone") << "7" << 0 << "element symbol is expected";
    QTest::newRow("space inside") << "Na Cl" << 3 << "unexpected";
    QTest::newRow("charge sign") << "NH4+" << 4 << "unexpected";
    QTest::newRow("huge count") << "H99999999999" << 2 << "larger than";
    QTest::newRow("deep nesting") << QString(40, '(') + "H" + QString(40, ')') << 17
                                  << "nested deeper";
}

void TestFormula::rejects() {
    QFETCH(QString, formula);
    QFETCH(int, position);
    QFETCH(QString, phrase);
    try {
        chem::parse_formula(formula.toStdString());
        QFAIL(qPrintable("accepted \"" + formula + "\""));
    } catch (const chem::Error& e) {
        QCOMPARE(QString::fromStdString(e.field()), QStringLiteral("formula"));
        const QString msg = QString::fromStdString(e.message());
        QVERIFY2(msg.contains('"' + formula + '"'), qPrintable(msg)); // names the formula
        QVERIFY2(msg.contains(phrase), qPrintable(msg));
        if (position > 0)
            QVERIFY2(msg.contains(QStringLiteral("at character %1:").arg(position)),
                     qPrintable(msg));
        else
            QVERIFY2(!msg.contains("at character"), qPrintable(msg));
    }
    // The mass function refuses it the same way.
    QVERIFY_THROWS_EXCEPTION(chem::Error, chem::molar_mass_g_per_mol(formula.toStdString()));
}

// IUPAC 2021 standard atomic weights, conventional values for the interval elements:
// Prohaska et al., Pure Appl. Chem. 94 (2022) 573, Table 2 / abridged table (from memory).
// A typo in the table would show here and in check_molar_masses.py (periodictable).
void TestFormula::atomic_weights_data() {
    QTest::addColumn<QString>("symbol");
    QTest::addColumn<double>("weight");
    QTest::newRow("H") << "H" << 1.008;
    QTest::newRow("Li") << "Li" << 6.94;
    QTest::newRow("B") << "B" << 10.81;
    QTest::newRow("C") << "C" << 12.011;
    QTest::newRow("N") << "N" << 14.007;
    QTest::newRow("O") << "O" << 15.999;
    QTest::newRow("F") << "F" << 18.998403162;
    QTest::newRow("Na") << "Na" << 22.98976928;
    QTest::newRow("Mg") << "Mg" << 24.305;
    QTest::newRow("Si") << "Si" << 28.085;
    QTest::newRow("P") << "P" << 30.973761998;
    QTest::newRow("S") << "S" << 32.06;
    QTest::newRow("Cl") << "Cl" << 35.45;
    QTest::newRow("K") << "K" << 39.0983;
    QTest::newRow("Ca") << "Ca" << 40.078;
    QTest::newRow("Br") << "Br" << 79.904;
    QTest::newRow("Kr") << "Kr" << 83.798;
    QTest::newRow("I") << "I" << 126.90447;
    QTest::newRow("Cs") << "Cs" << 132.90545196;
    QTest::newRow("Ba") << "Ba" << 137.327;
}

void TestFormula::atomic_weights() {
    QFETCH(QString, symbol);
    QFETCH(double, weight);
    QCOMPARE(chem::atomic_weight_g_per_mol(symbol.toStdString()), weight);
}

void TestFormula::unknown_symbol() {
    try {
        chem::atomic_weight_g_per_mol("Qq");
        QFAIL("accepted Qq");
    } catch (const chem::Error& e) {
        QCOMPARE(QString::fromStdString(e.field()), QStringLiteral("formula"));
        QVERIFY(QString::fromStdString(e.message()).contains("\"Qq\""));
    }
}

// The library's reagents, loaded from data/reagents.json as the program loads them, against
// formula weights printed in reference works. Published values carry 2–3 decimals and were
// computed with older atomic weights, so the tolerance is 0.01 g/mol.
void TestFormula::library_molar_masses_data() {
    QTest::addColumn<QString>("id");
    QTest::addColumn<double>("published");
    QTest::addColumn<QString>("source");
    const QString crc_inorg = "CRC Handbook of Chemistry and Physics, Physical constants of "
                              "inorganic compounds (from memory)";
    const QString crc_org = "CRC Handbook of Chemistry and Physics, Physical constants of organic "
                            "compounds (from memory)";
    const QString sigma = "Sigma-Aldrich catalogue formula weight (from memory)";
    QTest::newRow("KH2PO4") << "potassium-dihydrogen-phosphate" << 136.086 << crc_inorg;
    QTest::newRow("K2HPO4") << "dipotassium-hydrogen-phosphate" << 174.176 << crc_inorg;
    QTest::newRow("NaH2PO4") << "sodium-dihydrogen-phosphate" << 119.977 << crc_inorg;
    QTest::newRow("NaH2PO4.H2O") << "sodium-dihydrogen-phosphate-monohydrate" << 137.99 << sigma;
    QTest::newRow("NaH2PO4.2H2O") << "sodium-dihydrogen-phosphate-dihydrate" << 156.01 << sigma;
    QTest::newRow("Na2HPO4") << "disodium-hydrogen-phosphate" << 141.96 << sigma;
    QTest::newRow("Na2HPO4.2H2O") << "disodium-hydrogen-phosphate-dihydrate" << 177.99 << sigma;
    QTest::newRow("Na2HPO4.7H2O") << "disodium-hydrogen-phosphate-heptahydrate" << 268.07 << sigma;
    QTest::newRow("Na2HPO4.12H2O")
        << "disodium-hydrogen-phosphate-dodecahydrate" << 358.14 << sigma;
    QTest::newRow("H3PO4") << "phosphoric-acid" << 97.995 << crc_inorg;
    QTest::newRow("acetic acid") << "acetic-acid" << 60.052 << crc_org;
    QTest::newRow("sodium acetate") << "sodium-acetate" << 82.034 << crc_org;
    QTest::newRow("sodium acetate 3H2O") << "sodium-acetate-trihydrate" << 136.08 << sigma;
    QTest::newRow("ammonium acetate") << "ammonium-acetate" << 77.083 << crc_org;
    QTest::newRow("formic acid") << "formic-acid" << 46.025 << crc_org;
    QTest::newRow("citric acid") << "citric-acid" << 192.124 << crc_org;
    QTest::newRow("citric acid H2O") << "citric-acid-monohydrate" << 210.14 << sigma;
    QTest::newRow("trisodium citrate 2H2O") << "trisodium-citrate-dihydrate" << 294.10 << sigma;
    QTest::newRow("KH phthalate") << "potassium-hydrogen-phthalate" << 204.22 << crc_org;
    QTest::newRow("borax") << "sodium-tetraborate-decahydrate" << 381.37 << sigma;
    QTest::newRow("boric acid") << "boric-acid" << 61.833 << crc_inorg;
    QTest::newRow("NaHCO3") << "sodium-bicarbonate" << 84.007 << crc_inorg;
    QTest::newRow("Na2CO3") << "sodium-carbonate" << 105.988 << crc_inorg;
    QTest::newRow("tris") << "tris" << 121.135 << crc_org;
    QTest::newRow("tris HCl") << "tris-hydrochloride" << 157.60 << sigma;
    QTest::newRow("glycine") << "glycine" << 75.067 << crc_org;
    QTest::newRow("HCl") << "hydrochloric-acid" << 36.461 << crc_inorg;
    QTest::newRow("NaOH") << "sodium-hydroxide" << 39.997 << crc_inorg;
    QTest::newRow("KOH") << "potassium-hydroxide" << 56.106 << crc_inorg;
    QTest::newRow("NaCl") << "sodium-chloride" << 58.443 << crc_inorg;
    QTest::newRow("KCl") << "potassium-chloride" << 74.551 << crc_inorg;
    QTest::newRow("TFA") << "trifluoroacetic-acid" << 114.023 << crc_org;
    QTest::newRow("triethylamine") << "triethylamine" << 101.193 << crc_org;
}

void TestFormula::library_molar_masses() {
    QFETCH(QString, id);
    QFETCH(double, published);
    QFETCH(QString, source);
    static const phaseplan::AppData data =
        phaseplan::load_app_data(QStringLiteral(SOURCE_DIR "/data"));
    const chem::Reagent* r = data.reagents.find_reagent(id.toStdString());
    QVERIFY2(r, qPrintable("no reagent " + id));
    const double got = r->molar_mass_g_per_mol;
    QVERIFY2(std::abs(got - published) <= 0.01,
             qPrintable(QStringLiteral("%1 (%2): %3 g/mol, published %4 (%5)")
                            .arg(id, QString::fromStdString(r->formula))
                            .arg(got, 0, 'f', 4)
                            .arg(published)
                            .arg(source)));
}

// printf's %.6g, the behaviour chem/error.h promises (C standard 7.21.6.1).
void TestFormula::format_number_data() {
    QTest::addColumn<double>("value");
    QTest::addColumn<QString>("text");
    QTest::newRow("integer") << 100.0 << "100";
    QTest::newRow("fraction") << 1.5 << "1.5";
    QTest::newRow("binary noise") << 0.1 + 0.2 << "0.3";
    QTest::newRow("six digits") << 268.06578 << "268.066";
    QTest::newRow("negative") << -0.2 << "-0.2";
    QTest::newRow("large") << 123456789.0 << "1.23457e+08";
    QTest::newRow("small") << 1e-7 << "1e-07";
    QTest::newRow("negative zero") << -0.0 << "0";
    QTest::newRow("nan") << std::numeric_limits<double>::quiet_NaN() << "nan";
    QTest::newRow("infinity") << std::numeric_limits<double>::infinity() << "inf";
}

void TestFormula::format_number() {
    QFETCH(double, value);
    QFETCH(QString, text);
    QCOMPARE(QString::fromStdString(chem::format_number(value)), text);
}

QTEST_GUILESS_MAIN(TestFormula)
#include "tst_formula.moc"
