#include "workspace.h"

#include "column_library.h"

#include "chem/error.h"
#include "core/date_time.h"
#include "core/failure.h"
#include "core/solvent_data.h"
#include "storage/demo.h"

#include <QCryptographicHash>
#include <QDir>
#include <QElapsedTimer>
#include <QFile>
#include <QFileInfo>
#include <QJsonArray>
#include <QJsonDocument>
#include <QSaveFile>
#include <QStandardPaths>
#include <QSysInfo>

namespace phaseplan::gui {

namespace {

QByteArray read_all(const QString& path) {
    QFile f(path);
    if (!f.open(QIODevice::ReadOnly))
        return {};
    return f.readAll();
}

/// Who saves are recorded under when nobody is signed in and no name was typed: the computer's
/// user, else the computer.
QString fallback_actor() {
    for (const char* v : {"USER", "LOGNAME", "USERNAME"})
        if (const QString u = qEnvironmentVariable(v).trimmed(); !u.isEmpty())
            return u;
    return QStringLiteral("the bench %1").arg(QSysInfo::machineHostName());
}
} // namespace

Workspace::Workspace(QObject* parent) : QObject(parent) {
    change_poll_.setInterval(change_poll_interval_ms);
    connect(&change_poll_, &QTimer::timeout, this, &Workspace::pollChanges);
    reconnect_.setInterval(5000); // ms: "tries again every 5 s", as the banner says
    connect(&reconnect_, &QTimer::timeout, this, &Workspace::retryConnection);
}

void Workspace::setActor(const QString& who) {
    if (who.trimmed() == actor_)
        return;
    actor_ = who.trimmed();
    if (db_)
        db_->set_actor(actor_.isEmpty() ? fallback_actor() : actor_);
    emit actorChanged();
}

bool Workspace::pollChanges() {
    if (!db_ || connection_lost_)
        return false; // while the connection is lost, retryConnection() is what tries
    qint64 counter = last_change_counter_;
    QString library = library_stamp_;
    try {
        counter = storage::change_counter(db_->connection());
        if (counter != last_change_counter_)
            library = db_->user_entries_stamp();
    } catch (const Failure& f) {
        if (f.kind() == Failure::Kind::connection_lost)
            connectionLost(); // says so, and tries again every 5 s
        return false;
    } catch (const chem::Error&) {
        return false;
    }
    if (counter == last_change_counter_)
        return false;
    last_change_counter_ = counter;
    if (library != library_stamp_)
        reloadLibrary(); // a lab entry saved or removed on another bench (or this one)
    emit databaseChanged();
    emit savedChanged();
    return true;
}
Workspace::~Workspace() = default;

void Workspace::setDatabasePath(const QString& p) {
    if (p == database_path_)
        return;
    database_path_ = p;
    emit databasePathChanged();
}

void Workspace::setDataDir(const QString& d) {
    if (d == data_dir_)
        return;
    data_dir_ = d;
    emit dataDirChanged();
}

void Workspace::componentComplete() {
    if (!db_)
        open();
}

QDateTime Workspace::now() const {
    const QByteArray fixed = qgetenv("PHASEPLAN_NOW");
    if (!fixed.isEmpty()) {
        const QDateTime t = QDateTime::fromString(QString::fromLatin1(fixed), Qt::ISODate);
        if (t.isValid())
            return as_wall_clock(t);
    }
    return wall_clock_now(); // wall clock, as the plan counts
}

QString Workspace::demoName() {
    return storage::demo_sequence_name();
}

bool Workspace::open() {
    if (db_)
        return true;
    error_.clear();
    error_field_.clear();
    error_sentence_.clear();
    open_times_ = {};
    QElapsedTimer phase;
    phase.start();
    auto lap = [&phase](double& ms) {
        ms = phase.nsecsElapsed() / 1e6;
        phase.restart();
    };
    try {
        const QString dir = data_dir_.isEmpty() ? find_data_dir() : data_dir_;
        data_ = load_app_data(dir); // validates the shipped files as they are
        lap(open_times_.data_ms);
        const QString path =
            database_path_.isEmpty() ? storage::Database::default_path() : database_path_;
        // The demo goes only into a new file, inside the transaction that creates it: an existing
        // file is never seeded again, whatever its settings say.
        db_ = std::make_unique<storage::Database>(path, -1, [this](storage::Database& db) {
            if (seed_demo_on_)
                seed_demo(db);
        });
        first_run_ = db_->created();
        db_->set_actor(actor_.isEmpty() ? fallback_actor() : actor_);
        lap(open_times_.database_ms);
        if (db_->writable())
            for (const char* file : shipped_library_files) {
                const QByteArray bytes = read_all(dir + "/" + file);
                if (!bytes.isEmpty())
                    db_->sync_shipped_file(QString::fromLatin1(file), bytes);
            }
        lap(open_times_.sync_ms);
        reloadLibrary();
        lap(open_times_.library_ms);
        last_change_counter_ = storage::change_counter(db_->connection());
        change_poll_.start();
        if (!db_->writable())
            qInfo("PhasePlan: %s", qPrintable(db_->read_only_reason()));
    } catch (const chem::Error& e) {
        // An address typed wrong ("database.port", "database.password", …).
        error_ = QString::fromStdString(e.what());
        error_field_ = QString::fromStdString(e.field());
        error_sentence_ = QString::fromStdString(e.message());
        db_.reset();
        qWarning("PhasePlan: %s", qPrintable(error_));
    } catch (const Failure& f) {
        // The file or the server: the start screen says it (errorField "database").
        error_ = QString::fromStdString(f.line());
        error_field_ = QString::fromLatin1(f.subject());
        error_sentence_ = QString::fromStdString(f.sentence());
        db_.reset();
        qWarning("PhasePlan: %s", qPrintable(error_));
    }
    emit readyChanged();
    emit storageNoticeChanged();
    return db_ != nullptr;
}

QString Workspace::storageNotice() const {
    if (!db_)
        return {};
    QStringList parts;
    if (connection_lost_)
        parts << tr("The lab database has been out of reach since %1. What is on screen stays; "
                    "PhasePlan tries again every 5 s and saves your edits when it is back. "
                    "Meanwhile they are kept on this tablet, in %2.")
                     .arg(lost_since_.time().toString(QStringLiteral("HH:mm")), unsavedFile());
    if (!db_->writable())
        parts << db_->read_only_reason();
    if (!save_failure_.isEmpty())
        parts << save_failure_;
    QStringList aside;
    for (const storage::SetAsideRecord& r : db_->set_aside())
        aside << QStringLiteral("%1 \"%2\" (%3)").arg(r.source, r.name, r.reason);
    if (!aside.isEmpty())
        parts << tr("Too large to open, set aside in the database and not shown: %1.")
                     .arg(aside.join(QStringLiteral("; ")));
    return parts.join(QLatin1Char(' '));
}

void Workspace::saveFailed(const QString& what, const QString& message, const QString& field,
                           const QString& key, const QJsonObject& document) {
    if (!key.isEmpty() && !document.isEmpty()) {
        QJsonObject kept = read_kept();
        kept.insert(key, QJsonObject{{"what", what},
                                     {"document", document},
                                     {"kept_at", wall_clock_iso(now())}});
        write_kept(kept);
    }
    if (field == QLatin1String(Failure::subject_of(Failure::Kind::connection_lost))) {
        connectionLost();
        return;
    }
    // SQLite's words for the two usual causes, said as the bench would say them.
    QString why = message;
    const QString file = db_ ? db_->path() : database_path_;
    if (message.contains(QLatin1String("disk is full")))
        why = tr("the disk that holds %1 is full").arg(file);
    else if (message.contains(QLatin1String("readonly")))
        why = tr("%1 cannot be written to").arg(file);
    const QString text = tr("Could not save %1: %2. Your edits are still on screen; they are saved "
                            "again with the next change.")
                             .arg(what, why);
    if (text == save_failure_)
        return;
    save_failure_ = text;
    emit storageNoticeChanged();
}

void Workspace::saveSucceeded(const QString& key) {
    if (!key.isEmpty()) {
        QJsonObject kept = read_kept();
        if (kept.contains(key)) {
            kept.remove(key);
            write_kept(kept);
        }
    }
    if (save_failure_.isEmpty())
        return;
    save_failure_.clear();
    emit storageNoticeChanged();
}

QJsonObject Workspace::keptLocally(const QString& key) const {
    return read_kept().value(key).toObject().value(QLatin1String("document")).toObject();
}

QString Workspace::unsavedFile() const {
    const QString location = db_ ? db_->path() : database_path_;
    const QByteArray id =
        QCryptographicHash::hash(location.toUtf8(), QCryptographicHash::Sha1).toHex().left(16);
    QString dir = QStandardPaths::writableLocation(QStandardPaths::AppDataLocation);
    if (dir.isEmpty())
        dir = QDir::homePath() + QStringLiteral("/.phaseplan");
    return dir + QStringLiteral("/unsaved/") + QString::fromLatin1(id) + QStringLiteral(".json");
}

QJsonObject Workspace::read_kept() const {
    QFile f(unsavedFile());
    if (!f.open(QIODevice::ReadOnly))
        return {};
    return QJsonDocument::fromJson(f.readAll()).object();
}

void Workspace::write_kept(const QJsonObject& kept) const {
    const QString path = unsavedFile();
    if (kept.isEmpty()) {
        QFile::remove(path);
        return;
    }
    QDir().mkpath(QFileInfo(path).absolutePath());
    QSaveFile f(path); // written whole or not at all
    if (!f.open(QIODevice::WriteOnly))
        return;
    f.write(QJsonDocument(kept).toJson(QJsonDocument::Indented));
    f.commit();
}

void Workspace::failureSeen(const QString& subject) {
    if (subject == QLatin1String(Failure::subject_of(Failure::Kind::connection_lost)))
        connectionLost();
}

void Workspace::connectionLost() {
    if (connection_lost_)
        return;
    connection_lost_ = true;
    lost_since_ = now();
    reconnect_.start();
    emit storageNoticeChanged();
}

bool Workspace::retryConnection() {
    if (!db_)
        return false;
    if (!db_->reconnect()) {
        connectionLost(); // a first failure found here starts the timer too
        return false;
    }
    const bool was_lost = connection_lost_;
    connection_lost_ = false;
    reconnect_.stop();
    if (was_lost) {
        emit storageNoticeChanged();
        emit connectionRestored();
        pollChanges(); // what other benches did meanwhile
    }
    return true;
}

void Workspace::reloadLibrary() {
    if (!db_)
        return;
    // The shipped library with the lab's entries in place of shipped ones of the same id: the
    // same loader as data/reagents.json, so a lab entry is checked exactly like a shipped one.
    // A lab entry that no longer loads (a shipped system it names was renamed, say) must not
    // lock the lab out: the last good library stays and the problem is shown on the Library screen.
    try {
        library_stamp_ = db_->user_entries_stamp();
        chem::Library lib;
        load_reagents_json(db_->merged_file(QStringLiteral("reagents.json")),
                           "library reagents.json", lib);
        chem::SolventLibrary solvents;
        const QByteArray solvent_file = db_->merged_file(QStringLiteral("solvents.json"));
        if (!db_->shipped_file(QStringLiteral("solvents.json")).isEmpty())
            load_solvents_json(solvent_file, "library solvents.json", solvents);
        else
            solvents = data_.solvents;
        data_.reagents = std::move(lib);
        data_.solvents = std::move(solvents);
        library_problem_.clear();
    } catch (const chem::Error& e) {
        library_problem_ = QString::fromStdString(e.what());
    } catch (const Failure& f) {
        library_problem_ = QString::fromStdString(f.line());
    }
    names_.clear();
    for (const QString& kind : {QStringLiteral("solvents"), QStringLiteral("additives")})
        for (const storage::LibraryEntry& e : db_->merged_entries(kind)) {
            const QString n = e.document.value(QLatin1String("name")).toString();
            if (!n.isEmpty())
                names_[e.id] = n;
        }
    ++library_revision_;
    emit libraryChanged();
}

std::vector<storage::LibraryEntry> Workspace::entries(const QString& kind) const {
    if (!db_)
        return {};
    return db_->merged_entries(kind);
}

QVariant Workspace::setting(const QString& key) const {
    if (!db_)
        return {};
    const QJsonValue v = db_->setting(key);
    return v.isNull() ? QVariant() : v.toVariant();
}

void Workspace::setSetting(const QString& key, const QVariant& value) {
    if (!db_ || !db_->writable())
        return; // the banner says that nothing is saved
    try {
        db_->set_setting(key, QJsonValue::fromVariant(value));
    } catch (const Failure& f) {
        qWarning("PhasePlan: %s", f.what());
    } catch (const chem::Error& e) {
        qWarning("PhasePlan: %s", e.what());
    }
}

QString Workspace::displayName(const QString& id) const {
    if (const chem::Reagent* r = data_.reagents.find_reagent(id.toStdString()))
        return QString::fromStdString(r->name);
    auto it = names_.find(id);
    return it != names_.end() ? it->second : id;
}

QJsonObject Workspace::demoDocument() const {
    const QString dir = data_.data_dir.isEmpty() ? find_data_dir() : data_.data_dir;
    const QByteArray bytes = read_all(dir + "/demo/overnight-sequence.json");
    return QJsonDocument::fromJson(bytes).object();
}

void Workspace::seed_demo(storage::Database& db) const {
    // The demo sequence and its parts, the demo people and the demo batch with its trail.
    storage::seed_demo(db, data_.data_dir.isEmpty() ? find_data_dir() : data_.data_dir);
    seed_demo_columns(db);
}

} // namespace phaseplan::gui
