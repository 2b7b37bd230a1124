#pragma once
// From a document of the command-line contract (a `recipe` input, a line, or a sequence) plus its
// "batch" object to what is printed: the sheet, the labels, and a JSON summary of the batch
// (checks, composition and pH as made, warnings).
//
// The "batch" object (issue 5 §5; names fixed, extend only):
//   {"id": "…", "prepared_by": "…", "prepared_at": "2026-12-01T16:30:00", "expires_at": "…",
//    "actual": [{"reagent": "<id>", "mass_g": … | "volume_ml": …, "lot": "…"}]}
// all fields but "id" optional. Extensions: "checked_by", "purpose", "tolerance_percent"
// (default 2), "final_volume_ml", "shelf_life_h" (overrides the default for the kind),
// "copies" (labels per document; default: a full sheet on a4/letter, one on label62).
// For a line, "reagent" in "actual" may also name a part (a solvent id or "buffer") or an
// additive id.
#include "chem/batch.h"
#include "core/app_data.h"
#include "print/sheet.h"

#include <QJsonObject>
#include <QList>
#include <QString>

#include <optional>

namespace phaseplan::print {

/// "recipe", "line" or "sequence": which contract document `input` is (a sequence has "lines"
/// and "sequence"; a line has "parts" or "bottle_ml"; anything else is read as a recipe).
QString document_kind(const QJsonObject& input);

/// The "batch" object of `input` read into chem::Batch. Throws chem::Error naming the field
/// ("batch", "batch.id", "batch.actual[2].mass_g", …). `copies` receives "copies" when given.
chem::Batch batch_from_json(const QJsonObject& input, std::optional<int>* copies = nullptr,
                            std::optional<double>* shelf_life_h = nullptr);

struct PrintJob {
    QString kind;                 ///< "recipe", "line", "sequence"
    QString title;                ///< for the PDF's metadata
    SheetDocument sheet;
    QList<LabelData> labels;      ///< one per bottle (a sequence: one per line)
    std::optional<int> copies;    ///< "batch.copies"
    QJsonObject summary;          ///< {"document": kind, "batch": {…}, "warnings": […]}
};

/// Validates everything and builds the sheet and the labels. Throws chem::Error naming the
/// field for bad input (the same fields and messages as the `recipe`, `line` and `sequence`
/// subcommands, plus the batch's). Nothing is written.
/// @param printed_at the time shown in the footer (the CLI passes the current time).
PrintJob build_print_job(const AppData& data, const QJsonObject& input, const QString& printed_at);

/// Shelf life in hours for a kind of solution: data/solvents.json "shelf_life" (kind
/// "aqueous-buffer", "buffer-with-organic", "neat-solvent", …) when the data folder has it,
/// else chem::ShelfLifeDefaults. `source` receives where the number comes from.
double default_shelf_life_h(const AppData& data, const QString& kind, QString* source = nullptr);

/// Number formats shared by sheets, labels and tests: amounts to about four significant figures
/// (as the recipe's steps print them), pH to 0.01, concentrations in mmol/L to 0.01.
QString format_amount(double value);
QString format_ph(double ph);
QString format_mmol_per_l(double mol_per_l);
/// "2026-12-01T16:30:00" -> "2026-12-01 16:30"; "" stays "".
QString format_datetime(const QString& iso);

} // namespace phaseplan::print
