#pragma once
// Streaming JSON text, byte for byte what QJsonDocument::toJson(QJsonDocument::Indented) writes
// for the same values (4-space indent, "key": value, Qt's number forms), for results too large to
// build as a QJsonObject first (a sequence's rows). The caller gives an object's keys in the
// order QJsonObject keeps them (sorted by UTF-16 code unit; for ASCII keys, byte order).
//
// Numbers are held to json::check_output's guard as they are written: a number that is not
// finite or lies beyond ±chem::guard::max_amount · 10^3 throws chem::Error naming its path, so
// the text never holds "inf", "nan" or an overflow. Embedded QJsonValues are checked the same way.
#include <QJsonValue>
#include <QString>
#include <QStringView>

#include <functional>
#include <string>
#include <string_view>
#include <vector>

namespace phaseplan::json {

class IndentedWriter {
  public:
    /// The text, complete (with Qt's final newline) after the outermost end_object(); the
    /// writer is empty afterwards.
    std::string take();
    /// Room for `bytes` more without growing.
    void reserve(std::size_t bytes);

    void begin_object();
    void end_object();
    void begin_array();
    void end_array();
    /// The next member's key (inside an object); its value follows.
    void key(std::string_view ascii_key);

    /// A number as QJsonValue(double) writes it (integral values up to 2^53 as integers). `at`
    /// gives the number's path ("rows[3].volume_ml.A") and is called only when it is refused.
    void number(double value, const std::function<std::string()>& at);
    void integer(long long value);
    /// A string given as UTF-8 (a document's text after toStdString).
    void string(std::string_view utf8);
    void boolean(bool value);
    void null();
    /// Any value, written by Qt itself and indented to this place; checked as check_output
    /// checks it, with `at` as the path of the value.
    void value(const QJsonValue& v, const std::string& at);

  private:
    void walk(const QJsonValue& v);       ///< v written as Qt writes it (checked before)
    void qt_string(const QString& text);  ///< a string as Qt escapes it
    void any_string(const QString& text); ///< plain ASCII directly, else qt_string
    void element();            ///< the separator and indent before an array element or a key
    char* room(std::size_t n); ///< n bytes at the end of the text, to be filled
    void put(const char* p, std::size_t n);
    void put_indent(std::size_t depth);
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

    std::string out_; ///< the text in out_[0, used_), room after it
    std::size_t used_ = 0;
    std::vector<Level> levels_;
    bool after_key_ = false;
};

} // namespace phaseplan::json
