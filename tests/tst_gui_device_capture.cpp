// "Take from balance" and "take from meter" (DeviceCapture) on a temporary database, with the
// demo's instruments moved onto pseudo-terminals: the next stable reading is taken with its
// device id, raw line and time; unsettled readings are shown, not taken, unless accepted; every
// fault leaves the last capture as it was; instruments are added, refused with the field named, and
// removed. Line shapes: common practice, no source. The demo's
// calibration dates are its own (data/demo/devices.json).
#include "device_capture.h"
#include "devices/device_store.h"
#include "devices/serial_reader.h"
#include "fake_instrument.h"
#include "workspace.h"

#include <QSignalSpy>
#include <QTemporaryDir>
#include <QTest>

#include <memory>

using namespace phaseplan::gui;
using phaseplan::devices::DeviceStore;
using phaseplan::testing::FakeInstrument;

namespace {

const QString data_dir = QStringLiteral(SOURCE_DIR "/data");

} // namespace

class TestGuiDeviceCapture : public QObject {
    Q_OBJECT

    QTemporaryDir dir_;
    std::unique_ptr<Workspace> ws_;
    std::unique_ptr<FakeInstrument> balance_, meter_;
    std::unique_ptr<DeviceCapture> capture_;

    /// Puts the demo instrument `id` on `inst`'s port.
    void move_to(const QString& id, const FakeInstrument& inst) {
        DeviceStore store(*ws_->database());
        auto d = store.load(id);
        QVERIFY(d);
        d->port.port = inst.path();
        store.save(*d);
    }

  private slots:
    void init() {
        // "Today" for the calibration dates (Workspace::now reads it).
        qputenv("PHASEPLAN_NOW", "2026-12-02T10:00:00");
        ws_ = std::make_unique<Workspace>();
        ws_->setDatabasePath(
            dir_.filePath(QStringLiteral("lab-%1.sqlite").arg(QTest::currentTestFunction())));
        ws_->setDataDir(data_dir);
        QVERIFY(ws_->open());
        balance_ = std::make_unique<FakeInstrument>();
        meter_ = std::make_unique<FakeInstrument>();
        capture_ = std::make_unique<DeviceCapture>();
        capture_->setWorkspace(ws_.get());
        move_to("BAL-03", *balance_);
        move_to("PHM-01", *meter_);
        capture_->reloadDevices();
        capture_->setBalanceId("BAL-03");
    }
    void cleanup() {
        capture_.reset();
        balance_.reset();
        meter_.reset();
        ws_.reset();
    }

    void demoInstrumentsAreListedWithTheirCautions() {
        const QVariantList b = capture_->balances();
        QCOMPARE(b.size(), 2);
        QCOMPARE(b[0].toMap()["id"].toString(), QString("BAL-03"));
        QCOMPARE(b[0].toMap()["calibrationCaution"].toString(), QString());
        const QVariantList m = capture_->meters();
        QCOMPARE(m.size(), 1);
        QCOMPARE(capture_->meterId(), QString("PHM-01"));
        // Due 2026-11-30, today 2026-12-02.
        QVERIFY(m[0].toMap()["calibrationCaution"].toString().contains(
            "PHM-01 was due for calibration on 2026-11-30"));
    }

    void takesTheNextStableWeight() {
        QSignalSpy captured(capture_.get(), &DeviceCapture::captured);
        QSignalSpy unstable(capture_.get(), &DeviceCapture::unstableSeen);
        QVERIFY(capture_->takeFromBalance("batch.actual[0].mass_g"));
        QVERIFY(capture_->busy());
        QVERIFY(balance_->send("S D      3.1598 g\r\n"));
        QVERIFY(unstable.wait(5000));
        QCOMPARE(captured.count(), 0); // shown, not taken
        QCOMPARE(capture_->unstable()["value"].toDouble(), 3.1598);
        QVERIFY(balance_->send("S S      3.16"));
        QVERIFY(balance_->send("10 g\r\n")); // split across writes: joined
        QVERIFY(captured.wait(5000));
        QVERIFY(!capture_->busy());
        const QVariantMap c = captured.first().first().toMap();
        QCOMPARE(c["target"].toString(), QString("batch.actual[0].mass_g"));
        QCOMPARE(c["value"].toDouble(), 3.161);
        QCOMPARE(c["unit"].toString(), QString("g"));
        QCOMPARE(c["deviceId"].toString(), QString("BAL-03"));
        QCOMPARE(c["raw"].toString(), QString("S S      3.1610 g"));
        QVERIFY(QDateTime::fromString(c["receivedAt"].toString(), Qt::ISODateWithMs).isValid());
        QCOMPARE(c["acceptedUnstable"].toBool(), false);
        QCOMPARE(c["record"].toMap()["device_id"].toString(), QString("BAL-03"));
        QCOMPARE(capture_->lastCapture(), c);
        QVERIFY(capture_->errorMessage().isEmpty());
    }

    void acceptingAnUnstableReadingIsRecorded() {
        QSignalSpy captured(capture_.get(), &DeviceCapture::captured);
        QSignalSpy unstable(capture_.get(), &DeviceCapture::unstableSeen);
        QVERIFY(!capture_->acceptUnstable()); // nothing to accept
        QVERIFY(capture_->takeFromBalance("batch.actual[1].mass_g"));
        QVERIFY(!capture_->acceptUnstable());
        QVERIFY(balance_->send("S D      0.2510 g\r\n"));
        QVERIFY(unstable.wait(5000));
        QVERIFY(capture_->acceptUnstable());
        QCOMPARE(captured.count(), 1);
        const QVariantMap c = captured.first().first().toMap();
        QCOMPARE(c["value"].toDouble(), 0.251);
        QCOMPARE(c["stable"].toBool(), false);
        QCOMPARE(c["acceptedUnstable"].toBool(), true);
        QCOMPARE(c["record"].toMap()["accepted_unstable"].toBool(), true);
    }

    void meterReadingCarriesTheCalibrationCaution() {
        QSignalSpy captured(capture_.get(), &DeviceCapture::captured);
        QVERIFY(capture_->takeFromMeter("batch.measured_ph"));
        QVERIFY(meter_->send("2.512 pH 21.4 \xc2\xb0"
                             "C\r\n"));
        QVERIFY(captured.wait(5000));
        const QVariantMap c = captured.first().first().toMap();
        QCOMPARE(c["value"].toDouble(), 2.512);
        QCOMPARE(c["unit"].toString(), QString("pH"));
        QCOMPARE(c["temperatureC"].toDouble(), 21.4);
        QCOMPARE(c["deviceId"].toString(), QString("PHM-01"));
        QVERIFY(c["calibrationCaution"].toString().contains("2026-11-30"));
    }

    void faultsKeepThePreviousCapture_data() {
        QTest::addColumn<QByteArray>("sent");
        QTest::addColumn<bool>("unplug");
        QTest::addColumn<QString>("fault");
        QTest::addColumn<QString>("contains");
        QTest::newRow("overload") << QByteArray("ST,+OL\r\n") << false << "out-of-range"
                                  << "overload";
        QTest::newRow("dashes") << QByteArray("S S ------\r\n") << false << "out-of-range"
                                << "dashes";
        QTest::newRow("negative") << QByteArray("S S    -0.0040 g\r\n") << false << "negative"
                                  << "tare";
        QTest::newRow("mg where g expected")
            << QByteArray("S S 3161.0 mg\r\n") << false << "wrong-unit"
            << "where g was expected";
        QTest::newRow("garbage") << QByteArray("\xf3\x1c\x8a\xe1\r\n") << false << "garbage"
                                 << "baud rate";
        // An unsettled line first, in the same write: once it is shown, the half line after it
        // has been read too (a pty drops what is still queued when its master closes).
        QTest::newRow("gone mid-line")
            << QByteArray("S D   3.1598 g\r\nS S   3.16") << true << "disconnected"
            << "received \"S S   3.16\"";
    }
    void faultsKeepThePreviousCapture() {
        QFETCH(QByteArray, sent);
        QFETCH(bool, unplug);
        QFETCH(QString, fault);
        QFETCH(QString, contains);
        QSignalSpy captured(capture_.get(), &DeviceCapture::captured);
        QSignalSpy failed(capture_.get(), &DeviceCapture::failed);
        QVERIFY(capture_->takeFromBalance("batch.actual[0].mass_g"));
        QVERIFY(balance_->send("S S      3.1610 g\r\n"));
        QVERIFY(captured.wait(5000));
        const QVariantMap before = capture_->lastCapture();

        QVERIFY(capture_->takeFromBalance("batch.actual[0].mass_g"));
        QSignalSpy unstable(capture_.get(), &DeviceCapture::unstableSeen);
        QVERIFY(balance_->send(sent));
        if (unplug) {
            QVERIFY(unstable.wait(5000));
            balance_->unplug();
        }
        QVERIFY(failed.wait(5000));
        QCOMPARE(captured.count(), 1);
        QCOMPARE(capture_->lastCapture(), before);
        QVERIFY(!capture_->busy());
        QCOMPARE(capture_->errorField(), QString("batch.actual[0].mass_g"));
        QCOMPARE(capture_->errorFault(), fault);
        QVERIFY2(capture_->errorMessage().startsWith("balance BAL-03: "),
                 qPrintable(capture_->errorMessage()));
        QVERIFY2(capture_->errorMessage().contains(contains), qPrintable(capture_->errorMessage()));
    }

    void timeoutWithOnlyUnsettledReadings() {
        QSignalSpy failed(capture_.get(), &DeviceCapture::failed);
        capture_->setTimeoutS(0.3);
        QVERIFY(capture_->takeFromBalance("batch.actual[0].mass_g"));
        QVERIFY(balance_->send("S D      3.1598 g\r\n"));
        QVERIFY(failed.wait(5000));
        // The port failure (a DeviceFailure, not an input error) is still said beside the field
        // it was for, with the instrument and the port, and keeps its kind for the screen.
        QCOMPARE(capture_->errorField(), QString("batch.actual[0].mass_g"));
        QCOMPARE(capture_->errorFault(), QString("timeout"));
        QVERIFY2(capture_->errorMessage().startsWith("balance BAL-03: no stable reading from " +
                                                     balance_->path() + " within 0.3 s"),
                 qPrintable(capture_->errorMessage()));
        QVERIFY(capture_->lastCapture().isEmpty());
        // Trying again after the timeout takes the next stable reading and clears the fault.
        QSignalSpy captured(capture_.get(), &DeviceCapture::captured);
        capture_->setTimeoutS(5);
        QVERIFY(capture_->takeFromBalance("batch.actual[0].mass_g"));
        QVERIFY(capture_->errorFault().isEmpty());
        QVERIFY(balance_->send("S S      3.1610 g\r\n"));
        QVERIFY(captured.wait(5000));
        QCOMPARE(capture_->lastCapture()["value"].toDouble(), 3.161);
    }

    void portMissingOrBusy() {
        // BAL-05 stays on the demo's /dev/ttyUSB2, which this machine does not have.
        QSignalSpy failed(capture_.get(), &DeviceCapture::failed);
        capture_->setBalanceId("BAL-05");
        if (QFileInfo::exists("/dev/ttyUSB2"))
            QSKIP("this machine has a /dev/ttyUSB2");
        QVERIFY(!capture_->takeFromBalance("batch.actual[0].mass_g"));
        QCOMPARE(capture_->errorFault(), QString("port-missing"));
        QVERIFY2(capture_->errorMessage().startsWith("balance BAL-05: /dev/ttyUSB2 does not exist"),
                 qPrintable(capture_->errorMessage()));
        QCOMPARE(failed.count(), 1);
        capture_->setBalanceId("BAL-03");
        phaseplan::devices::SerialReader holder;
        phaseplan::devices::PortSettings p;
        p.port = balance_->path();
        holder.open(p);
        QVERIFY(!capture_->takeFromBalance("batch.actual[0].mass_g"));
        QCOMPARE(capture_->errorFault(), QString("port-busy"));
        QVERIFY(!capture_->busy());
    }

    void instrumentsAreAddedEditedAndRemoved() {
        QSignalSpy changed(capture_.get(), &DeviceCapture::devicesChanged);
        QVariantMap d{{"id", "BAL-07"},
                      {"name", "Semi-micro balance"},
                      {"kind", "balance"},
                      {"port", "/dev/ttyUSB7"},
                      {"baud", 4800},
                      {"format", "id-flag-number-unit"},
                      {"calibration_due", "2027-06-30"}};
        QVERIFY(capture_->saveDevice(d));
        QCOMPARE(capture_->balances().size(), 3);
        QVERIFY(changed.count() >= 1);
        // A wrong field is named and nothing is stored.
        d["baud"] = 0;
        d["id"] = "BAL-08";
        QVERIFY(!capture_->saveDevice(d));
        QCOMPARE(capture_->errorField(), QString("baud"));
        d["baud"] = 4800;
        d["format"] = "grams";
        QVERIFY(!capture_->saveDevice(d));
        QCOMPARE(capture_->errorField(), QString("format"));
        QCOMPARE(capture_->balances().size(), 3);
        QVERIFY(capture_->removeDevice("BAL-07"));
        QVERIFY(!capture_->removeDevice("BAL-07"));
        QCOMPARE(capture_->balances().size(), 2);
    }

    void cancelStopsTheWait() {
        QSignalSpy captured(capture_.get(), &DeviceCapture::captured);
        QVERIFY(capture_->takeFromBalance("batch.actual[0].mass_g"));
        capture_->cancel();
        QVERIFY(!capture_->busy());
        QVERIFY(capture_->errorMessage().isEmpty());
        // The port is free again at once.
        QVERIFY(capture_->takeFromBalance("batch.actual[0].mass_g"));
        QVERIFY(balance_->send("S S      1.0000 g\r\n"));
        QVERIFY(captured.wait(5000));
    }
};

QTEST_MAIN(TestGuiDeviceCapture)
#include "tst_gui_device_capture.moc"
