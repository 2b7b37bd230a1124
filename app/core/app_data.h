#pragma once
// The shipped reference data, loaded once at start from data/ (JSON, diff-friendly).
#include "chem/reagent.h"
#include "chem/solvent.h"

#include <QJsonObject>
#include <QString>

#include <string>

namespace phaseplan {

struct AppData {
    QString data_dir;              ///< where it was loaded from
    chem::Library reagents;        ///< data/reagents.json
    chem::SolventLibrary solvents; ///< data/solvents.json
};

/// The data folder: $PHASEPLAN_DATA_DIR if set, else <executable dir>/data, else
/// <executable dir>/`installed` (an installed program's: ../share/phaseplan/data from bin/), else
/// the source tree's data/ (PHASEPLAN_SOURCE_DATA_DIR).
QString find_data_dir(const char* installed = "../share/phaseplan/data");

/// Loads every reference file in `dir`. Throws chem::Error whose field names the file and the
/// JSON path ("reagents.json: reagents[3].formula") on a malformed entry.
AppData load_app_data(const QString& dir);

/// Loads data/reagents.json content into `lib` (used by load_app_data and by the storage seeding).
/// @param origin names the file in error fields.
/// One reagent object of the reagents.json schema (also how the lab's own entries are stored).
/// @param at the JSON path used in error fields.
chem::Reagent reagent_from_json(const QJsonObject& o, const std::string& at);

void load_reagents_json(const QByteArray& bytes, const std::string& origin, chem::Library& lib);

} // namespace phaseplan
