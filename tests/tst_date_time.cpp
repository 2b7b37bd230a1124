// app/core/date_time.h: the one date-time module. The contract's clock form is ISO 8601
// (yyyy-MM-ddTHH:mm:ss, local wall clock without a zone); 2026-12-04 is a Friday and 2026-03-29
// is the day Central European clocks go forward (last Sunday of March, EU rule, from memory).
#include "core/date_time.h"

#include <QTest>

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
