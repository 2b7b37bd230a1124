#include "chem/measure_band.h"

#include <cmath>

namespace chem {

namespace {
/// "-0.00" as "0.00" (a band's end rounded from a tiny negative value).
std::string without_minus_on_zero(std::string s) {
    if (s.size() > 1 && s[0] == '-' && s.find_first_not_of("-0.") == std::string::npos)
        s.erase(0, 1);
    return s;
}
} // namespace

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
    return without_minus_on_zero(format_fixed(lo, d)) + "–" +
           without_minus_on_zero(format_fixed(hi, d));
}

} // namespace chem
