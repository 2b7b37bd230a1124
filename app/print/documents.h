#pragma once
// From a document of the command-line contract (a `recipe` input, a line, or a sequence) plus its
// "batch" object to what is printed: the sheet, the labels, and a JSON summary of the batch
// (checks, composition and pH as made, warnings).
//
// The batch is read and evaluated by core/batch_document (read_batch_document), which the app's
// Prepare & record screen uses too: the contract of the "batch" object is documented there.
// An out-of-tolerance batch prints only with a deviation note (require_deviation_note); its sheet
// and labels then carry a boxed mark.
#include "chem/batch.h"
#include "chem/error.h"
#include "core/app_data.h"
#include "core/batch_document.h"
#include "core/batch_release.h"
#include "print/sheet.h"

#include <QJsonObject>
#include <QList>
#include <QString>

#include <optional>

namespace phaseplan::print {

struct PrintJob {
    QString kind;  ///< "recipe", "line", "sequence"
    QString title; ///< for the PDF's metadata
    SheetDocument sheet;
    QList<LabelData> labels;   ///< one per bottle (a sequence: one per line)
    std::optional<int> copies; ///< "batch.copies"
    QJsonObject summary;       ///< {"document": kind, "batch": {…}, "warnings": […]}
};

/// Validates everything and builds the sheet and the labels. Throws chem::Error naming the
/// field for bad input (the same fields and messages as the `recipe`, `line` and `sequence`
/// subcommands, plus the batch's). Nothing is written.
/// @param printed_at the time shown in the footer (the CLI passes the current time).
/// @param release the batch's electronic signatures and release, from the database; the default
/// (a document printed without one) is not released, and the sheet and every label say so.
PrintJob build_print_job(const AppData& data, const QJsonObject& input, const QString& printed_at,
                         const BatchRelease& release = {});

/// Number formats shared by sheets, labels and tests: amounts to about four significant figures
/// (bottle volumes, contractions), pH to 0.01, concentrations in mmol/L to 0.01. A tolerance band
/// has its target's decimals (band_text, chem::format_measure_band).
QString format_amount(double value);
/// An amount to weigh or measure as the steps write it (chem::format_measure).
QString measure_text(double value, chem::MeasureUnit unit);
QString format_ph(double ph);
QString format_mmol_per_l(double mol_per_l);

} // namespace phaseplan::print
