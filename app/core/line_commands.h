#pragma once
// The `line` and `sequence` subcommands (signature of app/core/commands.h) and the JSON readers
// and writers they use, reusable by the GUI and the print sheets.
//
// `line` input: a line plus "volume_ml" (optional "detector", "column"); output
//   {"items": [{"part", "volume_ml", "mass_g", …}], "uv_cutoff_nm", "warnings", …}.
// `sequence` input: {"lines", "methods", "sequence", "prime_ml", "start", "waste_ml",
//   "detector", "column", "standby", "safety_margin"} — or {"plans": [such documents]} for plans
//   over several instruments and days, summed per line recipe in "batches".
// Field names are a fixed contract: extend, rename nothing.
#include "chem/checks.h"
#include "chem/finding_text.h"
#include "chem/line.h"
#include "chem/pressure.h"
#include "chem/sequence.h"
#include "core/commands.h"

#include <QDateTime>
#include <QJsonArray>
#include <QJsonObject>
#include <QVariantMap>

#include <initializer_list>
#include <map>
#include <optional>
#include <string>

namespace phaseplan {

QJsonObject command_line(const AppData& data, const QJsonObject& input, const CommandOptions& opt);
QJsonObject command_sequence(const AppData& data, const QJsonObject& input,
                             const CommandOptions& opt);
/// The CLI's `sequence`: the text QJsonDocument(command_sequence(…)).toJson(Indented) gives,
/// its numbers held to json::check_output, without building the rows as QJsonObjects.
QByteArray command_sequence_text(const AppData& data, const QJsonObject& input,
                                 const CommandOptions& opt);

/// A finding's typed references for the screens (no sentence to parse back):
/// {"subject": {"kind", "id", "other"}, "place": {"kind", "id", "other"}}, the kinds as
/// chem::subject_kind_name gives them ("line", "line-pair", "method", "standby", "none").
QVariantMap finding_references(const chem::Finding& f);
/// The typed result behind command_sequence (sequence_result, to_json) is in
/// core/sequence_result.h.

/// A clock time of the contract: "2026-12-01T18:00:00" (local wall-clock time, no zone: minutes
/// are added without daylight-saving jumps) or with an offset ("…+01:00", kept on output).
struct Clock {
    QDateTime start;
    bool has_offset = false;
    std::function<QString(const QDateTime&)> words; ///< the app's wording; empty: as below
    QString iso(double minutes) const;              ///< "2026-12-02T03:12:30"
    std::string text(double minutes) const;         ///< "2026-12-02 03:12" for messages
};
/// Reagent and solvent names by id, for the checks' messages ("Acetonitrile", not "acetonitrile").
chem::NameLookup library_names(const AppData& data);
/// Reads an ISO date-time; throws chem::Error(path.key, …) when it is not one.
QDateTime datetime_from_json(const QJsonObject& o, const QString& key, const std::string& parent,
                             bool* has_offset);

/// A line of a `line` or `sequence` document.
struct ParsedLine {
    chem::LineSpec spec;
    std::optional<QDateTime> prepared_at;
    double bottle_ml = 0;
    double residue_ml = 0;
    /// Identity of the recipe for batching: the parts and additives in canonical JSON (buffer
    /// volumes left out), or "name:<name>" for a volumes-only line.
    QString recipe_key;
};

/// Parses a line at `path` ("lines.A"). A buffer part is a recipe document, designed with
/// chem::design_recipe for part_volume_ml × its fraction when it gives no volume_ml (or a smaller
/// one than needed). `bottle_required`: sequence lines need bottle_ml.
ParsedLine line_from_json(const AppData& data, const QJsonObject& o, const std::string& path,
                          double volume_ml, bool bottle_required,
                          std::vector<chem::Warning>* notes = nullptr);

/// The `line` command's typed result: the document parsed (line_from_json), the line prepared
/// (chem::prepare_line) and checked (chem::check_line). line_to_json renders it for the CLI; the
/// app's line cards read it directly.
struct LineResult {
    double volume_ml = 0; ///< the volume made, mL
    ParsedLine parsed;
    chem::LineRecipe recipe;
    std::vector<chem::Warning> notes;    ///< the reader's and the buffer design's warnings
    std::vector<chem::Finding> findings; ///< check_line's, worded with `words`
    chem::RenderContext words;
};
/// A line recipe's notes in words (chem::describe over chem/note_text.h), in order.
QJsonArray note_texts(const std::vector<chem::LineNote>& notes,
                      const chem::SolventLibrary& solvents);
/// Parses and computes a `line` document (throws chem::Error naming the field).
LineResult line_result(const AppData& data, const QJsonObject& input);
/// Where the line's shelf life comes from, in words: "set on the line", the shelf-life table's
/// source for its kind, or "" when neither.
QString line_shelf_source(const AppData& data, const LineResult& r);
/// The `line` command's JSON for a computed line.
QJsonObject line_to_json(const AppData& data, const LineResult& r);

/// The pH range of doc["column"] (ph_min, ph_max, temperature_c), or none when it gives neither pH
/// field; both are then required, within pH 0 to 14, ph_min below ph_max.
std::optional<chem::ColumnLimits> column_from_json(const QJsonObject& doc, const std::string& root);
/// A method of the `sequence` document ({"flow_ml_min", "gradient", "run_min",
/// "equilibration_min", and optionally its own "column", read by sequence_pressure}) at `path`
/// ("methods.assay"); values are checked by chem::validate_method.
chem::Method method_from_json(const QJsonObject& o, const std::string& name,
                              const std::string& path);
/// The line percentages of a gradient row or a composition ({"A": 95, "B": 5}); keys other than
/// A–D must be among other_keys (the first is named in the error).
chem::LineValues percent_from_json(const QJsonObject& o, const std::string& path,
                                   std::initializer_list<const char*> other_keys);
/// The eluent pH traces of a sequence's methods: {"<method>": {"temperature_c", "points":
/// [{"t_min", "organic_fraction_v", "ph_s_w", "ph_s_s", "extrapolated"}]}}.
QJsonObject eluent_traces_to_json(const std::vector<chem::EluentTrace>& traces);

/// The JSON form of a check's finding: code, severity, the message (chem::describe with `words`),
/// "line" (the subject's line letters, none for a lone line), the numbers and texts flattened
/// in; "…_at_min" numbers also as clock times ("…_at") when a clock is given.
QJsonObject finding_to_json(const chem::Finding& f, const chem::RenderContext& words,
                            const Clock* clock);

} // namespace phaseplan
