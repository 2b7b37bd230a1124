#pragma once
// Line profiles for tests, in plain C++ (shared by tests/chem and, through test_support.h, the
// QtTest programs).
#include "chem/line.h"

#include <string>

namespace chem::testing {

/// A described line of one neat solvent (water is the aqueous one).
inline chem::LineProfile neat_line(const std::string& solvent, bool aqueous) {
    chem::LineProfile p;
    p.described = true;
    p.solvent_fraction_v[solvent] = 1.0;
    (aqueous ? p.aqueous_fraction_v : p.organic_fraction_v) = 1.0;
    return p;
}

} // namespace chem::testing
