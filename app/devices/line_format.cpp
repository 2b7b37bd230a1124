#include "devices/line_format.h"

#include "core/json_util.h"

#include <QFile>
#include <QJsonArray>
#include <QJsonDocument>
#include <QLocale>
#include <QStringDecoder>

#include <cmath>

namespace phaseplan::devices {

namespace {

/// Control bytes other than tab, DEL, or bytes that are not UTF-8.
bool unreadable(const QByteArray& line) {
    for (unsigned char c : line)
        if ((c < 0x20 && c != '\t') || c == 0x7f)
            return true;
    QStringDecoder dec(QStringDecoder::Utf8, QStringDecoder::Flag::Stateless);
    (void)QString(dec.decode(line));
    return dec.hasError();
}

/// Factor to the base unit and the quantity of a unit the instrument sent; nullopt if unknown.
struct UnitInfo {
    Quantity quantity;
    double to_base;
    const char* base;
};
std::optional<UnitInfo> unit_info(const QString& u) {
    if (u == QLatin1String("g"))
        return UnitInfo{Quantity::mass, 1.0, "g"};
    if (u == QLatin1String("mg"))
        return UnitInfo{Quantity::mass, 1e-3, "g"};
    if (u == QLatin1String("kg"))
        return UnitInfo{Quantity::mass, 1e3, "g"};
    if (u.compare(QLatin1String("pH"), Qt::CaseInsensitive) == 0)
        return UnitInfo{Quantity::ph, 1.0, "pH"};
    return std::nullopt;
}

const char* quantity_words(Quantity q) {
    switch (q) {
    case Quantity::mass:
        return "a mass in g, mg or kg";
    case Quantity::ph:
        return "a pH";
    case Quantity::any:
        return "a mass (g, mg, kg) or a pH";
    }
    return "";
}

std::optional<Quantity> quantity_from_name(const QString& s) {
    if (s == QLatin1String("mass"))
        return Quantity::mass;
    if (s == QLatin1String("ph"))
        return Quantity::ph;
    if (s == QLatin1String("any"))
        return Quantity::any;
    return std::nullopt;
}

std::optional<Fault> fault_from_code(const QString& s) {
    for (Fault f : {Fault::out_of_range, Fault::negative, Fault::no_match, Fault::garbage})
        if (s == QLatin1String(fault_code(f)))
            return f;
    return std::nullopt;
}

QStringList string_list(const QJsonObject& o, const QString& key, const std::string& at) {
    QStringList out;
    if (!o.contains(key))
        return out;
    const QJsonArray a = json::require_array(o, key, at);
    for (int i = 0; i < a.size(); ++i) {
        if (!a[i].isString())
            throw chem::Error(json::path(json::path(at, key), i),
                              json::describe(a[i]) + " is not a string");
        out << a[i].toString();
    }
    return out;
}

} // namespace

const char* quantity_name(Quantity q) {
    switch (q) {
    case Quantity::mass:
        return "mass";
    case Quantity::ph:
        return "ph";
    case Quantity::any:
        return "any";
    }
    return "any";
}

std::string quote_line(const QByteArray& line) {
    std::string out = "\"";
    int shown = 0;
    for (unsigned char c : line) {
        if (++shown > 60) {
            out += "…";
            break;
        }
        if (c == '"' || c == '\\') {
            out += '\\';
            out += static_cast<char>(c);
        } else if (c < 0x20 || c >= 0x7f) {
            char buf[8];
            std::snprintf(buf, sizeof buf, "\\x%02x", c);
            out += buf;
        } else {
            out += static_cast<char>(c);
        }
    }
    return out + "\"";
}

const LineFormat* FormatLibrary::find(const QString& name) const {
    for (const LineFormat& f : formats)
        if (f.name == name)
            return &f;
    return nullptr;
}

QStringList FormatLibrary::names() const {
    QStringList out;
    for (const LineFormat& f : formats)
        out << f.name;
    return out;
}

LineFormat make_format(const QString& name, const QString& pattern, const QStringList& stable_marks,
                       Quantity quantity, const std::string& field) {
    LineFormat f;
    f.name = name;
    f.pattern = pattern;
    f.stable_marks = stable_marks;
    f.quantity = quantity;
    f.regex = QRegularExpression(QRegularExpression::anchoredPattern(pattern));
    if (!f.regex.isValid())
        throw DeviceError(Fault::bad_format, field,
                          "the regular expression \"" + pattern.toStdString() +
                              "\" does not compile: " + f.regex.errorString().toStdString() +
                              " at character " + std::to_string(f.regex.patternErrorOffset()));
    const QStringList groups = f.regex.namedCaptureGroups();
    for (const char* required : {"value", "unit"})
        if (!groups.contains(QLatin1String(required)))
            throw DeviceError(Fault::bad_format, field,
                              "the regular expression \"" + pattern.toStdString() +
                                  "\" has no (?<" + required + ">…) group");
    f.has_stable = groups.contains(QLatin1String("stable"));
    f.regex.optimize();
    return f;
}

namespace {

FormatLibrary load_format_library_unprefixed(const QByteArray& bytes) {
    FormatLibrary lib;
    const QJsonObject root = json::parse_document(bytes);
    const QJsonArray formats = json::require_array(root, QStringLiteral("formats"), "");
    for (int i = 0; i < formats.size(); ++i) {
        const std::string at = json::path("formats", i);
        const QJsonObject o = json::element_object(formats, i, "formats");
        const QString name =
            QString::fromStdString(json::require_string(o, QStringLiteral("name"), at));
        if (lib.find(name))
            throw chem::Error(at + ".name", "\"" + name.toStdString() + "\" is named twice");
        const QString q =
            QString::fromStdString(json::require_string(o, QStringLiteral("quantity"), at));
        const auto quantity = quantity_from_name(q);
        if (!quantity)
            throw chem::Error(at + ".quantity",
                              "\"" + q.toStdString() + "\" is not mass, ph or any");
        LineFormat f = make_format(
            name, QString::fromStdString(json::require_string(o, QStringLiteral("pattern"), at)),
            string_list(o, QStringLiteral("stable_marks"), at), *quantity, at + ".pattern");
        f.description =
            QString::fromStdString(json::require_string(o, QStringLiteral("description"), at));
        f.examples = string_list(o, QStringLiteral("examples"), at);
        lib.formats.push_back(std::move(f));
    }
    const QJsonArray faults = json::require_array(root, QStringLiteral("fault_lines"), "");
    for (int i = 0; i < faults.size(); ++i) {
        const std::string at = json::path("fault_lines", i);
        const QJsonObject o = json::element_object(faults, i, "fault_lines");
        FaultLine fl;
        const QString pattern =
            QString::fromStdString(json::require_string(o, QStringLiteral("pattern"), at));
        fl.regex = QRegularExpression(QRegularExpression::anchoredPattern(pattern));
        if (!fl.regex.isValid())
            throw chem::Error(at + ".pattern",
                              "does not compile: " + fl.regex.errorString().toStdString());
        const QString code =
            QString::fromStdString(json::require_string(o, QStringLiteral("fault"), at));
        const auto fault = fault_from_code(code);
        if (!fault)
            throw chem::Error(at + ".fault",
                              "\"" + code.toStdString() + "\" is not out-of-range or negative");
        fl.fault = *fault;
        fl.meaning = QString::fromStdString(json::require_string(o, QStringLiteral("meaning"), at));
        lib.fault_lines.push_back(std::move(fl));
    }
    return lib;
}

} // namespace

FormatLibrary load_format_library(const QByteArray& bytes, const std::string& origin) {
    try {
        return load_format_library_unprefixed(bytes);
    } catch (const chem::Error& e) {
        // "device_formats.json: formats[2].pattern", as the other data files name their errors.
        throw chem::Error(origin + ": " + e.field(), e.message());
    }
}

FormatLibrary load_format_library_file(const QString& path) {
    QFile f(path);
    if (!f.open(QIODevice::ReadOnly))
        throw chem::Error("device_formats.json", "cannot open \"" + path.toStdString() +
                                                     "\": " + f.errorString().toStdString());
    return load_format_library(f.readAll(), "device_formats.json");
}

LineFormat resolve_format(const FormatLibrary& lib, const QString& spec) {
    if (const LineFormat* f = lib.find(spec))
        return *f;
    if (spec.contains(QLatin1String("(?<")) || spec.contains(QLatin1String("(?P<"))) {
        // An expression given inline: stable when its stable group is empty, S or ST.
        return make_format(QStringLiteral("custom"), spec,
                           {QString(), QStringLiteral("S"), QStringLiteral("ST")}, Quantity::any,
                           "format");
    }
    throw DeviceError(Fault::bad_format, "format",
                      "\"" + spec.toStdString() + "\" is neither a preset (" +
                          lib.names().join(QStringLiteral(", ")).toStdString() +
                          ") nor a regular expression with (?<value>…) and (?<unit>…) groups");
}

QJsonObject Reading::to_json() const {
    QJsonObject o{{"value", value},
                  {"unit", unit},
                  {"stable", stable},
                  {"raw", raw},
                  {"sent_value", sent_value},
                  {"sent_unit", sent_unit},
                  {"received_at", received_at.toString(Qt::ISODateWithMs)}};
    if (!instrument_id.isEmpty())
        o["instrument_id"] = instrument_id;
    if (temperature_c)
        o["temperature_c"] = *temperature_c;
    return o;
}

Reading parse_line(const QByteArray& line, const LineFormat& format, const FormatLibrary& lib,
                   const Expectation& expect) {
    if (unreadable(line))
        throw DeviceError(Fault::garbage, "reading",
                          "unreadable bytes " + quote_line(line) +
                              ": check the baud rate, data bits and parity against the instrument");
    const QString text = QString::fromUtf8(line);
    for (const FaultLine& fl : lib.fault_lines)
        if (fl.regex.match(text).hasMatch())
            throw DeviceError(fl.fault, "reading",
                              "the instrument sent " + quote_line(line) + ": " +
                                  fl.meaning.toStdString());
    const QRegularExpressionMatch m = format.regex.match(text);
    if (!m.hasMatch())
        throw DeviceError(Fault::no_match, "reading",
                          quote_line(line) + " does not match the line format " +
                              format.name.toStdString());

    Reading r;
    r.raw = text;
    r.received_at = QDateTime::currentDateTimeUtc();
    QString number = m.captured(QStringLiteral("value"));
    number.remove(QLatin1Char(' '));
    bool ok = false;
    double v = QLocale::c().toDouble(number, &ok);
    if (!ok || !std::isfinite(v))
        throw DeviceError(Fault::no_match, "reading",
                          "\"" + number.toStdString() + "\" in " + quote_line(line) +
                              " is not a number");
    if (m.captured(QStringLiteral("sign")).trimmed() == QLatin1String("-"))
        v = -v;
    r.sent_value = v;
    r.sent_unit = m.captured(QStringLiteral("unit")).trimmed();
    r.instrument_id = m.captured(QStringLiteral("id")).trimmed();
    const QString temp = m.captured(QStringLiteral("temperature_c")).trimmed();
    if (!temp.isEmpty()) {
        bool tok = false;
        const double t = QLocale::c().toDouble(temp, &tok);
        if (tok && std::isfinite(t))
            r.temperature_c = t;
    }
    r.stable = !format.has_stable ||
               format.stable_marks.contains(m.captured(QStringLiteral("stable")).trimmed());

    const Quantity wanted = expect.quantity != Quantity::any ? expect.quantity : format.quantity;
    const auto info = unit_info(r.sent_unit);
    if (!info || (wanted != Quantity::any && info->quantity != wanted))
        throw DeviceError(Fault::wrong_unit, "unit",
                          "\"" + r.sent_unit.toStdString() + "\" in " + quote_line(line) +
                              " where " +
                              (expect.unit.isEmpty() ? std::string(quantity_words(wanted))
                                                     : expect.unit.toStdString()) +
                              " was expected");
    if (!expect.unit.isEmpty() && expect.unit != r.sent_unit &&
        !(info->quantity == Quantity::ph &&
          expect.unit.compare(r.sent_unit, Qt::CaseInsensitive) == 0))
        throw DeviceError(Fault::wrong_unit, "unit",
                          r.sent_unit.toStdString() + " in " + quote_line(line) + " where " +
                              expect.unit.toStdString() + " was expected: set the instrument to " +
                              expect.unit.toStdString());
    // "-0.0000 g" (a tare that drifted by less than a digit) is zero, not negative.
    if (v == 0)
        v = 0.0;
    r.sent_value = v;
    r.unit = QLatin1String(info->base);
    r.value = v * info->to_base;
    if (r.value < 0)
        throw DeviceError(Fault::negative, "reading",
                          quote_line(line) + " is negative" +
                              (info->quantity == Quantity::mass
                                   ? ": tare the balance and weigh again"
                                   : ": check the electrode and calibration"));
    // pH above 14 is outside what a buffer for HPLC can be and outside most meters' calibrated
    // span (common practice, no source): taken as the meter's overrange.
    if (info->quantity == Quantity::ph && r.value > 14)
        throw DeviceError(Fault::out_of_range, "reading",
                          quote_line(line) +
                              " is above pH 14: check the electrode and calibration");
    return r;
}

} // namespace phaseplan::devices
