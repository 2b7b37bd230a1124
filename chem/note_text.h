#pragma once
// The sentences of the notes that are not findings: a line recipe's notes (chem::LineNote) and a
// route change's notes (chem::RouteNote). Beside chem/finding_text.h, which words the findings:
// the notes carry only data (a kind, ids, numbers) and are worded here, at render time.
#include "chem/line.h"
#include "chem/recipe_roles.h"

#include <string>

namespace chem {

/// A line recipe's note in words; solvents are named by the library ("Acetonitrile"), an id
/// the library does not know by the id itself.
std::string describe(const LineNote& note, const SolventLibrary& solvents);

/// A route change's note in words; reagents by reagent_words ("formic acid"), systems by
/// system_words ("formate"); an id the library does not know by the id itself.
std::string describe(const RouteNote& note, const Library& lib);

} // namespace chem
