#pragma once
// Properties of liquid water at 0–60 °C, 101.325 kPa, used by the activity and equilibrium models.

namespace chem {

/// pKw = −log10 Kw of water (molal, thermodynamic), from Harned & Robinson, Trans. Faraday Soc. 36
/// (1940) 973: log10 Kw = −4470.99/T + 6.0875 − 0.01706·T, valid 0–60 °C. @param temperature_k in
/// K.
double pkw(double temperature_k);

/// Density of air-free water in g/mL: Tanaka et al., Metrologia 38 (2001) 301, eq. (1).
double water_density_g_per_ml(double temperature_k);

/// Relative permittivity of water: Malmberg & Maryott, J. Res. NBS 56 (1956) 1,
/// ε = 87.740 − 0.40008 t + 9.398e−4 t² − 1.410e−6 t³ (t in °C), valid 0–100 °C.
double water_permittivity(double temperature_k);

/// Debye–Hückel limiting-law constant A on the molar scale, in (L/mol)^1/2 for log10 γ with the
/// ionic strength in mol/L: A = 1.82483e6 / (ε T)^{3/2} (Robinson & Stokes, Electrolyte Solutions,
/// 2nd ed. (1959), ch. 9 and Appendix 7.1, from memory), ε from water_permittivity. The Davies
/// model works on this scale, as the solver does (mol/L).
double debye_huckel_a(double temperature_k);

/// The same constant on the molal scale, in (kg/mol)^1/2 for an ionic strength in mol/kg:
/// A_m = A · √ρ_w (ρ_w in g/mL, Tanaka 2001). The specific-ion-interaction model works on it.
double debye_huckel_a_molal(double temperature_k);

/// Molar Debye–Hückel A for any solvent of relative permittivity `permittivity` at temperature_k:
/// A = 1.82483e6 / (ε T)^{3/2} (L/mol)^1/2, used for water–organic eluents.
double debye_huckel_a_for(double permittivity, double temperature_k);

/// Molar Debye–Hückel B for any solvent of relative permittivity `permittivity` at
/// temperature_k, in Å⁻¹ (L/mol)^1/2: B = (2 N_A e² · 1000 / (ε0 ε k T))^1/2 = 50.2907 / (ε T)^1/2
/// (CODATA 2018 constants; 0.3287 in water at 25 °C).
double debye_huckel_b_for(double permittivity, double temperature_k);

/// The same in water on the molal scale, Å⁻¹ (kg/mol)^1/2: B_m = B · √ρ_w (ρ_w in g/mL).
double debye_huckel_b_molal(double temperature_k);

/// Davies activity coefficient (decadic): log10 γ = −A z² (√I/(1+√I) − 0.3 I)
/// (Davies, Ion Association, 1962). @param ionic_strength_mol_per_l I; @param charge z.
double davies_log10_gamma(double a, int charge, double ionic_strength_mol_per_l);

} // namespace chem
