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

QString amount_text(const QJsonObject& item) {
    // The locale's decimal mark, never a group separator ("1262.5 mL", not "1,262.5 mL", which
    // reads as 1.2625 mL where the comma is the decimal mark).
    struct NoGrouping {
        QString toString(double v, char, int d) const { return format_decimal(v, d); }
    } loc;
    // A liquid is pipetted: its volume first, the mass in brackets for weighing instead.
    const QString as = item.value(QLatin1String("as")).toString();
    if ((as == QLatin1String("liquid") || as.endsWith(QLatin1String("neat"))) &&
        item.contains(QLatin1String("volume_ml")) && item.contains(QLatin1String("mass_g"))) {
        const double ml = item.value(QLatin1String("volume_ml")).toDouble();
        const double g = item.value(QLatin1String("mass_g")).toDouble();
        return loc.toString(ml, 'f', ml < 10 ? 3 : 2) + QStringLiteral(" mL (") +
               loc.toString(g, 'f', g < 1 ? 4 : 3) + QStringLiteral(" g)");
    }
    if (item.contains(QLatin1String("mass_g"))) {
        const double g = item.value(QLatin1String("mass_g")).toDouble();
        // A lab balance reads 0.1 mg below 1 g and 1 mg above: show what can be weighed.
        const int decimals = g < 1 ? 4 : g < 100 ? 3 : 2;
        QString text = loc.toString(g, 'f', decimals) + QStringLiteral(" g");
        if (item.contains(QLatin1String("volume_ml")))
            text += QStringLiteral(" (") +
                    loc.toString(item.value(QLatin1String("volume_ml")).toDouble(), 'f', 2) +
                    QStringLiteral(" mL)");
        return text;
    }
    if (item.contains(QLatin1String("volume_ml"))) {
        const double ml = item.value(QLatin1String("volume_ml")).toDouble();
        const int decimals = ml < 10 ? 3 : ml < 100 ? 2 : 1;
        return loc.toString(ml, 'f', decimals) + QStringLiteral(" mL");
    }
    return QString();
}

} // namespace phaseplan::gui
