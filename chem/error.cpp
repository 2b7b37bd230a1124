// Number formatting for error messages (chem/error.h).
#include "chem/error.h"

#include <charconv>
#include <cmath>

namespace chem {

bool path_within(const std::string& path, const std::string& field) {
    if (field.empty())
        return true;
    if (path.size() < field.size() || path.compare(0, field.size(), field) != 0)
        return false;
    return path.size() == field.size() || path[field.size()] == '.' || path[field.size()] == '[';
}

int Subscripted::index() const {
    if (subscript.empty() || subscript.size() > 9)
        return -1;
    int v = 0;
    for (char c : subscript) {
        if (c < '0' || c > '9')
            return -1;
        v = v * 10 + (c - '0');
    }
    return v;
}

std::optional<Subscripted> subscript_of(const std::string& path, const std::string& list) {
    if (path.size() < list.size() + 2 || path.compare(0, list.size(), list) != 0 ||
        path[list.size()] != '[')
        return std::nullopt;
    const std::size_t close = path.find(']', list.size() + 1);
    if (close == std::string::npos)
        return std::nullopt;
    Subscripted out;
    out.subscript = path.substr(list.size() + 1, close - list.size() - 1);
    std::size_t rest = close + 1;
    if (rest < path.size() && path[rest] == '.')
        ++rest;
    out.rest = path.substr(rest);
    return out;
}

void require_finite(double v, const std::string& field) {
    if (!std::isfinite(v))
        throw Error(field, "must be a finite number");
}

void require_range(double v, double lo, double hi, const std::string& field, const char* what) {
    require_finite(v, field);
    if (v < lo || v > hi)
        throw Error(field, format_number(v) + " is outside " + format_number(lo) + " to " +
                               format_number(hi) + " " + what);
}

void require_positive(double v, double hi, const std::string& field, const char* unit) {
    require_finite(v, field);
    if (v <= 0)
        throw Error(field, format_number(v) + " " + unit + " is not positive");
    if (v > hi)
        throw Error(field,
                    format_number(v) + " " + unit + " is above the limit of " + format_number(hi));
}

std::string format_number(double value) {
    if (std::isnan(value))
        return "nan";
    if (std::isinf(value))
        return value > 0 ? "inf" : "-inf";
    if (value == 0)
        return "0"; // also for -0
    // std::to_chars is locale-independent (a Qt app may run under a decimal-comma locale, where
    // printf would write "1,5"); general format with precision 6 is printf's %.6g: up to six
    // significant digits, trailing zeros dropped, exponent form for very large or small values.
    char buf[64];
    auto res = std::to_chars(buf, buf + sizeof buf, value, std::chars_format::general, 6);
    return std::string(buf, res.ptr);
}

std::string format_fixed(double value, int decimals) {
    if (!std::isfinite(value))
        return format_number(value);
    char buf[128];
    auto res = std::to_chars(buf, buf + sizeof buf, value, std::chars_format::fixed, decimals);
    if (res.ec != std::errc())
        return format_number(value);
    return std::string(buf, res.ptr);
}

std::string format_amount(double value) {
    if (value == 0)
        return "0";
    const double a = std::abs(value);
    return format_fixed(value, a >= 100 ? 1 : a >= 10 ? 2 : a >= 1 ? 3 : 4);
}

} // namespace chem
