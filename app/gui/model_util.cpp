#include "model_util.h"

#include <QDateTime>
#include <QLocale>
#include <QXYSeries>

namespace phaseplan::gui {

void replace_series(QObject* series, const QList<QPointF>& points) {
    if (auto* xy = qobject_cast<QXYSeries*>(series)) xy->replace(points);
}

QString short_clock(const QString& iso) {
    const QDateTime t = QDateTime::fromString(iso, Qt::ISODate);
    if (!t.isValid()) return iso;
    return QLocale().toString(t, QStringLiteral("ddd HH:mm"));
}

} // namespace phaseplan::gui
