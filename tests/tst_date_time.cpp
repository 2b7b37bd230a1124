// app/core/date_time.h: the one date-time module. The contract's clock form is ISO 8601
// (yyyy-MM-ddTHH:mm:ss, local wall clock without a zone); 2026-12-04 is a Friday and 2026-03-29
// is the day Central European clocks go forward (last Sunday of March, EU rule, from memory).
#include "core/date_time.h"

#include <QTest>
#include <QTimeZone>

#include <cmath>

using namespace phaseplan;

class TestDateTime : public QObject {
    Q_OBJECT
  private slots:
    void wall_clock_keeps_the_written_reading() {
        // An offset is dropped, not converted; surrounding blanks are ignored.
        QCOMPARE(wall_clock_iso(wall_clock(" 2026-12-01T18:00:00+05:00 ")),
                 QString("2026-12-01T18:00:00"));
        QVERIFY(!wall_clock("tonight").isValid());
        QCOMPARE(wall_clock_iso(QDateTime()), QString());
        // No daylight-saving jump: 01:00 to 04:00 on the night clocks go forward is 3 h.
        QCOMPARE(hours_between("2026-03-29T01:00:00", "2026-03-29T04:00:00"), 3.0);
        QCOMPARE(hours_between("2026-12-01T18:00:00", "2026-12-02T07:30:00"), 13.5);
        QCOMPARE(hours_between("2026-12-01T18:00:00", "later"), -1.0);
    }

    void contract_form_keeps_an_offset_only_when_written() {
        const QDateTime t = QDateTime::fromString("2026-12-01T18:00:00+01:00", Qt::ISODate);
        QCOMPARE(contract_iso(t, true), QString("2026-12-01T18:00:00+01:00"));
        QCOMPARE(contract_iso(as_wall_clock(t), false), QString("2026-12-01T18:00:00"));
        QCOMPARE(minute_text(as_wall_clock(t)), QString("2026-12-01 18:00"));
        QCOMPARE(iso_minute_text("2026-12-01T16:30:00+01:00"), QString("2026-12-01 16:30"));
        QCOMPARE(iso_minute_text(""), QString());
    }

    void contract_clock_text_matches_the_qt_form() {
        // Reference: contract_iso (QDateTime::toString) at each time. 2000 and 2400 are leap
        // years, 1900 and 2100 are not (Gregorian rule, from memory); the steps cross month,
        // year and century ends, negative steps go before 1970.
        const char* starts[] = {"2026-12-01T18:00:00",       "1900-02-28T23:59:59",
                                "1999-12-31T23:00:00.750",   "2024-02-28T12:00:00+05:30",
                                "1969-12-31T23:59:59-03:00", "2100-02-28T22:00:00Z",
                                "8999-12-31T20:00:00"};
        const qint64 steps[] = {0,      1,        59,       3599,     86399,      86400,
                                172800, 2678400,  31536000, 31622400, 126230400,  -1,
                                -86401, -3600000, 12345678, 98765432, 3155760000, -2000000000};
        for (const char* s : starts) {
            bool offset = false;
            QDateTime t = QDateTime::fromString(QString::fromLatin1(s), Qt::ISODate);
            QVERIFY2(t.isValid(), s);
            offset = t.timeSpec() != Qt::LocalTime;
            if (!offset)
                t = as_wall_clock(t);
            const ContractClockText fast(t, offset);
            for (qint64 step : steps)
                QCOMPARE(fast.text(step), contract_iso(t.addSecs(step), offset));
            // Held in the UTC zone, as the sequence reader holds a start without an offset.
            if (!offset) {
                const QDateTime z(t.date(), t.time(), QTimeZone::utc());
                const ContractClockText in_zone(z, false);
                for (qint64 step : steps)
                    QCOMPARE(in_zone.text(step), contract_iso(z.addSecs(step), false));
            }
        }
        // A start held as local time takes the slow path, with the same result.
        const QDateTime local(QDate(2026, 3, 28), QTime(23, 0), Qt::LocalTime);
        QCOMPARE(ContractClockText(local, false).text(7200),
                 contract_iso(local.addSecs(7200), false));
        QCOMPARE(ContractClockText(QDateTime(), false).text(60), QString());
    }

    void time_of_day_reads_clock_readings_only() {
        QCOMPARE(time_of_day("07:30"), QTime(7, 30));
        QCOMPARE(time_of_day("7:30:15"), QTime(7, 30, 15));
        QVERIFY(!time_of_day("24:00").isValid());
        QVERIFY(!time_of_day("2026-12-02T07:30:00").isValid());
        QVERIFY(!time_of_day("").isValid());
    }

    void next_time_of_day_rolls_over_midnight() {
        const QDateTime evening = wall_clock("2026-12-01T19:00:00");
        QCOMPARE(wall_clock_iso(next_time_of_day(evening, 18, 0)), QString("2026-12-02T18:00:00"));
        QCOMPARE(wall_clock_iso(next_time_of_day(evening, 19, 0)), QString("2026-12-01T19:00:00"));
    }

    void words_for_the_screens_and_pages() {
        const QLocale c(QLocale::C);
        const QDate today(2026, 12, 1);
        QCOMPARE(day_clock_text(wall_clock("2026-12-02T03:30:00"), today, c),
                 QString("tomorrow 03:30"));
        QCOMPARE(day_clock_text(wall_clock("2026-12-04T07:30:00"), today, c),
                 QString("Fri 4 Dec 07:30"));
        QCOMPARE(day_text(QDate(2027, 1, 1), today, c), QString("Fri 1 Jan 2027"));
        QCOMPARE(duration_text(45), QString("45 min"));
        QCOMPARE(duration_text(125), QString("2 h 05 min"));
        QCOMPARE(duration_h_min_text(45), QString("0 h 45 min"));
        QCOMPARE(method_time_text(18 + 53.0 / 60), QString("18 min 53 s"));
        QCOMPARE(duration_text(std::nan("")), QString("–"));
    }
};

QTEST_GUILESS_MAIN(TestDateTime)
#include "tst_date_time.moc"
