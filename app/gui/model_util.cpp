#include "model_util.h"

#include "number_text.h"

#include <QJsonObject>
#include <QLocale>
#include <QXYSeries>

namespace phaseplan::gui {

void replace_series(QObject* series, const QList<QPointF>& points) {
    if (auto* xy = qobject_cast<QXYSeries*>(series))
        xy->replace(points);
}

QString amount_text(const chem::RecipeItem& item) {
    // The locale's decimal mark, never a group separator ("1262 mL", not "1,262 mL", which reads
    // as 1.262 mL where the comma is the decimal mark), and the decimals of the steps
    // (chem::measure_decimals): what the card shows is what the step says.
    using chem::MeasureUnit;
    // A liquid is pipetted: its volume first, the mass in brackets for weighing instead.
    const bool pipetted =
        item.kind == chem::ItemKind::liquid || item.kind == chem::ItemKind::titrant_neat;
    if (pipetted && item.volume_ml && item.mass_g)
        return measure_text(*item.volume_ml, MeasureUnit::ml) + QStringLiteral(" mL (") +
               measure_text(*item.mass_g, MeasureUnit::g) + QStringLiteral(" g)");
    if (item.mass_g) {
        QString out = measure_text(*item.mass_g, MeasureUnit::g) + QStringLiteral(" g");
        if (item.volume_ml)
            out += QStringLiteral(" (") + measure_text(*item.volume_ml, MeasureUnit::ml) +
                   QStringLiteral(" mL)");
        return out;
    }
    if (item.volume_ml)
        return measure_text(*item.volume_ml, MeasureUnit::ml) + QStringLiteral(" mL");
    return QString();
}

} // namespace phaseplan::gui
