#include "storage/database.h"

#include <QAtomicInt>
#include <QCryptographicHash>
#include <QDir>
#include <QFileInfo>
#include <QJsonArray>
#include <QJsonDocument>
#include <QSqlError>
#include <QStandardPaths>

#include <map>

namespace phaseplan::storage {

namespace {

const char* table_of(DocumentKind kind) {
    switch (kind) {
    case DocumentKind::buffer: return "buffers";
    case DocumentKind::line: return "lines";
    case DocumentKind::method: return "methods";
    case DocumentKind::sequence: return "sequences";
    }
    return "buffers";
}

QString now_utc() { return QDateTime::currentDateTimeUtc().toString(Qt::ISODateWithMs); }

QDateTime parse_time(const QString& s) {
    QDateTime t = QDateTime::fromString(s, Qt::ISODateWithMs);
    t.setTimeSpec(Qt::UTC);
    return t;
}

QString to_text(const QJsonObject& o) {
    return QString::fromUtf8(QJsonDocument(o).toJson(QJsonDocument::Compact));
}

QJsonObject from_text(const QString& s) { return QJsonDocument::fromJson(s.toUtf8()).object(); }

[[noreturn]] void fail(const QString& what) { throw chem::Error("database", what.toStdString()); }

QString unique_connection_name() {
    static QAtomicInt counter;
    return QStringLiteral("phaseplan-storage-%1").arg(counter.fetchAndAddRelaxed(1));
}

} // namespace

QString kind_name(DocumentKind kind) {
    switch (kind) {
    case DocumentKind::buffer: return QStringLiteral("buffer");
    case DocumentKind::line: return QStringLiteral("line");
    case DocumentKind::method: return QStringLiteral("method");
    case DocumentKind::sequence: return QStringLiteral("sequence");
    }
    return {};
}

std::optional<DocumentKind> kind_from_name(const QString& name) {
    for (DocumentKind k : all_document_kinds)
        if (kind_name(k) == name) return k;
    return std::nullopt;
}

QString Database::default_path() {
    QString dir = QStandardPaths::writableLocation(QStandardPaths::AppDataLocation);
    if (dir.isEmpty()) dir = QDir::homePath() + QStringLiteral("/.phaseplan");
    return dir + QStringLiteral("/phaseplan.sqlite");
}

Database::Database(const QString& path, int target_version)
    : path_(path), connection_name_(unique_connection_name()) {
    if (path.isEmpty()) fail(QStringLiteral("no database file given"));
    QFileInfo fi(path);
    if (!QDir().mkpath(fi.absolutePath()))
        fail(QStringLiteral("cannot create the folder \"%1\"").arg(fi.absolutePath()));
    db_ = QSqlDatabase::addDatabase(QStringLiteral("QSQLITE"), connection_name_);
    if (!db_.isValid()) fail(QStringLiteral("the Qt SQLite driver (QSQLITE) is not installed"));
    db_.setDatabaseName(path);
    if (!db_.open())
        fail(QStringLiteral("cannot open \"%1\": %2").arg(path, db_.lastError().text()));
    try {
        configure();
        migrate(target_version < 0 ? latest_schema_version() : target_version);
    } catch (...) {
        db_.close();
        db_ = QSqlDatabase();
        QSqlDatabase::removeDatabase(connection_name_);
        throw;
    }
}

Database::~Database() {
    db_.close();
    db_ = QSqlDatabase();
    QSqlDatabase::removeDatabase(connection_name_);
}

QSqlQuery Database::exec(const QString& sql, const QVariantList& bindings) const {
    QSqlQuery q(db_);
    if (!q.prepare(sql))
        fail(QStringLiteral("cannot prepare \"%1\": %2").arg(sql.left(80), q.lastError().text()));
    for (const QVariant& b : bindings) q.addBindValue(b);
    if (!q.exec())
        fail(QStringLiteral("\"%1\" failed: %2").arg(sql.left(80), q.lastError().text()));
    return q;
}

void Database::configure() {
    // A file that is not SQLite fails here, on the first read.
    QSqlQuery mode = exec(QStringLiteral("PRAGMA journal_mode=WAL"));
    if (!mode.next() || mode.value(0).toString().compare(QLatin1String("wal"), Qt::CaseInsensitive))
        fail(QStringLiteral("\"%1\" cannot use a write-ahead log (is it on a network drive?)").arg(path_));
    // FULL: a commit is on disk before save() returns, even across a power cut.
    exec(QStringLiteral("PRAGMA synchronous=FULL"));
    exec(QStringLiteral("PRAGMA foreign_keys=ON"));
    exec(QStringLiteral("PRAGMA busy_timeout=5000"));
}

int Database::schema_version() const {
    QSqlQuery q = exec(QStringLiteral("PRAGMA user_version"));
    return q.next() ? q.value(0).toInt() : 0;
}

QString Database::journal_mode() const {
    QSqlQuery q = exec(QStringLiteral("PRAGMA journal_mode"));
    return q.next() ? q.value(0).toString().toLower() : QString();
}

void Database::migrate(int target_version) {
    const int latest = latest_schema_version();
    if (target_version > latest) target_version = latest;
    int version = schema_version();
    if (version > latest)
        fail(QStringLiteral("\"%1\" has schema version %2, newer than this program's %3: use a "
                            "newer PhasePlan")
                 .arg(path_)
                 .arg(version)
                 .arg(latest));
    for (const Migration& step : migrations()) {
        if (step.version <= version || step.version > target_version) continue;
        Transaction t(*this);
        step.apply(*this);
        exec(QStringLiteral("PRAGMA user_version = %1").arg(step.version));
        t.commit();
        version = step.version;
    }
}

// ---- transactions ---------------------------------------------------------------------------

Database::Transaction::Transaction(Database& db) : db_(db) {
    // IMMEDIATE takes the write lock now, so a second writer waits (busy_timeout) instead of
    // failing half-way through.
    db_.exec(QStringLiteral("BEGIN IMMEDIATE"));
}

Database::Transaction::~Transaction() {
    if (done_) return;
    QSqlQuery q(db_.db_);
    q.exec(QStringLiteral("ROLLBACK")); // no throw from a destructor
}

void Database::Transaction::commit() {
    if (db_.before_commit_) db_.before_commit_();
    db_.exec(QStringLiteral("COMMIT"));
    done_ = true;
}

// ---- saved work -----------------------------------------------------------------------------

void Database::upsert_document(const SavedDocument& d, const QString& now) {
    const QString name = d.name.trimmed();
    if (name.isEmpty()) throw chem::Error("name", "a saved " + kind_name(d.kind).toStdString() +
                                                      " needs a name");
    exec(QStringLiteral("INSERT INTO %1 (name, document, note, created_at, updated_at)"
                        " VALUES (?, ?, ?, ?, ?)"
                        " ON CONFLICT (name) DO UPDATE SET document = excluded.document,"
                        " note = excluded.note, updated_at = excluded.updated_at")
             .arg(QLatin1String(table_of(d.kind))),
         {name, to_text(d.document), d.note.isNull() ? QStringLiteral("") : d.note, now, now});
}

void Database::save(DocumentKind kind, const QString& name, const QJsonObject& document,
                    const QString& note) {
    save_all({SavedDocument{kind, name, document, note}});
}

void Database::save_all(const std::vector<SavedDocument>& documents) {
    const QString now = now_utc();
    Transaction t(*this);
    for (const SavedDocument& d : documents) upsert_document(d, now);
    t.commit();
}

std::optional<QJsonObject> Database::load(DocumentKind kind, const QString& name) const {
    QSqlQuery q = exec(QStringLiteral("SELECT document FROM %1 WHERE name = ?")
                           .arg(QLatin1String(table_of(kind))),
                       {name.trimmed()});
    if (!q.next()) return std::nullopt;
    return from_text(q.value(0).toString());
}

std::vector<DocumentInfo> Database::list_where(DocumentKind kind) const {
    QSqlQuery q = exec(QStringLiteral("SELECT name, note, created_at, updated_at FROM %1"
                                      " ORDER BY updated_at DESC, name")
                           .arg(QLatin1String(table_of(kind))));
    std::vector<DocumentInfo> out;
    while (q.next())
        out.push_back({kind, q.value(0).toString(), q.value(1).toString(),
                       parse_time(q.value(2).toString()), parse_time(q.value(3).toString())});
    return out;
}

std::optional<DocumentInfo> Database::info(DocumentKind kind, const QString& name) const {
    for (DocumentInfo& i : list_where(kind))
        if (i.name == name.trimmed()) return i;
    return std::nullopt;
}

std::vector<DocumentInfo> Database::list(DocumentKind kind) const { return list_where(kind); }

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
    QSqlQuery q = exec(QStringLiteral("DELETE FROM %1 WHERE name = ?").arg(QLatin1String(table_of(kind))),
                       {name.trimmed()});
    const bool removed = q.numRowsAffected() > 0;
    t.commit();
    return removed;
}

bool Database::rename(DocumentKind kind, const QString& old_name, const QString& new_name) {
    const QString to = new_name.trimmed();
    if (to.isEmpty()) throw chem::Error("name", "the new name must not be empty");
    Transaction t(*this);
    if (to != old_name.trimmed() && load(kind, to))
        throw chem::Error("name", "\"" + to.toStdString() + "\" is already the name of a saved " +
                                      kind_name(kind).toStdString());
    QSqlQuery q = exec(QStringLiteral("UPDATE %1 SET name = ?, updated_at = ? WHERE name = ?")
                           .arg(QLatin1String(table_of(kind))),
                       {to, now_utc(), old_name.trimmed()});
    const bool renamed = q.numRowsAffected() > 0;
    t.commit();
    return renamed;
}

// ---- settings -------------------------------------------------------------------------------

void Database::set_setting(const QString& key, const QJsonValue& value) {
    // Wrapped in an array so that scalars survive the JSON round trip.
    const QString text = QString::fromUtf8(QJsonDocument(QJsonArray{value}).toJson(QJsonDocument::Compact));
    Transaction t(*this);
    exec(QStringLiteral("INSERT INTO settings (key, value) VALUES (?, ?)"
                        " ON CONFLICT (key) DO UPDATE SET value = excluded.value"),
         {key, text});
    t.commit();
}

QJsonValue Database::setting(const QString& key) const {
    QSqlQuery q = exec(QStringLiteral("SELECT value FROM settings WHERE key = ?"), {key});
    if (!q.next()) return QJsonValue::Null;
    return QJsonDocument::fromJson(q.value(0).toString().toUtf8()).array().at(0);
}

// ---- library --------------------------------------------------------------------------------

bool Database::sync_shipped_file(const QString& file_name, const QByteArray& content) {
    const QString hash =
        QString::fromLatin1(QCryptographicHash::hash(content, QCryptographicHash::Sha256).toHex());
    {
        QSqlQuery q = exec(QStringLiteral("SELECT sha256 FROM library_files WHERE file = ?"), {file_name});
        if (q.next() && q.value(0).toString() == hash) return false;
    }
    QJsonParseError err{};
    QJsonDocument doc = QJsonDocument::fromJson(content, &err);
    if (err.error != QJsonParseError::NoError || !doc.isObject())
        throw chem::Error(file_name.toStdString(), "is not a JSON object: " + err.errorString().toStdString());
    const QJsonObject root = doc.object();

    Transaction t(*this);
    exec(QStringLiteral("DELETE FROM library_shipped WHERE file = ?"), {file_name});
    for (auto it = root.begin(); it != root.end(); ++it) {
        if (!it.value().isArray()) continue;
        const QJsonArray arr = it.value().toArray();
        for (const QJsonValue& v : arr) {
            if (!v.isObject() || !v.toObject().value(QLatin1String("id")).isString()) continue;
            const QJsonObject entry = v.toObject();
            exec(QStringLiteral("INSERT OR REPLACE INTO library_shipped (kind, id, file, document)"
                                " VALUES (?, ?, ?, ?)"),
                 {it.key(), entry.value(QLatin1String("id")).toString(), file_name, to_text(entry)});
        }
    }
    exec(QStringLiteral("INSERT INTO library_files (file, sha256, content, seeded_at) VALUES (?, ?, ?, ?)"
                        " ON CONFLICT (file) DO UPDATE SET sha256 = excluded.sha256,"
                        " content = excluded.content, seeded_at = excluded.seeded_at"),
         {file_name, hash, content, now_utc()});
    t.commit();
    return true;
}

QByteArray Database::shipped_file(const QString& file_name) const {
    QSqlQuery q = exec(QStringLiteral("SELECT content FROM library_files WHERE file = ?"), {file_name});
    return q.next() ? q.value(0).toByteArray() : QByteArray();
}

void Database::save_user_entry(const QString& kind, const QJsonObject& document, const QString& source) {
    const QString id = document.value(QLatin1String("id")).toString().trimmed();
    if (id.isEmpty()) throw chem::Error("id", "a library entry needs an id");
    if (source.trimmed().isEmpty())
        throw chem::Error("source", "say where the numbers of \"" + id.toStdString() +
                                        "\" come from (a citation, a certificate, \"lab measurement\")");
    const QString now = now_utc();
    Transaction t(*this);
    exec(QStringLiteral("INSERT INTO library_user (kind, id, document, source, created_at, updated_at)"
                        " VALUES (?, ?, ?, ?, ?, ?)"
                        " ON CONFLICT (kind, id) DO UPDATE SET document = excluded.document,"
                        " source = excluded.source, updated_at = excluded.updated_at"),
         {kind, id, to_text(document), source.trimmed(), now, now});
    t.commit();
}

bool Database::remove_user_entry(const QString& kind, const QString& id) {
    Transaction t(*this);
    QSqlQuery q = exec(QStringLiteral("DELETE FROM library_user WHERE kind = ? AND id = ?"), {kind, id});
    const bool removed = q.numRowsAffected() > 0;
    t.commit();
    return removed;
}

std::vector<LibraryEntry> Database::shipped_entries(const QString& kind) const {
    QSqlQuery q = exec(QStringLiteral("SELECT s.id, s.document, s.file, f.seeded_at FROM library_shipped s"
                                      " JOIN library_files f ON f.file = s.file WHERE s.kind = ? ORDER BY s.id"),
                       {kind});
    std::vector<LibraryEntry> out;
    while (q.next())
        out.push_back({kind, q.value(0).toString(), from_text(q.value(1).toString()),
                       q.value(2).toString(), false, parse_time(q.value(3).toString())});
    return out;
}

std::vector<LibraryEntry> Database::user_entries(const QString& kind) const {
    QSqlQuery q = exec(QStringLiteral("SELECT id, document, source, updated_at FROM library_user"
                                      " WHERE kind = ? ORDER BY id"),
                       {kind});
    std::vector<LibraryEntry> out;
    while (q.next())
        out.push_back({kind, q.value(0).toString(), from_text(q.value(1).toString()),
                       q.value(2).toString(), true, parse_time(q.value(3).toString())});
    return out;
}

std::vector<LibraryEntry> Database::merged_entries(const QString& kind) const {
    std::map<QString, LibraryEntry> by_id;
    for (LibraryEntry& e : shipped_entries(kind)) by_id[e.id] = std::move(e);
    for (LibraryEntry& e : user_entries(kind)) by_id[e.id] = std::move(e);
    std::vector<LibraryEntry> out;
    out.reserve(by_id.size());
    for (auto& [id, e] : by_id) out.push_back(std::move(e));
    return out;
}

QByteArray Database::merged_file(const QString& file_name) const {
    QJsonObject root = QJsonDocument::fromJson(shipped_file(file_name)).object();
    for (auto it = root.begin(); it != root.end(); ++it) {
        if (!it.value().isArray()) continue;
        // Only arrays of entries are merged; other arrays (a list of sources, say) stay as shipped.
        bool entries = false;
        for (const QJsonValue& v : it.value().toArray())
            entries = entries || (v.isObject() && v.toObject().value(QLatin1String("id")).isString());
        if (!entries) continue;
        // Keep the shipped order (people read the file top to bottom); lab entries replace theirs
        // in place and new ones go at the end.
        std::map<QString, QJsonObject> user;
        for (const LibraryEntry& e : user_entries(it.key())) user[e.id] = e.document;
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
        for (auto& [id, doc] : user) merged.append(doc);
        it.value() = merged;
    }
    return QJsonDocument(root).toJson(QJsonDocument::Indented);
}

} // namespace phaseplan::storage
