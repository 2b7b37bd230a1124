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
    // The locale's decimal mark, never a group separator ("1262.5 mL", not "1,262.5 mL", which
    // reads as 1.2625 mL where the comma is the decimal mark).
    const auto text = [](double v, int decimals) { return format_decimal(v, decimals); };
    // A liquid is pipetted: its volume first, the mass in brackets for weighing instead.
    const bool pipetted =
        item.kind == chem::ItemKind::liquid || item.kind == chem::ItemKind::titrant_neat;
    if (pipetted && item.volume_ml && item.mass_g) {
        const double ml = *item.volume_ml, g = *item.mass_g;
        return text(ml, ml < 10 ? 3 : 2) + QStringLiteral(" mL (") + text(g, g < 1 ? 4 : 3) +
               QStringLiteral(" g)");
    }
    if (item.mass_g) {
        const double g = *item.mass_g;
        // A lab balance reads 0.1 mg below 1 g and 1 mg above: show what can be weighed.
        QString out = text(g, g < 1 ? 4 : g < 100 ? 3 : 2) + QStringLiteral(" g");
        if (item.volume_ml)
            out += QStringLiteral(" (") + text(*item.volume_ml, 2) + QStringLiteral(" mL)");
        return out;
    }
    if (item.volume_ml) {
        const double ml = *item.volume_ml;
        return text(ml, ml < 10 ? 3 : ml < 100 ? 2 : 1) + QStringLiteral(" mL");
    }
    return QString();
}

} // namespace phaseplan::gui
