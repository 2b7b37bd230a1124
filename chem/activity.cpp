#include "chem/activity.h"

#include <cmath>

namespace chem {

const char* activity_model_name(ActivityModel m) {
    switch (m) {
    case ActivityModel::davies:
        return "davies";
    case ActivityModel::sit:
        return "sit";
    case ActivityModel::truesdell_jones:
        return "truesdell-jones";
    }
    return "davies";
}

std::optional<ActivityModel> activity_model_from_name(const std::string& name) {
    if (name == "davies")
        return ActivityModel::davies;
    if (name == "sit")
        return ActivityModel::sit;
    if (name == "truesdell-jones")
        return ActivityModel::truesdell_jones;
    return std::nullopt;
}

double sit_debye_huckel(double a_molal, double ionic_strength_mol_per_kg) {
    const double s = std::sqrt(ionic_strength_mol_per_kg);
    return a_molal * s / (1.0 + 1.5 * s);
}

double truesdell_jones_raw_log10_gamma(double a_molal, double b_molal, int charge,
                                       double size_angstrom, double b_kg_per_mol,
                                       double ionic_strength_mol_per_kg) {
    if (charge == 0)
        return 0.0;
    const double s = std::sqrt(ionic_strength_mol_per_kg);
    return -a_molal * charge * charge * s / (1.0 + b_molal * size_angstrom * s) +
           b_kg_per_mol * ionic_strength_mol_per_kg;
}

double truesdell_jones_convention(double a_molal, double b_molal, double chloride_size_angstrom,
                                  double chloride_b_kg_per_mol, double ionic_strength_mol_per_kg) {
    const double bates_guggenheim = -sit_debye_huckel(a_molal, ionic_strength_mol_per_kg);
    return bates_guggenheim -
           truesdell_jones_raw_log10_gamma(a_molal, b_molal, -1, chloride_size_angstrom,
                                           chloride_b_kg_per_mol, ionic_strength_mol_per_kg);
}

} // namespace chem
