#include "chem/water.h"

#include <cmath>

namespace chem {

double pkw(double temperature_k) {
    // Harned & Robinson (1940): log10 Kw = -4470.99/T + 6.0875 - 0.01706 T.
    return 4470.99 / temperature_k - 6.0875 + 0.01706 * temperature_k;
}

double water_density_g_per_ml(double temperature_k) {
    // Tanaka et al. (2001), eq. (1), t in °C, result in kg/m3.
    const double t = temperature_k - 273.15;
    const double a1 = -3.983035, a2 = 301.797, a3 = 522528.9, a4 = 69.34881, a5 = 999.974950;
    const double rho = a5 * (1.0 - (t + a1) * (t + a1) * (t + a2) / (a3 * (t + a4)));
    return rho / 1000.0;
}

double water_permittivity(double temperature_k) {
    const double t = temperature_k - 273.15;
    return 87.740 - 0.40008 * t + 9.398e-4 * t * t - 1.410e-6 * t * t * t;
}

double debye_huckel_a_for(double permittivity, double temperature_k) {
    // A = e^3 (2 N_A)^1/2 / (ln10 (4 pi eps0 eps_r k T)^3/2) with c in mol/L, collapsed into the
    // usual numerical constant 1.82483e6 (Robinson & Stokes, Electrolyte Solutions).
    const double et = permittivity * temperature_k;
    return 1.82483e6 / (et * std::sqrt(et));
}

double debye_huckel_a(double temperature_k) {
    return debye_huckel_a_for(water_permittivity(temperature_k), temperature_k);
}

double debye_huckel_a_molal(double temperature_k) {
    return debye_huckel_a(temperature_k) * std::sqrt(water_density_g_per_ml(temperature_k));
}

double debye_huckel_b_for(double permittivity, double temperature_k) {
    // (2 N_A e² · 1000 L/m³ / (ε0 k))^1/2 · 1e-10 m/Å with the CODATA 2018 values.
    return 50.2907 / std::sqrt(permittivity * temperature_k);
}

double debye_huckel_b_molal(double temperature_k) {
    return debye_huckel_b_for(water_permittivity(temperature_k), temperature_k) *
           std::sqrt(water_density_g_per_ml(temperature_k));
}

double davies_log10_gamma(double a, int charge, double ionic_strength_mol_per_l) {
    const double sqrt_i = std::sqrt(ionic_strength_mol_per_l);
    return -a * charge * charge * (sqrt_i / (1.0 + sqrt_i) - 0.3 * ionic_strength_mol_per_l);
}

} // namespace chem
