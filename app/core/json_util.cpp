#include "core/json_util.h"
#include "chem/text.h"

#include "chem/guard.h"
#include "chem/solvent.h"

#include <QJsonDocument>
#include <QJsonParseError>

#include <algorithm>
#include <array>
#include <cmath>
#include <deque>
#include <memory>
#include <string_view>
#include <unordered_set>
#include <vector>

namespace phaseplan::json {

std::string path(const std::string& parent, const QString& key) {
    return parent.empty() ? key.toStdString() : parent + "." + key.toStdString();
}

std::string path(const std::string& parent, int index) {
    return parent + "[" + std::to_string(index) + "]";
}

std::string describe(const QJsonValue& v) {
    switch (v.type()) {
    case QJsonValue::Null:
        return "null";
    case QJsonValue::Bool:
        return v.toBool() ? "true" : "false";
    case QJsonValue::Double:
        return chem::format_number(v.toDouble());
    case QJsonValue::String: {
        // Cut on a character boundary (never inside a UTF-8 sequence or a surrogate pair).
        const QString s = v.toString();
        const std::string text = s.size() > 200 ? s.left(200).toStdString() : s.toStdString();
        // Appended, not "\"" + …: GCC 12 warns falsely (-Wrestrict) on literal + std::string.
        std::string quoted(1, '"');
        quoted += chem::guard::cut(text, 40);
        quoted += '"';
        return quoted;
    }
    case QJsonValue::Array:
        return "an array";
    case QJsonValue::Object:
        return "an object";
    case QJsonValue::Undefined:
        return "nothing";
    }
    return "?";
}

namespace {
QJsonValue require(const QJsonObject& o, const QString& key, const std::string& parent) {
    auto it = o.constFind(key);
    if (it == o.constEnd())
        throw chem::Error(path(parent, key), "is required but missing");
    return it.value();
}
} // namespace

QJsonObject require_object(const QJsonObject& o, const QString& key, const std::string& parent) {
    QJsonValue v = require(o, key, parent);
    if (!v.isObject())
        throw chem::Error(path(parent, key), "must be an object, got " + describe(v));
    return v.toObject();
}

QJsonArray require_array(const QJsonObject& o, const QString& key, const std::string& parent) {
    QJsonValue v = require(o, key, parent);
    if (!v.isArray())
        throw chem::Error(path(parent, key), "must be an array, got " + describe(v));
    return v.toArray();
}

QStringList strings_of(const QJsonValue& v) {
    QStringList out;
    for (const QJsonValue& x : v.toArray())
        out << x.toString();
    return out;
}

std::vector<std::string> optional_string_list(const QJsonObject& o, const QString& key,
                                              const std::string& parent) {
    std::vector<std::string> out;
    if (!o.contains(key))
        return out;
    const QJsonValue v = o.value(key);
    if (!v.isArray())
        throw chem::Error(path(parent, key), "must be an array of strings, got " + describe(v));
    const QJsonArray a = v.toArray();
    for (int i = 0; i < a.size(); ++i) {
        if (!a.at(i).isString())
            throw chem::Error(path(path(parent, key), i), "must be a string");
        out.push_back(a.at(i).toString().toStdString());
    }
    return out;
}

namespace {

/// check_text with the field's path spelled out only when the text is refused.
template <class Field>
void check_text_lazily(const QString& text, const Field& field, std::size_t max_chars) {
    // The usual text: no surrogate, no longer than max_chars UTF-16 units.
    if (static_cast<std::size_t>(text.size()) <= max_chars) {
        bool surrogate = false;
        for (QChar c : text)
            surrogate |= c.isSurrogate();
        if (!surrogate)
            return;
    }
    std::size_t chars = 0;
    for (qsizetype i = 0; i < text.size(); ++i, ++chars) {
        const QChar c = text[i];
        if (c.isHighSurrogate() && i + 1 < text.size() && text[i + 1].isLowSurrogate()) {
            ++i;
        } else if (c.isSurrogate()) {
            throw chem::Error(field(),
                              "contains a lone UTF-16 surrogate (\\u" +
                                  QString::number(c.unicode(), 16).toUpper().toStdString() +
                                  " at character " + std::to_string(chars + 1) +
                                  "), which is not a character");
        }
        if (chars >= max_chars)
            throw chem::Error(field(), chem::guard::quote_id(text.left(200).toStdString()) +
                                           " is longer than " + std::to_string(max_chars) +
                                           " characters, the most this field holds");
    }
}

} // namespace

void check_text(const QString& text, const std::string& field, std::size_t max_chars) {
    check_text_lazily(
        text, [&] { return field; }, max_chars);
}

std::string require_string(const QJsonObject& o, const QString& key, const std::string& parent,
                           std::size_t max_chars) {
    QJsonValue v = require(o, key, parent);
    if (!v.isString())
        throw chem::Error(path(parent, key), "must be a string, got " + describe(v));
    const QString text = v.toString().trimmed();
    check_text_lazily(
        text, [&] { return path(parent, key); }, max_chars);
    std::string s = text.toStdString();
    if (s.empty())
        throw chem::Error(path(parent, key), "must not be empty");
    return s;
}

std::optional<std::string> optional_string(const QJsonObject& o, const QString& key,
                                           const std::string& parent, std::size_t max_chars) {
    if (!o.contains(key) || o.value(key).isNull())
        return std::nullopt;
    return require_string(o, key, parent, max_chars);
}

double require_number(const QJsonObject& o, const QString& key, const std::string& parent) {
    QJsonValue v = require(o, key, parent);
    if (!v.isDouble())
        throw chem::Error(path(parent, key), "must be a number, got " + describe(v));
    double d = v.toDouble();
    if (!std::isfinite(d))
        throw chem::Error(path(parent, key), "must be a finite number");
    return d;
}

std::optional<double> optional_number(const QJsonObject& o, const QString& key,
                                      const std::string& parent) {
    if (!o.contains(key) || o.value(key).isNull())
        return std::nullopt;
    return require_number(o, key, parent);
}

double require_positive(const QJsonObject& o, const QString& key, const std::string& parent,
                        double max_value) {
    double d = require_number(o, key, parent);
    if (d <= 0)
        throw chem::Error(path(parent, key), chem::format_number(d) + " is not a positive amount");
    if (d > max_value)
        throw chem::Error(path(parent, key), chem::format_number(d) + " is above the limit of " +
                                                 chem::format_number(max_value));
    return d;
}

std::optional<double> optional_positive(const QJsonObject& o, const QString& key,
                                        const std::string& parent, double max_value) {
    if (!o.contains(key) || o.value(key).isNull())
        return std::nullopt;
    return require_positive(o, key, parent, max_value);
}

int require_int(const QJsonObject& o, const QString& key, const std::string& parent, int min_value,
                int max_value) {
    double d = require_number(o, key, parent);
    if (d != std::floor(d))
        throw chem::Error(path(parent, key), chem::format_number(d) + " is not a whole number");
    if (d < min_value || d > max_value)
        throw chem::Error(path(parent, key), chem::format_number(d) + " is outside " +
                                                 std::to_string(min_value) + " to " +
                                                 std::to_string(max_value));
    return static_cast<int>(d);
}

bool optional_bool(const QJsonObject& o, const QString& key, const std::string& parent,
                   bool fallback) {
    if (!o.contains(key) || o.value(key).isNull())
        return fallback;
    QJsonValue v = o.value(key);
    if (!v.isBool())
        throw chem::Error(path(parent, key), "must be true or false, got " + describe(v));
    return v.toBool();
}

QJsonObject element_object(const QJsonArray& a, int index, const std::string& parent) {
    QJsonValue v = a.at(index);
    if (!v.isObject())
        throw chem::Error(path(parent, index), "must be an object, got " + describe(v));
    return v.toObject();
}

namespace {

/// Lower case without '_', '-' and spaces: "Temperature_C" and "temperature-c" fold alike.
std::string fold_key(const QString& key) {
    std::string out;
    for (QChar ch : key)
        if (ch != '_' && ch != '-' && ch != ' ')
            out += ch.toLower().toLatin1();
    return out;
}

bool nearly(const QString& given, const QString& known) {
    const auto prefix_of = [](const QString& a, const QString& b) {
        return b.size() > a.size() && b.startsWith(a) && b[a.size()] == '_';
    };
    if (prefix_of(given, known) || prefix_of(known, given))
        return true; // "volume" for "volume_ml"
    const std::string g = fold_key(given), k = fold_key(known);
    if (g == k)
        return true;
    const int allowed = std::min(g.size(), k.size()) <= 5 ? 1 : 2;
    return chem::edit_distance(g, k) <= allowed;
}

} // namespace

void reject_near_misses(const QJsonObject& o, std::initializer_list<const char*> known,
                        const std::string& parent) {
    for (auto it = o.begin(); it != o.end(); ++it) {
        const QString key = it.key();
        // A near miss is a slip of a few characters: a key much longer than any contract key
        // (a 50 MB key, say) is not one, and the edit distance is never run over it.
        if (key.size() > 64)
            continue;
        bool listed = false;
        for (const char* k : known)
            listed |= key == QLatin1String(k);
        if (listed)
            continue;
        for (const char* k : known)
            if (nearly(key, QString::fromLatin1(k)))
                throw chem::Error(path(parent, key),
                                  "is not a field here; did you mean \"" + std::string(k) + "\"?");
    }
}

namespace {

/// The key of the JSON string literal that starts at b[i] (a '"'), as comparable bytes; leaves i
/// after it. The document has been parsed already, so the literal is well formed. A plain
/// literal is its UTF-8 bytes; an escaped one is decoded (backslash-u0061 equals "a"), and kept as
/// UTF-8 unless it holds a lone surrogate, which UTF-8 cannot carry: then as 0xFF (never in
/// UTF-8) and its UTF-16 units.
std::string_view key_at(const QByteArray& b, qsizetype& i, std::deque<std::string>& decoded) {
    const qsizetype start = ++i;
    bool escaped = false;
    while (i < b.size() && b[i] != '"') {
        if (b[i] == '\\') {
            escaped = true;
            ++i;
        }
        ++i;
    }
    const qsizetype end = i++;
    if (!escaped)
        return std::string_view(b.constData() + start, static_cast<std::size_t>(end - start));
    const QString s = QJsonDocument::fromJson("[" + b.mid(start - 1, end - start + 2) + "]")
                          .array()
                          .at(0)
                          .toString();
    bool lone = false;
    for (qsizetype k = 0; k < s.size(); ++k) {
        if (s[k].isHighSurrogate() && k + 1 < s.size() && s[k + 1].isLowSurrogate())
            ++k;
        else if (s[k].isSurrogate())
            lone = true;
    }
    if (!lone)
        return decoded.emplace_back(s.toStdString());
    std::string units(1, '\xff');
    for (QChar c : s) {
        units += static_cast<char>(c.unicode() >> 8);
        units += static_cast<char>(c.unicode() & 0xff);
    }
    return decoded.emplace_back(std::move(units));
}

/// The key as text again, for a path.
QString key_text(std::string_view k) {
    if (k.empty() || k[0] != '\xff')
        return QString::fromUtf8(k.data(), static_cast<qsizetype>(k.size()));
    QString s;
    for (std::size_t j = 1; j + 1 < k.size(); j += 2)
        s += QChar(static_cast<char16_t>((static_cast<unsigned char>(k[j]) << 8) |
                                         static_cast<unsigned char>(k[j + 1])));
    return s;
}

/// The keys of one object seen so far: a short inline list, a hash set beyond it. The keys are
/// views into the document (or into the decoded escaped keys), which outlive the scan.
class KeySet {
  public:
    /// False when `key` was there already.
    bool insert(std::string_view key) {
        if (!set_) {
            for (std::size_t k = 0; k < count_; ++k)
                if (list_[k] == key)
                    return false;
            if (count_ < list_.size()) {
                list_[count_++] = key;
                return true;
            }
            set_ =
                std::make_unique<std::unordered_set<std::string_view>>(list_.begin(), list_.end());
        }
        return set_->insert(key).second;
    }

  private:
    std::array<std::string_view, 8> list_;
    std::size_t count_ = 0;
    std::unique_ptr<std::unordered_set<std::string_view>> set_;
};

/// Qt keeps the last of two equal keys without a word; a document that gives a field twice
/// ({"mol_per_l": 0.01, "mol_per_l": 0.1}) is ambiguous, so it is refused, naming the field.
void reject_duplicate_keys(const QByteArray& b) {
    // Each frame keeps only its own key or index; the path is spelled out only when a
    // duplicate is found, so a deeply nested document costs O(depth) memory, not O(depth^2).
    struct Frame {
        bool object = false;
        KeySet keys;
        std::string_view key;
        int index = 0;
        bool expect_key = true;
    };
    std::vector<Frame> stack;
    std::deque<std::string> decoded; ///< escaped keys, decoded (stable addresses)
    auto path_to = [&](std::size_t depth) {
        std::string p;
        for (std::size_t d = 0; d + 1 < depth; ++d)
            p = stack[d].object ? path(p, key_text(stack[d].key)) : path(p, stack[d].index);
        return p;
    };
    const char* data = b.constData();
    const qsizetype n = b.size();
    static const std::array<bool, 256> structural = [] {
        std::array<bool, 256> t{};
        for (unsigned char ch : std::string_view("\"{}[],"))
            t[ch] = true;
        return t;
    }();
    for (qsizetype i = 0; i < n;) {
        const char c = data[i];
        if (!structural[static_cast<unsigned char>(c)]) { // numbers, blanks, literals
            ++i;
            continue;
        }
        if (c == '"') {
            if (!stack.empty() && stack.back().object && stack.back().expect_key) {
                const std::string_view k = key_at(b, i, decoded);
                Frame& f = stack.back();
                if (!f.keys.insert(k))
                    throw chem::Error(path(path_to(stack.size()), key_text(k)),
                                      "is given twice in one object; give it once");
                f.key = k;
                f.expect_key = false;
            } else { // a string value: skip it
                for (++i; i < n && data[i] != '"'; ++i)
                    if (data[i] == '\\')
                        ++i;
                ++i;
            }
            continue;
        }
        if (c == '{' || c == '[') {
            Frame f;
            f.object = c == '{';
            stack.push_back(std::move(f));
        } else if ((c == '}' || c == ']') && !stack.empty()) {
            stack.pop_back();
        } else if (c == ',' && !stack.empty()) {
            if (stack.back().object)
                stack.back().expect_key = true;
            else
                ++stack.back().index;
        }
        ++i;
    }
}

} // namespace

void refuse_output_number(double value, const std::string& at) {
    throw chem::Error(at.empty() ? "(result)" : at,
                      "the computed value " + chem::format_number(value) +
                          " is not a finite number in range; check the inputs it comes from");
}

namespace {

/// The quick pass: no paths are spelled out unless a number is refused.
bool all_in_range(const QJsonValue& v) {
    if (v.isDouble())
        return output_number_in_range(v.toDouble());
    if (v.isArray()) {
        const QJsonArray a = v.toArray();
        for (const QJsonValue& e : a)
            if (!all_in_range(e))
                return false;
    } else if (v.isObject()) {
        const QJsonObject o = v.toObject();
        for (auto it = o.constBegin(); it != o.constEnd(); ++it)
            if (!all_in_range(it.value()))
                return false;
    }
    return true;
}

/// The path of the first refused number, in the order of the keys.
void check_value(const QJsonValue& v, const std::string& at) {
    if (v.isDouble()) {
        const double d = v.toDouble();
        if (!output_number_in_range(d))
            refuse_output_number(d, at);
    } else if (v.isArray()) {
        const QJsonArray a = v.toArray();
        for (int i = 0; i < a.size(); ++i)
            check_value(a.at(i), path(at, i));
    } else if (v.isObject()) {
        const QJsonObject o = v.toObject();
        for (auto it = o.begin(); it != o.end(); ++it)
            check_value(it.value(), path(at, it.key()));
    }
}
} // namespace

void check_output_value(const QJsonValue& v, const std::string& at) {
    if (!all_in_range(v))
        check_value(v, at);
}

void check_output(const QJsonObject& out) {
    check_output_value(out, "");
}

QJsonObject parse_document(const QByteArray& bytes) {
    QJsonParseError err{};
    QJsonDocument doc = QJsonDocument::fromJson(bytes, &err);
    if (err.error != QJsonParseError::NoError)
        throw chem::Error("(document)", "is not valid JSON: " + err.errorString().toStdString() +
                                            " at offset " + std::to_string(err.offset));
    if (!doc.isObject())
        throw chem::Error("(document)", "must be a JSON object");
    reject_duplicate_keys(bytes);
    return doc.object();
}

} // namespace phaseplan::json
