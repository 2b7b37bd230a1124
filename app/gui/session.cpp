#include "session.h"

#include "chem/error.h"
#include "core/failure.h"
#include "storage/accounts.h"
#include "storage/audit_trail.h"
#include "storage/database.h"
#include "storage/demo.h"

#include <QCoreApplication>
#include <QEvent>
#include <QJsonValue>

namespace phaseplan::gui {

namespace {

constexpr int default_idle_minutes = 10;
constexpr int max_idle_minutes = 240;
const QString idle_key = QStringLiteral("session.idle_minutes");

} // namespace

Session::Session(QObject* parent) : QObject(parent) {
    idle_.setSingleShot(true);
    connect(&idle_, &QTimer::timeout, this, &Session::expireIdleTimer);
    if (QCoreApplication::instance())
        QCoreApplication::instance()->installEventFilter(this);
}

Session::~Session() {
    if (QCoreApplication::instance())
        QCoreApplication::instance()->removeEventFilter(this);
}

void Session::setWorkspace(Workspace* w) {
    if (workspace_ == w)
        return;
    workspace_ = w;
    login_.clear();
    display_name_.clear();
    role_.clear();
    locked_ = false;
    emit workspaceChanged();
    emit changed();
}

bool Session::demoAccountsOpen() const {
    if (!accountsExist())
        return false;
    try {
        const storage::AccountStore store(workspace_->database()->connection());
        for (const storage::DemoUser& u : storage::demo_users()) {
            const std::optional<storage::Account> a = store.find(QString::fromLatin1(u.login));
            if (a && !a->locked)
                return true;
        }
    } catch (const chem::Error&) {
        return false;
    } catch (const Failure&) {
        return false; // a lost connection: the banner says so; no hint meanwhile
    }
    return false;
}

bool Session::accountsExist() const {
    if (!workspace_ || !workspace_->database())
        return false;
    const QSqlDatabase c = workspace_->database()->connection();
    if (!storage::has_audit_schema(c))
        return false;
    bool any = false;
    try {
        any = storage::AccountStore(c).any();
    } catch (const chem::Error&) {
        any = false;
    } catch (const Failure&) {
        any = false;
    }
    return any;
}

bool Session::canRecord() const {
    return signedIn() && !locked_ && role_ != QLatin1String("administrator");
}

int Session::idleMinutes() const {
    if (!workspace_ || !workspace_->database())
        return default_idle_minutes;
    const int m = workspace_->database()->setting(idle_key).toInt(default_idle_minutes);
    return m >= 1 && m <= max_idle_minutes ? m : default_idle_minutes;
}

bool Session::fail(const QString& field, const QString& message) {
    error_field_ = field;
    error_message_ = message;
    emit errorChanged();
    return false;
}

void Session::succeed() {
    if (error_field_.isEmpty() && error_message_.isEmpty())
        return;
    error_field_.clear();
    error_message_.clear();
    emit errorChanged();
}

void Session::start_idle_timer() {
    if (signedIn() && !locked_)
        idle_.start(idleMinutes() * 60 * 1000);
    else
        idle_.stop();
}

bool Session::signIn(const QString& login, const QString& password) {
    if (!workspace_ || !workspace_->database())
        return fail(QStringLiteral("login"), tr("no database is open"));
    if (login.trimmed().isEmpty())
        return fail(QStringLiteral("login"), tr("enter your login"));
    try {
        const storage::Account a = storage::AccountStore(workspace_->database()->connection())
                                       .authenticate(login.trimmed(), password);
        login_ = a.login;
        display_name_ = a.display_name;
        role_ = storage::role_name(a.role);
        locked_ = false;
    } catch (const chem::Error& e) {
        return fail(QString::fromStdString(e.field()), QString::fromStdString(e.message()));
    } catch (const Failure& f) {
        return fail(QString::fromLatin1(f.subject()), QString::fromStdString(f.sentence()));
    }
    succeed();
    start_idle_timer();
    emit changed();
    return true;
}

bool Session::unlock(const QString& password) {
    if (!signedIn())
        return fail(QStringLiteral("login"), tr("nobody is signed in: sign in"));
    const QString who = login_;
    const bool ok = signIn(who, password);
    if (!ok && error_field_ == QLatin1String("login")) {
        // The account was locked by the failed attempts: nobody continues this session.
        signOut();
    }
    return ok;
}

void Session::expireIdleTimer() {
    if (!signedIn() || locked_)
        return;
    lock();
    locked_by_idle_ = true;
    emit changed();
}

void Session::lock() {
    if (!signedIn() || locked_)
        return;
    locked_ = true;
    locked_by_idle_ = false;
    idle_.stop();
    emit changed();
}

void Session::signOut() {
    if (!signedIn() && !locked_)
        return;
    login_.clear();
    display_name_.clear();
    role_.clear();
    locked_ = false;
    idle_.stop();
    emit changed();
}

bool Session::createAdministrator(const QString& login, const QString& name,
                                  const QString& password, const QString& repeat) {
    if (!workspace_ || !workspace_->database())
        return fail(QStringLiteral("login"), tr("no database is open"));
    if (accountsExist())
        return fail(QStringLiteral("login"),
                    tr("this database already has accounts: an administrator adds new ones"));
    if (password != repeat)
        return fail(QStringLiteral("repeat"), tr("the two passwords differ"));
    try {
        storage::AccountStore(workspace_->database()->connection())
            .add(login.trimmed(), name.trimmed(), storage::Role::administrator, password, {});
    } catch (const chem::Error& e) {
        return fail(QString::fromStdString(e.field()), QString::fromStdString(e.message()));
    } catch (const Failure& f) {
        return fail(QString::fromLatin1(f.subject()), QString::fromStdString(f.sentence()));
    }
    return signIn(login.trimmed(), password);
}

bool Session::addAccount(const QString& login, const QString& name, const QString& role,
                         const QString& password, const QString& repeat) {
    if (!signedIn() || locked_ || role_ != QLatin1String("administrator"))
        return fail(QStringLiteral("login"),
                    tr("only the administrator, signed in, adds accounts"));
    if (password != repeat)
        return fail(QStringLiteral("repeat"), tr("the two passwords differ"));
    try {
        storage::AccountStore(workspace_->database()->connection())
            .add(login.trimmed(), name.trimmed(), storage::role_from_name(role), password, login_);
    } catch (const chem::Error& e) {
        return fail(QString::fromStdString(e.field()), QString::fromStdString(e.message()));
    } catch (const Failure& f) {
        return fail(QString::fromLatin1(f.subject()), QString::fromStdString(f.sentence()));
    }
    succeed();
    emit accountAdded(login.trimmed());
    return true;
}

bool Session::setIdleMinutes(int minutes) {
    if (!signedIn() || locked_ || role_ != QLatin1String("administrator"))
        return fail(QStringLiteral("idle_minutes"),
                    tr("only the administrator, signed in, sets the idle time"));
    if (minutes < 1 || minutes > max_idle_minutes)
        return fail(QStringLiteral("idle_minutes"),
                    tr("%1 min is outside 1–%2 min").arg(minutes).arg(max_idle_minutes));
    workspace_->database()->set_setting(idle_key, QJsonValue(minutes));
    succeed();
    start_idle_timer();
    emit changed();
    return true;
}

void Session::noteActivity() {
    if (signedIn() && !locked_)
        idle_.start(idleMinutes() * 60 * 1000);
}

bool Session::eventFilter(QObject* watched, QEvent* event) {
    switch (event->type()) {
    case QEvent::MouseButtonPress:
    case QEvent::KeyPress:
    case QEvent::TouchBegin:
    case QEvent::Wheel:
        // One restart per input event, whichever object it reaches first.
        if (watched && watched->isWindowType())
            noteActivity();
        break;
    default:
        break;
    }
    return QObject::eventFilter(watched, event);
}

} // namespace phaseplan::gui
