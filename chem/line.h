#pragma once
// Line recipes: a mobile-phase line (A–D) is a mixture of an aqueous buffer from the recipe
// designer and/or neat solvents by volume fraction, plus additives (% v/v, % w/v, mmol/L).
// profile_line() works out what the checks need (composition, UV cutoff, pH, volatility, shelf-life
// kind); prepare_line() gives the amounts for a bottle: each part measured separately before
// combining, and the gravimetric alternative from densities.
#include "chem/recipe.h"
#include "chem/solvent.h"

#include <map>
#include <optional>
#include <string>
#include <vector>

namespace chem {

struct LinePart {
    std::string solvent;          ///< solvent id; empty for a buffer part
    std::optional<Recipe> buffer; ///< an aqueous buffer designed by design_recipe()
    double fraction_v = 0;        ///< volume fraction of the line, measured separately
};

struct LineAdditive {
    std::string additive; ///< additive id (= reagent id)
    AmountUnit unit = AmountUnit::percent_v;
    double amount = 0; ///< in `unit`, relative to the finished line
};

struct LineSpec {
    std::string field; ///< JSON path of the line for errors ("lines.A")
    std::string name;
    std::vector<LinePart> parts;
    std::vector<LineAdditive> additives;
    std::optional<double> shelf_life_h; ///< a lab's override of the default for the line's kind
    double temperature_c = 20;          ///< where the parts are measured: densities are taken at it
    ActivityModel activity_model = ActivityModel::davies; ///< for the pH of aqueous additives
};

/// Where a dissolved reagent comes from: a buffer part, an additive, or both.
enum class SoluteSource { buffer, additive, buffer_and_additive };
const char* solute_source_name(SoluteSource from); ///< "buffer", "additive", "buffer+additive"
/// The source of a reagent that comes from both `a` and `b`: a when they agree, else both.
inline SoluteSource combined(SoluteSource a, SoluteSource b) {
    return a == b ? a : SoluteSource::buffer_and_additive;
}

/// A dissolved reagent in the finished line.
struct Solute {
    std::string reagent;   ///< reagent id
    double mmol_per_l = 0; ///< formula units per litre of the finished line
    SoluteSource from = SoluteSource::buffer;
};

/// Where a pH comes from.
enum class PhBasis {
    none,                  ///< no pH (no aqueous part with solutes)
    buffer_design,         ///< the one buffer part's designed pH
    several_buffers,       ///< more than one buffer part: no pH predicted
    solved_from_additives, ///< the additives solved in water at 25 °C (no buffer, no organic)
    eluent_s_w,            ///< the mixed eluent's pH on the s_w scale (a method's trace)
};
/// "", "buffer design", "several buffers: pH not predicted", "solved from the additives in water
/// at 25 °C", "eluent s_w pH": the words of the contract and the checks.
const char* ph_basis_name(PhBasis basis);

/// One absorbing part of a line: its own cutoff (absorbance 1 in 1 cm), how many times its
/// absorbance it brings (a solvent's volume fraction; a solute's concentration over the tabulated
/// one, by Beer–Lambert) and, for a solvent with one, its published absorbance table
/// (Solvent::uv_absorbance).
struct UvPart {
    std::string who;
    double cutoff_nm = 0;
    double scale = 1;
    std::vector<UvAbsorbancePoint> table;
};

struct LineProfile {
    bool described = false;        ///< has parts (a volumes-only line has none)
    double aqueous_fraction_v = 0; ///< water and buffer parts
    double organic_fraction_v = 0; ///< everything else
    std::map<std::string, double>
        solvent_fraction_v; ///< solvent id → fraction (buffers count as water)
    std::vector<Solute> solutes;
    /// Wavelength at which the line's absorbance (1 cm, against water) reaches 1, from its parts:
    /// absorbance adds (see line_uv_cutoff_nm).
    double uv_cutoff_nm = 0;
    std::string uv_limited_by; ///< the part that absorbs most there
    /// What each part brings to the absorbance (solvents by volume fraction, solutes by
    /// Beer–Lambert), for the absorbance at any wavelength (uv_absorbance) and of a mixture.
    std::vector<UvPart> uv_parts;
    std::vector<std::string> uv_unknown;      ///< solutes without a cutoff figure
    std::vector<std::string> uv_beyond_table; ///< solutes above their table's last row
    std::optional<double> ph;                 ///< of the aqueous part (see ph_basis)
    PhBasis ph_basis = PhBasis::none;
    std::vector<std::string> nonvolatile; ///< solutes unsuitable for MS / ELSD / CAD
    std::vector<std::string> volatility_unknown;
    std::optional<ShelfKind> shelf_kind; ///< nullopt for a line without parts
    double shelf_life_h = 0;             ///< default for the kind, or the line's override
    bool short_lived = false;            ///< a short-lived component is present
};

/// shelf_kind_name of the profile's kind; "" for a line without parts.
inline const char* shelf_kind_name(const LineProfile& p) {
    return p.shelf_kind ? shelf_kind_name(*p.shelf_kind) : "";
}

/// Validates the line (fractions in (0, 1] summing to 1 ± 1e−4, known solvent and additive ids,
/// positive amounts, % v/v only for liquids) and works out its profile. Errors name
/// "<field>.parts[i].fraction_v", "<field>.additives[j].additive", … The pH of a line without a
/// buffer but with aqueous additives only (no organic) is solved with chem::solve at 25 °C.
LineProfile profile_line(const SolventLibrary& solvents, const Library& reagents,
                         const LineSpec& line);

/// What a line item is: a part measured by volume fraction (a solvent or a buffer), or an
/// additive.
enum class LineItemKind { solvent, buffer, additive };
const char* line_item_kind_name(LineItemKind kind); ///< "solvent", "buffer", "additive"

struct LineItem {
    std::string part; ///< solvent id, "buffer", or additive id
    LineItemKind kind = LineItemKind::solvent;
    double fraction_v = 0; ///< parts only
    std::optional<double> volume_ml;
    std::optional<double> mass_g;
    double density_g_per_ml = 0; ///< used for mass_g (0 when none)
    double density_temperature_c = 20;
    std::string density_basis;
};

/// What a line recipe's note says (chem/note_text.h words it).
enum class LineNoteKind {
    gravimetric_alternative, ///< the parts may be weighed instead of measured by volume
    ph_in_aqueous_part,      ///< the pH is measured in the aqueous part before the organic
    mixing_contraction,      ///< the estimated contraction on mixing, per organic
};

/// A note of a line recipe: data only; describe(note, solvents) makes the sentence.
struct LineNote {
    LineNoteKind kind = LineNoteKind::gravimetric_alternative;
    /// mixing_contraction: each organic with data, its solvent id and its contraction, mL.
    std::vector<std::pair<std::string, double>> contractions;
    double volume_ml = 0;  ///< mixing_contraction: the line's volume, measured part by part
    int organic_parts = 0; ///< mixing_contraction: organics in the line (estimates add up: > 1)
};

struct LineRecipe {
    LineProfile profile;
    double volume_ml = 0;         ///< the parts' volumes add up to this
    std::vector<LineItem> items;  ///< each part, then each additive
    std::optional<Recipe> buffer; ///< the buffer part's recipe (for the volume needed)
    double contraction_ml = 0;    ///< estimated volume lost on mixing (≥ 0 for contraction)
    double mixed_volume_ml = 0;   ///< volume_ml − contraction_ml
    std::vector<std::string> contraction_sources;
    std::vector<Step> steps; ///< in bench order
    std::vector<LineNote> notes;
    std::vector<std::string> cautions;
};

/// The absorbance (1 cm, against water) of one part at scale 1, at wavelength_nm.
/// - Without a table, the cutoff model: the absorbance falls tenfold per uv_decade_nm above the
///   cutoff, A(λ) = 10^{−(λ − λc)/w} (the shape is a rough rule, common practice, no source).
/// - With a published table: log-linear in absorbance between its rows. The cutoff (absorbance 1)
///   joins the table as a row of its own when it lies below the first row and the first row's
///   absorbance is below 1. Below the first row the absorbance rises tenfold per uv_decade_nm
///   (the cutoff model's slope); above the last row the last row's figure is held (the figures are
///   a grade's maxima, so holding never understates).
double uv_part_absorbance(const UvPart& part, double wavelength_nm);

/// Wavelength where the summed absorbance of the parts, Σ s_i·A_i(λ) (uv_part_absorbance), is 1.
/// Without tables this is closed-form, λ* = w·log10 Σ s_i 10^{λc_i/w}: 5 % THF (212 nm) in water
/// gives 200 nm, not 212; two weak absorbers add. With a table the root is found by bisection
/// between 50 and 1000 nm (1000 when the parts still absorb 1 there). `limited_by` gets the
/// largest contributor at the cutoff.
inline constexpr double uv_decade_nm = 10.0;
double line_uv_cutoff_nm(const std::vector<UvPart>& parts, std::string* limited_by);
/// The summed absorbance (1 cm, against water) of the parts at wavelength_nm, Σ s_i·A_i(λ).
/// Absorbance adds (Beer–Lambert), so a mixture of lines at volume fractions φ_l has
/// A = Σ φ_l A_l(λ); A = 1 at line_uv_cutoff_nm.
double uv_absorbance(const std::vector<UvPart>& parts, double wavelength_nm);

/// Estimated contraction on mixing of aqueous_ml of water with organic_ml of `organic`:
/// ΔV = −(n_w + n_o) · V^E(x_o) with n from densities and molar masses, V^E from the library's
/// Redlich–Kister excess volume (cm³/mol = mL/mol). Positive for a contraction; nullopt without
/// data for the pair.
std::optional<double> mixing_contraction_ml(const SolventLibrary& solvents, double aqueous_ml,
                                            const std::string& organic, double organic_ml);

/// The amounts for `volume_ml` of the line: each part measured separately (and its mass from the
/// density), each additive, the contraction on mixing, steps, notes and cautions. The buffer part's
/// recipe is used as given (app/ designs it for the volume the part needs).
LineRecipe prepare_line(const SolventLibrary& solvents, const Library& reagents,
                        const LineSpec& line, double volume_ml);

/// mmol/L of a reagent in the line from an additive amount (percent_v: mL of the liquid as
/// supplied per 100 mL; percent_w: g of the material as supplied per 100 mL).
double additive_mmol_per_l(const Reagent& r, AmountUnit unit, double amount);
/// The inverse: the amount in `unit` that gives mmol_per_l.
double additive_amount(const Reagent& r, AmountUnit unit, double mmol_per_l);

} // namespace chem
