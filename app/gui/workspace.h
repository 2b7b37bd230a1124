#pragma once
// The app's context for every model: the shipped data (data/), the lab's database, and the
// library as the lab sees it (shipped entries overlaid with the lab's own). Models take a
// Workspace as a property, so a test builds one on a temporary file and nothing is global.
#include "core/app_data.h"
#include "storage/database.h"

#include <QDateTime>
#include <QJsonObject>
#include <QObject>
#include <QQmlEngine>
#include <QQmlParserStatus>
#include <QTimer>

#include <map>
#include <memory>

namespace phaseplan::gui {

class Workspace : public QObject, public QQmlParserStatus {
    Q_OBJECT
    QML_ELEMENT
    Q_INTERFACES(QQmlParserStatus)
    /// The SQLite file; empty means Database::default_path(). Set before open().
    Q_PROPERTY(
        QString databasePath READ databasePath WRITE setDatabasePath NOTIFY databasePathChanged)
    /// The data/ folder; empty means find_data_dir().
    Q_PROPERTY(QString dataDir READ dataDir WRITE setDataDir NOTIFY dataDirChanged)
    /// True once the data and the database are open.
    Q_PROPERTY(bool ready READ ready NOTIFY readyChanged)
    /// Why open() failed ("database: cannot open …"), empty when it did not.
    Q_PROPERTY(QString errorMessage READ errorMessage NOTIFY readyChanged)
    /// Bumped whenever the library changes (a lab entry saved or removed): models recompute.
    Q_PROPERTY(int libraryRevision READ libraryRevision NOTIFY libraryChanged)
    /// Why the lab's own library entries could not be used (the shipped library is in use), or "".
    Q_PROPERTY(QString libraryProblem READ libraryProblem NOTIFY libraryChanged)
    /// True when this open created the database (first run): the demo was seeded.
    Q_PROPERTY(bool firstRun READ firstRun NOTIFY readyChanged)
    /// False when the database is read-only or locked by another program: nothing is saved.
    Q_PROPERTY(bool canSave READ canSave NOTIFY readyChanged)
    /// What the banner says about the database: why saving is off (with the path and who to ask),
    /// and the records set aside as too large to read back; empty when all is well.
    Q_PROPERTY(QString storageNotice READ storageNotice NOTIFY storageNoticeChanged)
    /// Who this bench's saves of buffers, lines, methods and sequences are recorded under
    /// (changed_by, app/storage/versioning.h): the signed-in login, else the name typed at the
    /// bench; empty means the computer's user name.
    Q_PROPERTY(QString actor READ actor WRITE setActor NOTIFY actorChanged)

  public:
    explicit Workspace(QObject* parent = nullptr);
    ~Workspace() override;

    QString databasePath() const { return database_path_; }
    void setDatabasePath(const QString& p);
    QString dataDir() const { return data_dir_; }
    void setDataDir(const QString& d);
    /// A new database gets the demo (sequence, buffers, people, signed batch) unless this is
    /// off (`phaseplan --no-demo`): then it starts empty, with no accounts, and Prepare & record
    /// creates the lab's first administrator. An existing file is never seeded either way.
    void setSeedDemo(bool on) { seed_demo_on_ = on; }
    bool ready() const { return db_ != nullptr; }
    QString errorMessage() const { return error_; }
    /// The field of the error open() failed with ("database.password" when the lab's server
    /// refused or wanted a password), and its sentence without the field.
    QString errorField() const { return error_field_; }
    QString errorSentence() const { return error_sentence_; }
    int libraryRevision() const { return library_revision_; }
    bool firstRun() const { return first_run_; }
    QString libraryProblem() const { return library_problem_; }
    bool canSave() const { return db_ && db_->writable(); }
    QString storageNotice() const;
    QString actor() const { return actor_; }
    void setActor(const QString& who);

    /// How often other benches' changes are looked for, ms: one SELECT of the database's change
    /// counter (storage::change_counter). Changes appear within this time, without a restart.
    static constexpr int change_poll_interval_ms = 3000;
    /// The timer that calls pollChanges() (running once the database is open).
    const QTimer& changePollTimer() const { return change_poll_; }
    /// Reads the change counter; when it moved since the last look (a save on any bench, this
    /// one included), emits databaseChanged() and savedChanged(), and rebuilds the library when
    /// the lab's own entries changed (libraryChanged). True when it moved.
    Q_INVOKABLE bool pollChanges();

    /// Loads data/, opens (creating, migrating) the database, syncs the shipped library files into
    /// it, builds the merged library and seeds the demo on first run. False with errorMessage set
    /// on failure. Called by componentComplete() when created in QML.
    Q_INVOKABLE bool open();
    /// What the last open() spent on each phase (ms, wall clock), for `phaseplan --measure`:
    /// reading the shipped data, the database (open, migrate, first-run demo), syncing the shipped
    /// library into it, and the merged library.
    struct OpenTimes {
        double data_ms = 0, database_ms = 0, sync_ms = 0, library_ms = 0;
    };
    const OpenTimes& openTimes() const { return open_times_; }

    /// The data every core command reads: the library includes the lab's own entries.
    const AppData& data() const { return data_; }
    /// Null until open() succeeded.
    storage::Database* database() const { return db_.get(); }

    /// Rebuilds the merged library after a lab entry changed; emits libraryChanged. When the merged
    /// library does not load, keeps the last good one and sets libraryProblem.
    void reloadLibrary();

    /// Shipped entries of a data/ array ("solvents", "additives", …) overlaid with the lab's own.
    std::vector<storage::LibraryEntry> entries(const QString& kind) const;
    /// Display name of a reagent, solvent or additive id (the id itself when unknown).
    Q_INVOKABLE QString displayName(const QString& id) const;
    /// The wall-clock time now: the system clock, or $PHASEPLAN_NOW ("2026-12-02T14:00:00") when
    /// set, so that tests and screenshots see the same "today" on every run.
    QDateTime now() const;
    /// Today's date as `now()` sees it (for "today 18:00" on the screens).
    QDate today() const { return now().date(); }
    /// A setting of the app kept in the database (the screen last shown, …); undefined when unset.
    Q_INVOKABLE QVariant setting(const QString& key) const;
    Q_INVOKABLE void setSetting(const QString& key, const QVariant& value);
    /// Tell the saved-work list that something was saved or removed.
    void notifySaved() { emit savedChanged(); }
    /// A save of `what` ("the buffer \"Line A\"") failed with `message`: the banner says so
    /// (the edits stay on screen) until a later save succeeds (saveSucceeded()). Nothing is
    /// attempted while the database is read-only: canSave() is checked first by the callers.
    /// A failure with field "database.connection" (the lab server is out of reach) starts the
    /// reconnection (retryConnection every 5 s) and says so. With a `key` ("plan", "buffer:NAME")
    /// the unsaved `document` is also kept on this tablet (unsavedFile()) until a save under
    /// that key succeeds, so that closing the app loses nothing.
    void saveFailed(const QString& what, const QString& message, const QString& field = {},
                    const QString& key = {}, const QJsonObject& document = {});
    /// A save succeeded: the banner's failure goes, and so does the copy kept under `key`.
    void saveSucceeded(const QString& key = {});
    /// The document kept on this tablet under `key` by an earlier failed save (this run or a
    /// previous one), empty when none. It stays kept until saveSucceeded(key).
    QJsonObject keptLocally(const QString& key) const;
    /// Where unsaved documents are kept: one JSON file per database, in the app's data folder.
    QString unsavedFile() const;
    /// False while the lab database is out of reach (see retryConnection).
    bool connected() const { return !connection_lost_; }
    /// Tries the lab database again (the timer calls this every 5 s while it is lost). On
    /// success the banner clears and connectionRestored() tells the models to save again.
    Q_INVOKABLE bool retryConnection();
    /// The connection was seen lost (a failed save, or the change poll).
    void connectionLost();
    /// A model met a Failure (core/failure.h) with this subject (its FieldError's field): a lost
    /// connection goes to the banner and starts the reconnection, like a failed save. Other
    /// failures stay the model's notice.
    void failureSeen(const QString& subject);
    const QTimer& reconnectTimer() const { return reconnect_; }

    /// data/demo/overnight-sequence.json, empty when absent.
    QJsonObject demoDocument() const;
    /// The name the demo sequence is saved under.
    static QString demoName();

    void classBegin() override {}
    void componentComplete() override;

    /// Tells every ColumnLibrary that the columns table changed.
    void notifyColumnsChanged() { emit columnsChanged(); }

  signals:
    void databasePathChanged();
    void dataDirChanged();
    void readyChanged();
    void libraryChanged();
    void savedChanged();
    void storageNoticeChanged();
    /// The lab's columns (the `columns` table) changed: every ColumnLibrary reloads.
    void columnsChanged();
    void actorChanged();
    /// A saved document, batch or signature changed in the database (pollChanges): models with
    /// an open record compare its version and reload it, or say it changed elsewhere.
    void databaseChanged();
    /// The lab database is reachable again after a lost connection: save what is pending.
    void connectionRestored();

  private:
    void write_kept(const QJsonObject& kept) const;
    QJsonObject read_kept() const;
    void seed_demo(storage::Database& db) const;
    bool seed_demo_on_ = true;
    OpenTimes open_times_;

    QString database_path_;
    QString data_dir_;
    QString error_;
    QString error_field_, error_sentence_;
    QString library_problem_;
    AppData data_;
    std::unique_ptr<storage::Database> db_;
    std::map<QString, QString> names_; ///< solvent and additive names by id
    QString save_failure_; ///< the last failed save, shown on the banner; empty once one succeeds
    int library_revision_ = 0;
    bool first_run_ = false;
    QString actor_;
    QTimer change_poll_;
    qint64 last_change_counter_ = -1;
    QString library_stamp_; ///< Database::user_entries_stamp() when the library was last built
    bool connection_lost_ = false;
    QDateTime lost_since_;
    QTimer reconnect_;
};

/// The shipped files whose entries go into the database (and may be overridden by the lab).
inline constexpr const char* shipped_library_files[] = {"reagents.json", "solvents.json"};

} // namespace phaseplan::gui
