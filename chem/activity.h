#pragma once
// Activity models of the speciation solver. Davies (the default) depends on the ionic strength
// alone; the specific ion interaction theory (SIT) adds, for each ion, a term for every ion of
// opposite charge and holds to a few mol/kg; Truesdell–Jones gives each ion its own size and
// linear term, and reports pH on the convention of the pH standards.
#include <optional>
#include <string>
#include <utility>
#include <vector>

namespace chem {

enum class ActivityModel {
    davies, ///< log10 γ = −A z² (√I/(1+√I) − 0.3 I), I in mol/L (Davies 1962)
    sit, ///< log10 γ_i = −z_i² D + Σ_j ε(i,j) m_j, molal (Brønsted–Guggenheim–Scatchard)
    /// log10 γ_i = −A z_i² √I/(1 + B å_i √I) + b_i I − z_i φ(I), molal (Truesdell & Jones 1974,
    /// ion sizes å_i of Kielland 1937); φ puts single-ion values on the Bates–Guggenheim
    /// convention (chem::truesdell_jones_log10_gamma).
    truesdell_jones,
};
const char* activity_model_name(ActivityModel m);
/// "davies", "sit" or "truesdell-jones"; nullopt for anything else.
std::optional<ActivityModel> activity_model_from_name(const std::string& name);

/// One SIT interaction coefficient ε(cation, anion) in kg/mol, with its source.
struct SitEpsilon {
    std::string cation; ///< "Na+"
    std::string anion;  ///< "H2PO4-"
    double kg_per_mol = 0;
    std::string source;
};

/// The Debye–Hückel term of SIT, D = A_m √I / (1 + 1.5 √I), with I in mol/kg and A_m the molal
/// Debye–Hückel constant (chem::debye_huckel_a_molal). The 1.5 (kg/mol)^1/2 is B·a_j, fixed for
/// all ions and temperatures (Grenthe, Plyasunov & Spahiu, in Modelling in Aquatic Chemistry,
/// OECD NEA 1997, ch. IX; the same form as the Bates–Guggenheim convention of the pH standards,
/// Buck et al., Pure Appl. Chem. 74 (2002) 2169; from memory).
double sit_debye_huckel(double a_molal, double ionic_strength_mol_per_kg);

/// One ion's Truesdell–Jones parameters, with their source.
struct IonSize {
    std::string species;      ///< "HCO3-", as the systems and spectators name it
    double size_angstrom = 0; ///< å, the ion-size parameter, Å (1e-10 m)
    double b_kg_per_mol = 0;  ///< b, the linear term, kg/mol
    std::string source;
};

/// One associated species of the extended models: an ion pair (K+ + Phth-2 ⇌ KPhth-) or a
/// polyanion (2 B(OH)3 + B(OH)4- ⇌ B3O3(OH)4-), formed from species the solver already has, with
/// its association constant at I = 0 and its source. The models fold it into its members'
/// stoichiometric activity coefficients (chem/equilibrium.cpp, fold_complexes): the species
/// amounts reported are totals, the members' free amounts plus their share of the complex, which
/// is counted as `formed_from` writes it (a triborate as two B(OH)3 and one B(OH)4-).
struct Complex {
    std::string species; ///< "KPhth-", "B3O3(OH)4-"
    /// Members, as the systems and spectators name them, and how many of each (1 to 4).
    std::vector<std::pair<std::string, int>> formed_from;
    double log10_k = 0; ///< log10 K° = log10 (a(complex) / Π a(member)^count), molal, I = 0
    std::vector<ActivityModel> models; ///< the models that include it (never Davies)
    std::string source;
};
/// The size and b a charged species takes when the library has no entry for it: Kielland's most
/// common size, 4.5 Å, and b = 0 (common practice, no source).
inline constexpr double default_ion_size_angstrom = 4.5;

/// Truesdell–Jones log10 γ of one ion, without the convention term:
/// −A_m z² √I/(1 + B_m å √I) + b I, with I in mol/kg, A_m in (kg/mol)^1/2 and B_m in
/// Å⁻¹ (kg/mol)^1/2 (chem::debye_huckel_b_molal).
double truesdell_jones_raw_log10_gamma(double a_molal, double b_molal, int charge,
                                       double size_angstrom, double b_kg_per_mol,
                                       double ionic_strength_mol_per_kg);

/// The convention term φ(I) of the Truesdell–Jones model: log10 γ(Cl−) by Bates–Guggenheim
/// (−A_m √I/(1 + 1.5 √I), Buck et al., Pure Appl. Chem. 74 (2002) 2169) minus the model's own
/// log10 γ(Cl−). Each ion's log10 γ then gets −z φ: neutral combinations, so every equilibrium,
/// are unchanged, and the reported pH is the one a cell calibrated with the pH standards reads.
double truesdell_jones_convention(double a_molal, double b_molal, double chloride_size_angstrom,
                                  double chloride_b_kg_per_mol, double ionic_strength_mol_per_kg);

} // namespace chem
