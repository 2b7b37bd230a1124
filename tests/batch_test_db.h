#pragma once
// A temporary SQLite file with the batch tables, on its own named connection: for the batch
// store's tests (tst_batch, tst_batch_bounds).
#include "storage/batch_store.h"

#include <QSqlDatabase>
#include <QSqlQuery>
#include <QString>
#include <QTemporaryDir>
#include <QtGlobal>

namespace phaseplan::testing {

struct TempBatchDb {
    QTemporaryDir dir;
    QString name = QStringLiteral("tst_batch_%1").arg(reinterpret_cast<quintptr>(this));
    QSqlDatabase db;
    TempBatchDb() {
        db = QSqlDatabase::addDatabase("QSQLITE", name);
        db.setDatabaseName(dir.filePath("batches.sqlite"));
        if (!db.open())
            qFatal("cannot open the test database");
        phaseplan::storage::BatchStore::ensure_schema(db);
    }
    ~TempBatchDb() {
        db.close();
        db = QSqlDatabase();
        QSqlDatabase::removeDatabase(name);
    }
    TempBatchDb(const TempBatchDb&) = delete;
    TempBatchDb& operator=(const TempBatchDb&) = delete;
    /// What another program could do: drop the guards and write rows directly.
    void exec(const QString& sql) {
        QSqlQuery q(db);
        if (!q.exec(sql))
            qFatal("%s", qPrintable(sql));
    }
};

} // namespace phaseplan::testing
