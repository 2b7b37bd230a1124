#pragma once
// Clock times as the screens show them: always with their day, in words near today
// ("today 18:00", "tomorrow 03:30") and with the weekday and date further off ("Fri 4 Dec 07:30"),
// so that an end or run-dry time can never be read as the wrong night.
//
// Times of the plan are wall-clock times without a zone (the contract's "2026-12-01T18:00:00"):
// they are read and shown as written, with no daylight-saving jump.
#include <QDate>
#include <QDateTime>
#include <QLocale>
#include <QString>

namespace phaseplan::gui {

/// A contract clock time ("2026-12-01T18:00:00", or with an offset) read as wall-clock time, held
/// with Qt::UTC so that arithmetic has no daylight-saving jumps. Invalid when it does not parse.
QDateTime wall_clock(const QString& iso);
/// The contract form of a wall-clock time: "2026-12-01T18:00:00".
QString wall_clock_iso(const QDateTime& t);

/// "today 18:00", "tomorrow 03:30", "yesterday 14:30", else "Fri 4 Dec 07:30" (the year added
/// when it is not `today`'s). `today` is a parameter so tests need no clock.
QString day_clock_text(const QDateTime& t, const QDate& today, const QLocale& locale = QLocale());
/// The day alone: "today", "tomorrow", "Fri 4 Dec".
QString day_text(const QDate& d, const QDate& today, const QLocale& locale = QLocale());
/// A duration in words: "45 min", "2 h 05 min", "26 h 30 min".
QString duration_text(double minutes);
/// A time within an injection or a method, from its start: "18 min 53 s", "2 min", "45 s".
QString method_time_text(double minutes);

/// The next time of day `hour`:`minute` at or after `after` (wall clock).
QDateTime next_time_of_day(const QDateTime& after, int hour, int minute);

} // namespace phaseplan::gui
