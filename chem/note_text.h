#pragma once
// The sentences of the notes that are not findings: a line recipe's notes (chem::LineNote), a
// route change's notes (chem::RouteNote), and a batch's use-by limit (chem::UseByLimit) and
// release reasons (chem::ReleaseReason). Beside chem/finding_text.h, which words the findings:
// the notes carry only data (a kind, ids, numbers) and are worded here, at render time.
#include "chem/batch.h"
#include "chem/finding.h"
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

/// The lot that limits a batch's use-by: "lot SP-2 of Sodium dihydrogen phosphate monohydrate,
/// which expires on 2026-12-02" (the sheet puts "limited by " before it). The part is named by
/// `name_of` (the screens' names); without one, by its id.
std::string describe(const UseByLimit& limit, const NameLookup& name_of = {});

/// A release reason: "Potassium dihydrogen phosphate: 3.2050 g, +1.4 % (band 3.0978–3.2242 g)"
/// (amounts by format_amount), "Measured pH 2.61, +0.11 from the target 2.50 (± 0.05)". The part
/// is named by `name_of` as above.
std::string describe(const ReleaseReason& reason, const NameLookup& name_of = {});

} // namespace chem
