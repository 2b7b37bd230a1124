#pragma once
// What leaves the mixer at one point of a gradient: the lines' profiles blended by the pump's
// percentages. Gives the volume fractions of water and of each organic solvent (as measured
// before mixing), the mole fractions, the estimated contraction on mixing, and every solute
// diluted into the blended volume. The eluent-pH model and the viscosity model both start here.
#include "chem/line.h"
#include "chem/solvent.h"

#include <map>
#include <string>
#include <vector>

namespace chem {

/// One line's share of the flow.
struct LineShare {
    const LineProfile* profile = nullptr;
    double percent = 0; ///< % of the flow (the gradient table's column for this line)
};

struct EluentMix {
    /// Solvent id → volume fraction, as measured before mixing (buffers count as water); sums to 1.
    std::map<std::string, double> solvent_fraction_v;
    /// Solvent id → mole fraction, from densities at their stated temperatures and molar masses.
    std::map<std::string, double> mole_fraction;
    double organic_fraction_v = 0; ///< everything that is not water, as measured before mixing
    /// Estimated volume lost on mixing, as a fraction of the unmixed volume (≥ 0 for a
    /// contraction). Binary Redlich–Kister excess volumes of each organic with the water present;
    /// with more than one organic, each pairs with the water in proportion (an approximation).
    double contraction_fraction = 0;
    /// Every solute of every line, in mmol per litre of the mixed eluent (after contraction).
    std::vector<Solute> solutes;
};

/// The solvents of a set of lines, prepared once so that many blends (every point of a gradient's
/// pressure trace) cost a few multiplications each. mix_lines() works through it too, so the
/// fractions, mole fractions and contraction have one implementation.
struct BlendBasis {
    struct Component {
        const Solvent* solvent = nullptr;
        double mol_per_ml = 0;                ///< density / molar mass, as measured before mixing
        const ExcessVolume* excess = nullptr; ///< V^E with water (organics only), or none
    };
    std::vector<Component> components;           ///< every solvent of every line, first seen first
    std::vector<std::vector<double>> fraction_v; ///< per line, per component (empty: undescribed)

    /// Index of the component with this solvent id, or −1.
    int index_of(const std::string& id) const;
};

/// The solvent side of a blend, in the order of BlendBasis::components.
struct SolventBlend {
    std::vector<double> fraction_v;    ///< as measured before mixing; sums to 1
    std::vector<double> mole_fraction; ///< sums to 1
    double organic_fraction_v = 0;
    double contraction_fraction = 0; ///< as in EluentMix
};

/// One entry per line (null or undescribed lines have no make-up; they may only run at 0 %).
BlendBasis blend_basis(const SolventLibrary& solvents,
                       const std::vector<const LineProfile*>& profiles);

/// The blend at `percent` per line (in the basis's line order, fractions of 100). No checks: the
/// caller has validated the percentages (mix_lines does; a validated method's rows are).
/// Undescribed lines count as absent. `out` is reused without reallocating.
void blend(const BlendBasis& basis, const double* percent, SolventBlend& out);

/// Estimated volume lost on mixing, as a fraction of the unmixed volume, for a blend given as
/// (solvent, volume fraction of the unmixed volume) pairs: each organic with its share of the
/// water, by the binary Redlich–Kister excess volumes (mixing_contraction_ml).
double contraction_fraction(const SolventLibrary& solvents,
                            const std::vector<std::pair<const Solvent*, double>>& fractions);

/// Blends the lines. Percentages must be finite, ≥ 0 and sum to 100 ± 0.01; each share's profile
/// must be described (have parts). Throws chem::Error("composition", …) otherwise, naming the
/// value. Lines at 0 % are skipped.
EluentMix mix_lines(const SolventLibrary& solvents, const std::vector<LineShare>& shares);

} // namespace chem
