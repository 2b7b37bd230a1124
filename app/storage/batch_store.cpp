#include "storage/batch_store.h"

#include "chem/batch.h"
#include "chem/error.h"
#include "chem/guard.h"
#include "core/batch_document.h"
#include "storage/accounts.h"
#include "storage/audit_trail.h"
#include "storage/database.h"
#include "storage/lot_store.h"
#include "storage/signatures.h"
#include "storage/sql_util.h"
#include "storage/versioning.h"

#include <QJsonDocument>
#include <QSqlError>
#include <QSqlQuery>
#include <QSqlRecord>

#include <algorithm>
#include <map>

namespace phaseplan::storage {

namespace {

using sql::run; // one statement with positional bindings (sql_util.h)

/// BEGIN IMMEDIATE … COMMIT (a savepoint inside an open transaction); rolled back when commit()
/// did not run.
using Transaction = sql::WriteTransaction;

QString compact(const QJsonObject& o) {
    return QString::fromUtf8(QJsonDocument(o).toJson(QJsonDocument::Compact));
}
QString compact(const QJsonArray& a) {
    return QString::fromUtf8(QJsonDocument(a).toJson(QJsonDocument::Compact));
}

/// A history value as text in the database: JSON, so numbers, strings and null survive.
QVariant value_text(const QJsonValue& v) {
    if (v.isNull() || v.isUndefined())
        return QVariant();
    return QString::fromUtf8(QJsonDocument(QJsonArray{v}).toJson(QJsonDocument::Compact));
}
QJsonValue value_from_text(const QVariant& v) {
    if (v.isNull())
        return QJsonValue::Null;
    QJsonParseError error{};
    const QJsonDocument d = QJsonDocument::fromJson(v.toString().toUtf8(), &error);
    if (error.error != QJsonParseError::NoError && !v.toString().isEmpty())
        return QJsonValue(v.toString() + QStringLiteral("…")); // cut on read-back (history())
    const QJsonArray a = d.array();
    return a.isEmpty() ? QJsonValue(QJsonValue::Null) : a.at(0);
}

QString kind_of(const QJsonObject& input) {
    if (input.contains("lines") && input.contains("sequence"))
        return QStringLiteral("sequence");
    if (input.contains("parts") || input.contains("bottle_ml"))
        return QStringLiteral("line");
    return QStringLiteral("recipe");
}

std::string str(const QString& s) {
    return s.toStdString();
}

/// SQL NULL for an absent number.
QVariant optional_real(const std::optional<double>& v) {
    return v ? QVariant(*v) : QVariant(QMetaType(QMetaType::Double));
}

/// Checks the batch fields with the rules of chem::check_batch_fields and the actual amounts'
/// shape (the amounts against a recipe are checked when the batch is evaluated for printing).
void validate(const BatchRecord& b) {
    chem::Batch cb;
    cb.id = str(b.id);
    cb.prepared_at = str(b.prepared_at);
    cb.expires_at = str(b.expires_at);
    cb.tolerance_fraction = b.tolerance_percent / 100.0;
    cb.measured_ph = b.measured_ph;
    cb.ph_tolerance = b.ph_tolerance;
    cb.container_ml = b.container_ml;
    cb.deviation_at = str(b.deviation_at);
    for (int i = 0; i < b.actual.size(); ++i) {
        const QJsonObject e = b.actual[i].toObject();
        const std::string at = "batch.actual[" + std::to_string(i) + "]";
        if (e.contains("lot_expires_on") && !e.value("lot_expires_on").isString())
            throw chem::Error(at + ".lot_expires_on", "must be a date like 2027-03-31");
        if (e.contains("lot_override")) {
            const QJsonObject ov = e.value("lot_override").toObject();
            for (const char* k : {"by", "reason"})
                if (ov.value(k).toString().trimmed().isEmpty())
                    throw chem::Error(at + ".lot_override." + k,
                                      "is required: an expired lot is used only when an "
                                      "approver says who accepts it and why");
        }
        chem::ActualAmount a;
        a.reagent = str(e.value("reagent").toString());
        a.lot = str(e.value("lot").toString());
        a.lot_expires_on = str(e.value("lot_expires_on").toString());
        a.lot_override = e.contains("lot_override");
        cb.actual.push_back(a);
    }
    chem::check_batch_fields(cb, 1.0);
    if (!b.deviation_note.isEmpty() && b.deviation_note.trimmed().isEmpty())
        throw chem::Error("batch.deviation.note",
                          "is empty: say why the batch is used although it is out of tolerance");
    if (b.document_kind != "recipe" && b.document_kind != "line" && b.document_kind != "sequence")
        throw chem::Error("document_kind",
                          "\"" + str(b.document_kind) + "\" is not recipe, line or sequence");
    QStringList seen;
    for (int i = 0; i < b.actual.size(); ++i) {
        const std::string at = "batch.actual[" + std::to_string(i) + "]";
        if (!b.actual[i].isObject())
            throw chem::Error(at, "must be an object");
        const QJsonObject e = b.actual[i].toObject();
        const QString r = e.value("reagent").toString().trimmed();
        if (r.isEmpty())
            throw chem::Error(at + ".reagent", "is required");
        if (seen.contains(r))
            throw chem::Error(at + ".reagent", "\"" + str(r) + "\" is given twice");
        seen << r;
        const bool m = e.contains("mass_g"), v = e.contains("volume_ml");
        if (m == v)
            throw chem::Error(at + ".mass_g", "give exactly one of mass_g and volume_ml");
        const QJsonValue x = e.value(m ? "mass_g" : "volume_ml");
        if (!x.isDouble() || !(x.toDouble() > 0) || x.toDouble() > 1.0e6)
            throw chem::Error(at + (m ? ".mass_g" : ".volume_ml"), "must be a positive amount");
        if (e.contains("lot") && !e.value("lot").isString())
            throw chem::Error(at + ".lot", "must be a string");
        if (e.contains("capture"))
            (void)read_capture(e.value("capture"), at + ".capture");
    }
    if (!b.ph_capture.isEmpty())
        (void)read_capture(b.ph_capture, "batch.measured_ph_capture");
    if (!b.ph_capture.isEmpty() && !b.measured_ph)
        throw chem::Error("batch.measured_ph_capture", "is given without measured_ph");
}

} // namespace

/// Field-by-field view of a batch for the history: "prepared_by", "actual[<reagent>].mass_g", …
std::map<QString, QJsonValue> batch_fields(const BatchRecord& b) {
    std::map<QString, QJsonValue> f;
    auto put = [&](const QString& k, const QJsonValue& v) {
        if (!(v.isString() && v.toString().isEmpty()) && !v.isNull() && !v.isUndefined())
            f[k] = v;
    };
    put("document_kind", b.document_kind);
    put("document", compact(b.document));
    put("prepared_by", b.prepared_by);
    put("prepared_at", b.prepared_at);
    put("expires_at", b.expires_at);
    put("checked_by", b.checked_by);
    put("tolerance_percent", b.tolerance_percent);
    if (b.measured_ph)
        put("measured_ph", *b.measured_ph);
    put("ph_tolerance", b.ph_tolerance);
    put("ph_meter_id", b.ph_meter_id);
    put("balance_id", b.balance_id);
    put("comment", b.comment);
    if (b.container_ml)
        put("container_ml", *b.container_ml);
    put("deviation.note", b.deviation_note);
    put("deviation.by", b.deviation_by);
    put("deviation.at", b.deviation_at);
    for (const QJsonValue& v : b.actual) {
        const QJsonObject e = v.toObject();
        const QString key = "actual[" + e.value("reagent").toString() + "]";
        for (const char* k :
             {"mass_g", "volume_ml", "lot", "capture", "lot_expires_on", "lot_override"})
            if (e.contains(k))
                put(key + "." + k, e.value(k));
    }
    if (!b.ph_capture.isEmpty())
        put("measured_ph_capture", b.ph_capture);
    return f;
}

namespace {

std::map<QString, QJsonValue> flatten(const BatchRecord& b) {
    return batch_fields(b);
}

const char* select_columns =
    "id, document_kind, document, prepared_by, prepared_at, expires_at, checked_by, "
    "tolerance_percent, actual, revision, printed_count, first_printed_at, created_at, updated_at, "
    "measured_ph, ph_tolerance, ph_meter_id, balance_id, comment, container_ml, deviation_note, "
    "deviation_by, deviation_at, measured_ph_capture";
/// Read after select_columns once the schema has versions.
const char* version_columns = ", version, changed_by, changed_at";

/// Refuses a stored batch row too large to read back (a file edited by another program, say):
/// its JSON columns within oversize_reason()'s limits, its other texts within
/// max_record_text_chars. The row stays in the file untouched; the message names the batch.
void check_row_size(const QSqlQuery& q) {
    QString reason;
    for (int column : {2, 8, 23}) {
        reason = oversize_reason(q.value(column).toString());
        if (!reason.isEmpty())
            break;
    }
    for (int column = 0; reason.isEmpty() && column < 23; ++column) {
        if (column == 2 || column == 8)
            continue;
        const qsizetype n = q.value(column).toString().size();
        if (n > max_record_text_chars)
            reason = QStringLiteral("a text of %1 characters (limit %2)")
                         .arg(QString::number(n), QString::number(max_record_text_chars));
    }
    if (!reason.isEmpty())
        throw chem::Error("batch", "batch " + chem::guard::quote_id(str(q.value(0).toString())) +
                                       " is too large to open (" + str(reason) +
                                       "); it is kept in the database unchanged");
}

BatchRecord record_from(const QSqlQuery& q) {
    check_row_size(q);
    BatchRecord b;
    b.id = q.value(0).toString();
    b.document_kind = q.value(1).toString();
    b.document = QJsonDocument::fromJson(q.value(2).toString().toUtf8()).object();
    b.prepared_by = q.value(3).toString();
    b.prepared_at = q.value(4).toString();
    b.expires_at = q.value(5).toString();
    b.checked_by = q.value(6).toString();
    b.tolerance_percent = q.value(7).toDouble();
    b.actual = QJsonDocument::fromJson(q.value(8).toString().toUtf8()).array();
    b.revision = q.value(9).toInt();
    b.printed_count = q.value(10).toInt();
    b.first_printed_at = q.value(11).toString();
    b.created_at = q.value(12).toString();
    b.updated_at = q.value(13).toString();
    if (!q.value(14).isNull())
        b.measured_ph = q.value(14).toDouble();
    b.ph_tolerance = q.value(15).toDouble();
    b.ph_meter_id = q.value(16).toString();
    b.balance_id = q.value(17).toString();
    b.comment = q.value(18).toString();
    if (!q.value(19).isNull())
        b.container_ml = q.value(19).toDouble();
    b.deviation_note = q.value(20).toString();
    b.deviation_by = q.value(21).toString();
    b.deviation_at = q.value(22).toString();
    b.ph_capture = QJsonDocument::fromJson(q.value(23).toString().toUtf8()).object();
    if (q.record().count() > 26) {
        b.version = q.value(24).toLongLong();
        b.changed_by = q.value(25).toString();
        b.changed_at = q.value(26).toString();
    }
    return b;
}

} // namespace

namespace {

/// The columns whose change needs recorded history rows, as of each step (4, 6 and 8).
const char* const step4_watched[] = {"document_kind",     "document",   "prepared_by",
                                     "prepared_at",       "expires_at", "checked_by",
                                     "tolerance_percent", "actual"};
const char* const step6_watched[] = {"measured_ph",    "ph_tolerance", "ph_meter_id",
                                     "balance_id",     "comment",      "container_ml",
                                     "deviation_note", "deviation_by", "deviation_at"};

/// A change of data needs the next revision and its history rows, written first; after printing
/// those rows must be an amendment.
sql::Guard changes_recorded(const QStringList& watched) {
    QStringList changed;
    for (const QString& c : watched)
        changed << QStringLiteral("NEW.%1 IS NOT OLD.%1").arg(c);
    return {
        "batches_changes_recorded", "batches", "UPDATE",
        "(" + changed.join(" OR ") +
            ")"
            " AND (NEW.revision <> OLD.revision + 1 OR NOT EXISTS (SELECT 1 FROM batch_history h"
            "  WHERE h.batch_id = NEW.id AND h.revision = NEW.revision"
            "  AND (h.action = 'amend' OR (OLD.printed_count = 0 AND h.action = 'edit'))))",
        "unrecorded change of a batch (a printed batch needs an amendment)"};
}

QStringList watched_until(int step) {
    QStringList w;
    for (const char* c : step4_watched)
        w << c;
    if (step >= 6)
        for (const char* c : step6_watched)
            w << c;
    if (step >= 8)
        w << "measured_ph_capture";
    return w;
}

} // namespace

QStringList batch_schema_statements(sql::Dialect d) {
    QStringList s = {
        // One row per batch. The data columns change only together with history rows.
        "CREATE TABLE batches ("
        " id TEXT PRIMARY KEY NOT NULL CHECK (length(id) > 0),"
        " document_kind TEXT NOT NULL CHECK (document_kind IN ('recipe', 'line', 'sequence')),"
        " document TEXT NOT NULL CHECK (json_valid(document)),"
        " prepared_by TEXT NOT NULL DEFAULT '',"
        " prepared_at TEXT NOT NULL DEFAULT '',"
        " expires_at TEXT NOT NULL DEFAULT '',"
        " checked_by TEXT NOT NULL DEFAULT '',"
        " tolerance_percent {real} NOT NULL DEFAULT 2 CHECK (tolerance_percent > 0 AND "
        "tolerance_percent <= 50),"
        " actual TEXT NOT NULL DEFAULT '[]' CHECK (json_valid(actual)),"
        " revision INTEGER NOT NULL DEFAULT 1 CHECK (revision >= 1),"
        " printed_count INTEGER NOT NULL DEFAULT 0 CHECK (printed_count >= 0),"
        " first_printed_at TEXT NOT NULL DEFAULT '',"
        " created_at TEXT NOT NULL,"
        " updated_at TEXT NOT NULL)",
        "CREATE INDEX batches_updated ON batches (updated_at)",
        // Append-only: who changed what, when, from which value to which.
        "CREATE TABLE batch_history ("
        " seq {autoinc_pk},"
        " batch_id TEXT NOT NULL REFERENCES batches (id),"
        " revision INTEGER NOT NULL,"
        " at TEXT NOT NULL,"
        " who TEXT NOT NULL CHECK (length(who) > 0),"
        " action TEXT NOT NULL CHECK (action IN ('create', 'edit', 'amend', 'print')),"
        " field TEXT NOT NULL DEFAULT '',"
        " old_value TEXT,"
        " new_value TEXT,"
        " reason TEXT NOT NULL DEFAULT '',"
        " CHECK (action <> 'amend' OR length(reason) > 0))",
        "CREATE INDEX batch_history_batch ON batch_history (batch_id, seq)",
    };
    for (QString& x : s)
        x = sql::render_ddl(d, x);
    const sql::Guard guards[] = {
        {"batch_history_no_update", "batch_history", "UPDATE", {}, "batch_history is append-only"},
        {"batch_history_no_delete", "batch_history", "DELETE", {}, "batch_history is append-only"},
        {"batches_no_delete", "batches", "DELETE", {}, "batches are never deleted"},
        {"batches_fixed", "batches", "UPDATE",
         "NEW.id IS NOT OLD.id OR NEW.created_at IS NOT OLD.created_at"
         " OR NEW.printed_count < OLD.printed_count OR NEW.revision < OLD.revision",
         "a batch keeps its id, creation time, revisions and prints"},
        changes_recorded(watched_until(4)),
    };
    for (const sql::Guard& g : guards)
        s << sql::guard_statements(d, g);
    return s;
}

QStringList batch_schema_bench_statements(sql::Dialect d) {
    QStringList s;
    for (const char* col : {
             "measured_ph {real} CHECK (measured_ph IS NULL OR (measured_ph >= 0 AND measured_ph "
             "<= 14))",
             "ph_tolerance {real} NOT NULL DEFAULT 0.05 CHECK (ph_tolerance > 0 AND ph_tolerance "
             "<= 2)",
             "ph_meter_id TEXT NOT NULL DEFAULT ''",
             "balance_id TEXT NOT NULL DEFAULT ''",
             "comment TEXT NOT NULL DEFAULT ''",
             "container_ml {real} CHECK (container_ml IS NULL OR container_ml > 0)",
             "deviation_note TEXT NOT NULL DEFAULT ''",
             "deviation_by TEXT NOT NULL DEFAULT ''",
             "deviation_at TEXT NOT NULL DEFAULT ''",
         })
        s << sql::render_ddl(d, QStringLiteral("ALTER TABLE batches ADD COLUMN %1").arg(col));
    s << sql::drop_guard_statements(d, "batches_changes_recorded", "batches");
    s << sql::guard_statements(d, changes_recorded(watched_until(6)));
    return s;
}

QStringList batch_schema_capture_statements(sql::Dialect d) {
    QStringList s;
    s << QStringLiteral(
        "ALTER TABLE batches ADD COLUMN measured_ph_capture TEXT NOT NULL DEFAULT '{}'"
        " CHECK (json_valid(measured_ph_capture))");
    s << sql::drop_guard_statements(d, "batches_changes_recorded", "batches");
    s << sql::guard_statements(d, changes_recorded(watched_until(8)));
    return s;
}

// ---- BatchRecord ------------------------------------------------------------------------------

QJsonObject BatchRecord::to_input() const {
    QJsonObject doc = document;
    QJsonObject b{{"id", id}};
    if (!prepared_by.isEmpty())
        b["prepared_by"] = prepared_by;
    if (!prepared_at.isEmpty())
        b["prepared_at"] = prepared_at;
    if (!expires_at.isEmpty())
        b["expires_at"] = expires_at;
    if (!checked_by.isEmpty())
        b["checked_by"] = checked_by;
    b["tolerance_percent"] = tolerance_percent;
    if (!actual.isEmpty())
        b["actual"] = actual;
    if (measured_ph)
        b["measured_ph"] = *measured_ph;
    if (!ph_capture.isEmpty())
        b["measured_ph_capture"] = ph_capture;
    b["ph_tolerance"] = ph_tolerance;
    if (!ph_meter_id.isEmpty())
        b["ph_meter_id"] = ph_meter_id;
    if (!balance_id.isEmpty())
        b["balance_id"] = balance_id;
    if (!comment.isEmpty())
        b["comment"] = comment;
    if (container_ml)
        b["container_ml"] = *container_ml;
    if (!deviation_note.isEmpty()) {
        QJsonObject dev{{"note", deviation_note}};
        if (!deviation_by.isEmpty())
            dev["by"] = deviation_by;
        if (!deviation_at.isEmpty())
            dev["at"] = deviation_at;
        b["deviation"] = dev;
    }
    doc["batch"] = b;
    return doc;
}

BatchRecord BatchRecord::from_input(const QJsonObject& input) {
    if (!input.value("batch").isObject())
        throw chem::Error("batch", "is required: an object with an id");
    const QJsonObject b = input.value("batch").toObject();
    BatchRecord r;
    auto text = [&](const char* key) -> QString {
        const QJsonValue v = b.value(key);
        if (v.isUndefined() || v.isNull())
            return {};
        if (!v.isString())
            throw chem::Error(std::string("batch.") + key, "must be a string");
        return v.toString().trimmed();
    };
    r.id = text("id");
    r.prepared_by = text("prepared_by");
    r.prepared_at = text("prepared_at");
    r.expires_at = text("expires_at");
    r.checked_by = text("checked_by");
    if (b.contains("tolerance_percent")) {
        if (!b.value("tolerance_percent").isDouble())
            throw chem::Error("batch.tolerance_percent", "must be a number");
        r.tolerance_percent = b.value("tolerance_percent").toDouble();
    }
    auto number = [&](const char* key) -> std::optional<double> {
        const QJsonValue v = b.value(key);
        if (v.isUndefined() || v.isNull())
            return std::nullopt;
        if (!v.isDouble())
            throw chem::Error(std::string("batch.") + key, "must be a number");
        return v.toDouble();
    };
    r.measured_ph = number("measured_ph");
    if (b.contains("measured_ph_capture") && !b.value("measured_ph_capture").isNull()) {
        if (!b.value("measured_ph_capture").isObject())
            throw chem::Error("batch.measured_ph_capture",
                              "must be an object {device_id, raw, received_at, …}");
        r.ph_capture = b.value("measured_ph_capture").toObject();
    }
    if (auto t = number("ph_tolerance"))
        r.ph_tolerance = *t;
    r.ph_meter_id = text("ph_meter_id");
    r.balance_id = text("balance_id");
    r.comment = text("comment");
    r.container_ml = number("container_ml");
    if (b.contains("deviation") && !b.value("deviation").isNull()) {
        if (!b.value("deviation").isObject())
            throw chem::Error("batch.deviation", "must be an object {note, by, at}");
        const QJsonObject d = b.value("deviation").toObject();
        for (const char* k : {"note", "by", "at"})
            if (d.contains(k) && !d.value(k).isString())
                throw chem::Error(std::string("batch.deviation.") + k, "must be a string");
        r.deviation_note = d.value("note").toString().trimmed();
        r.deviation_by = d.value("by").toString().trimmed();
        r.deviation_at = d.value("at").toString().trimmed();
        if (r.deviation_note.isEmpty())
            throw chem::Error(
                "batch.deviation.note",
                "is empty: say why the batch is used although it is out of tolerance");
    }
    if (b.contains("actual") && !b.value("actual").isNull()) {
        if (!b.value("actual").isArray())
            throw chem::Error("batch.actual", "must be an array");
        r.actual = b.value("actual").toArray();
    }
    r.document = input;
    r.document.remove("batch");
    r.document_kind = kind_of(r.document);
    validate(r);
    return r;
}

// ---- BatchStore -------------------------------------------------------------------------------

BatchStore::BatchStore(QSqlDatabase db) : db_(db) {}

void BatchStore::ensure_schema(QSqlDatabase db) {
    const sql::Dialect d = sql::dialect_of(db);
    const bool present = sql::table_exists(db, "batches");
    const bool bench = present && sql::column_exists(db, "batches", "measured_ph");
    const bool capture = bench && sql::column_exists(db, "batches", "measured_ph_capture");
    const bool audit = has_audit_schema(db);
    const bool lots = sql::table_exists(db, "reagent_lots");
    if (present && bench && capture && audit && has_versioning(db) && lots)
        return;
    Transaction tx(db);
    if (!present)
        for (const QString& s : sql::json_function_statements(d) + batch_schema_statements(d))
            run(db, s);
    if (!bench)
        for (const QString& s : batch_schema_bench_statements(d))
            run(db, s);
    if (!capture)
        for (const QString& s : batch_schema_capture_statements(d))
            run(db, s);
    if (!audit) {
        for (const QString& s : audit_schema_statements())
            run(db, s);
        for (const QString& s : audit_guard_statements(d))
            run(db, s);
    }
    if (!has_versioning(db))
        for (const QString& s :
             versioning_schema_statements(d, sql::table_exists(db, QStringLiteral("buffers"))))
            run(db, s);
    if (!lots)
        for (const QString& s : lot_schema_statements(d))
            run(db, s);
    tx.commit();
}

bool BatchStore::versioned() const {
    if (!versioned_)
        versioned_ = has_versioning(db_);
    return *versioned_;
}

QString BatchStore::now() const {
    if (!clock_)
        return sql::utc_now(db_); // the server's clock on PostgreSQL
    return clock_().toUTC().toString(Qt::ISODateWithMs);
}

void BatchStore::create(const BatchRecord& batch_in, const QString& who) {
    if (who.trimmed().isEmpty())
        throw chem::Error("who", "is required: the history names who made each change");
    validate(batch_in);
    Transaction tx(db_);
    AccountStore::check_may_edit(db_, who);
    if (run(db_, "SELECT 1 FROM batches WHERE id = ?", {batch_in.id}).next())
        throw chem::Error("batch.id", "\"" + str(batch_in.id) + "\" is taken by another batch");
    BatchRecord batch = batch_in;
    resolve_batch_lots(db_, nullptr, batch); // each lot's expiry from the shelf
    validate(batch);
    const QString t = now();
    run(db_,
        "INSERT INTO batches (id, document_kind, document, prepared_by, prepared_at, expires_at,"
        " checked_by, tolerance_percent, actual, revision, printed_count, first_printed_at,"
        " created_at, updated_at, measured_ph, ph_tolerance, ph_meter_id, balance_id, comment,"
        " container_ml, deviation_note, deviation_by, deviation_at, measured_ph_capture)"
        " VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, 1, 0, '', ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)",
        {batch.id,
         batch.document_kind,
         compact(batch.document),
         batch.prepared_by,
         batch.prepared_at,
         batch.expires_at,
         batch.checked_by,
         batch.tolerance_percent,
         compact(batch.actual),
         t,
         t,
         optional_real(batch.measured_ph),
         batch.ph_tolerance,
         batch.ph_meter_id,
         batch.balance_id,
         batch.comment,
         optional_real(batch.container_ml),
         batch.deviation_note,
         batch.deviation_by,
         batch.deviation_at,
         compact(batch.ph_capture)});
    if (versioned())
        run(db_, "UPDATE batches SET version = 1, changed_by = ?, changed_at = ? WHERE id = ?",
            {who.trimmed(), t, batch.id});
    for (const auto& [field, value] : flatten(batch))
        run(db_,
            "INSERT INTO batch_history (batch_id, revision, at, who, action, field, old_value, "
            "new_value)"
            " VALUES (?, 1, ?, ?, 'create', ?, NULL, ?)",
            {batch.id, t, who.trimmed(), field, value_text(value)});
    if (has_audit_schema(db_)) {
        QJsonObject changes;
        for (const auto& [field, value] : flatten(batch))
            changes.insert(field, QJsonObject{{"old", QJsonValue::Null}, {"new", value}});
        append_audit(db_, t, who.trimmed(), "create", "batch", batch.id, {}, changes);
    }
    tx.commit();
}

QString BatchStore::propose_id(const QString& prefix_in, const QDate& date) const {
    const QString prefix =
        (prefix_in.trimmed().isEmpty() ? QStringLiteral("B") : prefix_in.trimmed()) + "-" +
        date.toString(QStringLiteral("yyyyMMdd")) + "-";
    QSqlQuery q =
        run(db_, "SELECT id FROM batches WHERE substr(id, 1, ?) = ?", {prefix.size(), prefix});
    int highest = 0;
    while (q.next()) {
        bool ok = false;
        const int n = q.value(0).toString().mid(prefix.size()).toInt(&ok);
        if (ok)
            highest = std::max(highest, n);
    }
    return prefix + QStringLiteral("%1").arg(highest + 1, 3, 10, QChar('0'));
}

QString BatchStore::create_copy(const BatchRecord& mine, const QString& who, const QString& prefix,
                                const QDate& day) {
    BatchRecord copy = mine;
    const QString from = mine.id;
    copy.id = propose_id(prefix, day);
    const QString origin = QStringLiteral("Copy of %1").arg(from);
    copy.comment = copy.comment.trimmed().isEmpty() ? origin : origin + ": " + copy.comment;
    copy.comment = copy.comment.left(qsizetype(chem::guard::max_text_chars));
    create(copy, who);
    return copy.id;
}

std::optional<BatchRecord> BatchStore::load(const QString& id) const {
    QSqlQuery q = run(db_,
                      QStringLiteral("SELECT %1%2 FROM batches WHERE id = ?")
                          .arg(QLatin1String(select_columns),
                               versioned() ? QLatin1String(version_columns) : QLatin1String("")),
                      {id});
    if (!q.next())
        return std::nullopt;
    return record_from(q);
}

QStringList BatchStore::list() const {
    // Bounded read-back: ids that fit the id limit, the most recent max_record_array_items.
    QSqlQuery q = run(db_, QStringLiteral("SELECT id FROM batches WHERE length(id) <= %1"
                                          " ORDER BY updated_at DESC, id LIMIT %2")
                               .arg(QString::number(chem::guard::max_id_chars),
                                    QString::number(max_record_array_items)));
    QStringList out;
    while (q.next())
        out << q.value(0).toString();
    return out;
}

bool BatchStore::edit(const QString& id, const BatchRecord& next, const QString& who) {
    return change(id, next, who, QStringLiteral("edit"), {});
}

bool BatchStore::amend(const QString& id, const BatchRecord& next, const QString& who,
                       const QString& reason) {
    if (reason.trimmed().isEmpty())
        throw chem::Error("reason", "is required: an amendment says why the record changes");
    return change(id, next, who, QStringLiteral("amend"), reason.trimmed());
}

bool BatchStore::change(const QString& id, const BatchRecord& next_in, const QString& who,
                        const QString& action, const QString& reason,
                        const LotOverrideGrant* grant) {
    if (who.trimmed().isEmpty())
        throw chem::Error("who", "is required: the history names who made each change");
    BatchRecord next = next_in;
    next.id = id; // the id is the key; it never changes
    // Checked once its lots are tied to the shelf (and an override granted), below.
    Transaction tx(db_);
    AccountStore::check_may_edit(db_, who);
    const std::optional<BatchRecord> cur = load(id);
    if (!cur)
        throw chem::Error("batch.id", "no batch \"" + str(id) + "\"");
    resolve_batch_lots(db_, &*cur, next, grant); // each lot's expiry from the shelf
    validate(next);
    const std::vector<Signature> signed_now = holding_signatures(db_, *cur);
    if (!signed_now.empty() && action == "edit")
        throw chem::Error("batch", "batch \"" + str(id) + "\" was signed as " +
                                       str(signed_now.front().meaning) + " by " +
                                       str(signed_now.front().display_name) +
                                       ": a change is an amendment with a reason, and it voids "
                                       "the signatures");
    if (cur->printed() && action == "edit")
        throw chem::Error("batch", "batch \"" + str(id) + "\" was printed on " +
                                       str(cur->first_printed_at) +
                                       ": a change is an amendment with a reason, not an edit");
    const auto before = flatten(*cur);
    const auto after = flatten(next);
    std::map<QString, std::pair<QJsonValue, QJsonValue>> diff;
    for (const auto& [k, v] : before) {
        auto it = after.find(k);
        const QJsonValue nv = it == after.end() ? QJsonValue(QJsonValue::Null) : it->second;
        if (nv != v)
            diff[k] = {v, nv};
    }
    for (const auto& [k, v] : after)
        if (!before.count(k))
            diff[k] = {QJsonValue(QJsonValue::Null), v};
    if (diff.empty())
        return false; // what the caller wants is what is stored: nothing to refuse or to write
    // Someone saved this batch since the caller loaded it: refuse, naming them (versioning.h).
    if (versioned() && next_in.version != cur->version)
        throw conflict_error(db_, "Batch " + id, {cur->version, cur->changed_by, cur->changed_at});

    const int revision = cur->revision + 1;
    const QString t = grant ? grant->at : now(); // the override's time is the change's
    for (const auto& [field, values] : diff)
        run(db_,
            "INSERT INTO batch_history (batch_id, revision, at, who, action, field, old_value, "
            "new_value, reason)"
            " VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)",
            {id, revision, t, who.trimmed(), action, field, value_text(values.first),
             value_text(values.second), reason});
    run(db_,
        "UPDATE batches SET document_kind = ?, document = ?, prepared_by = ?, prepared_at = ?,"
        " expires_at = ?, checked_by = ?, tolerance_percent = ?, actual = ?, revision = ?,"
        " updated_at = ?, measured_ph = ?, ph_tolerance = ?, ph_meter_id = ?, balance_id = ?,"
        " comment = ?, container_ml = ?, deviation_note = ?, deviation_by = ?, deviation_at = ?,"
        " measured_ph_capture = ? WHERE id = ?",
        {next.document_kind,
         compact(next.document),
         next.prepared_by,
         next.prepared_at,
         next.expires_at,
         next.checked_by,
         next.tolerance_percent,
         compact(next.actual),
         revision,
         t,
         optional_real(next.measured_ph),
         next.ph_tolerance,
         next.ph_meter_id,
         next.balance_id,
         next.comment,
         optional_real(next.container_ml),
         next.deviation_note,
         next.deviation_by,
         next.deviation_at,
         compact(next.ph_capture),
         id});
    if (versioned()) {
        // Only the version this save was loaded at is replaced (checked above, under the write
        // lock; the WHERE makes the row itself the judge).
        QSqlQuery v = run(db_,
                          "UPDATE batches SET version = version + 1, changed_by = ?,"
                          " changed_at = ? WHERE id = ? AND version = ?",
                          {who.trimmed(), t, id, cur->version});
        if (v.numRowsAffected() != 1)
            throw conflict_error(db_, "Batch " + id,
                                 {cur->version, cur->changed_by, cur->changed_at});
    }
    if (has_audit_schema(db_)) {
        QJsonObject changes;
        for (const auto& [field, values] : diff)
            changes.insert(
                field,
                QJsonObject{{"old", values.first.isUndefined() ? QJsonValue(QJsonValue::Null)
                                                               : values.first},
                            {"new", values.second.isUndefined() ? QJsonValue(QJsonValue::Null)
                                                                : values.second}});
        if (grant) {
            // The approver's acceptance first, under the approver's login, then the change.
            QString expires;
            for (const QJsonValue& v : next.actual)
                if (v.toObject().value("reagent").toString() == grant->reagent)
                    expires = v.toObject().value("lot_expires_on").toString();
            append_audit(db_, t, grant->by, "override-expired-lot", "batch", id, grant->reason,
                         audit_change("actual[" + grant->reagent + "].lot", QJsonValue::Null,
                                      QStringLiteral("%1 (expired %2)").arg(grant->lot, expires)));
        }
        append_audit(db_, t, who.trimmed(), action, "batch", id, reason, changes);
        // The content signed is gone: each signature that held is void from this change on.
        for (const Signature& sig : signed_now)
            append_audit(db_, t, who.trimmed(), "void-signature", "batch", id,
                         QStringLiteral("revision %1 changed the content signed at revision %2")
                             .arg(revision)
                             .arg(sig.revision),
                         audit_change(QStringLiteral("signature %1 (%2 by %3)")
                                          .arg(sig.id)
                                          .arg(sig.meaning, sig.login),
                                      QStringLiteral("holds"), QStringLiteral("void")));
    }
    tx.commit();
    return true;
}

bool BatchStore::override_expired_lot(const QString& id, const BatchRecord& next,
                                      const QString& who, const LotOverrideRequest& request) {
    const QString reason = request.reason.trimmed();
    if (reason.isEmpty())
        throw chem::Error("lot_override.reason",
                          "is required: say why the expired lot may still be used");
    if (request.login.trimmed().isEmpty())
        throw chem::Error("login", "is required: the approver who overrides signs in here");
    const std::optional<BatchRecord> cur = load(id);
    if (!cur)
        throw chem::Error("batch.id", "no batch \"" + str(id) + "\"");
    // The password again, as for a signature (a wrong one counts towards the lock).
    AccountStore accounts(db_);
    const Account a = accounts.authenticate(request.login, request.password);
    if (a.role != Role::approver)
        throw chem::Error("login", str(a.display_name) + " (" + str(a.login) + ") is " +
                                       (a.role == Role::administrator ? "an " : "a ") +
                                       str(role_name(a.role)) +
                                       ": only an approver overrides an expired lot");
    LotOverrideGrant grant{request.reagent, request.lot.trimmed(), a.login, a.display_name, now(),
                           reason};
    const bool amendment = cur->printed() || !holding_signatures(db_, *cur).empty();
    const QString why = QStringLiteral("expired lot %1 of %2 used by override of %3 (%4): %5")
                            .arg(grant.lot, grant.reagent, a.display_name, a.login, reason);
    return change(id, next, who, amendment ? QStringLiteral("amend") : QStringLiteral("edit"),
                  amendment ? why : QString(), &grant);
}

void BatchStore::mark_printed(const QString& id, const QString& who, const QString& what,
                              qint64 expected_version) {
    if (who.trimmed().isEmpty())
        throw chem::Error("who", "is required: the history names who printed");
    Transaction tx(db_);
    AccountStore::check_may_edit(db_, who);
    const std::optional<BatchRecord> cur = load(id);
    if (!cur)
        throw chem::Error("batch.id", "no batch \"" + str(id) + "\"");
    if (versioned() && expected_version > 0 && expected_version != cur->version)
        throw conflict_error(db_, "Batch " + id, {cur->version, cur->changed_by, cur->changed_at});
    const QString t = now();
    if (has_audit_schema(db_))
        append_audit(db_, t, who.trimmed(), "print", "batch", id, {},
                     audit_change("printed_count", cur->printed_count,
                                  what.isEmpty()
                                      ? QString::number(cur->printed_count + 1)
                                      : QString::number(cur->printed_count + 1) + ": " + what));
    run(db_,
        "INSERT INTO batch_history (batch_id, revision, at, who, action, field, old_value, "
        "new_value)"
        " VALUES (?, ?, ?, ?, 'print', 'printed_count', ?, ?)",
        {id, cur->revision, t, who.trimmed(), value_text(cur->printed_count),
         value_text(QJsonValue(what.isEmpty()
                                   ? QString::number(cur->printed_count + 1)
                                   : QString::number(cur->printed_count + 1) + ": " + what))});
    run(db_,
        "UPDATE batches SET printed_count = printed_count + 1,"
        " first_printed_at = CASE WHEN first_printed_at = '' THEN ? ELSE first_printed_at END,"
        " updated_at = ? WHERE id = ?",
        {t, t, id});
    if (versioned())
        run(db_,
            "UPDATE batches SET version = version + 1, changed_by = ?, changed_at = ? WHERE id = ?",
            {who.trimmed(), t, id});
    tx.commit();
}

std::vector<HistoryEntry> BatchStore::history(const QString& id) const {
    QSqlQuery q = run(
        db_,
        // Bounded read-back: the latest max_record_array_items changes, each text cut to
        // max_record_text_chars (a cut value reads back as text; the row is unchanged).
        QStringLiteral("SELECT seq, batch_id, revision, at, substr(who, 1, %1), action,"
                       " substr(field, 1, %1), substr(old_value, 1, %1), substr(new_value, 1, %1),"
                       " substr(reason, 1, %1) FROM (SELECT * FROM batch_history WHERE batch_id = ?"
                       " ORDER BY seq DESC LIMIT %2) AS recent ORDER BY seq")
            .arg(QString::number(max_record_text_chars), QString::number(max_record_array_items)),
        {id});
    std::vector<HistoryEntry> out;
    while (q.next()) {
        HistoryEntry h;
        h.seq = q.value(0).toLongLong();
        h.batch_id = q.value(1).toString();
        h.revision = q.value(2).toInt();
        h.at = q.value(3).toString();
        h.who = q.value(4).toString();
        h.action = q.value(5).toString();
        h.field = q.value(6).toString();
        h.old_value = value_from_text(q.value(7));
        h.new_value = value_from_text(q.value(8));
        h.reason = q.value(9).toString();
        out.push_back(std::move(h));
    }
    return out;
}

} // namespace phaseplan::storage
