#pragma once
// Internals of the speciation solver, shared with the recipe designer (which re-solves one
// mixture many times with different amounts). Not part of the public contract.
#include "chem/equilibrium.h"

#include <array>
#include <string>
#include <vector>

namespace chem::detail {

inline constexpr int max_steps = 4; ///< pKa steps per system supported by the fixed arrays

struct Problem {
    double temperature_k = 298.15;
    double kw = 1e-14; ///< thermodynamic ion product of water at T
    double a_dh = 0.5; ///< molar Debye–Hückel A at T, (L/mol)^1/2 (Davies)
    ActivityModel model = ActivityModel::davies;
    double a_molal = 0.5; ///< molal Debye–Hückel A at T, (kg/mol)^1/2 (SIT, Truesdell–Jones)
    double b_molal = 0.33; ///< molal Debye–Hückel B at T, Å⁻¹ (kg/mol)^1/2 (Truesdell–Jones)
    /// kg of solvent per litre of solution, m = c / kg_per_l; the solutes' own volume is
    /// neglected (about 2 % in m at 1 mol/L NaCl).
    double kg_per_l = 1.0;

    struct System {
        const AcidBaseSystem* def = nullptr;
        int steps = 0;
        int z0 = 0;                         ///< charge of the fully protonated species
        std::array<double, max_steps> ka{}; ///< thermodynamic Ka of each step at T
        double total_mol_per_l = 0;
    };
    struct Ion {
        std::string name;
        int charge = 0;
        double total_mol_per_l = 0;
    };
    std::vector<System> systems;
    std::vector<Ion> ions;

    /// How each component feeds the totals: (index, units per formula unit).
    struct Feed {
        std::vector<std::pair<int, double>> systems;
        std::vector<std::pair<int, double>> ions;
    };
    std::vector<Feed> feeds;

    /// Every charged or neutral species in one flat list for per-species activity coefficients:
    /// each system's species in order (from sys_offset[i]), then the spectator ions, then H+ and
    /// OH-. flat_charge gives each one's charge; sit_eps the ε(k, l) matrix (n_flat²), zero but
    /// for a cation with an anion that has a recorded value.
    std::vector<int> sys_offset;
    int ion_offset = 0, h_index = 0, oh_index = 0, n_flat = 0;
    std::vector<int> flat_charge;
    std::vector<double> sit_eps;
    /// Truesdell–Jones: each flat species' size å (Å) and b (kg/mol); and chloride's, which
    /// sets the convention term.
    std::vector<double> tj_size, tj_b;
    double tj_chloride_size = 3.0, tj_chloride_b = 0.0;
    /// The associated species of this model (chem::Complex) whose members are all flat species:
    /// the members' flat indices and counts, K° (molal, I = 0) and the complex's charge.
    struct Assoc {
        int n = 0;
        std::array<int, 4> member{};
        std::array<int, 4> count{};
        double k = 0;
        int charge = 0;
    };
    std::vector<Assoc> complexes;
    /// Fills the flat layout and (for SIT) the ε matrix, (for Truesdell–Jones) the sizes, from
    /// the library.
    void index_species(const Library& lib);

    /// Recomputes the totals from the components' amounts (mol/L, one per component).
    void set_amounts(const std::vector<double>& mol_per_l);
};

/// Builds the problem for these components at temperature_c; validates amounts and temperature
/// (chem::Error on "components[i].mol_per_l" / "temperature_c").
Problem build_problem(const Library& lib, const std::vector<Component>& components,
                      double temperature_c, ActivityModel model = ActivityModel::davies);

struct State {
    double ph = 7;
    double ionic_strength_mol_per_l = 0;
    int iterations = 0; ///< pH solves used (each at fixed activity coefficients)
};

/// Solves charge balance and ionic strength self-consistently, starting from `guess` when given
/// (a nearby solution: the recipe searches re-solve with slightly changed amounts).
/// Throws chem::Error("components", …) if the iteration does not converge (never returns NaN).
State solve_state(const Problem& p, const State* guess = nullptr);

/// The same from a neighbouring solution `guess` (the next point of a gradient trace): one loop
/// of Newton steps in pH with I carried along, for Davies; SIT, or a pass that fails, goes to
/// solve_state. Agrees with solve_state within 1e-9 pH.
State solve_state_near(const Problem& p, const State& guess);

/// Full report: species, β, warnings.
Speciation report(const Problem& p, const State& s);

/// Activity coefficients of every flat species (Problem::index_species) at a solved state.
std::vector<double> gammas_at(const Problem& p, const State& s);

} // namespace chem::detail
