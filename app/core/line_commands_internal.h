#pragma once
// Small readers and writers shared by the `line` (line_commands.cpp) and `sequence`
// (sequence_commands.cpp) commands. Internal to those two files; not part of the contract.
#include "chem/checks.h"
#include "chem/error.h"
#include "chem/line.h"

#include <QJsonArray>
#include <QJsonObject>
#include <QJsonValue>
#include <QString>

#include <array>
#include <optional>
#include <string>
#include <vector>

namespace phaseplan::line_internal {

QString qs(const std::string& s);
/// A number, or JSON null when absent.
QJsonValue opt(const std::optional<double>& v);
QJsonArray strings(const std::vector<std::string>& v);
/// {"A": …, "B": …} for the lines that are defined.
QJsonObject per_line(const chem::LineValues& v, const std::array<bool, chem::max_lines>& defined);
/// Wraps a chem error of a nested document (fields relative to it) with the document's path.
[[noreturn]] void rethrow_within(const chem::Error& e, const std::string& root);
/// The optional "temperature_c" of `o` (at path `at`), checked against the solver's range.
std::optional<double> optional_temperature_c(const QJsonObject& o, const std::string& at);
/// The optional "detector" of a document at `root`.
std::optional<chem::Detector> detector_from_json(const QJsonObject& doc, const std::string& root);

} // namespace phaseplan::line_internal
