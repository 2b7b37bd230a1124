// chem/guard.h: the one guard between computed results and what shows them (issue 9).
// UTF-8 sequence lengths from RFC 3629 section 3; "é" is U+00E9 (2 bytes), "€" U+20AC (3 bytes),
// "😀" U+1F600 (4 bytes). INT_MAX is 2^31 - 1 on the platforms built here (LP64, from memory).
#include "chem/guard.h"

#include <QTest>

#include <cmath>
#include <limits>

using namespace chem;

class TestGuard : public QObject {
    Q_OBJECT
  private slots:
    void cut_never_splits_a_character() {
        const std::string s = "é€😀abc";
        QCOMPARE(guard::char_count(s), std::size_t(6));
        QCOMPARE(guard::cut(s, 1), std::string("é…"));
        QCOMPARE(guard::cut(s, 2), std::string("é€…"));
        QCOMPARE(guard::cut(s, 3), std::string("é€😀…"));
        QCOMPARE(guard::cut(s, 6), s);
        std::string many;
        for (int i = 0; i < 70; ++i)
            many += "é";
        const std::string q = guard::quote_id(many);
        QCOMPARE(guard::char_count(q), std::size_t(64 + 3)); // two quotes and the ellipsis
    }

    void non_finite_amounts_never_pass() {
        QVERIFY_THROWS_EXCEPTION(
            Error, guard::amount(std::numeric_limits<double>::infinity(), "items.x", "mass"));
        QVERIFY_THROWS_EXCEPTION(Error, guard::amount(std::nan(""), "items.x", "mass"));
        QVERIFY_THROWS_EXCEPTION(Error, guard::amount(1e300, "items.x", "mass"));
        QVERIFY_THROWS_EXCEPTION(Error, guard::amount(-1, "items.x", "mass"));
        QCOMPARE(guard::amount(12.5, "items.x", "mass"), 12.5);
        try {
            guard::amount(1e300, "items.x.mass_g", "mass");
        } catch (const Error& e) {
            QCOMPARE(e.field(), std::string("items.x.mass_g"));
        }
    }

    // 1e300 batches would be -2147483648 once cast to int: the count is refused before any cast.
    void counts_never_overflow() {
        QVERIFY_THROWS_EXCEPTION(Error, guard::count_up(1e300, "batches", "number of batches"));
        QVERIFY_THROWS_EXCEPTION(
            Error, guard::count_up(std::numeric_limits<double>::infinity(), "b", "n"));
        QCOMPARE(guard::count_up(2.1, "batches", "number of batches"), 3LL);
    }

    void years_stay_within_1900_to_9000() {
        QVERIFY_THROWS_EXCEPTION(Error, guard::year(0, "batch.prepared_at", "0000-01-01T00:00"));
        QVERIFY_THROWS_EXCEPTION(Error,
                                 guard::year(10011, "batch.expires_at", "10011-01-01T00:00"));
        guard::year(1900, "d", "1900");
        guard::year(9000, "d", "9000");
    }
};

QTEST_APPLESS_MAIN(TestGuard)
#include "tst_guard.moc"
