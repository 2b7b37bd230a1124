// `phaseplan-cli device read` as a lab's script runs it, against instruments played by
// pseudo-terminals: one JSON reading on success; on any failure status 2, nothing on stdout and
// one stderr line: "phaseplan-cli: <field>: <message>" for a wrong option or reading,
// "phaseplan-cli: device: <sentence naming the port>" when the port or the instrument fails
// (README, Instruments). Line shapes: common practice, no source.
#include "devices/serial_reader.h"
#include "fake_instrument.h"
#include "test_support.h"

#include <QElapsedTimer>
#include <QJsonDocument>
#include <QProcess>
#include <QThread>
#include <QtTest>

using phaseplan::testing::CliRun;
using phaseplan::testing::FakeInstrument;
using phaseplan::testing::run_cli;
using phaseplan::testing::verify_rejected;

namespace {

QStringList read_args(const FakeInstrument& inst, const QString& format,
                      const QStringList& more = {}) {
    return QStringList{"device",   "read", "--port",      inst.path(),
                       "--format", format, "--timeout-s", "5"} +
           more;
}

QJsonObject json_of(const CliRun& r) {
    if (r.exit_code != 0)
        qWarning("stderr: %s", r.err.constData());
    return QJsonDocument::fromJson(r.out).object();
}

} // namespace

class TestCliDevice : public QObject {
    Q_OBJECT
  private slots:
    void readsOneWeight() {
        FakeInstrument bal;
        QVERIFY(bal.send("S S      3.1610 g\r\nS S      9.9999 g\r\n"));
        const CliRun r = run_cli(read_args(bal, "flag-number-unit"));
        QCOMPARE(r.exit_code, 0);
        QVERIFY(r.err.isEmpty());
        const QJsonObject o = json_of(r);
        QCOMPARE(o["value"].toDouble(), 3.161); // the first complete line
        QCOMPARE(o["unit"].toString(), QString("g"));
        QCOMPARE(o["stable"].toBool(), true);
        QCOMPARE(o["raw"].toString(), QString("S S      3.1610 g"));
    }

    void convertsToGramsAndReadsPh() {
        FakeInstrument bal;
        QVERIFY(bal.send("250.0 mg\r\n"));
        QJsonObject o = json_of(run_cli(read_args(bal, "number-unit")));
        QCOMPARE(o["value"].toDouble(), 0.25); // 1 mg = 1e-3 g (SI)
        QCOMPARE(o["sent_unit"].toString(), QString("mg"));
        FakeInstrument meter;
        QVERIFY(meter.send("7.012 pH 25.1 \xc2\xb0"
                           "C\r\n"));
        o = json_of(run_cli(read_args(meter, "ph-temperature")));
        QCOMPARE(o["value"].toDouble(), 7.012);
        QCOMPARE(o["unit"].toString(), QString("pH"));
        QCOMPARE(o["temperature_c"].toDouble(), 25.1);
    }

    void stableOnlyWaitsForTheSettledReading() {
        FakeInstrument bal;
        QVERIFY(bal.send("US,+00003.1598  g\r\nST,+00003.1610  g\r\n"));
        QJsonObject o = json_of(run_cli(read_args(bal, "flag-number-unit", {"--stable-only"})));
        QCOMPARE(o["value"].toDouble(), 3.161);
        QCOMPARE(o["stable"].toBool(), true);
        // Without the flag the unsettled reading is printed, marked so.
        FakeInstrument bal2;
        QVERIFY(bal2.send("US,+00003.1598  g\r\nST,+00003.1610  g\r\n"));
        o = json_of(run_cli(read_args(bal2, "flag-number-unit")));
        QCOMPARE(o["value"].toDouble(), 3.1598);
        QCOMPARE(o["stable"].toBool(), false);
    }

    void takesARegularExpression() {
        FakeInstrument bal;
        QVERIFY(bal.send("W=1.2500g\r\n"));
        const QJsonObject o = json_of(run_cli(read_args(bal, R"(W=(?<value>\d+\.\d+)(?<unit>g))")));
        QCOMPARE(o["value"].toDouble(), 1.25);
        QCOMPARE(o["format"].toString(), QString("custom"));
    }

    void faultsExitTwoWithOneLine_data() {
        QTest::addColumn<QByteArray>("sent");
        QTest::addColumn<QStringList>("more");
        QTest::addColumn<QString>("field");
        QTest::addColumn<QString>("contains");
        QTest::newRow("overload") << QByteArray("ST,+OL\r\n") << QStringList{} << "reading"
                                  << "overload";
        QTest::newRow("dashes") << QByteArray("S S ----\r\n") << QStringList{} << "reading"
                                << "dashes";
        QTest::newRow("negative") << QByteArray("S S    -0.0040 g\r\n") << QStringList{}
                                  << "reading"
                                  << "negative";
        QTest::newRow("mg where g expected")
            << QByteArray("S S 3161.0 mg\r\n") << QStringList{"--unit", "g"} << "unit"
            << "where g was expected";
        QTest::newRow("garbage, line end")
            << QByteArray("\xf3\x1c\x8a\xe1\r\n") << QStringList{} << "reading"
            << "baud rate";
        QTest::newRow("garbage, no line end")
            << QByteArray(400, '\xd5') << QStringList{} << "reading"
            << "no line end";
        QTest::newRow("no match") << QByteArray("READY\r\n") << QStringList{} << "reading"
                                  << "does not match";
        QTest::newRow("timeout") << QByteArray() << QStringList{"--timeout-s", "0.3"} << "device"
                                 << "within 0.3 s";
        QTest::newRow("timeout, only unsettled")
            << QByteArray("S D 3.1598 g\r\n") << QStringList{"--timeout-s", "0.3", "--stable-only"}
            << "device"
            << "no stable reading";
        QTest::newRow("timeout, half a line")
            << QByteArray("S S 3.16") << QStringList{"--timeout-s", "0.3"} << "device"
            << "received \"S S 3.16\"";
    }
    void faultsExitTwoWithOneLine() {
        QFETCH(QByteArray, sent);
        QFETCH(QStringList, more);
        QFETCH(QString, field);
        QFETCH(QString, contains);
        FakeInstrument bal;
        if (!sent.isEmpty())
            QVERIFY(bal.send(sent));
        QStringList args = read_args(bal, "flag-number-unit");
        args += more; // a second --timeout-s wins
        verify_rejected(run_cli(args), field, contains);
    }

    void badArgumentsExitTwo_data() {
        QTest::addColumn<QStringList>("args");
        QTest::addColumn<QString>("field");
        QTest::addColumn<QString>("contains");
        QTest::newRow("missing port")
            << QStringList{"device",   "read",       "--port", "/dev/phaseplan-no-such-port",
                           "--format", "number-unit"}
            << "device"
            << "/dev/phaseplan-no-such-port does not exist";
        QTest::newRow("not a serial port")
            << QStringList{"device", "read", "--port", "/dev/null", "--format", "number-unit"}
            << "device"
            << "/dev/null cannot be opened as a serial port";
        QTest::newRow("no port") << QStringList{"device", "read", "--format", "number-unit"}
                                 << "port"
                                 << "--port";
        QTest::newRow("no format")
            << QStringList{"device", "read", "--port", "/dev/null"} << "format"
            << "number-unit";
        QTest::newRow("unknown preset")
            << QStringList{"device", "read", "--port", "/dev/null", "--format", "grams"} << "format"
            << "\"grams\"";
        QTest::newRow("bad expression")
            << QStringList{"device", "read", "--port", "/dev/null", "--format", "(?<value>[0-9"}
            << "format"
            << "does not compile";
        QTest::newRow("baud") << QStringList{"device",   "read",        "--port", "/dev/null",
                                             "--format", "number-unit", "--baud", "fast"}
                              << "baud"
                              << "\"fast\"";
        QTest::newRow("timeout") << QStringList{"device",      "read",     "--port",
                                                "/dev/null",   "--format", "number-unit",
                                                "--timeout-s", "-1"}
                                 << "timeout_s"
                                 << "\"-1\"";
        QTest::newRow("unit") << QStringList{"device",   "read",        "--port", "/dev/null",
                                             "--format", "number-unit", "--unit", "lb"}
                              << "unit"
                              << "\"lb\"";
        QTest::newRow("parity") << QStringList{"device",   "read",        "--port",   "/dev/null",
                                               "--format", "number-unit", "--parity", "odd-ish"}
                                << "parity"
                                << "odd-ish";
        QTest::newRow("value missing") << QStringList{"device", "read", "--port"} << "port"
                                       << "needs a value";
        QTest::newRow("unknown option")
            << QStringList{"device", "read", "--colour", "red"} << "device"
            << "--colour";
        QTest::newRow("unknown subcommand") << QStringList{"device", "tare"} << "device"
                                            << "tare";
        QTest::newRow("no subcommand") << QStringList{"device"} << "device"
                                       << "read";
    }
    void badArgumentsExitTwo() {
        QFETCH(QStringList, args);
        QFETCH(QString, field);
        QFETCH(QString, contains);
        verify_rejected(run_cli(args), field, contains);
    }

    void busyPort() {
        FakeInstrument bal;
        phaseplan::devices::SerialReader holder;
        phaseplan::devices::PortSettings p;
        p.port = bal.path();
        holder.open(p);
        verify_rejected(run_cli(read_args(bal, "number-unit")), "device",
                        bal.path() + " is in use by another program");
    }

    void instrumentGoneMidLine() {
        FakeInstrument bal;
        QVERIFY(bal.send("S S   3.16"));
        QProcess cli;
        cli.start(QStringLiteral(CLI_PATH),
                  read_args(bal, "flag-number-unit", {"--baud", "19200", "--timeout-s", "30"}));
        QVERIFY(cli.waitForStarted());
        // Wait until the tool has opened the port (it sets 19200 baud), then pull the plug.
        for (int i = 0; i < 3000 && bal.speed() != B19200 && cli.state() == QProcess::Running; ++i)
            QThread::msleep(10);
        QCOMPARE(bal.speed(), speed_t(B19200));
        // and has read what was sent (a slow machine may set the speed well before it reads).
        for (int i = 0; i < 3000 && bal.unread() > 0 && cli.state() == QProcess::Running; ++i)
            QThread::msleep(10);
        QCOMPARE(bal.unread(), 0);
        bal.unplug();
        QVERIFY(cli.waitForFinished(30000));
        CliRun r;
        r.exit_code = cli.exitCode();
        r.out = cli.readAllStandardOutput();
        r.err = cli.readAllStandardError();
        verify_rejected(r, "device", "the instrument on " + bal.path() + " went away");
        QVERIFY2(r.err.contains("received \"S S   3.16\""), r.err.constData());
    }

    void formatsAreListed() {
        const CliRun r = run_cli({"device", "formats"});
        QCOMPARE(r.exit_code, 0);
        const QJsonArray a = QJsonDocument::fromJson(r.out).object()["formats"].toArray();
        QStringList names;
        for (const auto& f : a)
            names << f.toObject()["name"].toString();
        QVERIFY(names.contains("number-unit") && names.contains("flag-number-unit") &&
                names.contains("ph-temperature"));
    }
};

QTEST_GUILESS_MAIN(TestCliDevice)
#include "tst_cli_device.moc"
