#pragma once
// The `pressure` and `transfer` subcommands (signature of app/core/commands.h), and the readers
// and writers of the column and instrument that the `sequence` document shares with them.
//
// `pressure` input: {"lines", "method", "column", "instrument", "step_min"}; output
//   {"trace": [{"t_min", "organic_fraction_v", "viscosity_mpa_s", "pressure_bar", …}],
//    "max_pressure_bar", "max_at_t_min", "plates_estimate", "warnings", …}.
// `transfer` input: {"method", "from", "to", "injection_ul", "sequence_injections", "lines",
//   "instrument"}; output {"method", "injection_ul", "solvent_ml_per_injection": {"from", "to"},
//   "saving_fraction", "l_over_dp_change", "within_allowed_adjustment", "pressure", "warnings", …}.
// Field names are a fixed contract: extend, rename nothing.
#include "chem/finding.h"
#include "chem/pressure.h"
#include "chem/sequence.h"
#include "chem/transfer.h"
#include "core/commands.h"

#include <QJsonArray>
#include <QJsonObject>

#include <array>
#include <optional>
#include <string>
#include <vector>

namespace phaseplan {

QJsonObject command_pressure(const AppData& data, const QJsonObject& input,
                             const CommandOptions& opt);
/// A method as the `sequence` document writes it ({"flow_ml_min", "gradient": [{"t_min", "A",
/// …}], "run_min", "equilibration_min"}), the lines it never uses left out.
QJsonObject method_to_json(const chem::Method& m);
/// The `transfer` command's typed result: the request as read, the method moved
/// (chem::transfer_method) and, when the document gives the lines, the pressure on the new
/// column with its notes (chem::pressure_limit_warning, chem::pressure_notes).
struct TransferCommandResult {
    chem::TransferRequest request;
    chem::TransferResult result;
    std::optional<chem::PressureTrace> pressure;
    std::vector<chem::Finding> pressure_findings;
};
/// Parses and computes a `transfer` document (throws chem::Error naming the field).
TransferCommandResult transfer_result(const AppData& data, const QJsonObject& input);
/// The `transfer` command's JSON for a computed move.
QJsonObject transfer_to_json(const TransferCommandResult& r);
QJsonObject command_transfer(const AppData& data, const QJsonObject& input,
                             const CommandOptions& opt);

/// The column at doc[key] for the pressure, or none when it gives no dimensions (a `sequence`
/// column may carry only its pH range). Once one of length_mm, id_mm, particle_um is given, all
/// three are required. Values are checked by chem::validate_column.
std::optional<chem::Column> pressure_column_from_json(const QJsonObject& doc, const char* key,
                                                      const std::string& root);
/// The instrument at doc["instrument"]; an empty (default) one when absent.
chem::Instrument instrument_from_json(const QJsonObject& doc, const std::string& root);

/// The JSON of a trace: "trace" points plus the peak, limit, plates and basis fields.
QJsonObject pressure_trace_to_json(const chem::PressureTrace& t);

/// The pressure of each method of a `sequence` plan (index as in.methods), for the column and
/// instrument of the document; empty when the document gives no column dimensions. A method that
/// runs a line without a make-up gets none, and an info note says so.
std::vector<std::optional<chem::PressureTrace>>
sequence_pressure(const AppData& data, const QJsonObject& doc, const std::string& root,
                  const chem::SequenceInput& in,
                  const std::array<const chem::LineProfile*, chem::max_lines>& profiles,
                  QJsonArray* notes);

} // namespace phaseplan
