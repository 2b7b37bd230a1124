#pragma once
// The reagent library's types: acid-base systems, reagents, and the Library that holds them.
// Filled by app/core/library_loader from data/reagents.json; chem/ itself does no I/O.
#include "chem/activity.h"

#include <optional>
#include <string>
#include <vector>

namespace chem {

/// How a system's pKa values move in one water–organic mixture: s_s pKa − w_w pKa of each step
/// against the volume fraction of the organic (rows ascending, 25 °C). Used by chem/eluent.
struct OrganicShift {
    std::string organic;                   ///< solvent id: "acetonitrile", "methanol"
    std::vector<double> fraction_v;        ///< rows, ascending, in (0, 1]
    std::vector<std::vector<double>> dpka; ///< per row, one shift per step (pKa units)
    std::string source;
};

/// One organic solvent's data for the eluent-pH model: its permittivity, the shift of s_s pKw,
/// and δ = s_w pH − s_s pH as δ(φ) = Σ a_k φ^(k+1) / (1 + Σ b_k φ^(k+1)).
struct EluentSolvent {
    std::string organic;
    double permittivity_25c = 0;
    std::string permittivity_source;
    std::vector<double> fraction_v, dpkw; ///< s_s pKw − w_w pKw against φ, rows ascending
    std::string dpkw_source;
    std::vector<double> delta_numerator, delta_denominator;
    double delta_max_fraction_v = 0; ///< the published range of the δ equation
    std::string delta_source;
    double delta(double fraction_v) const;
};

/// One acid-base system (phosphate, acetate, tris, …): its species from the fully protonated form
/// down, the stepwise thermodynamic pKa values at 25 °C and their temperature dependence.
struct AcidBaseSystem {
    std::string id;   ///< "phosphate"
    std::string name; ///< "Phosphate (H3PO4 / H2PO4- / HPO4-2 / PO4-3)"
    std::vector<std::string>
        species; ///< fully protonated first: {"H3PO4","H2PO4-","HPO4-2","PO4-3"}
    int charge_fully_protonated = 0; ///< charge of species[0]: 0 for H3PO4, +1 for NH4+ or TrisH+
    /// Thermodynamic pKa of step i (species[i] -> species[i+1] + H+) at 25 °C, infinite dilution.
    std::vector<double> pka_25c;
    /// Standard reaction enthalpy of step i in kJ/mol (van 't Hoff temperature dependence).
    /// An empty optional means the step uses dpka_per_k instead.
    std::vector<std::optional<double>> enthalpy_kj_per_mol;
    /// Standard heat capacity of reaction of step i in J/(mol K); 0 when not published. With it
    /// the temperature dependence follows the integrated van 't Hoff equation at constant ΔrCp.
    std::vector<double> heat_capacity_j_per_mol_k;
    /// dpKa/dT of step i in 1/K, used where no enthalpy is given (0 when neither is published).
    std::vector<double> dpka_per_k;
    std::vector<std::string> sources;       ///< one citation per number, free text
    std::vector<OrganicShift> eluent_shift; ///< s_s pKa shifts in water–organic mixtures

    int steps() const { return static_cast<int>(pka_25c.size()); }
    int charge_of(int species_index) const { return charge_fully_protonated - species_index; }
    /// pKa of step i at temperature_k: integrated van 't Hoff with the step's ΔrH° and ΔrCp°
    /// (Clarke & Glew, Trans. Faraday Soc. 62 (1966) 539, truncated at ΔCp):
    /// pKa(T) = pKa(T0) + ΔH/(R ln10)·(1/T − 1/T0) − ΔCp/(R ln10)·(ln(T/T0) + T0/T − 1),
    /// T0 = 298.15 K; or linear in dpka_per_k where no enthalpy is given.
    double pka_at(int step, double temperature_k) const;
};

/// A spectator ion released by a reagent (takes no part in acid-base equilibria here).
struct SpectatorIon {
    std::string ion;  ///< "Na+", "Cl-"
    int charge = 0;   ///< +1, -1, …
    double count = 1; ///< per formula unit of the reagent
};

/// A reagent's share in one acid-base system.
struct SystemShare {
    std::string system; ///< AcidBaseSystem::id
    double count = 1;   ///< system units per formula unit (4 for Na2B4O7: 4 boron)
    /// Protons removed from the fully protonated form, per formula unit of the reagent, summed over
    /// its `count` units (Na2HPO4: 2; Na2B4O7·10H2O as 4 B(OH)3 less 2 H+: 2). Used to check the
    /// reagent's electroneutrality and to say which of two reagents is the more basic form.
    double protons_removed = 0;
};

enum class PhysicalForm { solid, liquid };

struct Reagent {
    std::string id;      ///< "disodium-hydrogen-phosphate-heptahydrate"
    std::string name;    ///< "Disodium hydrogen phosphate heptahydrate"
    std::string formula; ///< "Na2HPO4(H2O)7"
    double molar_mass_g_per_mol =
        0; ///< from the formula, IUPAC 2021 weights, hydrate water included
    PhysicalForm form = PhysicalForm::solid;
    /// Mass fraction of the named substance in the material as supplied: purity of a solid,
    /// assay (w/w) of a liquid such as 85 % phosphoric acid (0.85). 1 = pure.
    double assay_fraction = 1;
    double density_g_per_ml = 0;             ///< of the liquid as supplied (0 for solids)
    std::vector<std::string> ghs_hazards;    ///< "H314", "H290", … as supplied
    std::vector<std::string> ghs_pictograms; ///< "GHS05", …
    std::vector<SpectatorIon> spectators;
    std::vector<SystemShare> systems;
    std::vector<std::string> sources; ///< where the physical data and hazard codes come from
    bool user_defined = false;        ///< a lab's own entry, never overwritten by data/ updates

    bool has_system(const std::string& system_id) const;
    const SystemShare* share(const std::string& system_id) const;
    /// Sum of spectator charges plus system charges of the form as supplied: 0 for a valid reagent
    /// with an acid-base system; for one without, a negative sum is a strong acid's (the H+ it
    /// releases balances it), a positive sum a strong base's (OH-).
    /// @param lib gives each system's charge_fully_protonated.
    double formal_charge(const class Library& lib) const;
    /// Strong acid: releases only anions and brings no acid-base system (HCl).
    bool is_strong_acid() const;
    /// Strong base: releases only cations and brings no acid-base system (NaOH).
    bool is_strong_base() const;
    bool is_corrosive() const; ///< GHS05 or H314/H290/H318
    bool is_flammable() const; ///< GHS02 or H22x
    bool is_toxic() const;     ///< GHS06/GHS08 or H30x/H31x/H33x
};

/// The reagents and systems known to the program. Lookup by id; unknown ids throw chem::Error
/// naming the id and the nearest known ids.
class Library {
  public:
    void add_system(AcidBaseSystem system);
    /// Adds or replaces (by id) a reagent. Throws chem::Error when it names an unknown system,
    /// has a non-positive molar mass, or is not electroneutral.
    void add_reagent(Reagent reagent);

    const AcidBaseSystem& system(const std::string& id, const std::string& field = "system") const;
    const Reagent& reagent(const std::string& id, const std::string& field = "reagent") const;
    const Reagent* find_reagent(const std::string& id) const;
    const AcidBaseSystem* find_system(const std::string& id) const;

    const std::vector<AcidBaseSystem>& systems() const { return systems_; }
    const std::vector<Reagent>& reagents() const { return reagents_; }

    /// Adds or replaces an SIT interaction coefficient (a cation with an anion).
    void add_sit_epsilon(SitEpsilon e);
    /// ε(cation, anion) in kg/mol, 0 when none is recorded (the SIT model then keeps the
    /// Debye–Hückel term alone for that pair).
    double sit_epsilon(const std::string& cation, const std::string& anion) const;
    const std::vector<SitEpsilon>& sit_epsilons() const { return sit_; }
    /// Adds or replaces one ion's Truesdell–Jones size and b.
    void add_ion_size(IonSize s);
    /// The entry for `species`, nullptr when none is recorded (the model then uses
    /// default_ion_size_angstrom and b = 0).
    const IonSize* ion_size(const std::string& species) const;
    const std::vector<IonSize>& ion_sizes() const { return ion_sizes_; }
    /// Adds or replaces (by species) one associated species of the extended models. Throws
    /// chem::Error for no members, a count outside 1–4, a non-finite or huge log10 K, or Davies
    /// among its models.
    void add_complex(Complex c);
    const std::vector<Complex>& complexes() const { return complexes_; }
    void add_eluent_solvent(EluentSolvent e);
    const EluentSolvent* eluent_solvent(const std::string& organic) const;
    const std::vector<EluentSolvent>& eluent_solvents() const { return eluent_solvents_; }

    /// Up to `count` known reagent ids closest to `id` (edit distance), best first.
    std::vector<std::string> nearest_reagent_ids(const std::string& id, int count = 3) const;

  private:
    std::vector<AcidBaseSystem> systems_;
    std::vector<Reagent> reagents_;
    std::vector<SitEpsilon> sit_;
    std::vector<IonSize> ion_sizes_;
    std::vector<Complex> complexes_;
    std::vector<EluentSolvent> eluent_solvents_;
};

} // namespace chem
