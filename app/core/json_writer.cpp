#include "core/json_writer.h"

#include "core/json_util.h"

#include <QByteArray>
#include <QJsonArray>
#include <QJsonDocument>
#include <QJsonObject>
#include <QLocale>
#include <QString>

#include <algorithm>
#include <array>
#include <charconv>
#include <cmath>
#include <cstring>

namespace phaseplan::json {

QByteArray IndentedWriter::take() {
    out_.resize(static_cast<qsizetype>(used_));
    used_ = 0;
    capacity_ = 0;
    text_ = nullptr;
    return std::move(out_);
}

void IndentedWriter::reserve(std::size_t bytes) {
    if (capacity_ < used_ + bytes) {
        out_.resize(static_cast<qsizetype>(used_ + bytes));
        text_ = out_.data();
        capacity_ = used_ + bytes;
    }
}

void IndentedWriter::grow(std::size_t n) {
    reserve(std::max(capacity_, n + 4096));
}

void IndentedWriter::open(char bracket) {
    char* at = element(2);
    at[0] = bracket;
    at[1] = '\n';
    levels_.push_back({bracket == '{', true});
}

void IndentedWriter::close(char bracket) {
    const bool empty = levels_.back().empty;
    levels_.pop_back();
    const std::size_t depth = levels_.size();
    const std::size_t newline = empty ? 0 : 1;
    const std::size_t last = levels_.empty() ? 1 : 0; // toJson ends the document with a newline
    char* at = room(newline + 4 * depth + 1 + last);
    if (!empty)
        *at++ = '\n';
    at = indent(at, depth);
    *at++ = bracket;
    if (last)
        *at = '\n';
}

void IndentedWriter::integer(long long value) {
    char buf[24];
    const auto r = std::to_chars(buf, buf + sizeof buf, value);
    const auto n = static_cast<std::size_t>(r.ptr - buf);
    std::memcpy(element(n), buf, n);
}

void IndentedWriter::number_in_range(double value) {
    // QJsonValue(double) keeps an integral value up to 2^53 as an integer (-0 becomes 0).
    if (value == std::trunc(value) && std::abs(value) <= 9007199254740992.0) {
        integer(static_cast<long long>(value));
        return;
    }
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
    std::memcpy(element(slot.text.size()), slot.text.data(), slot.text.size());
}

namespace {

/// The bytes a string cannot be copied with as they are: a quote, a backslash (escaped here),
/// control characters and non-ASCII bytes (Qt's own escaping).
constexpr std::array<bool, 256> not_plain = [] {
    std::array<bool, 256> t{};
    for (int c = 0; c < 256; ++c)
        t[static_cast<std::size_t>(c)] = c < 0x20 || c >= 0x80 || c == '"' || c == '\\';
    return t;
}();

} // namespace

void IndentedWriter::string(std::string_view utf8) {
    bool plain = true;
    for (char c : utf8)
        plain &= !not_plain[static_cast<unsigned char>(c)];
    if (plain) {
        char* at = element(utf8.size() + 2);
        *at++ = '"';
        std::memcpy(at, utf8.data(), utf8.size());
        at[utf8.size()] = '"';
        return;
    }
    std::size_t quotes = 0;
    bool ascii = true;
    for (char c : utf8) {
        const auto u = static_cast<unsigned char>(c);
        ascii &= u >= 0x20 && u < 0x80;
        quotes += c == '"' || c == '\\';
    }
    if (!ascii) { // control characters and non-ASCII text: Qt's own escaping
        qt_string(QString::fromUtf8(utf8.data(), static_cast<qsizetype>(utf8.size())));
        return;
    }
    char* at = element(utf8.size() + quotes + 2);
    *at++ = '"';
    for (char c : utf8) {
        if (c == '"' || c == '\\')
            *at++ = '\\';
        *at++ = c;
    }
    *at = '"';
}

void IndentedWriter::qt_string(const QString& text) {
    const QByteArray json = QJsonDocument(QJsonArray{text}).toJson(QJsonDocument::Compact);
    const auto n = static_cast<std::size_t>(json.size() - 2); // ["text"]
    std::memcpy(element(n), json.constData() + 1, n);
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
    if (value)
        std::memcpy(element(4), "true", 4);
    else
        std::memcpy(element(5), "false", 5);
}

void IndentedWriter::null() {
    std::memcpy(element(4), "null", 4);
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
            element(0);
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
    QByteArray text = QJsonDocument(QJsonArray{v}).toJson(QJsonDocument::Compact);
    const auto n = static_cast<std::size_t>(text.size() - 2); // "[value]"
    std::memcpy(element(n), text.constData() + 1, n);
}

} // namespace phaseplan::json
