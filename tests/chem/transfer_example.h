#pragma once
// The chemistry tests' example column move (test_transfer, test_findings_notes): a gradient
// method on a 250 × 4.6 mm, 5 µm column at 1.0 mL/min with 10 µL injections, moved to a
// 50 × 2.1 mm column of the given particle size, at the given flow (none: scaled by the rule).
#include "chem/transfer.h"

#include <optional>

namespace chem::testing {

inline TransferRequest transfer_example(double to_particle_um, std::optional<double> to_flow) {
    TransferRequest r;
    r.method.name = "assay";
    r.method.flow_ml_min = 1.0;
    r.method.gradient = {{0, {95, 5, 0, 0}}, {10, {5, 95, 0, 0}}};
    r.method.run_min = 12;
    r.method.equilibration_min = 5;
    r.from.column.field = "from";
    r.from.column.length_mm = 250;
    r.from.column.id_mm = 4.6;
    r.from.column.particle_um = 5;
    r.to.column.field = "to";
    r.to.column.length_mm = 50;
    r.to.column.id_mm = 2.1;
    r.to.column.particle_um = to_particle_um;
    r.to.flow_ml_min = to_flow;
    r.injection_ul = 10;
    return r;
}

} // namespace chem::testing
