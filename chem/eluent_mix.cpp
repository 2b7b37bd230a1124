#include "chem/eluent_mix.h"

#include "chem/error.h"

#include <cmath>

namespace chem {

int BlendBasis::index_of(const std::string& id) const {
    for (std::size_t i = 0; i < components.size(); ++i)
        if (components[i].solvent->id == id)
            return static_cast<int>(i);
    return -1;
}

BlendBasis blend_basis(const SolventLibrary& solvents,
                       const std::vector<const LineProfile*>& profiles) {
    BlendBasis b;
    for (const LineProfile* p : profiles) {
        if (!p || !p->described)
            continue;
        for (const auto& [id, frac] : p->solvent_fraction_v) {
            (void)frac;
            if (b.index_of(id) >= 0)
                continue;
            BlendBasis::Component c;
            c.solvent = &solvents.solvent(id, "composition");
            c.mol_per_ml = c.solvent->density_g_per_ml / c.solvent->molar_mass_g_per_mol;
            if (!c.solvent->aqueous)
                c.excess = solvents.excess_volume("water", id);
            b.components.push_back(c);
        }
    }
    for (const LineProfile* p : profiles) {
        std::vector<double> f;
        if (p && p->described) {
            f.assign(b.components.size(), 0.0);
            for (const auto& [id, frac] : p->solvent_fraction_v)
                f[b.index_of(id)] = frac;
        }
        b.fraction_v.push_back(std::move(f));
    }
    return b;
}

void blend(const BlendBasis& basis, const double* percent, SolventBlend& out) {
    const std::size_t n = basis.components.size();
    out.fraction_v.assign(n, 0.0);
    out.mole_fraction.assign(n, 0.0);
    for (std::size_t l = 0; l < basis.fraction_v.size(); ++l) {
        const auto& f = basis.fraction_v[l];
        if (f.empty() || percent[l] <= 0)
            continue;
        const double share = percent[l] / 100.0;
        for (std::size_t i = 0; i < n; ++i)
            out.fraction_v[i] += share * f[i];
    }
    // Mole fractions from each solvent's density and molar mass (per mL of unmixed volume).
    double n_total = 0, water_fraction = 0, water_mol = 0;
    out.organic_fraction_v = 0;
    for (std::size_t i = 0; i < n; ++i) {
        const double moles = out.fraction_v[i] * basis.components[i].mol_per_ml;
        out.mole_fraction[i] = moles;
        n_total += moles;
        if (basis.components[i].solvent->aqueous) {
            water_fraction += out.fraction_v[i];
            water_mol += moles;
        } else {
            out.organic_fraction_v += out.fraction_v[i];
        }
    }
    for (double& x : out.mole_fraction)
        x = n_total > 0 ? x / n_total : 0;
    // Contraction: each organic with its share of the water (binary excess volumes).
    out.contraction_fraction = 0;
    if (out.organic_fraction_v <= 0 || water_fraction <= 0)
        return;
    for (std::size_t i = 0; i < n; ++i) {
        const auto& c = basis.components[i];
        if (!c.excess || out.fraction_v[i] <= 0)
            continue;
        const double water_share_mol = water_mol * out.fraction_v[i] / out.organic_fraction_v;
        // Fractions are mL per mL of unmixed volume, so the contraction is a fraction too.
        out.contraction_fraction +=
            c.excess->contraction_ml(water_share_mol, out.fraction_v[i] * c.mol_per_ml);
    }
}

double contraction_fraction(const SolventLibrary& solvents,
                            const std::vector<std::pair<const Solvent*, double>>& fractions) {
    double water = 0, organic = 0;
    for (const auto& [sv, frac] : fractions)
        (sv->aqueous ? water : organic) += frac;
    if (organic <= 0 || water <= 0)
        return 0;
    double c = 0;
    for (const auto& [sv, frac] : fractions) {
        if (sv->aqueous || frac <= 0)
            continue;
        // Each organic with its share of the water; mixing_contraction_ml works in mL and the
        // fractions are mL per mL of unmixed volume.
        if (const auto ml = mixing_contraction_ml(solvents, water * frac / organic, sv->id, frac))
            c += *ml;
    }
    return c;
}

EluentMix mix_lines(const SolventLibrary& solvents, const std::vector<LineShare>& shares) {
    double total = 0;
    for (const LineShare& s : shares) {
        if (!std::isfinite(s.percent) || s.percent < 0)
            throw Error("composition",
                        format_number(s.percent) + " is not a percentage of the flow");
        total += s.percent;
    }
    if (std::abs(total - 100.0) > 0.01)
        throw Error("composition", "the lines add up to " + format_number(total) + " %, not 100 %");

    EluentMix out;
    std::map<std::string, double> solute_mmol; // per litre of unmixed volume
    std::map<std::string, SoluteSource> solute_from;
    std::vector<std::string> order;
    std::vector<const LineProfile*> profiles;
    std::vector<double> percent;
    for (const LineShare& s : shares) {
        if (s.percent <= 0)
            continue;
        if (!s.profile || !s.profile->described)
            throw Error("composition", "a line at " + format_number(s.percent) +
                                           " % has no parts, so its make-up is unknown");
        profiles.push_back(s.profile);
        percent.push_back(s.percent);
        const double f = s.percent / 100.0;
        for (const Solute& so : s.profile->solutes) {
            if (!solute_mmol.count(so.reagent)) {
                order.push_back(so.reagent);
                solute_from[so.reagent] = so.from;
            } else {
                solute_from[so.reagent] = combined(solute_from[so.reagent], so.from);
            }
            solute_mmol[so.reagent] += f * so.mmol_per_l;
        }
    }

    const BlendBasis basis = blend_basis(solvents, profiles);
    SolventBlend b;
    blend(basis, percent.data(), b);
    for (std::size_t i = 0; i < basis.components.size(); ++i) {
        const std::string& id = basis.components[i].solvent->id;
        out.solvent_fraction_v[id] = b.fraction_v[i];
        out.mole_fraction[id] = b.mole_fraction[i];
    }
    out.organic_fraction_v = b.organic_fraction_v;
    out.contraction_fraction = b.contraction_fraction;

    const double mixed = 1.0 - out.contraction_fraction;
    for (const std::string& id : order)
        out.solutes.push_back({id, solute_mmol[id] / mixed, solute_from[id]});
    return out;
}

} // namespace chem
