// Chemical formulas and molar masses from the IUPAC 2021 standard atomic weights.
#include "chem/formula.h"

#include "chem/error.h"

#include <array>
#include <cstddef>
#include <utility>
#include <vector>

namespace chem {

namespace {

struct Element {
    std::string_view symbol;
    double weight_g_per_mol;
};

// Standard atomic weights 2021: Prohaska et al., "Standard atomic weights of the elements 2021
// (IUPAC Technical Report)", Pure Appl. Chem. 94 (2022) 573 (from memory). For the elements whose
// standard atomic weight is an interval (H, Li, B, C, N, O, Mg, Si, S, Cl, Ar, Br, Tl, Pb) the
// table holds the conventional (abridged) value the report gives for use in commerce and trade.
// Covered: H through Kr, and the heavier elements that occur in buffer and mobile-phase reagents.
constexpr std::array<Element, 53> elements = {{
    {"H", 1.008},        {"He", 4.002602},     {"Li", 6.94},        {"Be", 9.0121831},
    {"B", 10.81},        {"C", 12.011},        {"N", 14.007},       {"O", 15.999},
    {"F", 18.998403162}, {"Ne", 20.1797},      {"Na", 22.98976928}, {"Mg", 24.305},
    {"Al", 26.9815384},  {"Si", 28.085},       {"P", 30.973761998}, {"S", 32.06},
    {"Cl", 35.45},       {"Ar", 39.95},        {"K", 39.0983},      {"Ca", 40.078},
    {"Sc", 44.955907},   {"Ti", 47.867},       {"V", 50.9415},      {"Cr", 51.9961},
    {"Mn", 54.938043},   {"Fe", 55.845},       {"Co", 58.933194},   {"Ni", 58.6934},
    {"Cu", 63.546},      {"Zn", 65.38},        {"Ga", 69.723},      {"Ge", 72.630},
    {"As", 74.921595},   {"Se", 78.971},       {"Br", 79.904},      {"Kr", 83.798},
    {"Rb", 85.4678},     {"Sr", 87.62},        {"Mo", 95.95},       {"Ag", 107.8682},
    {"Cd", 112.414},     {"Sn", 118.710},      {"Sb", 121.760},     {"I", 126.90447},
    {"Xe", 131.293},     {"Cs", 132.90545196}, {"Ba", 137.327},     {"W", 183.84},
    {"Pt", 195.084},     {"Au", 196.966570},   {"Hg", 200.592},     {"Pb", 207.2},
    {"Bi", 208.98040},
}};

/// `text` in double quotes. Built by append: GCC 12 warns falsely (-Wrestrict) on "\"" + string.
std::string quoted(std::string_view text) {
    std::string q;
    q.reserve(text.size() + 2);
    q.push_back('"');
    q.append(text);
    q.push_back('"');
    return q;
}

const Element* find_element(std::string_view symbol) {
    for (const auto& e : elements)
        if (e.symbol == symbol)
            return &e;
    return nullptr;
}

constexpr int max_nesting_depth = 16; ///< deeper groups are refused, not recursed into
constexpr double max_count = 1e6;     ///< a subscript or multiplier above this is refused
constexpr std::size_t max_formula_bytes = 1000;

/// Recursive-descent reader over the UTF-8 text. Positions in messages are 1-based characters
/// (code points), so "Na2HPO4·7H2O" reports the "7" as character 9 although it is byte 10.
class Parser {
  public:
    explicit Parser(std::string_view text) : text_(text) {}

    std::map<std::string, double> run() {
        if (text_.size() > max_formula_bytes)
            fail("is longer than " + std::to_string(max_formula_bytes) + " characters");
        if (text_.empty())
            fail("is empty");
        std::map<std::string, double> total;
        // formula := part (dot part)*  ;  part := [multiplier] group+
        for (;;) {
            double multiplier = 1;
            if (at_digit())
                multiplier = read_number(/*allow_fraction=*/true);
            std::map<std::string, double> part = read_sequence(0);
            if (part.empty()) {
                if (pos_ >= text_.size())
                    fail("ends where an element symbol is expected");
                fail_at(pos_, "expected an element symbol or \"(\", found " + quote_here());
            }
            for (const auto& [symbol, n] : part)
                total[symbol] += multiplier * n;
            if (pos_ >= text_.size())
                break;
            std::size_t dot_at = pos_;
            if (!read_dot()) {
                if (peek() == ')' || peek() == ']')
                    fail_at(pos_,
                            quoted(std::string(1, peek())) + " has no matching opening bracket");
                fail_at(pos_, "unexpected " + quote_here());
            }
            skip_spaces();
            if (pos_ >= text_.size())
                fail_at(dot_at, "hydrate dot is not followed by a formula");
        }
        return total;
    }

  private:
    std::string_view text_;
    std::size_t pos_ = 0;

    char peek() const { return pos_ < text_.size() ? text_[pos_] : '\0'; }
    bool at_digit() const { return peek() >= '0' && peek() <= '9'; }
    static bool is_upper(char c) { return c >= 'A' && c <= 'Z'; }
    static bool is_lower(char c) { return c >= 'a' && c <= 'z'; }

    /// group+ up to a closing bracket, a dot or the end; returns the summed element counts.
    std::map<std::string, double> read_sequence(int depth) {
        std::map<std::string, double> counts;
        for (;;) {
            char c = peek();
            if (is_upper(c)) {
                std::size_t start = pos_;
                ++pos_;
                while (is_lower(peek()))
                    ++pos_;
                std::string symbol(text_.substr(start, pos_ - start));
                if (!find_element(symbol))
                    fail_at(start, "unknown element symbol " + quoted(symbol));
                double n = at_digit() ? read_number(false) : 1;
                counts[symbol] += n;
            } else if (c == '(' || c == '[') {
                std::size_t open_at = pos_;
                char close = c == '(' ? ')' : ']';
                if (depth + 1 > max_nesting_depth)
                    fail_at(open_at,
                            "brackets nested deeper than " + std::to_string(max_nesting_depth));
                ++pos_;
                std::map<std::string, double> inner = read_sequence(depth + 1);
                if (peek() != close) {
                    if (pos_ >= text_.size())
                        fail_at(open_at, quoted(std::string(1, c)) + " is never closed");
                    fail_at(pos_, "expected \"" + std::string(1, close) + "\" to close the \"" +
                                      std::string(1, c) + "\" at character " +
                                      std::to_string(char_index(open_at) + 1) + ", found " +
                                      quote_here());
                }
                if (inner.empty())
                    fail_at(open_at, "empty brackets");
                ++pos_;
                double n = at_digit() ? read_number(false) : 1;
                for (const auto& [symbol, k] : inner)
                    counts[symbol] += n * k;
            } else {
                return counts;
            }
        }
    }

    /// Digits, and with allow_fraction a decimal part ("0.5" before a hemihydrate's water).
    /// Subscripts are integers, so "Na2HPO4.7H2O" reads as Na2HPO4 · 7 H2O, never as O4.7.
    double read_number(bool allow_fraction) {
        std::size_t start = pos_;
        double value = 0;
        while (at_digit()) {
            value = value * 10 + (peek() - '0');
            ++pos_;
            if (value > max_count)
                fail_at(start, "count is larger than " + format_number(max_count));
        }
        if (allow_fraction && peek() == '.' && pos_ + 1 < text_.size() && text_[pos_ + 1] >= '0' &&
            text_[pos_ + 1] <= '9') {
            ++pos_;
            double scale = 0.1;
            while (at_digit()) {
                value += scale * (peek() - '0');
                scale /= 10;
                ++pos_;
            }
        }
        if (value == 0)
            fail_at(start,
                    "count " + std::string(text_.substr(start, pos_ - start)) + " is not positive");
        return value;
    }

    /// A hydrate or adduct separator: "·" (U+00B7), "•" (U+2022), "⋅" (U+22C5), "." or "*".
    bool read_dot() {
        static constexpr std::array<std::string_view, 5> dots = {"\xC2\xB7", "\xE2\x80\xA2",
                                                                 "\xE2\x8B\x85", ".", "*"};
        std::size_t start = pos_;
        skip_spaces();
        for (auto d : dots)
            if (text_.substr(pos_, d.size()) == d) {
                pos_ += d.size();
                return true;
            }
        pos_ = start;
        return false;
    }

    /// Spaces are allowed only around a hydrate dot ("Na2HPO4 · 7H2O").
    void skip_spaces() {
        while (peek() == ' ')
            ++pos_;
    }

    std::size_t char_index(std::size_t byte) const {
        std::size_t n = 0;
        for (std::size_t i = 0; i < byte && i < text_.size(); ++i)
            if ((static_cast<unsigned char>(text_[i]) & 0xC0) != 0x80)
                ++n;
        return n;
    }

    std::string quote_here() const {
        if (pos_ >= text_.size())
            return "the end";
        std::size_t len = 1;
        while (pos_ + len < text_.size() &&
               (static_cast<unsigned char>(text_[pos_ + len]) & 0xC0) == 0x80)
            ++len;
        return quoted(text_.substr(pos_, len));
    }

    [[noreturn]] void fail(const std::string& what) const {
        throw Error("formula", quoted(text_.substr(0, max_formula_bytes)) + " " + what);
    }

    [[noreturn]] void fail_at(std::size_t byte, const std::string& what) const {
        throw Error("formula", quoted(text_) + " at character " +
                                   std::to_string(char_index(byte) + 1) + ": " + what);
    }
};

} // namespace

double atomic_weight_g_per_mol(std::string_view symbol) {
    if (const Element* e = find_element(symbol))
        return e->weight_g_per_mol;
    throw Error("formula", "unknown element symbol " + quoted(symbol.substr(0, 40)));
}

std::map<std::string, double> parse_formula(std::string_view formula) {
    return Parser(formula).run();
}

double molar_mass_g_per_mol(std::string_view formula) {
    double mass = 0;
    for (const auto& [symbol, n] : parse_formula(formula))
        mass += n * atomic_weight_g_per_mol(symbol);
    return mass;
}

} // namespace chem
