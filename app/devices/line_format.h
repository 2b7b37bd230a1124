#pragma once
// Line formats: how one line of text from a balance or pH meter is read.
//
// A format is a regular expression with named groups, matched against one whole line (the line
// end removed; the expression is anchored at both ends whatever it says):
//   value        required: the number ("12.3456", "0012.35", "-0.002")
//   unit         required: "g", "mg", "kg" or "pH" (checked, and converted: mass to g)
//   stable       optional: the stability mark; the reading is stable when the mark's text is one
//                of the format's stable_marks ("" counts when listed). No group: always stable.
//   sign         optional: a separate sign ("-" makes the value negative)
//   id           optional: the instrument's own id in the line
//   temperature_c optional: a temperature sent with a pH reading, in °C
// The presets ship as editable data in data/device_formats.json, with the fault lines
// ("+OL", "----") that an instrument sends instead of a reading.
#include "devices/device_error.h"

#include <QByteArray>
#include <QDateTime>
#include <QJsonObject>
#include <QRegularExpression>
#include <QString>
#include <QStringList>

#include <optional>
#include <vector>

namespace phaseplan::devices {

/// What a field takes: a mass (base unit g) or a pH.
enum class Quantity { any, mass, ph };
/// "mass", "ph" or "any".
const char* quantity_name(Quantity q);

struct LineFormat {
    QString name; ///< the preset's name, or "custom" for an expression given inline
    QString description;
    QString pattern;          ///< as written (without the added anchors)
    QStringList stable_marks; ///< texts of the stable group that mean "stable"
    Quantity quantity = Quantity::any;
    QStringList examples;     ///< lines the format must read (checked by the tests)
    QRegularExpression regex; ///< the pattern anchored at both ends
    bool has_stable = false;
};

/// A line an instrument sends instead of a reading ("+OL"), from the formats file.
struct FaultLine {
    QRegularExpression regex;
    Fault fault = Fault::out_of_range;
    QString meaning; ///< "over the instrument's range"
};

/// The presets and fault lines of data/device_formats.json.
struct FormatLibrary {
    std::vector<LineFormat> formats;
    std::vector<FaultLine> fault_lines;

    const LineFormat* find(const QString& name) const;
    QStringList names() const;
};

/// Reads data/device_formats.json content. Throws chem::Error naming `origin` and the JSON path
/// ("device_formats.json: formats[2].pattern") on a malformed entry.
FormatLibrary load_format_library(const QByteArray& bytes, const std::string& origin);
/// <data dir>/device_formats.json.
FormatLibrary load_format_library_file(const QString& path);

/// A format from its parts; throws DeviceError(bad_format, field, …) for an expression that does
/// not compile or lacks the value or unit group.
LineFormat make_format(const QString& name, const QString& pattern, const QStringList& stable_marks,
                       Quantity quantity, const std::string& field);

/// `spec` is a preset's name or a regular expression with named groups (recognised by "(?<value>").
/// Throws DeviceError(bad_format, "format", …) naming the presets when it is neither.
LineFormat resolve_format(const FormatLibrary& lib, const QString& spec);

/// One reading, as taken from one line.
struct Reading {
    double value = 0;      ///< in the base unit: g for a mass, pH units for a pH
    QString unit;          ///< "g" or "pH"
    double sent_value = 0; ///< as the instrument sent it
    QString sent_unit;     ///< as the instrument sent it ("mg")
    bool stable = true;
    QString raw;           ///< the line as received, without its line end
    QString instrument_id; ///< from the id group; empty when none
    std::optional<double> temperature_c;
    QDateTime received_at; ///< UTC

    QJsonObject to_json() const;
};

/// What a field expects of a reading.
struct Expectation {
    Quantity quantity = Quantity::any; ///< any: the format's quantity
    QString unit;                      ///< "g", "mg", "kg" or "pH"; empty: any unit of the quantity
};

/// Reads one complete line (bytes without the line end). Throws DeviceError:
///   garbage       control or non-UTF-8 bytes (a wrong baud rate looks like this),
///   out_of_range  a fault line of the library ("+OL", "----"),
///   no_match      readable text the format does not match,
///   negative      a value below zero,
///   wrong_unit    a unit the expectation or the format's quantity refuses.
/// Field: "reading" for the first four, "unit" for the last.
Reading parse_line(const QByteArray& line, const LineFormat& format, const FormatLibrary& lib,
                   const Expectation& expect = {});

/// The line as a quoted string for a message, control and high bytes shown as \xNN, cut at 60.
std::string quote_line(const QByteArray& line);

} // namespace phaseplan::devices
