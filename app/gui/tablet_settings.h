#pragma once
// Settings of this tablet (not of the lab's database): the on-screen keyboard and which database
// to open. Kept with QSettings under "tablet/"; both are read before the application starts
// (Qt reads its input method, QT_IM_MODULE, once; the database is opened once).
#include <QObject>
#include <QQmlEngine>

namespace phaseplan::gui {

/// Applies the on-screen keyboard choice for this run, before QApplication exists: the command
/// line's `--keyboard on|off` wins (and is kept), else the saved setting. Sets QT_IM_MODULE to
/// Qt Virtual Keyboard when on; an input method already chosen in the environment is left alone
/// when off. @return whether the keyboard is on for this run.
bool apply_keyboard_choice(int argc, char** argv);

/// The database chosen in the settings for the next starts: a file path or a
/// postgresql://user@host:port/dbname address; "" for this tablet's own file
/// (storage::Database::default_path). `phaseplan --database` overrides it for one run.
QString saved_database_location();
/// What this run opened, for the settings card to show (set once by run_app).
void set_database_in_use(const QString& location);

class TabletSettings : public QObject {
    Q_OBJECT
    QML_ELEMENT
    QML_SINGLETON
    /// The saved choice: an on-screen keyboard at the next start.
    Q_PROPERTY(bool keyboardEnabled READ keyboardEnabled WRITE setKeyboardEnabled NOTIFY
                   keyboardEnabledChanged)
    /// The on-screen keyboard is the input method of this run (QT_IM_MODULE).
    Q_PROPERTY(bool keyboardActive READ keyboardActive CONSTANT)
    /// The saved database choice (saved_database_location), "" for this tablet's own file.
    Q_PROPERTY(QString database READ database NOTIFY databaseChanged)
    /// The database this run uses (a path, or the address without any password).
    Q_PROPERTY(QString databaseInUse READ databaseInUse CONSTANT)

  public:
    explicit TabletSettings(QObject* parent = nullptr) : QObject(parent) {}
    bool keyboardEnabled() const;
    void setKeyboardEnabled(bool on);
    bool keyboardActive() const;
    QString database() const;
    QString databaseInUse() const;
    /// Saves `location` for the next starts after checking its form: "" (this tablet's own
    /// file), a full path to a file in an existing folder, or a PostgreSQL address without a
    /// password. @return "" when saved, else one sentence naming the value (nothing saved).
    Q_INVOKABLE QString setDatabase(const QString& location);

  signals:
    void keyboardEnabledChanged();
    void databaseChanged();
};

} // namespace phaseplan::gui
