#include "storage/sql_util.h"

#include "chem/error.h"

#include <QDateTime>
#include <QSqlError>

#include <atomic>

namespace phaseplan::storage::sql {

QSqlQuery run(QSqlDatabase db, const QString& sql, const QVariantList& bindings) {
    QSqlQuery q(db);
    if (!q.prepare(sql))
        throw chem::Error("database", "cannot prepare \"" + sql.left(60).toStdString() +
                                          "\": " + q.lastError().text().toStdString());
    for (int i = 0; i < bindings.size(); ++i) {
        const QVariant& v = bindings[i];
        if (v.typeId() == QMetaType::QString && v.toString().isNull())
            q.bindValue(i, QString(""));
        else
            q.bindValue(i, v);
    }
    if (!q.exec())
        throw chem::Error("database", "\"" + sql.left(60).toStdString() +
                                          "\" failed: " + q.lastError().text().toStdString());
    return q;
}

WriteTransaction::WriteTransaction(QSqlDatabase db) : db_(db) {
    QSqlQuery q(db_);
    if (q.exec(QStringLiteral("BEGIN IMMEDIATE")))
        return;
    // Already inside a transaction: nest with a savepoint (its name unique on the connection).
    static std::atomic<int> counter{0};
    savepoint_ = QStringLiteral("phaseplan_write_%1").arg(++counter);
    run(db_, QStringLiteral("SAVEPOINT ") + savepoint_);
}

WriteTransaction::~WriteTransaction() {
    if (done_)
        return;
    QSqlQuery q(db_);
    if (savepoint_.isEmpty()) {
        q.exec(QStringLiteral("ROLLBACK"));
    } else {
        q.exec(QStringLiteral("ROLLBACK TO ") + savepoint_);
        q.exec(QStringLiteral("RELEASE ") + savepoint_);
    }
}

void WriteTransaction::commit() {
    run(db_,
        savepoint_.isEmpty() ? QStringLiteral("COMMIT") : QStringLiteral("RELEASE ") + savepoint_);
    done_ = true;
}

QString utc_now() {
    return QDateTime::currentDateTimeUtc().toString(Qt::ISODateWithMs);
}

} // namespace phaseplan::storage::sql
