#pragma once
// Chemical formulas and molar masses from the IUPAC 2021 standard atomic weights.
#include <map>
#include <string>
#include <string_view>

namespace chem {

/// Standard atomic weight of an element in g/mol: the IUPAC 2021 table (Prohaska et al.,
/// Pure Appl. Chem. 94 (2022) 573), taking the conventional value for elements whose standard
/// atomic weight is given as an interval. Throws chem::Error("formula", …) for an unknown symbol.
double atomic_weight_g_per_mol(std::string_view symbol);

/// Element counts of a formula. Accepts nested groups and hydrate notation:
/// "Na2HPO4(H2O)7", "Na2HPO4·7H2O", "Na2HPO4.7H2O", "C4H11NO3·HCl", "(CH3COO)NH4".
/// Throws chem::Error("formula", …) naming the formula on a syntax error.
std::map<std::string, double> parse_formula(std::string_view formula);

/// Molar mass in g/mol of one formula unit, hydrate water included.
double molar_mass_g_per_mol(std::string_view formula);

} // namespace chem
