// Field paths and number formatting for error messages (chem/error.h).
#include "chem/error.h"

#include <charconv>
#include <cmath>
#include <utility>

namespace chem {

PathSegment PathSegment::subscript(std::string text) {
    PathSegment s{Kind::subscript, std::move(text)};
    if (s.as_index_text() >= 0)
        s.kind = Kind::index;
    return s;
}

int PathSegment::as_index_text() const {
    if (text.empty() || text.size() > 9)
        return -1;
    int v = 0;
    for (char c : text) {
        if (c < '0' || c > '9')
            return -1;
        v = v * 10 + (c - '0');
    }
    return v;
}

int PathSegment::as_index() const {
    return kind == Kind::index ? as_index_text() : -1;
}

Path Path::parse(std::string_view text) {
    Path out;
    std::string key;
    bool key_open = false; // a key has started (possibly empty, as in "a..b")
    auto flush_key = [&] {
        if (key_open)
            out.segments_.push_back(PathSegment::key(std::move(key)));
        key.clear();
        key_open = false;
    };
    std::size_t i = 0;
    while (i < text.size()) {
        const char c = text[i];
        if (c == '[') {
            const std::size_t close = text.find(']', i + 1);
            if (close == std::string_view::npos) { // no ']': the rest is text of the key
                key.append(text.substr(i));
                key_open = true;
                break;
            }
            flush_key();
            out.segments_.push_back(
                PathSegment::subscript(std::string(text.substr(i + 1, close - i - 1))));
            i = close + 1;
            if (i < text.size() && text[i] == '.') {
                ++i;
                key_open = true; // "x[1]." then a key, even an empty one
            }
            continue;
        }
        if (c == '.') {
            key_open = true;
            flush_key();
            key_open = true;
            ++i;
            continue;
        }
        key.push_back(c);
        key_open = true;
        ++i;
    }
    flush_key();
    return out;
}

std::string Path::text() const {
    std::string out;
    for (std::size_t i = 0; i < segments_.size(); ++i) {
        const PathSegment& s = segments_[i];
        if (s.kind == PathSegment::Kind::key) {
            if (i > 0)
                out.push_back('.');
            out += s.text;
        } else {
            out.push_back('[');
            out += s.text;
            out.push_back(']');
        }
    }
    return out;
}

bool Path::within(const Path& parent) const {
    if (parent.segments_.size() > segments_.size())
        return false;
    for (std::size_t i = 0; i < parent.segments_.size(); ++i)
        if (segments_[i] != parent.segments_[i])
            return false;
    return true;
}

Path Path::under(const Path& parent) const {
    Path out = parent;
    out.segments_.insert(out.segments_.end(), segments_.begin(), segments_.end());
    return out;
}

Path Path::tail(std::size_t first) const {
    if (first >= segments_.size())
        return {};
    return Path(std::vector<PathSegment>(segments_.begin() + static_cast<std::ptrdiff_t>(first),
                                         segments_.end()));
}

bool path_within(const std::string& path, const std::string& field) {
    return Path::parse(path).within(Path::parse(field));
}

int Subscripted::index() const {
    return PathSegment::subscript(subscript).as_index();
}

std::optional<Subscripted> subscript_of(const Path& path, const Path& list) {
    const std::size_t n = list.size();
    if (path.size() <= n || !path.within(list) || path.segments()[n].kind == PathSegment::Kind::key)
        return std::nullopt;
    Subscripted out;
    out.subscript = path.segments()[n].text;
    out.rest_path = path.tail(n + 1);
    out.rest = out.rest_path.text();
    return out;
}

std::optional<Subscripted> subscript_of(const std::string& path, const std::string& list) {
    return subscript_of(Path::parse(path), Path::parse(list));
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

std::string format_fixed_ties_away(double value, int decimals) {
    if (std::isfinite(value) && decimals >= 0 && decimals <= 4) {
        // v · 10^d = v · 2^d · 5^d is exact in long double (64-bit mantissa) for d ≤ 4: 5^4 = 625
        // needs 10 bits, 53 + 10 ≤ 64 (and every partial product fits as well).
        long double scaled = value;
        for (int i = 0; i < decimals; ++i)
            scaled *= 10;
        if (std::fabs(scaled - std::trunc(scaled)) == 0.5L)
            value = std::nextafter(value, value > 0 ? HUGE_VAL : -HUGE_VAL);
    }
    return format_fixed(value, decimals);
}

std::string format_amount(double value) {
    if (value == 0)
        return "0";
    const double a = std::abs(value);
    return format_fixed(value, a >= 100 ? 1 : a >= 10 ? 2 : a >= 1 ? 3 : 4);
}

namespace {
/// "-0.000" reads as another number at the bench: a zero is written without its sign.
std::string without_negative_zero(std::string s) {
    if (s.size() > 1 && s[0] == '-' && s.find_first_not_of("-0.") == std::string::npos)
        s.erase(0, 1);
    return s;
}
} // namespace

int measure_decimals(double value, MeasureUnit unit) {
    const double a = std::abs(value);
    if (unit == MeasureUnit::g)
        return a < 1 ? 4 : a < 100 ? 3 : 2;
    return a < 1 ? 3 : a < 10 ? 2 : a < 100 ? 1 : 0;
}

std::string format_measure(double value, MeasureUnit unit) {
    // Rounded first, so that a value just under a boundary (99.9996 g) is written at the
    // resolution of the amount it rounds to ("100.00", not "100.000").
    int d = measure_decimals(value, unit);
    const double scale = std::pow(10.0, d);
    const double shown = std::round(value * scale) / scale;
    d = measure_decimals(shown, unit);
    std::string s = format_fixed(shown, d);
    return without_negative_zero(std::move(s));
}

std::string format_recorded(double value, MeasureUnit unit) {
    constexpr int max_decimals = 6;
    int d = measure_decimals(value, unit);
    // The fewest decimals at or above the rule's that give the value back (to within a
    // part in 1e9 of the last decimal's step, which absorbs binary representation).
    while (d < max_decimals) {
        const double scale = std::pow(10.0, d);
        if (std::abs(std::round(value * scale) - value * scale) < 1e-6)
            break;
        ++d;
    }
    return without_negative_zero(format_fixed(value, d));
}

} // namespace chem
