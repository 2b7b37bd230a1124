#include "chem/activity.h"

#include <cmath>

namespace chem {

const char* activity_model_name(ActivityModel m) {
    switch (m) {
    case ActivityModel::davies:
        return "davies";
    case ActivityModel::sit:
        return "sit";
    }
    return "davies";
}

std::optional<ActivityModel> activity_model_from_name(const std::string& name) {
    if (name == "davies")
        return ActivityModel::davies;
    if (name == "sit")
        return ActivityModel::sit;
    return std::nullopt;
}

double sit_debye_huckel(double a_molal, double ionic_strength_mol_per_kg) {
    const double s = std::sqrt(ionic_strength_mol_per_kg);
    return a_molal * s / (1.0 + 1.5 * s);
}

} // namespace chem
