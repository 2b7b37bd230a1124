#pragma once
// Activity models of the speciation solver. Davies (the default) depends on the ionic strength
// alone; the specific ion interaction theory (SIT) adds, for each ion, a term for every ion of
// opposite charge and holds to a few mol/kg.
#include <optional>
#include <string>

namespace chem {

enum class ActivityModel {
    davies, ///< log10 γ = −A z² (√I/(1+√I) − 0.3 I), I in mol/L (Davies 1962)
    sit, ///< log10 γ_i = −z_i² D + Σ_j ε(i,j) m_j, molal (Brønsted–Guggenheim–Scatchard)
};
const char* activity_model_name(ActivityModel m);
/// "davies" or "sit"; nullopt for anything else.
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

} // namespace chem
