#pragma once
// A tolerance band around an amount to weigh or measure, written at the target's resolution
// (chem::measure_decimals, the one amount rule: DEVELOPERS.md, "Amounts to weigh and measure").
// Kept beside chem/error.h's format_measure rather than in it, so that a change here does not
// rebuild everything that includes the error type.
#include "chem/error.h"

#include <string>

namespace chem {

/// The decimals `value` is written with by format_measure: measure_decimals of the value once
/// rounded (99.9996 g is written "100.00", so 2).
int shown_measure_decimals(double value, MeasureUnit unit);

/// The band "low–high" (en dash, "." as the decimal mark, no unit) with the decimals of its
/// target as format_measure writes it, so the band reads on the same balance or pipette as the
/// target (common practice, no source). Each end is rounded inward (low up, high down), so every
/// reading the printed band holds is within tolerance: 1.2336–1.2840 mL around 1.26 mL is
/// "1.24–1.28". A band too narrow for that resolution (the inward ends cross) is rounded to the
/// nearest step instead.
std::string format_measure_band(double low, double high, double target, MeasureUnit unit);

} // namespace chem
