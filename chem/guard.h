#pragma once
// The one guard between a computed result and whatever shows it (JSON, a screen, paper), and the
// text limits of the contract. A computed amount, count or date that is not finite or out of its
// range throws chem::Error naming the field, so "inf", "nan" and an overflowed integer can never
// be printed; an id or a text echoed in a message is cut on a character boundary.
#include "chem/error.h"

#include <cstddef>
#include <string>

namespace chem::guard {

/// Longest id (reagent, solvent, additive, system, method, batch id), in characters.
inline constexpr std::size_t max_id_chars = 64;
/// Longest free text (a name, a label, prepared_by, a lot, a note), in characters.
inline constexpr std::size_t max_text_chars = 1000;
/// Largest amount any result may carry: g, mL, mol/L, min or h (10^9 mL is a million litres).
inline constexpr double max_amount = 1.0e9;
/// Largest count a result may carry (batches, bottles, injections).
inline constexpr double max_count = 1.0e9;
/// The years a printed date may fall in.
inline constexpr int min_year = 1900;
inline constexpr int max_year = 9000;

/// v if it is finite and 0 ≤ v ≤ max_amount; else Error(field, "the computed <what> is …").
double amount(double v, const std::string& field, const char* what);
/// v rounded up to a whole count if finite and 0 ≤ v ≤ max_count; else Error(field, …).
long long count_up(double v, const std::string& field, const char* what);
/// Error(field, …) unless min_year ≤ year ≤ max_year.
void year(int year, const std::string& field, const std::string& shown);

/// The number of Unicode characters (code points) of UTF-8 text; a stray byte counts as one.
std::size_t char_count(const std::string& utf8);
/// The first max_chars characters of UTF-8 text, never splitting one, with "…" when cut.
std::string cut(const std::string& utf8, std::size_t max_chars);
/// "\"<id>\"", the id cut to max_id_chars characters: for messages that echo what was given.
std::string quote_id(const std::string& id);

} // namespace chem::guard
