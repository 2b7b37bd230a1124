// Prepare & record with the instruments: a weight taken from a balance played on a pseudo-terminal
// goes into a batch through DeviceCapture and BatchModel, is stored with its device, raw line and
// time, shows where it came from, and the printed sheet says "from balance BAL-03" against it and
// "typed" against a typed amount; the pH from a meter past its calibration date carries a caution
// onto the screen and the sheet; a captured value is changed by hand only with a reason, and is
// then typed; faults keep the value that was there.
//
// Outside references: the lines the instruments send are common practice, no source (the shapes of
// data/device_formats.json); the PDF's text is read back with poppler's pdftotext, an outside
// program. Device ids and dates are the test's own.
#include "batch_model.h"
#include "device_capture.h"
#include "devices/device_store.h"
#include "fake_instrument.h"
#include "gui_test_support.h"
#include "print/print_controller.h"
#include "workspace.h"

#include <QCoreApplication>
#include <QFile>
#include <QJsonArray>
#include <QJsonDocument>
#include <QJsonObject>
#include <QProcess>
#include <QSettings>
#include <QSignalSpy>
#include <QStandardPaths>
#include <QTemporaryDir>
#include <QTest>

#include <cmath>
#include <memory>

using namespace phaseplan::gui;
using phaseplan::devices::DeviceStore;
using phaseplan::testing::FakeInstrument;

namespace {

const QString data_dir = QStringLiteral(SOURCE_DIR "/data");
const QString salt = QStringLiteral("sodium-dihydrogen-phosphate-monohydrate");
const QString acid = QStringLiteral("phosphoric-acid");

QVariantMap demo_buffer() {
    QFile f(data_dir + "/demo/buffer-phosphate-ph2.5.json");
    if (!f.open(QIODevice::ReadOnly))
        qFatal("cannot open the demo buffer");
    return QJsonDocument::fromJson(f.readAll()).object().toVariantMap();
}

int row_of(const BatchModel& m, const QString& reagent) {
    for (int r = 0; r < m.rowCount(); ++r)
        if (m.data(m.index(r), BatchModel::ReagentRole).toString() == reagent)
            return r;
    return -1;
}

QVariant role(const BatchModel& m, int row, BatchModel::Role r) {
    return m.data(m.index(row), r);
}

/// pdftotext's text with runs of white space made one space (table cells wrap and align).
QString pdf_text(const QString& path) {
    QProcess p;
    p.start(QStringLiteral("pdftotext"), {QStringLiteral("-raw"), path, QStringLiteral("-")});
    if (!p.waitForFinished(30000) || p.exitCode() != 0)
        return {};
    return QString::fromUtf8(p.readAllStandardOutput()).simplified();
}

QJsonObject actual_entry(const BatchModel& m, const QString& reagent) {
    const QJsonObject in = QJsonObject::fromVariantMap(m.input());
    for (const QJsonValue& v : in.value("batch").toObject().value("actual").toArray())
        if (v.toObject().value("reagent").toString() == reagent)
            return v.toObject();
    return {};
}

} // namespace

class TestGuiBatchCapture : public QObject {
    Q_OBJECT

    QTemporaryDir dir_;
    std::unique_ptr<Workspace> ws_;
    std::unique_ptr<FakeInstrument> balance_, meter_;
    std::unique_ptr<DeviceCapture> capture_;
    std::unique_ptr<phaseplan::print::PrintController> printer_;
    std::unique_ptr<BatchModel> model_;

    /// Puts the demo instrument `id` on `port` with the calibration due on `due`.
    void move_to(const QString& id, const QString& port, const QDate& due) {
        DeviceStore store(*ws_->database());
        auto d = store.load(id);
        QVERIFY(d);
        d->port.port = port;
        d->calibration_due = due;
        store.save(*d);
    }

    /// Takes the next reading of `inst` for `target` (balance or meter) after sending `line`.
    bool take(bool balance, const QString& target, const QByteArray& line) {
        QSignalSpy captured(capture_.get(), &DeviceCapture::captured);
        QSignalSpy failed(capture_.get(), &DeviceCapture::failed);
        if (!(balance ? capture_->takeFromBalance(target) : capture_->takeFromMeter(target)))
            return false;
        if (!(balance ? balance_ : meter_)->send(line))
            return false;
        if (!captured.wait(5000) && failed.isEmpty())
            return false;
        return failed.isEmpty();
    }

  private slots:
    void initTestCase() { phaseplan::testing::use_test_settings("tst_gui_batch_capture"); }

    void init() {
        ws_ = std::make_unique<Workspace>();
        ws_->setDatabasePath(
            dir_.filePath(QStringLiteral("lab-%1.sqlite").arg(QTest::currentTestFunction())));
        ws_->setDataDir(data_dir);
        QVERIFY(ws_->open());
        balance_ = std::make_unique<FakeInstrument>();
        meter_ = std::make_unique<FakeInstrument>();
        capture_ = std::make_unique<DeviceCapture>();
        capture_->setWorkspace(ws_.get()); // adds the demo instruments
        // The balance well within its calibration, the meter long past it (dates far from today
        // so that the test does not depend on the day it runs).
        move_to("BAL-03", balance_->path(), QDate(2099, 12, 31));
        move_to("PHM-01", meter_->path(), QDate(2020, 1, 31));
        capture_->reloadDevices();
        printer_ = std::make_unique<phaseplan::print::PrintController>();
        printer_->setData(&ws_->data());
        model_ = std::make_unique<BatchModel>();
        model_->setWorkspace(ws_.get());
        model_->setOutput(printer_.get());
        model_->setIdPrefix("CP");
        model_->setPreparer("R. Okafor");
        QVERIFY2(model_->markPrepared(demo_buffer()), qPrintable(model_->errorMessage()));
        // As the screen wires it.
        connect(capture_.get(), &DeviceCapture::captured, model_.get(),
                [this](const QVariantMap& c) { model_->applyCapture(c); });
    }
    void cleanup() {
        model_.reset();
        printer_.reset();
        capture_.reset();
        balance_.reset();
        meter_.reset();
        ws_.reset();
    }

    void weightFromTheBalanceIsRecordedAndPrinted() {
        if (QStandardPaths::findExecutable("pdftotext").isEmpty())
            QSKIP("pdftotext (poppler-utils) missing");
        BatchModel& m = *model_;
        const int rs = row_of(m, salt), ra = row_of(m, acid);
        QVERIFY(rs >= 0 && ra >= 0);
        QCOMPARE(capture_->balanceId(), QString("BAL-03")); // the first balance by default
        QCOMPARE(role(m, rs, BatchModel::UnitRole).toString(), QString("g"));
        const double ts = role(m, rs, BatchModel::TargetRole).toDouble();
        const QString sent = QString::number(ts, 'f', 4);
        const QByteArray line = "S S " + sent.rightJustified(10).toLatin1() + " g";
        const QString target = role(m, rs, BatchModel::CaptureTargetRole).toString();
        QCOMPARE(target, QStringLiteral("batch.actual[%1].mass_g").arg(rs));

        QVERIFY(take(true, target, line + "\r\n"));
        QVERIFY2(m.errorMessage().isEmpty(), qPrintable(m.errorMessage()));
        QCOMPARE(role(m, rs, BatchModel::ActualRole).toDouble(), sent.toDouble());
        QCOMPARE(role(m, rs, BatchModel::SourceRole).toString(), QString("from balance BAL-03"));
        QCOMPARE(m.balanceId(), QString("BAL-03"));
        const QJsonObject rec = actual_entry(m, salt).value("capture").toObject();
        QCOMPARE(rec.value("device_id").toString(), QString("BAL-03"));
        QCOMPARE(rec.value("raw").toString(), QString::fromLatin1(line));
        QVERIFY(QDateTime::fromString(rec.value("received_at").toString(), Qt::ISODateWithMs)
                    .isValid());
        QCOMPARE(rec.value("accepted_unstable").toBool(), false);
        QCOMPARE(rec.value("calibration_due").toString(), QString("2099-12-31"));

        // The acid typed.
        const double ta = role(m, ra, BatchModel::TargetRole).toDouble();
        QVERIFY(m.setActual(ra, std::round(ta * 1000) / 1000));
        QCOMPARE(role(m, ra, BatchModel::SourceRole).toString(), QString("typed"));

        // The pH from a meter past its calibration date: taken, with a caution.
        QVERIFY(take(false, "batch.measured_ph",
                     "2.512 pH 21.4 \xc2\xb0"
                     "C\r\n"));
        QCOMPARE(m.measuredPh(), 2.512);
        QCOMPARE(m.measuredPhSource(), QString("from pH meter PHM-01"));
        QCOMPARE(m.phMeterId(), QString("PHM-01"));
        bool caution = false;
        for (const QVariant& w : m.warnings())
            caution |= w.toMap()["code"].toString() == "device-calibration-due" &&
                       w.toMap()["message"].toString().contains("PHM-01") &&
                       w.toMap()["message"].toString().contains("2020-01-31");
        QVERIFY(caution);

        // Stored: a fresh model on the same database shows the same.
        {
            BatchModel again;
            again.setWorkspace(ws_.get());
            QVERIFY(again.open(m.batchId()));
            QCOMPARE(role(again, rs, BatchModel::SourceRole).toString(),
                     QString("from balance BAL-03"));
            QCOMPARE(again.measuredPhCapture().value("raw").toString(),
                     QString("2.512 pH 21.4 \u00b0C"));
        }

        const QString sheet = dir_.filePath("out/captured-sheet.pdf");
        QVERIFY2(m.saveSheet(sheet, "a4"), qPrintable(m.errorMessage()));
        const QString text = pdf_text(sheet);
        // The sheet prints an actual as recorded: every digit the balance sent.
        QVERIFY2(text.contains(sent + " g from balance BAL-03"),
                 qPrintable(text.mid(text.indexOf("Reagents"), 900)));
        QVERIFY2(text.contains(" typed"), qPrintable(text));
        QVERIFY2(text.contains("from pH meter PHM-01"), qPrintable(text));
        QVERIFY2(text.contains("due for calibration on 2020-01-31"), qPrintable(text));

        // Changed by hand: refused without a reason, beside the field; the value stays.
        QVERIFY(!m.setActual(rs, sent.toDouble() + 0.01));
        QVERIFY2(m.errorField().startsWith("batch.actual["), qPrintable(m.errorField()));
        QVERIFY2(m.errorMessage().contains("give a reason"), qPrintable(m.errorMessage()));
        QVERIFY(role(m, rs, BatchModel::ErrorRole).toString().contains("from balance BAL-03"));
        QCOMPARE(role(m, rs, BatchModel::ActualRole).toDouble(), sent.toDouble());
        QVERIFY(!m.setActualByHand(rs, sent.toDouble() + 0.01, "  "));
        QCOMPARE(role(m, rs, BatchModel::SourceRole).toString(), QString("from balance BAL-03"));
        // With a reason (after printing: an amendment): typed, and the history says so.
        const double by_hand = std::round((sent.toDouble() + 0.01) * 10000) / 10000;
        QVERIFY2(m.setActualByHand(rs, by_hand, "balance display misread, weighed again on paper"),
                 qPrintable(m.errorMessage()));
        QCOMPARE(role(m, rs, BatchModel::ActualRole).toDouble(), by_hand);
        QCOMPARE(role(m, rs, BatchModel::SourceRole).toString(), QString("typed"));
        QVERIFY(!actual_entry(m, salt).contains("capture"));
        bool source_line = false;
        for (const QVariant& h : m.history()) {
            const QVariantMap e = h.toMap();
            if (e["text"].toString().startsWith(
                    "Source of the actual amount of Sodium dihydrogen phosphate monohydrate: from "
                    "balance BAL-03 (sent \"" +
                    QString::fromLatin1(line) + "\"") &&
                e["text"].toString().endsWith("→ typed")) {
                source_line = true;
                QCOMPARE(e["reason"].toString(),
                         QString("balance display misread, weighed again on paper"));
                QCOMPARE(e["action"].toString(), QString("amend"));
            }
        }
        QVERIFY(source_line);
        // The pH too.
        QVERIFY(!m.setMeasuredPhByHand(2.52, ""));
        QCOMPARE(m.measuredPh(), 2.512);
        QVERIFY(m.setMeasuredPhByHand(2.52, "meter lead loose, read on the display"));
        QCOMPARE(m.measuredPhSource(), QString("typed"));

        const QString sheet2 = dir_.filePath("out/typed-sheet.pdf");
        QVERIFY2(m.saveSheet(sheet2, "a4"), qPrintable(m.errorMessage()));
        const QString text2 = pdf_text(sheet2);
        QVERIFY2(!text2.contains("from balance"), qPrintable(text2));
        QVERIFY2(!text2.contains("from pH meter"), qPrintable(text2));
        // As typed, to 0.1 mg; a last zero dropped down to the 1 mg a 1–100 g amount is read to.
        QString typed = QString::number(by_hand, 'f', 4);
        if (typed.endsWith('0'))
            typed.chop(1);
        QVERIFY2(text2.contains(typed + " g typed"), qPrintable(text2));
    }

    void faultsKeepThePreviousValue_data() {
        QTest::addColumn<QByteArray>("sent");
        QTest::addColumn<QString>("fault");
        QTest::newRow("overload") << QByteArray("ST,+OL\r\n") << "out-of-range";
        QTest::newRow("mg where g expected") << QByteArray("S S 3161.0 mg\r\n") << "wrong-unit";
        QTest::newRow("negative") << QByteArray("S S    -0.0040 g\r\n") << "negative";
        QTest::newRow("garbage") << QByteArray("\xf3\x1c\x8a\xe1\r\n") << "garbage";
    }
    void faultsKeepThePreviousValue() {
        QFETCH(QByteArray, sent);
        QFETCH(QString, fault);
        BatchModel& m = *model_;
        const int rs = row_of(m, salt);
        const QString target = role(m, rs, BatchModel::CaptureTargetRole).toString();
        QVERIFY(take(true, target, "S S     3.1610 g\r\n"));
        QCOMPARE(role(m, rs, BatchModel::ActualRole).toDouble(), 3.161);
        const QJsonObject before = actual_entry(m, salt);
        const int revision = m.revision();

        QSignalSpy failed(capture_.get(), &DeviceCapture::failed);
        QVERIFY(!take(true, target, sent));
        QCOMPARE(failed.count(), 1);
        QCOMPARE(failed.first().at(0).toString(), target);
        QCOMPARE(capture_->errorField(), target);
        QCOMPARE(capture_->errorFault(), fault);
        QVERIFY(!capture_->errorMessage().isEmpty());
        QCOMPARE(role(m, rs, BatchModel::ActualRole).toDouble(), 3.161);
        QCOMPARE(actual_entry(m, salt), before);
        QCOMPARE(m.revision(), revision);
    }

    void missingPortKeepsTheTypedValue() {
        BatchModel& m = *model_;
        const int rs = row_of(m, salt);
        QVERIFY(m.setActual(rs, 3.2));
        // BAL-05 stays on the demo's /dev/ttyUSB2.
        if (QFileInfo::exists("/dev/ttyUSB2"))
            QSKIP("this machine has a /dev/ttyUSB2");
        capture_->setBalanceId("BAL-05");
        const QString target = role(m, rs, BatchModel::CaptureTargetRole).toString();
        QVERIFY(!capture_->takeFromBalance(target));
        QCOMPARE(capture_->errorFault(), QString("port-missing"));
        QCOMPARE(capture_->errorField(), target);
        QCOMPARE(role(m, rs, BatchModel::ActualRole).toDouble(), 3.2);
        QCOMPARE(role(m, rs, BatchModel::SourceRole).toString(), QString("typed"));
    }

    void captureThatDoesNotFitIsRefused() {
        BatchModel& m = *model_;
        const int rs = row_of(m, salt);
        // A pH handed to an amount row: refused at the row, nothing entered.
        QVERIFY(take(false, role(m, rs, BatchModel::CaptureTargetRole).toString(),
                     "2.512 pH 21.4 \xc2\xb0"
                     "C\r\n"));
        QVERIFY(m.errorMessage().contains("from a balance"));
        QVERIFY(!role(m, rs, BatchModel::EnteredRole).toBool());
    }
};

QTEST_MAIN(TestGuiBatchCapture)
#include "tst_gui_batch_capture.moc"
