#pragma once
// Where a batch's sheet and labels go: a PDF file or a printer. The app's models depend on this
// interface only; print::PrintController implements it (app/print), and the app hands one to the
// model (BatchModel::output). So the GUI models need nothing from app/print, and a test can pass
// any implementation.
//
// `document` is the input of `phaseplan-cli sheet` / `labels`: a contract document with "batch".
#include "core/batch_release.h"

#include <QObject>
#include <QString>
#include <QStringList>
#include <QVariantMap>

namespace phaseplan {

class DocumentOutput {
  public:
    virtual ~DocumentOutput() = default;
    /// Writes the "sheet" or the "labels" of `document` as a PDF at `path` on `paper` ("a4",
    /// "letter", "label62"). False on failure, with outputError() / outputErrorField() saying why.
    /// `release`: the batch's signatures and release from the lab's database (printed on the
    /// sheet and on every label).
    virtual bool writePdf(const QString& what, const QVariantMap& document,
                          const BatchRelease& release, const QString& path,
                          const QString& paper) = 0;
    /// Prints the "sheet" or the "labels" on `printer` ("" = the system's default printer).
    virtual bool sendToPrinter(const QString& what, const QVariantMap& document,
                               const BatchRelease& release, const QString& printer,
                               const QString& paper) = 0;
    /// Printer names known to the system; empty when none is set up.
    virtual QStringList printerNames() const = 0;
    /// The last failure's message and the field it names ("" after a success).
    virtual QString outputError() const = 0;
    virtual QString outputErrorField() const = 0;
    /// "<batch id>-sheet.pdf", usable as a file name.
    virtual QString fileNameFor(const QVariantMap& document, const QString& what) const = 0;
};

} // namespace phaseplan

#define PhasePlanDocumentOutput_iid "org.phaseplan.DocumentOutput/1"
Q_DECLARE_INTERFACE(phaseplan::DocumentOutput, PhasePlanDocumentOutput_iid)
