#include "core/json_util.h"

#include <QJsonDocument>
#include <QJsonParseError>

#include <cmath>

namespace phaseplan::json {

std::string path(const std::string& parent, const QString& key) {
    return parent.empty() ? key.toStdString() : parent + "." + key.toStdString();
}

std::string path(const std::string& parent, int index) {
    return parent + "[" + std::to_string(index) + "]";
}

std::string describe(const QJsonValue& v) {
    switch (v.type()) {
    case QJsonValue::Null: return "null";
    case QJsonValue::Bool: return v.toBool() ? "true" : "false";
    case QJsonValue::Double: return chem::format_number(v.toDouble());
    case QJsonValue::String: {
        QString s = v.toString();
        if (s.size() > 40) s = s.left(37) + "...";
        return "\"" + s.toStdString() + "\"";
    }
    case QJsonValue::Array: return "an array";
    case QJsonValue::Object: return "an object";
    case QJsonValue::Undefined: return "nothing";
    }
    return "?";
}

namespace {
QJsonValue require(const QJsonObject& o, const QString& key, const std::string& parent) {
    auto it = o.constFind(key);
    if (it == o.constEnd()) throw chem::Error(path(parent, key), "is required but missing");
    return it.value();
}
} // namespace

QJsonObject require_object(const QJsonObject& o, const QString& key, const std::string& parent) {
    QJsonValue v = require(o, key, parent);
    if (!v.isObject()) throw chem::Error(path(parent, key), "must be an object, got " + describe(v));
    return v.toObject();
}

QJsonArray require_array(const QJsonObject& o, const QString& key, const std::string& parent) {
    QJsonValue v = require(o, key, parent);
    if (!v.isArray()) throw chem::Error(path(parent, key), "must be an array, got " + describe(v));
    return v.toArray();
}

std::string require_string(const QJsonObject& o, const QString& key, const std::string& parent) {
    QJsonValue v = require(o, key, parent);
    if (!v.isString()) throw chem::Error(path(parent, key), "must be a string, got " + describe(v));
    std::string s = v.toString().trimmed().toStdString();
    if (s.empty()) throw chem::Error(path(parent, key), "must not be empty");
    return s;
}

std::optional<std::string> optional_string(const QJsonObject& o, const QString& key,
                                           const std::string& parent) {
    if (!o.contains(key) || o.value(key).isNull()) return std::nullopt;
    return require_string(o, key, parent);
}

double require_number(const QJsonObject& o, const QString& key, const std::string& parent) {
    QJsonValue v = require(o, key, parent);
    if (!v.isDouble()) throw chem::Error(path(parent, key), "must be a number, got " + describe(v));
    double d = v.toDouble();
    if (!std::isfinite(d)) throw chem::Error(path(parent, key), "must be a finite number");
    return d;
}

std::optional<double> optional_number(const QJsonObject& o, const QString& key,
                                      const std::string& parent) {
    if (!o.contains(key) || o.value(key).isNull()) return std::nullopt;
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
    if (!o.contains(key) || o.value(key).isNull()) return std::nullopt;
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
    if (!o.contains(key) || o.value(key).isNull()) return fallback;
    QJsonValue v = o.value(key);
    if (!v.isBool()) throw chem::Error(path(parent, key), "must be true or false, got " + describe(v));
    return v.toBool();
}

QJsonObject element_object(const QJsonArray& a, int index, const std::string& parent) {
    QJsonValue v = a.at(index);
    if (!v.isObject()) throw chem::Error(path(parent, index), "must be an object, got " + describe(v));
    return v.toObject();
}

QJsonObject parse_document(const QByteArray& bytes) {
    QJsonParseError err{};
    QJsonDocument doc = QJsonDocument::fromJson(bytes, &err);
    if (err.error != QJsonParseError::NoError)
        throw chem::Error("(document)", "is not valid JSON: " + err.errorString().toStdString() +
                                            " at offset " + std::to_string(err.offset));
    if (!doc.isObject()) throw chem::Error("(document)", "must be a JSON object");
    return doc.object();
}

} // namespace phaseplan::json
