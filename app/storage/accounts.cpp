#include "storage/accounts.h"
#include "core/failure.h"

#include "chem/error.h"
#include "chem/guard.h"
#include "storage/audit_trail.h"
#include "storage/sql_util.h"
#include "storage/versioning.h"

#include <QRegularExpression>
#include <QSqlQuery>
#include <QSqlRecord>

#include <sodium.h>

namespace phaseplan::storage {

using sql::run;

namespace {

std::string str(const QString& s) {
    return s.toStdString();
}
std::string quoted(const QString& s) {
    return chem::guard::quote_id(s.toStdString());
}

void ensure_sodium() {
    if (sodium_init() < 0)
        throw Failure(Failure::Kind::database,
                      "libsodium could not start (no source of randomness)");
}

void check_login(const QString& login) {
    static const QRegularExpression ok(QStringLiteral("^[a-z0-9._-]{1,64}$"));
    if (!ok.match(login).hasMatch())
        throw chem::Error("login", quoted(login) +
                                       " is not a login: use 1 to 64 characters of a-z, 0-9, "
                                       "\".\", \"_\" and \"-\"");
}

void check_password(const QString& password) {
    const qsizetype n = password.toUcs4().size();
    if (n < min_password_chars)
        throw chem::Error("password", "has " + std::to_string(n) + " characters; use at least " +
                                          std::to_string(min_password_chars));
    if (n > max_password_chars)
        throw chem::Error("password", "has " + std::to_string(n) + " characters; use at most " +
                                          std::to_string(max_password_chars));
}

Account account_from(const QSqlQuery& q) {
    Account a;
    a.login = q.value(0).toString();
    a.display_name = q.value(1).toString();
    a.role = role_from_name(q.value(2).toString());
    a.failed_attempts = q.value(3).toInt();
    a.locked = q.value(4).toInt() != 0;
    a.created_at = q.value(5).toString();
    a.changed_at = q.value(6).toString();
    if (q.record().count() > 7) {
        a.version = q.value(7).toLongLong();
        a.changed_by = q.value(8).toString();
    }
    return a;
}

const char* plain_account_columns =
    "login, display_name, role, failed_attempts, locked, created_at, changed_at";
const char* versioned_account_columns =
    "login, display_name, role, failed_attempts, locked, created_at, changed_at, version, "
    "changed_by";

QLatin1String account_columns(QSqlDatabase db) {
    return QLatin1String(has_row_version(db, QStringLiteral("users")) ? versioned_account_columns
                                                                      : plain_account_columns);
}

RowKey account_key(const QString& login) {
    return {QStringLiteral("users"), {QStringLiteral("login")}, {login}};
}

QString account_words(const QString& login) {
    return QStringLiteral("The account %1").arg(QString::fromStdString(quoted(login)));
}

} // namespace

QString role_name(Role r) {
    switch (r) {
    case Role::preparer:
        return QStringLiteral("preparer");
    case Role::reviewer:
        return QStringLiteral("reviewer");
    case Role::approver:
        return QStringLiteral("approver");
    case Role::administrator:
        return QStringLiteral("administrator");
    }
    return {};
}

Role role_from_name(const QString& name) {
    for (Role r : {Role::preparer, Role::reviewer, Role::approver, Role::administrator})
        if (role_name(r) == name)
            return r;
    throw chem::Error("role", quoted(name) +
                                  " is not a role: preparer, reviewer, approver or administrator");
}

bool may_edit_records(Role r) {
    return r != Role::administrator;
}

QString hash_password(const QString& password) {
    check_password(password);
    ensure_sodium();
    const QByteArray pw = password.toUtf8();
    char out[crypto_pwhash_STRBYTES];
    if (crypto_pwhash_str_alg(out, pw.constData(), static_cast<unsigned long long>(pw.size()),
                              crypto_pwhash_OPSLIMIT_INTERACTIVE,
                              crypto_pwhash_MEMLIMIT_INTERACTIVE,
                              crypto_pwhash_ALG_ARGON2ID13) != 0)
        throw Failure(Failure::Kind::database,
                      "the password could not be hashed (out of memory: Argon2id "
                      "needs 64 MiB)");
    return QString::fromLatin1(out);
}

bool password_matches(const QString& hash, const QString& password) {
    ensure_sodium();
    const QByteArray h = hash.toLatin1();
    if (h.size() >= crypto_pwhash_STRBYTES)
        return false;
    char buf[crypto_pwhash_STRBYTES] = {};
    std::copy(h.begin(), h.end(), buf);
    const QByteArray pw = password.toUtf8();
    return crypto_pwhash_str_verify(buf, pw.constData(),
                                    static_cast<unsigned long long>(pw.size())) == 0;
}

AccountStore::AccountStore(QSqlDatabase db) : db_(db) {}

QString AccountStore::now() const {
    return clock_ ? clock_() : sql::utc_now(db_);
}

bool AccountStore::any() const {
    QSqlQuery q = run(db_, "SELECT count(*) FROM users");
    return q.next() && q.value(0).toLongLong() > 0;
}

std::optional<Account> AccountStore::find(const QString& login) const {
    QSqlQuery q =
        run(db_, QStringLiteral("SELECT %1 FROM users WHERE login = ?").arg(account_columns(db_)),
            {login});
    if (!q.next())
        return std::nullopt;
    return account_from(q);
}

std::vector<Account> AccountStore::list() const {
    QSqlQuery q =
        run(db_, QStringLiteral("SELECT %1 FROM users ORDER BY login").arg(account_columns(db_)));
    std::vector<Account> out;
    while (q.next())
        out.push_back(account_from(q));
    return out;
}

void AccountStore::require_administrator(const QString& actor) const {
    const std::optional<Account> a = find(actor);
    if (!a)
        throw chem::Error("as", "no account " + quoted(actor));
    if (a->locked)
        throw chem::Error("as", "the account " + quoted(actor) + " is locked");
    if (a->role != Role::administrator)
        throw chem::Error("as", quoted(actor) + " is a " + str(role_name(a->role)) +
                                    ": only an administrator manages accounts");
}

namespace {
/// The login's rules (check_login) and a display name of 1 to 200 characters, both trimmed.
void check_account_fields(const QString& login, const QString& display_name_in) {
    check_login(login.trimmed());
    const QString display_name = display_name_in.trimmed();
    if (display_name.isEmpty())
        throw chem::Error("name", "is required: the name shown beside each signature");
    if (display_name.size() > 200)
        throw chem::Error("name", "has more than 200 characters");
}
} // namespace

void AccountStore::add(const QString& login_in, const QString& display_name_in, Role role,
                       const QString& password, const QString& actor) {
    // The fields are checked before the (slow) hash is made; add_with_hash checks them again.
    check_account_fields(login_in, display_name_in);
    add_with_hash(login_in, display_name_in, role, hash_password(password), actor);
}

void AccountStore::add_with_hash(const QString& login_in, const QString& display_name_in, Role role,
                                 const QString& hash, const QString& actor) {
    const QString login = login_in.trimmed();
    const QString display_name = display_name_in.trimmed();
    check_account_fields(login, display_name);
    if (!hash.startsWith(QLatin1String("$argon2id$")) || hash.size() >= crypto_pwhash_STRBYTES)
        throw chem::Error("password", "the stored hash is not an Argon2id string");
    sql::WriteTransaction tx(db_);
    if (any()) {
        require_administrator(actor);
    } else {
        if (role != Role::administrator)
            throw chem::Error("role", "the first account must be an administrator (it creates "
                                      "the others)");
    }
    const bool versioned = has_row_version(db_, QStringLiteral("users"));
    if (versioned)
        refuse_taken(db_, account_key(login), QStringLiteral("account"), login, "login");
    else if (find(login))
        throw chem::Error("login", quoted(login) + " is taken (logins are never reused)");
    const QString t = now();
    if (versioned)
        run(db_,
            "INSERT INTO users (login, display_name, role, password_hash, failed_attempts, locked,"
            " created_at, changed_at, version, changed_by) VALUES (?, ?, ?, ?, 0, 0, ?, ?, 1, ?)",
            {login, display_name, role_name(role), hash, t, t, actor.isEmpty() ? login : actor});
    else
        run(db_,
            "INSERT INTO users (login, display_name, role, password_hash, failed_attempts, locked,"
            " created_at, changed_at) VALUES (?, ?, ?, ?, 0, 0, ?, ?)",
            {login, display_name, role_name(role), hash, t, t});
    QJsonObject changes = audit_change("display_name", QJsonValue::Null, display_name);
    changes.insert("role", QJsonObject{{"old", QJsonValue::Null}, {"new", role_name(role)}});
    append_audit(db_, t, actor.isEmpty() ? login : actor, "add-user", "user", login, {}, changes);
    tx.commit();
}

Account AccountStore::authenticate(const QString& login_in, const QString& password) {
    const QString login = login_in.trimmed();
    const std::optional<Account> a = find(login);
    QString hash;
    if (a) {
        QSqlQuery q = run(db_, "SELECT password_hash FROM users WHERE login = ?", {login});
        if (q.next())
            hash = q.value(0).toString();
    }
    if (a && a->locked)
        throw chem::Error("login", "the account " + quoted(login) + " is locked after " +
                                       std::to_string(max_failed_attempts) +
                                       " wrong passwords: an administrator unlocks it");
    // An unknown login costs one hash too, so the time does not tell which logins exist.
    static const QString dummy = hash_password(QStringLiteral("no such account here"));
    const bool ok =
        a ? password_matches(hash, password) : (password_matches(dummy, password), false);
    const QString t = now();
    if (ok) {
        if (a->failed_attempts > 0) {
            sql::WriteTransaction tx(db_);
            run(db_, "UPDATE users SET failed_attempts = 0 WHERE login = ?", {login});
            tx.commit();
        }
        Account out = *a;
        out.failed_attempts = 0;
        return out;
    }
    sql::WriteTransaction tx(db_);
    int attempts = 0;
    if (a) {
        // Counted under the write lock: two benches failing at once both count.
        const int before = find(login)->failed_attempts;
        attempts = before + 1;
        const bool lock = attempts >= max_failed_attempts;
        if (lock && a->version > 0) // locking is a change of the account; counting is not
            run(db_,
                "UPDATE users SET failed_attempts = ?, locked = 1, changed_at = ?,"
                " version = version + 1, changed_by = ? WHERE login = ?",
                {attempts, t, login, login});
        else
            run(db_,
                "UPDATE users SET failed_attempts = ?, locked = ?, changed_at = ? WHERE login = ?",
                {attempts, lock ? 1 : 0, t, login});
        QJsonObject changes = audit_change("failed_attempts", before, attempts);
        append_audit(db_, t, login, "sign-in-failed", "user", login, {}, changes);
        if (lock)
            append_audit(db_, t, login, "lock", "user", login,
                         QStringLiteral("%1 wrong passwords in a row").arg(attempts),
                         audit_change("locked", false, true));
    } else {
        append_audit(db_, t, QStringLiteral("(unknown)"), "sign-in-failed", "user", login.left(64),
                     {}, {});
    }
    tx.commit();
    if (a && attempts >= max_failed_attempts)
        throw chem::Error("password", "wrong login or password; the account " + quoted(login) +
                                          " is now locked after " +
                                          std::to_string(max_failed_attempts) +
                                          " wrong passwords: an administrator unlocks it");
    throw chem::Error("password", "wrong login or password");
}

void AccountStore::write_account(const Account& a, const QString& assignments,
                                 const QVariantList& values, const QString& actor,
                                 const QString& at, qint64 expected_version) {
    if (a.version == 0) { // before step row_version_schema_version
        run(db_,
            QStringLiteral("UPDATE users SET %1, changed_at = ? WHERE login = ?").arg(assignments),
            QVariantList(values) << at << a.login);
        return;
    }
    update_checked(db_, account_key(a.login), assignments, values,
                   expected_version > 0 ? expected_version : a.version, actor, at,
                   account_words(a.login));
}

void AccountStore::set_locked(const QString& login, bool locked, const QString& actor,
                              qint64 expected_version) {
    sql::WriteTransaction tx(db_);
    require_administrator(actor);
    const std::optional<Account> a = find(login);
    if (!a)
        throw chem::Error("login", "no account " + quoted(login));
    if (expected_version > 0 && a->version > 0 && a->version != expected_version)
        throw conflict_error(db_, account_words(login), {a->version, a->changed_by, a->changed_at});
    if (locked && !a->locked && a->role == Role::administrator) {
        QSqlQuery q =
            run(db_, "SELECT count(*) FROM users WHERE role = 'administrator' AND locked = 0");
        if (q.next() && q.value(0).toLongLong() <= 1)
            throw chem::Error("login", quoted(login) +
                                           " is the last unlocked administrator: add another "
                                           "before locking it, or nobody can manage accounts");
    }
    if (a->locked == locked && (locked || a->failed_attempts == 0))
        throw chem::Error("login", "the account " + quoted(login) + " is already " +
                                       (locked ? "locked" : "unlocked"));
    const QString t = now();
    write_account(*a, QStringLiteral("locked = ?, failed_attempts = ?"),
                  {locked ? 1 : 0, locked ? a->failed_attempts : 0}, actor, t, expected_version);
    QJsonObject changes = audit_change("locked", a->locked, locked);
    if (!locked && a->failed_attempts > 0)
        changes.insert("failed_attempts", QJsonObject{{"old", a->failed_attempts}, {"new", 0}});
    append_audit(db_, t, actor, locked ? "lock" : "unlock", "user", login, {}, changes);
    tx.commit();
}

void AccountStore::set_password(const QString& login, const QString& new_password,
                                const QString& actor, qint64 expected_version) {
    const QString hash = hash_password(new_password);
    sql::WriteTransaction tx(db_);
    const std::optional<Account> a = find(login);
    if (!a)
        throw chem::Error("login", "no account " + quoted(login));
    if (actor != login)
        require_administrator(actor);
    const QString t = now();
    write_account(*a, QStringLiteral("password_hash = ?"), {hash}, actor, t, expected_version);
    append_audit(db_, t, actor, "password", "user", login, {},
                 audit_change("password", QStringLiteral("(set)"), QStringLiteral("(changed)")));
    tx.commit();
}

void AccountStore::check_may_edit(QSqlDatabase db, const QString& login) {
    if (!has_audit_schema(db))
        return;
    QSqlQuery q = run(db, "SELECT role, locked FROM users WHERE login = ?", {login.trimmed()});
    if (!q.next())
        return;
    if (q.value(1).toInt() != 0)
        throw chem::Error("who", "the account " + quoted(login.trimmed()) +
                                     " is locked: it cannot change records");
    if (q.value(0).toString() == QLatin1String("administrator"))
        throw chem::Error("who", quoted(login.trimmed()) +
                                     " is an administrator: administrators manage accounts and "
                                     "do not create, edit or sign records");
}

} // namespace phaseplan::storage
