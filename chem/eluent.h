#pragma once
// The mobile phase as the column sees it: the lines blended by the pump (chem/eluent_mix), the
// pKa values moved by the organic solvent and taken at the column's temperature, and the pH of
// the water–organic eluent on the three scales of the Rosés–Bosch framework:
//   w_w pH  the aqueous part alone (measured and referred to water),
//   s_s pH  in the mixture, referred to the mixture (what sets the ionisation of the analytes),
//   s_w pH  in the mixture, read with an electrode calibrated in water: s_w pH = s_s pH + δ.
// Published parameters exist for water–acetonitrile and water–methanol up to about 60 % and 80 %
// organic; anything else is estimated and flagged with the warning "eluent-ph-extrapolated".
#include "chem/activity.h"
#include "chem/eluent_mix.h"
#include "chem/equilibrium.h"
#include "chem/equilibrium_detail.h"
#include "chem/line.h"
#include "chem/solvent.h"

#include <array>
#include <memory>
#include <optional>
#include <string>
#include <vector>

namespace chem {

/// One pKa step in the eluent.
struct EluentPka {
    std::string system; ///< system id
    int step = 1;       ///< 1-based
    double w_w = 0;     ///< thermodynamic pKa in water at the eluent temperature
    double s_s = 0;     ///< thermodynamic pKa in the mixture (s_s scale) at that temperature
    double s_s_conditional = 0; ///< s_s pKa′ at the eluent's ionic strength
    bool estimated = false;     ///< no published shift for this system, mixture or fraction
};

/// The eluent at one composition (one point of a gradient).
struct EluentResult {
    EluentMix mix; ///< volume and mole fractions, contraction, diluted solutes
    double temperature_c = 25;
    ActivityModel activity_model = ActivityModel::davies;
    double organic_fraction_v = 0; ///< as measured before mixing
    std::optional<double> ph_w_w;  ///< the aqueous part alone at temperature_c (none: no water)
    double ph_s_s = 7;
    double ph_s_w = 7;
    double delta = 0;                     ///< s_w pH − s_s pH
    double ionic_strength_mol_per_l = 0;  ///< in the eluent
    double buffer_capacity_mol_per_l = 0; ///< in the eluent, per s_s pH unit
    double permittivity = 78.4;           ///< relative permittivity of the solvent mixture
    double solvent_density_g_per_ml = 1;  ///< of the solvent mixture at temperature_c
    std::vector<EluentPka> pka;
    std::vector<Warning> warnings; ///< eluent-ph-extrapolated, eluent-temperature, solver's
};

/// The pH of one gradient point, for traces and checks (no strings, no allocation per call).
struct EluentPoint {
    double organic_fraction_v = 0;
    double ph_s_s = 7;
    double ph_s_w = 7;
    double ionic_strength_mol_per_l = 0;
    /// Distance from ph_s_s to the nearest s_s pKa′ of the systems present (infinite without
    /// any), and that pKa′ with its system's index into EluentModel::systems().
    double nearest_pka_gap = 0;
    double nearest_pka = 0;
    int nearest_system = -1;
    bool extrapolated = false;
};

namespace detail {
/// 1/ε at the last two rows of a pKa-shift table in its organic (at 25 °C), for the
/// extrapolation past the table; fixed per table, so EluentModel works it out once.
struct ShiftEnds {
    double inv0 = 0, inv1 = 0;
};
} // namespace detail

/// The eluents that a set of lines can make, at one temperature. Built once per set of lines
/// (it gathers the solutes and the published tables), then evaluated at any pump composition.
class EluentModel {
  public:
    /// @param profiles one per line (index = line), null or undescribed for a line without parts.
    /// Throws chem::Error("temperature_c", …) outside 0–60 °C.
    EluentModel(const SolventLibrary& solvents, const Library& reagents,
                const std::vector<const LineProfile*>& profiles, double temperature_c,
                ActivityModel model = ActivityModel::davies);
    ~EluentModel();
    EluentModel(const EluentModel&) = delete;
    EluentModel& operator=(const EluentModel&) = delete;

    /// The full result at `percent` (one per line, summing to 100 ± 0.01; errors name
    /// "composition"). Also solves the aqueous part alone for ph_w_w.
    EluentResult solve(const std::vector<double>& percent) const;

    /// The pH only, starting from `guess` (a nearby point) when given. Reuses scratch space:
    /// one EluentModel serves one thread at a time.
    EluentPoint point(const std::vector<double>& percent, const EluentPoint* guess = nullptr) const;
    /// The same for `count` percentages at `percent` (no allocation).
    EluentPoint point(const double* percent, std::size_t count,
                      const EluentPoint* guess = nullptr) const;

    /// The pH as point() gives it, and each system's species fractions there into `fractions`
    /// (index as systems(); per system, index = protons removed, summing to 1; empty for a system
    /// absent at this composition), from the s_s pKa′ at the solved ionic strength. For the
    /// precipitation check's speciation: as cheap as point(), unlike solve().
    EluentPoint point_species(const double* percent, std::size_t count,
                              std::vector<std::vector<double>>& fractions,
                              const EluentPoint* guess = nullptr) const;

    /// point() that also writes each step's s_s pKa′ at the solved point into
    /// `pka_conditional` (step_count() values, by system as systems() and step; NaN for a
    /// system absent at this composition), for species_fractions() later.
    EluentPoint point(const double* percent, std::size_t count, const EluentPoint* guess,
                      double* pka_conditional) const;
    /// The acid–base steps of all systems (the length of point()'s pka_conditional).
    int step_count() const;
    /// point_species()'s fractions from a point and the pKa′ that point() wrote for it.
    void species_fractions(const EluentPoint& point, const double* pka_conditional,
                           std::vector<std::vector<double>>& fractions) const;

    /// Organic volume fraction of a composition (before mixing).
    double organic_fraction_v(const double* percent, std::size_t count) const;

    const std::vector<const AcidBaseSystem*>& systems() const { return system_defs_; }
    bool has_systems() const { return !system_defs_.empty(); }

  private:
    struct Prepared; // per-point inputs of the solver
    void prepare(const double* percent, std::size_t count, Prepared& out) const;
    /// A step with a borrowed (estimated) shift within relevant_pka_gap of the pH.
    bool estimate_matters(const Prepared& pr, double ph_s_s) const;
    static constexpr double relevant_pka_gap = 2.5; ///< pH units: farther steps hardly take part

    /// A solvent of a line, resolved once: its share of the line and what the model needs of it.
    struct LineSolvent {
        const Solvent* solvent = nullptr;
        double fraction_v = 0;
        int basis = 0;          ///< 0 acetonitrile, 1 methanol
        bool estimated = false; ///< neither of the two published organics
        double permittivity = 0;
        double density_g_per_ml = 0; ///< at the model's temperature
    };
    /// One step's shift table in one organic (or the analogue's), resolved once.
    struct StepShift {
        const std::vector<double>* fraction_v = nullptr;
        std::vector<double> dpka;
        bool estimated = false;
        detail::ShiftEnds ends; ///< 1/ε at the table's last two rows, in its organic
        int rows = -1;          ///< index into table_rows_ (its fraction_v rows), −1 without
    };
    /// The distinct organic-fraction rows of the shift tables (ΔpKw's and the steps'), each
    /// with its organic: the tables of one organic share their rows, so prepare() finds the
    /// row pair around a point once per distinct set of rows, not once per table.
    struct TableRows {
        const std::vector<double>* fraction_v = nullptr;
        int basis = 0;
    };
    std::vector<TableRows> table_rows_;
    std::array<int, 2> dpkw_rows_{-1, -1}; ///< each organic's ΔpKw table's index in table_rows_
    int rows_of(const std::vector<double>& fraction_v, int basis);
    /// Each organic's mixing contraction with water, resolved once (mixing_contraction_ml's
    /// lookups by name cost as much as the rest of a point's blend).
    struct OrganicExcess {
        const Solvent* solvent = nullptr;
        const ExcessVolume* excess = nullptr; ///< none: no contraction recorded
        double mol_per_ml = 0;                ///< library density / molar mass
    };
    std::vector<OrganicExcess> organic_excess_;
    double water_mol_per_ml_ = 0; ///< the same for water (0: no water in the library)
    double contraction_of(const std::vector<std::pair<const Solvent*, double>>& fractions) const;
    std::vector<std::vector<LineSolvent>> line_solvents_;
    std::vector<StepShift> step_shifts_; ///< [(system, step) flat][basis]
    std::vector<int> step_offset_;       ///< first flat (system, step) of each system
    std::array<const EluentSolvent*, 2> basis_data_{};
    std::array<detail::ShiftEnds, 2> dpkw_ends_{}; ///< the same for each organic's ΔpKw table
    mutable detail::Problem scratch_;
    std::unique_ptr<Prepared> prepared_;

    const SolventLibrary& solvents_;
    const Library& reagents_;
    std::vector<const LineProfile*> profiles_;
    double temperature_c_ = 25;
    double temperature_k_ = 298.15;
    ActivityModel model_ = ActivityModel::davies;
    std::vector<Component> components_;               ///< every solute of every line
    std::vector<std::vector<double>> line_mol_per_l_; ///< [line][component], in the line
    detail::Problem problem_; ///< built once; amounts and constants set per point
    bool has_components_ = false;
    std::vector<const AcidBaseSystem*> system_defs_; ///< problem_.systems in order
    std::vector<std::vector<double>> pka_w_w_;       ///< [system][step] at T
};

/// Convenience: blends the lines at `percent` and solves the eluent (the `eluent` command).
EluentResult solve_eluent(const SolventLibrary& solvents, const Library& reagents,
                          const std::vector<const LineProfile*>& profiles,
                          const std::vector<double>& percent, double temperature_c,
                          ActivityModel model = ActivityModel::davies);

} // namespace chem
