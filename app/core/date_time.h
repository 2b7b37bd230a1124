#pragma once
// Clock times and dates, in one place for the CLI, the screens and the pages.
//
// Times of a plan are wall-clock times without a zone (the contract's "2026-12-01T18:00:00"):
// they are read and written as written, held with Qt::UTC so that adding minutes never meets a
// daylight-saving jump (the core counts minutes from the start the same way). A time written
// with an offset keeps it on output.
//
// The screens' words ("today 18:00", "2 h 05 min") are here too, so that a time is worded the
// same wherever it is shown; `today` is a parameter so tests need no clock.
#include <QDate>
#include <QDateTime>
#include <QLocale>
#include <QString>
#include <QTime>

#include <string>

namespace phaseplan {

// ---- reading and writing the contract's clock times -------------------------------------------

/// A contract clock time ("2026-12-01T18:00:00", or with an offset) read as wall-clock time, held
/// with Qt::UTC. An offset is dropped, not converted. Invalid when it does not parse.
QDateTime wall_clock(const QString& iso);
/// The same clock reading held as wall-clock time (Qt::UTC), whatever `t`'s spec.
QDateTime as_wall_clock(const QDateTime& t);
/// Now, as the local wall clock reads it, held as wall-clock time.
QDateTime wall_clock_now();
/// The contract form without an offset: "2026-12-01T18:00:00"; "" for an invalid time.
QString wall_clock_iso(const QDateTime& t);
/// The contract form of `t`: with its offset ("2026-12-01T18:00:00+01:00") when `has_offset`,
/// else as wall_clock_iso.
QString contract_iso(const QDateTime& t, bool has_offset);
/// contract_iso(start.addSecs(seconds), has_offset) for many `seconds` from one start, without
/// QDateTime::toString per time (a sequence's rows have thousands): the date is computed from
/// the day count (proleptic Gregorian, as QDate), the offset suffix once. Starts held as
/// local time or in a named zone other than UTC, and years outside 1000–9999, take contract_iso
/// itself.
class ContractClockText {
  public:
    ContractClockText(const QDateTime& start, bool has_offset);
    /// Appends the text (ASCII) to `out`.
    void append(qint64 seconds, std::string& out) const;
    QString text(qint64 seconds) const;

  private:
    QDateTime start_;
    bool has_offset_ = false;
    bool fast_ = false;
    qint64 wall_s_ = 0;  ///< start's wall-clock reading, seconds from 1970-01-01T00:00:00
    std::string suffix_; ///< "", "Z" or "+01:00"
};
/// "07:30" or "07:30:00" as a time of day; invalid for anything else (a full date and time).
QTime time_of_day(const QString& text);

// ---- arithmetic -------------------------------------------------------------------------------

/// Hours from one contract clock time to another, as wall-clock times; −1 when either does not
/// parse.
double hours_between(const QString& from_iso, const QString& to_iso);
/// The next time of day `hour`:`minute` at or after `after` (wall clock).
QDateTime next_time_of_day(const QDateTime& after, int hour, int minute);

// ---- fixed forms for messages, records and pages ----------------------------------------------

/// "2026-12-01 18:00" (messages and printed pages); "" for an invalid time.
QString minute_text(const QDateTime& t);
/// A contract time as written, to the minute: "2026-12-01T16:30:00" → "2026-12-01 16:30" (text
/// only: an offset or seconds are cut, nothing is converted); "" stays "".
QString iso_minute_text(const QString& iso);
/// The local time now as minute_text: the print time of a page.
QString now_minute_text();
/// "2026-12-01 18:00:07" in local time of an ISO time with milliseconds (an instrument's
/// reading, stored in UTC); "" when it does not parse.
QString local_second_text(const QString& iso_ms);
/// Now in UTC with milliseconds, "2026-12-01T17:00:07.123Z": the stamp of a stored record.
QString utc_now_iso_ms();

// ---- the screens' words -----------------------------------------------------------------------

/// "today 18:00", "tomorrow 03:30", "yesterday 14:30", else "Fri 4 Dec 07:30" (the year added
/// when it is not `today`'s), so that an end or run-dry time can never be read as the wrong
/// night; "(no time)" for an invalid time.
QString day_clock_text(const QDateTime& t, const QDate& today, const QLocale& locale = QLocale());
/// The day alone: "today", "tomorrow", "Fri 4 Dec".
QString day_text(const QDate& d, const QDate& today, const QLocale& locale = QLocale());
/// "2026-12-01T18:00:00" → "Tue 18:00" style for lists; the input when it does not parse.
QString short_clock(const QString& iso);
/// A duration in words: "45 min", "2 h 05 min", "26 h 30 min" (negative counts as 0).
QString duration_text(double minutes);
/// A duration always with its hours, as pages print it: "0 h 45 min", "12 h 05 min".
QString duration_h_min_text(double minutes);
/// A time within an injection or a method, from its start: "18 min 53 s", "2 min", "45 s".
QString method_time_text(double minutes);

} // namespace phaseplan
