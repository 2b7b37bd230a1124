#pragma once
// The sentences of the notes that are not findings: a line recipe's notes (chem::LineNote), a
// route change's notes (chem::RouteNote), and a batch's use-by limit (chem::UseByLimit), release
// reasons (chem::ReleaseReason) and suggested correction (chem::Correction). Beside
// chem/finding_text.h, which words the findings: the notes carry only data (a kind, ids, numbers)
// and are worded here, at render time.
#include "chem/batch.h"
#include "chem/batch_correction.h"
#include "chem/finding.h"
#include "chem/line.h"
#include "chem/recipe_roles.h"

#include <string>
#include <vector>

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

/// Why a correction is a remake: "the corrected batch needs 1050 mL, more than the 1000 mL the
/// container holds" (volumes by format_number); "" when `c.remake` is false.
std::string remake_reason(const Correction& c);

/// A suggested correction in words, one sentence per entry: "Weigh 1.500 g of NaCl (scaled from
/// 1.4286 g).", "Add 0.05 mL of Phosphoric acid 85 % (to 1.27 mL, the scaled target).", "Make up
/// to 1050 mL instead of 1000 mL (all amounts × 1.0500), then relabel the volume.", or "Remake the
/// batch: …." (amounts by format_amount). `made_up`: the volume is made up to the mark (a buffer);
/// false for a line, whose volume is the sum of its parts ("The line then holds …"). Empty when
/// no correction is needed. Parts are named by `name_of` as above.
std::vector<std::string> describe(const Correction& c, const NameLookup& name_of = {},
                                  bool made_up = true);

} // namespace chem
