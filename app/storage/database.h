#pragma once
// The lab's own work in one SQLite file (Qt SQL, QSQLITE driver), or in the lab's PostgreSQL
// database (QPSQL, given as postgresql://user@host:port/dbname): saved buffers, lines, methods
// and sequences as the JSON documents of the command-line contract, the app's settings, and the
// library (the entries shipped in data/ and, kept apart, the lab's own entries that win on lookup).
//
// Durability: WAL journal, synchronous=FULL, and every save is one transaction, so closing or
// killing the program at any moment leaves the last committed state (tests/tst_storage.cpp kills a
// process inside a save). The schema is versioned (PRAGMA user_version) and migrated forward by the
// ordered steps in app/storage/migrations.cpp: see the comment there to add one.
//
// Errors: the file or server itself (cannot open, not PhasePlan's, newer schema, locked, a
// statement refused, the connection lost) throws phaseplan::Failure (core/failure.h: Kind::database
// or Kind::connection_lost, one sentence without SQL); a bad argument throws chem::Error naming it
// (the document's name or id, "version" for a stale save, "database.port" for a wrong address).
#include "chem/error.h"
#include "storage/sql_dialect.h"
#include "storage/versioning.h"

#include <QDateTime>
#include <QJsonObject>
#include <QJsonValue>
#include <QSqlDatabase>
#include <QSqlError>
#include <QSqlQuery>
#include <QString>

#include <functional>
#include <optional>
#include <vector>

namespace phaseplan::storage {

/// The kinds of saved work. Each has its own table holding the document of the CLI contract:
/// buffer = a `recipe` input, line = a `line` input (without volume_ml), method = one entry of a
/// sequence's "methods", sequence = a whole `sequence` input.
enum class DocumentKind { buffer, line, method, sequence };
inline constexpr DocumentKind all_document_kinds[] = {DocumentKind::buffer, DocumentKind::line,
                                                      DocumentKind::method, DocumentKind::sequence};
/// "buffer", "line", "method", "sequence".
QString kind_name(DocumentKind kind);
/// The inverse of kind_name; std::nullopt for anything else.
std::optional<DocumentKind> kind_from_name(const QString& name);

struct DocumentInfo {
    DocumentKind kind = DocumentKind::buffer;
    QString name;
    QString note;         ///< free text ("for the assay of lot 7"), may be empty
    QDateTime created_at; ///< UTC
    QDateTime updated_at; ///< UTC
    qint64 version = 0;   ///< schema step concurrency_schema_version on; 0 before it
    QString changed_by;   ///< login or name of the last save
    QString changed_at;   ///< UTC ISO 8601 of the last save
};

struct SavedDocument {
    DocumentKind kind = DocumentKind::buffer;
    QString name;
    QJsonObject document;
    QString note;
    /// For save_all: -1 writes whatever is stored (the demo, imports); 0 means the name must be
    /// new (refused with name_taken_error otherwise); above 0, the version it was loaded at
    /// (refused with conflict_error when the stored one differs).
    qint64 expected_version = -1;
};

/// One library entry: a reagent, system, solvent or additive, as the object of its data/ file.
struct LibraryEntry {
    QString
        kind; ///< the array it lives in, in its data/ file: "reagents", "systems", "solvents", …
    QString id;           ///< the entry's "id"
    QJsonObject document; ///< the whole entry
    QString
        source; ///< user entries: where the lab's numbers come from (required); shipped: the file
    bool user_defined = false;
    QDateTime updated_at; ///< UTC
    /// User entries from schema step row_version_schema_version on (0 before it, and for shipped
    /// ones): the version, who saved it last and when (UTC ISO 8601).
    qint64 version = 0;
    QString changed_by{};
    QString changed_at{};
};

/// PRAGMA application_id of a PhasePlan file ("PhPl").
inline constexpr qint32 phaseplan_application_id = 0x5068506c;

/// Limits on what is read back from the file (a record over them is set aside, not replayed):
/// the stored JSON text of one record, the entries of any one array in it, the characters of any
/// one string in it, and the characters of a saved document's name.
inline constexpr qsizetype max_record_bytes = 2 * 1024 * 1024;
inline constexpr qsizetype max_record_array_items = 5000;
inline constexpr qsizetype max_record_text_chars = 10000;
inline constexpr qsizetype max_name_chars = 200;
/// How long a save waits for another program's write lock before it says so (busy_timeout).
inline constexpr int busy_timeout_ms = 3000;

/// Why a stored JSON text is not read back (over one of the limits above), or empty when it fits.
QString oversize_reason(const QString& json_text);

/// A record that was not read back because it is over the limits (moved to the set_aside table
/// when the file is writable).
struct SetAsideRecord {
    QString source; ///< "sequences", "settings", … (the table)
    QString name;   ///< its name or key (cut to 80 characters)
    QString reason; ///< oversize_reason()
};

class Database {
  public:
    /// Called once, inside the transaction that creates a new file, to fill it (the demo).
    using Seed = std::function<void(Database&)>;

    /// Opens the file, creating it (and its folder) when absent, sets WAL and migrates the schema
    /// to `target_version` (the latest by default; tests pass an older one to build an old file).
    /// A new file is built under a temporary name with its schema and `seed` in one transaction and
    /// then moved into place without replacing anything, so two first runs cannot race and a kill
    /// never leaves a half-made file; `seed` never runs on an existing file.
    /// An existing file must be a PhasePlan database (application_id, or the tables of an older
    /// PhasePlan): anything else (another program's SQLite file, an empty file, not SQLite) is
    /// refused and left byte-identical. A file that cannot be written (permissions) or whose write
    /// lock another program holds past busy_timeout_ms is opened read-only: writable() is false
    /// and read_only_reason() says why, with the path.
    /// Throws Failure (Kind::database) when the file cannot be opened, is not PhasePlan's, or has
    /// a schema newer than this program knows.
    ///
    /// `path` may instead be a PostgreSQL URI (postgresql://user@host:port/dbname, or
    /// postgresql://user@/dbname?host=/socket/dir; sql::parse_postgresql_uri). The password comes
    /// from ~/.pgpass or PGPASSWORD, never from the URI. An empty database gets the schema and
    /// `seed` in one transaction (created() is true); one holding other tables but no PhasePlan
    /// schema is refused and left unchanged. Migrations run under the writers' advisory lock.
    explicit Database(const QString& path, int target_version = -1, Seed seed = {});
    ~Database();
    Database(const Database&) = delete;
    Database& operator=(const Database&) = delete;

    /// <AppDataLocation>/phaseplan.sqlite (e.g. ~/.local/share/PhasePlan/phaseplan.sqlite).
    static QString default_path();

    /// The file, or the PostgreSQL URI as given.
    QString path() const { return path_; }
    /// The back end: SQLite or PostgreSQL.
    sql::Dialect dialect() const { return dialect_; }
    bool is_postgresql() const { return dialect_ == sql::Dialect::postgresql; }
    /// True when this constructor created the file (and ran the seed).
    bool created() const { return created_; }
    /// False when the file is read-only or locked by another program: every write throws.
    bool writable() const { return read_only_reason_.isEmpty(); }
    /// Why saving is off, naming the file and who to ask; empty when writable.
    QString read_only_reason() const { return read_only_reason_; }
    /// Records over the read-back limits, set aside at open or skipped when read.
    const std::vector<SetAsideRecord>& set_aside() const { return set_aside_; }
    /// PRAGMA user_version of the open file (PostgreSQL: phaseplan_schema.version).
    int schema_version() const;
    /// PRAGMA journal_mode ("wal"); empty on PostgreSQL.
    QString journal_mode() const;
    /// The connection, for code that adds its own tables through a migration step (batches).
    /// Use Transaction around every write.
    QSqlDatabase connection() const { return db_; }

    // ---- saved work -------------------------------------------------------------------------
    /// Who the saves of this connection are recorded under (changed_by): the signed-in login, or
    /// the name typed at the bench. Empty by default.
    void set_actor(const QString& who) {
        actor_ = who.isNull() ? QStringLiteral("") : who.trimmed();
    }
    QString actor() const { return actor_; }
    /// True when the schema has versions (step concurrency_schema_version).
    bool versioned() const;

    /// Saves one document only if nobody saved it since it was loaded at `expected_version`
    /// (0: it must be new). One transaction: `UPDATE … WHERE name = ? AND version = ?` and the rows
    /// affected checked. Throws ConflictError (field "version", naming who changed it and when)
    /// when the stored version differs or the name is taken by a newer one; nothing is written
    /// then. Returns the version now stored.
    qint64 save_checked(DocumentKind kind, const QString& name, const QJsonObject& document,
                        const QString& note, qint64 expected_version);
    /// "Save as a copy" after a conflict: saves `document` under the first free name of "<name>
    /// (copy)", "<name> (copy 2)", … as a new document. Returns that name.
    QString save_copy(DocumentKind kind, const QString& name, const QJsonObject& document,
                      const QString& note);
    /// The version, who and when of a saved document (version 0 when absent).
    RowStamp stamp(DocumentKind kind, const QString& name) const;
    /// How `name` was left when no document is saved under it any more: renamed (to what) or
    /// removed, by whom and when (step retired_names_schema_version). Nothing when it never was,
    /// or on an older schema.
    std::optional<Retirement> retirement(DocumentKind kind, const QString& name) const;
    /// The name the document once saved as `name` is saved under now, following its renames
    /// (`name` itself when it is still there); empty when it was removed or never saved.
    QString current_name(DocumentKind kind, const QString& name) const;

    /// Inserts or replaces one document (one transaction), whatever its stored version (the demo,
    /// imports, tests; the app's editors use save_checked). Throws chem::Error("name", …) for an
    /// empty name.
    void save(DocumentKind kind, const QString& name, const QJsonObject& document,
              const QString& note = {});
    /// Saves several documents in one transaction: all or none land (a sequence with its methods,
    /// lines and buffers). Each document's expected_version is checked as save_checked does (a
    /// taken name for 0 throws name_taken_error, field "name"); the first refusal throws and
    /// nothing is written.
    void save_all(const std::vector<SavedDocument>& documents);
    std::optional<QJsonObject> load(DocumentKind kind, const QString& name) const;
    std::optional<DocumentInfo> info(DocumentKind kind, const QString& name) const;
    /// Newest first.
    std::vector<DocumentInfo> list(DocumentKind kind) const;
    /// Every kind, newest first.
    std::vector<DocumentInfo> list_all() const;
    /// True when something was removed.
    bool remove(DocumentKind kind, const QString& name);
    /// Throws chem::Error("name", …) when `new_name` is taken or empty; false when `old_name` is
    /// absent.
    bool rename(DocumentKind kind, const QString& old_name, const QString& new_name);
    /// Renames only if nobody saved `old_name` since it was loaded at `expected_version`, and
    /// `new_name` is free. Throws name_taken_error (field "name", naming who saved that name and
    /// when) or conflict_error (field "version": the record changed or was removed); nothing is
    /// written then. Returns the version now stored under `new_name`.
    qint64 rename_checked(DocumentKind kind, const QString& old_name, const QString& new_name,
                          qint64 expected_version);

    // ---- settings ---------------------------------------------------------------------------
    void set_setting(const QString& key, const QJsonValue& value);
    /// Null when unset.
    QJsonValue setting(const QString& key) const;

    // ---- library ----------------------------------------------------------------------------
    /// Records the shipped file `file_name` (e.g. "reagents.json"): when its content differs from
    /// what was recorded, every top-level array of objects with a string "id" replaces the shipped
    /// entries of that kind from this file. The lab's own entries are never touched. Returns true
    /// when the shipped entries changed (first run, or an update of data/).
    bool sync_shipped_file(const QString& file_name, const QByteArray& content);
    /// The last recorded content of a shipped file (empty when never seeded).
    QByteArray shipped_file(const QString& file_name) const;
    /// The lab's own entry: added, or edited from a shipped one (same id). `source` is required:
    /// throws chem::Error("source", …) when empty, chem::Error("id", …) when the document has no
    /// id. `expected_version` as SavedDocument's: -1 writes whatever is stored (imports, tests);
    /// 0: the entry must be new (a lab entry of that id is refused with name_taken_error, field
    /// "id"); above 0: the version it was loaded at (conflict_error, field "version", when it
    /// changed or was removed since). Recorded under actor(). Returns the version now stored (0
    /// before step row_version_schema_version).
    qint64 save_user_entry(const QString& kind, const QJsonObject& document, const QString& source,
                           qint64 expected_version = -1);
    /// Removes the lab's entry; with `expected_version` above 0 only from that version
    /// (conflict_error otherwise). True when something was removed.
    bool remove_user_entry(const QString& kind, const QString& id, qint64 expected_version = -1);
    /// A short text that changes whenever a lab entry is saved, removed or added (the count and the
    /// sum of their versions): the app rebuilds its library when it moved.
    QString user_entries_stamp() const;
    /// The version, who and when of the lab's entry (version 0 when there is none).
    RowStamp user_entry_stamp(const QString& kind, const QString& id) const;
    /// True when the lab's entries, instruments, columns, lots and accounts carry versions
    /// (step row_version_schema_version).
    bool rows_versioned() const;
    std::vector<LibraryEntry> shipped_entries(const QString& kind) const;
    std::vector<LibraryEntry> user_entries(const QString& kind) const;
    /// Shipped entries overlaid with the lab's own (same id: the user entry wins), ordered by id.
    std::vector<LibraryEntry> merged_entries(const QString& kind) const;
    /// The shipped file with each of its entry arrays replaced by merged_entries(kind), user
    /// entries of kinds the file holds appended: what the loaders in app/core read.
    QByteArray merged_file(const QString& file_name) const;

    /// Test seam: called inside every write transaction of this class just before COMMIT
    /// (tests/tst_storage.cpp kills the process there). Empty by default.
    void set_before_commit_hook(std::function<void()> hook) { before_commit_ = std::move(hook); }

    /// BEGIN IMMEDIATE … COMMIT, rolled back unless commit() ran (an exception in between).
    class Transaction {
      public:
        explicit Transaction(Database& db);
        ~Transaction();
        Transaction(const Transaction&) = delete;
        Transaction& operator=(const Transaction&) = delete;
        void commit();

      private:
        Database& db_;
        bool done_ = false;
        int depth_ = 0; ///< 1 for the outermost (BEGIN IMMEDIATE); more is a SAVEPOINT
    };

    /// Runs one statement with positional bindings and returns the executed query for reading
    /// rows. Throws Failure: Kind::database with one sentence (never the SQL), or
    /// Kind::connection_lost when the lab server's connection is gone (see reconnect()).
    QSqlQuery exec(const QString& sql, const QVariantList& bindings = {}) const;
    /// After a lost connection (PostgreSQL): checks the connection and opens it again if it is
    /// gone (with the password typed for this run, if any). True when it works again; a file is
    /// always connected.
    bool reconnect();
    /// Runs a schema statement with the type tokens of sql::render_ddl filled in for this back end.
    void exec_ddl(const QString& ddl) { exec(sql::render_ddl(dialect_, ddl)); }

  private:
    void open_connection(const QString& file, bool read_only);
    void open_postgresql(int target_version, const Seed& seed);
    /// Throws when the PostgreSQL database holds another program's tables (or application id).
    void refuse_foreign_postgresql() const;
    void close_connection();
    /// Throws Failure(Kind::connection_lost) when `e` says the server's connection is gone.
    void fail_lost_connection(const QSqlError& e) const;
    void configure();
    void probe_writable();
    void migrate(int target_version, const Seed& seed);
    void create_new(int target_version, const Seed& seed);
    void set_aside_oversized();
    /// The record's text when it fits the limits, else nothing (and noted in set_aside_).
    std::optional<QString> bounded(const QString& source, const QString& name,
                                   const QString& text) const;
    void upsert_document(const SavedDocument& d, const QString& now);
    /// save_checked's write, inside the caller's transaction; `taken_words` (a kind in words)
    /// turns a taken name for version 0 into name_taken_error.
    qint64 write_checked(DocumentKind kind, const QString& name, const QJsonObject& document,
                         const QString& note, qint64 expected_version, const QString& now,
                         const QString& taken_words);
    std::vector<DocumentInfo> list_where(DocumentKind kind) const;
    /// The version a document newly saved under `name` starts at: 1, or one above the last
    /// version a document had under that name before it was renamed away or removed.
    qint64 first_version(DocumentKind kind, const QString& name) const;
    /// The version of a document at `was` once renamed to `to`: one up, and above every version
    /// a document once had under `to`.
    qint64 renamed_version(DocumentKind kind, const QString& to, qint64 was) const;
    /// Records that `name` was left at `last_version` (renamed to `renamed_to`, or removed when it
    /// is empty), inside the caller's transaction.
    void retire(DocumentKind kind, const QString& name, qint64 last_version,
                const QString& renamed_to, const QString& now);
    /// The refusal of a checked write to `name`: who renamed or removed it, or who changed it.
    ConflictError refusal(DocumentKind kind, const QString& name) const;

    QString path_;
    sql::Dialect dialect_ = sql::Dialect::sqlite;
    QString connection_name_;
    QSqlDatabase db_;
    std::function<void()> before_commit_;
    QString read_only_reason_;
    QString actor_ = QStringLiteral("");
    bool created_ = false;
    int transaction_depth_ = 0;
    mutable std::vector<SetAsideRecord> set_aside_;
    /// versioned() once seen true: a schema only moves forward, so it is not asked again (it was
    /// a query on every save and rename).
    mutable bool versioned_seen_ = false;
};

/// The schema steps (app/storage/migrations.cpp). Step i brings the file from version i to i+1.
struct Migration {
    int version;                          ///< the version after this step (1, 2, 3, … in order)
    const char* summary;                  ///< one line, for the log and the contributor guide
    std::function<void(Database&)> apply; ///< runs inside the step's transaction
};
const std::vector<Migration>& migrations();
int latest_schema_version();

} // namespace phaseplan::storage
