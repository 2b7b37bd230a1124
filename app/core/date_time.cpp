#include "core/date_time.h"

#include <QObject>
#include <QRegularExpression>

#include <algorithm>
#include <cmath>

namespace phaseplan {

namespace {
const QString iso_seconds_format = QStringLiteral("yyyy-MM-ddTHH:mm:ss");
}

QDateTime wall_clock(const QString& iso) {
    const QDateTime t = QDateTime::fromString(iso.trimmed(), Qt::ISODate);
    return t.isValid() ? as_wall_clock(t) : QDateTime();
}

QDateTime as_wall_clock(const QDateTime& t) {
    return QDateTime(t.date(), t.time(), Qt::UTC);
}

QDateTime wall_clock_now() {
    return as_wall_clock(QDateTime::currentDateTime());
}

QString wall_clock_iso(const QDateTime& t) {
    return t.isValid() ? t.toString(iso_seconds_format) : QString();
}

QString contract_iso(const QDateTime& t, bool has_offset) {
    return has_offset ? t.toString(Qt::ISODate) : wall_clock_iso(t);
}

QTime time_of_day(const QString& text) {
    static const QRegularExpression re(
        QStringLiteral("^([01]?\\d|2[0-3]):([0-5]\\d)(:([0-5]\\d))?$"));
    const auto m = re.match(text);
    if (!m.hasMatch())
        return {};
    return QTime(m.captured(1).toInt(), m.captured(2).toInt(),
                 m.captured(4).isEmpty() ? 0 : m.captured(4).toInt());
}

double hours_between(const QString& from_iso, const QString& to_iso) {
    const QDateTime a = wall_clock(from_iso);
    const QDateTime b = wall_clock(to_iso);
    if (!a.isValid() || !b.isValid())
        return -1;
    return a.secsTo(b) / 3600.0;
}

QDateTime next_time_of_day(const QDateTime& after, int hour, int minute) {
    QDateTime t(after.date(), QTime(hour, minute), after.timeSpec());
    if (t < after)
        t = t.addDays(1);
    return t;
}

QString minute_text(const QDateTime& t) {
    return t.toString(QStringLiteral("yyyy-MM-dd HH:mm"));
}

QString iso_minute_text(const QString& iso) {
    if (iso.isEmpty())
        return {};
    QString s = iso.left(16);
    s.replace('T', ' ');
    return s;
}

QString now_minute_text() {
    return minute_text(QDateTime::currentDateTime());
}

QString local_second_text(const QString& iso_ms) {
    return QDateTime::fromString(iso_ms, Qt::ISODateWithMs)
        .toLocalTime()
        .toString(QStringLiteral("yyyy-MM-dd HH:mm:ss"));
}

QString utc_now_iso_ms() {
    return QDateTime::currentDateTimeUtc().toString(Qt::ISODateWithMs);
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

QString short_clock(const QString& iso) {
    const QDateTime t = QDateTime::fromString(iso, Qt::ISODate);
    if (!t.isValid())
        return iso;
    return QLocale().toString(t, QStringLiteral("ddd HH:mm"));
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

QString duration_h_min_text(double minutes) {
    const long m = std::lround(minutes);
    return QStringLiteral("%1 h %2 min").arg(m / 60).arg(m % 60, 2, 10, QChar('0'));
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

} // namespace phaseplan
