#include "chem/guard.h"

#include <cmath>

namespace chem::guard {

double amount(double v, const std::string& field, const char* what) {
    if (!std::isfinite(v))
        throw Error(field, std::string("the computed ") + what +
                               " is not a finite number; check the inputs it comes from");
    if (v < 0 || v > max_amount)
        throw Error(field, std::string("the computed ") + what + " of " + format_number(v) +
                               " is outside 0 to " + format_number(max_amount) +
                               "; check the inputs it comes from");
    return v;
}

long long count_up(double v, const std::string& field, const char* what) {
    if (!std::isfinite(v) || v < 0 || v > max_count)
        throw Error(field, std::string("the computed ") + what + " of " + format_number(v) +
                               " is outside 0 to " + format_number(max_count) +
                               "; check the inputs it comes from");
    return static_cast<long long>(std::ceil(v));
}

void year(int y, const std::string& field, const std::string& shown) {
    if (y < min_year || y > max_year)
        throw Error(field, quote_id(shown) + " is outside the years " + std::to_string(min_year) +
                               " to " + std::to_string(max_year));
}

namespace {
/// Bytes of the UTF-8 sequence that starts with byte c (1 for a stray continuation byte).
std::size_t sequence_length(unsigned char c) {
    if (c >= 0xf0 && c < 0xf8)
        return 4;
    if (c >= 0xe0)
        return c < 0xf0 ? 3 : 1;
    if (c >= 0xc0)
        return 2;
    return 1;
}
} // namespace

std::size_t char_count(const std::string& s) {
    std::size_t n = 0;
    for (std::size_t i = 0; i < s.size(); ++n)
        i += sequence_length(static_cast<unsigned char>(s[i]));
    return n;
}

std::string cut(const std::string& s, std::size_t max_chars) {
    std::size_t i = 0, n = 0;
    while (i < s.size() && n < max_chars) {
        i += sequence_length(static_cast<unsigned char>(s[i]));
        ++n;
    }
    if (i >= s.size())
        return s;
    return s.substr(0, i) + "…";
}

std::string quote_id(const std::string& id) {
    // Appended rather than `"\"" + cut(...)`: GCC 12 reports a false -Wrestrict on that form.
    std::string quoted(1, '"');
    quoted += cut(id, max_id_chars);
    quoted += '"';
    return quoted;
}

} // namespace chem::guard
