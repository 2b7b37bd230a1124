#include "storage/database.h"
#include "core/failure.h"

#include "storage/sql_dialect.h"

#include <QAtomicInt>
#include <QCryptographicHash>
#include <QDir>
#include <QFileInfo>
#include <QJsonArray>
#include <QJsonDocument>
#include <QSqlError>
#include <QStandardPaths>

#include <QCoreApplication>

#include <algorithm>
#include <cerrno>
#include <cstring>
#include <map>

#include <fcntl.h>
#include <signal.h>
#include <stdio.h>
#include <unistd.h>

namespace phaseplan::storage {

namespace {

const char* table_of(DocumentKind kind) {
    switch (kind) {
    case DocumentKind::buffer:
        return "buffers";
    case DocumentKind::line:
        return "lines";
    case DocumentKind::method:
        return "methods";
    case DocumentKind::sequence:
        return "sequences";
    }
    return "buffers";
}

QDateTime parse_time(const QString& s) {
    QDateTime t = QDateTime::fromString(s, Qt::ISODateWithMs);
    t.setTimeSpec(Qt::UTC);
    return t;
}

QString to_text(const QJsonObject& o) {
    return QString::fromUtf8(QJsonDocument(o).toJson(QJsonDocument::Compact));
}

QJsonObject from_text(const QString& s) {
    return QJsonDocument::fromJson(s.toUtf8()).object();
}

[[noreturn]] void fail(const QString& what) {
    throw Failure(Failure::Kind::database, what.toStdString());
}

QString unique_connection_name() {
    static QAtomicInt counter;
    return QStringLiteral("phaseplan-storage-%1").arg(counter.fetchAndAddRelaxed(1));
}

} // namespace

QString kind_name(DocumentKind kind) {
    switch (kind) {
    case DocumentKind::buffer:
        return QStringLiteral("buffer");
    case DocumentKind::line:
        return QStringLiteral("line");
    case DocumentKind::method:
        return QStringLiteral("method");
    case DocumentKind::sequence:
        return QStringLiteral("sequence");
    }
    return {};
}

std::optional<DocumentKind> kind_from_name(const QString& name) {
    for (DocumentKind k : all_document_kinds)
        if (kind_name(k) == name)
            return k;
    return std::nullopt;
}

QString Database::default_path() {
    QString dir = QStandardPaths::writableLocation(QStandardPaths::AppDataLocation);
    if (dir.isEmpty())
        dir = QDir::homePath() + QStringLiteral("/.phaseplan");
    return dir + QStringLiteral("/phaseplan.sqlite");
}

namespace {

/// The tables every PhasePlan file has had since schema version 1 (files made before the
/// application_id was set are recognised by them).
const char* const marker_tables[] = {"buffers", "lines", "methods", "sequences", "settings"};

QString quoted(const QString& path) {
    return QLatin1Char('"') + path + QLatin1Char('"');
}

/// SQLite's primary result code (the low byte of an extended one).
int primary_code(const QSqlError& e) {
    bool ok = false;
    const int c = e.nativeErrorCode().toInt(&ok);
    return ok ? (c & 0xff) : -1;
}
bool is_busy(const QSqlError& e) { // SQLITE_BUSY, SQLITE_LOCKED
    return primary_code(e) == 5 || primary_code(e) == 6 ||
           e.databaseText().contains(QLatin1String("locked"));
}
bool is_read_only(const QSqlError& e) { // SQLITE_READONLY
    return primary_code(e) == 8 || e.databaseText().contains(QLatin1String("readonly"));
}

QString locked_reason(const QString& path) {
    return quoted(path) +
           QStringLiteral(
               " is locked by another program (another PhasePlan, a backup or a copy tool)"
               " and stayed locked for %1 s: nothing you change is saved. Close the other"
               " program, or ask whoever uses this computer with you, then restart PhasePlan.")
               .arg(busy_timeout_ms / 1000);
}
QString read_only_text(const QString& path) {
    return quoted(path) +
           QStringLiteral(
               " cannot be written (file or folder permissions, or a read-only disk): nothing"
               " you change is saved. Ask whoever manages this computer for write access, or"
               " start PhasePlan with --database on a file you can write.");
}

/// Refuses a file that is not a PhasePlan database, without writing to it.
void check_is_phaseplan_file(const QString& path) {
    QFileInfo fi(path);
    if (!fi.isFile())
        fail(quoted(path) + QStringLiteral(" is not a regular file; give a database file"));
    const QString left =
        QStringLiteral("; PhasePlan left it unchanged. Give another file with --database,"
                       " or move this one away to start a new database.");
    if (fi.size() == 0)
        fail(quoted(path) + QStringLiteral(" is an empty file, not a PhasePlan database") + left);
    QFile f(path);
    if (!f.open(QIODevice::ReadOnly))
        fail(QStringLiteral("cannot read ") + quoted(path) + QStringLiteral(": ") +
             f.errorString());
    const QByteArray head = f.read(16);
    f.close();
    if (head != QByteArray("SQLite format 3\0", 16))
        fail(quoted(path) + QStringLiteral(" is not a PhasePlan database (not an SQLite file)") +
             left);

    const QString name = unique_connection_name();
    QString problem;
    {
        QSqlDatabase probe = QSqlDatabase::addDatabase(QStringLiteral("QSQLITE"), name);
        probe.setConnectOptions(
            QStringLiteral("QSQLITE_OPEN_READONLY;QSQLITE_BUSY_TIMEOUT=%1").arg(busy_timeout_ms));
        probe.setDatabaseName(path);
        if (!probe.open()) {
            problem = QStringLiteral(" cannot be opened: ") + probe.lastError().text();
        } else {
            QSqlQuery q(probe);
            qint64 app_id = -1;
            int version = -1;
            QStringList tables;
            if (q.exec(QStringLiteral("PRAGMA application_id")) && q.next())
                app_id = q.value(0).toLongLong();
            if (q.exec(QStringLiteral("PRAGMA user_version")) && q.next())
                version = q.value(0).toInt();
            if (q.exec(QStringLiteral(
                    "SELECT name FROM sqlite_master WHERE type = 'table' ORDER BY name")))
                while (q.next())
                    tables << q.value(0).toString();
            if (app_id < 0 || version < 0) {
                problem = QStringLiteral(" is not a PhasePlan database (SQLite cannot read it: ") +
                          q.lastError().text() + QStringLiteral(")");
            } else if (app_id != phaseplan_application_id) {
                bool ours = app_id == 0 && version >= 1;
                for (const char* t : marker_tables)
                    ours = ours && tables.contains(QLatin1String(t));
                if (!ours) {
                    QStringList shown = tables.mid(0, 5);
                    if (tables.size() > 5)
                        shown << QStringLiteral("…");
                    problem =
                        QStringLiteral(" is another program's SQLite database, not PhasePlan's"
                                       " (application_id %1, tables: %2)")
                            .arg(QString::number(app_id), tables.isEmpty()
                                                              ? QStringLiteral("none")
                                                              : shown.join(QStringLiteral(", ")));
                }
            }
            probe.close();
        }
    }
    QSqlDatabase::removeDatabase(name);
    if (!problem.isEmpty())
        fail(quoted(path) + problem + left);
}

} // namespace

QString oversize_reason(const QString& text) {
    if (text.size() > max_record_bytes)
        return QStringLiteral(
                   "%1 characters of stored text, above the %2 that PhasePlan reads back")
            .arg(QString::number(text.size()), QString::number(max_record_bytes));
    // Below this length no array or string can pass its limit.
    if (text.size() <= std::min(max_record_text_chars, 2 * max_record_array_items))
        return {};
    const QJsonDocument doc = QJsonDocument::fromJson(text.toUtf8());
    QString reason;
    std::function<void(const QJsonValue&)> walk = [&](const QJsonValue& v) {
        if (!reason.isEmpty())
            return;
        if (v.isString() && v.toString().size() > max_record_text_chars) {
            reason = QStringLiteral("a text of %1 characters (limit %2)")
                         .arg(QString::number(v.toString().size()),
                              QString::number(max_record_text_chars));
        } else if (v.isArray()) {
            const QJsonArray a = v.toArray();
            if (a.size() > max_record_array_items)
                reason =
                    QStringLiteral("a list of %1 entries (limit %2)")
                        .arg(QString::number(a.size()), QString::number(max_record_array_items));
            for (const QJsonValue& e : a)
                walk(e);
        } else if (v.isObject()) {
            const QJsonObject o = v.toObject();
            for (auto it = o.begin(); it != o.end(); ++it) {
                if (it.key().size() > max_record_text_chars)
                    reason = QStringLiteral("a key of %1 characters (limit %2)")
                                 .arg(QString::number(it.key().size()),
                                      QString::number(max_record_text_chars));
                walk(it.value());
            }
        }
    };
    walk(doc.isArray() ? QJsonValue(doc.array()) : QJsonValue(doc.object()));
    return reason;
}

Database::Database(const QString& path, int target_version, Seed seed)
    : path_(path), connection_name_(unique_connection_name()) {
    if (path.isEmpty())
        fail(QStringLiteral("no database file given"));
    if (target_version < 0 || target_version > latest_schema_version())
        target_version = latest_schema_version();
    if (sql::is_postgresql_uri(path)) {
        open_postgresql(target_version, seed);
        return;
    }
    QFileInfo fi(path);
    if (!QDir().mkpath(fi.absolutePath()))
        fail(QStringLiteral("cannot create the folder ") + quoted(fi.absolutePath()));
    if (!fi.exists() && !fi.isSymLink())
        create_new(target_version, seed);
    check_is_phaseplan_file(path_);
    open_connection(path_, false);
    try {
        configure();
        probe_writable();
        if (writable()) {
            migrate(target_version, {});
            set_aside_oversized();
        } else {
            const int version = schema_version();
            const int latest = latest_schema_version();
            if (version > latest)
                fail(quoted(path_) +
                     QStringLiteral(" has schema version %1, newer than this program's %2:"
                                    " use a newer PhasePlan")
                         .arg(QString::number(version), QString::number(latest)));
            if (version < target_version)
                fail(read_only_reason_ +
                     QStringLiteral(" Its layout (schema version %1) also needs an update"
                                    " to version %2, which needs write access.")
                         .arg(QString::number(version), QString::number(target_version)));
        }
    } catch (...) {
        close_connection();
        throw;
    }
}

void Database::open_connection(const QString& file, bool read_only) {
    db_ = QSqlDatabase::addDatabase(QStringLiteral("QSQLITE"), connection_name_);
    if (!db_.isValid())
        fail(QStringLiteral("the Qt SQLite driver (QSQLITE) is not installed"));
    db_.setConnectOptions(
        QStringLiteral("QSQLITE_BUSY_TIMEOUT=%1%2")
            .arg(QString::number(busy_timeout_ms),
                 read_only ? QStringLiteral(";QSQLITE_OPEN_READONLY") : QString()));
    db_.setDatabaseName(file);
    if (!db_.open()) {
        const QString why = db_.lastError().text();
        close_connection();
        fail(QStringLiteral("cannot open ") + quoted(file) + QStringLiteral(": ") + why);
    }
}

void Database::refuse_foreign_postgresql() const {
    const sql::PgLocation loc = sql::parse_postgresql_uri(path_);
    // A database holding other tables and no PhasePlan schema is another program's.
    const qint64 app_id = sql::application_id(db_);
    if (app_id >= 0 && app_id != phaseplan_application_id && app_id != 0)
        fail(QStringLiteral("the database \"%1\" at %2 is another program's (application id "
                            "%3); PhasePlan left it unchanged")
                 .arg(loc.dbname.left(64), loc.where(), QString::number(app_id)));
    if (app_id >= 0)
        return;
    QSqlQuery q = exec(QStringLiteral("SELECT table_name FROM information_schema.tables"
                                      " WHERE table_schema = current_schema()"
                                      " ORDER BY table_name LIMIT 6"));
    QStringList tables;
    while (q.next())
        tables << q.value(0).toString();
    if (!tables.isEmpty())
        fail(QStringLiteral("the database \"%1\" at %2 holds another program's tables "
                            "(%3) and no PhasePlan schema; PhasePlan left it unchanged."
                            " Give an empty database in the address.")
                 .arg(loc.dbname.left(64), loc.where(),
                      tables.mid(0, 5).join(QStringLiteral(", "))));
}

void Database::open_postgresql(int target_version, const Seed& seed) {
    dialect_ = sql::Dialect::postgresql;
    const sql::PgLocation loc = sql::parse_postgresql_uri(path_);
    db_ = sql::open_postgresql(loc, connection_name_, false);
    try {
        QSqlQuery ro = exec(QStringLiteral("SHOW transaction_read_only"));
        if (ro.next() && ro.value(0).toString() == QLatin1String("on"))
            read_only_reason_ =
                QStringLiteral("the lab database at %1 is read-only (a standby server): nothing "
                               "you change is saved. Ask whoever manages the server.")
                    .arg(loc.where());
        if (writable()) {
            // The foreign-database check runs under the writers' lock, inside migrate(): a first
            // run that is creating the schema right now is either done or not started.
            migrate(target_version, seed);
            set_aside_oversized();
        } else {
            refuse_foreign_postgresql();
            if (schema_version() > latest_schema_version())
                fail(QStringLiteral("the lab database at %1 has schema version %2, newer than "
                                    "this program's %3: use a newer PhasePlan")
                         .arg(loc.where(), QString::number(schema_version()),
                              QString::number(latest_schema_version())));
        }
    } catch (...) {
        close_connection();
        throw;
    }
}

void Database::close_connection() {
    if (db_.isValid())
        db_.close();
    db_ = QSqlDatabase();
    QSqlDatabase::removeDatabase(connection_name_);
}

namespace {
/// Removes what a first run killed part-way left next to `path`: "<file>.new-<pid>-<ms>" (and its
/// -wal, -shm and -journal) whose process no longer runs. A file of a live process (another first
/// run, now) is left alone.
void remove_stale_creations(const QString& path) {
    const QFileInfo fi(path);
    const QString prefix = fi.fileName() + QStringLiteral(".new-");
    QDir dir = fi.absoluteDir();
    const QStringList found =
        dir.entryList({prefix + QLatin1Char('*')}, QDir::Files | QDir::Hidden | QDir::System);
    for (const QString& name : found) {
        const QString rest = name.mid(prefix.size());
        const QStringList parts = rest.split(QLatin1Char('-'));
        bool ok = false;
        const qint64 pid = parts.value(0).toLongLong(&ok);
        if (!ok || pid <= 0 || parts.size() < 2)
            continue;
        if (::kill(static_cast<pid_t>(pid), 0) == 0 || errno != ESRCH)
            continue; // still running (or not ours to judge)
        dir.remove(name);
    }
}
} // namespace

void Database::create_new(int target_version, const Seed& seed) {
    remove_stale_creations(path_);
    // Built under a name of its own, committed and closed (which checkpoints the WAL into the
    // file), then moved to `path_` only if nothing is there: the loser of two first runs opens the
    // winner's file, and a kill part-way leaves at most a stray ".new-" file, never a half-made
    // database under the real name.
    const QString temp = path_ + QStringLiteral(".new-%1-%2")
                                     .arg(QString::number(QCoreApplication::applicationPid()),
                                          QString::number(QDateTime::currentMSecsSinceEpoch()));
    const QString real = path_;
    path_ = temp;
    try {
        open_connection(temp, false);
        configure();
        migrate(target_version, seed);
        close_connection();
    } catch (...) {
        close_connection();
        QFile::remove(temp);
        path_ = real;
        throw;
    }
    path_ = real;
    const QByteArray from = QFile::encodeName(temp), to = QFile::encodeName(real);
    int rc = ::renameat2(AT_FDCWD, from.constData(), AT_FDCWD, to.constData(), RENAME_NOREPLACE);
    if (rc != 0 && (errno == EINVAL || errno == ENOSYS)) { // a filesystem without it: link, unlink
        rc = ::link(from.constData(), to.constData());
        if (rc == 0)
            ::unlink(from.constData());
    }
    if (rc != 0) {
        const int err = errno;
        QFile::remove(temp);
        if (err != EEXIST)
            fail(QStringLiteral("cannot create ") + quoted(real) + QStringLiteral(": ") +
                 QString::fromLocal8Bit(std::strerror(err)));
        return; // another first run made it first: open theirs
    }
    for (const char* suffix : {"-wal", "-shm"})
        QFile::remove(temp + QLatin1String(suffix));
    created_ = true;
}

Database::~Database() {
    close_connection();
}

void Database::fail_lost_connection(const QSqlError& e) const {
    if (!sql::connection_lost(db_, e))
        return;
    throw Failure(Failure::Kind::connection_lost,
                  QStringLiteral("the connection to the lab database at %1 was lost")
                      .arg(sql::parse_postgresql_uri(path_).where())
                      .toStdString());
}

bool Database::reconnect() {
    if (dialect_ != sql::Dialect::postgresql)
        return db_.isOpen();
    try {
        if (db_.isOpen()) {
            QSqlQuery ping(db_);
            if (ping.exec(QStringLiteral("SELECT 1")))
                return true;
        }
        db_.close();
        if (!db_.open())
            return false;
        exec(QStringLiteral("SELECT 1"));
        return true;
    } catch (const Failure&) {
        return false;
    }
}

QSqlQuery Database::exec(const QString& sql, const QVariantList& bindings) const {
    QSqlQuery q(db_);
    if (dialect_ == sql::Dialect::postgresql && bindings.isEmpty()) {
        // PostgreSQL prepares only SELECT, INSERT, UPDATE and DELETE: a statement without values
        // (DDL, BEGIN, SAVEPOINT) runs as it is. Values are always bound.
        if (!q.exec(sql)) {
            fail_lost_connection(q.lastError());
            fail(sql::failure_sentence(q.lastError()));
        }
        return q;
    }
    if (!q.prepare(sql)) {
        if (is_busy(q.lastError()))
            fail(locked_reason(path_));
        fail_lost_connection(q.lastError());
        fail(sql::failure_sentence(q.lastError()));
    }
    for (const QVariant& b : bindings)
        q.addBindValue(b);
    if (!q.exec()) {
        if (is_busy(q.lastError()))
            fail(locked_reason(path_));
        if (is_read_only(q.lastError()))
            fail(read_only_text(path_));
        fail_lost_connection(q.lastError());
        fail(sql::failure_sentence(q.lastError()));
    }
    return q;
}

void Database::configure() {
    exec(QStringLiteral("PRAGMA busy_timeout=%1").arg(busy_timeout_ms));
    // A file that is not SQLite fails here, on the first read.
    QSqlQuery mode = exec(QStringLiteral("PRAGMA journal_mode=WAL"));
    if (!mode.next() || mode.value(0).toString().compare(QLatin1String("wal"), Qt::CaseInsensitive))
        fail(quoted(path_) +
             QStringLiteral(" cannot use a write-ahead log (is it on a network drive?)"));
    // FULL: a commit is on disk before save() returns, even across a power cut.
    exec(QStringLiteral("PRAGMA synchronous=FULL"));
    exec(QStringLiteral("PRAGMA foreign_keys=ON"));
}

void Database::probe_writable() {
    // Take the write lock once, as every save will: a read-only file or a lock that another
    // program holds past busy_timeout is found here, at start, not at the first save.
    QSqlQuery q(db_);
    if (q.exec(QStringLiteral("BEGIN IMMEDIATE"))) {
        QSqlQuery(db_).exec(QStringLiteral("ROLLBACK"));
        if (::access(QFile::encodeName(path_).constData(), W_OK) != 0)
            read_only_reason_ = read_only_text(path_);
        return;
    }
    if (is_busy(q.lastError()))
        read_only_reason_ = locked_reason(path_);
    else if (is_read_only(q.lastError()))
        read_only_reason_ = read_only_text(path_);
    else
        fail(QStringLiteral("cannot write ") + quoted(path_) + QStringLiteral(": ") +
             q.lastError().text());
}

int Database::schema_version() const {
    return sql::schema_version(db_);
}

QString Database::journal_mode() const {
    if (is_postgresql())
        return {};
    QSqlQuery q = exec(QStringLiteral("PRAGMA journal_mode"));
    return q.next() ? q.value(0).toString().toLower() : QString();
}

void Database::migrate(int target_version, const Seed& seed) {
    const int latest = latest_schema_version();
    if (target_version > latest)
        target_version = latest;
    // The version is read under the write lock: a second program starting at the same moment
    // waits here and then sees the finished schema.
    Transaction t(*this);
    if (is_postgresql())
        refuse_foreign_postgresql();
    int version = schema_version();
    // PostgreSQL: the database is new when nobody gave it a schema yet (read under the lock, so
    // of two first runs only one seeds).
    const bool fresh = version == 0;
    if (version > latest)
        fail(quoted(path_) +
             QStringLiteral(" has schema version %1, newer than this program's %2: use a "
                            "newer PhasePlan")
                 .arg(QString::number(version), QString::number(latest)));
    for (const Migration& step : migrations()) {
        if (step.version <= version || step.version > target_version)
            continue;
        step.apply(*this);
        sql::set_schema_version(db_, step.version);
        version = step.version;
    }
    if (sql::application_id(db_) != phaseplan_application_id)
        sql::set_application_id(db_, phaseplan_application_id);
    if (is_postgresql() && fresh)
        created_ = true;
    if (seed && (!is_postgresql() || fresh))
        seed(*this);
    t.commit(); // nothing written when the file was up to date: no sync at an ordinary start
}

std::optional<QString> Database::bounded(const QString& source, const QString& name,
                                         const QString& text) const {
    const QString reason = oversize_reason(text);
    if (reason.isEmpty())
        return text;
    bool noted = false;
    for (const SetAsideRecord& r : set_aside_)
        noted = noted || (r.source == source && r.name == name.left(80));
    if (!noted)
        set_aside_.push_back({source, name.left(80), reason});
    return std::nullopt;
}

void Database::set_aside_oversized() {
    if (!sql::table_exists(db_, QStringLiteral("set_aside")))
        return; // an old schema built by a test
    struct Found {
        QString table, key_column, name, reason;
    };
    std::vector<Found> found;
    const QString floor =
        QString::number(std::min(max_record_text_chars, 2 * max_record_array_items));
    auto scan = [&](const QString& table, const QString& key, const QString& value) {
        QSqlQuery q =
            exec(QStringLiteral(
                     "SELECT %1, %2, length(%1) FROM %3 WHERE length(%2) > %4 OR length(%1) > %5")
                     .arg(key, value, table, floor, QString::number(max_name_chars)));
        while (q.next()) {
            const QString name = q.value(0).toString();
            QString reason = q.value(2).toLongLong() > max_name_chars
                                 ? QStringLiteral("a name of %1 characters (limit %2)")
                                       .arg(q.value(2).toString(), QString::number(max_name_chars))
                                 : oversize_reason(q.value(1).toString());
            if (!reason.isEmpty())
                found.push_back({table, key, name, reason});
        }
    };
    for (DocumentKind k : all_document_kinds)
        scan(QLatin1String(table_of(k)), QStringLiteral("name"), QStringLiteral("document"));
    scan(QStringLiteral("settings"), QStringLiteral("key"), QStringLiteral("value"));
    if (sql::table_exists(db_, QStringLiteral("columns")))
        scan(QStringLiteral("columns"), QStringLiteral("name"), QStringLiteral("document"));
    if (found.empty())
        return;
    Transaction t(*this);
    for (const Found& f : found) {
        const QString value = f.table == QLatin1String("settings") ? QStringLiteral("value")
                                                                   : QStringLiteral("document");
        exec(QStringLiteral("INSERT INTO set_aside (source, name, content, reason, set_aside_at)"
                            " SELECT ?, %1, %2, ?, ? FROM %3 WHERE %1 = ?")
                 .arg(f.key_column, value, f.table),
             {f.table, f.reason, sql::utc_now(db_), f.name});
        exec(QStringLiteral("DELETE FROM %1 WHERE %2 = ?").arg(f.table, f.key_column), {f.name});
    }
    t.commit();
    for (const Found& f : found)
        set_aside_.push_back({f.table, f.name.left(80), f.reason});
}

// ---- transactions ---------------------------------------------------------------------------

Database::Transaction::Transaction(Database& db) : db_(db) {
    if (!db_.writable())
        throw Failure(Failure::Kind::database, db_.read_only_reason_.toStdString());
    // The connection's depth, shared with sql::WriteTransaction (a store's write inside this one
    // nests as a savepoint, and this one inside a store's too).
    depth_ = std::max(db_.transaction_depth_, sql::transaction_depth(db_.db_)) + 1;
    // IMMEDIATE takes the write lock now, so a second writer waits (busy_timeout) instead of
    // failing half-way through. Inside another transaction (the seed inside the creating one) it
    // is a savepoint.
    // PostgreSQL: BEGIN and the writers' advisory lock (sql::begin_write).
    if (depth_ == 1)
        for (const QString& s : sql::begin_write(db_.dialect_))
            db_.exec(s);
    else
        db_.exec(QStringLiteral("SAVEPOINT nested_%1").arg(depth_));
    db_.transaction_depth_ = depth_;
    sql::set_transaction_depth(db_.db_, depth_);
}

Database::Transaction::~Transaction() {
    if (done_)
        return;
    QSqlQuery q(db_.db_); // no throw from a destructor
    if (depth_ == 1)
        q.exec(QStringLiteral("ROLLBACK"));
    else {
        q.exec(QStringLiteral("ROLLBACK TO SAVEPOINT nested_%1").arg(depth_));
        q.exec(QStringLiteral("RELEASE SAVEPOINT nested_%1").arg(depth_));
    }
    db_.transaction_depth_ = depth_ - 1;
    sql::set_transaction_depth(db_.db_, depth_ - 1);
}

void Database::Transaction::commit() {
    if (depth_ == 1) {
        if (db_.before_commit_)
            db_.before_commit_();
        db_.exec(QStringLiteral("COMMIT"));
    } else {
        db_.exec(QStringLiteral("RELEASE SAVEPOINT nested_%1").arg(depth_));
    }
    done_ = true;
    db_.transaction_depth_ = depth_ - 1;
    sql::set_transaction_depth(db_.db_, depth_ - 1);
}

// ---- saved work -----------------------------------------------------------------------------

namespace {
void check_name(DocumentKind kind, const QString& name) {
    if (name.isEmpty())
        throw chem::Error("name", "a saved " + kind_name(kind).toStdString() + " needs a name");
    if (name.size() > max_name_chars)
        throw chem::Error("name", "a name of " + std::to_string(name.size()) +
                                      " characters is too long (at most " +
                                      std::to_string(max_name_chars) + ")");
}

/// "plan", "buffer", "line", "method": a kind as the screens name it.
QString kind_words(DocumentKind kind) {
    return kind == DocumentKind::sequence ? QStringLiteral("plan") : kind_name(kind);
}

/// "Buffer \"Phosphate 25 mM\"", "Plan \"Tonight\"", for the conflict sentence.
QString record_words(DocumentKind kind, const QString& name) {
    QString k = kind_words(kind);
    k[0] = k[0].toUpper();
    return QStringLiteral("%1 \"%2\"").arg(k, name);
}
} // namespace

bool Database::versioned() const {
    if (!versioned_seen_)
        versioned_seen_ = schema_version() >= concurrency_schema_version;
    return versioned_seen_;
}

void Database::upsert_document(const SavedDocument& d, const QString& now) {
    const QString name = d.name.trimmed();
    check_name(d.kind, name);
    const QString note = d.note.isNull() ? QStringLiteral("") : d.note;
    if (!versioned()) {
        exec(QStringLiteral("INSERT INTO %1 (name, document, note, created_at, updated_at)"
                            " VALUES (?, ?, ?, ?, ?)"
                            " ON CONFLICT (name) DO UPDATE SET document = excluded.document,"
                            " note = excluded.note, updated_at = excluded.updated_at")
                 .arg(QLatin1String(table_of(d.kind))),
             {name, to_text(d.document), note, now, now});
        return;
    }
    exec(QStringLiteral(
             "INSERT INTO %1 (name, document, note, created_at, updated_at, version, changed_by,"
             " changed_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?)"
             " ON CONFLICT (name) DO UPDATE SET document = excluded.document,"
             " note = excluded.note, updated_at = excluded.updated_at,"
             " version = %1.version + 1, changed_by = excluded.changed_by,"
             " changed_at = excluded.changed_at")
             .arg(QLatin1String(table_of(d.kind))),
         {name, to_text(d.document), note, now, now, first_version(d.kind, name), actor_, now});
}

QString Database::save_copy(DocumentKind kind, const QString& name, const QJsonObject& document,
                            const QString& note) {
    const QString base = name.trimmed().left(max_name_chars - 12);
    Transaction t(*this);
    QString candidate = base + QStringLiteral(" (copy)");
    for (int i = 2; load(kind, candidate) || stamp(kind, candidate).version > 0; ++i)
        candidate = base + QStringLiteral(" (copy %1)").arg(i);
    save_checked(kind, candidate, document, note, 0);
    t.commit();
    return candidate;
}

RowStamp Database::stamp(DocumentKind kind, const QString& name) const {
    if (!versioned())
        return {};
    return row_stamp(db_,
                     {QLatin1String(table_of(kind)), {QStringLiteral("name")}, {name.trimmed()}});
}

std::optional<Retirement> Database::retirement(DocumentKind kind, const QString& name) const {
    if (schema_version() < retired_names_schema_version)
        return std::nullopt;
    QSqlQuery q = exec(QStringLiteral("SELECT last_version, renamed_to, retired_by, retired_at"
                                      " FROM retired_names WHERE kind = ? AND name = ?"),
                       {QLatin1String(table_of(kind)), name.trimmed()});
    if (!q.next())
        return std::nullopt;
    return Retirement{q.value(0).toLongLong(), q.value(1).toString(), q.value(2).toString(),
                      q.value(3).toString()};
}

QString Database::current_name(DocumentKind kind, const QString& name_in) const {
    QString name = name_in.trimmed();
    // A chain of renames ends within as many hops as there are retired names; the bound only
    // stops a cycle (A → B → A, each renamed back) from running forever.
    for (int hop = 0; hop < 64 && !name.isEmpty(); ++hop) {
        if (load(kind, name))
            return name;
        const std::optional<Retirement> gone = retirement(kind, name);
        if (!gone)
            return {};
        name = gone->renamed_to;
    }
    return {};
}

qint64 Database::renamed_version(DocumentKind kind, const QString& to, qint64 was) const {
    return std::max(was + 1, first_version(kind, to));
}

qint64 Database::first_version(DocumentKind kind, const QString& name) const {
    const std::optional<Retirement> gone = retirement(kind, name);
    return gone ? gone->last_version + 1 : 1;
}

void Database::retire(DocumentKind kind, const QString& name, qint64 last_version,
                      const QString& renamed_to, const QString& now) {
    if (schema_version() < retired_names_schema_version || last_version < 1)
        return;
    exec(QStringLiteral("INSERT INTO retired_names (kind, name, last_version, renamed_to,"
                        " retired_by, retired_at) VALUES (?, ?, ?, ?, ?, ?)"
                        " ON CONFLICT (kind, name) DO UPDATE SET"
                        " last_version = excluded.last_version, renamed_to = excluded.renamed_to,"
                        " retired_by = excluded.retired_by, retired_at = excluded.retired_at"),
         {QLatin1String(table_of(kind)), name, last_version,
          renamed_to.isEmpty() ? QVariant() : QVariant(renamed_to), actor_, now});
}

ConflictError Database::refusal(DocumentKind kind, const QString& name) const {
    const RowStamp theirs = stamp(kind, name);
    if (theirs.version == 0)
        if (const std::optional<Retirement> gone = retirement(kind, name))
            return retired_error(db_, record_words(kind, name), *gone);
    return conflict_error(db_, record_words(kind, name), theirs);
}

qint64 Database::save_checked(DocumentKind kind, const QString& name_in,
                              const QJsonObject& document, const QString& note_in,
                              qint64 expected_version) {
    const QString name = name_in.trimmed();
    check_name(kind, name);
    if (!versioned()) {
        save(kind, name, document, note_in);
        return 0;
    }
    Transaction t(*this);
    const qint64 stored = write_checked(kind, name, document, note_in, expected_version,
                                        sql::utc_now(db_), QString());
    t.commit();
    return stored;
}

qint64 Database::write_checked(DocumentKind kind, const QString& name, const QJsonObject& document,
                               const QString& note_in, qint64 expected_version, const QString& now,
                               const QString& taken_words) {
    const QString note = note_in.isNull() ? QStringLiteral("") : note_in;
    if (expected_version <= 0) {
        const RowStamp theirs = stamp(kind, name);
        if (theirs.version > 0)
            throw taken_words.isEmpty() ? conflict_error(db_, record_words(kind, name), theirs)
                                        : name_taken_error(db_, taken_words, name, theirs);
        const qint64 first = first_version(kind, name);
        exec(QStringLiteral("INSERT INTO %1 (name, document, note, created_at, updated_at,"
                            " version, changed_by, changed_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?)")
                 .arg(QLatin1String(table_of(kind))),
             {name, to_text(document), note, now, now, first, actor_, now});
        return first;
    }
    QSqlQuery q = exec(QStringLiteral("UPDATE %1 SET document = ?, note = ?, updated_at = ?,"
                                      " version = version + 1, changed_by = ?, changed_at = ?"
                                      " WHERE name = ? AND version = ?")
                           .arg(QLatin1String(table_of(kind))),
                       {to_text(document), note, now, actor_, now, name, expected_version});
    if (q.numRowsAffected() != 1)
        throw refusal(kind, name);
    return expected_version + 1;
}

void Database::save(DocumentKind kind, const QString& name, const QJsonObject& document,
                    const QString& note) {
    save_all({SavedDocument{kind, name, document, note}});
}

void Database::save_all(const std::vector<SavedDocument>& documents) {
    Transaction t(*this);
    const QString now = sql::utc_now(db_);
    const bool v = versioned();
    for (const SavedDocument& d : documents) {
        if (d.expected_version < 0 || !v) {
            upsert_document(d, now);
            continue;
        }
        const QString name = d.name.trimmed();
        check_name(d.kind, name);
        write_checked(d.kind, name, d.document, d.note, d.expected_version, now,
                      kind_words(d.kind));
    }
    t.commit();
}

std::optional<QJsonObject> Database::load(DocumentKind kind, const QString& name) const {
    QSqlQuery q = exec(
        QStringLiteral("SELECT document FROM %1 WHERE name = ?").arg(QLatin1String(table_of(kind))),
        {name.trimmed()});
    if (!q.next())
        return std::nullopt;
    const auto text = bounded(QLatin1String(table_of(kind)), name.trimmed(), q.value(0).toString());
    if (!text)
        return std::nullopt;
    return from_text(*text);
}

std::vector<DocumentInfo> Database::list_where(DocumentKind kind) const {
    const bool v = versioned();
    QSqlQuery q =
        exec(QStringLiteral("SELECT name, note, created_at, updated_at%4 FROM %1"
                            " WHERE length(name) <= %2 ORDER BY updated_at DESC, name"
                            " LIMIT %3")
                 .arg(QLatin1String(table_of(kind)), QString::number(max_name_chars),
                      QString::number(max_record_array_items),
                      v ? QStringLiteral(", version, changed_by, changed_at") : QString()));
    std::vector<DocumentInfo> out;
    while (q.next()) {
        DocumentInfo i;
        i.kind = kind;
        i.name = q.value(0).toString();
        i.note = q.value(1).toString();
        i.created_at = parse_time(q.value(2).toString());
        i.updated_at = parse_time(q.value(3).toString());
        if (v) {
            i.version = q.value(4).toLongLong();
            i.changed_by = q.value(5).toString();
            i.changed_at = q.value(6).toString();
        }
        out.push_back(i);
    }
    return out;
}

std::optional<DocumentInfo> Database::info(DocumentKind kind, const QString& name) const {
    for (DocumentInfo& i : list_where(kind))
        if (i.name == name.trimmed())
            return i;
    return std::nullopt;
}

std::vector<DocumentInfo> Database::list(DocumentKind kind) const {
    return list_where(kind);
}

std::vector<DocumentInfo> Database::list_all() const {
    std::vector<DocumentInfo> all;
    for (DocumentKind k : all_document_kinds) {
        auto part = list_where(k);
        all.insert(all.end(), part.begin(), part.end());
    }
    std::stable_sort(all.begin(), all.end(), [](const DocumentInfo& a, const DocumentInfo& b) {
        return a.updated_at > b.updated_at;
    });
    return all;
}

bool Database::remove(DocumentKind kind, const QString& name) {
    Transaction t(*this);
    const RowStamp last = stamp(kind, name);
    QSqlQuery q =
        exec(QStringLiteral("DELETE FROM %1 WHERE name = ?").arg(QLatin1String(table_of(kind))),
             {name.trimmed()});
    const bool removed = q.numRowsAffected() > 0;
    if (removed)
        retire(kind, name.trimmed(), last.version, {}, sql::utc_now(db_));
    t.commit();
    return removed;
}

bool Database::rename(DocumentKind kind, const QString& old_name, const QString& new_name) {
    const QString to = new_name.trimmed();
    if (to.isEmpty())
        throw chem::Error("name", "the new name must not be empty");
    Transaction t(*this);
    if (to != old_name.trimmed() && load(kind, to))
        throw chem::Error("name", "\"" + to.toStdString() + "\" is already the name of a saved " +
                                      kind_name(kind).toStdString());
    const QString now = sql::utc_now(db_);
    const QString from = old_name.trimmed();
    const qint64 was = stamp(kind, from).version;
    QSqlQuery q = versioned()
                      ? exec(QStringLiteral("UPDATE %1 SET name = ?, updated_at = ?, version = ?,"
                                            " changed_by = ?, changed_at = ? WHERE name = ?")
                                 .arg(QLatin1String(table_of(kind))),
                             {to, now, renamed_version(kind, to, was), actor_, now, from})
                      : exec(QStringLiteral("UPDATE %1 SET name = ?, updated_at = ? WHERE name = ?")
                                 .arg(QLatin1String(table_of(kind))),
                             {to, now, from});
    const bool renamed = q.numRowsAffected() > 0;
    if (renamed && to != from)
        retire(kind, from, was, to, now);
    t.commit();
    return renamed;
}

qint64 Database::rename_checked(DocumentKind kind, const QString& old_name_in,
                                const QString& new_name, qint64 expected_version) {
    const QString to = new_name.trimmed();
    const QString from = old_name_in.trimmed();
    if (to.isEmpty())
        throw chem::Error("name", "the new name must not be empty");
    check_name(kind, to);
    if (!versioned()) {
        if (!rename(kind, from, to))
            throw chem::Error("name", "\"" + from.toStdString() + "\" is not saved");
        return 0;
    }
    Transaction t(*this);
    if (to != from) {
        const RowStamp taken = stamp(kind, to);
        if (taken.version > 0)
            throw name_taken_error(db_, kind_words(kind), to, taken);
    }
    const QString now = sql::utc_now(db_);
    const qint64 stored = renamed_version(kind, to, expected_version);
    QSqlQuery q =
        exec(QStringLiteral("UPDATE %1 SET name = ?, updated_at = ?, version = ?,"
                            " changed_by = ?, changed_at = ? WHERE name = ? AND version = ?")
                 .arg(QLatin1String(table_of(kind))),
             {to, now, stored, actor_, now, from, expected_version});
    if (q.numRowsAffected() != 1)
        throw refusal(kind, from);
    if (to != from)
        retire(kind, from, expected_version, to, now);
    t.commit();
    return stored;
}

// ---- settings -------------------------------------------------------------------------------

void Database::set_setting(const QString& key, const QJsonValue& value) {
    // Wrapped in an array so that scalars survive the JSON round trip.
    const QString text =
        QString::fromUtf8(QJsonDocument(QJsonArray{value}).toJson(QJsonDocument::Compact));
    Transaction t(*this);
    exec(QStringLiteral("INSERT INTO settings (key, value) VALUES (?, ?)"
                        " ON CONFLICT (key) DO UPDATE SET value = excluded.value"),
         {key, text});
    t.commit();
}

QJsonValue Database::setting(const QString& key) const {
    QSqlQuery q = exec(QStringLiteral("SELECT value FROM settings WHERE key = ?"), {key});
    if (!q.next())
        return QJsonValue::Null;
    const auto text = bounded(QStringLiteral("settings"), key, q.value(0).toString());
    if (!text)
        return QJsonValue::Null;
    return QJsonDocument::fromJson(text->toUtf8()).array().at(0);
}

// ---- library --------------------------------------------------------------------------------

bool Database::sync_shipped_file(const QString& file_name, const QByteArray& content) {
    const QString hash =
        QString::fromLatin1(QCryptographicHash::hash(content, QCryptographicHash::Sha256).toHex());
    {
        QSqlQuery q =
            exec(QStringLiteral("SELECT sha256 FROM library_files WHERE file = ?"), {file_name});
        if (q.next() && q.value(0).toString() == hash)
            return false;
    }
    QJsonParseError err{};
    QJsonDocument doc = QJsonDocument::fromJson(content, &err);
    if (err.error != QJsonParseError::NoError || !doc.isObject())
        throw chem::Error(file_name.toStdString(),
                          "is not a JSON object: " + err.errorString().toStdString());
    const QJsonObject root = doc.object();

    Transaction t(*this);
    exec(QStringLiteral("DELETE FROM library_shipped WHERE file = ?"), {file_name});
    for (auto it = root.begin(); it != root.end(); ++it) {
        if (!it.value().isArray())
            continue;
        const QJsonArray arr = it.value().toArray();
        for (const QJsonValue& v : arr) {
            if (!v.isObject() || !v.toObject().value(QLatin1String("id")).isString())
                continue;
            const QJsonObject entry = v.toObject();
            exec(
                QStringLiteral("INSERT INTO library_shipped (kind, id, file, document)"
                               " VALUES (?, ?, ?, ?) ON CONFLICT (kind, id) DO UPDATE SET"
                               " file = excluded.file, document = excluded.document"),
                {it.key(), entry.value(QLatin1String("id")).toString(), file_name, to_text(entry)});
        }
    }
    exec(QStringLiteral(
             "INSERT INTO library_files (file, sha256, content, seeded_at) VALUES (?, ?, ?, ?)"
             " ON CONFLICT (file) DO UPDATE SET sha256 = excluded.sha256,"
             " content = excluded.content, seeded_at = excluded.seeded_at"),
         {file_name, hash, content, sql::utc_now(db_)});
    t.commit();
    return true;
}

QByteArray Database::shipped_file(const QString& file_name) const {
    QSqlQuery q =
        exec(QStringLiteral("SELECT content FROM library_files WHERE file = ?"), {file_name});
    return q.next() ? q.value(0).toByteArray() : QByteArray();
}

bool Database::rows_versioned() const {
    return schema_version() >= row_version_schema_version;
}

namespace {
RowKey user_entry_key(const QString& kind, const QString& id) {
    return {
        QStringLiteral("library_user"), {QStringLiteral("kind"), QStringLiteral("id")}, {kind, id}};
}
QString user_entry_words(const QString& id) {
    return QStringLiteral("Library entry \"%1\"").arg(id);
}
} // namespace

QString Database::user_entries_stamp() const {
    QSqlQuery q =
        exec(rows_versioned() ? QStringLiteral("SELECT count(*), COALESCE(sum(version), 0),"
                                               " COALESCE(max(changed_at), '') FROM library_user")
                              : QStringLiteral("SELECT count(*), 0, COALESCE(max(updated_at), '')"
                                               " FROM library_user"));
    if (!q.next())
        return {};
    return QStringLiteral("%1/%2/%3")
        .arg(q.value(0).toString(), q.value(1).toString(), q.value(2).toString());
}

RowStamp Database::user_entry_stamp(const QString& kind, const QString& id) const {
    if (!rows_versioned())
        return {};
    return row_stamp(db_, user_entry_key(kind, id.trimmed()));
}

qint64 Database::save_user_entry(const QString& kind, const QJsonObject& document,
                                 const QString& source, qint64 expected_version) {
    const QString id = document.value(QLatin1String("id")).toString().trimmed();
    if (id.isEmpty())
        throw chem::Error("id", "a library entry needs an id");
    if (source.trimmed().isEmpty())
        throw chem::Error("source",
                          "say where the numbers of \"" + id.toStdString() +
                              "\" come from (a citation, a certificate, \"lab measurement\")");
    Transaction t(*this);
    const QString now = sql::utc_now(db_);
    const bool v = rows_versioned();
    qint64 stored = 0;
    if (!v) {
        exec(QStringLiteral(
                 "INSERT INTO library_user (kind, id, document, source, created_at, updated_at)"
                 " VALUES (?, ?, ?, ?, ?, ?)"
                 " ON CONFLICT (kind, id) DO UPDATE SET document = excluded.document,"
                 " source = excluded.source, updated_at = excluded.updated_at"),
             {kind, id, to_text(document), source.trimmed(), now, now});
    } else if (expected_version > 0) {
        stored = update_checked(db_, user_entry_key(kind, id),
                                QStringLiteral("document = ?, source = ?, updated_at = ?"),
                                {to_text(document), source.trimmed(), now}, expected_version,
                                actor_, now, user_entry_words(id));
    } else {
        if (expected_version == 0)
            refuse_taken(db_, user_entry_key(kind, id), QStringLiteral("lab library entry"), id,
                         "id");
        exec(QStringLiteral(
                 "INSERT INTO library_user (kind, id, document, source, created_at, updated_at,"
                 " version, changed_by, changed_at) VALUES (?, ?, ?, ?, ?, ?, 1, ?, ?)"
                 " ON CONFLICT (kind, id) DO UPDATE SET document = excluded.document,"
                 " source = excluded.source, updated_at = excluded.updated_at,"
                 " version = library_user.version + 1, changed_by = excluded.changed_by,"
                 " changed_at = excluded.changed_at"),
             {kind, id, to_text(document), source.trimmed(), now, now, actor_, now});
        stored = row_stamp(db_, user_entry_key(kind, id)).version;
    }
    t.commit();
    return stored;
}

bool Database::remove_user_entry(const QString& kind, const QString& id, qint64 expected_version) {
    Transaction t(*this);
    bool removed = true;
    if (expected_version > 0 && rows_versioned()) {
        delete_checked(db_, user_entry_key(kind, id.trimmed()), expected_version,
                       user_entry_words(id.trimmed()));
    } else {
        QSqlQuery q =
            exec(QStringLiteral("DELETE FROM library_user WHERE kind = ? AND id = ?"), {kind, id});
        removed = q.numRowsAffected() > 0;
    }
    t.commit();
    return removed;
}

std::vector<LibraryEntry> Database::shipped_entries(const QString& kind) const {
    QSqlQuery q = exec(
        QStringLiteral("SELECT s.id, s.document, s.file, f.seeded_at FROM library_shipped s"
                       " JOIN library_files f ON f.file = s.file WHERE s.kind = ? ORDER BY s.id"),
        {kind});
    std::vector<LibraryEntry> out;
    while (q.next())
        out.push_back({kind, q.value(0).toString(), from_text(q.value(1).toString()),
                       q.value(2).toString(), false, parse_time(q.value(3).toString())});
    return out;
}

std::vector<LibraryEntry> Database::user_entries(const QString& kind) const {
    const bool v = rows_versioned();
    QSqlQuery q =
        exec(QStringLiteral("SELECT id, document, source, updated_at%1 FROM library_user"
                            " WHERE kind = ? ORDER BY id")
                 .arg(v ? QStringLiteral(", version, changed_by, changed_at") : QString()),
             {kind});
    std::vector<LibraryEntry> out;
    while (q.next()) {
        LibraryEntry e{kind,
                       q.value(0).toString(),
                       from_text(q.value(1).toString()),
                       q.value(2).toString(),
                       true,
                       parse_time(q.value(3).toString())};
        if (v) {
            e.version = q.value(4).toLongLong();
            e.changed_by = q.value(5).toString();
            e.changed_at = q.value(6).toString();
        }
        out.push_back(std::move(e));
    }
    return out;
}

std::vector<LibraryEntry> Database::merged_entries(const QString& kind) const {
    std::map<QString, LibraryEntry> by_id;
    for (LibraryEntry& e : shipped_entries(kind))
        by_id[e.id] = std::move(e);
    for (LibraryEntry& e : user_entries(kind))
        by_id[e.id] = std::move(e);
    std::vector<LibraryEntry> out;
    out.reserve(by_id.size());
    for (auto& [id, e] : by_id)
        out.push_back(std::move(e));
    return out;
}

QByteArray Database::merged_file(const QString& file_name) const {
    QJsonObject root = QJsonDocument::fromJson(shipped_file(file_name)).object();
    for (auto it = root.begin(); it != root.end(); ++it) {
        if (!it.value().isArray())
            continue;
        // Only arrays of entries are merged; other arrays (a list of sources, say) stay as shipped.
        bool entries = false;
        for (const QJsonValue& v : it.value().toArray())
            entries =
                entries || (v.isObject() && v.toObject().value(QLatin1String("id")).isString());
        if (!entries)
            continue;
        // Keep the shipped order (people read the file top to bottom); lab entries replace theirs
        // in place and new ones go at the end.
        std::map<QString, QJsonObject> user;
        for (const LibraryEntry& e : user_entries(it.key()))
            user[e.id] = e.document;
        QJsonArray merged;
        for (const QJsonValue& v : it.value().toArray()) {
            const QString id = v.toObject().value(QLatin1String("id")).toString();
            auto u = user.find(id);
            if (u != user.end()) {
                merged.append(u->second);
                user.erase(u);
            } else {
                merged.append(v);
            }
        }
        for (auto& [id, doc] : user)
            merged.append(doc);
        it.value() = merged;
    }
    return QJsonDocument(root).toJson(QJsonDocument::Indented);
}

} // namespace phaseplan::storage
