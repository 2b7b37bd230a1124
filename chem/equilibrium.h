#pragma once
// Charge-balance speciation of an aqueous mixture of reagents with Davies activity coefficients
// at the self-consistent ionic strength.
#include "chem/activity.h"
#include "chem/finding.h"
#include "chem/reagent.h"

#include <optional>
#include <string>
#include <vector>

namespace chem {

struct Component {
    const Reagent* reagent = nullptr;
    double mol_per_l = 0; ///< formula units of the reagent per litre of final solution
};

struct SpeciesAmount {
    std::string species; ///< "H2PO4-", "Na+", "H+", "OH-"
    std::string system;  ///< system id, "" for spectators and water ions
    int charge = 0;
    double mol_per_l = 0;
    double activity_coefficient = 1;
};

/// A diagnostic attached to a result. Codes are stable strings (tests and the CLI use them).
/// The core's warnings (solver, recipe, batch, eluent, transfer) carry their finding (typed
/// subject and numbers) and are worded by chem::describe (chem/finding_text.h, warning_of).
struct Warning {
    using Severity = chem::Severity;
    std::string code; ///< "ionic-strength-high", "ph-outside-pka-range", …
    Severity severity = Severity::info;
    std::string message;              ///< plain sentence with the numbers behind it
    std::optional<Finding> finding{}; ///< the data behind the message, where it is typed
};
const char* severity_name(Warning::Severity s);

struct Speciation {
    double temperature_c = 25;
    double ph = 7;                        ///< −log10 a(H+), activity scale
    double ionic_strength_mol_per_l = 0;  ///< ½ Σ c z², self-consistent with the γ used
    double buffer_capacity_mol_per_l = 0; ///< β = dC_base/dpH in mol/L per pH unit
    std::vector<SpeciesAmount> species;
    std::vector<Warning> warnings;
    int iterations = 0; ///< ionic-strength iterations used
    ActivityModel activity_model = ActivityModel::davies;

    double concentration_of(const std::string& species_name) const; ///< 0 if absent
};

/// Solves the charge balance of the mixture at temperature_c (0–60 °C).
/// Each system's pKa is taken at T by van 't Hoff; γ by Davies with A(T); pKw(T).
/// The pH is bracketed in [−3, 17] and found by TOMS 748; the ionic strength by damped fixed
/// point. Throws chem::Error naming the field for a temperature out of range, a null, negative,
/// non-finite or too large (> 10 mol/L) amount, or a mixture that does not converge.
/// Components' fields in errors are "components[i].mol_per_l"; temperature is "temperature_c".
/// `model` chooses the activity coefficients (Davies by default, or SIT, chem/activity.h). When
/// the ionic strength exceeds 0.1 mol/L the other model is solved too, and a difference above
/// 0.02 pH is reported as the warning "activity-model-differs".
Speciation solve(const Library& lib, const std::vector<Component>& components, double temperature_c,
                 ActivityModel model = ActivityModel::davies);

} // namespace chem
