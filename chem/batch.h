#pragma once
// A batch: one preparation of a recipe at the bench. It carries its own id, who prepared it and
// when, when it expires, and the amounts actually weighed or measured with their lot numbers.
// From those amounts the batch recomputes the solution as made and its predicted pH, and flags
// every amount outside the tolerance.
//
// Times are ISO 8601 local date-times kept as strings ("2026-12-01T16:30:00"); chem/ parses them
// only to check them and to add a shelf life. No Qt here.
#include "chem/equilibrium.h"
#include "chem/recipe.h"

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

namespace chem {

/// One amount as actually weighed or measured. Exactly one of mass_g and volume_ml.
struct ActualAmount {
    std::string reagent;             ///< reagent id as in the recipe's items
    std::optional<double> mass_g;    ///< material as supplied, g
    std::optional<double> volume_ml; ///< liquid as supplied, or the stock / titrant solution, mL
    std::string lot;                 ///< the supplier's lot number, may be empty
    /// The lot's expiry date from the lab's lot shelf, "YYYY-MM-DD"; "" = not known (a lot typed
    /// by hand). The lot may be used on that day; the batch's use-by is clamped to its end.
    std::string lot_expires_on;
    /// An approver accepted this lot although it had expired before the preparation (the record
    /// of who, when and why is kept by the app); such a lot no longer limits the use-by.
    bool lot_override = false;
};

struct Batch {
    std::string id;          ///< the lab's batch id ("PB-2026-12-01-01"); printed in the QR code
    std::string prepared_by; ///< may be empty until someone prepares it
    std::string prepared_at; ///< ISO 8601 local date-time, "" = not yet prepared
    std::string expires_at;  ///< ISO 8601; "" = prepared_at + the shelf life
    std::string checked_by;  ///< second person's name, may be empty
    double tolerance_fraction = 0.02; ///< ± relative tolerance of each amount (0.02 = ± 2 %)
    /// The final volume actually made up, mL; absent = the recipe's volume_ml.
    std::optional<double> final_volume_ml;
    std::vector<ActualAmount> actual;
    /// The pH read on the meter after preparation, at the recipe's temperature; absent = not read.
    std::optional<double> measured_ph;
    /// ± allowed between measured_ph and the target pH, pH units (default 0.05: common practice,
    /// no source).
    double ph_tolerance = 0.05;
    std::string ph_meter_id; ///< the pH meter used, may be empty
    std::string balance_id;  ///< the balance used, may be empty
    std::string comment;     ///< free text, may be empty
    /// The largest volume the vessel holds, mL; absent = not known (limits a scaled correction).
    std::optional<double> container_ml;
    /// Why an out-of-tolerance batch is still used, who recorded it and when; empty = none.
    std::string deviation_note;
    std::string deviation_by;
    std::string deviation_at; ///< ISO 8601 local
};

/// One recipe item against what was actually measured.
struct AmountCheck {
    std::string reagent;  ///< reagent id
    std::string unit;     ///< "g" or "mL": the quantity in which target and actual are compared
    double target = 0;    ///< the recipe's amount, in `unit`
    double low = 0;       ///< target · (1 − tolerance), in `unit`
    double high = 0;      ///< target · (1 + tolerance), in `unit`
    bool entered = false; ///< an actual amount was given
    double actual = 0;    ///< in `unit` (converted from the other quantity if needed)
    /// actual / target − 1 (0 when nothing was entered).
    double deviation_fraction = 0;
    bool within_tolerance = true;
    std::string lot;
    std::string lot_expires_on;  ///< "YYYY-MM-DD" from the lot shelf, "" when not known
    bool lot_override = false;   ///< the lot had expired and an approver accepted it
    double target_mol_per_l = 0; ///< formula units per litre of final solution, as planned
    double actual_mol_per_l = 0; ///< as made (the target when nothing was entered)
};

struct BatchResult {
    std::vector<AmountCheck> checks;    ///< one per recipe item, in the recipe's order
    std::vector<Component> composition; ///< the solution as made, formula units per litre
    Speciation predicted;               ///< solve() of `composition` at the recipe's temperature
    double final_volume_ml = 0;
    std::string expires_at;  ///< given, or prepared_at + shelf life; "" when neither is known
    double shelf_life_h = 0; ///< the shelf life applied (when expires_at was not given)
    /// The index in Batch::actual of the lot whose expiry clamped expires_at, -1 when none did.
    int expiry_limited_by = -1;
    /// "amount-out-of-tolerance" (warning), "amount-not-entered" (info), "ph-off-target" (caution
    /// when the pH predicted from the actual amounts is more than 0.05 from the target — common
    /// practice, no source), "measured-ph-out-of-tolerance" (warning, measured_ph more than
    /// ph_tolerance from the target).
    std::vector<Warning> warnings;
    /// measured_ph − target pH; absent when no pH was measured.
    std::optional<double> measured_ph_deviation;
    /// True when measured_ph lies outside target ± ph_tolerance.
    bool measured_ph_out = false;
    /// True when an entered amount lies outside its band or the measured pH outside tolerance:
    /// the batch needs a deviation note before it is printed or used.
    bool out_of_tolerance = false;
};

/// The out-of-tolerance warning for a measured pH (code "measured-ph-out-of-tolerance").
Warning measured_ph_warning(double measured_ph, double target_ph, double ph_tolerance);

/// Amount of substance per unit of what is measured for one recipe item: mol per g of material
/// (assay / M) and mol per mL (stock or titrant: molarity / 1000; neat liquid: density · assay /
/// M). Uses the request's purity overrides like the designer. Throws nothing for a valid recipe
/// item.
struct ItemBasis {
    std::optional<double> mol_per_g;
    std::optional<double> mol_per_ml;
};
ItemBasis item_basis(const Library& lib, const RecipeRequest& request, const RecipeItem& item);

/// Checks the batch's own fields (id, times, tolerance, amounts) and returns the checks, the
/// solution as made and its predicted pH. Items without an actual amount count at their target.
/// Throws chem::Error with fields in the CLI's JSON path style: "batch.id",
/// "batch.prepared_at", "batch.actual[1].mass_g", "batch.tolerance_percent", … for a missing id,
/// a time that is not ISO 8601, an expiry before preparation, a non-positive amount, an amount
/// for a reagent the recipe does not use (the message lists the recipe's reagents), a mass for a
/// stock solution, a volume for a solid, or two entries for one reagent, a measured pH outside
/// 0–14 ("batch.measured_ph"), a pH tolerance outside 0–2 ("batch.ph_tolerance"), a container
/// that is not a positive volume ("batch.container_ml"), a deviation time that is not ISO 8601
/// ("batch.deviation.at").
/// @param shelf_life_h hours from prepared_at to the expiry when the batch gives no expires_at.
BatchResult evaluate_batch(const Library& lib, const Recipe& recipe, const Batch& batch,
                           double shelf_life_h);

/// The batch's id, times and tolerance alone (evaluate_batch calls it; lines and sequences,
/// which have no recipe items of their own, use it directly). Returns the expiry: given, or
/// prepared_at + shelf_life_h, or "" when neither time is known. Throws chem::Error as
/// evaluate_batch.
std::string check_batch_fields(const Batch& batch, double shelf_life_h);

/// The batch's use-by and what limits it.
struct UseBy {
    std::string expires_at; ///< as check_batch_fields returns it
    int limited_by = -1;    ///< index in Batch::actual of the lot that clamped it, -1 when none
};
/// check_batch_fields with the lot that limits the use-by. The use-by is the expiry given (or
/// prepared_at + shelf_life_h), clamped to the end (23:59) of the expiry date of every lot in
/// the batch that is not overridden: a batch is never usable after one of its lots. Throws
/// chem::Error("batch.actual[i].lot", …) for a lot that expired before the day of preparation
/// unless it carries lot_override, and ("batch.actual[i].lot_expires_on", …) for a date that is
/// not YYYY-MM-DD.
UseBy use_by(const Batch& batch, double shelf_life_h);

/// The lot whose expiry date sets a batch's use-by (UseBy::limited_by), as data; worded by
/// describe(const UseByLimit&, …) (chem/note_text.h): "lot SP-2 of <name>, which expires on
/// 2026-12-02".
struct UseByLimit {
    std::string reagent;        ///< the part's or the reagent's id ("buffer." taken off)
    std::string lot;            ///< the supplier's lot number
    std::string lot_expires_on; ///< "YYYY-MM-DD", as the lot shelf gives it
    bool operator==(const UseByLimit&) const = default;
};

/// Why a batch is out of tolerance and needs a deviation note before it is released, as data;
/// worded by describe(const ReleaseReason&, …) (chem/note_text.h).
enum class ReleaseReasonKind {
    amount_out_of_band,          ///< an entered amount outside target ± tolerance
    measured_ph_out_of_tolerance ///< the measured pH outside target ± the pH tolerance
};
struct ReleaseReason {
    ReleaseReasonKind kind = ReleaseReasonKind::amount_out_of_band;
    std::string reagent; ///< an amount: its part's or reagent's id; "" for the pH
    std::string unit;    ///< an amount: "g" or "mL"; "" for the pH (pH units)
    double target = 0;   ///< the amount's target in `unit`, or the target pH
    double actual = 0;   ///< the amount as made in `unit`, or the measured pH
    double low = 0;      ///< the band's low end, in `unit` or pH
    double high = 0;     ///< the band's high end, in `unit` or pH
    /// An amount: actual / target − 1 (AmountCheck::deviation_fraction). The pH: measured −
    /// target, pH units.
    double deviation = 0;
    /// An amount: the relative tolerance (0.02 = ± 2 %). The pH: ± pH units.
    double tolerance = 0;
    bool operator==(const ReleaseReason&) const = default;
};
/// The reason for an entered amount outside its band (`c.entered && !c.within_tolerance`);
/// `tolerance_fraction` is the batch's (0.02 = ± 2 %).
ReleaseReason amount_reason(const AmountCheck& c, double tolerance_fraction);
/// The reason for a measured pH outside target_ph ± tolerance_ph (pH units).
ReleaseReason measured_ph_reason(double measured_ph, double target_ph, double tolerance_ph);

/// A reagent lot's dates (YYYY-MM-DD): the lot is opened no earlier than it was received, and it
/// expires after it was received. `opened_on` may be "". Throws chem::Error naming the field
/// ("received_on", "opened_on", "expires_on", each prefixed by `at` + "." when `at` is not empty)
/// and the value.
void check_lot_dates(const std::string& received_on, const std::string& opened_on,
                     const std::string& expires_on, const std::string& at = {});

/// Checks one measured amount against a target with a relative tolerance; for parts of a line
/// (solvents by volume) that have no recipe item. `entered` false → within, deviation 0.
AmountCheck check_amount(const std::string& name, const std::string& unit, double target,
                         std::optional<double> actual, double tolerance_fraction);

/// The out-of-tolerance warning for a check (code "amount-out-of-tolerance", severity warning),
/// with the numbers: "potassium-dihydrogen-phosphate: 2.8000 g measured, target 2.7218 g ± 2 %
/// (2.6674 to 2.7762 g), +2.9 %".
Warning out_of_tolerance_warning(const AmountCheck& check, double tolerance_fraction);

// ---- ISO 8601 local date-times ---------------------------------------------------------------

/// A calendar date-time without zone (the lab's local time).
struct LocalDateTime {
    int year = 2000, month = 1, day = 1, hour = 0, minute = 0, second = 0;
};
/// Parses "YYYY-MM-DDTHH:MM[:SS]" (a space instead of T is accepted; a trailing "Z" or ±HH:MM is
/// accepted and ignored: times are local). Throws chem::Error(field, …) naming the value.
LocalDateTime parse_local_datetime(const std::string& text, const std::string& field);
/// Parses a date "YYYY-MM-DD" (exactly). Throws chem::Error(field, …) naming the value.
LocalDateTime parse_local_date(const std::string& text, const std::string& field);
/// "YYYY-MM-DDTHH:MM:SS".
std::string format_local_datetime(const LocalDateTime& t);
/// Minutes since 1970-01-01T00:00 of the proleptic Gregorian calendar (no zone, no leap seconds).
std::int64_t to_minutes(const LocalDateTime& t);
LocalDateTime from_minutes(std::int64_t minutes);
/// text + hours (rounded to the minute), formatted as format_local_datetime.
std::string add_hours(const std::string& text, double hours, const std::string& field);

} // namespace chem
