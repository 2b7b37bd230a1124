#pragma once
// A finding of the sequence and line checks (chem/checks.h): what was found, about what, and the
// numbers behind it. Data only: the sentence is made at render time by describe()
// (chem/finding_text.h), in one place, so that it can be translated.
#include <functional>
#include <string>
#include <utility>
#include <vector>

namespace chem {

/// How much a finding matters (chem::Warning's severity is the same type).
enum class Severity { info, caution, warning };

/// What a finding says, one value per wording. Several share a contract code (code_of): a
/// uv-cutoff finding is about the eluent's absorbance, an unknown cutoff or a table passed.
enum class FindingKind {
    uv_cutoff_eluent,       ///< the eluent (or the lone line) absorbs at the wavelength
    uv_cutoff_unknown,      ///< parts of a line have no UV cutoff figure
    uv_cutoff_beyond_table, ///< parts of a line are above their UV table
    immiscible_in_line,     ///< two parts of one line do not mix
    immiscible_lines,       ///< two lines meet in the mixer and do not mix
    precipitation,          ///< a salt group at or near its solubility limit
    ms_nonvolatile,         ///< non-volatile parts into an evaporating detector
    ms_additive,            ///< an additive with its own MS caution
    ms_volatility_unknown,  ///< parts whose volatility is not recorded
    column_ph_eluent,       ///< the eluent's s_w pH outside the column's range
    column_ph_line,         ///< a line's own pH outside the column's range (no library)
    buffer_range,           ///< a stretch of the gradient where the eluent buffers poorly
    shelf_life,             ///< a line past its shelf life before the sequence ends
    runs_dry,               ///< a bottle runs dry
    runs_low,               ///< a bottle lasts with less than the safety margin
    waste_overflow,         ///< the waste container overfills
    waste_nearly_full,      ///< the waste container ends above 90 %
    pressure_limit,         ///< a method's pressure peak past (or near) the limit
    // The solver's and the recipe's (chem/equilibrium, chem/recipe), carried by chem::Warning:
    ionic_strength_high,    ///< past the activity model's range (detail text "model")
    activity_model_differs, ///< Davies and the extended model differ by more than 0.02 pH
    ph_outside_pka_range,   ///< the target pH more than 1 from every conditional pKa′
    low_buffer_capacity,    ///< β below 2 mmol/L per pH
    small_amount,           ///< a mass or volume too small to measure well (about a reagent)
    titrant_volume_large,   ///< the titrant takes more than half the final volume
    // The batch's (chem/batch), about a reagent's amount as made:
    amount_out_of_tolerance, ///< an amount outside target ± tolerance (detail text "unit")
    amount_not_entered,      ///< no actual amount: the target is assumed (detail text "unit")
    // The batch's pH (chem/batch), about the batch as a whole (subject none):
    ph_off_target,                ///< the pH predicted from the amounts as made is off the target
    measured_ph_out_of_tolerance, ///< the measured pH outside target ± the pH tolerance
    // The eluent's (chem/eluent), about the eluent as a whole (subject none):
    eluent_ph_extrapolated, ///< the eluent pH is an estimate; the details say how it was made
    eluent_temperature,     ///< the organic's shifts are 25 °C values used at another temperature
    // The column transfer's (chem/transfer), about the moved method (subject: method ""):
    dwell_too_large,            ///< the new system's dwell volume delays the gradient
    outside_allowed_adjustment, ///< L/dp changes outside −25 % to +50 %
    flow_not_scaled,            ///< the chosen flow differs from the scaled flow
    small_injection,            ///< the scaled injection volume is below 0.5 µL
    // The pressure trace's notes (chem/pressure), about a method ("": a one-method document):
    viscosity_estimate,    ///< the viscosity of some organics with water is estimated (items)
    pressure_uncalibrated, ///< the column's flow resistance is a Kozeny–Carman estimate
    pressure_no_limit,     ///< no pressure limit to check against
    pressure_unknown,      ///< no trace: lines the method runs have no parts (items: the lines)
    // The line document's (app/core line_from_json), about a line known by its name:
    buffer_scaled, ///< a line's buffer designed for more than its volume_ml (detail "line_name")
    // The app's (dates are app-side: they come as ISO texts, "2027-03-31", and are worded as
    // they are; no clock is needed):
    /// An instrument past its calibration-due date (subject: the device; texts "device",
    /// "calibration_due"; detail "device_kind": "balance", "ph_meter").
    device_calibration_due,
    /// A value taken from an instrument that was past its calibration-due date on the day of the
    /// reading (subject: the amount's part, a reagent, or none for the measured pH; where: the
    /// device; texts "device", "calibration_due"; detail "device_kind", "" when not recorded).
    reading_calibration_due,
    /// An expired lot used by an approver's override (subject: the part, a reagent; details
    /// "lot", "lot_expires_on" ("" when not recorded), "by", "name", "at" (ISO), "reason").
    expired_lot_override,
    /// One batch of a line recipe used over more than its shelf life across several plans
    /// (subject: the batch; text "recipe"; numbers "span_h", "shelf_life_h", "batches"; details
    /// "bottles", "kind" (shelf_kind_name)).
    batch_shelf_life,
};
/// The contract's stable code: "uv-cutoff", "immiscible", "precipitation", "ms-nonvolatile",
/// "column-ph", "buffer-range", "shelf-life", "runs-dry", "waste-overflow", "pressure-limit",
/// "ionic-strength-high", "activity-model-differs", "ph-outside-pka-range",
/// "low-buffer-capacity", "small-amount", "titrant-volume-large", "amount-out-of-tolerance",
/// "amount-not-entered", "ph-off-target", "measured-ph-out-of-tolerance",
/// "eluent-ph-extrapolated", "eluent-temperature", "dwell-too-large",
/// "outside-allowed-adjustment", "flow-not-scaled", "small-injection", "viscosity-estimate",
/// "pressure-uncalibrated", "pressure-no-limit", "pressure-unknown", "buffer-scaled",
/// "device-calibration-due", "expired-lot-override" (and "shelf-life" for batch_shelf_life).
const char* code_of(FindingKind kind);

/// What a finding is about, as a typed reference (never a name to be parsed back).
struct Subject {
    enum class Kind {
        none,      ///< the whole: the sequence (waste container), the batch, the eluent
        line,      ///< id: the line's letter, "A"
        line_pair, ///< id and other: two lines' letters, "A" and "B"
        method,    ///< id: the method's name (empty: the one method of a document)
        standby,   ///< the standby flow after the last injection
        reagent,   ///< id: a reagent's (or a line part's) id ("sodium-chloride", "acetonitrile")
        system,    ///< id: an acid-base system's id ("phosphate")
        device,    ///< id: an instrument's id ("BAL-03")
        batch,     ///< id: the name of a line recipe whose lines share one batch
    };
    Kind kind = Kind::none;
    std::string id;
    std::string other;

    static Subject of_line(int index);
    static Subject of_lines(int a, int b);
    static Subject of_method(std::string name);
    static Subject of_standby();
    static Subject of_reagent(std::string id);
    static Subject of_system(std::string id);
    static Subject of_device(std::string id);
    static Subject of_batch(std::string recipe);
    /// The lines' letters as the contract's "line" field gives them ("A", "AB"); empty otherwise.
    std::string line_letters() const;
    bool operator==(const Subject& o) const {
        return kind == o.kind && id == o.id && other == o.other;
    }
};
const char* subject_kind_name(Subject::Kind kind); ///< "none", "line", "line-pair", …

struct Finding {
    using Severity = chem::Severity;
    FindingKind kind = FindingKind::uv_cutoff_eluent;
    Severity severity = Severity::info;
    Subject subject;
    /// Where in the night it happens, when the finding has a place: a method (the time into each
    /// injection among the numbers as "t_min"), the standby, or a line (its bottle).
    Subject where;
    /// From check_line: the line on its own, shown by its name, with no sequence around it.
    bool alone = false;
    /// The contract's numbers and texts, in the order the output gives them. Times in minutes
    /// from the sequence start are keyed "…_at_min"; the app adds clock times.
    std::vector<std::pair<std::string, double>> numbers;
    std::vector<std::pair<std::string, std::string>> texts;
    /// What the sentence needs beyond the contract's fields (not in the output): a line's share
    /// of the mix, the safety margin, the injections in the night, …
    std::vector<std::pair<std::string, double>> detail_numbers;
    std::vector<std::pair<std::string, std::string>> detail_texts;
    /// The parts a finding lists, as ids (reagents, additives, solvents), each with a number
    /// where the sentence gives one (mmol/L of a non-volatile part), NaN otherwise.
    std::vector<std::pair<std::string, double>> items;

    const char* code() const { return code_of(kind); }
    void number(std::string key, double v) { numbers.emplace_back(std::move(key), v); }
    void text(std::string key, std::string v) { texts.emplace_back(std::move(key), std::move(v)); }
    void detail(std::string key, double v) { detail_numbers.emplace_back(std::move(key), v); }
    void detail_text(std::string key, std::string v) {
        detail_texts.emplace_back(std::move(key), std::move(v));
    }
    /// A number or text by key, from the contract's fields or the details; NaN or "" if absent.
    double number_of(const std::string& key) const;
    const std::string& text_of(const std::string& key) const;
    bool has_number(const std::string& key) const;
    /// Every number or text under a key that a finding repeats (a list, such as the eluent's
    /// estimated steps), in order, from the contract's fields and then the details.
    std::vector<double> numbers_all(const std::string& key) const;
    std::vector<std::string> texts_all(const std::string& key) const;
};

/// Formats a time (minutes from the sequence start) for the sentences; app/ passes clock times.
using ClockFormatter = std::function<std::string(double minutes)>;
std::string default_clock(double minutes); ///< "t+125.5 min"
/// The name a reagent, solvent or additive id is shown by; app/ passes the library's names
/// ("Acetonitrile" for "acetonitrile"). Empty: the id as it is.
using NameLookup = std::function<std::string(const std::string& id)>;
/// A time into an injection, in words: "18 min 53 s", "2 min", "45 s".
std::string method_time_words(double minutes);

} // namespace chem
