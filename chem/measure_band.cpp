#include "chem/measure_band.h"

#include <cmath>

namespace chem {

int shown_measure_decimals(double value, MeasureUnit unit) {
    const double scale = std::pow(10.0, measure_decimals(value, unit));
    return measure_decimals(std::round(value * scale) / scale, unit);
}

std::string format_measure_band(double low, double high, double target, MeasureUnit unit) {
    const int d = shown_measure_decimals(target, unit);
    const double scale = std::pow(10.0, d);
    // A part in 1e9 of the last decimal's step absorbs binary representation (1.23 * 100 is
    // 122.99999…).
    constexpr double slack = 1e-9;
    double lo = std::ceil(low * scale - slack) / scale;
    double hi = std::floor(high * scale + slack) / scale;
    if (lo > hi) {
        lo = std::round(low * scale) / scale;
        hi = std::round(high * scale) / scale;
    }
    // A zero end is -0.0 when rounded from a tiny negative value (ceil, round); + 0.0 makes it
    // +0.0, so it is not written "-0.00".
    return format_fixed(lo + 0.0, d) + "–" + format_fixed(hi + 0.0, d);
}

} // namespace chem
