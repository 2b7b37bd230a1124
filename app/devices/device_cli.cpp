#include "devices/device_cli.h"

#include "devices/serial_reader.h"

#include <QJsonArray>
#include <QLocale>

#include <cmath>

namespace phaseplan::devices {

namespace {

QJsonObject formats_json(const FormatLibrary& lib) {
    QJsonArray arr;
    for (const LineFormat& f : lib.formats)
        arr.append(QJsonObject{{"name", f.name},
                               {"quantity", QLatin1String(quantity_name(f.quantity))},
                               {"description", f.description},
                               {"pattern", f.pattern},
                               {"stable_marks", QJsonArray::fromStringList(f.stable_marks)}});
    return QJsonObject{{"formats", arr}};
}

int whole_number(const QString& text, const char* field, int lo, int hi) {
    bool ok = false;
    const int v = text.toInt(&ok);
    if (!ok || v < lo || v > hi)
        throw DeviceError(Fault::bad_setting, field,
                          "\"" + text.toStdString() + "\" is not a whole number from " +
                              std::to_string(lo) + " to " + std::to_string(hi));
    return v;
}

} // namespace

QJsonObject device_command(const QStringList& args, const QString& data_dir) {
    if (args.isEmpty())
        throw chem::Error("device", "give a subcommand: read or formats");
    const QString sub = args.first();
    const FormatLibrary lib =
        load_format_library_file(data_dir + QStringLiteral("/device_formats.json"));
    if (sub == QLatin1String("formats")) {
        if (args.size() > 1)
            throw chem::Error("device", "unexpected argument \"" + args[1].toStdString() +
                                            "\" after formats");
        return formats_json(lib);
    }
    if (sub != QLatin1String("read"))
        throw chem::Error("device",
                          "unknown subcommand \"" + sub.toStdString() + "\" (read or formats)");

    PortSettings port;
    port.port.clear();
    QString format_spec;
    double timeout_s = 10;
    ReadOptions options;
    for (int i = 1; i < args.size(); ++i) {
        const QString a = args[i];
        auto value = [&](const char* field) -> QString {
            if (i + 1 >= args.size())
                throw chem::Error(field, a.toStdString() + " needs a value");
            return args[++i];
        };
        if (a == QLatin1String("--port"))
            port.port = value("port");
        else if (a == QLatin1String("--format"))
            format_spec = value("format");
        else if (a == QLatin1String("--baud"))
            port.baud = whole_number(value("baud"), "baud", 50, 4000000);
        else if (a == QLatin1String("--data-bits"))
            port.data_bits = whole_number(value("data_bits"), "data_bits", 5, 8);
        else if (a == QLatin1String("--parity"))
            port.parity = value("parity");
        else if (a == QLatin1String("--stop-bits"))
            port.stop_bits = value("stop_bits");
        else if (a == QLatin1String("--flow-control"))
            port.flow_control = value("flow_control");
        else if (a == QLatin1String("--unit"))
            options.expect.unit = value("unit");
        else if (a == QLatin1String("--stable-only"))
            options.stable_only = true;
        else if (a == QLatin1String("--timeout-s")) {
            const QString t = value("timeout_s");
            bool ok = false;
            timeout_s = QLocale::c().toDouble(t, &ok);
            // Up to an hour: a wait longer than that is a script waiting on nobody.
            if (!ok || !std::isfinite(timeout_s) || timeout_s <= 0 || timeout_s > 3600)
                throw DeviceError(Fault::bad_setting, "timeout_s",
                                  "\"" + t.toStdString() +
                                      "\" is not a number of seconds above 0 and up to 3600");
        } else {
            throw chem::Error(
                "device", "unknown option \"" + a.toStdString() +
                              "\" (--port, --format, --baud, --timeout-s, --stable-only, --unit, "
                              "--data-bits, --parity, --stop-bits, --flow-control)");
        }
    }
    if (port.port.isEmpty())
        throw DeviceError(Fault::bad_setting, "port", "give the serial port: --port /dev/ttyUSB0");
    if (format_spec.isEmpty())
        throw DeviceError(Fault::bad_format, "format",
                          "give --format with a preset (" +
                              lib.names().join(QStringLiteral(", ")).toStdString() +
                              ") or a regular expression with (?<value>…) and (?<unit>…) groups");
    const LineFormat format = resolve_format(lib, format_spec);
    if (!options.expect.unit.isEmpty()) {
        const QStringList units{"g", "mg", "kg", "pH"};
        if (!units.contains(options.expect.unit))
            throw DeviceError(Fault::bad_setting, "unit",
                              "\"" + options.expect.unit.toStdString() +
                                  "\" is not g, mg, kg or pH");
    }
    options.timeout_ms = static_cast<int>(std::lround(timeout_s * 1000));

    SerialReader reader;
    reader.open(port);
    const Reading r = reader.next_reading(format, lib, options);
    QJsonObject out = r.to_json();
    out["format"] = format.name;
    out["port"] = port.port;
    return out;
}

} // namespace phaseplan::devices
