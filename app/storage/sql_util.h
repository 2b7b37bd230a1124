#pragma once
// Small helpers shared by the stores that work on a bare QSqlDatabase connection (batches,
// accounts, signatures, the audit trail). Internal to app/storage.
#include "storage/sql_dialect.h"

#include <QSqlDatabase>
#include <QSqlQuery>
#include <QString>
#include <QVariantList>

namespace phaseplan::storage::sql {

/// Prepares and runs one statement with positional bindings. A null QString binds as ''.
/// Throws Failure (core/failure.h) with the database's reason (failure_sentence), never the SQL.
QSqlQuery run(QSqlDatabase db, const QString& sql, const QVariantList& bindings = {});

/// A write transaction: BEGIN IMMEDIATE … COMMIT (PostgreSQL: BEGIN and the writers' advisory
/// lock, sql_dialect.h), or, when the connection is already inside a
/// transaction (the demo seeded inside the transaction that creates the file), a SAVEPOINT that
/// is released on commit. Rolled back when commit() did not run (an exception in between).
class WriteTransaction {
  public:
    explicit WriteTransaction(QSqlDatabase db);
    ~WriteTransaction();
    WriteTransaction(const WriteTransaction&) = delete;
    WriteTransaction& operator=(const WriteTransaction&) = delete;
    void commit();

  private:
    QSqlDatabase db_;
    QString savepoint_; ///< empty for the outermost transaction
    bool done_ = false;
};

// utc_now(db), the clock of the back end: storage/sql_dialect.h.

} // namespace phaseplan::storage::sql
