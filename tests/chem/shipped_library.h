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

/// The tests' shorthands for the two (`using chem::testing::lib;` in a test file).
inline const chem::Library& lib() {
    return shipped_library();
}
inline const chem::SolventLibrary& solvents() {
    return shipped_solvents();
}

} // namespace chem::testing
