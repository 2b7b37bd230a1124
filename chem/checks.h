#pragma once
// The checks that save a night's run, each a chem::Finding (chem/finding.h): a code, the subject
// as a typed reference and the numbers behind it; describe() (chem/finding_text.h) words it:
//   uv-cutoff       a line's UV cutoff against the detector wavelength, with a margin
//   immiscible      two lines (or two parts of one line) that meet and do not mix
//   precipitation   a buffer salt above its solubility limit at the organic fraction reached
//   ms-nonvolatile  a non-volatile buffer or additive with an MS (or ELSD/CAD) detector
//   column-ph       the eluent's s_w pH along the gradient, at the column temperature, outside
//                   the column's stated range (a line's own pH when no reagent library is given)
//   buffer-range    stretches of the gradient where the eluent's s_s pH lies more than one unit
//                   from every s_s pKa′ of the buffer systems present
//   shelf-life      an aqueous buffer past its shelf life before the sequence ends
//   runs-dry        a bottle that runs dry (or has less than the safety margin to spare)
//   waste-overflow  a waste container that overfills
//   pressure-limit  a method whose pressure peak passes the lower of the column's and the
//                   instrument's limits (a caution within 10 % of it)
// Warnings come out in that order.
#include "chem/eluent.h"
#include "chem/equilibrium.h"
#include "chem/error.h"
#include "chem/finding.h"
#include "chem/line.h"
#include "chem/pressure.h"
#include "chem/sequence.h"
#include "chem/solvent.h"

#include <array>
#include <functional>
#include <map>
#include <memory>
#include <optional>
#include <string>
#include <utility>
#include <vector>

namespace chem {

enum class DetectorType { uv, dad, pda, uv_ms, ms, elsd, cad, fluorescence, ri };
/// "uv", "dad", "pda", "uv-ms", "ms", "elsd", "cad", "fluorescence", "ri": the contract's words.
const char* detector_type_name(DetectorType type);
/// The inverse of detector_type_name (lower case only); std::nullopt for anything else.
std::optional<DetectorType> detector_type_from_name(const std::string& name);
const std::vector<DetectorType>& detector_types(); ///< every type, in the order above

struct Detector {
    DetectorType type = DetectorType::uv;
    std::optional<double> wavelength_nm; ///< for UV types
    double margin_nm = 10; ///< caution within this of the cutoff (common practice, no source)
};
bool detector_reads_uv(DetectorType type);       ///< uv, dad, pda, uv-ms
bool detector_needs_volatile(DetectorType type); ///< ms, uv-ms, elsd, cad

struct ColumnLimits {
    double ph_min = 2;
    double ph_max = 8;
    std::optional<double>
        temperature_c; ///< column oven; the eluent pH is taken at 25 °C without it
};

/// One point of a method's eluent pH trace (an injection's time course, minutes from its start).
struct EluentTracePoint {
    double t_min = 0;
    double organic_fraction_v = 0;
    double ph_s_w = 7;
    double ph_s_s = 7;
    double nearest_pka_gap = 0; ///< to the nearest s_s pKa′ (infinite without acid-base systems)
    double nearest_pka = 0;
    int nearest_system = -1;   ///< index into EluentTrace::systems
    bool extrapolated = false; ///< an estimate (see the eluent command's eluent-ph-extrapolated)
};
/// The eluent pH at every gradient row and every 1 % of organic between rows, per method run.
struct EluentTrace {
    std::string method;
    double temperature_c = 25;
    bool has_systems = false;         ///< the eluent carries acid-base systems
    std::vector<std::string> systems; ///< their ids
    std::vector<EluentTracePoint> points;
};

class EluentPoints;

struct SequenceCheckInput {
    const SolventLibrary* solvents = nullptr;
    const SequenceInput* input = nullptr;
    const SequencePlan* plan = nullptr;
    std::array<const LineProfile*, max_lines> profiles{};           ///< null: a volumes-only line
    std::array<std::optional<double>, max_lines> prepared_at_min{}; ///< from the sequence start
    std::optional<Detector> detector;
    std::optional<ColumnLimits> column;
    /// A method's own column pH range (by method name; the app copies a library column into the
    /// method): it replaces `column` in that method's column-ph check.
    std::map<std::string, ColumnLimits> method_columns;
    /// One pressure trace per plan method (index as SequencePlan::methods), or none: no column
    /// dimensions given, or the method runs a line without a make-up.
    const std::vector<std::optional<PressureTrace>>* pressure = nullptr;
    /// The reagent library: with it the column-ph and buffer-range checks use the eluent pH.
    const Library* reagents = nullptr;
    /// Precomputed traces (eluent_traces); the checks compute them when null.
    const std::vector<EluentTrace>* traces = nullptr;
    /// The eluent points solved so far in this check run (with `reagents`): eluent_traces and the
    /// precipitation check's speciation look each composition up here, so none is solved twice.
    /// check_sequence makes one when null; give one to share it with an eluent_traces call
    /// before check_sequence.
    EluentPoints* eluent_points = nullptr;
    bool lone_line = false; ///< set by check_line: one line at 100 %, no gradient to speak of
};

/// The eluent of one check run at the column's temperature (25 °C without one), from the lines
/// with a make-up, each pump composition solved once: the solves that eluent_traces and the
/// precipitation check's speciation share. One thread at a time.
class EluentPoints {
  public:
    /// Keeps copies of the lines' profiles and references to c's libraries, which must outlive
    /// it; nothing else of `c`.
    explicit EluentPoints(const SequenceCheckInput& c);
    /// The same, borrowing c's profiles instead of copying them: for points that do not
    /// outlive `c`'s profiles (check_sequence's own, the precipitation check's bottles).
    struct BorrowProfiles {};
    EluentPoints(const SequenceCheckInput& c, BorrowProfiles);
    ~EluentPoints();
    EluentPoints(const EluentPoints&) = delete;
    EluentPoints& operator=(const EluentPoints&) = delete;

    double temperature_c() const { return temperature_c_; }
    /// The model, or null where it cannot be built (error() says why).
    const EluentModel* model() const { return model_.get(); }
    const std::optional<Error>& error() const { return error_; }

    /// The point at `percent` (pump percentages), solved on the first request from `guess`, or
    /// from the last point solved when null. Throws chem::Error as EluentModel::point; needs
    /// model(). The reference stays valid while this object lives.
    const EluentPoint& at(const LineValues& percent, const EluentPoint* guess = nullptr);
    /// The point at `percent` when it has been solved, else null.
    const EluentPoint* find(const LineValues& percent) const;
    /// The same point, with each system's species fractions there (EluentModel::point_species).
    const EluentPoint& species(const LineValues& percent,
                               std::vector<std::vector<double>>& fractions);

  private:
    struct Table;
    std::array<std::optional<LineProfile>, max_lines> profiles_; ///< the model's, copied
    double temperature_c_ = 25;
    std::unique_ptr<EluentModel> model_;
    std::optional<Error> error_;
    std::unique_ptr<Table> table_;
    /// The index of the point at `percent`, solved when new.
    std::size_t index_of(const LineValues& percent, const EluentPoint* guess);
    void init(const SequenceCheckInput& c, bool copy_profiles);
};

/// The eluent pH trace of every method the sequence runs, at the column temperature (Davies).
/// Needs c.reagents; empty without it or when a line in use has no parts.
std::vector<EluentTrace> eluent_traces(const SequenceCheckInput& c);

/// Lines the sequence pumps at some point (above 0 % in a method it runs, or in the standby).
std::array<bool, max_lines> lines_in_use(const SequenceInput& in, const SequencePlan& plan);

std::vector<Finding> check_uv_cutoff(const SequenceCheckInput& c);
std::vector<Finding> check_immiscible(const SequenceCheckInput& c);
std::vector<Finding> check_precipitation(const SequenceCheckInput& c);
std::vector<Finding> check_ms_nonvolatile(const SequenceCheckInput& c);
std::vector<Finding> check_column_ph(const SequenceCheckInput& c);
std::vector<Finding> check_buffer_range(const SequenceCheckInput& c);
std::vector<Finding> check_shelf_life(const SequenceCheckInput& c);
std::vector<Finding> check_runs_dry(const SequenceCheckInput& c);
std::vector<Finding> check_waste_overflow(const SequenceCheckInput& c);
std::vector<Finding> check_pressure_limit(const SequenceCheckInput& c);
/// The pressure-limit warning for one method's trace: "warning" when the peak passes the limit,
/// "caution" when it comes within 10 % of it (≥ 90 %), none otherwise or without a limit. The
/// numbers: max_pressure_bar, limit_bar, peak_t_min (into the injection), organic_fraction_v;
/// texts: method, limited_by. An empty `method` (a one-method document) reads "The method".
std::optional<Finding> pressure_limit_warning(const std::string& method,
                                              const PressureTrace& trace);
/// All of the above, in the order of the list at the top.
std::vector<Finding> check_sequence(const SequenceCheckInput& c);

/// The checks that apply to one line on its own (the `line` command): immiscible parts,
/// precipitation in the bottle, and, when given, UV cutoff, MS volatility and column pH.
std::vector<Finding> check_line(const SolventLibrary& solvents, const LineProfile& profile,
                                const std::string& name, const std::optional<Detector>& detector,
                                const std::optional<ColumnLimits>& column,
                                const Library* reagents = nullptr);

/// The acid–base speciation of an eluent at one point, for the solubility form tables: per
/// system id, the fraction of each species (index = protons removed from the fully protonated
/// acid; the fractions sum to 1).
struct SpeciesShares {
    std::map<std::string, std::vector<double>> fractions;
    double ph_s_s = 7; ///< the eluent's s_s pH the fractions hold at
};
/// The speciation of a solved eluent: each system's species at the eluent's s_s pH from its s_s
/// pKa′ at the eluent's ionic strength (EluentResult::pka, s_s_conditional).
SpeciesShares species_shares_of(const EluentResult& eluent);

/// Worst-case salt loading of a mixture against the solubility tables: for every salt group in
/// the mixture, the highest ratio concentration / limit. Used by check_precipitation and tests.
///
/// A group with form tables (SolubilityTable::form) is split into its forms by the speciation
/// and loaded by the sum-of-fractions rule R = Σ c_form / limit_form(φ): precipitation when
/// R ≥ 1. Species of the system without a table of their own count against the lowest form
/// limit (conservative), except the fully protonated acid (protons removed 0), which is not a
/// salt. Without a speciation for the group's system the whole total is counted as the form with
/// the lowest limit (conservative), and `speciated` is false.
struct SaltLoad {
    std::string group;
    double mmol_per_l = 0; ///< total of the group in the mixed eluent
    /// Group table: the table's limit. Form tables: the total the eluent holds at R = 1 at this
    /// speciation (mmol_per_l / R), so that ratio() is R.
    double limit_mmol_per_l = 0;
    double organic_fraction_v = 0; ///< total organic where the ratio is highest
    std::string organic;           ///< the solvent whose table gave the (limiting form's) limit
    std::string basis;             ///< "published" | "rule-of-thumb"
    std::string source;
    // With form tables only (form empty: a group table gave the limit).
    std::string form;           ///< the form with the largest share of R ("hydrogen-phosphate")
    std::string system;         ///< its acid–base system ("phosphate")
    double form_mmol_per_l = 0; ///< that form's concentration in the eluent
    double form_limit_mmol_per_l = 0; ///< that form's limit at organic_fraction_v
    bool speciated = false;           ///< split at the eluent's pH (ph_s_s)
    double ph_s_s = 0;                ///< the eluent's s_s pH, when speciated
    double ratio() const;             ///< mmol/limit (infinite for a zero limit with salt present)
};
/// A mixture: per line percent (sum 100) of lines with the given profiles. `speciation`, when
/// given, splits the groups with form tables (see SaltLoad).
std::vector<SaltLoad> salt_loads(const SolventLibrary& solvents,
                                 const std::array<const LineProfile*, max_lines>& profiles,
                                 const LineValues& percent,
                                 const SpeciesShares* speciation = nullptr);

} // namespace chem
