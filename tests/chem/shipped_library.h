#pragma once
// The shipped reagent library (data/reagents.json) for the chemistry tests, rebuilt with plain
// chem/ calls by a source generated at build time (tests/chem/shipped_library_gen, which reads
// data/ with the app's loader). Loaded once per process.
#include "chem/reagent.h"

namespace chem::testing {

const chem::Library& shipped_library();

} // namespace chem::testing
