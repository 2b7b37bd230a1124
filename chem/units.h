#pragma once
// Physical constants and unit conversions. Internal basis: mol/L, mL, g, kelvin inside the
// solvers; °C only at the edges (inputs and outputs), converted once.
namespace chem {

inline constexpr double kelvin_offset = 273.15;                 ///< K at 0 °C
inline constexpr double reference_temperature_k = 298.15;       ///< 25 °C
inline constexpr double gas_constant_j_per_mol_k = 8.314462618; ///< CODATA 2018 (exact)
inline constexpr double ln10 = 2.302585092994046;

inline constexpr double min_temperature_c = 0.0; ///< range of the aqueous models here
inline constexpr double max_temperature_c = 60.0;
inline constexpr double max_concentration_mol_per_l = 10.0; ///< above this an amount is refused

inline constexpr double to_kelvin(double celsius) {
    return celsius + kelvin_offset;
}
inline constexpr double to_celsius(double kelvin) {
    return kelvin - kelvin_offset;
}

} // namespace chem
