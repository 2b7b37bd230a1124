#pragma once
// Streaming JSON text, byte for byte what QJsonDocument::toJson(QJsonDocument::Indented) writes
// for the same values (4-space indent, "key": value, Qt's number forms), for results too large to
// build as a QJsonObject first (a sequence's rows). The caller gives an object's keys in the
// order QJsonObject keeps them (sorted by UTF-16 code unit; for ASCII keys, byte order).
//
// Numbers are held to json::check_output's guard as they are written: a number that is not
// finite or lies beyond ±chem::guard::max_amount · 10^3 throws chem::Error naming its path, so
// the text never holds "inf", "nan" or an overflow. Embedded QJsonValues are checked the same way.
#include "core/json_util.h"

#include <QByteArray>
#include <QJsonValue>
#include <QString>
#include <QStringView>

#include <cstring>
#include <string>
#include <string_view>
#include <vector>

namespace phaseplan::json {

class IndentedWriter {
  public:
    /// The text, complete (with Qt's final newline) after the outermost end_object(); the
    /// writer is empty afterwards.
    QByteArray take();
    /// Room for `bytes` more without growing.
    void reserve(std::size_t bytes);

    void begin_object() { open('{'); }
    void end_object() { close('}'); }
    void begin_array() { open('['); }
    void end_array() { close(']'); }
    /// The next member's key (inside an object); its value follows.
    void key(std::string_view ascii_key) {
        char* at = element(ascii_key.size() + 4);
        *at++ = '"';
        std::memcpy(at, ascii_key.data(), ascii_key.size());
        at += ascii_key.size();
        at[0] = '"';
        at[1] = ':';
        at[2] = ' ';
        after_key_ = true;
    }

    /// A number as QJsonValue(double) writes it (integral values up to 2^53 as integers).
    /// `at()` gives the number's path ("rows[3].volume_ml.A") as a std::string and is called
    /// only when it is refused.
    template <class At> void number(double value, const At& at) {
        if (!output_number_in_range(value))
            refuse_output_number(value, at());
        number_in_range(value);
    }
    void integer(long long value);
    /// A string given as UTF-8 (a document's text after toStdString).
    void string(std::string_view utf8);
    void boolean(bool value);
    void null();
    /// Any value, written by Qt itself and indented to this place; checked as check_output
    /// checks it, with `at` as the path of the value.
    void value(const QJsonValue& v, const std::string& at);

  private:
    void number_in_range(double value);
    void walk(const QJsonValue& v);       ///< v written as Qt writes it (checked before)
    void qt_string(const QString& text);  ///< a string as Qt escapes it
    void any_string(const QString& text); ///< plain ASCII directly, else qt_string
    /// The separator and indent before an array element or a key (none for a key's value),
    /// then room for `n` bytes of the element, returned to be filled.
    char* element(std::size_t n) {
        if (after_key_) { // the value of a key: on the key's line
            after_key_ = false;
            return room(n);
        }
        if (levels_.empty())
            return room(n); // the document itself
        Level& l = levels_.back();
        const std::size_t depth = levels_.size();
        const std::size_t comma = l.empty ? 0 : 2;
        char* at = room(comma + 4 * depth + n);
        if (!l.empty) {
            at[0] = ',';
            at[1] = '\n';
        }
        l.empty = false;
        return indent(at + comma, depth);
    }
    /// Four blanks a level at `at`; returns the end.
    static char* indent(char* at, std::size_t depth) {
        for (std::size_t i = 0; i < depth; ++i, at += 4)
            std::memcpy(at, "    ", 4);
        return at;
    }
    /// n bytes at the end of the text, to be filled.
    char* room(std::size_t n) {
        if (capacity_ - used_ < n)
            grow(n);
        char* at = text_ + used_;
        used_ += n;
        return at;
    }
    void grow(std::size_t n);
    void put(const char* p, std::size_t n) { std::memcpy(room(n), p, n); }
    void open(char bracket);
    void close(char bracket);

    struct Level {
        bool object = false;
        bool empty = true;
    };
    /// Qt's text of recently written fractional numbers (a sequence's rows repeat a method's
    /// volumes): a small table indexed by the number's bits, holding exact bits and text.
    struct NumberText {
        quint64 bits = ~quint64(0); ///< a NaN, which is never written
        std::string text;
    };
    std::vector<NumberText> numbers_;

    /// The text in out_[0, used_), room after it up to capacity_ (out_.size(): QByteArray leaves
    /// the bytes it adds unset, where std::string would fill them first); text_ is out_.data().
    QByteArray out_;
    char* text_ = nullptr;
    std::size_t used_ = 0;
    std::size_t capacity_ = 0;
    std::vector<Level> levels_;
    bool after_key_ = false;
};

} // namespace phaseplan::json
