// The instrument layer without hardware: line formats (every preset), the fault cases of a
// serial line, a burst of readings, device records and their table. Instruments are played by
// pseudo-terminals (tests/fake_instrument.h). Line shapes are "common practice, no source": the
// presets are this project's own definitions (data/device_formats.json), described there.
#include "core/failure.h"
#include "devices/device_store.h"
#include "devices/serial_reader.h"
#include "fake_instrument.h"
#include "test_support.h"

#include <QFile>
#include <QJsonArray>
#include <QRandomGenerator>
#include <QTemporaryDir>
#include <QtTest>

#include <thread>
#include <type_traits>

using namespace phaseplan::devices;
using phaseplan::testing::FakeInstrument;

namespace {

const FormatLibrary& formats() {
    static const FormatLibrary lib =
        load_format_library_file(QStringLiteral(SOURCE_DIR "/data/device_formats.json"));
    return lib;
}

const LineFormat& preset(const char* name) {
    const LineFormat* f = formats().find(QLatin1String(name));
    if (!f)
        qFatal("no preset %s", name);
    return *f;
}

PortSettings port_of(const FakeInstrument& inst) {
    PortSettings p;
    p.port = inst.path();
    return p;
}

/// The input error a call throws (a setting, the format, the reading), or nullopt when it throws
/// none or a port failure instead (said, so that the check of the caller fails with a reason).
template <class F> std::optional<DeviceError> fault_of(F&& f) {
    try {
        f();
    } catch (const DeviceError& e) {
        return e;
    } catch (const DeviceFailure& e) {
        qWarning("a port failure where an input error was expected: %s", e.what());
    }
    return std::nullopt;
}

/// The port or instrument failure a call throws, or nullopt when it throws none or an input error
/// instead (said, as above).
template <class F> std::optional<DeviceFailure> failure_of(F&& f) {
    try {
        f();
    } catch (const DeviceFailure& e) {
        return e;
    } catch (const chem::Error& e) {
        qWarning("an input error where a port failure was expected: %s: %s", e.field().c_str(),
                 e.message().c_str());
    }
    return std::nullopt;
}

Expectation grams() {
    return {Quantity::mass, QStringLiteral("g")};
}

} // namespace

class TestDevices : public QObject {
    Q_OBJECT
  private slots:
    // ---- formats ------------------------------------------------------------------------------
    void everyPresetReadsItsExamples() {
        QVERIFY(formats().formats.size() >= 3);
        for (const char* name : {"number-unit", "flag-number-unit", "ph-temperature"})
            QVERIFY2(formats().find(QLatin1String(name)), name);
        for (const LineFormat& f : formats().formats) {
            QVERIFY2(!f.examples.isEmpty(), qPrintable(f.name));
            QVERIFY2(!f.description.isEmpty(), qPrintable(f.name));
            for (const QString& line : f.examples) {
                try {
                    const Reading r = parse_line(line.toUtf8(), f, formats());
                    QVERIFY(r.value >= 0);
                    QCOMPARE(r.raw, line);
                } catch (const chem::Error& e) {
                    QFAIL(qPrintable(f.name + ": " + line + ": " + e.what()));
                }
            }
        }
    }

    void presetsReadValuesUnitsAndMarks_data() {
        QTest::addColumn<QString>("format");
        QTest::addColumn<QByteArray>("line");
        QTest::addColumn<double>("grams_or_ph");
        QTest::addColumn<QString>("unit");
        QTest::addColumn<bool>("stable");
        QTest::addColumn<QString>("id");
        QTest::addColumn<double>("temperature_c"); // NaN: none sent
        const double none = std::nan("");
        // Conversions: 1 mg = 1e-3 g, 1 kg = 1e3 g (SI prefixes, BIPM SI Brochure).
        QTest::newRow("number-unit, padded")
            << "number-unit" << QByteArray("    3.1610 g") << 3.161 << "g" << true << "" << none;
        QTest::newRow("number-unit, signed, zeros")
            << "number-unit" << QByteArray("+0012.35 g") << 12.35 << "g" << true << "" << none;
        QTest::newRow("number-unit, kg to g")
            << "number-unit" << QByteArray("0.0025 kg") << 2.5 << "g" << true << "" << none;
        QTest::newRow("number-unit, mg to g")
            << "number-unit" << QByteArray("250.0 mg") << 0.25 << "g" << true << "" << none;
        QTest::newRow("number-unit, unsettled")
            << "number-unit" << QByteArray("  3.1612 g ?") << 3.1612 << "g" << false << "" << none;
        QTest::newRow("number-unit, minus zero")
            << "number-unit" << QByteArray("-0.0000 g") << 0.0 << "g" << true << "" << none;
        QTest::newRow("number-unit, pH")
            << "number-unit" << QByteArray("7.02 pH") << 7.02 << "pH" << true << "" << none;
        QTest::newRow("flag, echo S settled")
            << "flag-number-unit" << QByteArray("S S      3.1610 g") << 3.161 << "g" << true << ""
            << none;
        QTest::newRow("flag, echo S moving")
            << "flag-number-unit" << QByteArray("S D      3.1598 g") << 3.1598 << "g" << false << ""
            << none;
        QTest::newRow("flag, ST comma") << "flag-number-unit" << QByteArray("ST,+00003.1610  g")
                                        << 3.161 << "g" << true << "" << none;
        QTest::newRow("flag, US comma") << "flag-number-unit" << QByteArray("US,+00003.1598  g")
                                        << 3.1598 << "g" << false << "" << none;
        QTest::newRow("flag, no echo, mg") << "flag-number-unit" << QByteArray("S 250.02 mg")
                                           << 0.25002 << "g" << true << "" << none;
        QTest::newRow("id-flag") << "id-flag-number-unit" << QByteArray("BAL-03 ST +3.1610 g")
                                 << 3.161 << "g" << true << "BAL-03" << none;
        QTest::newRow("id-flag, commas, moving")
            << "id-flag-number-unit" << QByteArray("BAL-03,US,+3.1590,g") << 3.159 << "g" << false
            << "BAL-03" << none;
        QTest::newRow("ph-temperature °C") << "ph-temperature"
                                           << QByteArray("7.012 pH 25.1 \xc2\xb0"
                                                         "C")
                                           << 7.012 << "pH" << true << "" << 25.1;
        QTest::newRow("ph-temperature comma C")
            << "ph-temperature" << QByteArray("4.005 pH, 24.8 C") << 4.005 << "pH" << true << ""
            << 24.8;
        QTest::newRow("ph-temperature label, drifting")
            << "ph-temperature" << QByteArray("pH: 2.51 pH; 22.0 deg C ?") << 2.51 << "pH" << false
            << "" << 22.0;
    }
    void presetsReadValuesUnitsAndMarks() {
        QFETCH(QString, format);
        QFETCH(QByteArray, line);
        QFETCH(double, grams_or_ph);
        QFETCH(QString, unit);
        QFETCH(bool, stable);
        QFETCH(QString, id);
        QFETCH(double, temperature_c);
        const Reading r = parse_line(line, *formats().find(format), formats());
        QVERIFY2(std::abs(r.value - grams_or_ph) < 1e-12,
                 qPrintable(QString::number(r.value, 'g', 17)));
        QVERIFY(!std::signbit(r.value));
        QCOMPARE(r.unit, unit);
        QCOMPARE(r.stable, stable);
        QCOMPARE(r.instrument_id, id);
        QCOMPARE(r.temperature_c.has_value(), !std::isnan(temperature_c));
        if (r.temperature_c)
            QCOMPARE(*r.temperature_c, temperature_c);
        QCOMPARE(r.raw, QString::fromUtf8(line));
    }

    void faultLinesAndBadReadings_data() {
        QTest::addColumn<QString>("format");
        QTest::addColumn<QByteArray>("line");
        QTest::addColumn<int>("fault");
        QTest::addColumn<QString>("field");
        QTest::addColumn<QString>("contains");
        const int oor = int(Fault::out_of_range);
        QTest::newRow("+OL") << "number-unit" << QByteArray("+OL") << oor << "reading"
                             << "overload";
        QTest::newRow("flag +OL") << "flag-number-unit" << QByteArray("ST,+OL") << oor << "reading"
                                  << "overload";
        QTest::newRow("-OL") << "flag-number-unit" << QByteArray("S -OL g") << oor << "reading"
                             << "underload";
        QTest::newRow("----") << "number-unit" << QByteArray("----") << oor << "reading"
                              << "dashes";
        QTest::newRow("flag ------ g")
            << "flag-number-unit" << QByteArray("S D  ------ g") << oor << "reading"
            << "dashes";
        QTest::newRow("error code") << "ph-temperature" << QByteArray("Err 03") << oor << "reading"
                                    << "error code";
        QTest::newRow("pH above 14")
            << "ph-temperature" << QByteArray("15.20 pH 25.0 C") << oor << "reading"
            << "above pH 14";
        QTest::newRow("negative weight") << "flag-number-unit" << QByteArray("S S     -0.0012 g")
                                         << int(Fault::negative) << "reading"
                                         << "tare";
        QTest::newRow("negative, number-unit")
            << "number-unit" << QByteArray("-12.5 g") << int(Fault::negative) << "reading"
            << "negative";
        QTest::newRow("mg where g expected")
            << "flag-number-unit" << QByteArray("S S 3161.0 mg") << int(Fault::wrong_unit) << "unit"
            << "mg in \"S S 3161.0 mg\" where g was expected";
        QTest::newRow("mV from the meter")
            << "ph-temperature" << QByteArray("-12.3 mV 25.0 C") << int(Fault::wrong_unit) << "unit"
            << "\"mV\"";
        QTest::newRow("unknown unit")
            << "number-unit" << QByteArray("3.1610 oz") << int(Fault::wrong_unit) << "unit"
            << "\"oz\"";
        QTest::newRow("text that is no reading")
            << "flag-number-unit" << QByteArray("READY") << int(Fault::no_match) << "reading"
            << "does not match the line format flag-number-unit";
        QTest::newRow("wrong baud") << "number-unit" << QByteArray("\xf3\x1c\x8a\xe1\x99")
                                    << int(Fault::garbage) << "reading"
                                    << "baud rate";
        QTest::newRow("NUL in a line") << "number-unit"
                                       << QByteArray("3.16\0"
                                                     "10 g",
                                                     9)
                                       << int(Fault::garbage) << "reading"
                                       << "\\x00";
    }
    void faultLinesAndBadReadings() {
        QFETCH(QString, format);
        QFETCH(QByteArray, line);
        QFETCH(int, fault);
        QFETCH(QString, field);
        QFETCH(QString, contains);
        const LineFormat& f = *formats().find(format);
        // A balance field expects g, the meter's a pH (the device record's expectation).
        const Expectation expect = f.quantity == Quantity::ph ? Expectation{Quantity::ph, "pH"}
                                   : format == "number-unit"  ? Expectation{Quantity::mass, "g"}
                                                              : grams();
        const auto e = fault_of([&] { parse_line(line, f, formats(), expect); });
        QVERIFY2(e, line.constData());
        QCOMPARE(int(e->fault()), fault);
        QCOMPARE(QString::fromStdString(e->field()), field);
        QVERIFY2(QString::fromStdString(e->message()).contains(contains), e->what());
    }

    void expectationRefusesAnotherQuantity() {
        // number-unit reads both; the field decides.
        auto e = fault_of([] { parse_line("7.02 pH", preset("number-unit"), formats(), grams()); });
        QVERIFY(e && e->fault() == Fault::wrong_unit);
        e = fault_of([] {
            parse_line("3.1 g", preset("number-unit"), formats(), {Quantity::ph, "pH"});
        });
        QVERIFY(e && e->fault() == Fault::wrong_unit);
        // Without a unit set, any mass unit is converted.
        QCOMPARE(
            parse_line("3161 mg", preset("number-unit"), formats(), {Quantity::mass, {}}).value,
            3.161);
    }

    void customExpressions() {
        const LineFormat f =
            resolve_format(formats(), R"(W=(?<value>\d+\.\d+)(?<unit>g)(?<stable>[*]?))");
        QCOMPARE(f.name, QString("custom"));
        Reading r = parse_line("W=1.2500g", f, formats());
        QCOMPARE(r.value, 1.25);
        QVERIFY(r.stable); // an empty stable group counts as settled for an inline expression
        r = parse_line("W=1.2500g*", f, formats());
        QVERIFY(!r.stable);
        // Anchored at both ends whatever the expression says.
        auto e = fault_of([&] { parse_line("xW=1.2500g", f, formats()); });
        QVERIFY(e && e->fault() == Fault::no_match);
        e = fault_of([] { resolve_format(formats(), "(?<value>[0-9"); });
        QVERIFY(e && e->fault() == Fault::bad_format && e->field() == "format");
        e = fault_of([] { resolve_format(formats(), R"((?<value>\d+) g)"); });
        QVERIFY(e && QString::fromStdString(e->message()).contains("(?<unit>"));
        e = fault_of([] { resolve_format(formats(), "grams"); });
        QVERIFY(e &&
                QString::fromStdString(e->message()).contains("number-unit, flag-number-unit"));
    }

    void formatsFileErrorsNameTheEntry() {
        auto field_of = [](const char* json) -> std::string {
            try {
                load_format_library(json, "device_formats.json");
            } catch (const chem::Error& e) {
                return e.field();
            }
            return "(none)";
        };
        QCOMPARE(
            field_of(
                R"J({"formats": [{"name": "a", "quantity": "mass", "description": "d", "pattern": "(?<value>\\d+)"}], "fault_lines": []})J"),
            std::string("device_formats.json: formats[0].pattern"));
        QCOMPARE(
            field_of(
                R"({"formats": [{"name": "a", "quantity": "volume", "description": "d", "pattern": "x"}], "fault_lines": []})"),
            std::string("device_formats.json: formats[0].quantity"));
        QCOMPARE(
            field_of(
                R"({"formats": [], "fault_lines": [{"pattern": "OL", "fault": "sometimes", "meaning": "m"}]})"),
            std::string("device_formats.json: fault_lines[0].fault"));
    }

    void randomLinesGiveAReadingOrADeviceError() {
        // 20,000 lines of random bytes and of reading-like text with random edits, fixed seed:
        // each gives a finite, non-negative reading or a DeviceError, never anything else.
        QRandomGenerator rng(20261202);
        const QByteArray alphabet =
            "0123456789.+- gmkpHSTDU,;?*\xb0\xc2OLE-rC\r\t"; // NUL and 0xff come with the random
                                                             // lines
        int readings = 0, faults = 0;
        for (int i = 0; i < 20000; ++i) {
            const LineFormat& f = formats().formats[size_t(i) % formats().formats.size()];
            QByteArray line = f.examples[i % f.examples.size()].toUtf8();
            if (i % 2 == 0) {
                line = QByteArray(int(rng.bounded(40)), '\0');
                for (char& c : line)
                    c = char(rng.bounded(256));
            } else {
                for (int k = 0, n = int(rng.bounded(4)); k < n && !line.isEmpty(); ++k)
                    line[int(rng.bounded(line.size()))] =
                        alphabet[int(rng.bounded(alphabet.size()))];
            }
            try {
                const Reading r = parse_line(line, f, formats());
                QVERIFY2(std::isfinite(r.value) && r.value >= 0, line.toHex().constData());
                QVERIFY(r.unit == "g" || r.unit == "pH");
                ++readings;
            } catch (const DeviceError&) {
                ++faults;
            } catch (const std::exception& e) {
                QFAIL(qPrintable(QString("%1: %2").arg(QString(line.toHex()), e.what())));
            }
        }
        QVERIFY(readings > 0 && faults > 0);
    }

    // ---- the line ---------------------------------------------------------------------------
    void assemblerJoinsSplitLinesAndTakesTheFirst() {
        LineAssembler a;
        a.feed("S S   3.1");
        QVERIFY(!a.take_line());
        a.feed("610 g\r");
        QCOMPARE(a.take_line().value(), QByteArray("S S   3.1610 g"));
        a.feed(
            "\nS S 1.0000 g\r\nS S 2.0000 g\r\n"); // the LF of the previous CR LF, then two lines
        QCOMPARE(a.take_line().value(), QByteArray("S S 1.0000 g"));
        QCOMPARE(a.take_line().value(), QByteArray("S S 2.0000 g"));
        QVERIFY(!a.take_line());
        a.feed(QByteArray(300, '\x95'));
        const auto e = fault_of([&] { a.take_line(); });
        QVERIFY(e && e->fault() == Fault::garbage);
        QVERIFY(a.pending().isEmpty()); // the junk is dropped, the next line reads
        a.feed("S S 4.0000 g\n");
        QCOMPARE(a.take_line().value(), QByteArray("S S 4.0000 g"));
    }

    void readsFromAPort() {
        FakeInstrument bal;
        QVERIFY(bal.send("S S      3.1610 g\r\n"));
        SerialReader reader;
        reader.open(port_of(bal));
        const Reading r =
            reader.next_reading(preset("flag-number-unit"), formats(), {2000, false, grams(), {}});
        QCOMPARE(r.value, 3.161);
        QCOMPARE(r.raw, QString("S S      3.1610 g"));
        QVERIFY(r.received_at.isValid());
    }

    void everyPresetThroughAPort() {
        for (const LineFormat& f : formats().formats) {
            FakeInstrument inst;
            QByteArray all;
            for (const QString& line : f.examples)
                all += line.toUtf8() + "\r\n";
            QVERIFY(inst.send(all));
            SerialReader reader;
            reader.open(port_of(inst));
            for (const QString& line : f.examples)
                QCOMPARE(reader.next_reading(f, formats(), {2000, false, {}, {}}).raw, line);
        }
    }

    void twoLinesAtOnceTakeTheFirstAndKeepTheSecond() {
        FakeInstrument bal;
        QVERIFY(bal.send("S S 1.0000 g\r\nS S 2.0000 g\r\n"));
        SerialReader reader;
        reader.open(port_of(bal));
        const ReadOptions o{2000, false, grams(), {}};
        QCOMPARE(reader.next_reading(preset("flag-number-unit"), formats(), o).value, 1.0);
        QCOMPARE(reader.next_reading(preset("flag-number-unit"), formats(), o).value, 2.0);
    }

    void splitLineIsJoinedAcrossReads() {
        FakeInstrument bal;
        SerialReader reader;
        reader.open(port_of(bal));
        QVERIFY(bal.send("S S   3.1"));
        // The first half alone is no reading: the wait ends without one and keeps the half.
        auto e = failure_of([&] { reader.next_line(200); });
        QVERIFY(e && e->fault() == Fault::timeout);
        QVERIFY2(QString::fromStdString(e->sentence()).contains("received \"S S   3.1\""),
                 e->what());
        QVERIFY(bal.send("610 g\r\n"));
        QCOMPARE(reader.next_line(2000), QByteArray("S S   3.1610 g"));
    }

    void unstableReadingsAreReportedNotTaken() {
        FakeInstrument bal;
        QVERIFY(bal.send("S D      3.1598 g\r\nS D      3.1605 g\r\nS S      3.1610 g\r\n"));
        SerialReader reader;
        reader.open(port_of(bal));
        QList<double> seen;
        ReadOptions o{2000, true, grams(), [&](const Reading& r) { seen << r.value; }};
        const Reading r = reader.next_reading(preset("flag-number-unit"), formats(), o);
        QCOMPARE(r.value, 3.161);
        QVERIFY(r.stable);
        QCOMPARE(seen, (QList<double>{3.1598, 3.1605}));
        // Without stable_only the unsettled reading is returned, marked.
        QVERIFY(bal.send("S D      3.1598 g\r\n"));
        o.stable_only = false;
        const Reading u = reader.next_reading(preset("flag-number-unit"), formats(), o);
        QVERIFY(!u.stable);
    }

    void portMissing() {
        SerialReader reader;
        PortSettings p;
        p.port = QStringLiteral("/dev/phaseplan-no-such-port");
        const auto e = failure_of([&] { reader.open(p); });
        QVERIFY(e && e->fault() == Fault::port_missing && e->port() == p.port.toStdString());
        // The command-line tool's line names the device and the port as given.
        QVERIFY2(e->line().rfind("device: /dev/phaseplan-no-such-port does not exist", 0) == 0,
                 e->what());
        // A bare name (looked up under /dev) is said as typed, then as the device file.
        p.port = QStringLiteral("phaseplan-no-such-port");
        const auto bare = failure_of([&] { reader.open(p); });
        QVERIFY(bare && bare->port() == "phaseplan-no-such-port");
        QVERIFY2(QString::fromStdString(bare->sentence())
                     .startsWith("phaseplan-no-such-port (/dev/phaseplan-no-such-port) does not "
                                 "exist"),
                 bare->what());
    }

    void portBusy() {
        FakeInstrument bal;
        SerialReader first;
        first.open(port_of(bal));
        SerialReader second;
        const auto e = failure_of([&] { second.open(port_of(bal)); });
        QVERIFY(e);
        QCOMPARE(int(e->fault()), int(Fault::port_busy));
        QVERIFY(QString::fromStdString(e->sentence()).contains(bal.path() + " is in use"));
        // The first holder still reads.
        QVERIFY(bal.send("S S 5.0000 g\r\n"));
        QCOMPARE(
            first.next_reading(preset("flag-number-unit"), formats(), {2000, false, grams(), {}})
                .value,
            5.0);
    }

    void notASerialPort() {
        SerialReader reader;
        PortSettings p;
        p.port = QStringLiteral("/dev/null");
        const auto e = failure_of([&] { reader.open(p); });
        QVERIFY(e && e->fault() == Fault::port_failed);
        QVERIFY2(QString::fromStdString(e->sentence()).startsWith("/dev/null cannot be opened"),
                 e->what());
    }

    void badSettingsNameTheField() {
        PortSettings p;
        p.port = "/dev/ttyUSB0";
        p.baud = 0;
        auto e = fault_of([&] { p.validate("devices[0]"); });
        QVERIFY(e && e->field() == "devices[0].baud" && e->fault() == Fault::bad_setting);
        p.baud = 9600;
        p.parity = "odd-ish";
        e = fault_of([&] { p.validate(); });
        QVERIFY(e && e->field() == "parity");
        QVERIFY(QString::fromStdString(e->message()).contains("odd-ish"));
    }

    void deviceGoneMidLine() {
        FakeInstrument bal;
        SerialReader reader;
        reader.open(port_of(bal));
        QVERIFY(bal.send("S S 1.0000 g\r\nS S   3.16"));
        QCOMPARE(
            reader.next_reading(preset("flag-number-unit"), formats(), {2000, false, grams(), {}})
                .value,
            1.0);
        bal.unplug();
        const auto e = failure_of([&] {
            reader.next_reading(preset("flag-number-unit"), formats(), {2000, false, grams(), {}});
        });
        QVERIFY(e);
        QCOMPARE(int(e->fault()), int(Fault::disconnected));
        QCOMPARE(e->port(), bal.path().toStdString());
        QVERIFY2(QString::fromStdString(e->sentence())
                     .startsWith("the instrument on " + bal.path() + " went away"),
                 e->what());
        QVERIFY2(QString::fromStdString(e->sentence()).contains("received \"S S   3.16\""),
                 e->what());
        // It stays gone: no half-line is ever turned into a reading.
        const auto again = failure_of([&] { reader.next_line(500); });
        QVERIFY(again && again->fault() == Fault::disconnected);
    }

    void lineAlreadyReceivedIsTakenBeforeTheUnplugIsReported() {
        FakeInstrument bal;
        SerialReader reader;
        reader.open(port_of(bal));
        // Both lines are in the line's queue before the first read, so one read takes both.
        QVERIFY(bal.send("S S 2.5000 g\r\nS S 2.6000 g\r\n"));
        const ReadOptions o{2000, false, grams(), {}};
        QCOMPARE(reader.next_reading(preset("flag-number-unit"), formats(), o).value, 2.5);
        bal.unplug();
        QCOMPARE(reader.next_reading(preset("flag-number-unit"), formats(), o).value, 2.6);
        const auto e =
            failure_of([&] { reader.next_reading(preset("flag-number-unit"), formats(), o); });
        QVERIFY(e && e->fault() == Fault::disconnected);
        QVERIFY2(QString::fromStdString(e->sentence()).contains("nothing of a line received"),
                 e->what());
    }

    void garbageFromAWrongBaudRate() {
        FakeInstrument bal;
        SerialReader reader;
        reader.open(port_of(bal));
        // What 9600 8N1 text looks like when read at another rate: high bytes, no line end.
        QByteArray junk;
        for (int i = 0; i < 400; ++i)
            junk += char(0x80 | ((i * 37) & 0x7f));
        QVERIFY(bal.send(junk));
        auto e = fault_of([&] { reader.next_line(2000); });
        QVERIFY(e && e->fault() == Fault::garbage && e->field() == "reading");
        QVERIFY(QString::fromStdString(e->message()).contains("baud rate"));
        // With line ends it is still refused, line by line.
        QVERIFY(bal.send("\xf3\x1c\x8a\xe1\r\n"));
        e = fault_of([&] {
            reader.next_reading(preset("number-unit"), formats(), {2000, false, grams(), {}});
        });
        QVERIFY(e && e->fault() == Fault::garbage);
    }

    void overloadAndNegativeThroughAPort() {
        FakeInstrument bal;
        SerialReader reader;
        reader.open(port_of(bal));
        QVERIFY(bal.send("ST,+OL\r\nS S ----\r\nS S    -0.0040 g\r\nS S 3161.0 mg\r\n"));
        const ReadOptions o{2000, false, grams(), {}};
        const Fault expected[] = {Fault::out_of_range, Fault::out_of_range, Fault::negative,
                                  Fault::wrong_unit};
        for (Fault f : expected) {
            const auto e =
                fault_of([&] { reader.next_reading(preset("flag-number-unit"), formats(), o); });
            QVERIFY(e);
            QCOMPARE(int(e->fault()), int(f));
        }
    }

    void timeoutWhenNothingComes() {
        FakeInstrument bal;
        SerialReader reader;
        reader.open(port_of(bal));
        const auto e = failure_of([&] {
            reader.next_reading(preset("flag-number-unit"), formats(), {300, true, grams(), {}});
        });
        QVERIFY(e && e->fault() == Fault::timeout && e->port() == bal.path().toStdString());
        QVERIFY2(QString::fromStdString(e->sentence())
                     .startsWith("no stable reading from " + bal.path() + " within 0.3 s"),
                 e->what());
    }

    // The split of issue 10 ("a separate app error covers failures that are not about input"):
    // a timeout is the instrument's silence, not a wrong input, so it must come as a
    // phaseplan::Failure of Kind::device and never as a chem::Error naming a field. This fails
    // if a timeout is thrown as an input error again.
    void timeoutIsAFailureNotAnInputError() {
        static_assert(!std::is_base_of_v<chem::Error, DeviceFailure>);
        static_assert(std::is_base_of_v<phaseplan::Failure, DeviceFailure>);
        FakeInstrument bal;
        SerialReader reader;
        reader.open(port_of(bal));
        bool failure = false;
        try {
            reader.next_reading(preset("flag-number-unit"), formats(), {200, false, grams(), {}});
        } catch (const chem::Error& e) {
            QFAIL(qPrintable(
                QStringLiteral("a timeout reported as an input error: %1: %2")
                    .arg(QString::fromStdString(e.field()), QString::fromStdString(e.message()))));
        } catch (const phaseplan::Failure& f) {
            failure = true;
            QCOMPARE(int(f.kind()), int(phaseplan::Failure::Kind::device));
            QCOMPARE(f.subject(), "device");
            const auto* df = dynamic_cast<const DeviceFailure*>(&f);
            QVERIFY(df);
            QCOMPARE(int(df->fault()), int(Fault::timeout));
            QCOMPARE(QString(fault_code(df->fault())), QString("timeout"));
            QVERIFY2(QString::fromStdString(f.line()).startsWith("device: no reading from " +
                                                                 bal.path() + " within 0.2 s"),
                     f.what());
        }
        QVERIFY(failure);
    }

    // Which faults are the port's (a Failure) and which are about what was given or read (an
    // input error): the README's fault table, Instruments section (this project's contract).
    void portFaultsAreTheFailures() {
        const Fault port[] = {Fault::port_missing, Fault::port_busy, Fault::port_failed,
                              Fault::disconnected, Fault::timeout};
        const Fault input[] = {Fault::garbage,    Fault::no_match,   Fault::out_of_range,
                               Fault::negative,   Fault::wrong_unit, Fault::bad_format,
                               Fault::bad_setting};
        for (Fault f : port)
            QVERIFY2(is_port_fault(f), fault_code(f));
        for (Fault f : input)
            QVERIFY2(!is_port_fault(f), fault_code(f));
    }

    void burstOfAThousandReadings() {
        FakeInstrument bal;
        SerialReader reader;
        reader.open(port_of(bal));
        constexpr int n = 1000;
        // Written in pieces of 1 to 97 bytes, so lines are split across reads and several lines
        // arrive in one read; the writer blocks whenever the line's buffer is full.
        std::thread writer([&bal] {
            QByteArray all;
            for (int i = 0; i < n; ++i)
                all += QStringLiteral("S S %1.%2 g\r\n")
                           .arg(i)
                           .arg(i % 10000, 4, 10, QLatin1Char('0'))
                           .toLatin1();
            qsizetype at = 0;
            int k = 0;
            while (at < all.size()) {
                const qsizetype len = std::min<qsizetype>(1 + (k++ * 31) % 97, all.size() - at);
                bal.send(all.mid(at, len));
                at += len;
            }
        });
        QList<double> got;
        try {
            for (int i = 0; i < n; ++i)
                got << reader
                           .next_reading(preset("flag-number-unit"), formats(),
                                         {10000, false, grams(), {}})
                           .value;
        } catch (const chem::Error& e) {
            writer.join();
            QFAIL(e.what());
        }
        writer.join();
        QCOMPARE(got.size(), n);
        for (int i = 0; i < n; ++i) {
            const double expected =
                QStringLiteral("%1.%2").arg(i).arg(i % 10000, 4, 10, QLatin1Char('0')).toDouble();
            if (got[i] != expected)
                QFAIL(qPrintable(QStringLiteral("reading %1: %2, expected %3")
                                     .arg(i)
                                     .arg(got[i])
                                     .arg(expected)));
        }
        // Nothing more is waiting: no reading was duplicated.
        const auto e = failure_of([&] { reader.next_line(200); });
        QVERIFY(e && e->fault() == Fault::timeout);
    }

    // ---- records ----------------------------------------------------------------------------
    void demoDevicesLoadAndStore() {
        QFile f(SOURCE_DIR "/data/demo/devices.json");
        QVERIFY(f.open(QIODevice::ReadOnly));
        const QByteArray bytes = f.readAll();
        QTemporaryDir dir;
        phaseplan::storage::Database db(dir.filePath("lab.sqlite"));
        DeviceStore store(db);
        QCOMPARE(store.import_json(bytes, "devices.json", &formats()), 3);
        const auto all = store.list();
        QCOMPARE(all.size(), size_t(3));
        const auto bal = store.load("BAL-03");
        QVERIFY(bal);
        QCOMPARE(bal->kind, DeviceKind::balance);
        QCOMPARE(bal->port.baud, 9600);
        QCOMPARE(bal->format, QString("flag-number-unit"));
        QCOMPARE(bal->calibration_due, QDate(2027, 3, 31));
        const auto bal5 = store.load("BAL-05");
        QCOMPARE(bal5->port.data_bits, 7);
        QCOMPARE(bal5->port.parity, QString("even"));
        QCOMPARE(store.list(DeviceKind::ph_meter).size(), size_t(1));
        // Round trip through JSON is exact.
        QCOMPARE(DeviceRecord::from_json(bal->to_json(), "d").to_json(), bal->to_json());
        // Edit and remove.
        DeviceRecord edited = *bal;
        edited.port.port = "/dev/ttyUSB9";
        store.save(edited);
        QCOMPARE(store.load("BAL-03")->port.port, QString("/dev/ttyUSB9"));
        QVERIFY(store.remove("BAL-05"));
        QVERIFY(!store.load("BAL-05"));
        QVERIFY(!store.remove("BAL-05"));
    }

    void calibrationDueGivesACaution() {
        const auto devices = devices_from_json(
            R"({"devices": [{"id": "PHM-01", "kind": "ph_meter", "port": "/dev/ttyUSB1", "format": "ph-temperature", "calibration_due": "2026-11-30"}]})",
            "devices.json", &formats());
        const DeviceRecord& m = devices.front();
        QCOMPARE(m.unit, QString("pH"));
        QVERIFY(!calibration_caution(m, QDate(2026, 11, 29)));
        const auto due_today = calibration_caution(m, QDate(2026, 11, 30));
        QVERIFY(due_today);
        const auto c = calibration_caution(m, QDate(2026, 12, 2));
        QVERIFY(c);
        QCOMPARE((*c)["code"].toString(), QString("device-calibration-due"));
        QCOMPARE((*c)["severity"].toString(), QString("caution"));
        QVERIFY((*c)["message"].toString().contains(
            "pH meter PHM-01 was due for calibration on 2026-11-30"));
        DeviceRecord undated = m;
        undated.calibration_due = QDate();
        QVERIFY(!calibration_caution(undated, QDate(2030, 1, 1)));
    }

    void badRecordsNameTheField_data() {
        QTest::addColumn<QByteArray>("json");
        QTest::addColumn<QString>("field");
        QTest::addColumn<QString>("contains");
        auto rec = [](const char* extra) {
            return QByteArray(
                       R"({"devices": [{"id": "B1", "kind": "balance", "port": "/dev/ttyUSB0", "format": "number-unit")") +
                   extra + "}]}";
        };
        QTest::newRow("kind")
            << QByteArray(
                   R"({"devices": [{"id": "B1", "kind": "scale", "port": "p", "format": "number-unit"}]})")
            << "devices.json: devices[0].kind"
            << "scale";
        QTest::newRow("baud") << rec(R"(, "baud": 0)") << "devices.json: devices[0].baud"
                              << "0";
        QTest::newRow("parity") << rec(R"(, "parity": "odd-ish")")
                                << "devices.json: devices[0].parity"
                                << "odd-ish";
        QTest::newRow("stop bits")
            << rec(R"(, "stop_bits": 3)") << "devices.json: devices[0].stop_bits"
            << "3";
        QTest::newRow("flow") << rec(R"(, "flow_control": "xon")")
                              << "devices.json: devices[0].flow_control"
                              << "xon";
        QTest::newRow("date") << rec(R"(, "calibration_due": "2027-13-01")")
                              << "devices.json: devices[0].calibration_due"
                              << "2027-13-01";
        QTest::newRow("unit") << rec(R"(, "unit": "pH")") << "devices.json: devices[0].unit"
                              << "pH";
        QTest::newRow("format")
            << QByteArray(
                   R"({"devices": [{"id": "B1", "kind": "balance", "port": "p", "format": "grams"}]})")
            << "devices.json: devices[0].format"
            << "grams";
        QTest::newRow("twice")
            << QByteArray(
                   R"({"devices": [{"id": "B1", "kind": "balance", "port": "p", "format": "number-unit"}, {"id": "B1", "kind": "balance", "port": "q", "format": "number-unit"}]})")
            << "devices.json: devices[1].id"
            << "twice";
        QTest::newRow("misspelt") << rec(R"(, "data_bit": 7)")
                                  << "devices.json: devices[0].data_bit"
                                  << "data_bits";
    }
    void badRecordsNameTheField() {
        QFETCH(QByteArray, json);
        QFETCH(QString, field);
        QFETCH(QString, contains);
        try {
            devices_from_json(json, "devices.json", &formats());
            QFAIL("accepted");
        } catch (const chem::Error& e) {
            QVERIFY2(QString::fromStdString(e.field()).startsWith(field), e.what());
            QVERIFY2(QString::fromStdString(e.message()).contains(contains), e.what());
        }
    }

    void migratesAnOlderFile() {
        QTemporaryDir dir;
        const QString path = dir.filePath("old.sqlite");
        {
            phaseplan::storage::Database old(path, 4);
            QCOMPARE(old.schema_version(), 4);
        }
        phaseplan::storage::Database db(path);
        QVERIFY(db.schema_version() >= 5);
        DeviceStore store(db);
        QVERIFY(store.list().empty());
        DeviceRecord d =
            devices_from_json(
                R"({"devices": [{"id": "BAL-03", "kind": "balance", "port": "/dev/ttyUSB0", "format": "flag-number-unit"}]})",
                "d", &formats())
                .front();
        store.save(d);
        QCOMPARE(store.load("BAL-03")->unit, QString("g"));
        // The table's own checks hold even against SQL written by hand.
        bool refused = false;
        try {
            db.exec("INSERT INTO devices (id, name, kind, port, baud, data_bits, parity, "
                    "stop_bits, flow_control,"
                    " line_format, unit, created_at, updated_at) VALUES ('X', '', 'scale', 'p', "
                    "9600, 8, 'none',"
                    " '1', 'none', 'number-unit', 'g', '', '')");
        } catch (const phaseplan::Failure&) { // the CHECK constraint
            refused = true;
        }
        QVERIFY(refused);
    }
};

QTEST_GUILESS_MAIN(TestDevices)
#include "tst_devices.moc"
