#pragma once
// Numbers as people type them at the bench, in any locale: "6.8" and "6,8" are both six point
// eight. A group separator ("1,234.5", "1.234,5", "1 234", "1'234") is refused with a message
// rather than guessed, because a balance reading of "3,161" g taken as 3161 g is the worst kind of
// mistake: plausible and a thousand times off. Exponents and words are refused too.
//
// NumberText is the QML face (a singleton): NumberField parses with it and shows values with it,
// using the locale's decimal mark and never a group separator, so that what the field shows can
// always be typed back.
#include "chem/error.h"

#include <QLocale>
#include <QObject>
#include <QQmlEngine>
#include <QString>
#include <QVariantMap>

namespace phaseplan::gui {

struct ParsedNumber {
    enum class Status {
        ok,
        empty,           ///< nothing typed (or only spaces)
        incomplete,      ///< a sign or decimal mark still waiting for digits ("6,", "-")
        group_separator, ///< two marks, or a space or apostrophe between digits
        not_a_number,    ///< letters, exponents, anything else
        not_whole,       ///< a fraction where a whole number is needed
        too_large,       ///< beyond ±1e15: no bench quantity is that large
    };
    Status status = Status::empty;
    double value = 0; ///< meaningful when status == ok
    bool ok() const { return status == Status::ok; }
};

/// Reads `text`: optional sign (+, -, U+2212), digits with at most one decimal mark ('.' or ','),
/// surrounding spaces ignored. @param whole only whole numbers (counts).
ParsedNumber parse_decimal(const QString& text, bool whole = false);

/// The message beside the field for a failed parse, naming the field's label and the text as typed.
/// Empty for Status::ok.
QString parse_message(const ParsedNumber& parsed, const QString& label, const QString& text);

/// `value` with `decimals` decimals and the locale's decimal mark, never a group separator
/// ("1234,50" in de_DE, "1234.50" in en_US).
QString format_decimal(double value, int decimals, const QLocale& locale = QLocale());
/// As format_decimal with at least `decimals` decimals, and up to two more when the value needs
/// them to be shown as held (0.515 with 2 decimals is "0.515", not "0.51"; 1.2 is "1.20"): a field
/// never shows less than what is saved, to 1e-9 relative.
QString format_shown(double value, int decimals, const QLocale& locale = QLocale());

/// An amount to weigh or measure ("0.756" mL, "2.400" g) by the one rule of the steps and sheets
/// (chem::measure_decimals), with the locale's decimal mark: the cards and the steps agree.
QString measure_text(double value, chem::MeasureUnit unit, const QLocale& locale = QLocale());

/// A sentence of chem/ (a preparation step: "Weigh 2.400 g …, pH 2.50") with the locale's
/// decimal mark in its numbers, as the cards beside it show them ("2,400 g" in de_DE). The core
/// writes every number with "." and never groups digits, so a '.' between two digits is a
/// decimal mark and nothing else ('.' ending a sentence, "H3PO4·H2O" and "Phosphoric acid 85 %"
/// stay). The command line and the printed sheet keep ".".
QString with_locale_marks(const QString& sentence, const QLocale& locale = QLocale());

class NumberText : public QObject {
    Q_OBJECT
    QML_ELEMENT
    QML_SINGLETON

  public:
    explicit NumberText(QObject* parent = nullptr) : QObject(parent) {}
    /// {ok: bool, value: number, incomplete: bool, message: string}; `label` names the field in
    /// the message ("Target pH: “6,8,1” has two decimal marks…").
    Q_INVOKABLE QVariantMap parse(const QString& text, bool whole = false,
                                  const QString& label = {}) const;
    Q_INVOKABLE QString format(double value, int decimals) const;
    Q_INVOKABLE QString formatIn(double value, int decimals, const QLocale& locale) const {
        return format_decimal(value, decimals, locale);
    }
    Q_INVOKABLE QString shownIn(double value, int decimals, const QLocale& locale) const {
        return format_shown(value, decimals, locale);
    }
};

} // namespace phaseplan::gui
