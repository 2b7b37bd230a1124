#pragma once
// Reading the command-line JSON documents with errors that name the field. Every reader throws
// chem::Error(path, message) where path is the JSON path of the field ("components[2].mol_per_l")
// and message names the bad value. The one catch is in commands.cpp (CLI) and the GUI models.
#include "chem/error.h"
#include "chem/guard.h"

#include <QJsonArray>
#include <QJsonObject>
#include <QJsonValue>
#include <QString>
#include <QStringList>

#include <cmath>
#include <initializer_list>
#include <optional>
#include <string>
#include <vector>

namespace phaseplan::json {

/// "parent.key", or "key" when parent is empty.
std::string path(const std::string& parent, const QString& key);
/// "parent[i]".
std::string path(const std::string& parent, int index);

/// Short rendering of a JSON value for messages: 1.5, "abc", true, null, an object, an array.
std::string describe(const QJsonValue& v);

QJsonObject require_object(const QJsonObject& o, const QString& key, const std::string& parent);
QJsonArray require_array(const QJsonObject& o, const QString& key, const std::string& parent);
/// o[key] as a list of strings, empty when the key is absent; chem::Error naming the field (or
/// the element) when it is not an array of strings.
/// The texts of a result's JSON array, as they are (not a validator: anything that is not an
/// array gives an empty list, a non-string element an empty text).
QStringList strings_of(const QJsonValue& v);
std::vector<std::string> optional_string_list(const QJsonObject& o, const QString& key,
                                              const std::string& parent);
/// A non-empty string (trimmed) of at most `max_chars` characters (code points) without a lone
/// UTF-16 surrogate. Ids pass chem::guard::max_id_chars; free text takes the default.
std::string require_string(const QJsonObject& o, const QString& key, const std::string& parent,
                           std::size_t max_chars = chem::guard::max_text_chars);
std::optional<std::string> optional_string(const QJsonObject& o, const QString& key,
                                           const std::string& parent,
                                           std::size_t max_chars = chem::guard::max_text_chars);
/// Throws Error(field, …) when `text` is longer than max_chars characters or holds a lone
/// surrogate.
void check_text(const QString& text, const std::string& field, std::size_t max_chars);
/// A finite number. Rejects strings, booleans, null.
double require_number(const QJsonObject& o, const QString& key, const std::string& parent);
std::optional<double> optional_number(const QJsonObject& o, const QString& key,
                                      const std::string& parent);
/// A finite number > 0 and <= max_value.
double require_positive(const QJsonObject& o, const QString& key, const std::string& parent,
                        double max_value);
std::optional<double> optional_positive(const QJsonObject& o, const QString& key,
                                        const std::string& parent, double max_value);
/// A whole number in [min_value, max_value].
int require_int(const QJsonObject& o, const QString& key, const std::string& parent, int min_value,
                int max_value);
bool optional_bool(const QJsonObject& o, const QString& key, const std::string& parent,
                   bool fallback);
/// The value of an array element as an object, or an error naming parent[i].
QJsonObject element_object(const QJsonArray& a, int index, const std::string& parent);

/// Refuses a key of o that is not in `known` but nearly is one of them ("temperature" or
/// "Temperature_C" for "temperature_c", "equilibration_mn"): a misspelt optional field would
/// otherwise be ignored and its default used without a word. Other extra keys ("about", "note")
/// stay allowed: the documents may carry more than the contract reads.
void reject_near_misses(const QJsonObject& o, std::initializer_list<const char*> known,
                        const std::string& parent);

/// Parses a whole document; a syntax error names "(document)" and the offset.
QJsonObject parse_document(const QByteArray& bytes);

/// The most a document may hold, in bytes (16 MiB): the command-line tool reads no more.
inline constexpr qint64 max_document_bytes = 16 * 1024 * 1024;

/// The shared guard at the JSON boundary: throws Error(path, …) for the first number in `out` that
/// is not finite or lies beyond ±chem::guard::max_amount · 10^3 (no "inf", "nan" or overflow is
/// ever written). Amounts and counts are checked where they are computed (chem/guard.h); this
/// catches anything that slipped through.
void check_output(const QJsonObject& out);
/// check_output for one value of a result at path `at` ("" for the result itself).
void check_output_value(const QJsonValue& v, const std::string& at);
/// Whether check_output lets `value` through: finite and within ±chem::guard::max_amount · 10^3.
inline bool output_number_in_range(double value) {
    return std::isfinite(value) && std::abs(value) <= chem::guard::max_amount * 1e3;
}
/// check_output's error for a number refused at path `at`.
[[noreturn]] void refuse_output_number(double value, const std::string& at);

} // namespace phaseplan::json
