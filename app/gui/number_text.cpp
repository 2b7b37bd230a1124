#include "number_text.h"

#include <QRegularExpression>

#include <algorithm>
#include <cmath>

namespace phaseplan::gui {

namespace {

constexpr double largest = 1e15;

bool is_digit(QChar c) {
    return c >= QLatin1Char('0') && c <= QLatin1Char('9');
}
bool is_mark(QChar c) {
    return c == QLatin1Char('.') || c == QLatin1Char(',');
}
/// Characters people and locales use to group thousands: space, no-break spaces, apostrophes.
bool is_grouping(QChar c) {
    return c == QLatin1Char(' ') || c == QChar(0x00A0) || c == QChar(0x202F) ||
           c == QChar(0x2009) || c == QLatin1Char('\'') || c == QChar(0x2019) ||
           c == QLatin1Char('_');
}

} // namespace

ParsedNumber parse_decimal(const QString& raw, bool whole) {
    using S = ParsedNumber::Status;
    const QString text = raw.trimmed();
    if (text.isEmpty())
        return {S::empty};
    int i = 0;
    bool negative = false;
    if (text[0] == QLatin1Char('+') || text[0] == QLatin1Char('-') || text[0] == QChar(0x2212)) {
        negative = text[0] != QLatin1Char('+');
        ++i;
    }
    QString digits;
    int marks = 0, int_digits = 0, frac_digits = 0;
    bool grouping = false;
    for (; i < text.size(); ++i) {
        const QChar c = text[i];
        if (is_digit(c)) {
            digits += c;
            (marks ? frac_digits : int_digits)++;
        } else if (is_mark(c)) {
            ++marks;
            digits += QLatin1Char('.');
        } else if (is_grouping(c)) {
            grouping = true;
        } else {
            return {S::not_a_number};
        }
    }
    if (grouping || marks > 1)
        return {S::group_separator};
    if (int_digits + frac_digits == 0)
        return {S::incomplete}; // "-", ".", "-,"
    if (marks == 1 && frac_digits == 0)
        return {S::incomplete}; // "6," waits for its decimals
    bool ok = false;
    double v = digits.toDouble(&ok); // C-locale conversion of a string of digits and one '.'
    if (!ok || !std::isfinite(v))
        return {S::not_a_number};
    if (negative)
        v = -v;
    if (std::abs(v) > largest)
        return {S::too_large};
    if (whole && v != std::floor(v))
        return {S::not_whole};
    return {S::ok, v};
}

QString parse_message(const ParsedNumber& p, const QString& label, const QString& text) {
    using S = ParsedNumber::Status;
    const QString what = label.isEmpty() ? QObject::tr("This field") : label;
    const QString typed = text.trimmed();
    switch (p.status) {
    case S::ok:
        return {};
    case S::empty:
        return QObject::tr("%1: type a number.").arg(what);
    case S::incomplete:
        return QObject::tr("%1: “%2” is not complete yet; not applied.").arg(what, typed);
    case S::group_separator:
        return QObject::tr(
                   "%1: “%2” has a thousands separator or two decimal marks. Type the number "
                   "without grouping, with one decimal mark (“.” or “,”); not applied.")
            .arg(what, typed);
    case S::not_a_number:
        return QObject::tr("%1: “%2” is not a number; not applied.").arg(what, typed);
    case S::not_whole:
        return QObject::tr("%1: “%2” is not a whole number; not applied.").arg(what, typed);
    case S::too_large:
        return QObject::tr("%1: “%2” is far too large; not applied.").arg(what, typed);
    }
    return {};
}

QString format_decimal(double value, int decimals, const QLocale& locale) {
    if (!std::isfinite(value))
        return QStringLiteral("–");
    QLocale l = locale;
    l.setNumberOptions(QLocale::OmitGroupSeparator);
    QString s = l.toString(value, 'f', std::max(0, decimals));
    // "-0.00" reads as a different number at the bench; show 0.
    static const QRegularExpression negative_zero(QStringLiteral("^-0([.,]0*)?$"));
    if (negative_zero.match(s).hasMatch())
        s.remove(0, 1);
    return s;
}

QString format_shown(double value, int decimals, const QLocale& locale) {
    int d = std::max(0, decimals);
    if (std::isfinite(value)) {
        const double tolerance = 1e-9 * std::max(1.0, std::abs(value));
        while (d < std::max(0, decimals) + 2) {
            const double scale = std::pow(10.0, d);
            if (std::abs(std::round(value * scale) / scale - value) <= tolerance)
                break;
            ++d;
        }
    }
    return format_decimal(value, d, locale);
}

QString measure_text(double value, chem::MeasureUnit unit, const QLocale& locale) {
    // The same digits as chem::format_measure (rounding included), only the mark differs.
    QString s = QString::fromStdString(chem::format_measure(value, unit));
    const QString mark = locale.decimalPoint();
    if (mark != QLatin1String("."))
        s.replace(QLatin1Char('.'), mark);
    return s;
}

QString with_locale_marks(const QString& sentence, const QLocale& locale) {
    const QString mark = locale.decimalPoint();
    if (mark == QLatin1String("."))
        return sentence;
    QString out;
    out.reserve(sentence.size());
    const auto digit = [](QChar c) { return c >= QLatin1Char('0') && c <= QLatin1Char('9'); };
    for (qsizetype i = 0; i < sentence.size(); ++i) {
        const QChar c = sentence[i];
        if (c == QLatin1Char('.') && i > 0 && i + 1 < sentence.size() && digit(sentence[i - 1]) &&
            digit(sentence[i + 1]))
            out += mark;
        else
            out += c;
    }
    return out;
}

QVariantMap NumberText::parse(const QString& text, bool whole, const QString& label) const {
    const ParsedNumber p = parse_decimal(text, whole);
    return {{"ok", p.ok()},
            {"value", p.ok() ? p.value : 0.0},
            {"incomplete", p.status == ParsedNumber::Status::incomplete},
            {"message", parse_message(p, label, text)}};
}

QString NumberText::format(double value, int decimals) const {
    return format_decimal(value, decimals);
}

} // namespace phaseplan::gui
