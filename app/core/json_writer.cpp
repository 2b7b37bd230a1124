#include "core/json_writer.h"

#include "core/json_util.h"

#include <QByteArray>
#include <QJsonArray>
#include <QJsonDocument>
#include <QJsonObject>
#include <QLocale>
#include <QString>

#include <algorithm>
#include <charconv>
#include <cmath>
#include <cstring>

namespace phaseplan::json {

std::string IndentedWriter::take() {
    out_.resize(used_);
    used_ = 0;
    return std::move(out_);
}

void IndentedWriter::reserve(std::size_t bytes) {
    if (out_.size() < used_ + bytes)
        out_.resize(used_ + bytes);
}

char* IndentedWriter::room(std::size_t n) {
    if (used_ + n > out_.size())
        out_.resize(std::max(2 * out_.size(), used_ + n + 4096));
    char* at = out_.data() + used_;
    used_ += n;
    return at;
}

void IndentedWriter::put(const char* p, std::size_t n) {
    char* at = room(n);
    if (n <= 16)
        for (std::size_t i = 0; i < n; ++i)
            at[i] = p[i];
    else
        std::memcpy(at, p, n);
}

void IndentedWriter::put_indent(std::size_t depth) {
    char* at = room(4 * depth);
    std::memset(at, ' ', 4 * depth);
}

void IndentedWriter::element() {
    if (after_key_) { // the value of a key: on the key's line
        after_key_ = false;
        return;
    }
    if (levels_.empty())
        return; // the document itself
    Level& l = levels_.back();
    if (!l.empty)
        put(",\n", 2);
    l.empty = false;
    put_indent(levels_.size());
}

void IndentedWriter::open(char bracket) {
    element();
    const char text[2] = {bracket, '\n'};
    put(text, 2);
    levels_.push_back({bracket == '{', true});
}

void IndentedWriter::close(char bracket) {
    const bool empty = levels_.back().empty;
    levels_.pop_back();
    if (!empty)
        put("\n", 1);
    put_indent(levels_.size());
    put(&bracket, 1);
    if (levels_.empty())
        put("\n", 1); // toJson ends the document with a newline
}

void IndentedWriter::begin_object() {
    open('{');
}
void IndentedWriter::end_object() {
    close('}');
}
void IndentedWriter::begin_array() {
    open('[');
}
void IndentedWriter::end_array() {
    close(']');
}

void IndentedWriter::key(std::string_view ascii_key) {
    element();
    char* at = room(ascii_key.size() + 4);
    *at++ = '"';
    for (char c : ascii_key)
        *at++ = c;
    *at++ = '"';
    *at++ = ':';
    *at = ' ';
    after_key_ = true;
}

void IndentedWriter::integer(long long value) {
    element();
    char buf[24];
    const auto r = std::to_chars(buf, buf + sizeof buf, value);
    put(buf, static_cast<std::size_t>(r.ptr - buf));
}

void IndentedWriter::number(double value, const std::function<std::string()>& at) {
    if (!output_number_in_range(value))
        refuse_output_number(value, at());
    // QJsonValue(double) keeps an integral value up to 2^53 as an integer (-0 becomes 0).
    if (value == std::trunc(value) && std::abs(value) <= 9007199254740992.0) {
        integer(static_cast<long long>(value));
        return;
    }
    element();
    quint64 bits = 0;
    std::memcpy(&bits, &value, sizeof bits);
    if (numbers_.empty())
        numbers_.resize(256);
    NumberText& slot = numbers_[(bits ^ (bits >> 17) ^ (bits >> 41)) & 255];
    if (slot.bits != bits) {
        const QByteArray text = QByteArray::number(value, 'g', QLocale::FloatingPointShortest);
        slot.bits = bits;
        slot.text.assign(text.constData(), static_cast<std::size_t>(text.size()));
    }
    put(slot.text.data(), slot.text.size());
}

void IndentedWriter::string(std::string_view utf8) {
    std::size_t quotes = 0;
    bool plain = true;
    for (char c : utf8) {
        const auto u = static_cast<unsigned char>(c);
        plain &= u >= 0x20 && u < 0x80;
        quotes += c == '"' || c == '\\';
    }
    if (!plain) { // control characters and non-ASCII text: Qt's own escaping
        qt_string(QString::fromUtf8(utf8.data(), static_cast<qsizetype>(utf8.size())));
        return;
    }
    element();
    char* at = room(utf8.size() + quotes + 2);
    *at++ = '"';
    for (char c : utf8) {
        if (c == '"' || c == '\\')
            *at++ = '\\';
        *at++ = c;
    }
    *at = '"';
}

void IndentedWriter::qt_string(const QString& text) {
    element();
    const QByteArray json = QJsonDocument(QJsonArray{text}).toJson(QJsonDocument::Compact);
    put(json.constData() + 1, static_cast<std::size_t>(json.size() - 2)); // ["text"]
}

void IndentedWriter::any_string(const QString& text) {
    for (QChar c : text)
        if (c.unicode() < 0x20 || c.unicode() >= 0x80) {
            qt_string(text);
            return;
        }
    string(text.toStdString());
}

void IndentedWriter::boolean(bool value) {
    element();
    if (value)
        put("true", 4);
    else
        put("false", 5);
}

void IndentedWriter::null() {
    element();
    put("null", 4);
}

void IndentedWriter::value(const QJsonValue& v, const std::string& at) {
    check_output_value(v, at);
    walk(v);
}

void IndentedWriter::walk(const QJsonValue& v) {
    switch (v.type()) {
    case QJsonValue::Object: {
        const QJsonObject o = v.toObject();
        begin_object();
        for (auto it = o.constBegin(); it != o.constEnd(); ++it) {
            // A key as Qt escapes it: written as a string, then ": " in place of its place.
            const QString k = it.key();
            element();
            after_key_ = true; // no separator before the key's text
            any_string(k);
            put(": ", 2);
            after_key_ = true;
            walk(it.value());
        }
        end_object();
        return;
    }
    case QJsonValue::Array: {
        const QJsonArray a = v.toArray();
        begin_array();
        for (const QJsonValue& e : a)
            walk(e);
        end_array();
        return;
    }
    case QJsonValue::String:
        any_string(v.toString());
        return;
    case QJsonValue::Bool:
        boolean(v.toBool());
        return;
    case QJsonValue::Double: {
        const double d = v.toDouble();
        // A parsed -0 keeps its sign in Qt's text; anything unusual is Qt's to write.
        if (!std::signbit(d) || d != 0) {
            number(d, [] { return std::string(); }); // already checked
            return;
        }
        break;
    }
    case QJsonValue::Null:
        null();
        return;
    default:
        break;
    }
    element();
    QByteArray text = QJsonDocument(QJsonArray{v}).toJson(QJsonDocument::Compact);
    put(text.constData() + 1, static_cast<std::size_t>(text.size() - 2)); // "[value]"
}

} // namespace phaseplan::json
