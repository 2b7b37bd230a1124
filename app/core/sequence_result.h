#pragma once
// The typed result of the `sequence` command: computed once by sequence_result(), then rendered
// by to_json for the CLI (command_sequence, command_sequence_text) and read field by field by the
// app's plan model. Parse (the document into chem::SequenceInput) → compute (chem::plan_sequence,
// the checks, clock times and batches) → render.
#include "chem/checks.h"
#include "chem/pressure.h"
#include "chem/sequence.h"
#include "chem/solvent.h"
#include "core/line_commands.h"

#include <QDateTime>
#include <QJsonArray>
#include <QJsonObject>
#include <QString>
#include <QStringList>

#include <array>
#include <optional>
#include <vector>

namespace phaseplan {

/// One warning of a plan or of the batches, in the order the CLI writes them.
struct SequenceWarning {
    /// As the CLI writes it: code, severity, message, "line", the numbers flattened in.
    QJsonObject json;
    /// The typed finding: a check's, or the batches' shelf-life (batch_shelf_life); none for the
    /// library's notes, a buffer's warnings and the pressure notes.
    std::optional<chem::Finding> finding;
};

/// A defined line of one plan.
struct SequenceLineResult {
    int index = 0; ///< 0–3 for A–D
    QString name;
    double bottle_ml = 0;  ///< as given
    double residue_ml = 0; ///< as given
    /// The totals: prime_ml, pumped_ml, required_ml, usable_ml, runs_dry, dry_at_min (minutes
    /// from the start), dry_after_injection, spare_ml, min_bottle_ml, suggested_bottle_ml.
    chem::LinePlan plan;
    QString dry_at; ///< the run-dry clock time, ISO as the contract writes it; "" when it lasts
    /// What a line with parts is (chem::profile_line); none for a volumes-only line.
    struct Profile {
        double uv_cutoff_nm = 0;
        std::optional<double> ph;
        std::optional<chem::ShelfKind> shelf_kind;
        double shelf_life_h = 0;
    };
    std::optional<Profile> profile;
    /// The line as parsed (line_from_json: its parts with each buffer part's designed recipe, its
    /// additives) and its whole profile (chem::profile_line; `described` is false for a
    /// volumes-only line): what the sequence sheet prints of the line (its hazards, the label's
    /// composition) without parsing or designing it again.
    chem::LineSpec spec;
    chem::LineProfile line_profile;
    QString letter() const { return QString(QChar(chem::line_letter(index))); }
};

/// A method of one plan.
struct SequenceMethodResult {
    double flow_ml_min = 0;
    chem::MethodPlan plan; ///< name, injection_min, per_injection_ml, pumped_per_injection_ml
    std::optional<chem::PressureTrace> pressure; ///< when the document gives the column
};

/// Where a line's bottle of one plan is used, for the batches (summed per recipe).
struct SequenceBatchUse {
    QString key; ///< ParsedLine::recipe_key
    QString name;
    QString label; ///< "A" or "plans[1].A"
    double required_ml = 0;
    double prepare_ml = 0; ///< this bottle's min_bottle_ml
    QDateTime first_use, last_use;
    double shelf_life_h = 0;
    std::optional<chem::ShelfKind> shelf_kind;
};

/// One batch: the lines that share a recipe, summed.
struct SequenceBatch {
    QString recipe;
    QStringList lines; ///< labels ("A", "plans[1].A")
    double required_ml = 0;
    double prepare_ml = 0;
    double suggested_bottle_ml = 0; ///< 0: larger than any common size
    QDateTime first_use, last_use;
    double span_h = 0;       ///< first to last use, hours
    double shelf_life_h = 0; ///< 0: no shelf life known (a volumes-only line)
    std::optional<chem::ShelfKind> shelf_kind;
};

/// One instrument's night.
struct PlanResult {
    Clock clock;                     ///< the start and the wording of clock times in messages
    QString start, end, standby_end; ///< clock times, ISO as the contract writes them
    double total_min = 0;            ///< start to the end of the last injection
    double standby_min = 0;
    int injections = 0;
    double waste_ml = 0; ///< pumped + priming
    double pumped_ml = 0;
    double prime_ml = 0;
    std::optional<double> waste_capacity_ml;
    std::vector<SequenceLineResult> lines;     ///< the defined lines, A to D
    std::vector<SequenceMethodResult> methods; ///< in the plan's order
    std::vector<chem::RowPlan> rows;           ///< start_min, end_min, volume_ml per line
    std::vector<chem::SequenceRow> row_inputs; ///< method and label of each row
    std::array<bool, chem::max_lines> defined{};
    std::vector<chem::EluentTrace> eluent; ///< one per method run
    std::vector<SequenceWarning> warnings;
    std::vector<SequenceBatchUse> uses;

    /// The line with index 0–3, or null when it is not defined.
    const SequenceLineResult* line(int index) const;
    /// The pressure trace of a method, or null.
    const chem::PressureTrace* pressure(const std::string& method) const;
    /// The last eluent trace of a method (as the JSON keyed by method name keeps it), or null.
    const chem::EluentTrace* eluent_of(const std::string& method) const;
    /// Row i's start and end as the contract writes them ("2026-12-02T03:12:30").
    QString row_start(std::size_t i) const;
    QString row_end(std::size_t i) const;
};

struct SequenceResult {
    bool several = false; ///< a "plans" document
    std::vector<PlanResult> plans;
    std::vector<SequenceBatch> batches;
    /// The batches' warnings of a "plans" document (one plan's are in its own warnings).
    std::vector<SequenceWarning> warnings;
};

/// Parses and computes a `sequence` document (one plan or "plans"). Throws chem::Error naming
/// the field, as command_sequence.
SequenceResult sequence_result(const AppData& data, const QJsonObject& input,
                               const CommandOptions& options);

/// The contract's JSON of a result: what command_sequence returns.
QJsonObject to_json(const SequenceResult& r);

} // namespace phaseplan
