#include "core/json_writer.h"

#include "core/json_util.h"

#include <QByteArray>
#include <QJsonArray>
#include <QJsonDocument>
#include <QJsonObject>
#include <QLocale>
#include <QString>

#include <charconv>
#include <cmath>
#include <cstring>

namespace phaseplan::json {

void IndentedWriter::element() {
    if (after_key_) { // the value of a key: on the key's line
        after_key_ = false;
        return;
    }
    if (levels_.empty())
        return; // the document itself
    Level& l = levels_.back();
    if (!l.empty)
        out_ += ",\n";
    l.empty = false;
    out_.append(4 * levels_.size(), ' ');
}

void IndentedWriter::open(char bracket) {
    element();
    out_ += bracket;
    out_ += '\n';
    levels_.push_back({bracket == '{', true});
}

void IndentedWriter::close(char bracket) {
    const bool empty = levels_.back().empty;
    levels_.pop_back();
    if (!empty)
        out_ += '\n';
    out_.append(4 * levels_.size(), ' ');
    out_ += bracket;
    if (levels_.empty())
        out_ += '\n'; // toJson ends the document with a newline
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
    out_ += '"';
    out_ += ascii_key;
    out_ += "\": ";
    after_key_ = true;
}

void IndentedWriter::integer(long long value) {
    element();
    char buf[24];
    const auto r = std::to_chars(buf, buf + sizeof buf, value);
    out_.append(buf, r.ptr);
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
    out_ += slot.text;
}

void IndentedWriter::string(std::string_view utf8) {
    bool plain = true;
    for (char c : utf8)
        plain &= static_cast<unsigned char>(c) >= 0x20 && static_cast<unsigned char>(c) < 0x80;
    if (!plain) { // control characters and non-ASCII text: Qt's own escaping
        value(QJsonValue(QString::fromUtf8(utf8.data(), static_cast<qsizetype>(utf8.size()))),
              std::string());
        return;
    }
    element();
    out_ += '"';
    for (char c : utf8) {
        if (c == '"' || c == '\\')
            out_ += '\\';
        out_ += c;
    }
    out_ += '"';
}

void IndentedWriter::boolean(bool value) {
    element();
    out_ += value ? "true" : "false";
}

void IndentedWriter::null() {
    element();
    out_ += "null";
}

void IndentedWriter::value(const QJsonValue& v, const std::string& at) {
    check_output_value(v, at);
    element();
    QByteArray text;
    if (v.isObject()) {
        text = QJsonDocument(v.toObject()).toJson(QJsonDocument::Indented);
        text.chop(1); // the document's final newline
    } else if (v.isArray()) {
        text = QJsonDocument(v.toArray()).toJson(QJsonDocument::Indented);
        text.chop(1);
    } else {
        text = QJsonDocument(QJsonArray{v}).toJson(QJsonDocument::Compact);
        text = text.mid(1, text.size() - 2); // "[value]"
    }
    // Qt indents a nested value's lines by its depth: the same text, each line shifted.
    const std::string indent(4 * levels_.size(), ' ');
    for (char c : text) {
        out_ += c;
        if (c == '\n')
            out_ += indent;
    }
}

} // namespace phaseplan::json
