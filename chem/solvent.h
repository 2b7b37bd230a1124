#pragma once
// The solvent and additive library: neat solvents with their physical data and hazards, the
// miscibility table, mobile-phase additives (UV cutoff at a concentration, MS volatility, salt
// solubility in water–organic mixtures), excess volumes of mixing and default shelf lives.
// Filled by app/core/solvent_data from data/solvents.json; chem/ itself does no I/O. Every number
// in that file carries its source beside it.
#include <map>
#include <optional>
#include <string>
#include <utility>
#include <vector>

namespace chem {

enum class Miscibility { miscible, partly, immiscible };

/// One row of a published absorbance-against-wavelength table of a solvent grade (1 cm path
/// against water). The published figures are a grade's maximum absorbance (its specification), so
/// the absorbance they give is an upper bound for a bottle of that grade.
struct UvAbsorbancePoint {
    double wavelength_nm = 0;
    double absorbance = 0; ///< 1 cm path against water, > 0
};
const char* miscibility_name(Miscibility m);

struct Solvent {
    std::string id;                  ///< "acetonitrile"
    std::string name;                ///< "Acetonitrile"
    std::string formula;             ///< "C2H3N"
    bool aqueous = false;            ///< water (the only aqueous solvent here)
    double molar_mass_g_per_mol = 0; ///< from the formula, IUPAC 2021 weights
    double density_g_per_ml = 0;     ///< at density_temperature_c
    double density_temperature_c = 20;
    /// Cubical expansion coefficient α in 1/K near density_temperature_c (0: none recorded).
    double expansion_per_k = 0;
    /// Water's density comes from Tanaka et al. (2001) at any temperature rather than α.
    bool density_from_water_model = false;
    double viscosity_mpa_s = 0; ///< at viscosity_temperature_c
    double viscosity_temperature_c = 25;
    double uv_cutoff_nm = 0; ///< 1 cm path against water, absorbance 1
    /// Published absorbance against wavelength, ascending in wavelength; empty where none was
    /// found (the absorbance then follows the cutoff model, see chem::uv_part_absorbance).
    std::vector<UvAbsorbancePoint> uv_absorbance;
    double boiling_point_c = 0;              ///< at 101.325 kPa
    std::optional<double> flash_point_c;     ///< closed cup; none for water and dichloromethane
    std::vector<std::string> ghs_hazards;    ///< "H225", …
    std::vector<std::string> ghs_pictograms; ///< "GHS02", …
    /// Citation per quantity: keys "density", "viscosity", "uv_cutoff", "boiling_point",
    /// "flash_point", "ghs", and "uv_absorbance" with a table.
    std::map<std::string, std::string> sources;
    std::string note;

    bool is_flammable() const; ///< H224–H226 or GHS02
    /// Density in g/mL at temperature_c: Tanaka et al. (2001) for water, else
    /// ρ(T) = ρ(T0)·(1 − α (T − T0)) with the recorded α (ρ(T0) when none is recorded).
    double density_at(double temperature_c) const;
};

/// How an additive's amount is stated: % v/v of the liquid as supplied, % w/v (g per 100 mL) of
/// the material as supplied, or mmol of formula units per litre of the finished line.
enum class AmountUnit { percent_v, percent_w, mmol_per_l };
const char* amount_unit_name(AmountUnit u);

struct UvPoint {
    double amount = 0; ///< in the table's unit
    double cutoff_nm = 0;
    std::string source;
};

/// The UV cutoff of an additive against its concentration, ascending in amount.
struct UvTable {
    AmountUnit unit = AmountUnit::mmol_per_l;
    std::vector<UvPoint> points;

    struct Lookup {
        double cutoff_nm = 0;
        const UvPoint* point = nullptr; ///< the row used
        bool beyond_table = false;      ///< amount above the last row: the cutoff is at least this
    };
    /// Conservative step rule: the cutoff of the smallest tabulated amount at or above `amount`
    /// (cutoffs rise with concentration, so this never understates); above the table, the last
    /// row's cutoff flagged beyond_table. No interpolation: the tables are coarse.
    Lookup at(double amount) const;
};

struct Additive {
    std::string id;           ///< the reagent id where one exists ("formic-acid")
    bool ms_volatile = false; ///< suitable for a mass spectrometer (and ELSD/CAD)
    std::string volatility_source;
    std::optional<UvTable> uv; ///< absent: no cutoff figure recorded
    std::string
        solubility_group;     ///< key into the solubility tables ("potassium-phosphate"), "" none
    bool short_lived = false; ///< loses a component from solution within a day (NH4HCO3)
    /// A caution for mass spectrometry beyond volatility (triethylamine's lasting background).
    std::string ms_caution;
    std::string ms_caution_source;
    std::string note;
};

/// Highest concentration of a salt group in a water–organic mixture, against the volume fraction
/// of the organic. basis "published" or "rule-of-thumb".
///
/// Two kinds of table share the type:
///   - a group table (form empty): the limit of the group's total, whatever the pH;
///   - a form table (form set): the limit of one species form of an acid–base system in that
///     group ("potassium-phosphate" as the "hydrogen-phosphate", HPO4²⁻, protons_removed 2). The
///     precipitation check splits the group's total into the forms at the eluent's pH and adds
///     c_form / limit_form over the forms (chem::salt_loads). A group with form tables is checked
///     by them; its group table, if any, is then not used.
struct SolubilityTable {
    std::string group;   ///< "potassium-phosphate"
    std::string organic; ///< solvent id: "acetonitrile"
    std::string basis;   ///< "published" | "rule-of-thumb"
    std::string source;
    std::vector<std::pair<double, double>> points; ///< (organic fraction_v, max mmol/L), ascending
    std::string form;   ///< "" a group table; else the form's words id ("hydrogen-phosphate")
    std::string system; ///< a form table's acid–base system id ("phosphate")
    /// A form table's species of `system`: the protons removed from the fully protonated acid
    /// (H2PO4⁻ 1, HPO4²⁻ 2, PO4³⁻ 3), as reagents' "protons_removed"; ≥ 1 (the neutral acid is
    /// not a salt and has no table).
    int protons_removed = 0;

    /// Linear between rows, above the last row the last row's value, in mmol/L. Below the first
    /// row the table says nothing (nullopt): each table starts at the organic fraction where its
    /// data or rule of thumb starts, and is not stretched below it.
    std::optional<double> limit_mmol_per_l(double organic_fraction_v) const;
};

/// What a solution's shelf life depends on (profile_line picks the kind): water with buffer salts
/// grows microbes and takes up CO2, a short-lived component (ammonia, bicarbonate) escapes,
/// organic solvents evaporate and take up water. The one vocabulary of shelf lives: lines,
/// batches, checks and sheets.
enum class ShelfKind {
    water,                   ///< water alone
    aqueous_buffer,          ///< aqueous buffer with under 10 % organic
    aqueous_buffer_volatile, ///< aqueous buffer with a short-lived component
    buffer_with_organic,     ///< buffer with 10 % organic or more
    aqueous_additive,        ///< water with an acid or base modifier only
    organic_additive,        ///< organic solvent(s) with a modifier
    solvent_mixture,         ///< premixed solvents without additives
    neat_solvent,            ///< one neat organic solvent
};
/// "water", "aqueous-buffer", "aqueous-buffer-volatile", "buffer-with-organic",
/// "aqueous-additive", "organic-additive", "solvent-mixture", "neat-solvent": the words of
/// data/solvents.json "shelf_life", the contract and the checks.
const char* shelf_kind_name(ShelfKind kind);
/// The inverse of shelf_kind_name; std::nullopt for anything else.
std::optional<ShelfKind> shelf_kind_from_name(const std::string& name);
const std::vector<ShelfKind>& shelf_kinds(); ///< every kind, in the order above
/// The kind in words for a printed sheet: "an aqueous buffer", "a neat solvent", …
const char* shelf_kind_words(ShelfKind kind);
/// Built-in shelf life in hours, used when the solvent library has no entry for the kind; the
/// same figures as the shipped data/solvents.json. Common practice, no source: an aqueous buffer
/// is remade after two days (microbial growth, CO2 uptake shift the pH), one with a short-lived
/// component after one, a premixed aqueous-organic phase after three, a neat solvent after a
/// month.
double builtin_shelf_life_h(ShelfKind kind);

/// Default shelf life for a kind of solution (a lab-set default, common practice).
struct ShelfLife {
    ShelfKind kind = ShelfKind::aqueous_buffer;
    double hours = 0;
    std::string source;
    std::string description;
};

/// Excess molar volume of a binary water + organic mixture, Redlich–Kister form:
/// V^E(x) = x(1−x) Σ_k A_k (2x−1)^k in cm³/mol, x = mole fraction of the organic.
struct ExcessVolume {
    std::string aqueous = "water";
    std::string organic; ///< "methanol"
    double temperature_c = 25;
    std::vector<double> rk_cm3_per_mol; ///< A_0, A_1, …
    std::string source;

    double at(double x_organic) const; ///< cm³/mol
    /// Volume lost on mixing n_water_mol with n_organic_mol, in mL (≥ 0 for a contraction):
    /// ΔV = −(n_w + n_o) · V^E(x_o).
    double contraction_ml(double n_water_mol, double n_organic_mol) const;
};

class SolventLibrary {
  public:
    /// Adds or replaces (by id). Throws chem::Error for a non-positive density or molar mass.
    void add_solvent(Solvent s);
    void set_miscibility(const std::string& a, const std::string& b, Miscibility m);
    void add_additive(Additive a);
    /// Replaces the table of the same group, organic and form. Throws chem::Error naming the
    /// field: "points" (a fraction twice), "system" (a form without one, or a group whose forms
    /// name two systems), "protons_removed" (a form's below 1), "form" (a system without a form).
    void add_solubility(SolubilityTable t);
    void add_shelf_life(ShelfLife s);
    void add_excess_volume(ExcessVolume e);
    /// Throws chem::Error("miscibility", …) naming a pair of known solvents without an entry.
    void check_complete() const;

    /// Throws chem::Error(field, "unknown solvent \"x\" (nearest: …)").
    const Solvent& solvent(const std::string& id, const std::string& field = "solvent") const;
    const Solvent* find_solvent(const std::string& id) const;
    const Additive* find_additive(const std::string& id) const;
    /// Miscible for a solvent with itself; nullopt for an unknown pair.
    std::optional<Miscibility> miscibility(const std::string& a, const std::string& b) const;
    /// The group table (form "") of a group in an organic, or none.
    const SolubilityTable* solubility(const std::string& group, const std::string& organic) const;
    /// A form table of a group in an organic, or none.
    const SolubilityTable* solubility_form(const std::string& group, const std::string& organic,
                                           const std::string& form) const;
    /// Every table of a group (group and form tables).
    std::vector<const SolubilityTable*> solubility_tables(const std::string& group) const;
    /// The form tables of a group only (empty: the group is checked by its group tables).
    std::vector<const SolubilityTable*> solubility_form_tables(const std::string& group) const;
    const ShelfLife* shelf_life(ShelfKind kind) const;
    /// The library's hours for the kind, else builtin_shelf_life_h. `source` receives the
    /// entry's source, or that the figure is the built-in default.
    double shelf_life_h(ShelfKind kind, std::string* source = nullptr) const;
    const ExcessVolume* excess_volume(const std::string& aqueous, const std::string& organic) const;
    std::vector<std::string> nearest_solvent_ids(const std::string& id, int count = 3) const;

    const std::vector<Solvent>& solvents() const { return solvents_; }
    const std::vector<Additive>& additives() const { return additives_; }
    const std::vector<ShelfLife>& shelf_lives() const { return shelf_; }
    const std::vector<SolubilityTable>& solubility_tables() const { return solubility_; }
    const std::vector<ExcessVolume>& excess_volumes() const { return excess_; }
    const std::string& miscibility_source() const { return miscibility_source_; }
    void set_miscibility_source(std::string s) { miscibility_source_ = std::move(s); }

  private:
    std::vector<Solvent> solvents_;
    std::map<std::pair<std::string, std::string>, Miscibility> miscibility_;
    std::vector<Additive> additives_;
    std::vector<SolubilityTable> solubility_;
    std::vector<ShelfLife> shelf_;
    std::vector<ExcessVolume> excess_;
    std::string miscibility_source_;
};

} // namespace chem
