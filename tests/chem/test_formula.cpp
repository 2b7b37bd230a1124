// Formula parser, atomic weights and molar masses (chem/formula.h), and the molar masses of the
// shipped reagent library (data/reagents.json) against published values.
#include "chem/error.h"
#include "chem/formula.h"
#include "shipped_library.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <map>
#include <sstream>
#include <string>
#include <vector>

namespace {

/// "Na:2 H:15 P:1 O:11" -> element counts.
std::map<std::string, double> counts_from(const std::string& text) {
    std::map<std::string, double> out;
    std::istringstream in(text);
    std::string item;
    while (in >> item) {
        const size_t colon = item.find(':');
        out[item.substr(0, colon)] = std::stod(item.substr(colon + 1));
    }
    return out;
}

struct Row2 {
    const char* name;
    std::string a;
    std::string b;
};

} // namespace

// Element counts follow from the formulas by hand (one count per atom written).
TEST(Formula, Parse) {
    const std::vector<Row2> rows = {
        {"plain", "KH2PO4", "K:1 H:2 P:1 O:4"},
        {"hydrate in parentheses", "Na2HPO4(H2O)7", "Na:2 H:15 P:1 O:11"},
        {"hydrate, middle dot", "Na2HPO4·7H2O", "Na:2 H:15 P:1 O:11"},
        {"hydrate, full stop", "Na2HPO4.7H2O", "Na:2 H:15 P:1 O:11"},
        {"hydrate, asterisk", "Na2HPO4*7H2O", "Na:2 H:15 P:1 O:11"},
        {"hydrate, spaces round dot", "Na2HPO4 · 7H2O", "Na:2 H:15 P:1 O:11"},
        {"adduct without multiplier", "C4H11NO3·HCl", "C:4 H:12 N:1 O:3 Cl:1"},
        {"two dots add up", "Na2HPO4·2H2O·5H2O", "Na:2 H:15 P:1 O:11"},
        {"adduct and hydrate", "C4H11NO3.HCl.H2O", "C:4 H:14 N:1 O:4 Cl:1"},
        {"decimal multiplier", "CaSO4·0.5H2O", "Ca:1 S:1 O:4.5 H:1"},
        {"decimal multiplier, full stop", "CaSO4.0.5H2O", "Ca:1 S:1 O:4.5 H:1"},
        {"leading group", "(CH3COO)NH4", "C:2 H:7 N:1 O:2"},
        {"group with count", "Ca3(PO4)2", "Ca:3 P:2 O:8"},
        {"nested groups", "((CH3)3C)2O", "C:8 H:18 O:1"},
        {"nested, square brackets", "K4[Fe(CN)6]", "K:4 Fe:1 C:6 N:6"},
        {"two-letter symbols", "NaCl", "Na:1 Cl:1"},
        {"Co is cobalt, CO is not", "CO", "C:1 O:1"},
        {"multi-digit count", "C12H22O11", "C:12 H:22 O:11"},
        {"borax decahydrate", "Na2B4O7(H2O)10", "Na:2 B:4 O:17 H:20"},
        {"alum, group and hydrate", "KAl(SO4)2·12H2O", "K:1 Al:1 S:2 O:20 H:24"}};
    for (const Row2& row : rows)
        EXPECT_EQ(chem::parse_formula(row.a), counts_from(row.b)) << row.name;
}

// The four hydrate notations give the same mass to the last bit.
TEST(Formula, NotationsAgree) {
    const double m = chem::molar_mass_g_per_mol("Na2HPO4(H2O)7");
    EXPECT_EQ(chem::molar_mass_g_per_mol("Na2HPO4·7H2O"), m);
    EXPECT_EQ(chem::molar_mass_g_per_mol("Na2HPO4.7H2O"), m);
    EXPECT_EQ(chem::molar_mass_g_per_mol("Na2HPO4*7H2O"), m);
    EXPECT_DOUBLE_EQ(chem::molar_mass_g_per_mol("C4H11NO3·HCl"),
                     chem::molar_mass_g_per_mol("C4H11NO3") + chem::molar_mass_g_per_mol("HCl"));
}

TEST(Formula, Rejects) {
    struct Row {
        const char* name;
        std::string formula;
        int position;       ///< 1-based character named in the message, 0: none
        std::string phrase; ///< part of the message
    };
    const std::vector<Row> rows = {
        {"unclosed parenthesis", "Na2(HPO4", 4, "never closed"},
        {"unknown element", "Xx2O", 1, "unknown element symbol \"Xx\""},
        {"empty", "", 0, "empty"},
        {"stray closing parenthesis", "H2O)", 4, "no matching opening"},
        {"mismatched brackets", "(H2O]", 5, "expected \")\""},
        {"empty group", "Na2()", 4, "empty brackets"},
        {"dot at the end", "Na2HPO4·", 8, "hydrate dot"},
        {"dot at the start", "·H2O", 1, "expected an element symbol"},
        {"two dots", "Na2HPO4..7H2O", 9, "expected an element symbol"},
        {"lower-case start", "h2o", 1, "expected an element symbol"},
        {"zero count", "H0", 2, "not positive"},
        {"multiplier alone", "7", 0, "element symbol is expected"},
        {"space inside", "Na Cl", 3, "unexpected"},
        {"charge sign", "NH4+", 4, "unexpected"},
        {"huge count", "H99999999999", 2, "larger than"},
        {"deep nesting", std::string(40, '(') + "H" + std::string(40, ')'), 17, "nested deeper"}};
    for (const Row& row : rows) {
        SCOPED_TRACE(row.name);
        try {
            chem::parse_formula(row.formula);
            ADD_FAILURE() << "accepted \"" << row.formula << "\"";
        } catch (const chem::Error& e) {
            EXPECT_EQ(e.field(), "formula");
            const std::string msg = e.message();
            EXPECT_NE(msg.find('"' + row.formula + '"'), std::string::npos) << msg; // names it
            EXPECT_NE(msg.find(row.phrase), std::string::npos) << msg;
            const std::string at = "at character " + std::to_string(row.position) + ":";
            if (row.position > 0)
                EXPECT_NE(msg.find(at), std::string::npos) << msg;
            else
                EXPECT_EQ(msg.find("at character"), std::string::npos) << msg;
        }
        // The mass function refuses it the same way.
        EXPECT_THROW(chem::molar_mass_g_per_mol(row.formula), chem::Error);
    }
}

// IUPAC 2021 standard atomic weights, conventional values for the interval elements:
// Prohaska et al., Pure Appl. Chem. 94 (2022) 573, Table 2 / abridged table (from memory).
// A typo in the table would show here and in check_molar_masses.py (periodictable).
TEST(Formula, AtomicWeights) {
    const std::vector<std::pair<std::string, double>> rows = {
        {"H", 1.008},   {"Li", 6.94},     {"B", 10.81},         {"C", 12.011},
        {"N", 14.007},  {"O", 15.999},    {"F", 18.998403162},  {"Na", 22.98976928},
        {"Mg", 24.305}, {"Si", 28.085},   {"P", 30.973761998},  {"S", 32.06},
        {"Cl", 35.45},  {"K", 39.0983},   {"Ca", 40.078},       {"Br", 79.904},
        {"Kr", 83.798}, {"I", 126.90447}, {"Cs", 132.90545196}, {"Ba", 137.327}};
    for (const auto& [symbol, weight] : rows)
        EXPECT_DOUBLE_EQ(chem::atomic_weight_g_per_mol(symbol), weight) << symbol;
}

TEST(Formula, UnknownSymbol) {
    try {
        chem::atomic_weight_g_per_mol("Qq");
        ADD_FAILURE() << "accepted Qq";
    } catch (const chem::Error& e) {
        EXPECT_EQ(e.field(), "formula");
        EXPECT_NE(e.message().find("\"Qq\""), std::string::npos);
    }
}

// The library's reagents, loaded from data/reagents.json as the program loads them, against
// formula weights printed in reference works. Published values carry 2–3 decimals and were
// computed with older atomic weights, so the tolerance is 0.01 g/mol.
TEST(Formula, LibraryMolarMasses) {
    const std::string crc_inorg = "CRC Handbook of Chemistry and Physics, Physical constants of "
                                  "inorganic compounds (from memory)";
    const std::string crc_org =
        "CRC Handbook of Chemistry and Physics, Physical constants of organic "
        "compounds (from memory)";
    const std::string sigma = "Sigma-Aldrich catalogue formula weight (from memory)";
    struct Row {
        const char* name;
        const char* id;
        double published;
        std::string source;
    };
    const std::vector<Row> rows = {
        {"KH2PO4", "potassium-dihydrogen-phosphate", 136.086, crc_inorg},
        {"K2HPO4", "dipotassium-hydrogen-phosphate", 174.176, crc_inorg},
        {"NaH2PO4", "sodium-dihydrogen-phosphate", 119.977, crc_inorg},
        {"NaH2PO4.H2O", "sodium-dihydrogen-phosphate-monohydrate", 137.99, sigma},
        {"NaH2PO4.2H2O", "sodium-dihydrogen-phosphate-dihydrate", 156.01, sigma},
        {"Na2HPO4", "disodium-hydrogen-phosphate", 141.96, sigma},
        {"Na2HPO4.2H2O", "disodium-hydrogen-phosphate-dihydrate", 177.99, sigma},
        {"Na2HPO4.7H2O", "disodium-hydrogen-phosphate-heptahydrate", 268.07, sigma},
        {"Na2HPO4.12H2O", "disodium-hydrogen-phosphate-dodecahydrate", 358.14, sigma},
        {"H3PO4", "phosphoric-acid", 97.995, crc_inorg},
        {"acetic acid", "acetic-acid", 60.052, crc_org},
        {"sodium acetate", "sodium-acetate", 82.034, crc_org},
        {"sodium acetate 3H2O", "sodium-acetate-trihydrate", 136.08, sigma},
        {"ammonium acetate", "ammonium-acetate", 77.083, crc_org},
        {"formic acid", "formic-acid", 46.025, crc_org},
        {"citric acid", "citric-acid", 192.124, crc_org},
        {"citric acid H2O", "citric-acid-monohydrate", 210.14, sigma},
        {"trisodium citrate 2H2O", "trisodium-citrate-dihydrate", 294.10, sigma},
        {"KH phthalate", "potassium-hydrogen-phthalate", 204.22, crc_org},
        {"borax", "sodium-tetraborate-decahydrate", 381.37, sigma},
        {"boric acid", "boric-acid", 61.833, crc_inorg},
        {"NaHCO3", "sodium-bicarbonate", 84.007, crc_inorg},
        {"Na2CO3", "sodium-carbonate", 105.988, crc_inorg},
        {"tris", "tris", 121.135, crc_org},
        {"tris HCl", "tris-hydrochloride", 157.60, sigma},
        {"glycine", "glycine", 75.067, crc_org},
        {"HCl", "hydrochloric-acid", 36.461, crc_inorg},
        {"NaOH", "sodium-hydroxide", 39.997, crc_inorg},
        {"KOH", "potassium-hydroxide", 56.106, crc_inorg},
        {"NaCl", "sodium-chloride", 58.443, crc_inorg},
        {"KCl", "potassium-chloride", 74.551, crc_inorg},
        {"TFA", "trifluoroacetic-acid", 114.023, crc_org},
        {"triethylamine", "triethylamine", 101.193, crc_org}};
    const chem::Library& lib = chem::testing::shipped_library();
    for (const Row& row : rows) {
        const chem::Reagent* r = lib.find_reagent(row.id);
        ASSERT_TRUE(r) << "no reagent " << row.id;
        const double got = r->molar_mass_g_per_mol;
        EXPECT_LE(std::abs(got - row.published), 0.01)
            << row.id << " (" << r->formula << "): " << got << " g/mol, published " << row.published
            << " (" << row.source << ")";
    }
}

// printf's %.6g, the behaviour chem/error.h promises (C standard 7.21.6.1).
TEST(Formula, FormatNumber) {
    const std::vector<std::pair<double, std::string>> rows = {
        {100.0, "100"},
        {1.5, "1.5"},
        {0.1 + 0.2, "0.3"},
        {268.06578, "268.066"},
        {-0.2, "-0.2"},
        {123456789.0, "1.23457e+08"},
        {1e-7, "1e-07"},
        {-0.0, "0"},
        {std::numeric_limits<double>::quiet_NaN(), "nan"},
        {std::numeric_limits<double>::infinity(), "inf"}};
    for (const auto& [value, text] : rows)
        EXPECT_EQ(chem::format_number(value), text);
}
