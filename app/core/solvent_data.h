#pragma once
// Loading data/solvents.json (solvents, miscibility, additives, salt solubility, excess volumes,
// shelf lives) into a chem::SolventLibrary.
#include "chem/solvent.h"

#include <QByteArray>

#include <string>

namespace phaseplan {

/// Parses the file's content into `lib`. Throws chem::Error whose field names the file and the
/// JSON path ("solvents.json: solvents[3].density_g_per_ml") on a malformed entry, and when the
/// miscibility table lacks a pair of the listed solvents.
/// @param origin the file name used in error fields.
void load_solvents_json(const QByteArray& bytes, const std::string& origin,
                        chem::SolventLibrary& lib);

} // namespace phaseplan
