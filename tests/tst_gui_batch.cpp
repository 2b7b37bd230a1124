// The batch model on a temporary database (no QML): a batch made from the shipped demo buffer,
// actual amounts against the ± 2 % band, the PDFs it writes, the record after printing, and a
// reopen.
//
// Outside references: the tolerance band is issue 5's default (± 2 % of the target), checked
// here from the target itself, not from the core's flag; more of the base form than planned
// raises the pH (a buffer's pH rises monotonically with its base fraction, Henderson–Hasselbalch,
// any analytical chemistry text); the PDF's text is read back with poppler's pdftotext, an
// outside program.
#include "batch_model.h"
#include "core/batch_document.h"
#include "gui_test_support.h"
#include "print/documents.h"
#include "print/print_controller.h"
#include "storage/demo.h"
#include "workspace.h"

#include <QCoreApplication>
#include <QSettings>

#include <QFile>
#include <QFileInfo>
#include <QJsonArray>
#include <QJsonDocument>
#include <QProcess>
#include <QSignalSpy>
#include <QStandardPaths>
#include <QTemporaryDir>
#include <QTest>

#include <cmath>
#include <memory>

using namespace phaseplan::gui;
using phaseplan::testing::demo_buffer;
using phaseplan::testing::open_workspace;

namespace {

int row_of(const BatchModel& m, const QString& reagent) {
    for (int r = 0; r < m.rowCount(); ++r)
        if (m.data(m.index(r), BatchModel::ReagentRole).toString() == reagent)
            return r;
    return -1;
}

QVariant role(const BatchModel& m, int row, BatchModel::Role r) {
    return m.data(m.index(row), r);
}

QString pdf_text(const QString& path) {
    QProcess p;
    p.start(QStringLiteral("pdftotext"), {QStringLiteral("-layout"), path, QStringLiteral("-")});
    if (!p.waitForFinished(30000) || p.exitCode() != 0)
        return {};
    return QString::fromUtf8(p.readAllStandardOutput());
}

/// The model over `ws` with a batch of the demo buffer marked prepared by R. Okafor, its id
/// made from `prefix`; false when marking failed (the model's error says why).
bool prepare_demo_batch(BatchModel& m, Workspace* ws, const QString& prefix) {
    m.setWorkspace(ws);
    m.setIdPrefix(prefix);
    m.setPreparer("R. Okafor");
    return m.markPrepared(demo_buffer());
}

int count_action(const QVariantList& history, const QString& action) {
    int n = 0;
    for (const QVariant& h : history)
        n += h.toMap().value("action").toString() == action;
    return n;
}

/// The steps the sheet prints: each numbered block with the heading before it.
QVariantList printed_steps(const phaseplan::print::SheetDocument& d) {
    using phaseplan::print::Block;
    QVariantList out;
    for (int i = 1; i < d.blocks.size(); ++i)
        if (d.blocks[i].kind == Block::Kind::numbered &&
            d.blocks[i - 1].kind == Block::Kind::heading)
            out.append(
                QVariantMap{{"heading", d.blocks[i - 1].text}, {"steps", d.blocks[i].items}});
    return out;
}

} // namespace

class TestGuiBatch : public QObject {
    Q_OBJECT
    QTemporaryDir dir_;

  private slots:
    void initTestCase() { phaseplan::testing::use_test_settings("tst_gui_batch"); }

    /// The demo's signed batch on the Prepare & record model: "Signed by" with name, UTC time and
    /// meaning (21 CFR 11.50), a wrong password refused at the password field and counted
    /// (11.200(a)(1), 11.300(d)), a right one signs, and a later amendment shows every signature
    /// void (11.70: bound to the content signed).
    void signatures_on_the_batch_screen() {
        const QString db = dir_.filePath("signed.sqlite");
        auto ws = open_workspace(db);
        BatchModel m;
        m.setWorkspace(ws.get());
        QVERIFY(m.open(phaseplan::storage::demo_batch_id()));
        QVERIFY(m.signingAvailable());
        QCOMPARE(m.signatures().size(), 2);
        const QVariantMap first = m.signatures().at(0).toMap();
        QVERIFY(first.value("holds").toBool());
        QVERIFY2(first.value("words").toString().startsWith("Prepared by Rosa Okafor (demo-prep) "),
                 qPrintable(first.value("words").toString()));
        QVERIFY(first.value("words").toString().endsWith(" UTC"));
        QCOMPARE(m.signatures().at(1).toMap().value("meaning").toString(), QString("reviewed"));
        // Reviewed by a second person and holding: released (issue 13, part 6), and the labels
        // printed from this screen say so.
        QVERIFY(m.released());
        QVERIFY2(m.releaseText().startsWith("Released for use: reviewed by "),
                 qPrintable(m.releaseText()));
        // The second person is the review signature, not a typed "Checked by".
        QCOMPARE(m.reviewedBy(), QString("Mats Lindqvist (demo-review)"));
        phaseplan::print::PrintController printer;
        printer.setData(&ws->data());
        m.setOutput(&printer);
        const bool have_pdftotext = !QStandardPaths::findExecutable("pdftotext").isEmpty();
        const QString labels = dir_.filePath("released-labels.pdf");
        QVERIFY2(m.saveLabels(labels, "label62"), qPrintable(m.errorMessage()));
        if (have_pdftotext) {
            const QString text = pdf_text(labels).simplified();
            QVERIFY2(text.contains("Released: reviewed by"), qPrintable(text));
            QVERIFY(!text.contains("NOT RELEASED"));
        }

        QVERIFY(!m.sign("demo-approve", "not-the-password", "approved"));
        QCOMPARE(m.errorField(), QString("password"));
        QCOMPARE(m.signatures().size(), 2);
        QVERIFY(m.sign("demo-approve", "demo-approve-2026", "approved"));
        QCOMPARE(m.signatures().size(), 3);
        QVERIFY(m.signatures().at(2).toMap().value("holds").toBool());

        // The batch was printed: a change is an amendment with a reason, and it voids them all.
        m.setPreparer("Rosa Okafor");
        // A lot the shelf does not hold is refused while the shelf has lots of the reagent.
        QVERIFY(!m.setLot(0, "PA-00001"));
        QVERIFY2(m.errorMessage().contains("not on the shelf"), qPrintable(m.errorMessage()));
        QVERIFY(!m.pendingAmendment());
        QVERIFY(!m.setLot(0, "PA-90417")); // a demo lot on the shelf (storage/demo.cpp)
        QVERIFY(m.pendingAmendment());
        QVERIFY(!m.sign("demo-approve", "demo-approve-2026", "approved"));
        QCOMPARE(m.errorField(), QString("signature"));
        m.setAmendReason("lot re-read from the bottle");
        QVERIFY2(m.amend(), qPrintable(m.errorMessage()));
        QCOMPARE(m.signatures().size(), 3);
        for (const QVariant& v : m.signatures()) {
            QVERIFY(!v.toMap().value("holds").toBool());
            QVERIFY(v.toMap().value("words").toString().contains("void"));
        }
        QVERIFY(!m.released());
        QCOMPARE(m.reviewedBy(), QString());
        QCOMPARE(m.releaseText(), phaseplan::BatchRelease::not_released_words());
        const QString after = dir_.filePath("amended-labels.pdf");
        QVERIFY2(m.saveLabels(after, "label62"), qPrintable(m.errorMessage()));
        if (have_pdftotext)
            QVERIFY(pdf_text(after).simplified().contains("NOT RELEASED"));
    }

    // Issue 13, part 7, on the screen's model: each reagent's lots from the shelf (the demo's,
    // dated from today: storage/demo.cpp), an expired one refused beside its picker, accepted
    // only by an approver with the password and a reason, and the use-by clamped to the lot
    // that expires first (SP-2207, the day after today: its end, 23:59, comes before the 48 h
    // shelf life).
    void lots_picked_from_the_shelf() {
        const QString db = dir_.filePath("lots.sqlite");
        auto ws = open_workspace(db);
        BatchModel m;
        QVERIFY2(prepare_demo_batch(m, ws.get(), "LT"), qPrintable(m.errorMessage()));
        const QString salt = QStringLiteral("sodium-dihydrogen-phosphate-monohydrate");
        const int rs = row_of(m, salt);
        const QVariantList choices = role(m, rs, BatchModel::LotChoicesRole).toList();
        QStringList ids;
        for (const QVariant& c : choices)
            ids << c.toMap().value("id").toString() +
                       (c.toMap().value("expired").toBool() ? "!" : "");
        QCOMPARE(ids, QStringList({"SP-1987!", "SP-2207", "SP-2391"})); // earliest expiry first
        QVERIFY(m.setActual(rs, role(m, rs, BatchModel::TargetRole).toDouble()));

        QVERIFY(!m.setLot(rs, "SP-1987"));
        QVERIFY2(m.errorField().endsWith("].lot"), qPrintable(m.errorField()));
        QVERIFY(role(m, rs, BatchModel::LotErrorRole).toString().contains("SP-1987"));
        QVERIFY(role(m, rs, BatchModel::ErrorRole).toString().isEmpty()); // not the amount's
        QVERIFY(role(m, rs, BatchModel::LotExpiredRole).toBool());
        QVERIFY(!m.overrideExpiredLot(rs, "demo-prep", "demo-prep-2026", "needed tonight"));
        QCOMPARE(m.errorField(), QString("lot_override.login"));
        QVERIFY(!m.overrideExpiredLot(rs, "demo-approve", "wrong-password", "needed tonight"));
        QCOMPARE(m.errorField(), QString("lot_override.password"));
        QVERIFY2(m.overrideExpiredLot(rs, "demo-approve", "demo-approve-2026", "retested in spec"),
                 qPrintable(m.errorMessage()));
        QVERIFY(!role(m, rs, BatchModel::LotExpiredRole).toBool());
        QCOMPARE(m.lotOverrides().size(), 1);
        QVERIFY2(m.lotOverrides()[0].contains("Priya Haldane (demo-approve)"),
                 qPrintable(m.lotOverrides()[0]));
        QVERIFY(m.useByLimit().isEmpty());

        QVERIFY(m.setLot(rs, "SP-2207"));
        QVERIFY(m.lotOverrides().isEmpty());
        const QString tomorrow = QDate::currentDate().addDays(1).toString(Qt::ISODate);
        QCOMPARE(m.useByAt(), tomorrow + "T23:59:00");
        QVERIFY2(m.useByLimit().startsWith("lot SP-2207 of Sodium dihydrogen phosphate"),
                 qPrintable(m.useByLimit()));
        QCOMPARE(role(m, rs, BatchModel::LotExpiresOnRole).toString(), tomorrow);
    }

    /// The release reasons and the use-by's limiting lot reach the screen and the sheet as the
    /// same words, from typed data: the salt 4 % over its target (band ± 2 % of the target,
    /// issue 5's default, worked here from the target), the measured pH 0.08 over 2.50 ± 0.05,
    /// and the lot SP-2207 that expires tomorrow (storage/demo.cpp) limiting the use-by.
    void release_reasons_and_use_by_limit_are_typed_and_worded_once() {
        const QString db = dir_.filePath("reasons.sqlite");
        auto ws = open_workspace(db);
        BatchModel m;
        QVERIFY2(prepare_demo_batch(m, ws.get(), "RR"), qPrintable(m.errorMessage()));
        const std::string salt_id = "sodium-dihydrogen-phosphate-monohydrate";
        const QString salt = QString::fromStdString(salt_id);
        const int rs = row_of(m, salt);
        const double ts = role(m, rs, BatchModel::TargetRole).toDouble();
        const double salt_actual = std::round(ts * 1.04 * 1000) / 1000;
        QVERIFY(m.setActual(rs, salt_actual));
        QVERIFY(m.setLot(rs, "SP-2207"));
        m.setMeasuredPh(2.58);
        QVERIFY2(m.errorField().isEmpty(), qPrintable(m.errorMessage()));

        // Typed: the part, its unit, target, actual and band; the pH, its target and tolerance.
        const phaseplan::BatchDocument doc =
            phaseplan::read_batch_document(ws->data(), QJsonObject::fromVariantMap(m.input()));
        QCOMPARE(doc.out_of_tolerance_reasons.size(), size_t(2));
        const chem::ReleaseReason& amount = doc.out_of_tolerance_reasons[0];
        QVERIFY(amount.kind == chem::ReleaseReasonKind::amount_out_of_band);
        QCOMPARE(amount.reagent, salt_id);
        QCOMPARE(amount.unit, std::string("g"));
        QCOMPARE(amount.target, ts);
        QCOMPARE(amount.actual, salt_actual);
        QVERIFY(std::abs(amount.low - ts * 0.98) < 1e-9 &&
                std::abs(amount.high - ts * 1.02) < 1e-9);
        QVERIFY(std::abs(amount.deviation - (salt_actual / ts - 1)) < 1e-12);
        const chem::ReleaseReason& ph = doc.out_of_tolerance_reasons[1];
        QVERIFY(ph.kind == chem::ReleaseReasonKind::measured_ph_out_of_tolerance);
        QCOMPARE(ph.actual, 2.58);
        QCOMPARE(ph.target, 2.5); // the demo buffer's target pH
        QCOMPARE(ph.tolerance, 0.05);
        const QString tomorrow = QDate::currentDate().addDays(1).toString(Qt::ISODate);
        QVERIFY(doc.expiry_limit);
        QVERIFY(*doc.expiry_limit ==
                (chem::UseByLimit{salt_id, "SP-2207", tomorrow.toStdString()}));

        // In words on the screen, the numbers formatted here (≥ 1 g: three decimals; the band's
        // ends rounded inward, low up and high down, as the sheet's table prints it).
        const auto g = [](double v) { return QString::number(v, 'f', 3); };
        const QString salt_reason = "Sodium dihydrogen phosphate monohydrate: " + g(salt_actual) +
                                    " g, +" +
                                    QString::number((salt_actual / ts - 1) * 100, 'f', 1) +
                                    " % (band " + g(std::ceil(ts * 0.98 * 1000) / 1000) + "–" +
                                    g(std::floor(ts * 1.02 * 1000) / 1000) + " g)";
        const QString ph_reason =
            QStringLiteral("Measured pH 2.58, +0.08 from the target 2.50 (± 0.05)");
        QCOMPARE(m.outOfToleranceReasons(), QStringList({salt_reason, ph_reason}));
        const QString limit =
            "lot SP-2207 of Sodium dihydrogen phosphate monohydrate, which expires on " + tomorrow;
        QCOMPARE(m.useByLimit(), limit);

        // The sheet: the same reasons in its notice, the same lot after "limited by"; the summary
        // gives the same words.
        QVERIFY(m.recordDeviation("Used for the system suitability run only."));
        const auto job = phaseplan::print::build_print_job(
            ws->data(), QJsonObject::fromVariantMap(m.input()), "now");
        QStringList notice;
        QString expires;
        for (const phaseplan::print::Block& b : job.sheet.blocks) {
            if (b.kind == phaseplan::print::Block::Kind::notice &&
                b.text.startsWith("OUT OF TOLERANCE")) // the sheet's mark, boxed with its reasons
                notice = b.items;
            for (const auto& kv : b.fields)
                if (kv.key == QLatin1String("Expires at"))
                    expires = kv.value;
        }
        QCOMPARE(notice, m.outOfToleranceReasons());
        QVERIFY2(expires.endsWith("\nlimited by " + limit), qPrintable(expires));
        const phaseplan::BatchDocument noted =
            phaseplan::read_batch_document(ws->data(), QJsonObject::fromVariantMap(m.input()));
        const QJsonObject summary = noted.summary.value("batch").toObject();
        QCOMPARE(summary.value("out_of_tolerance_reasons").toVariant().toStringList(),
                 m.outOfToleranceReasons());
        QCOMPARE(summary.value("expires_limited_by").toObject().value("text").toString(), limit);
    }

    /// Out of tolerance: the reasons in words, the correction worked by hand, a deviation note
    /// required before printing and recorded with who and when, the mark on the sheet, the steps
    /// on screen equal to the printed ones, the audit trail in words, the PDF folder remembered.
    void out_of_tolerance_needs_a_deviation_note() {
        const QString db = dir_.filePath("deviation.sqlite");
        auto ws = open_workspace(db);
        phaseplan::print::PrintController printer;
        printer.setData(&ws->data());
        BatchModel m;
        QVERIFY2(prepare_demo_batch(m, ws.get(), "DV"), qPrintable(m.errorMessage()));
        QVERIFY(!m.outOfTolerance());

        // No output connected: saving says why, at field "output".
        QVERIFY(!m.saveSheet(dir_.filePath("pdf/none.pdf"), "a4"));
        QCOMPARE(m.errorField(), QString("output"));
        m.setOutput(&printer);

        const QString acid = QStringLiteral("phosphoric-acid");
        const QString salt = QStringLiteral("sodium-dihydrogen-phosphate-monohydrate");
        const int ra = row_of(m, acid), rs = row_of(m, salt);
        const double ta = role(m, ra, BatchModel::TargetRole).toDouble();
        const double ts = role(m, rs, BatchModel::TargetRole).toDouble();
        // The salt 4 % over, the acid on target: out of tolerance.
        const double salt_actual = std::round(ts * 1.04 * 1000) / 1000;
        QVERIFY(m.setActual(rs, salt_actual));
        QVERIFY(m.setActual(ra, std::round(ta * 1000) / 1000));
        QVERIFY(m.outOfTolerance());
        QVERIFY(m.needsDeviationNote());
        QCOMPARE(m.outOfToleranceReasons().size(), 1);
        QVERIFY2(
            m.outOfToleranceReasons()[0].startsWith("Sodium dihydrogen phosphate monohydrate: "),
            qPrintable(m.outOfToleranceReasons()[0]));

        // The correction by hand: s = salt actual / salt target; the acid (entered at its target,
        // rounded to 0.001 mL) then lies 1/s − 1 ≈ −3.8 % below its scaled target, outside ± 2 %:
        // add s·ta − acid actual; make up to s × 2000 mL (the demo's volume).
        const double s = salt_actual / ts;
        const double acid_actual = std::round(ta * 1000) / 1000;
        const QString add_acid =
            QString::number(s * ta - acid_actual, 'f', (s * ta - acid_actual) >= 1 ? 3 : 4);
        const QString volume = QString::number(2000 * s, 'f', 1);
        const QString all = m.correction().join("\n");
        QVERIFY2(all.contains("Add " + add_acid + " mL of Phosphoric acid"),
                 qPrintable(all + " / " + add_acid));
        QVERIFY2(all.contains("Make up to " + volume + " mL instead of 2000.0 mL"),
                 qPrintable(all));
        QVERIFY(!m.correctionIsRemake());
        // A 2000 mL flask cannot take the scaled volume: remake.
        m.setContainerMl(2000);
        QVERIFY(m.correctionIsRemake());
        QVERIFY(m.correction().join(" ").contains("Remake"));
        m.setContainerMl(std::nan(""));
        QVERIFY(!m.correctionIsRemake());

        // Printing asks for a deviation note; an empty one is refused.
        const QString sheet = dir_.filePath("pdf/chosen/sheet.pdf");
        QVERIFY(!m.saveSheet(sheet, "a4"));
        QCOMPARE(m.errorField(), QString("batch.deviation.note"));
        QVERIFY(!QFileInfo::exists(sheet));
        QVERIFY(!m.recordDeviation("   "));
        QCOMPARE(m.errorField(), QString("batch.deviation.note"));
        QVERIFY2(m.recordDeviation("Used for the system suitability run only (QA, M. Lindqvist)."),
                 qPrintable(m.errorMessage()));
        QVERIFY(!m.needsDeviationNote());
        QCOMPARE(m.deviationBy(), QString("R. Okafor"));
        QVERIFY(QDateTime::fromString(m.deviationAt(), Qt::ISODate).isValid());

        // Bench fields, stored with the batch.
        m.setMeasuredPh(2.53);
        m.setPhMeterId("PHM-3");
        m.setBalanceId("BAL-07");
        m.setComment("2 L flask, shelf 4");
        QVERIFY2(m.errorField().isEmpty(), qPrintable(m.errorMessage()));
        QCOMPARE(m.measuredPh(), 2.53);

        // Saved where the user chose: the folder is remembered for the next session.
        QVERIFY2(m.saveSheet(sheet, "a4"), qPrintable(m.errorMessage()));
        QCOMPARE(m.outputDir(), dir_.filePath("pdf/chosen"));
        BatchModel fresh;
        QCOMPARE(fresh.outputDir(), dir_.filePath("pdf/chosen"));
        // A file that cannot be written says why, at the path.
        QFile blocker(dir_.filePath("pdf/blocker"));
        QVERIFY(blocker.open(QIODevice::WriteOnly));
        blocker.close();
        QVERIFY(!m.saveLabels(dir_.filePath("pdf/blocker/labels.pdf"), "label62"));
        QCOMPARE(m.errorField(), QString("path"));
        QVERIFY2(m.errorMessage().contains("is a file, not a folder"),
                 qPrintable(m.errorMessage()));

        if (QStandardPaths::findExecutable("pdftotext").isEmpty())
            QSKIP("pdftotext (poppler-utils) missing");
        const QString text = pdf_text(sheet).simplified();
        QVERIFY(text.contains("OUT OF TOLERANCE"));
        QVERIFY(text.contains("Used for the system suitability run only"));
        QVERIFY(text.contains("PHM-3") && text.contains("BAL-07"));

        // One source of steps: the screen's list equals the printed sheet's.
        const auto job = phaseplan::print::build_print_job(
            ws->data(), QJsonObject::fromVariantMap(m.input()), "now");
        QCOMPARE(m.steps(), printed_steps(job.sheet));
        QVERIFY(!m.steps().isEmpty());

        // The audit trail in words: reagent names and field labels, no JSON paths.
        QStringList texts;
        for (const QVariant& h : m.history())
            texts << h.toMap().value("text").toString();
        const QString trail = texts.join("\n");
        QVERIFY2(trail.contains("Actual amount of Sodium dihydrogen phosphate monohydrate: – → " +
                                QString::number(salt_actual, 'f', 3) + " g"),
                 qPrintable(trail));
        QVERIFY(trail.contains("Measured pH: – → 2.53"));
        QVERIFY(trail.contains("Deviation note: – → Used for the system suitability run only"));
        QVERIFY(trail.contains("Sheet saved as PDF (A4)"));
        QVERIFY(!trail.contains("actual["));
        QVERIFY(!trail.contains("mass_g"));
    }

    void demo_batch_from_prepare_to_amendment() {
        const QString db = dir_.filePath("batch.sqlite");
        const QString base = QStringLiteral("sodium-dihydrogen-phosphate-monohydrate");
        QString id;
        double entered = 0;
        {
            auto ws = open_workspace(db);
            phaseplan::print::PrintController printer;
            printer.setData(&ws->data());
            BatchModel m;
            m.setWorkspace(ws.get());
            m.setOutput(&printer);
            m.setIdPrefix("HR");
            m.setOutputDir(dir_.filePath("out"));

            // Nobody named: refused at the preparer's field, nothing stored.
            QVERIFY(!m.markPrepared(demo_buffer()));
            QCOMPARE(m.errorField(), QString("batch.prepared_by"));
            // A new database holds only the demo's signed batch (app/storage/demo.h).
            const QStringList demo{phaseplan::storage::demo_batch_id()};
            QCOMPARE(m.batchIds(), demo);

            m.setPreparer("R. Okafor");
            QVERIFY2(m.markPrepared(demo_buffer()), qPrintable(m.errorMessage()));
            id = m.batchId();
            QCOMPARE(id, "HR-" + QDate::currentDate().toString("yyyyMMdd") + "-001");
            QCOMPARE(m.preparedBy(), QString("R. Okafor"));
            QVERIFY(!m.preparedAt().isEmpty());
            // Expiry from the shelf-life default (data/solvents.json, aqueous-buffer).
            const QDateTime at = QDateTime::fromString(m.preparedAt(), Qt::ISODate);
            const QDateTime exp = QDateTime::fromString(m.expiresAt(), Qt::ISODate);
            QVERIFY(at.isValid() && exp.isValid());
            QVERIFY(m.shelfLifeH() > 0);
            QVERIFY(std::abs(at.secsTo(exp) / 3600.0 - m.shelfLifeH()) < 0.02);
            QCOMPARE(m.batchIds(), QStringList({id}) + demo);
            QCOMPARE(count_action(m.history(), "create") > 0, true);

            // Nothing entered yet: as made = as planned, the pH on its target.
            QCOMPARE(m.rowCount(), 2);
            QCOMPARE(m.missingCount(), 2);
            QVERIFY(std::abs(m.predictedPh() - 2.5) < 0.005);
            const int r = row_of(m, base);
            QVERIFY(r >= 0);
            QCOMPARE(role(m, r, BatchModel::UnitRole).toString(), QString("g"));
            const double target = role(m, r, BatchModel::TargetRole).toDouble();
            QVERIFY(target > 0);
            // The band is ± 2 % of the target (issue 5 default), computed here.
            QVERIFY(std::abs(role(m, r, BatchModel::LowRole).toDouble() - target * 0.98) <
                    1e-9 * target);
            QVERIFY(std::abs(role(m, r, BatchModel::HighRole).toDouble() - target * 1.02) <
                    1e-9 * target);

            // Within the band: not flagged.
            const double inside = std::round(target * 1.01 * 1000) / 1000;
            QVERIFY(std::abs(inside / target - 1) < 0.02);
            QVERIFY2(m.setActual(r, inside), qPrintable(m.errorMessage()));
            QVERIFY(role(m, r, BatchModel::WithinToleranceRole).toBool());
            QCOMPARE(m.flaggedCount(), 0);

            // 5 % over: outside the band, flagged; more base form than planned → the pH as made
            // rises.
            entered = std::round(target * 1.05 * 1000) / 1000;
            QVERIFY(std::abs(entered / target - 1) > 0.02);
            QSignalSpy results(&m, &BatchModel::resultChanged);
            QVERIFY(m.setActual(r, entered));
            QVERIFY(results.count() > 0);
            QVERIFY(!role(m, r, BatchModel::WithinToleranceRole).toBool());
            QCOMPARE(m.flaggedCount(), 1);
            QVERIFY(std::abs(role(m, r, BatchModel::DeviationPercentRole).toDouble() -
                             (entered / target - 1) * 100) < 1e-6);
            QVERIFY2(m.predictedPh() > 2.5 + 0.001, qPrintable(QString::number(m.predictedPh())));
            bool warned = false;
            for (const QVariant& w : m.warnings())
                warned |= w.toMap().value("code") == "amount-out-of-tolerance";
            QVERIFY(warned);
            // The screen reads the typed evaluation; the sheet's summary JSON of the same record
            // (what `phaseplan-cli sheet` writes; the contract's own output, no outside source)
            // must say the same, field by field: a figure read from the wrong field differs.
            {
                const phaseplan::BatchDocument doc = phaseplan::read_batch_document(
                    ws->data(), QJsonObject::fromVariantMap(m.input()));
                const QJsonObject s = doc.summary;
                const QJsonObject b = s.value("batch").toObject();
                const QJsonArray checks = b.value("checks").toArray();
                QCOMPARE(m.rowCount(), int(checks.size()));
                for (int k = 0; k < m.rowCount(); ++k) {
                    const QJsonObject c = checks[k].toObject();
                    QCOMPARE(role(m, k, BatchModel::ReagentRole).toString(),
                             c.value("reagent").toString());
                    QCOMPARE(role(m, k, BatchModel::NameRole).toString(),
                             c.value("name").toString());
                    QCOMPARE(role(m, k, BatchModel::UnitRole).toString(),
                             c.value("unit").toString());
                    for (auto [rl, key] : {std::pair{BatchModel::TargetRole, "target"},
                                           std::pair{BatchModel::LowRole, "low"},
                                           std::pair{BatchModel::HighRole, "high"}})
                        QCOMPARE(role(m, k, rl).toDouble(), c.value(key).toDouble());
                    QCOMPARE(role(m, k, BatchModel::EnteredRole).toBool(),
                             c.value("entered").toBool());
                    QCOMPARE(role(m, k, BatchModel::WithinToleranceRole).toBool(),
                             c.value("within_tolerance").toBool());
                    if (c.value("entered").toBool()) {
                        QCOMPARE(role(m, k, BatchModel::ActualRole).toDouble(),
                                 c.value("actual").toDouble());
                        QCOMPARE(role(m, k, BatchModel::DeviationPercentRole).toDouble(),
                                 c.value("deviation_percent").toDouble());
                    }
                }
                QCOMPARE(m.title(), s.value("title").toString());
                QCOMPARE(m.targetPh(), s.value("target_ph").toDouble());
                QCOMPARE(m.predictedPh(), b.value("ph").toDouble());
                QCOMPARE(m.shelfLifeH(), b.value("shelf_life_h").toDouble());
                QVERIFY(std::abs(m.ionicStrengthMmolPerL() -
                                 b.value("ionic_strength_mol_per_l").toDouble() * 1000) < 1e-9);
                QVERIFY(std::abs(m.bufferCapacityMmolPerL() -
                                 b.value("buffer_capacity_mol_per_l").toDouble() * 1000) < 1e-9);
                const QJsonArray comp = b.value("composition").toArray();
                QVERIFY(!comp.isEmpty());
                QCOMPARE(m.composition().size(), comp.size());
                for (int k = 0; k < comp.size(); ++k) {
                    const QVariantMap c = m.composition()[k].toMap();
                    QCOMPARE(c.value("reagent").toString(), comp[k]["reagent"].toString());
                    QVERIFY(std::abs(c.value("mmolPerL").toDouble() -
                                     comp[k]["mol_per_l"].toDouble() * 1000) < 1e-9);
                }
                const QJsonArray ws_json = s.value("warnings").toArray();
                QCOMPARE(m.warnings().size(), ws_json.size());
                for (int k = 0; k < ws_json.size(); ++k) {
                    const QVariantMap w = m.warnings()[k].toMap();
                    QCOMPARE(w.value("code").toString(), ws_json[k]["code"].toString());
                    QCOMPARE(w.value("severity").toString(), ws_json[k]["severity"].toString());
                    QCOMPARE(w.value("message").toString(), ws_json[k]["message"].toString());
                }
            }
            QVERIFY(m.setLot(r, "SP-2207"));

            // The core refuses a negative amount: shown at that row, not stored.
            QVERIFY(!m.setActual(r, -1));
            QVERIFY(m.errorField().startsWith("batch.actual["));
            QVERIFY(!role(m, r, BatchModel::ErrorRole).toString().isEmpty());
            QVERIFY(m.setActual(r, entered));
            QVERIFY(m.errorField().isEmpty());

            // Out of tolerance: a deviation note first.
            QVERIFY(!m.saveSheet(dir_.filePath("out/sheet.pdf"), "a4"));
            QCOMPARE(m.errorField(), QString("batch.deviation.note"));
            QVERIFY(m.recordDeviation("weighed 5 % over; used for a trial injection only"));

            // Sheet and labels as PDF.
            const QString sheet = dir_.filePath("out/sheet.pdf");
            const QString labels = dir_.filePath("out/labels.pdf");
            QVERIFY2(m.saveSheet(sheet, "a4"), qPrintable(m.errorMessage()));
            QVERIFY2(m.saveLabels(labels, "label62"), qPrintable(m.errorMessage()));
            QVERIFY(QFileInfo(sheet).size() > 1000);
            QVERIFY(QFileInfo(labels).size() > 1000);
            QCOMPARE(m.lastSavedPath(), labels);
            QVERIFY(m.defaultPath("sheet").startsWith(dir_.filePath("out")));
            if (QStandardPaths::findExecutable("pdftotext").isEmpty())
                QSKIP("pdftotext (poppler-utils) missing");
            const QString text = pdf_text(sheet);
            QVERIFY2(text.contains(id), qPrintable(text.left(400)));
            const QString shown = QString::number(entered, 'f', 3);
            QVERIFY2(text.contains(shown), qPrintable(shown));
            QVERIFY(text.contains("SP-2207"));
            QVERIFY(pdf_text(labels).contains(id));

            // Printed: a plain edit is refused (the store's message at the field), nothing changes.
            QVERIFY(m.printed());
            QCOMPARE(count_action(m.history(), "print"), 2);
            const int revision = m.revision();
            const int rows_before = m.history().size();
            const double corrected = std::round(target * 1000) / 1000;
            QVERIFY(!m.setActual(r, corrected));
            QVERIFY(m.pendingAmendment());
            QVERIFY(m.errorField().startsWith("batch.actual["));
            QVERIFY(m.errorMessage().contains("print", Qt::CaseInsensitive));
            QCOMPARE(m.revision(), revision);
            QCOMPARE(m.history().size(), rows_before);
            // Printing with a change pending is refused too.
            QVERIFY(!m.saveSheet(sheet, "a4"));
            QCOMPARE(m.errorField(), QString("reason"));
            // An amendment without a reason is refused by the store; with one it is recorded.
            QVERIFY(!m.amend());
            QCOMPARE(m.errorField(), QString("reason"));
            m.setAmendReason("balance printout re-read: 5 % over was a transcription slip");
            QVERIFY2(m.amend(), qPrintable(m.errorMessage()));
            QVERIFY(!m.pendingAmendment());
            QCOMPARE(m.revision(), revision + 1);
            const QVariantMap last = m.history().back().toMap();
            QCOMPARE(last.value("action").toString(), QString("amend"));
            QVERIFY(last.value("reason").toString().contains("transcription"));
            QCOMPARE(last.value("newValue").toDouble(), corrected);
            QCOMPARE(last.value("oldValue").toDouble(), entered);
            QVERIFY(role(m, r, BatchModel::WithinToleranceRole).toBool());
            entered = corrected;
        }
        // Reopen the database: the batch, its amended amount and the whole history are there.
        auto ws = open_workspace(db);
        BatchModel m;
        m.setWorkspace(ws.get());
        QCOMPARE(m.batchIds(), QStringList({id, phaseplan::storage::demo_batch_id()}));
        QVERIFY(m.open(id));
        QVERIFY(m.printed());
        const int r = row_of(m, base);
        QCOMPARE(role(m, r, BatchModel::ActualRole).toDouble(), entered);
        QCOMPARE(role(m, r, BatchModel::LotRole).toString(), QString("SP-2207"));
        QCOMPARE(count_action(m.history(), "create") > 0, true);
        QCOMPARE(count_action(m.history(), "print"), 2);
        QCOMPARE(count_action(m.history(), "amend"), 1);
        QVERIFY(!m.open("HR-00000000-999"));
        QCOMPARE(m.errorField(), QString("batch.id"));
    }
};

QTEST_MAIN(TestGuiBatch)
#include "tst_gui_batch.moc"
