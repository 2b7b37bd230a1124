#include "storage/signatures.h"
#include "storage/versioning.h"

#include "chem/error.h"
#include "chem/guard.h"
#include "storage/accounts.h"
#include "storage/audit_trail.h"
#include "storage/lot_store.h"
#include "storage/sql_util.h"

#include <QCryptographicHash>
#include <QJsonArray>
#include <QJsonDocument>
#include <QSqlQuery>

#include <map>
#include <set>

namespace phaseplan::storage {

using sql::run;

namespace {

std::string quoted(const QString& s) {
    return chem::guard::quote_id(s.toStdString());
}

const char* signature_columns =
    "id, batch_id, login, display_name, meaning, signed_at, revision, content_sha256, audit_seq";

std::vector<Signature> read_signatures(QSqlDatabase db, const QString& batch_id,
                                       const QString& current_hash) {
    QSqlQuery q = run(db,
                      QStringLiteral("SELECT %1 FROM signatures WHERE batch_id = ? ORDER BY id")
                          .arg(QLatin1String(signature_columns)),
                      {batch_id});
    std::vector<Signature> out;
    while (q.next()) {
        Signature s;
        s.id = q.value(0).toLongLong();
        s.batch_id = q.value(1).toString();
        s.login = q.value(2).toString();
        s.display_name = q.value(3).toString();
        s.meaning = q.value(4).toString();
        s.signed_at = q.value(5).toString();
        s.revision = q.value(6).toInt();
        s.content_sha256 = q.value(7).toString();
        s.audit_seq = q.value(8).toLongLong();
        s.holds = s.content_sha256 == current_hash;
        out.push_back(std::move(s));
    }
    return out;
}

/// Did `login` prepare the batch: created it (the trail's "create" entry) or signed it as
/// prepared (holding or void)?
bool prepared_by(QSqlDatabase db, const QString& batch_id, const QString& login) {
    QSqlQuery q = run(db,
                      "SELECT count(*) FROM audit_log WHERE record_type = 'batch' AND record_id = ?"
                      " AND action = 'create' AND login = ?",
                      {batch_id, login});
    if (q.next() && q.value(0).toLongLong() > 0)
        return true;
    QSqlQuery s = run(db,
                      "SELECT count(*) FROM signatures WHERE batch_id = ? AND login = ?"
                      " AND meaning = 'prepared'",
                      {batch_id, login});
    return s.next() && s.value(0).toLongLong() > 0;
}

} // namespace

QString batch_content_sha256(const BatchRecord& batch) {
    const QJsonObject content{{"batch", batch.to_input()}, {"revision", batch.revision}};
    return QString::fromLatin1(
        QCryptographicHash::hash(QJsonDocument(content).toJson(QJsonDocument::Compact),
                                 QCryptographicHash::Sha256)
            .toHex());
}

std::vector<Signature> holding_signatures(QSqlDatabase db, const BatchRecord& batch) {
    if (!has_audit_schema(db))
        return {};
    std::vector<Signature> all = read_signatures(db, batch.id, batch_content_sha256(batch));
    std::vector<Signature> out;
    for (Signature& s : all)
        if (s.holds)
            out.push_back(std::move(s));
    return out;
}

SignatureStore::SignatureStore(QSqlDatabase db) : db_(db) {}

Signature SignatureStore::sign(const QString& batch_id, const QString& login_in,
                               const QString& password, const QString& meaning,
                               qint64 expected_version) {
    const QString login = login_in.trimmed();
    if (meaning != QLatin1String("prepared") && meaning != QLatin1String("reviewed") &&
        meaning != QLatin1String("approved"))
        throw chem::Error("meaning", quoted(meaning) + " is not prepared, reviewed or approved");
    // Both components, every time (21 CFR 11.200(a)(1)); a failure is counted and committed.
    AccountStore accounts(db_);
    const Account who = accounts.authenticate(login, password);
    return sign_as(batch_id, who, meaning, expected_version);
}

Signature SignatureStore::sign_as(const QString& batch_id, const Account& who,
                                  const QString& meaning, qint64 expected_version) {
    const QString login = who.login;
    sql::WriteTransaction tx(db_);
    BatchStore batches(db_);
    const std::optional<BatchRecord> batch = batches.load(batch_id);
    if (!batch)
        throw chem::Error("batch.id", "no batch " + quoted(batch_id));
    if (expected_version > 0 && batch->version > 0 && batch->version != expected_version)
        throw conflict_error(db_, "Batch " + batch_id,
                             {batch->version, batch->changed_by, batch->changed_at});
    const bool allowed = (meaning == QLatin1String("prepared") && who.role == Role::preparer) ||
                         (meaning == QLatin1String("reviewed") &&
                          (who.role == Role::reviewer || who.role == Role::approver)) ||
                         (meaning == QLatin1String("approved") && who.role == Role::approver);
    if (!allowed)
        throw chem::Error("login", quoted(login) + " is a " + role_name(who.role).toStdString() +
                                       " and cannot sign as " + meaning.toStdString());
    const QString content = batch_content_sha256(*batch);
    const std::vector<Signature> current = read_signatures(db_, batch_id, content);
    auto holding = [&](const char* m) {
        for (const Signature& s : current)
            if (s.holds && s.meaning == QLatin1String(m))
                return true;
        return false;
    };
    if (meaning != QLatin1String("prepared") && prepared_by(db_, batch_id, login))
        throw chem::Error("login", quoted(login) + " prepared batch " + quoted(batch_id) +
                                       " and cannot sign it as " + meaning.toStdString() +
                                       ": a second person checks it");
    if (meaning == QLatin1String("reviewed") && !holding("prepared"))
        throw chem::Error("meaning", "batch " + quoted(batch_id) +
                                         " has no signature as prepared on its current content: "
                                         "the preparer signs first");
    if (meaning == QLatin1String("approved") && !holding("reviewed"))
        throw chem::Error("meaning", "batch " + quoted(batch_id) +
                                         " has no signature as reviewed on its current content");
    for (const Signature& s : current)
        if (s.holds && s.meaning == meaning && s.login == login)
            throw chem::Error("meaning", quoted(login) + " already signed batch " +
                                             quoted(batch_id) + " as " + meaning.toStdString());

    Signature s;
    QSqlQuery next = run(db_, "SELECT coalesce(max(id), 0) + 1 FROM signatures");
    s.id = next.next() ? next.value(0).toLongLong() : 1;
    s.batch_id = batch_id;
    s.login = login;
    s.display_name = who.display_name;
    s.meaning = meaning;
    s.signed_at = clock_ ? clock_() : sql::utc_now(db_);
    s.revision = batch->revision;
    s.content_sha256 = content;
    s.holds = true;
    QJsonObject changes = audit_change("meaning", QJsonValue::Null, meaning);
    changes.insert("content_sha256", QJsonObject{{"old", QJsonValue::Null}, {"new", content}});
    changes.insert("revision", QJsonObject{{"old", QJsonValue::Null}, {"new", batch->revision}});
    changes.insert("signature", QJsonObject{{"old", QJsonValue::Null}, {"new", s.id}});
    const AuditEntry e =
        append_audit(db_, s.signed_at, login, "sign", "batch", batch_id, {}, changes);
    s.audit_seq = e.seq;
    run(db_,
        "INSERT INTO signatures (id, batch_id, login, display_name, meaning, signed_at, revision,"
        " content_sha256, audit_seq) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)",
        {s.id, s.batch_id, s.login, s.display_name, s.meaning, s.signed_at, s.revision,
         s.content_sha256, s.audit_seq});
    tx.commit();
    return s;
}

std::vector<Signature> SignatureStore::list(const QString& batch_id) const {
    const std::optional<BatchRecord> batch = BatchStore(db_).load(batch_id);
    if (!batch)
        throw chem::Error("batch.id", "no batch " + quoted(batch_id));
    return read_signatures(db_, batch_id, batch_content_sha256(*batch));
}

QString SignatureStore::manifestation(const Signature& s) {
    QString meaning = s.meaning;
    if (!meaning.isEmpty())
        meaning[0] = meaning[0].toUpper();
    QString when = s.signed_at;
    when.replace(QLatin1Char('T'), QLatin1Char(' '));
    if (when.endsWith(QLatin1Char('Z')))
        when = when.left(when.size() - 1).section(QLatin1Char('.'), 0, 0) + QStringLiteral(" UTC");
    QString out = QStringLiteral("%1 by %2 (%3) %4").arg(meaning, s.display_name, s.login, when);
    if (!s.holds)
        out += QStringLiteral(" — void: the batch changed after signing (revision %1)")
                   .arg(s.revision);
    return out;
}

AuditVerification verify_records(QSqlDatabase db) {
    AuditVerification v;
    // Signatures against their "sign" entries.
    std::map<qint64, AuditEntry> sign_entries;
    std::map<QString, std::map<QString, QJsonValue>> replayed;
    std::map<QString, qint64> last_seq;
    for (const AuditEntry& e : audit_entries(db, {QStringLiteral("batch"), {}})) {
        ++v.entries;
        last_seq[e.record_id] = e.seq;
        const QJsonObject c = QJsonDocument::fromJson(e.changes.toUtf8()).object();
        if (e.action == QLatin1String("sign")) {
            sign_entries[e.seq] = e;
        } else if (e.action == QLatin1String("create") || e.action == QLatin1String("edit") ||
                   e.action == QLatin1String("amend")) {
            if (e.action == QLatin1String("create"))
                replayed[e.record_id].clear();
            else if (!replayed.count(e.record_id))
                return v.broken_at(e.seq, QStringLiteral("entry %1 changes batch \"%2\" before any "
                                                         "entry creates it")
                                              .arg(e.seq)
                                              .arg(e.record_id.left(64)));
            auto& fields = replayed[e.record_id];
            for (auto it = c.begin(); it != c.end(); ++it) {
                const QJsonValue nv = it.value().toObject().value(QLatin1String("new"));
                if (nv.isNull() || nv.isUndefined())
                    fields.erase(it.key());
                else
                    fields[it.key()] = nv;
            }
        }
    }
    QSqlQuery q = sql::run(
        db, QStringLiteral("SELECT %1 FROM signatures ORDER BY id").arg(signature_columns));
    std::set<qint64> seen;
    while (q.next()) {
        const qint64 id = q.value(0).toLongLong();
        const QString batch = q.value(1).toString(), login = q.value(2).toString(),
                      meaning = q.value(4).toString(), at = q.value(5).toString(),
                      content = q.value(7).toString();
        const int revision = q.value(6).toInt();
        const qint64 seq = q.value(8).toLongLong();
        auto it = sign_entries.find(seq);
        if (it == sign_entries.end())
            return v.broken_at(seq, QStringLiteral("signature %1 on batch \"%2\" names entry %3, "
                                                   "which records no signature")
                                        .arg(id)
                                        .arg(batch.left(64))
                                        .arg(seq));
        const AuditEntry& e = it->second;
        const QJsonObject c = QJsonDocument::fromJson(e.changes.toUtf8()).object();
        auto nv = [&c](const char* k) {
            return c.value(QLatin1String(k)).toObject().value(QLatin1String("new"));
        };
        QStringList differs;
        if (e.record_id != batch)
            differs << QStringLiteral("batch");
        if (e.login != login)
            differs << QStringLiteral("login");
        if (e.logged_at != at)
            differs << QStringLiteral("time");
        if (nv("meaning").toString() != meaning)
            differs << QStringLiteral("meaning");
        if (nv("revision").toInt() != revision)
            differs << QStringLiteral("revision");
        if (nv("content_sha256").toString() != content)
            differs << QStringLiteral("content hash");
        if (nv("signature").toInteger() != id)
            differs << QStringLiteral("number");
        if (!differs.isEmpty())
            return v.broken_at(seq,
                               QStringLiteral("signature %1 on batch \"%2\" differs from entry %3 "
                                              "that recorded it: %4")
                                   .arg(id)
                                   .arg(batch.left(64))
                                   .arg(seq)
                                   .arg(differs.join(QStringLiteral(", "))));
        seen.insert(seq);
    }
    for (const auto& [seq, e] : sign_entries)
        if (!seen.count(seq))
            return v.broken_at(seq,
                               QStringLiteral("entry %1 records a signature on batch \"%2\" that "
                                              "is missing from the signatures")
                                   .arg(seq)
                                   .arg(e.record_id.left(64)));
    // Batches against their replayed trail.
    BatchStore batches(db);
    QSqlQuery ids = sql::run(db, "SELECT id FROM batches ORDER BY id");
    while (ids.next()) {
        const QString id = ids.value(0).toString();
        const std::optional<BatchRecord> b = batches.load(id);
        if (!replayed.count(id))
            return v.broken_at(
                last_seq.count(id) ? last_seq[id] : v.entries + 1,
                QStringLiteral("batch \"%1\" has no entry that creates it").arg(id.left(64)));
        const auto now = batch_fields(*b);
        const auto& trail = replayed[id];
        QStringList differs;
        for (const auto& [k, value] : now) {
            auto t = trail.find(k);
            if (t == trail.end() || t->second != value)
                differs << k;
        }
        for (const auto& [k, value] : trail)
            if (!now.count(k))
                differs << k;
        if (!differs.isEmpty())
            return v.broken_at(
                last_seq[id],
                QStringLiteral("batch \"%1\" differs from its trail (last entry %2) in "
                               "%3")
                    .arg(id.left(64))
                    .arg(last_seq[id])
                    .arg(differs.join(QStringLiteral(", ")).left(300)));
    }
    // The lot shelf against its entries.
    const AuditVerification lots = verify_lots(db);
    if (!lots.intact)
        return lots;
    return v;
}

AuditVerification verify_all(QSqlDatabase db) {
    const AuditVerification chain = verify_audit(db);
    if (!chain.intact)
        return chain;
    AuditVerification records = verify_records(db);
    if (!records.intact) {
        records.entries = chain.entries;
        return records;
    }
    return chain;
}

} // namespace phaseplan::storage
