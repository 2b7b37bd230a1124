#pragma once
// The back end a storage test runs on. CTest runs tst_storage, tst_audit, tst_batch,
// tst_batch_bounds, tst_lots, tst_concurrency, tst_row_versions and the GUI tests
// tst_gui_connection and tst_gui_row_versions twice (the list is in tests/CMakeLists.txt): as
// they are (SQLite files in a temporary folder) and as
// <name>_pg with PHASEPLAN_TEST_BACKEND=postgresql, where every database is a fresh one (CREATE
// DATABASE with a name of its own, dropped at the end) on the cluster that PHASEPLAN_TEST_PG_URI
// names (tests/pg_cluster.sh start prints it; PGPASSFILE points at its password file). Without that
// variable the PostgreSQL runs skip, saying why, so nothing passes silently.
#include "chem/error.h"
#include "core/failure.h"
#include "storage/sql_dialect.h"

#include <QAtomicInt>
#include <QCoreApplication>
#include <QDateTime>
#include <QDir>
#include <QSqlDatabase>
#include <QSqlError>
#include <QSqlQuery>
#include <QString>
#include <QStringList>

#include <QTemporaryDir>
#include <QUrl>
#include <QtGlobal>
#include <utility>

namespace phaseplan::testing {

/// True when this run is the PostgreSQL variant.
inline bool on_postgresql() {
    return qgetenv("PHASEPLAN_TEST_BACKEND") == "postgresql";
}

/// Why the PostgreSQL variant cannot run here ("" when it can, or when this is the SQLite run).
inline QString postgresql_missing() {
    if (!on_postgresql())
        return {};
    if (qEnvironmentVariableIsEmpty("PHASEPLAN_TEST_PG_URI"))
        return QStringLiteral("PHASEPLAN_TEST_PG_URI is not set: start a cluster with "
                              "tests/pg_cluster.sh start DIR and export the URI it prints (and "
                              "PGPASSFILE=DIR/pgpass)");
    return {};
}

/// Fresh databases for one test program: files in a temporary folder (SQLite) or new databases
/// on the test cluster (PostgreSQL), dropped when this object goes.
class TestDatabases {
  public:
    TestDatabases() = default;
    TestDatabases(const TestDatabases&) = delete;
    TestDatabases& operator=(const TestDatabases&) = delete;
    ~TestDatabases() {
        if (created_.isEmpty())
            return;
        {
            QSqlDatabase admin = connect_admin();
            for (const QString& name : created_) {
                QSqlQuery q(admin);
                q.exec(QStringLiteral("DROP DATABASE IF EXISTS %1 WITH (FORCE)").arg(name));
            }
            admin.close();
        }
        QSqlDatabase::removeDatabase(admin_name());
    }

    /// Where a new, empty database is: `file_name` in a new folder inside the temporary one, or
    /// the URI of a new PostgreSQL database.
    QString fresh(const QString& file_name = QStringLiteral("lab.sqlite")) {
        static QAtomicInt counter;
        if (!on_postgresql()) { // a folder of its own: the same name twice is two databases
            const QString folder = dir_.filePath(QString::number(counter.fetchAndAddRelaxed(1)));
            QDir().mkpath(folder);
            return folder + QLatin1Char('/') + file_name;
        }
        const QString name = QStringLiteral("tst_%1_%2_%3")
                                 .arg(QCoreApplication::applicationPid())
                                 .arg(QDateTime::currentMSecsSinceEpoch() % 100000000)
                                 .arg(counter.fetchAndAddRelaxed(1));
        {
            QSqlDatabase admin = connect_admin();
            QSqlQuery q(admin);
            if (!q.exec(QStringLiteral("CREATE DATABASE %1").arg(name)))
                qFatal("cannot create the test database %s: %s", qPrintable(name),
                       qPrintable(q.lastError().text()));
        }
        created_ << name;
        QUrl url(QString::fromLocal8Bit(qgetenv("PHASEPLAN_TEST_PG_URI")));
        url.setPath(QLatin1Char('/') + name);
        return url.toString();
    }

    /// A path in the temporary folder (for files that are not databases).
    QString file(const QString& name) const { return dir_.filePath(name); }

  private:
    static QString admin_name() { return QStringLiteral("phaseplan-test-admin"); }
    static QSqlDatabase connect_admin() {
        if (QSqlDatabase::contains(admin_name())) {
            QSqlDatabase db = QSqlDatabase::database(admin_name());
            if (db.isOpen())
                return db;
            QSqlDatabase::removeDatabase(admin_name());
        }
        const storage::sql::PgLocation loc = storage::sql::parse_postgresql_uri(
            QString::fromLocal8Bit(qgetenv("PHASEPLAN_TEST_PG_URI")));
        return storage::sql::open_postgresql(loc, admin_name(), false);
    }

    QTemporaryDir dir_;
    QStringList created_;
};

/// The chem::Error thrown by `f`: {field, message}, or a Failure as {subject, sentence};
/// {"", ""} when it does not throw.
template <class F> std::pair<QString, QString> error_of(F&& f) {
    try {
        f();
    } catch (const chem::Error& e) {
        return {QString::fromStdString(e.field()), QString::fromStdString(e.message())};
    } catch (const phaseplan::Failure& f) {
        return {QString::fromLatin1(f.subject()), QString::fromStdString(f.sentence())};
    }
    return {};
}

} // namespace phaseplan::testing

/// In initTestCase(): skips the whole program, saying why, when its PostgreSQL run has no cluster.
#define PHASEPLAN_REQUIRE_BACKEND()                                                                \
    do {                                                                                           \
        const QString missing_ = phaseplan::testing::postgresql_missing();                         \
        if (!missing_.isEmpty())                                                                   \
            QSKIP(qPrintable(missing_));                                                           \
    } while (false)

/// In a test about SQLite files themselves (WAL, locks, file permissions, kills): skipped on the
/// PostgreSQL run, with the reason.
#define PHASEPLAN_SQLITE_ONLY(why)                                                                 \
    do {                                                                                           \
        if (phaseplan::testing::on_postgresql())                                                   \
            QSKIP("SQLite only: " why);                                                            \
    } while (false)
