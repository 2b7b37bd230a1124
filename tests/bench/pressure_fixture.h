#pragma once
// The column and instrument the pressure benchmarks run on: 100 × 2.1 mm, 1.8 µm at 40 °C, an
// instrument with a 0.4 mL dwell volume (invented, typical of a small-particle setup).
#include "chem/pressure.h"

namespace bench {

inline chem::Column small_particle_column() {
    chem::Column c;
    c.length_mm = 100;
    c.id_mm = 2.1;
    c.particle_um = 1.8;
    c.temperature_c = 40;
    c.max_pressure_bar = 600;
    return c;
}

inline chem::Instrument low_dwell_instrument() {
    chem::Instrument in;
    in.max_pressure_bar = 1000;
    in.dwell_ml = 0.4;
    return in;
}

} // namespace bench
