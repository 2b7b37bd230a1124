// The print library in-process: QR codes decode back (Debian's zbarimg), the quiet zone,
// the nine GHS pictograms (red frame, black symbol, all different), the hazard-statement table
// against the UN GHS wording, label geometry, and the app's PrintController (save as PDF, print
// through a QPrinter in PDF mode, errors that name the field and write nothing).
#include "chem/error.h"
#include "print/documents.h"
#include "print/ghs.h"
#include "print/print_controller.h"
#include "print/qr.h"
#include "print/sheet.h"
#include "test_support.h"

#include <QImage>
#include <QJsonArray>
#include <QPageSize>
#include <QPainter>
#include <QPrinter>
#include <QProcess>
#include <QRegularExpression>
#include <QSignalSpy>
#include <QStandardPaths>
#include <QTemporaryDir>
#include <QtTest>

using namespace phaseplan::print;
using phaseplan::testing::shipped_data;

namespace {

QJsonObject demo_with_batch() {
    QJsonObject in{{"name", "Line A buffer: 20 mM sodium phosphate pH 2.5"},
                   {"target_ph", 2.5},
                   {"temperature_c", 25},
                   {"volume_ml", 2000},
                   {"route", "mix"},
                   {"acid", "phosphoric-acid"},
                   {"base", "sodium-dihydrogen-phosphate-monohydrate"},
                   {"concentration_mol_per_l", 0.02}};
    in["batch"] = QJsonObject{
        {"id", "HR-QC117-A-0042"},
        {"prepared_by", "R. Okafor"},
        {"prepared_at", "2026-12-01T16:30:00"},
        {"actual", QJsonArray{QJsonObject{{"reagent", "sodium-dihydrogen-phosphate-monohydrate"},
                                          {"mass_g", 3.0855},
                                          {"lot", "SP-2207"}}}},
        // 3.0855 g is over the salt's ± 2 % band: printing needs a deviation note.
        {"deviation", QJsonObject{{"note", "salt over its band; trial use only"},
                                  {"by", "M. Lindqvist"},
                                  {"at", "2026-12-01T16:50:00"}}}};
    return in;
}

QStringList zbar(const QString& png) {
    QProcess p;
    p.start(QStringLiteral("zbarimg"), {"-q", "--raw", png});
    p.waitForFinished(30000);
    return QString::fromUtf8(p.readAllStandardOutput()).split('\n', Qt::SkipEmptyParts);
}

QString pdftotext(const QString& pdf) {
    QProcess p;
    p.start(QStringLiteral("pdftotext"), {"-raw", pdf, "-"});
    p.waitForFinished(30000);
    return QString::fromUtf8(p.readAllStandardOutput()).simplified();
}

bool is_red(QRgb c) {
    return qRed(c) > 180 && qGreen(c) < 90 && qBlue(c) < 90;
}
bool is_black(QRgb c) {
    return qRed(c) < 60 && qGreen(c) < 60 && qBlue(c) < 60;
}

QImage pictogram(const QString& code, int side = 200) {
    QImage img(side, side, QImage::Format_RGB32);
    img.fill(Qt::white);
    QPainter p(&img);
    paint_ghs_pictogram(p, QRectF(0, 0, side, side), code);
    p.end();
    return img;
}

} // namespace

class TestPrint : public QObject {
    Q_OBJECT
  private slots:
    void initTestCase();
    void qrDecodesBack_data();
    void qrDecodesBack();
    void qrQuietZoneIsWhite();
    void qrRefusesEmpty();
    void pictogramsHaveRedFrameAndBlackSymbol();
    void pictogramsAreDistinct();
    void hazardStatementsUseGhsWording_data();
    void hazardStatementsUseGhsWording();
    void hazardCodesSort();
    void labelGridFitsThePaper();
    void controllerSavesSheetAndLabels();
    void controllerPrintsThroughQPrinter();
    void controllerErrorsNameTheFieldAndWriteNothing();
    void outOfToleranceNeedsNoteAndCarriesMark();
    void releaseIsOnTheSheetAndEveryLabel();
    void bandHasTheDecimalsOfItsTarget();

  private:
    QTemporaryDir dir_;
};

void TestPrint::initTestCase() {
    QVERIFY(dir_.isValid());
    if (QStandardPaths::findExecutable("zbarimg").isEmpty())
        QFAIL("zbarimg (zbar-tools) is needed");
    if (QStandardPaths::findExecutable("pdftotext").isEmpty())
        QFAIL("pdftotext (poppler-utils) is needed");
}

void TestPrint::qrDecodesBack_data() {
    QTest::addColumn<QString>("text");
    QTest::addColumn<int>("module_px");
    QTest::newRow("batch id, 4 px") << "HR-QC117-A-0042" << 4;
    QTest::newRow("batch id, 2 px") << "HR-QC117-A-0042" << 2;
    QTest::newRow("lower case and spaces") << "lab 2 / batch 7 of 2026-12-01" << 3;
    QTest::newRow("64 characters") << QString(64, 'X').replace(10, 5, "-0042") << 3;
}

void TestPrint::qrDecodesBack() {
    QFETCH(QString, text);
    QFETCH(int, module_px);
    const int total = qr_total_modules(text);
    const int side = total * module_px;
    QImage img(side + 40, side + 40, QImage::Format_RGB32);
    img.fill(QColor(0xDD, 0xDD, 0xDD)); // grey around: the code must bring its own white quiet zone
    QPainter p(&img);
    paint_qr_code(p, QRectF(20, 20, side, side), text);
    p.end();
    const QString png = dir_.filePath("qr.png");
    QVERIFY(img.save(png));
    QCOMPARE(zbar(png), QStringList{text});
}

// ISO/IEC 18004 asks for a quiet zone of 4 modules (from memory).
void TestPrint::qrQuietZoneIsWhite() {
    const QString text = "HR-QC117-A-0042";
    int n = 0;
    qr_modules(text, &n, "batch.id");
    const int total = qr_total_modules(text);
    QCOMPARE(total, n + 8);
    const int m = 5;
    QImage img(total * m, total * m, QImage::Format_RGB32);
    img.fill(Qt::red);
    QPainter p(&img);
    paint_qr_code(p, QRectF(0, 0, total * m, total * m), text);
    p.end();
    for (int y = 0; y < img.height(); ++y)
        for (int x = 0; x < img.width(); ++x) {
            const bool border =
                x < 4 * m || y < 4 * m || x >= (total - 4) * m || y >= (total - 4) * m;
            if (border)
                QVERIFY2(img.pixel(x, y) == qRgb(255, 255, 255),
                         qPrintable(QString("%1,%2").arg(x).arg(y)));
        }
    // The finder pattern's corner module is dark (every QR code has one at top left).
    QVERIFY(is_black(img.pixel(4 * m + 1, 4 * m + 1)));
}

void TestPrint::qrRefusesEmpty() {
    QImage img(100, 100, QImage::Format_RGB32);
    QPainter p(&img);
    try {
        paint_qr_code(p, QRectF(0, 0, 100, 100), QString(), "batch.id");
        QFAIL("no error for an empty text");
    } catch (const chem::Error& e) {
        QCOMPARE(QString::fromStdString(e.field()), QString("batch.id"));
    }
}

// UN GHS Rev. 9, Annex 1/3: a black symbol on white in a square set on a point with a red frame.
void TestPrint::pictogramsHaveRedFrameAndBlackSymbol() {
    for (int i = 1; i <= 9; ++i) {
        const QString code = QString("GHS0%1").arg(i);
        QVERIFY(is_ghs_pictogram(code));
        QVERIFY(!ghs_pictogram_name(code).isEmpty());
        const QImage img = pictogram(code);
        // The frame crosses the four mid-edges of the box (the diamond's corners point there).
        QVERIFY2(is_red(img.pixel(100, 6)) && is_red(img.pixel(100, 193)) &&
                     is_red(img.pixel(6, 100)) && is_red(img.pixel(193, 100)),
                 qPrintable(code));
        // Outside the diamond stays untouched; inside there is a black symbol and white ground.
        QCOMPARE(img.pixel(3, 3), qRgb(255, 255, 255));
        int black = 0, white = 0;
        for (int y = 50; y < 150; ++y)
            for (int x = 50; x < 150; ++x) {
                black += is_black(img.pixel(x, y));
                white += img.pixel(x, y) == qRgb(255, 255, 255);
            }
        QVERIFY2(black > 400 && white > 2000,
                 qPrintable(QString("%1: %2 black, %3 white").arg(code).arg(black).arg(white)));
        // No red inside the symbol area: red is the frame's only.
        int red_inside = 0;
        for (int y = 70; y < 130; ++y)
            for (int x = 70; x < 130; ++x)
                red_inside += is_red(img.pixel(x, y));
        QCOMPARE(red_inside, 0);
    }
    QVERIFY(!is_ghs_pictogram("GHS10") && !is_ghs_pictogram("GHS00") && !is_ghs_pictogram("ghs05"));
    // An unknown code still draws a red frame (a hazard exists) with the code inside.
    QVERIFY(is_red(pictogram("XYZ").pixel(100, 6)));
}

void TestPrint::pictogramsAreDistinct() {
    QList<QImage> imgs;
    for (int i = 1; i <= 9; ++i)
        imgs << pictogram(QString("GHS0%1").arg(i), 120);
    for (int a = 0; a < imgs.size(); ++a)
        for (int b = a + 1; b < imgs.size(); ++b) {
            int differ = 0;
            for (int y = 0; y < 120; ++y)
                for (int x = 0; x < 120; ++x)
                    differ += is_black(imgs[a].pixel(x, y)) != is_black(imgs[b].pixel(x, y));
            QVERIFY2(
                differ > 300,
                qPrintable(QString("GHS0%1 vs GHS0%2: %3 px").arg(a + 1).arg(b + 1).arg(differ)));
        }
}

// Standard English hazard statements, UN GHS Rev. 9 (2021) Annex 3 section 1 (from memory).
void TestPrint::hazardStatementsUseGhsWording_data() {
    QTest::addColumn<QString>("code");
    QTest::addColumn<QString>("statement");
    QTest::newRow("H225") << "H225"
                          << "Highly flammable liquid and vapour";
    QTest::newRow("H290") << "H290"
                          << "May be corrosive to metals";
    QTest::newRow("H302") << "H302"
                          << "Harmful if swallowed";
    QTest::newRow("H314") << "H314"
                          << "Causes severe skin burns and eye damage";
    QTest::newRow("H318") << "H318"
                          << "Causes serious eye damage";
    QTest::newRow("H319") << "H319"
                          << "Causes serious eye irritation";
    QTest::newRow("H331") << "H331"
                          << "Toxic if inhaled";
    QTest::newRow("H335") << "H335"
                          << "May cause respiratory irritation";
    QTest::newRow("H336") << "H336"
                          << "May cause drowsiness or dizziness";
    QTest::newRow("H351") << "H351"
                          << "Suspected of causing cancer";
    QTest::newRow("H360D") << "H360D"
                           << "May damage the unborn child";
    QTest::newRow("H373") << "H373"
                          << "May cause damage to organs through prolonged or repeated exposure";
    QTest::newRow("H411") << "H411"
                          << "Toxic to aquatic life with long lasting effects";
    QTest::newRow("unknown") << "H999"
                             << "";
}

void TestPrint::hazardStatementsUseGhsWording() {
    QFETCH(QString, code);
    QFETCH(QString, statement);
    QCOMPARE(hazard_statement(code), statement);
}

void TestPrint::hazardCodesSort() {
    QCOMPARE(sorted_hazard_codes({"H314", "EUH071", "H290", "H314", "H225", " ", "H360D", "H360"}),
             QStringList({"H225", "H290", "H314", "H360", "H360D", "EUH071"}));
    QCOMPARE(sorted_pictograms({"GHS07", "ghs02", "GHS05", "GHS07"}),
             QStringList({"GHS02", "GHS05", "GHS07"}));
}

void TestPrint::labelGridFitsThePaper() {
    for (Paper paper : {Paper::a4, Paper::letter}) {
        const LabelGrid g = label_grid(paper);
        const QSizeF page = QPageSize(paper == Paper::a4 ? QPageSize::A4 : QPageSize::Letter)
                                .size(QPageSize::Millimeter);
        QCOMPARE(g.columns * g.rows, 8);
        QVERIFY(std::abs(2 * g.margin_left_mm + g.columns * g.label_width_mm +
                         (g.columns - 1) * g.gap_mm - page.width()) < 1e-6);
        QVERIFY(std::abs(2 * g.margin_top_mm + g.rows * g.label_height_mm +
                         (g.rows - 1) * g.gap_mm - page.height()) < 1e-6);
        QVERIFY(g.label_width_mm > 60 &&
                g.label_height_mm > 45); // room for a 24 mm QR code and the text
    }
    const LabelGrid one = label_grid(Paper::label62);
    QCOMPARE(one.label_width_mm, 62.0);
}

/// An out-of-tolerance batch: no sheet or label without a deviation note (and no file); with one,
/// the job's sheet and label carry the mark and the sheet a notice listing the reason.
void TestPrint::outOfToleranceNeedsNoteAndCarriesMark() {
    PrintController pc;
    pc.setData(&shipped_data());
    QJsonObject in = demo_with_batch();
    QJsonObject b = in.value("batch").toObject();
    b.remove("deviation");
    in["batch"] = b;
    const QString path = dir_.filePath("no-note.pdf");
    QVERIFY(!pc.saveSheet(in.toVariantMap(), path, "a4"));
    QCOMPARE(pc.lastErrorField(), QString("batch.deviation.note"));
    QVERIFY(!pc.saveLabels(in.toVariantMap(), path, "label62"));
    QVERIFY(!QFile::exists(path));
    // The preview still evaluates it, and says it is out of tolerance.
    QCOMPARE(
        pc.preview(in.toVariantMap()).value("batch").toMap().value("out_of_tolerance").toBool(),
        true);

    const auto job = phaseplan::print::build_print_job(shipped_data(), demo_with_batch(), "now");
    QVERIFY(!job.sheet.mark.isEmpty());
    QCOMPARE(job.labels.size(), 1);
    QCOMPARE(job.labels[0].mark, job.sheet.mark);
    bool notice = false;
    for (const auto& block : job.sheet.blocks)
        if (block.kind == phaseplan::print::Block::Kind::notice)
            notice =
                notice || (block.items.size() == 1 &&
                           block.items[0].startsWith("Sodium dihydrogen phosphate monohydrate"));
    QVERIFY(notice);
    // Within tolerance: no mark.
    QJsonObject ok = demo_with_batch();
    QJsonObject okb = ok.value("batch").toObject();
    okb.remove("actual");
    okb.remove("deviation");
    ok["batch"] = okb;
    QVERIFY(phaseplan::print::build_print_job(shipped_data(), ok, "now").sheet.mark.isEmpty());
}

void TestPrint::controllerSavesSheetAndLabels() {
    PrintController pc;
    pc.setData(&shipped_data());
    QSignalSpy printed(&pc, &PrintController::printed);
    const QVariantMap doc = demo_with_batch().toVariantMap();

    const QVariantMap preview = pc.preview(doc);
    QCOMPARE(preview.value("batch").toMap().value("id").toString(), QString("HR-QC117-A-0042"));
    bool flagged = false;
    for (const QVariant& w : preview.value("warnings").toList())
        flagged |= w.toMap().value("code").toString() == "amount-out-of-tolerance";
    QVERIFY(flagged); // 3.0855 g against 3.010 g is +2.5 %

    const QString sheet =
        QUrl::fromLocalFile(dir_.filePath("sheet.pdf")).toString(); // QML hands file: URLs
    QVERIFY2(pc.saveSheet(doc, sheet, "letter"), qPrintable(pc.lastError()));
    QVERIFY(pc.lastError().isEmpty());
    const QString text = pdftotext(dir_.filePath("sheet.pdf"));
    QVERIFY(text.contains("HR-QC117-A-0042") && text.contains("SP-2207") &&
            text.contains("Checked by"));
    QCOMPARE(printed.count(), 1);
    QCOMPARE(printed.at(0).at(0).toString(), QString("HR-QC117-A-0042"));

    QVERIFY2(pc.saveLabels(doc, dir_.filePath("label.pdf"), "label62", 2),
             qPrintable(pc.lastError()));
    QProcess r;
    r.start("pdftoppm", {"-r", "300", "-png", "-f", "2", "-l", "2", dir_.filePath("label.pdf"),
                         dir_.filePath("label")});
    QVERIFY(r.waitForFinished(60000));
    const QStringList pngs = QDir(dir_.path()).entryList({"label-*.png"});
    QCOMPARE(pngs.size(), 1); // page 2 exists: two copies
    QCOMPARE(zbar(dir_.filePath(pngs.first())), QStringList{"HR-QC117-A-0042"});
    QCOMPARE(pc.suggestedFileName(doc, "labels"), QString("HR-QC117-A-0042-labels.pdf"));
}

void TestPrint::controllerPrintsThroughQPrinter() {
    PrintController pc;
    pc.setData(&shipped_data());
    QPrinter printer(QPrinter::HighResolution);
    printer.setOutputFormat(QPrinter::PdfFormat);
    printer.setOutputFileName(dir_.filePath("printed.pdf"));
    const int pages = pc.paintSheet(printer, demo_with_batch().toVariantMap(), "a4");
    QVERIFY(pages >= 1);
    QVERIFY(pdftotext(dir_.filePath("printed.pdf"))
                .contains("page " + QString::number(pages) + " of " + QString::number(pages)));
    // With no printer named and none installed, print refuses and says what to do.
    if (pc.printers().isEmpty()) {
        QVERIFY(!pc.printSheet(demo_with_batch().toVariantMap()));
        QCOMPARE(pc.lastErrorField(), QString("printer"));
    }
}

void TestPrint::controllerErrorsNameTheFieldAndWriteNothing() {
    PrintController pc;
    QVERIFY(!pc.saveSheet(demo_with_batch().toVariantMap(), dir_.filePath("x.pdf")));
    QCOMPARE(pc.lastErrorField(), QString("data"));
    pc.setData(&shipped_data());
    QSignalSpy changed(&pc, &PrintController::lastErrorChanged);
    QJsonObject bad = demo_with_batch();
    QJsonObject b = bad["batch"].toObject();
    b.remove("id");
    bad["batch"] = b;
    const QString path = dir_.filePath("none.pdf");
    QVERIFY(!pc.saveSheet(bad.toVariantMap(), path));
    QCOMPARE(pc.lastErrorField(), QString("batch.id"));
    QVERIFY(!QFile::exists(path));
    QVERIFY(!pc.saveLabels(demo_with_batch().toVariantMap(), path, "a5"));
    QCOMPARE(pc.lastErrorField(), QString("--paper"));
    QVERIFY(!pc.saveSheet(demo_with_batch().toVariantMap(), path, "label62"));
    QCOMPARE(pc.lastErrorField(), QString("--paper"));
    QVERIFY(!pc.saveSheet(demo_with_batch().toVariantMap(), dir_.filePath("no/such/folder/x.pdf")));
    QCOMPARE(pc.lastErrorField(), QString("-o"));
    QVERIFY(!QFile::exists(path));
    QVERIFY(changed.count() >= 4);
    // A success clears the error.
    QVERIFY(pc.saveSheet(demo_with_batch().toVariantMap(), path));
    QVERIFY(pc.lastError().isEmpty() && pc.lastErrorField().isEmpty());
}

// Issue 13, part 6: labels of an unreleased batch say so; the sheet lists the electronic
// signatures and the release. Without a database (the default) a batch is not released.
void TestPrint::releaseIsOnTheSheetAndEveryLabel() {
    using phaseplan::print::Block;
    auto notice_of = [](const phaseplan::print::PrintJob& job) {
        for (const auto& b : job.sheet.blocks)
            if (b.kind == Block::Kind::notice && b.text == "NOT RELEASED FOR USE")
                return true;
        return false;
    };
    auto has_paragraph = [](const phaseplan::print::PrintJob& job, const QString& text) {
        for (const auto& b : job.sheet.blocks)
            if (b.kind == Block::Kind::paragraph && b.text == text)
                return true;
        return false;
    };
    QJsonObject ok = demo_with_batch();
    QJsonObject okb = ok.value("batch").toObject();
    okb.remove("actual");
    ok["batch"] = okb;
    const auto unreleased = phaseplan::print::build_print_job(shipped_data(), ok, "now");
    QVERIFY(notice_of(unreleased));
    QVERIFY(!unreleased.labels.isEmpty());
    for (const auto& l : unreleased.labels) {
        QVERIFY(!l.released);
        QVERIFY2(l.release.startsWith("NOT RELEASED"), qPrintable(l.release));
    }
    phaseplan::BatchRelease r;
    r.signature_lines << "Prepared by Ansel Marchetti (demo-prep) 2026-12-02 13:10:04 UTC"
                      << "Reviewed by Mats Lindqvist (demo-review) 2026-12-02 14:02:51 UTC";
    r.released_line =
        "Released for use: reviewed by Mats Lindqvist (demo-review) 2026-12-02 14:02 UTC";
    r.reviewed_by = "Mats Lindqvist (demo-review)";
    const auto released = phaseplan::print::build_print_job(shipped_data(), ok, "now", r);
    // The paper sign-off names the second person from the holding review, not a typed name;
    // unreleased, it keeps the document's own "checked_by".
    auto checked_by = [](const phaseplan::print::PrintJob& job) {
        for (const auto& b : job.sheet.blocks)
            if (b.kind == Block::Kind::signoff)
                for (const auto& f : b.fields)
                    if (f.key == "Checked by")
                        return f.value;
        return QString("(no sign-off)");
    };
    QCOMPARE(checked_by(released), QString("Mats Lindqvist (demo-review)"));
    QCOMPARE(checked_by(unreleased), ok.value("batch").toObject().value("checked_by").toString());
    QVERIFY(!notice_of(released));
    QVERIFY(has_paragraph(released, r.released_line));
    bool listed = false;
    for (const auto& b : released.sheet.blocks)
        listed = listed || (b.kind == Block::Kind::bullets && b.items == r.signature_lines);
    QVERIFY(listed);
    for (const auto& l : released.labels) {
        QVERIFY(l.released);
        QCOMPARE(
            l.release,
            QString("Released: reviewed by Mats Lindqvist (demo-review) 2026-12-02 14:02 UTC"));
    }
}

/// The decimals of the first number in `text` ("1.26 mL" → 2, "2.975 g" → 3, "500 mL" → 0).
static int decimals_of_first_number(const QString& text) {
    const QRegularExpressionMatch m = QRegularExpression(R"((\d+)(?:\.(\d+))?)").match(text);
    return m.hasMatch() ? int(m.captured(2).size()) : -1;
}

/// The tolerance band beside a target is printed with the target's decimals (chem::
/// measure_decimals, the one amount rule; common practice, no source): the demo's 1.26 mL of
/// phosphoric acid once printed a band of 1.234–1.284 mL.
void TestPrint::bandHasTheDecimalsOfItsTarget() {
    const auto job = phaseplan::print::build_print_job(shipped_data(), demo_with_batch(), "now");
    int rows = 0;
    for (const auto& block : job.sheet.blocks) {
        if (block.kind != phaseplan::print::Block::Kind::table)
            continue;
        const int target = int(block.table.headers.indexOf("Target"));
        const int band = int(block.table.headers.indexOf("Tolerance"));
        if (target < 0 || band < 0)
            continue;
        for (const QStringList& row : block.table.rows) {
            const QString band_line = row[band].section('\n', 1); // "1.24–1.28 mL"
            const QStringList ends = band_line.section(' ', 0, 0).split(QChar(0x2013));
            QCOMPARE(ends.size(), 2);
            const int want = decimals_of_first_number(row[target]);
            for (const QString& e : ends)
                QVERIFY2(decimals_of_first_number(e) == want,
                         qPrintable(row[target] + " beside the band " + band_line));
            ++rows;
        }
    }
    QCOMPARE(rows, 2); // phosphoric acid (mL) and the salt (g)
}

QTEST_MAIN(TestPrint)
#include "tst_print.moc"
