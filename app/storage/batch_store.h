#pragma once
// Batches in the lab's database (SQLite or PostgreSQL, storage/sql_dialect.h): one row per batch
// (the document it was made from, who, when, the actual amounts) and an append-only history of
// every change (who, when, field, old value, new value).
//
// Rules, enforced here and again by triggers in the database so that no other code path can
// break them:
//   - the history is append-only: UPDATE and DELETE on batch_history abort;
//   - every change of a batch's data comes with history rows of the same revision, written in
//     the same transaction; an UPDATE without them aborts;
//   - once a batch has been printed, a change must be an amendment: action "amend" with a reason;
//     edit() refuses (chem::Error), and a plain UPDATE aborts;
//   - batches are never deleted.
// From schema step 10 every create, edit, amend and print is also one entry of the hash-chained
// audit trail (app/storage/audit_trail.h), in the same transaction; an account that is an
// administrator or locked changes nothing (AccountStore::check_may_edit); a batch with a holding
// signature is changed only by amend, which voids those signatures (app/storage/signatures.h).
//
// The tables come from migration step batch_schema_version in app/storage/migrations.cpp
// (batch_schema_statements()); BatchStore::ensure_schema creates them on a bare connection
// (tests, tools). Every write is one transaction (BEGIN IMMEDIATE … COMMIT).
#include "storage/sql_dialect.h"

#include <QDateTime>
#include <QJsonArray>
#include <QJsonObject>
#include <QJsonValue>
#include <QSqlDatabase>
#include <QString>
#include <QStringList>
#include <QVariantList>

#include <functional>
#include <map>
#include <optional>
#include <vector>

namespace phaseplan::storage {

struct LotOverrideGrant; // storage/lot_store.h

/// The SQL that creates the batch tables, indexes and triggers, in order (migration step 4), in
/// the back end's dialect (storage/sql_dialect.h).
QStringList batch_schema_statements(sql::Dialect d = sql::Dialect::sqlite);
/// Step 6: the bench record's columns (measured pH, pH tolerance, pH meter, balance, comment,
/// container, deviation note/by/at) and the change trigger re-created to watch them too.
QStringList batch_schema_bench_statements(sql::Dialect d = sql::Dialect::sqlite);

/// Step 7: the pH meter's capture record (measured_ph_capture, JSON) and the change trigger
/// re-created to watch it. A captured amount keeps its record inside `actual` ("capture").
QStringList batch_schema_capture_statements(sql::Dialect d = sql::Dialect::sqlite);

/// One batch as stored. The batch fields are those of the "batch" object of the CLI contract.
struct BatchRecord {
    QString id;
    QString document_kind = "recipe"; ///< "recipe", "line" or "sequence"
    QJsonObject document;             ///< the contract document it was made from, without "batch"
    QString prepared_by;
    QString prepared_at; ///< ISO 8601 local, "" = not yet
    QString expires_at;  ///< ISO 8601 local, "" = from the shelf life
    QString checked_by;
    double tolerance_percent = 2;
    /// [{"reagent", "mass_g" | "volume_ml", "lot", "capture"}]; "capture" only for a value taken
    /// from a balance: {"device_id", "device_kind", "device_name", "raw", "received_at" (UTC ISO),
    /// "stable", "accepted_unstable", "calibration_due", "calibration_caution"}, the first three
    /// required. Absent = typed.
    QJsonArray actual;
    std::optional<double> measured_ph; ///< the meter's reading; absent = not measured
    QJsonObject ph_capture;     ///< the same record for a pH taken from the meter; {} = typed
    double ph_tolerance = 0.05; ///< ± pH units allowed around the target
    QString ph_meter_id;
    QString balance_id;
    QString comment;
    std::optional<double> container_ml; ///< the largest volume the vessel holds, mL
    QString deviation_note;             ///< why an out-of-tolerance batch is still used, "" = none
    QString deviation_by;               ///< who recorded the note
    QString deviation_at;               ///< when, ISO 8601 local
    int revision = 1;                   ///< +1 on every recorded change
    int printed_count = 0;
    QString first_printed_at; ///< UTC, "" when never printed
    QString created_at;       ///< UTC
    QString updated_at;       ///< UTC
    /// The row's version when loaded (app/storage/versioning.h): +1 on every edit, amendment and
    /// print. edit() and amend() write only when the stored version still equals this one.
    qint64 version = 0;
    QString changed_by; ///< login or name of the last write
    QString changed_at; ///< UTC ISO 8601 of the last write

    bool printed() const { return printed_count > 0; }
    /// The document with its "batch" object: the input of `phaseplan-cli sheet` / `labels`.
    QJsonObject to_input() const;
    /// Splits a `sheet`/`labels` input into the document and the batch. Throws chem::Error
    /// naming the field ("batch", "batch.id", "batch.actual[0].mass_g") for a malformed batch.
    static BatchRecord from_input(const QJsonObject& input);
};

/// The batch field by field, as the history and the audit trail record it: "prepared_by",
/// "actual[<reagent>].mass_g", "measured_ph", …; unset fields are absent.
std::map<QString, QJsonValue> batch_fields(const BatchRecord& b);

struct HistoryEntry {
    qint64 seq = 0; ///< order of writing
    QString batch_id;
    int revision = 0; ///< the batch's revision after the change (print: the one printed)
    QString at;       ///< UTC ISO 8601
    QString who;
    QString action; ///< "create", "edit", "amend", "print"
    QString
        field; ///< "prepared_by", "actual[phosphoric-acid].volume_ml", "document", "measured_ph", …
    QJsonValue old_value; ///< null when the field was unset
    QJsonValue new_value;
    QString reason; ///< amendments: why
};

class BatchStore {
  public:
    /// Uses an open connection whose schema has the batch tables (see ensure_schema).
    explicit BatchStore(QSqlDatabase db);

    /// Creates the batch tables if they are absent (for a connection that did not go through the
    /// app's migrations). Throws Failure on SQL failure.
    static void ensure_schema(QSqlDatabase db);

    /// Stores a new batch, with one "create" history row per field set. Throws chem::Error:
    /// "batch.id" when the id is taken, "who" when empty, batch fields as from_input.
    void create(const BatchRecord& batch, const QString& who);

    /// A fresh id for a batch prepared on `date`: "<prefix>-YYYYMMDD-NNN", NNN one above the
    /// highest taken for that prefix and day (001 for the first).
    QString propose_id(const QString& prefix, const QDate& date) const;

    /// "Save as a copy" after a conflict: `mine` (the edits refused) becomes a new batch with a
    /// fresh id (propose_id(prefix, day)), its comment starting "Copy of <old id>", created by
    /// `who`. The batch it came from is left as the other bench saved it. Returns the new id.
    QString create_copy(const BatchRecord& mine, const QString& who, const QString& prefix,
                        const QDate& day);

    std::optional<BatchRecord> load(const QString& id) const;
    /// Ids, newest first.
    QStringList list() const;

    /// Changes a batch that has not been printed: every changed field is recorded. `next.version`
    /// is the version the batch was loaded at: when the stored one differs (someone changed it
    /// since), throws ConflictError naming who and when, and writes nothing. Returns false
    /// when nothing changed. Throws chem::Error("batch", …) when the batch was printed (use
    /// amend), chem::Error("batch.id", …) for an unknown id.
    bool edit(const QString& id, const BatchRecord& next, const QString& who);

    /// Changes a batch after printing (or before): recorded as action "amend" with the reason.
    /// Throws chem::Error("reason", …) for an empty reason.
    bool amend(const QString& id, const BatchRecord& next, const QString& who,
               const QString& reason);

    /// Who overrides an expired lot, and why (BatchStore::override_expired_lot).
    struct LotOverrideRequest {
        QString reagent;  ///< the amount's reagent id
        QString lot;      ///< the expired lot
        QString login;    ///< an approver
        QString password; ///< the approver's password, asked again
        QString reason;
    };
    /// Stores `next`, whose amount of request.reagent uses the expired lot request.lot, with an
    /// approver's override: the login and password are checked again (a wrong password counts
    /// towards the lock), the account must be an approver, and the override (who, name, when,
    /// why) is kept with the amount ("lot_override") and written to the audit trail as
    /// "override-expired-lot" under the approver's login, before the change itself under `who`.
    /// A printed or signed batch is amended, with the override as the reason. Throws
    /// chem::Error: "lot_override.reason" (empty), "login"/"password" (authentication, not an
    /// approver), "lot_override" (nothing to override), and as edit/amend.
    bool override_expired_lot(const QString& id, const BatchRecord& next, const QString& who,
                              const LotOverrideRequest& request);

    /// Records that the batch was printed (what: "sheet a4", "labels label62", …). With
    /// `expected_version` > 0 (the version the printed content was loaded at), throws
    /// ConflictError when the stored batch changed since.
    void mark_printed(const QString& id, const QString& who, const QString& what,
                      qint64 expected_version = 0);

    /// Oldest first.
    std::vector<HistoryEntry> history(const QString& id) const;

    /// Test seam: the clock used for created_at / updated_at / history times (UTC).
    void set_clock(std::function<QDateTime()> clock) { clock_ = std::move(clock); }

  private:
    bool change(const QString& id, const BatchRecord& next, const QString& who,
                const QString& action, const QString& reason,
                const LotOverrideGrant* grant = nullptr);
    QString now() const;
    bool versioned() const;

    QSqlDatabase db_;
    mutable std::optional<bool> versioned_;
    std::function<QDateTime()> clock_;
};

} // namespace phaseplan::storage
