#pragma once
// The lab's audit trail: one append-only table, audit_log, into which every change of a record
// (batches, their signatures, the user accounts) is written, each entry chained to the one before
// it by a SHA-256 hash, so that a changed, deleted, inserted or reordered entry is found by
// verify() (21 CFR 11.10(e): secure, computer-generated, time-stamped audit trails that do not
// obscure what was recorded before; EU GMP Annex 11 §9).
//
// Canonical serialisation of entry n (version 1), hashed with SHA-256 (QCryptographicHash):
//
//   "phaseplan-audit-v1\n" followed by, for each field in this order,
//   <length of its UTF-8 bytes in decimal> ":" <the bytes> "\n"
//   fields: seq (decimal), logged_at, login, action, record_type, record_id, reason, changes,
//           prev_hash
//
//   hash(n) = lowercase hex of SHA-256(canonical(n)); prev_hash(n) = hash(n - 1), and 64 zeros
//   for n = 1. `changes` is hashed as the exact text stored (compact JSON written once, never
//   re-formatted), so verification does not depend on how a JSON library prints numbers.
//
// The length prefixes make the serialisation unambiguous (no field can end early or run into the
// next). Entries are numbered 1, 2, 3, … without gaps; the number and hash of the last entry are
// also kept in audit_anchor, so that removing entries from the end is found too.
//
// What the chain proves: that nobody changed the table without recomputing every hash after the
// change and the anchor. It is tamper-evident, not tamper-proof: someone with write access to the
// file and this description can rewrite the tail consistently. Keep the head (seq and hash, which
// `phaseplan-cli audit export` prints) outside the file, with the printed record, to close that.
//
// The SQL is portable (TEXT, BIGINT, INTEGER, CHECK, PRIMARY KEY, REFERENCES): the same tables
// serve a second back end. The triggers that refuse UPDATE and DELETE are written per dialect
// (audit_guard_statements(), storage/sql_dialect.h).
#include "storage/sql_dialect.h"

#include <QJsonObject>
#include <QJsonValue>
#include <QSqlDatabase>
#include <QString>
#include <QStringList>

#include <optional>
#include <vector>

namespace phaseplan::storage {

/// Schema step 10: users, audit_log, audit_anchor and signatures (portable SQL).
QStringList audit_schema_statements();
/// Schema step 10, in the back end's dialect: triggers that refuse UPDATE and DELETE on audit_log
/// and signatures, DELETE on users and audit_anchor, and an anchor that moves other than by one.
QStringList audit_guard_statements(sql::Dialect d);

/// The hash before the first entry: 64 zeros.
QString audit_genesis_hash();

struct AuditEntry {
    qint64 seq = 0;      ///< 1, 2, 3, … in order of writing
    QString logged_at;   ///< UTC, ISO 8601 with milliseconds and "Z"
    QString login;       ///< who: an account's login (or, for batches made before accounts, the
                         ///< name that was typed)
    QString action;      ///< "create", "edit", "amend", "print", "sign", "void-signature",
                         ///< "add-user", "lock", "unlock", "password", "sign-in-failed", …
    QString record_type; ///< "batch", "signature", "user"
    QString record_id;
    QString reason;    ///< why (required for an amendment)
    QString changes;   ///< compact JSON {"field": {"old": …, "new": …}, …}, as stored
    QString prev_hash; ///< hex SHA-256 of the entry before
    QString hash;      ///< hex SHA-256 of canonical_audit_bytes(this)
};

/// The bytes that are hashed (see the header comment).
QByteArray canonical_audit_bytes(const AuditEntry& e);
/// Lowercase hex SHA-256 of canonical_audit_bytes(e).
QString audit_hash(const AuditEntry& e);

/// {"field": {"old": old, "new": new}} for one field, to build `changes`.
QJsonObject audit_change(const QString& field, const QJsonValue& old_value,
                         const QJsonValue& new_value);

/// Appends one entry: numbers it, chains it and moves the anchor. Must run inside the caller's
/// write transaction (the number is read under its lock). `logged_at` empty means now (UTC).
/// Returns the entry as stored. Throws Failure on SQL failure.
AuditEntry append_audit(QSqlDatabase db, const QString& logged_at, const QString& login,
                        const QString& action, const QString& record_type, const QString& record_id,
                        const QString& reason, const QJsonObject& changes);

/// What to read back: everything, or one record.
struct AuditFilter {
    QString record_type; ///< "" = all
    QString record_id;   ///< "" = all
};
/// The entries in order of seq.
std::vector<AuditEntry> audit_entries(QSqlDatabase db, const AuditFilter& filter = {});

/// The result of walking the chain.
struct AuditVerification {
    bool intact = true;
    qint64 entries = 0;       ///< rows read
    qint64 first_bad_seq = 0; ///< 0 when intact
    QString problem;          ///< one sentence: what differs at first_bad_seq
    qint64 head_seq = 0;      ///< the last entry read
    QString head_hash;

    /// Marks the chain broken at `seq` for `why`; returns the result to hand back.
    AuditVerification broken_at(qint64 seq, const QString& why) {
        intact = false;
        first_bad_seq = seq;
        problem = why;
        return *this;
    }
};
/// Walks audit_log in order of seq and checks, for every entry: its number follows the one
/// before (a gap is a deletion), its prev_hash is the hash before, its stored hash is the hash
/// of its fields; and at the end that the last entry is the one the anchor records. Stops at the
/// first problem. Read-only.
AuditVerification verify_audit(QSqlDatabase db);

/// The entry in people's words: "demo-prep amended batch HR-…: lot PA-1 → PA-2 (reason: …)".
QString audit_words(const AuditEntry& e);

/// True when the connection's file has the audit tables (schema step 10).
bool has_audit_schema(QSqlDatabase db);

} // namespace phaseplan::storage
