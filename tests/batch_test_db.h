#pragma once
// A temporary database with the batch tables, on its own named connection: for the batch
// store's tests (tst_batch, tst_batch_bounds). A SQLite file, or, on the PostgreSQL run
// (tests/test_backend.h), a fresh database on the test cluster.
#include "storage/batch_store.h"
#include "storage/sql_dialect.h"
#include "test_backend.h"

#include <QSqlDatabase>
#include <QSqlQuery>
#include <QString>
#include <QtGlobal>

namespace phaseplan::testing {

struct TempBatchDb {
    TestDatabases databases; // destroyed after the connection below is closed
    QString name = QStringLiteral("tst_batch_%1").arg(reinterpret_cast<quintptr>(this));
    QSqlDatabase db;
    TempBatchDb() {
        const QString where = databases.fresh(QStringLiteral("batches.sqlite"));
        if (on_postgresql()) {
            db = storage::sql::open_postgresql(storage::sql::parse_postgresql_uri(where), name,
                                               false);
        } else {
            db = QSqlDatabase::addDatabase("QSQLITE", name);
            db.setDatabaseName(where);
            if (!db.open())
                qFatal("cannot open the test database");
        }
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
    /// Removes one guard trigger in this back end's words.
    void drop_trigger(const QString& trigger, const QString& table) {
        for (const QString& s :
             storage::sql::drop_guard_statements(storage::sql::dialect_of(db), trigger, table))
            exec(s);
    }
};

} // namespace phaseplan::testing
