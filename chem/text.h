#pragma once
// Small text helpers shared by the core's messages.
#include <string>

namespace chem {

/// Levenshtein edit distance between two byte strings: the fewest single-byte insertions,
/// deletions and substitutions that turn `a` into `b` (for "did you mean" suggestions of ids and
/// keys). O(|a|·|b|) time: callers bound the lengths first (guard::max_id_chars).
int edit_distance(const std::string& a, const std::string& b);

} // namespace chem
