#pragma once
// The two back ends of the lab's database and the few places where their SQL differs. Every
// schema step is written once, in SQLite's words, with these pieces filled in per back end:
//
//   - column types written as tokens in the DDL (render_ddl): {real} (REAL / DOUBLE PRECISION),
//     {blob} (BLOB / BYTEA), {rowid_pk} (INTEGER PRIMARY KEY / an identity column),
//     {autoinc_pk} (INTEGER PRIMARY KEY AUTOINCREMENT / an identity column);
//   - json_valid(text) in CHECKs: SQLite's JSON1 function; on PostgreSQL a plpgsql function of
//     the same name (json_function_statements), created by step 1;
//   - triggers that refuse a change (guard_statements): SQLite's CREATE TRIGGER … RAISE(ABORT);
//     on PostgreSQL a plpgsql function raising an exception and a row trigger calling it (plus a
//     statement trigger refusing TRUNCATE on tables that refuse DELETE). Conditions are written
//     with SQLite's null-safe `IS NOT`, read as `IS DISTINCT FROM` on PostgreSQL;
//   - the schema version: PRAGMA user_version / application_id on SQLite; the one-row table
//     phaseplan_schema on PostgreSQL;
//   - a write transaction: BEGIN IMMEDIATE on SQLite; BEGIN and a transaction-scoped advisory
//     lock on PostgreSQL, so writers queue one after the other on both;
//   - the clock: the program's on SQLite, the server's (now(), in UTC) on PostgreSQL.
// Upserts are written as INSERT … ON CONFLICT (key) DO UPDATE SET … = excluded.…, which both
// accept.
#include "chem/error.h"

#include <QSqlDatabase>
#include <QSqlError>
#include <QString>
#include <QStringList>

namespace phaseplan::storage::sql {

enum class Dialect { sqlite, postgresql };

/// From the connection's driver (QSQLITE or QPSQL).
Dialect dialect_of(const QSqlDatabase& db);

/// The DDL with its type tokens replaced for `d` (see the header comment).
QString render_ddl(Dialect d, const QString& ddl);

/// PostgreSQL only (empty for SQLite): json_valid(text), true when the text parses as JSON.
QStringList json_function_statements(Dialect d);

/// A trigger that refuses a change: `event` is "UPDATE" or "DELETE"; `when` (optional) limits it
/// to the rows where the condition holds (it may refer to NEW, OLD and other tables).
struct Guard {
    QString name;
    QString table;
    QString event;
    QString when;
    QString message;
};
QStringList guard_statements(Dialect d, const Guard& g);
/// Removes a guard (to re-create it with another condition in a later step).
QStringList drop_guard_statements(Dialect d, const QString& name, const QString& table);

/// True when the table exists (sqlite_master / information_schema).
bool table_exists(const QSqlDatabase& db, const QString& table);
/// True when the table has the column.
bool column_exists(const QSqlDatabase& db, const QString& table, const QString& column);

/// The schema version recorded in the database (0 for an empty one).
int schema_version(const QSqlDatabase& db);
/// Records the version (inside the migrating transaction).
void set_schema_version(const QSqlDatabase& db, int version);
/// The application id recorded (SQLite: PRAGMA application_id; PostgreSQL: phaseplan_schema);
/// -1 when none.
qint64 application_id(const QSqlDatabase& db);
void set_application_id(const QSqlDatabase& db, qint64 id);

/// Now, UTC, ISO 8601 with milliseconds and "Z": the program's clock on SQLite, the server's
/// clock on PostgreSQL (so that every bench records the same time base).
QString utc_now(const QSqlDatabase& db);

/// The statements that open the outermost write transaction.
QStringList begin_write(Dialect d);

/// Nesting depth of write transactions on this connection (shared by every handle to it).
int transaction_depth(const QSqlDatabase& db);
void set_transaction_depth(const QSqlDatabase& db, int depth);

// ---- where the lab's database is ----------------------------------------------------------

/// A PostgreSQL location, from a libpq URI: postgresql://user@host:port/dbname, or
/// postgresql://user@/dbname?host=/socket/dir. The password is never part of it: libpq reads it
/// from ~/.pgpass (or the file PGPASSFILE names, or PGPASSWORD).
struct PgLocation {
    QString user;   ///< empty: libpq's default (PGUSER, the login name)
    QString host;   ///< a host name, an address, or a socket folder (starts with '/')
    int port = 0;   ///< 0: 5432
    QString dbname; ///< required
    QString sslmode;
    int connect_timeout_s = 5; ///< seconds
    /// "HOST" or "HOST:PORT" or "the local socket in DIR", as the messages say it.
    QString where() const;
};

/// True when `location` is a PostgreSQL URI (postgresql:// or postgres://).
bool is_postgresql_uri(const QString& location);
/// Parses a PostgreSQL URI. Throws chem::Error naming the part at fault ("database.port", …)
/// and the value, and refuses a password in the URI (input errors; a server that cannot be
/// reached is a Failure, from open_postgresql).
PgLocation parse_postgresql_uri(const QString& uri);

/// A password typed by the user for this run (the app asks when the server refuses the password
/// from ~/.pgpass or PGPASSWORD). Held in this process's memory only, never written anywhere;
/// every later PostgreSQL connection of the process uses it. An empty text forgets it.
void set_typed_password(const QString& password);
bool has_typed_password();

/// Opens a QPSQL connection named `connection_name` to `loc`. Throws chem::Error with one
/// sentence (the server cannot be reached, the database does not exist), never SQL or the
/// driver's own words alone; a refused or missing password is field "database.password", so that
/// the app can ask for it.
QSqlDatabase open_postgresql(const PgLocation& loc, const QString& connection_name, bool read_only);

/// True when a statement failed because the connection to the server is gone (the server
/// restarted or the network dropped), not because of the statement: PostgreSQL only.
bool connection_lost(const QSqlDatabase& db, const QSqlError& e);

/// One sentence for a failed statement, without its SQL: the database's own reason, first line.
QString failure_sentence(const QSqlError& e);

} // namespace phaseplan::storage::sql
