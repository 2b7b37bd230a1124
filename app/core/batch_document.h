#pragma once
// A contract document (a `recipe` input, a line or a sequence) with its "batch" object, evaluated
// once for everyone who shows it: the app's Prepare & record screen (gui/batch_model) and the
// printed sheet and labels (print/documents). Both read the same checks, the same warnings, the
// same steps and the same out-of-tolerance verdict from here, so the screen and the paper cannot
// differ. No painting, no Qt GUI.
//
// The "batch" object (issue 5 §5; names fixed, extend only):
//   {"id": "…", "prepared_by": "…", "prepared_at": "2026-12-01T16:30:00", "expires_at": "…",
//    "actual": [{"reagent": "<id>", "mass_g": … | "volume_ml": …, "lot": "…"}]}
// all fields but "id" optional. Extensions: "checked_by", "purpose", "tolerance_percent"
// (default 2), "final_volume_ml", "shelf_life_h" (overrides the default for the kind),
// "copies" (labels per document), and for the record at the bench:
//   "measured_ph" (the meter's reading at the recipe temperature), "ph_tolerance" (± pH units,
//   default 0.05), "ph_meter_id", "balance_id", "comment", "container_ml" (the largest volume the
//   vessel holds, for the correction), "deviation": {"note", "by", "at"} (why an
//   out-of-tolerance batch is still used, who wrote it, when), "actual[i].capture" and
//   "measured_ph_capture" (a value taken from a balance or the pH meter: {"device_id", "raw",
//   "received_at", "device_kind", "device_name", "stable", "accepted_unstable",
//   "calibration_due", "calibration_caution"}; absent = typed), "actual[i].lot_expires_on" (the
//   lot's expiry date from the lab's lot shelf, YYYY-MM-DD: the use-by is clamped to it, and a
//   lot expired before the day of preparation is refused) and "actual[i].lot_override" ({"by",
//   "name", "at", "reason"}: an approver accepted the expired lot; by and reason required).
// For a line, "reagent" in "actual" may also name a part (a solvent id or "buffer") or an
// additive id.
#include "chem/batch.h"
#include "chem/batch_correction.h"
#include "chem/line.h"
#include "chem/recipe.h"
#include "core/app_data.h"
#include "core/sequence_result.h"

#include <QJsonArray>
#include <QJsonObject>
#include <QList>
#include <QString>
#include <QStringList>

#include <optional>
#include <vector>

namespace phaseplan {

/// "recipe", "line" or "sequence": which contract document `input` is (a sequence has "lines"
/// and "sequence"; a line has "parts" or "bottle_ml"; anything else is read as a recipe).
QString batch_document_kind(const QJsonObject& input);

/// A captured value's record {device_id, raw, received_at, and optionally device_kind,
/// device_name, calibration_due, calibration_caution, stable, accepted_unstable}, checked once
/// for the print path and the store alike. Throws chem::Error naming `at` or its key.
QJsonObject read_capture(const QJsonValue& v, const std::string& at);

/// The "batch" object of `input` read into chem::Batch. Throws chem::Error naming the field
/// ("batch", "batch.id", "batch.actual[2].mass_g", "batch.deviation.note", …). `copies` receives
/// "copies" when given, `shelf_life_h` "shelf_life_h".
chem::Batch batch_from_json(const QJsonObject& input, std::optional<int>* copies = nullptr,
                            std::optional<double>* shelf_life_h = nullptr);

/// Shelf life in hours for a kind of solution: the solvent library's "shelf_life" entry
/// (data/solvents.json) when it has one, else chem::builtin_shelf_life_h. `source` receives where
/// the number comes from.
double default_shelf_life_h(const AppData& data, chem::ShelfKind kind, QString* source = nullptr);

/// A titled list of steps, in order.
struct StepSection {
    QString heading;   ///< "Steps", "Buffer steps", "Line steps"
    QStringList steps; ///< without leading numbers
};

/// The recipe's steps as shown and printed: the designer's, with a degassing step before the
/// labelling step when the designer's steps leave it out.
QStringList recipe_steps(const chem::Recipe& recipe);
/// The steps' sentences, unnumbered (the screen and the sheet number them).
QStringList step_sentences(const std::vector<chem::Step>& steps);

/// A reagent, solvent or line part by the name the screens show ("Potassium dihydrogen
/// phosphate", "Acetonitrile", "Aqueous buffer"); the id itself when unknown.
QString part_display_name(const AppData& data, const std::string& id);

/// An amount check as the screens and the sheet show it: the check and its part's name.
struct BatchCheckRow {
    chem::AmountCheck check;
    QString name; ///< part_display_name of check.reagent
};

/// A warning of the document or the batch: what the screens show of it, and its JSON.
struct BatchWarning {
    QString code;
    QString severity; ///< "info", "caution", "warning"
    QString message;
    QJsonObject json; ///< as the sheet's summary writes it (amount warnings add their numbers)
    /// The typed finding behind it, where the batch made one (device-calibration-due,
    /// expired-lot-override); the amount and pH warnings keep theirs in chem::Warning.
    std::optional<chem::Finding> finding{};
};

/// The batch evaluated against its document, typed: what the Prepare & record screen shows and
/// what the sheet's summary JSON is rendered from (summary_to_json). Needs no sheet.
struct BatchEvaluation {
    /// A recipe's reagents; a line's parts, then its buffer's reagents; none for a sequence.
    std::vector<BatchCheckRow> checks;
    std::optional<double> target_ph;  ///< a recipe's, a line buffer's
    std::optional<double> planned_ph; ///< a recipe: the design's predicted pH
    /// Predicted for the batch as made (a recipe, a line's buffer), mol/L for the last two.
    std::optional<double> ph, ionic_strength_mol_per_l, buffer_capacity_mol_per_l;
    struct Component {
        std::string reagent; ///< id
        double mol_per_l = 0;
    };
    /// The batch's composition: a recipe's, or a line's buffer part's (composition_of_buffer).
    std::vector<Component> composition;
    bool composition_of_buffer = false;
    std::optional<double> final_volume_ml; ///< a recipe: the volume made up to
    std::optional<double> volume_ml;       ///< a line: the volume the sheet is for
    /// The shelf life the summary states, hours (a sequence: its shortest line's, even when
    /// "shelf_life_h" overrides the use-by).
    double shelf_life_h = 0;
    QString end; ///< a sequence: the end of its last injection (contract clock time)
    /// Every warning of the document and the batch, once each, in order.
    std::vector<BatchWarning> warnings;
};

struct BatchDocument {
    QString kind; ///< "recipe", "line", "sequence"
    QString title;
    chem::Batch batch;
    std::optional<int> copies;
    std::optional<double> shelf_override;
    double shelf_life_h = 0;
    QString shelf_source;                      ///< where the shelf life comes from
    std::optional<chem::ShelfKind> shelf_kind; ///< worded by shelf_note_text
    QString expires_at; ///< ISO, "" when unknown (clamped to the lots: chem::use_by)
    /// The index in batch.actual of the lot whose expiry date set expires_at, -1 when none.
    int expiry_limited_by = -1;
    /// That lot in words: "lot PA-88112 of Phosphoric acid, which expires on 2027-01-15"; "".
    QString expiry_limit_text;
    /// Each expired lot used by an approver's override, in words: "Lot SP-1987 of … expired on
    /// 2026-11-30; used by override of Priya Haldane (demo-approve) at 2026-12-02 14:03 UTC:
    /// <reason>" (chem::describe of its expired_lot_override finding, in evaluation.warnings).
    QStringList lot_override_text;

    // recipe: the design and the batch against it; line: the buffer part's.
    std::optional<chem::Recipe> recipe;
    std::optional<chem::BatchResult> result;

    // line
    QJsonObject line_out; ///< the `line` command's result
    std::optional<chem::LineSpec> line_spec;
    std::optional<chem::LineRecipe> line;
    std::vector<chem::AmountCheck> part_checks; ///< one per line item, in its order

    // sequence
    /// The `sequence` command's typed result (one plan: batch_document_kind refuses "plans").
    std::optional<SequenceResult> sequence;

    /// The steps, the same on the screen and on the sheet.
    QList<StepSection> steps;
    /// Every warning of the document and the batch, once each, as JSON (code, severity,
    /// message; amount warnings also reagent, unit, target, actual, deviation_percent).
    QJsonArray warnings;

    /// An entered amount outside its band, or the measured pH outside its tolerance.
    bool out_of_tolerance = false;
    /// Each reason, in the screens' words: "Potassium dihydrogen phosphate: 3.2050 g, +1.4 %
    /// (band 3.098–3.224 g)" (the band with its target's decimals, chem::format_measure_band),
    /// "Measured pH 2.61, +0.11 from the target 2.50 (± 0.05)".
    QStringList out_of_tolerance_reasons;
    /// For out-of-band amounts: what to add, or remake. Absent when every amount is in its band.
    std::optional<chem::Correction> correction;
    /// The correction in words, one instruction a line.
    QStringList correction_text;

    /// Values taken from instruments: the "capture" record of each captured actual amount, by the
    /// reagent (or part) id the check names; and the pH meter's record ({} = typed). See
    /// storage::BatchRecord for the fields.
    QJsonObject captures;
    QJsonObject ph_capture;

    /// The lot that limits the use-by ({reagent, lot, lot_expires_on, text}; {} when none) and
    /// the expired lots used by override ({…the override, reagent, lot, lot_expires_on, text}).
    QJsonObject expires_limited_by;
    QJsonArray lot_overrides;

    /// The evaluation, typed: the screens read it; the summary is rendered from it.
    BatchEvaluation evaluation;

    /// The JSON summary of `phaseplan-cli sheet`: {"document", "title", "batch": {…}, "warnings"}
    /// (summary_to_json of this document).
    QJsonObject summary;
};

/// The JSON summary of `phaseplan-cli sheet` for an evaluated document (what read_batch_document
/// puts in `summary`).
QJsonObject summary_to_json(const AppData& data, const BatchDocument& d);

/// Validates everything and evaluates the batch. Throws chem::Error naming the field (the same
/// fields and messages as the `recipe`, `line` and `sequence` subcommands, plus the batch's).
BatchDocument read_batch_document(const AppData& data, const QJsonObject& input);

/// "from balance BAL-03" / "from pH meter PH-01" for a capture record, "typed" for {}.
QString capture_source_text(const QJsonObject& capture);

/// Throws chem::Error("batch.deviation.note", …) when the batch is out of tolerance and has no
/// deviation note: it may be neither printed nor used without one.
void require_deviation_note(const BatchDocument& doc);

} // namespace phaseplan
