#include "storage/sql_util.h"
#include "core/failure.h"

#include "chem/error.h"
#include "storage/sql_dialect.h"

#include <QDateTime>
#include <QSqlError>

#include <atomic>

namespace phaseplan::storage::sql {

namespace {
/// The failure of a statement: a lost connection is Kind::connection_lost (the app keeps what is
/// on screen and tries again), anything else Kind::database.
[[noreturn]] void fail_statement(const QSqlDatabase& db, const QSqlError& e) {
    if (connection_lost(db, e))
        throw Failure(Failure::Kind::connection_lost,
                      "the connection to the lab database was lost (" +
                          failure_sentence(e).toStdString() + ")");
    throw Failure(Failure::Kind::database, failure_sentence(e).toStdString());
}
} // namespace

QSqlQuery run(QSqlDatabase db, const QString& sql, const QVariantList& bindings) {
    QSqlQuery q(db);
    // PostgreSQL prepares only SELECT, INSERT, UPDATE and DELETE: a statement without values
    // (DDL, BEGIN, SAVEPOINT) runs as it is. Values are always bound, never written into the SQL.
    if (bindings.isEmpty() && dialect_of(db) == Dialect::postgresql) {
        if (!q.exec(sql))
            fail_statement(db, q.lastError());
        return q;
    }
    if (!q.prepare(sql))
        fail_statement(db, q.lastError());
    for (int i = 0; i < bindings.size(); ++i) {
        const QVariant& v = bindings[i];
        if (v.typeId() == QMetaType::QString && v.toString().isNull())
            q.bindValue(i, QString(""));
        else
            q.bindValue(i, v);
    }
    if (!q.exec())
        fail_statement(db, q.lastError());
    return q;
}

WriteTransaction::WriteTransaction(QSqlDatabase db) : db_(db) {
    const int depth = transaction_depth(db_);
    if (depth == 0) {
        if (dialect_of(db_) == Dialect::postgresql) {
            for (const QString& s : begin_write(Dialect::postgresql))
                run(db_, s);
            set_transaction_depth(db_, 1);
            return;
        }
        QSqlQuery q(db_);
        if (q.exec(QStringLiteral("BEGIN IMMEDIATE"))) {
            set_transaction_depth(db_, 1);
            return;
        }
    }
    // Already inside a transaction: nest with a savepoint (its name unique on the connection).
    static std::atomic<int> counter{0};
    savepoint_ = QStringLiteral("phaseplan_write_%1").arg(++counter);
    run(db_, QStringLiteral("SAVEPOINT ") + savepoint_);
    set_transaction_depth(db_, depth + 1);
}

WriteTransaction::~WriteTransaction() {
    if (done_)
        return;
    QSqlQuery q(db_);
    if (savepoint_.isEmpty()) {
        q.exec(QStringLiteral("ROLLBACK"));
    } else {
        q.exec(QStringLiteral("ROLLBACK TO SAVEPOINT ") + savepoint_);
        q.exec(QStringLiteral("RELEASE SAVEPOINT ") + savepoint_);
    }
    set_transaction_depth(db_, std::max(0, transaction_depth(db_) - 1));
}

void WriteTransaction::commit() {
    run(db_, savepoint_.isEmpty() ? QStringLiteral("COMMIT")
                                  : QStringLiteral("RELEASE SAVEPOINT ") + savepoint_);
    done_ = true;
    set_transaction_depth(db_, std::max(0, transaction_depth(db_) - 1));
}

} // namespace phaseplan::storage::sql
