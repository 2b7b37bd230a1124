// chem/guard.h: the one guard between computed results and what shows them (issue 9).
// UTF-8 sequence lengths from RFC 3629 section 3; "é" is U+00E9 (2 bytes), "€" U+20AC (3 bytes),
// "😀" U+1F600 (4 bytes). INT_MAX is 2^31 - 1 on the platforms built here (LP64, from memory).
#include "chem/guard.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>

using namespace chem;

TEST(Guard, CutNeverSplitsACharacter) {
    const std::string s = "é€😀abc";
    EXPECT_EQ(guard::char_count(s), std::size_t(6));
    EXPECT_EQ(guard::cut(s, 1), std::string("é…"));
    EXPECT_EQ(guard::cut(s, 2), std::string("é€…"));
    EXPECT_EQ(guard::cut(s, 3), std::string("é€😀…"));
    EXPECT_EQ(guard::cut(s, 6), s);
    std::string many;
    for (int i = 0; i < 70; ++i)
        many += "é";
    const std::string q = guard::quote_id(many);
    EXPECT_EQ(guard::char_count(q), std::size_t(64 + 3)); // two quotes and the ellipsis
}

TEST(Guard, NonFiniteAmountsNeverPass) {
    EXPECT_THROW(guard::amount(std::numeric_limits<double>::infinity(), "items.x", "mass"), Error);
    EXPECT_THROW(guard::amount(std::nan(""), "items.x", "mass"), Error);
    EXPECT_THROW(guard::amount(1e300, "items.x", "mass"), Error);
    EXPECT_THROW(guard::amount(-1, "items.x", "mass"), Error);
    EXPECT_EQ(guard::amount(12.5, "items.x", "mass"), 12.5);
    try {
        guard::amount(1e300, "items.x.mass_g", "mass");
    } catch (const Error& e) {
        EXPECT_EQ(e.field(), std::string("items.x.mass_g"));
    }
}

// 1e300 batches would be -2147483648 once cast to int: the count is refused before any cast.
TEST(Guard, CountsNeverOverflow) {
    EXPECT_THROW(guard::count_up(1e300, "batches", "number of batches"), Error);
    EXPECT_THROW(guard::count_up(std::numeric_limits<double>::infinity(), "b", "n"), Error);
    EXPECT_EQ(guard::count_up(2.1, "batches", "number of batches"), 3LL);
}

TEST(Guard, YearsStayWithin1900To9000) {
    EXPECT_THROW(guard::year(0, "batch.prepared_at", "0000-01-01T00:00"), Error);
    EXPECT_THROW(guard::year(10011, "batch.expires_at", "10011-01-01T00:00"), Error);
    EXPECT_NO_THROW(guard::year(1900, "d", "1900"));
    EXPECT_NO_THROW(guard::year(9000, "d", "9000"));
}
