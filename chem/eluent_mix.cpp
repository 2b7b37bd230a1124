#include "chem/eluent_mix.h"

#include "chem/error.h"

#include <cmath>

namespace chem {

EluentMix mix_lines(const SolventLibrary& solvents, const std::vector<LineShare>& shares) {
    double total = 0;
    for (const LineShare& s : shares) {
        if (!std::isfinite(s.percent) || s.percent < 0)
            throw Error("composition", format_number(s.percent) + " is not a percentage of the flow");
        total += s.percent;
    }
    if (std::abs(total - 100.0) > 0.01)
        throw Error("composition", "the lines add up to " + format_number(total) + " %, not 100 %");

    EluentMix out;
    std::map<std::string, double> solute_mmol; // per litre of unmixed volume
    std::map<std::string, std::string> solute_from;
    std::vector<std::string> order;
    for (const LineShare& s : shares) {
        if (s.percent <= 0)
            continue;
        if (!s.profile || !s.profile->described)
            throw Error("composition", "a line at " + format_number(s.percent) +
                                           " % has no parts, so its make-up is unknown");
        const double f = s.percent / 100.0;
        for (const auto& [id, frac] : s.profile->solvent_fraction_v)
            out.solvent_fraction_v[id] += f * frac;
        for (const Solute& so : s.profile->solutes) {
            if (!solute_mmol.count(so.reagent)) {
                order.push_back(so.reagent);
                solute_from[so.reagent] = so.from;
            } else if (solute_from[so.reagent] != so.from) {
                solute_from[so.reagent] = "buffer+additive";
            }
            solute_mmol[so.reagent] += f * so.mmol_per_l;
        }
    }

    // Mole fractions from each solvent's density and molar mass (per mL of unmixed volume).
    double n_total = 0;
    std::map<std::string, double> n;
    for (const auto& [id, frac] : out.solvent_fraction_v) {
        const Solvent& sv = solvents.solvent(id, "composition");
        n[id] = frac * sv.density_g_per_ml / sv.molar_mass_g_per_mol;
        n_total += n[id];
        const bool water = sv.aqueous;
        if (!water)
            out.organic_fraction_v += frac;
    }
    for (const auto& [id, moles] : n)
        out.mole_fraction[id] = n_total > 0 ? moles / n_total : 0;

    // Contraction: each organic with its share of the water (binary excess volumes).
    double water_fraction = 0;
    for (const auto& [id, frac] : out.solvent_fraction_v)
        if (solvents.solvent(id, "composition").aqueous)
            water_fraction += frac;
    if (out.organic_fraction_v > 0 && water_fraction > 0) {
        for (const auto& [id, frac] : out.solvent_fraction_v) {
            if (solvents.solvent(id, "composition").aqueous || frac <= 0)
                continue;
            const double water_share = water_fraction * frac / out.organic_fraction_v;
            // mixing_contraction_ml works in mL; fractions are mL per mL of unmixed volume.
            if (const auto c = mixing_contraction_ml(solvents, water_share, id, frac))
                out.contraction_fraction += *c;
        }
    }
    const double mixed = 1.0 - out.contraction_fraction;
    for (const std::string& id : order)
        out.solutes.push_back({id, solute_mmol[id] / mixed, solute_from[id]});
    return out;
}

} // namespace chem
