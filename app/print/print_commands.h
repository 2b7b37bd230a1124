#pragma once
// The printing subcommands, with the signature of app/core/commands.h: JSON document in, a PDF
// written to opt.output_path (-o), a JSON summary out. Bad input throws chem::Error naming the
// field, before any file is touched; the PDF is written to a temporary file and renamed, so a
// failure never leaves a partial file.
#include "core/commands.h"

namespace phaseplan {

/// `phaseplan-cli sheet`: the recipe sheet (or line sheet, or sequence sheet) of a `recipe`
/// input (a line, a sequence) plus "batch" (see app/print/documents.h). --paper a4|letter.
/// Output: {"output": path, "paper": …, "pages": n, "document": …, "batch": {…}, "warnings": […]}.
QJsonObject command_sheet(const AppData& data, const QJsonObject& input, const CommandOptions& opt);

/// `phaseplan-cli labels`: bottle labels for the same input: a sheet of 2 × 4 labels on a4 or
/// letter, or one 62 mm label per page (label62). "batch.copies" sets how many of each.
/// Output as command_sheet, plus "labels": n.
QJsonObject command_labels(const AppData& data, const QJsonObject& input,
                           const CommandOptions& opt);

} // namespace phaseplan
