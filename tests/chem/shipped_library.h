#pragma once
// The shipped reagent and solvent libraries (data/reagents.json, data/solvents.json) for the
// chemistry tests, rebuilt with plain chem/ calls by a source generated at build time
// (tests/chem/shipped_library_gen, which reads data/ with the app's loader). Loaded once per
// process.
#include "chem/reagent.h"
#include "chem/solvent.h"

namespace chem::testing {

const chem::Library& shipped_library();
/// data/solvents.json, the same way.
const chem::SolventLibrary& shipped_solvents();

} // namespace chem::testing
