#pragma once
// Two benches, one record: every editable row carries a version, who changed it last and when,
// and the database keeps one change counter that other benches poll.
//
// The rows: saved buffers, lines, methods and sequences (app/storage/database.h) and batches
// (app/storage/batch_store.h), from schema step concurrency_schema_version; the lab's own library
// entries, instruments, columns, reagent lots and accounts, from step row_version_schema_version
// (their stores check through row_stamp / update_checked / delete_checked / refuse_taken below).
// The columns:
//   version     INTEGER, 1 for a new row (and for every row that existed before the step), +1 on
//               every write of the row (save, rename, edit, amendment, print);
//   changed_by  the login (or the name typed, on a database without accounts) of that write;
//   changed_at  its time, UTC ISO 8601 (the server's clock on PostgreSQL).
//
// A save carries the version it was loaded at. Inside the save's write transaction the row is
// written with `UPDATE … SET version = version + 1 … WHERE <key> = ? AND version = ?`; when no row
// is affected, the row changed since it was loaded (or is gone) and the save throws
// ConflictError, which names the other person and the time in words. Nothing is written then.
//
// change_counter: one row (`change_counter.counter`), raised by triggers after every INSERT,
// UPDATE and DELETE on those tables and on signatures. A bench reads it with one cheap SELECT
// (Workspace polls it) and reloads its lists, and any record open without unsaved edits, when it
// moved.
#include "chem/error.h"
#include "storage/sql_dialect.h"

#include <QSqlDatabase>
#include <QString>
#include <QStringList>
#include <QVariantList>

#include <string>

namespace phaseplan::storage {

/// The schema step that adds versions (app/storage/migrations.cpp). Written only here: at a merge
/// with another branch's step, renumber this one constant.
inline constexpr int concurrency_schema_version = 11;

/// The schema step that gives the rest of what people edit the same columns: the lab's own
/// library entries (library_user), instruments (devices), columns (columns), reagent lots
/// (reagent_lots) and accounts (users). Written only here: renumber this one constant at a merge.
inline constexpr int row_version_schema_version = 13;

/// The schema step that remembers names a saved document left (renamed away or removed), so that
/// a document saved again under such a name goes on from the old versions instead of starting at
/// 1 again: a bench still holding an old version of the old record can then never match the new
/// one. Written only here: at a merge with another branch's step, renumber this one constant.
inline constexpr int retired_names_schema_version = 14;

/// The statements of that step, in the back end's dialect: the three columns on each versioned
/// table (existing rows at version 1, changed_at from updated_at, a batch's changed_by from its
/// last history row), the change_counter table and its triggers.
/// `documents` false: only batches and signatures (a bare connection without the saved-document
/// tables, BatchStore::ensure_schema).
QStringList versioning_schema_statements(sql::Dialect d, bool documents = true);

/// Step row_version_schema_version in the back end's dialect: version, changed_by (and
/// changed_at where the table has none) on library_user, devices, columns, reagent_lots and users
/// (existing rows at version 1; changed_at from updated_at; a lot's or an account's changed_by
/// from its last entry in the audit trail), and the change-counter triggers on those tables.
QStringList row_version_schema_statements(sql::Dialect d);

/// The statements of step retired_names_schema_version: the table retired_names, one row per
/// (table, name) a saved document left, with the last version it had under that name, whom and
/// when, and the name it went to (NULL when removed).
QStringList retired_names_schema_statements();

/// True when the connection's schema has the step (batches.version exists).
bool has_versioning(QSqlDatabase db);
/// True when `table` has a version column (its step has run).
bool has_row_version(QSqlDatabase db, const QString& table);

/// Who changed a row last, when, and its version.
struct RowStamp {
    qint64 version = 0; ///< 0: the row does not exist
    QString changed_by; ///< login or name
    QString changed_at; ///< UTC ISO 8601
};

/// A name a saved document left: renamed away (renamed_to set) or removed (renamed_to empty).
struct Retirement {
    qint64 last_version = 0; ///< the highest version the row had under that name
    QString renamed_to;      ///< empty when removed
    QString retired_by;      ///< login or name
    QString retired_at;      ///< UTC ISO 8601
};

/// A save refused because the row changed (or was removed) since it was loaded. field() is
/// "version"; message() is the sentence the user reads.
class ConflictError : public chem::Error {
  public:
    ConflictError(const QString& message, RowStamp theirs, QString person_words, QString time_words,
                  const std::string& field = "version");
    /// The row as it is now in the database (version 0: removed).
    const RowStamp& theirs() const { return theirs_; }
    /// "Mats Lindqvist (demo-review)", or the name as recorded.
    const QString& person() const { return person_; }
    /// "2026-12-02 19:04 UTC".
    const QString& time() const { return time_; }

  private:
    RowStamp theirs_;
    QString person_, time_;
};

/// A login in words: "Display Name (login)" when it is an account, else the text as recorded;
/// "someone" when empty (a row written before versions).
QString person_words(QSqlDatabase db, const QString& login);
/// A UTC ISO 8601 time as "2026-12-02 19:04 UTC"; "an unknown time" when empty or unreadable.
QString utc_time_words(const QString& utc_iso);

/// Builds the error for `record` ("Batch HR-20261202-001", "Buffer \"Phosphate 25 mM\""): the
/// sentence names who changed it and when, and says what to do.
ConflictError conflict_error(QSqlDatabase db, const QString& record, const RowStamp& theirs);
/// The same for a record that is no longer under its name: "Plan \"Tonight\" was renamed to
/// \"Tonight 2\" by Mats Lindqvist (demo-review) at … after you opened it; open \"Tonight 2\", or
/// save yours as a copy" (or "was removed by … at …"). theirs() is version 0.
ConflictError retired_error(QSqlDatabase db, const QString& record, const Retirement& gone);

/// A save under a name that is taken (a Save as, a rename, a new record): field "name", and the
/// sentence names who saved that name and when: "A plan named \"Tonight\" was saved by Rosa
/// Okafor (demo-prep) at 2026-12-02 19:04 UTC; choose another name, or open it". `what` is the
/// kind in words ("plan", "buffer", "line", "method").
/// `field` is the form's field the name is typed in ("id" for an instrument, "lot" for a lot).
ConflictError name_taken_error(QSqlDatabase db, const QString& what, const QString& name,
                               const RowStamp& theirs, const std::string& field = "name");

/// One row of a versioned table: the table, its key columns and their values. Table and column
/// names are the program's own constants, never input; the values are always bound.
struct RowKey {
    QString table;       ///< "devices"
    QStringList columns; ///< {"id"}, {"kind", "id"}
    QVariantList values; ///< in the order of columns
};

/// The version, who and when of the row (version 0 when it does not exist).
RowStamp row_stamp(QSqlDatabase db, const RowKey& key);

/// The checked write, inside the caller's write transaction: `UPDATE <table> SET <assignments>,
/// version = version + 1, changed_by = ?, changed_at = ? WHERE <key> AND version = ?` with
/// `values` bound to the assignments' placeholders. When no row changed, throws
/// conflict_error(record) with the row as it is now; nothing is written then. Returns the version
/// now stored (expected_version + 1).
qint64 update_checked(QSqlDatabase db, const RowKey& key, const QString& assignments,
                      const QVariantList& values, qint64 expected_version, const QString& who,
                      const QString& now, const QString& record);

/// `DELETE FROM <table> WHERE <key> AND version = ?`, inside the caller's write transaction.
/// Throws conflict_error(record) when the row changed since `expected_version` or is gone.
void delete_checked(QSqlDatabase db, const RowKey& key, qint64 expected_version,
                    const QString& record);

/// A new record under a key that is taken: throws name_taken_error(what, name) naming who saved
/// the row there and when. Does nothing when the key is free.
void refuse_taken(QSqlDatabase db, const RowKey& key, const QString& what, const QString& name,
                  const std::string& field = "name");

/// The database's change counter (0 before the step): moves on every write of a versioned row or
/// a signature, on any bench.
qint64 change_counter(QSqlDatabase db);

} // namespace phaseplan::storage
