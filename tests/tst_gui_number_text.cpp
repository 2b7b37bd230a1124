// parse_decimal and format_decimal: numbers as typed at the bench, in any locale. "." and "," are
// both the decimal mark; anything that looks like a thousands separator is refused rather than
// guessed (common practice for bench data entry, no source: a weighing of "3,161" g read as 3161 g
// is plausible and a thousand times off). Display uses the locale's mark and no grouping, so that
// what is shown can be typed back (checked under C, en_US, de_DE and fr_FR).
#include "number_text.h"

#include <QtTest>

using phaseplan::gui::ParsedNumber;
using S = ParsedNumber::Status;

class TestNumberText : public QObject {
    Q_OBJECT
  private slots:
    /// A step's sentence with the locale's decimal mark: only a '.' between two digits changes.
    void locale_marks_in_a_sentence() {
        using phaseplan::gui::with_locale_marks;
        const QString step = QStringLiteral(
            "Measure 1.26 mL (2.126 g) of Phosphoric acid 85 % (H3PO4, 97.99 g/mol), 85 % w/w, "
            "1.689 g/mL. Filter through a 0.45 µm membrane.");
        QCOMPARE(with_locale_marks(step, QLocale(QLocale::German, QLocale::Germany)),
                 QStringLiteral("Measure 1,26 mL (2,126 g) of Phosphoric acid 85 % (H3PO4, 97,99 "
                                "g/mol), 85 % w/w, 1,689 g/mL. Filter through a 0,45 µm "
                                "membrane."));
        QCOMPARE(with_locale_marks(step, QLocale::c()), step);
        QCOMPARE(with_locale_marks(QStringLiteral("pH 2.50."), QLocale(QLocale::French)),
                 QStringLiteral("pH 2,50."));
    }

    void parse_data() {
        QTest::addColumn<QString>("text");
        QTest::addColumn<bool>("whole");
        QTest::addColumn<int>("status");
        QTest::addColumn<double>("value");
        auto row = [](const char* tag, const char* text, S s, double v = 0, bool whole = false) {
            QTest::newRow(tag) << QString::fromUtf8(text) << whole << int(s) << v;
        };
        row("point", "6.8", S::ok, 6.8);
        row("comma", "6,8", S::ok, 6.8);
        row("comma thousands-looking", "3,161", S::ok, 3.161);
        row("leading comma", ",5", S::ok, 0.5);
        row("small", "0,125", S::ok, 0.125);
        row("spaces around", "  12.5 ", S::ok, 12.5);
        row("minus", "-4", S::ok, -4);
        row("unicode minus", "\u22124,5", S::ok, -4.5);
        row("plus", "+7", S::ok, 7);
        row("empty", "", S::empty);
        row("blank", "   ", S::empty);
        row("sign only", "-", S::incomplete);
        row("trailing mark", "6,", S::incomplete);
        row("mark only", ".", S::incomplete);
        row("en grouping", "1,234.5", S::group_separator);
        row("de grouping", "1.234,5", S::group_separator);
        row("two points", "7.2.5", S::group_separator);
        row("space grouping", "1 234", S::group_separator);
        row("nbsp grouping (fr_FR)", "1\u202F234,5", S::group_separator);
        row("apostrophe grouping", "1'234", S::group_separator);
        row("letters", "abc", S::not_a_number);
        row("exponent", "1e3", S::not_a_number);
        row("unit typed", "12 mL", S::not_a_number);
        row("unit glued", "12mL", S::not_a_number);
        row("huge", "12345678901234567", S::too_large);
        row("whole ok", "40", S::ok, 40, true);
        row("whole refused", "40,5", S::not_whole, 0, true);
    }
    void parse() {
        QFETCH(QString, text);
        QFETCH(bool, whole);
        QFETCH(int, status);
        QFETCH(double, value);
        const ParsedNumber p = phaseplan::gui::parse_decimal(text, whole);
        QCOMPARE(int(p.status), status);
        if (p.ok())
            QCOMPARE(p.value, value);
        const QString msg = phaseplan::gui::parse_message(p, QStringLiteral("Actual mass"), text);
        if (p.ok()) {
            QVERIFY(msg.isEmpty());
        } else {
            QVERIFY2(msg.startsWith(QStringLiteral("Actual mass")), qPrintable(msg));
            if (!text.trimmed().isEmpty())
                QVERIFY2(msg.contains(text.trimmed()), qPrintable(msg));
        }
    }

    void format_data() {
        QTest::addColumn<QString>("locale");
        QTest::addColumn<double>("value");
        QTest::addColumn<int>("decimals");
        QTest::addColumn<QString>("shown");
        QTest::newRow("C") << "C" << 1234.5 << 2 << "1234.50";
        QTest::newRow("en_US") << "en_US" << 1234.5 << 2 << "1234.50";
        QTest::newRow("de_DE") << "de_DE" << 1234.5 << 2 << "1234,50";
        QTest::newRow("fr_FR") << "fr_FR" << 1234.5 << 2 << "1234,50";
        QTest::newRow("negative zero") << "de_DE" << -0.0001 << 2 << "0,00";
        QTest::newRow("whole") << "fr_FR" << 2000.0 << 0 << "2000";
    }
    void format() {
        QFETCH(QString, locale);
        QFETCH(double, value);
        QFETCH(int, decimals);
        QFETCH(QString, shown);
        const QString s = phaseplan::gui::format_decimal(value, decimals, QLocale(locale));
        QCOMPARE(s, shown);
        // What is shown reads back as the same number.
        if (value > 0)
            QCOMPARE(phaseplan::gui::parse_decimal(s).value, std::round(value * 100) / 100);
    }

    // A field never shows less than is saved: up to two more decimals when the value needs them
    // (a flow of 0.515 mL/min from a method transfer showed as 0.51).
    void shown_data() {
        QTest::addColumn<QString>("locale");
        QTest::addColumn<double>("value");
        QTest::addColumn<int>("decimals");
        QTest::addColumn<QString>("shown");
        QTest::newRow("needs one more") << "C" << 0.515 << 2 << "0.515";
        QTest::newRow("decimal comma") << "de_DE" << 0.515 << 2 << "0,515";
        QTest::newRow("keeps its minimum") << "C" << 1.2 << 2 << "1.20";
        QTest::newRow("float noise ignored") << "C" << 0.1 + 0.2 << 2 << "0.30";
        QTest::newRow("at most two more") << "C" << 2.912345 << 1 << "2.912";
        QTest::newRow("negative zero") << "C" << -0.0 << 2 << "0.00";
    }
    void shown() {
        QFETCH(QString, locale);
        QFETCH(double, value);
        QFETCH(int, decimals);
        QFETCH(QString, shown);
        QCOMPARE(phaseplan::gui::format_shown(value, decimals, QLocale(locale)), shown);
    }
};

QTEST_GUILESS_MAIN(TestNumberText)
#include "tst_gui_number_text.moc"
