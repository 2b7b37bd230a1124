#include "storage/audit_trail.h"

#include "chem/error.h"
#include "storage/sql_util.h"

#include <QCryptographicHash>
#include <QJsonArray>
#include <QJsonDocument>
#include <QSqlQuery>

namespace phaseplan::storage {

using sql::run;

QStringList audit_schema_statements() {
    return {
        // People. The hash is libsodium's crypto_pwhash_str string ("$argon2id$v=19$…"): it holds
        // the salt and the parameters. Accounts are never deleted (a login is not reused).
        "CREATE TABLE users ("
        " login TEXT PRIMARY KEY NOT NULL CHECK (length(login) > 0),"
        " display_name TEXT NOT NULL CHECK (length(display_name) > 0),"
        " role TEXT NOT NULL CHECK (role IN ('preparer', 'reviewer', 'approver', "
        "'administrator')),"
        " password_hash TEXT NOT NULL,"
        " failed_attempts INTEGER NOT NULL DEFAULT 0 CHECK (failed_attempts >= 0),"
        " locked INTEGER NOT NULL DEFAULT 0 CHECK (locked IN (0, 1)),"
        " created_at TEXT NOT NULL,"
        " changed_at TEXT NOT NULL)",
        // The one trail. seq is given by append_audit (max + 1 under the write lock), not by an
        // engine's autoincrement, so the numbering is the same on every back end.
        "CREATE TABLE audit_log ("
        " seq BIGINT PRIMARY KEY NOT NULL CHECK (seq >= 1),"
        " logged_at TEXT NOT NULL,"
        " login TEXT NOT NULL CHECK (length(login) > 0),"
        " action TEXT NOT NULL CHECK (length(action) > 0),"
        " record_type TEXT NOT NULL,"
        " record_id TEXT NOT NULL,"
        " reason TEXT NOT NULL DEFAULT '',"
        " changes TEXT NOT NULL,"
        " prev_hash TEXT NOT NULL CHECK (length(prev_hash) = 64),"
        " hash TEXT NOT NULL UNIQUE CHECK (length(hash) = 64),"
        " CHECK (action <> 'amend' OR length(reason) > 0))",
        "CREATE INDEX audit_log_record ON audit_log (record_type, record_id, seq)",
        // The last entry, so that entries removed from the end are noticed.
        "CREATE TABLE audit_anchor ("
        " id INTEGER PRIMARY KEY NOT NULL CHECK (id = 1),"
        " last_seq BIGINT NOT NULL,"
        " last_hash TEXT NOT NULL)",
        // Electronic signatures on batches: who, when, as what, over which content (21 CFR
        // 11.50, 11.70). Never updated: whether a signature still holds is computed by comparing
        // content_sha256 with the batch as it is now.
        "CREATE TABLE signatures ("
        " id BIGINT PRIMARY KEY NOT NULL,"
        " batch_id TEXT NOT NULL REFERENCES batches (id),"
        " login TEXT NOT NULL REFERENCES users (login),"
        " display_name TEXT NOT NULL,"
        " meaning TEXT NOT NULL CHECK (meaning IN ('prepared', 'reviewed', 'approved')),"
        " signed_at TEXT NOT NULL,"
        " revision INTEGER NOT NULL CHECK (revision >= 1),"
        " content_sha256 TEXT NOT NULL CHECK (length(content_sha256) = 64),"
        " audit_seq BIGINT NOT NULL)",
        "CREATE INDEX signatures_batch ON signatures (batch_id, id)",
    };
}

QStringList audit_guard_statements(sql::Dialect d) {
    const sql::Guard guards[] = {
        {"audit_log_no_update", "audit_log", "UPDATE", {}, "audit_log is append-only"},
        {"audit_log_no_delete", "audit_log", "DELETE", {}, "audit_log is append-only"},
        {"audit_anchor_no_delete",
         "audit_anchor",
         "DELETE",
         {},
         "the audit anchor is never removed"},
        {"audit_anchor_steps", "audit_anchor", "UPDATE", "NEW.last_seq <> OLD.last_seq + 1",
         "the audit anchor moves one entry at a time"},
        {"signatures_no_update", "signatures", "UPDATE", {}, "signatures are never changed"},
        {"signatures_no_delete", "signatures", "DELETE", {}, "signatures are never removed"},
        {"users_no_delete", "users", "DELETE", {}, "accounts are never removed (lock them)"},
        {"users_login_fixed", "users", "UPDATE",
         "NEW.login IS NOT OLD.login OR NEW.created_at IS NOT OLD.created_at",
         "an account keeps its login and creation time"},
    };
    QStringList s;
    for (const sql::Guard& g : guards)
        s << sql::guard_statements(d, g);
    return s;
}

QString audit_genesis_hash() {
    return QString(64, QLatin1Char('0'));
}

QByteArray canonical_audit_bytes(const AuditEntry& e) {
    QByteArray out("phaseplan-audit-v1\n");
    auto field = [&out](const QByteArray& bytes) {
        out += QByteArray::number(bytes.size());
        out += ':';
        out += bytes;
        out += '\n';
    };
    field(QByteArray::number(e.seq));
    field(e.logged_at.toUtf8());
    field(e.login.toUtf8());
    field(e.action.toUtf8());
    field(e.record_type.toUtf8());
    field(e.record_id.toUtf8());
    field(e.reason.toUtf8());
    field(e.changes.toUtf8());
    field(e.prev_hash.toUtf8());
    return out;
}

QString audit_hash(const AuditEntry& e) {
    return QString::fromLatin1(
        QCryptographicHash::hash(canonical_audit_bytes(e), QCryptographicHash::Sha256).toHex());
}

QJsonObject audit_change(const QString& field, const QJsonValue& old_value,
                         const QJsonValue& new_value) {
    auto norm = [](const QJsonValue& v) {
        return v.isUndefined() ? QJsonValue(QJsonValue::Null) : v;
    };
    return {{field, QJsonObject{{"old", norm(old_value)}, {"new", norm(new_value)}}}};
}

AuditEntry append_audit(QSqlDatabase db, const QString& logged_at, const QString& login,
                        const QString& action, const QString& record_type, const QString& record_id,
                        const QString& reason, const QJsonObject& changes) {
    AuditEntry e;
    QSqlQuery last = run(db, "SELECT seq, hash FROM audit_log ORDER BY seq DESC LIMIT 1");
    if (last.next()) {
        e.seq = last.value(0).toLongLong() + 1;
        e.prev_hash = last.value(1).toString();
    } else {
        e.seq = 1;
        e.prev_hash = audit_genesis_hash();
    }
    e.logged_at = logged_at.isEmpty() ? sql::utc_now(db) : logged_at;
    e.login = login.trimmed();
    e.action = action;
    e.record_type = record_type;
    e.record_id = record_id;
    e.reason = reason.trimmed();
    e.changes = QString::fromUtf8(QJsonDocument(changes).toJson(QJsonDocument::Compact));
    e.hash = audit_hash(e);
    run(db,
        "INSERT INTO audit_log (seq, logged_at, login, action, record_type, record_id, reason,"
        " changes, prev_hash, hash) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?)",
        {e.seq, e.logged_at, e.login, e.action, e.record_type, e.record_id, e.reason, e.changes,
         e.prev_hash, e.hash});
    if (e.seq == 1)
        run(db, "INSERT INTO audit_anchor (id, last_seq, last_hash) VALUES (1, ?, ?)",
            {e.seq, e.hash});
    else
        run(db, "UPDATE audit_anchor SET last_seq = ?, last_hash = ? WHERE id = 1",
            {e.seq, e.hash});
    return e;
}

namespace {

const char* entry_columns =
    "seq, logged_at, login, action, record_type, record_id, reason, changes, prev_hash, hash";

AuditEntry entry_from(const QSqlQuery& q) {
    AuditEntry e;
    e.seq = q.value(0).toLongLong();
    e.logged_at = q.value(1).toString();
    e.login = q.value(2).toString();
    e.action = q.value(3).toString();
    e.record_type = q.value(4).toString();
    e.record_id = q.value(5).toString();
    e.reason = q.value(6).toString();
    e.changes = q.value(7).toString();
    e.prev_hash = q.value(8).toString();
    e.hash = q.value(9).toString();
    return e;
}

QString short_hash(const QString& h) {
    return h.left(12) + QStringLiteral("…");
}

} // namespace

std::vector<AuditEntry> audit_entries(QSqlDatabase db, const AuditFilter& filter) {
    QString sql = QStringLiteral("SELECT %1 FROM audit_log").arg(QLatin1String(entry_columns));
    QVariantList b;
    QStringList where;
    if (!filter.record_type.isEmpty()) {
        where << QStringLiteral("record_type = ?");
        b << filter.record_type;
    }
    if (!filter.record_id.isEmpty()) {
        where << QStringLiteral("record_id = ?");
        b << filter.record_id;
    }
    if (!where.isEmpty())
        sql += QStringLiteral(" WHERE ") + where.join(QStringLiteral(" AND "));
    sql += QStringLiteral(" ORDER BY seq");
    QSqlQuery q = run(db, sql, b);
    std::vector<AuditEntry> out;
    while (q.next())
        out.push_back(entry_from(q));
    return out;
}

AuditVerification verify_audit(QSqlDatabase db) {
    AuditVerification v;
    QSqlQuery q = run(
        db,
        QStringLiteral("SELECT %1 FROM audit_log ORDER BY seq").arg(QLatin1String(entry_columns)));
    qint64 expected = 1;
    QString prev = audit_genesis_hash();
    while (q.next()) {
        const AuditEntry e = entry_from(q);
        ++v.entries;
        if (e.seq != expected) {
            if (e.seq > expected)
                return v.broken_at(
                    expected, e.seq == expected + 1
                                  ? QStringLiteral("entry %1 is missing (deleted): entry %2 "
                                                   "follows entry %3")
                                        .arg(expected)
                                        .arg(e.seq)
                                        .arg(expected - 1)
                                  : QStringLiteral("entries %1 to %2 are missing (deleted): entry "
                                                   "%3 follows entry %4")
                                        .arg(expected)
                                        .arg(e.seq - 1)
                                        .arg(e.seq)
                                        .arg(expected - 1));
            return v.broken_at(
                e.seq,
                QStringLiteral("entry %1 is out of order (expected %2)").arg(e.seq).arg(expected));
        }
        const QString computed = audit_hash(e);
        if (e.prev_hash != prev) {
            if (computed == e.hash)
                // The entry is whole but does not chain to the one before it.
                return v.broken_at(
                    e.seq, QStringLiteral("entry %1 does not follow entry %2: its prev_hash %3 "
                                          "is not entry %2's hash %4 (an entry was inserted, "
                                          "replaced or reordered)")
                               .arg(e.seq)
                               .arg(e.seq - 1)
                               .arg(short_hash(e.prev_hash), short_hash(prev)));
            return v.broken_at(e.seq,
                               QStringLiteral("entry %1 was changed: its prev_hash %2 is not the "
                                              "hash %3 of entry %4")
                                   .arg(e.seq)
                                   .arg(short_hash(e.prev_hash), short_hash(prev))
                                   .arg(e.seq - 1));
        }
        if (computed != e.hash) {
            return v.broken_at(
                e.seq, QStringLiteral("entry %1 was changed: its fields (%2 by %3, %4 %5 "
                                      "\"%6\") hash to %7, not the stored %8")
                           .arg(e.seq)
                           .arg(e.logged_at, e.login, e.action, e.record_type, e.record_id.left(64),
                                short_hash(computed), short_hash(e.hash)));
        }
        prev = e.hash;
        ++expected;
    }
    v.head_seq = expected - 1;
    v.head_hash = v.head_seq > 0 ? prev : QString();
    QSqlQuery a = run(db, "SELECT last_seq, last_hash FROM audit_anchor WHERE id = 1");
    if (a.next()) {
        const qint64 anchored = a.value(0).toLongLong();
        const QString anchored_hash = a.value(1).toString();
        if (anchored > v.head_seq)
            return v.broken_at(
                v.head_seq + 1,
                anchored == v.head_seq + 1
                    ? QStringLiteral("entry %1, the last one recorded, is missing "
                                     "(deleted from the end)")
                          .arg(anchored)
                    : QStringLiteral("entries %1 to %2 are missing (deleted from the "
                                     "end; the last one recorded is %2)")
                          .arg(v.head_seq + 1)
                          .arg(anchored));
        if (anchored < v.head_seq)
            return v.broken_at(anchored + 1,
                               QStringLiteral("entry %1 comes after the last entry recorded (%2): "
                                              "added behind the program's back")
                                   .arg(anchored + 1)
                                   .arg(anchored));
        if (anchored_hash != v.head_hash)
            return v.broken_at(v.head_seq,
                               QStringLiteral("entry %1's hash %2 is not the recorded last hash %3")
                                   .arg(v.head_seq)
                                   .arg(short_hash(v.head_hash), short_hash(anchored_hash)));
    } else if (v.head_seq > 0) {
        return v.broken_at(
            1, QStringLiteral("the record of the last entry (audit_anchor) is missing"));
    }
    return v;
}

namespace {

QString value_words(const QJsonValue& v) {
    if (v.isNull() || v.isUndefined())
        return QStringLiteral("(none)");
    if (v.isString())
        return QStringLiteral("\"%1\"").arg(v.toString().left(120));
    if (v.isBool())
        return v.toBool() ? QStringLiteral("yes") : QStringLiteral("no");
    if (v.isDouble())
        return QString::number(v.toDouble(), 'g', 12);
    const QByteArray text = v.isObject()
                                ? QJsonDocument(v.toObject()).toJson(QJsonDocument::Compact)
                                : QJsonDocument(v.toArray()).toJson(QJsonDocument::Compact);
    return QString::fromUtf8(text).left(120);
}

} // namespace

QString audit_words(const AuditEntry& e) {
    static const QHash<QString, QString> verbs = {
        {"create", "created"},
        {"edit", "edited"},
        {"amend", "amended"},
        {"print", "printed"},
        {"sign", "signed"},
        {"void-signature", "voided by a later change:"},
        {"add-user", "added"},
        {"lock", "locked"},
        {"unlock", "unlocked"},
        {"password", "set the password of"},
        {"sign-in-failed", "failed to sign in as"},
        {"history-import", "(recorded before accounts) changed"},
        {"add-lot", "put on the shelf"},
        {"open-lot", "recorded the opening of"},
        {"override-expired-lot", "accepted an expired lot for"},
    };
    QString s =
        QStringLiteral("%1 %2 %3 %4")
            .arg(e.login, verbs.value(e.action, e.action), e.record_type, e.record_id.left(64));
    const QJsonObject c = QJsonDocument::fromJson(e.changes.toUtf8()).object();
    QStringList parts;
    for (auto it = c.begin(); it != c.end(); ++it) {
        const QJsonObject on = it.value().toObject();
        parts << QStringLiteral("%1 %2 → %3")
                     .arg(it.key(), value_words(on.value("old")), value_words(on.value("new")));
    }
    if (!parts.isEmpty())
        s += QStringLiteral(": ") + parts.join(QStringLiteral("; "));
    if (!e.reason.isEmpty())
        s += QStringLiteral(" (reason: %1)").arg(e.reason);
    return s;
}

bool has_audit_schema(QSqlDatabase db) {
    return sql::table_exists(db, QStringLiteral("audit_log"));
}

} // namespace phaseplan::storage
