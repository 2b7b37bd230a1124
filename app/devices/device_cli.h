#pragma once
// The `device` subcommands of phaseplan-cli (they take flags, not a JSON document):
//   device read --port PORT --format NAME|REGEX [--baud N] [--timeout-s S] [--stable-only] [--unit
//   U]
//               [--data-bits N] [--parity P] [--stop-bits S] [--flow-control F]
//       waits for one reading and returns {value, unit, stable, raw, …} (Reading::to_json);
//   device formats
//       the presets of data/device_formats.json.
// A wrong option or reading throws chem::Error (a DeviceError for the instrument's faults) whose
// field is the option at fault without its dashes ("port", "format", "baud", "timeout_s") or the
// reading's ("reading", "unit"). The port or the instrument failing (no such port, busy, gone,
// nothing in time) throws a DeviceFailure, whose line is "device: <sentence naming the port>".
// phaseplan-cli prints either as its one error line and exits with status 2.
#include <QJsonObject>
#include <QString>
#include <QStringList>

namespace phaseplan::devices {

/// args: everything after "device" ("read", "--port", …). data_dir: where device_formats.json is.
QJsonObject device_command(const QStringList& args, const QString& data_dir);

} // namespace phaseplan::devices
