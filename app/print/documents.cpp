#include "print/documents.h"

#include "chem/error.h"
#include "core/json_util.h"
#include "print/sheet_parts.h"

namespace phaseplan::print {

// ---- formats ----------------------------------------------------------------------------------

QString format_amount(double v) {
    return QString::fromStdString(chem::format_amount(v));
}

QString measure_text(double value, chem::MeasureUnit unit) {
    return QString::fromStdString(chem::format_measure(value, unit));
}

QString format_ph(double ph) {
    return QString::number(ph, 'f', 2);
}

QString format_mmol_per_l(double mol_per_l) {
    return QString::number(mol_per_l * 1000.0, 'f', 2) + " mmol/L";
}

PrintJob build_print_job(const AppData& data, const QJsonObject& input, const QString& printed_at,
                         const BatchRelease& release) {
    // Texts that only the paper shows: held to the same limit as every text field.
    for (const char* key : {"name", "purpose"})
        if (input.value(key).isString())
            json::check_text(input.value(key).toString(), key, chem::guard::max_text_chars);
    const QJsonValue purpose = input.value("batch").toObject().value("purpose");
    if (purpose.isString())
        json::check_text(purpose.toString(), "batch.purpose", chem::guard::max_text_chars);
    const BatchDocument doc = read_batch_document(data, input);
    require_deviation_note(data, doc);
    if (doc.kind == "line")
        return line_job(data, doc, input, printed_at, release);
    if (doc.kind == "sequence")
        return sequence_job(data, doc, input, printed_at, release);
    return recipe_job(data, doc, input, printed_at, release);
}

} // namespace phaseplan::print
