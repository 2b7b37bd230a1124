#include "clock_text.h"

#include <QObject>

#include <cmath>

namespace phaseplan::gui {

QDateTime wall_clock(const QString& iso) {
    QDateTime t = QDateTime::fromString(iso.trimmed(), Qt::ISODate);
    if (!t.isValid())
        return {};
    // Keep the written clock reading: an offset is dropped, not converted. Held as UTC so that
    // adding hours never meets a daylight-saving jump (the core counts minutes the same way).
    return QDateTime(t.date(), t.time(), Qt::UTC);
}

QString wall_clock_iso(const QDateTime& t) {
    return t.isValid() ? t.toString(QStringLiteral("yyyy-MM-ddTHH:mm:ss")) : QString();
}

QString day_text(const QDate& d, const QDate& today, const QLocale& locale) {
    const qint64 days = today.daysTo(d);
    if (days == 0)
        return QObject::tr("today");
    if (days == 1)
        return QObject::tr("tomorrow");
    if (days == -1)
        return QObject::tr("yesterday");
    const QString fmt =
        d.year() == today.year() ? QStringLiteral("ddd d MMM") : QStringLiteral("ddd d MMM yyyy");
    return locale.toString(d, fmt);
}

QString day_clock_text(const QDateTime& t, const QDate& today, const QLocale& locale) {
    if (!t.isValid())
        return QObject::tr("(no time)");
    return day_text(t.date(), today, locale) + QLatin1Char(' ') +
           t.time().toString(QStringLiteral("HH:mm"));
}

QString duration_text(double minutes) {
    if (!std::isfinite(minutes))
        return QStringLiteral("–");
    const long long total = std::llround(std::max(0.0, minutes));
    const long long h = total / 60, m = total % 60;
    if (h == 0)
        return QObject::tr("%1 min").arg(m);
    return QObject::tr("%1 h %2 min").arg(h).arg(m, 2, 10, QLatin1Char('0'));
}

QString method_time_text(double minutes) {
    if (!std::isfinite(minutes))
        return QStringLiteral("–");
    const long long total_s = std::llround(std::max(0.0, minutes) * 60.0);
    const long long m = total_s / 60, s = total_s % 60;
    if (m == 0)
        return QObject::tr("%1 s").arg(s);
    if (s == 0)
        return QObject::tr("%1 min").arg(m);
    return QObject::tr("%1 min %2 s").arg(m).arg(s);
}

QDateTime next_time_of_day(const QDateTime& after, int hour, int minute) {
    QDateTime t(after.date(), QTime(hour, minute), after.timeSpec());
    if (t < after)
        t = t.addDays(1);
    return t;
}

} // namespace phaseplan::gui
