#include "print/print_controller.h"

#include "chem/error.h"
#include "core/date_time.h"
#include "core/failure.h"
#include "print/documents.h"
#include "print/sheet.h"

#include <QJsonObject>
#include <QPrinter>
#include <QPrinterInfo>
#include <QRegularExpression>
#include <QUrl>

namespace phaseplan::print {

namespace {

QString local_path(const QString& path_or_url) {
    if (path_or_url.startsWith(QStringLiteral("file:")))
        return QUrl(path_or_url).toLocalFile();
    return path_or_url;
}

int label_copies(const PrintJob& job, Paper paper, int copies) {
    if (copies > 0)
        return copies;
    if (job.copies)
        return *job.copies;
    if (paper != Paper::label62 && job.labels.size() == 1) {
        const LabelGrid g = label_grid(paper);
        return g.columns * g.rows;
    }
    return 1;
}

} // namespace

PrintController::PrintController(QObject* parent) : QObject(parent) {}

QStringList PrintController::printers() const {
    return QPrinterInfo::availablePrinterNames();
}

QString PrintController::defaultPrinter() const {
    return QPrinterInfo::defaultPrinterName();
}

bool PrintController::fail(const QString& field, const QString& message) {
    last_error_field_ = field;
    last_error_ = field.isEmpty() ? message : field + ": " + message;
    emit lastErrorChanged();
    return false;
}

bool PrintController::succeed() {
    if (!last_error_.isEmpty() || !last_error_field_.isEmpty()) {
        last_error_.clear();
        last_error_field_.clear();
        emit lastErrorChanged();
    }
    return true;
}

QVariantMap PrintController::preview(const QVariantMap& document) {
    if (!data_)
        return fail("data", "no reference data loaded"), QVariantMap{};
    try {
        // The evaluation alone: a preview needs no deviation note (printing does).
        const BatchDocument doc =
            read_batch_document(*data_, QJsonObject::fromVariantMap(document));
        succeed();
        return doc.summary.toVariantMap();
    } catch (const chem::Error& e) {
        fail(QString::fromStdString(e.field()), QString::fromStdString(e.message()));
        return {};
    } catch (const Failure& f) {
        fail(QString::fromLatin1(f.subject()), QString::fromStdString(f.sentence()));
        return {};
    }
}

bool PrintController::saveSheet(const QVariantMap& document, const QString& path,
                                const QString& paper_name) {
    return save_sheet(document, {}, path, paper_name);
}

bool PrintController::save_sheet(const QVariantMap& document, const BatchRelease& release,
                                 const QString& path, const QString& paper_name) {
    if (!data_)
        return fail("data", "no reference data loaded");
    try {
        const Paper paper = paper_from_name(paper_name);
        if (paper == Paper::label62)
            throw chem::Error("--paper", "label62 is a label size; a sheet prints on a4 or letter");
        const PrintJob job = build_print_job(*data_, QJsonObject::fromVariantMap(document),
                                             now_minute_text(), release);
        write_pdf_atomically(local_path(path), job.title, [&](QPagedPaintDevice& d) {
            return render_sheet(d, job.sheet, paper);
        });
        succeed();
        emit printed(job.sheet.batch_id, "sheet " + paper_name + " pdf");
        return true;
    } catch (const chem::Error& e) {
        return fail(QString::fromStdString(e.field()), QString::fromStdString(e.message()));
    } catch (const Failure& f) {
        return fail(QString::fromLatin1(f.subject()), QString::fromStdString(f.sentence()));
    }
}

bool PrintController::saveLabels(const QVariantMap& document, const QString& path,
                                 const QString& paper_name, int copies) {
    return save_labels(document, {}, path, paper_name, copies);
}

bool PrintController::save_labels(const QVariantMap& document, const BatchRelease& release,
                                  const QString& path, const QString& paper_name, int copies) {
    if (!data_)
        return fail("data", "no reference data loaded");
    try {
        const Paper paper = paper_from_name(paper_name);
        const PrintJob job = build_print_job(*data_, QJsonObject::fromVariantMap(document),
                                             now_minute_text(), release);
        const int n = label_copies(job, paper, copies);
        write_pdf_atomically(local_path(path), job.title, [&](QPagedPaintDevice& d) {
            return render_labels(d, job.labels, paper, n);
        });
        succeed();
        emit printed(job.sheet.batch_id, "labels " + paper_name + " pdf");
        return true;
    } catch (const chem::Error& e) {
        return fail(QString::fromStdString(e.field()), QString::fromStdString(e.message()));
    } catch (const Failure& f) {
        return fail(QString::fromLatin1(f.subject()), QString::fromStdString(f.sentence()));
    }
}

int PrintController::paintSheet(QPrinter& printer, const QVariantMap& document,
                                const QString& paper_name, const BatchRelease& release) {
    if (!data_)
        throw chem::Error("data", "no reference data loaded");
    const Paper paper = paper_from_name(paper_name);
    if (paper == Paper::label62)
        throw chem::Error("--paper", "label62 is a label size; a sheet prints on a4 or letter");
    const PrintJob job =
        build_print_job(*data_, QJsonObject::fromVariantMap(document), now_minute_text(), release);
    printer.setDocName(job.title);
    printer.setFullPage(true); // the layout keeps its own margins
    return render_sheet(printer, job.sheet, paper);
}

int PrintController::paintLabels(QPrinter& printer, const QVariantMap& document,
                                 const QString& paper_name, int copies,
                                 const BatchRelease& release) {
    if (!data_)
        throw chem::Error("data", "no reference data loaded");
    const Paper paper = paper_from_name(paper_name);
    const PrintJob job =
        build_print_job(*data_, QJsonObject::fromVariantMap(document), now_minute_text(), release);
    printer.setDocName(job.title);
    printer.setFullPage(true);
    return render_labels(printer, job.labels, paper, label_copies(job, paper, copies));
}

bool PrintController::print_on(const QString& printer_name,
                               const std::function<int(QPrinter&)>& paint) {
    const QString name = printer_name.isEmpty() ? defaultPrinter() : printer_name;
    if (name.isEmpty())
        return fail("printer", "no printer is set up on this system: save as PDF instead");
    if (!printers().contains(name))
        return fail("printer", "\"" + name + "\" is not a known printer");
    try {
        QPrinter printer(QPrinterInfo::printerInfo(name), QPrinter::HighResolution);
        if (!printer.isValid())
            return fail("printer", "\"" + name + "\" cannot be used");
        paint(printer);
        return succeed();
    } catch (const chem::Error& e) {
        return fail(QString::fromStdString(e.field()), QString::fromStdString(e.message()));
    } catch (const Failure& f) {
        return fail(QString::fromLatin1(f.subject()), QString::fromStdString(f.sentence()));
    }
}

bool PrintController::printSheet(const QVariantMap& document, const QString& printer,
                                 const QString& paper) {
    return print_sheet(document, {}, printer, paper);
}

bool PrintController::print_sheet(const QVariantMap& document, const BatchRelease& release,
                                  const QString& printer, const QString& paper) {
    QString id;
    const bool ok = print_on(printer, [&](QPrinter& p) {
        id = document.value("batch").toMap().value("id").toString();
        return paintSheet(p, document, paper, release);
    });
    if (ok)
        emit printed(id, "sheet " + paper + " printer");
    return ok;
}

bool PrintController::printLabels(const QVariantMap& document, const QString& printer,
                                  const QString& paper, int copies) {
    return print_labels(document, {}, printer, paper, copies);
}

bool PrintController::print_labels(const QVariantMap& document, const BatchRelease& release,
                                   const QString& printer, const QString& paper, int copies) {
    QString id;
    const bool ok = print_on(printer, [&](QPrinter& p) {
        id = document.value("batch").toMap().value("id").toString();
        return paintLabels(p, document, paper, copies, release);
    });
    if (ok)
        emit printed(id, "labels " + paper + " printer");
    return ok;
}

QString PrintController::suggestedFileName(const QVariantMap& document, const QString& what) const {
    QString id = document.value("batch").toMap().value("id").toString().trimmed();
    if (id.isEmpty())
        id = QStringLiteral("batch");
    id.replace(QRegularExpression(QStringLiteral("[^A-Za-z0-9._-]+")), QStringLiteral("_"));
    return id + "-" + (what.isEmpty() ? QStringLiteral("sheet") : what) + ".pdf";
}

} // namespace phaseplan::print
