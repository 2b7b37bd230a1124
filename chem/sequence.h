#pragma once
// Methods, gradients and the sequence's solvent budget: exact integration of piecewise-linear
// gradients, volumes per injection, per row and in total, waste, end time, and for each line's
// bottle whether it lasts — and if not, the injection and the time at which it runs dry.
//
// Times are minutes from the sequence start (chem/ has no clock); app/ converts ISO dates.
// Lines are indexed 0..3 for A..D.
#include <array>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace chem {

inline constexpr int max_lines = 4;
/// One value per line A..D (percent, mL, …).
using LineValues = std::array<double, max_lines>;

char line_letter(int index);          ///< 0 → 'A'
int line_index(std::string_view key); ///< "A" → 0; −1 if not one of A–D

/// One row of a gradient table: at t_min the mixer delivers `percent` of each line (sum 100).
struct GradientRow {
    double t_min = 0;
    LineValues percent{};
};

/// An injection occupies run_min (the gradient, its last row held to the end) and then
/// equilibration_min at the first row's composition, both at flow_ml_min. Before the first row's
/// time (when it is above 0) the first row's composition holds.
struct Method {
    std::string name;
    double flow_ml_min = 0;
    std::vector<GradientRow> gradient;
    double run_min = 0;
    double equilibration_min = 0;

    double injection_min() const { return run_min + equilibration_min; }
    /// Percent of line `line` at time t_min of an injection (0 ≤ t ≤ injection_min()).
    double percent_at(int line, double t_min) const;
};

/// A stretch of an injection's time course in which every line's percentage is linear.
struct Stretch {
    double start_min = 0; ///< from the injection's start
    double duration_min = 0;
    LineValues percent_start{};
    LineValues percent_end{};
};
/// The injection's time course as stretches: an initial hold (if the first row is after 0),
/// the gradient's segments, the final hold to run_min, the re-equilibration. Zero-length
/// stretches are left out.
std::vector<Stretch> stretches(const Method& m);

/// Volume of each line per injection in mL, exactly: flow/100 × [Σ over segments of
/// (p_i + p_{i+1})/2 · (t_{i+1} − t_i) + p_last·(run − t_last) + p_first·(t_first +
/// equilibration)].
LineValues volume_per_injection_ml(const Method& m);

struct SequenceRow {
    std::string method; ///< Method::name
    int injections = 1;
    std::string label;
};

struct BottleSpec {
    std::string name;      ///< the line's display name
    double bottle_ml = 0;  ///< volume on hand in the bottle
    double residue_ml = 0; ///< unusable below the inlet filter
    double prime_ml = 0;   ///< purged before the sequence (takes no sequence time)
};

/// Flow after the last injection (e.g. overnight standby at low flow).
struct Standby {
    double flow_ml_min = 0;
    double duration_min = 0;
    /// Composition; absent → the first row of the last row's method.
    std::optional<LineValues> percent;
};

struct SequenceInput {
    std::array<std::optional<BottleSpec>, max_lines> lines; ///< defined lines
    std::vector<Method> methods;
    std::vector<SequenceRow> rows;
    std::optional<Standby> standby;
    std::optional<double> waste_capacity_ml; ///< free volume of the waste container
    double safety_margin_fraction =
        0.10; ///< spare on the smallest bottle (common practice, no source)
};

struct MethodPlan {
    std::string name;
    double injection_min = 0;
    LineValues per_injection_ml{};
    double pumped_per_injection_ml = 0; ///< flow × injection_min
    LineValues max_percent{};           ///< highest percentage of each line the method reaches
};

struct RowPlan {
    int method = 0; ///< index into SequencePlan::methods
    int injections = 0;
    int first_injection = 1; ///< 1-based number across the sequence
    double start_min = 0;
    double end_min = 0;
    LineValues volume_ml{};
};

enum class DryPhase { none, priming, injection, standby };
const char* dry_phase_name(DryPhase p);

struct LinePlan {
    bool defined = false;
    double prime_ml = 0;
    double pumped_ml = 0;   ///< injections and standby
    double required_ml = 0; ///< prime + pumped
    double usable_ml = 0;   ///< bottle − residue
    bool runs_dry = false;
    DryPhase dry_phase = DryPhase::none;
    std::optional<int> dry_after_injection; ///< 1-based injection during which it runs dry
    std::optional<int> dry_row;             ///< 0-based sequence row of that injection
    std::optional<double> dry_at_min;       ///< minutes from the start
    double spare_ml = 0;                    ///< usable − required (negative: shortfall)
    /// required × (1 + margin) + residue: the smallest bottle that lasts with the margin.
    double min_bottle_ml = 0;
    /// The smallest common bottle size (250 mL … 20 L) at or above min_bottle_ml; 0 if none.
    double suggested_bottle_ml = 0;
};

struct SequencePlan {
    std::vector<MethodPlan> methods; ///< in the order of SequenceInput::methods
    std::vector<RowPlan> rows;
    std::array<LinePlan, max_lines> lines;
    int injections = 0;
    double total_min = 0; ///< start to the end of the last injection
    double standby_min = 0;
    double pumped_ml = 0; ///< everything through the column (injections + standby)
    double prime_ml = 0;
    double waste_ml = 0; ///< pumped + priming
    /// 1-based injection running at time t_min (clamped to [1, injections]); 0 before any.
    int injection_at(double t_min) const;
    /// Cumulative waste (priming at t = 0, then the flow) at time t_min, in mL.
    double waste_at(double t_min) const;
    /// Time at which the cumulative waste reaches volume_ml, or nullopt if it never does.
    std::optional<double> time_waste_reaches(double volume_ml) const;
    // kept for waste_at / time_waste_reaches
    std::vector<double> row_flow_ml_min;
    double standby_flow_ml_min = 0;
    LineValues standby_percent{};
};

/// Checks a method (JSON paths "methods.<name>.…"): flow > 0, at least one row, times ≥ 0 and
/// strictly ascending, percentages 0–100 summing to 100 ± 0.01, only defined lines above 0,
/// run_min ≥ the last row's time, equilibration_min ≥ 0. Throws chem::Error.
void validate_method(const Method& m, const std::array<bool, max_lines>& defined);

/// Checks one composition: each line 0–100 % (field "<at>.A"), only defined lines above 0, the
/// sum 100 ± 0.01 (field `at`, message naming `where`). Throws chem::Error.
void validate_composition(const LineValues& percent, const std::array<bool, max_lines>& defined,
                          const std::string& at, const char* where);

/// Validates everything (throws chem::Error with the JSON path: "sequence[0].method",
/// "lines.A.bottle_ml", "methods.x.gradient[2].t_min", "standby.flow_ml_min") and plans.
SequencePlan plan_sequence(const SequenceInput& in);

/// The common bottle sizes considered for suggested_bottle_ml, in mL.
const std::vector<double>& common_bottle_sizes_ml();

} // namespace chem
