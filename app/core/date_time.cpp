#include "core/date_time.h"

#include <QObject>
#include <QRegularExpression>
#include <QTimeZone>

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

namespace {

/// Year, month and day of a day count from 1970-01-01 (proleptic Gregorian; H. Hinnant's
/// days_from_civil inverse, "chrono-Compatible Low-Level Date Algorithms", from memory).
void civil_from_days(qint64 z, qint64& y, int& m, int& d) {
    z += 719468;
    const qint64 era = (z >= 0 ? z : z - 146096) / 146097;
    const qint64 doe = z - era * 146097;                                      // [0, 146096]
    const qint64 yoe = (doe - doe / 1460 + doe / 36524 - doe / 146096) / 365; // [0, 399]
    const qint64 doy = doe - (365 * yoe + yoe / 4 - yoe / 100);               // [0, 365]
    const qint64 mp = (5 * doy + 2) / 153;                                    // [0, 11]
    d = static_cast<int>(doy - (153 * mp + 2) / 5 + 1);
    m = static_cast<int>(mp < 10 ? mp + 3 : mp - 9);
    y = yoe + era * 400 + (m <= 2 ? 1 : 0);
}

qint64 floor_div(qint64 a, qint64 b) {
    return a / b - ((a % b != 0) && ((a < 0) != (b < 0)) ? 1 : 0);
}

void put_digits(char* at, qint64 value, int width) {
    for (int i = width - 1; i >= 0; --i) {
        at[i] = static_cast<char>('0' + value % 10);
        value /= 10;
    }
}

/// Two digits of `value` (0-99).
void put_two(char* at, int value) {
    at[0] = static_cast<char>('0' + value / 10);
    at[1] = static_cast<char>('0' + value % 10);
}

} // namespace

ContractClockText::ContractClockText(const QDateTime& start, bool has_offset)
    : start_(start), has_offset_(has_offset) {
    if (!start.isValid())
        return;
    const Qt::TimeSpec spec = start.timeSpec();
    const bool fixed_offset = spec == Qt::UTC || spec == Qt::OffsetFromUTC ||
                              (spec == Qt::TimeZone && start.timeZone() == QTimeZone::utc());
    if (!fixed_offset)
        return; // local time or a zone with daylight saving: contract_iso itself
    const int year = start.date().year();
    if (year < 1000 || year > 9999)
        return;
    const qint64 wall_ms = start.toMSecsSinceEpoch() + qint64(start.offsetFromUtc()) * 1000;
    wall_s_ = floor_div(wall_ms, 1000);
    if (has_offset)
        suffix_ = start.toString(Qt::ISODate).mid(19).toStdString();
    fast_ = true;
}

void ContractClockText::append(qint64 seconds, std::string& out) const {
    if (fast_) {
        const qint64 s = wall_s_ + seconds;
        const qint64 days = floor_div(s, 86400);
        const qint64 in_day = s - days * 86400;
        qint64 y = 0;
        int m = 0, d = 0;
        civil_from_days(days, y, m, d);
        if (y >= 1000 && y <= 9999) {
            char buf[19] = {0, 0, 0, 0, '-', 0, 0, '-', 0, 0, 'T', 0, 0, ':', 0, 0, ':', 0, 0};
            put_digits(buf, y, 4);
            put_two(buf + 5, m);
            put_two(buf + 8, d);
            const int secs = static_cast<int>(in_day); // [0, 86399]
            put_two(buf + 11, secs / 3600);
            put_two(buf + 14, secs / 60 % 60);
            put_two(buf + 17, secs % 60);
            out.append(buf, sizeof buf);
            if (!suffix_.empty())
                out += suffix_;
            return;
        }
    }
    out += contract_iso(start_.addSecs(seconds), has_offset_).toStdString();
}

QString ContractClockText::text(qint64 seconds) const {
    std::string s;
    append(seconds, s);
    return QString::fromLatin1(s.data(), static_cast<qsizetype>(s.size()));
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
