#pragma once
// Printing from the app: a QObject that QML calls to save a sheet or labels as PDF, or to print
// them through Qt Print Support (QPrinter). It takes the same JSON documents as
// `phaseplan-cli sheet` / `labels` (a recipe, line or sequence plus "batch"), so the app and the
// command line print exactly the same pages.
//
// No QPrintDialog: it needs Qt Widgets and a display, and does not run offscreen. The app offers
// "Save as PDF" (a path, e.g. from a FileDialog) and "Print" to a printer chosen from `printers`
// (the system default when none is named).
//
// Errors: every method returns false and sets lastError / lastErrorField (the JSON path of the
// field at fault, as the CLI names it); nothing is written on error.
//
// Registration (done by the app, not here, to keep this library free of Qt Qml):
//   qmlRegisterType<phaseplan::print::PrintController>("PhasePlan.Print", 1, 0, "PrintController");
// or one instance as a context property / singleton with setData(&appData).
#include "core/app_data.h"
#include "core/document_output.h"

#include <QObject>
#include <QString>
#include <QStringList>
#include <QVariantMap>

class QPrinter;

namespace phaseplan::print {

class PrintController : public QObject, public DocumentOutput {
    Q_OBJECT
    Q_INTERFACES(phaseplan::DocumentOutput)
    /// Message of the last failure ("batch.id: is required but missing"), "" after a success.
    Q_PROPERTY(QString lastError READ lastError NOTIFY lastErrorChanged)
    /// The field the last failure names ("batch.id"), for showing the message beside it.
    Q_PROPERTY(QString lastErrorField READ lastErrorField NOTIFY lastErrorChanged)
    /// Printer names known to the system (CUPS); empty on a machine without printers.
    Q_PROPERTY(QStringList printers READ printers NOTIFY printersChanged)
    /// The system's default printer, "" when none.
    Q_PROPERTY(QString defaultPrinter READ defaultPrinter NOTIFY printersChanged)

  public:
    explicit PrintController(QObject* parent = nullptr);
    /// The reference data to design from; must outlive the controller's use. Without it every
    /// call fails with field "data".
    void setData(const AppData* data) { data_ = data; }

    QString lastError() const { return last_error_; }
    QString lastErrorField() const { return last_error_field_; }
    QStringList printers() const;
    QString defaultPrinter() const;

    /// Checks the document and its batch without printing: the summary of `phaseplan-cli sheet`
    /// (batch checks, composition and pH as made, warnings); {} and lastError on bad input.
    Q_INVOKABLE QVariantMap preview(const QVariantMap& document);

    /// Saves the sheet (paper "a4" or "letter") as a PDF at `path` (a local path or a file:
    /// URL). True on success; emits printed(batchId, "sheet <paper> pdf").
    Q_INVOKABLE bool saveSheet(const QVariantMap& document, const QString& path,
                               const QString& paper = "a4");
    /// Saves the labels ("a4", "letter" sheets of 2 × 4, or "label62"); copies 0 = the default
    /// (a full sheet, or one 62 mm label).
    Q_INVOKABLE bool saveLabels(const QVariantMap& document, const QString& path,
                                const QString& paper = "a4", int copies = 0);
    /// Prints the sheet on `printer` ("" = the default printer).
    Q_INVOKABLE bool printSheet(const QVariantMap& document, const QString& printer = {},
                                const QString& paper = "a4");
    Q_INVOKABLE bool printLabels(const QVariantMap& document, const QString& printer = {},
                                 const QString& paper = "label62", int copies = 0);
    /// "<batch id>-sheet.pdf" / "<batch id>-labels.pdf", safe as a file name.
    Q_INVOKABLE QString suggestedFileName(const QVariantMap& document,
                                          const QString& what = "sheet") const;

    /// The painting behind printSheet / printLabels on a printer set up by the caller (tests
    /// print through a QPrinter in PDF mode). Throws chem::Error like the CLI.
    /// `release` from the lab's database (BatchModel); the default prints "not released".
    int paintSheet(QPrinter& printer, const QVariantMap& document, const QString& paper,
                   const BatchRelease& release = {});
    int paintLabels(QPrinter& printer, const QVariantMap& document, const QString& paper,
                    int copies, const BatchRelease& release = {});

    // ---- DocumentOutput ------------------------------------------------------------------------
    bool writePdf(const QString& what, const QVariantMap& document, const BatchRelease& release,
                  const QString& path, const QString& paper) override {
        return what == QLatin1String("labels") ? save_labels(document, release, path, paper, 0)
                                               : save_sheet(document, release, path, paper);
    }
    bool sendToPrinter(const QString& what, const QVariantMap& document,
                       const BatchRelease& release, const QString& printer,
                       const QString& paper) override {
        return what == QLatin1String("labels") ? print_labels(document, release, printer, paper, 0)
                                               : print_sheet(document, release, printer, paper);
    }
    QStringList printerNames() const override { return printers(); }
    QString outputError() const override { return last_error_; }
    QString outputErrorField() const override { return last_error_field_; }
    QString fileNameFor(const QVariantMap& document, const QString& what) const override {
        return suggestedFileName(document, what);
    }

  signals:
    void lastErrorChanged();
    void printersChanged();
    /// After a successful save or print: the app records it in the batch's history
    /// (storage::BatchStore::mark_printed), so later changes need an amendment.
    void printed(const QString& batchId, const QString& what);

  private:
    bool save_sheet(const QVariantMap& document, const BatchRelease& release, const QString& path,
                    const QString& paper_name);
    bool save_labels(const QVariantMap& document, const BatchRelease& release, const QString& path,
                     const QString& paper_name, int copies);
    bool print_sheet(const QVariantMap& document, const BatchRelease& release,
                     const QString& printer, const QString& paper);
    bool print_labels(const QVariantMap& document, const BatchRelease& release,
                      const QString& printer, const QString& paper, int copies);
    bool fail(const QString& field, const QString& message);
    bool succeed();
    bool print_on(const QString& printer_name, const std::function<int(QPrinter&)>& paint);

    const AppData* data_ = nullptr;
    QString last_error_;
    QString last_error_field_;
};

} // namespace phaseplan::print
