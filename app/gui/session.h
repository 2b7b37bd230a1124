#pragma once
// Who is at the tablet: the signed-in account for the lab's record (Prepare & record).
//
// When the database has accounts, recording a batch (creating, editing, amending, printing,
// signing) needs someone signed in, and every change is recorded under their login. After the
// lab's idle time without a touch, key or click, the session locks: the same person continues
// with their password, or anyone switches user by signing in. A database without accounts (a
// lab's first run) asks for the first administrator instead. The administrator manages accounts
// and records nothing (storage::may_edit_records).
//
// The idle time is the lab's, not the tablet's: it is kept in the database's settings
// ("session.idle_minutes", 1–240, default 10).
#include "workspace.h"

#include <QObject>
#include <QPointer>
#include <QQmlEngine>
#include <QString>
#include <QTimer>

namespace phaseplan::gui {

class Session : public QObject {
    Q_OBJECT
    QML_ELEMENT
    Q_PROPERTY(phaseplan::gui::Workspace* workspace READ workspace WRITE setWorkspace NOTIFY
                   workspaceChanged)
    /// The database has at least one account: recording needs a signed-in user.
    Q_PROPERTY(bool accountsExist READ accountsExist NOTIFY changed)
    /// The demo's accounts (README, demo only) are in this database and not locked: the sign-in
    /// card says so, so that a newcomer can try the demo and a lab knows to lock them.
    Q_PROPERTY(bool demoAccountsOpen READ demoAccountsOpen NOTIFY changed)
    Q_PROPERTY(bool signedIn READ signedIn NOTIFY changed)
    /// Signed in, but idle past the lab's idle time: the password continues the session.
    Q_PROPERTY(bool locked READ locked NOTIFY changed)
    /// The lock came from the idle timer (not from Lock).
    Q_PROPERTY(bool lockedByIdle READ lockedByIdle NOTIFY changed)
    Q_PROPERTY(QString login READ login NOTIFY changed)
    Q_PROPERTY(QString displayName READ displayName NOTIFY changed)
    /// "preparer", "reviewer", "approver", "administrator" ("" when nobody is signed in).
    Q_PROPERTY(QString role READ role NOTIFY changed)
    /// Signed in, not locked, and a role that records (not the administrator).
    Q_PROPERTY(bool canRecord READ canRecord NOTIFY changed)
    /// The lab's idle time before the session locks, in minutes (1–240).
    Q_PROPERTY(int idleMinutes READ idleMinutes NOTIFY changed)
    /// The last failure: the field it names ("login", "password", "name", "repeat",
    /// "idle_minutes") and the message ("" after a success).
    Q_PROPERTY(QString errorField READ errorField NOTIFY errorChanged)
    Q_PROPERTY(QString errorMessage READ errorMessage NOTIFY errorChanged)

  public:
    explicit Session(QObject* parent = nullptr);
    ~Session() override;

    Workspace* workspace() const { return workspace_; }
    void setWorkspace(Workspace* w);

    bool accountsExist() const;
    bool demoAccountsOpen() const;
    bool signedIn() const { return !login_.isEmpty(); }
    bool locked() const { return locked_; }
    bool lockedByIdle() const { return locked_ && locked_by_idle_; }
    QString login() const { return login_; }
    QString displayName() const { return display_name_; }
    QString role() const { return role_; }
    bool canRecord() const;
    int idleMinutes() const;
    QString errorField() const { return error_field_; }
    QString errorMessage() const { return error_message_; }

    /// Checks login and password (a wrong one counts towards the account's lock). Replaces
    /// whoever was signed in (quick user switch). False with errorField "login"/"password".
    Q_INVOKABLE bool signIn(const QString& login, const QString& password);
    /// Continues a locked session with the same person's password.
    Q_INVOKABLE bool unlock(const QString& password);
    /// Locks now (the idle timer calls this).
    Q_INVOKABLE void lock();
    /// Nobody signed in.
    Q_INVOKABLE void signOut();
    /// The lab's first administrator, only while the database has no accounts; signs them in.
    Q_INVOKABLE bool createAdministrator(const QString& login, const QString& name,
                                         const QString& password, const QString& repeat);
    /// The administrator signed in adds an account ("preparer", "reviewer", "approver" or
    /// "administrator"). False with errorField "login", "display_name", "role", "password" or
    /// "repeat".
    Q_INVOKABLE bool addAccount(const QString& login, const QString& name, const QString& role,
                                const QString& password, const QString& repeat);
    /// An administrator sets the lab's idle time (minutes, 1–240).
    Q_INVOKABLE bool setIdleMinutes(int minutes);

    /// Test seam: what counts as activity restarts the idle timer (the app filters input events).
    void noteActivity();
    /// Test seam: the idle timer's state and interval (ms), and its expiry without waiting.
    bool idleTimerActive() const { return idle_.isActive(); }
    int idleTimerIntervalMs() const { return idle_.interval(); }
    void expireIdleTimer();

  signals:
    void workspaceChanged();
    void changed();
    void errorChanged();
    void accountAdded(const QString& login);

  protected:
    bool eventFilter(QObject* watched, QEvent* event) override;

  private:
    bool fail(const QString& field, const QString& message);
    void succeed();
    void start_idle_timer();

    QPointer<Workspace> workspace_;
    QString login_, display_name_, role_;
    bool locked_ = false;
    bool locked_by_idle_ = false;
    QString error_field_, error_message_;
    QTimer idle_;
};

} // namespace phaseplan::gui
