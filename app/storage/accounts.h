#pragma once
// The people who use the lab's database: accounts with a role, an Argon2id password hash, a
// failed-attempt counter and a lock. Table `users` from schema step 10 (app/storage/audit_trail.h).
//
// Passwords are hashed with libsodium's crypto_pwhash_str_alg(…, crypto_pwhash_ALG_ARGON2ID13)
// at crypto_pwhash_OPSLIMIT_INTERACTIVE and crypto_pwhash_MEMLIMIT_INTERACTIVE (libsodium
// 1.0.18: 2 passes over 64 MiB, one lane; the string reads "$argon2id$v=19$m=65536,t=2,p=1$…").
// The libsodium documentation ("Password hashing", the crypto_pwhash_str section) names these
// as the baseline for interactive, online operations. The string holds its salt and parameters,
// so raising them later leaves the old hashes verifiable.
//
// Rules (each throws chem::Error naming the field):
//   - a login is 1–64 characters of a–z, 0–9, ".", "_" and "-"; it is never reused (accounts
//     are locked, never removed: 21 CFR 11.100(a), 11.300(a));
//   - a password has at least 8 and at most 256 characters (common practice, no source);
//   - after max_failed_attempts wrong passwords in a row the account locks, and only an
//     administrator unlocks it (21 CFR 11.300(d): safeguards against unauthorised use);
//   - the administrator manages accounts and does not edit or sign records (segregation of
//     duties, EU GMP Annex 11 §12: access by role);
//   - every account change and every failed sign-in is written to the audit trail.
#include <QSqlDatabase>
#include <QString>
#include <QVariantList>

#include <functional>
#include <optional>
#include <vector>

namespace phaseplan::storage {

enum class Role { preparer, reviewer, approver, administrator };
/// "preparer", "reviewer", "approver", "administrator".
QString role_name(Role r);
/// Throws chem::Error("role", …) for anything else.
Role role_from_name(const QString& name);

/// Wrong passwords in a row before the account locks.
inline constexpr int max_failed_attempts = 5;
inline constexpr int min_password_chars = 8;
inline constexpr int max_password_chars = 256;

struct Account {
    QString login;
    QString display_name;
    Role role = Role::preparer;
    int failed_attempts = 0;
    bool locked = false;
    QString created_at; ///< UTC ISO 8601
    QString changed_at; ///< UTC ISO 8601
    /// From schema step row_version_schema_version (storage/versioning.h), 0 before it: +1 on
    /// every change an administrator or the account makes (lock, unlock, password) and when the
    /// account locks itself after the last wrong password; a failed sign-in that does not lock it
    /// only counts. changed_by: who made that change.
    qint64 version = 0;
    QString changed_by{};
};

/// May this role create, edit, amend or print records? Everyone but the administrator.
bool may_edit_records(Role r);

/// libsodium's Argon2id string for `password` (the salt is random). Throws chem::Error("password",
/// …) when the password breaks the length rule, Failure (Kind::database) when libsodium fails
/// (memory).
QString hash_password(const QString& password);
/// True when `password` matches a crypto_pwhash_str string.
bool password_matches(const QString& hash, const QString& password);

class AccountStore {
  public:
    /// On a connection whose schema has the users and audit_log tables (step 10).
    explicit AccountStore(QSqlDatabase db);

    /// True when the database has at least one account.
    bool any() const;
    std::optional<Account> find(const QString& login) const;
    /// Ordered by login.
    std::vector<Account> list() const;

    /// Adds an account. `actor` is the administrator's login, signed in by the caller; it may be
    /// empty only for the very first account, which must be an administrator. A login that is
    /// taken is refused with name_taken_error (field "login": who added it and when).
    void add(const QString& login, const QString& display_name, Role role, const QString& password,
             const QString& actor);

    /// The same with a crypto_pwhash_str string computed beforehand (the demo's accounts, so that
    /// a new database does not spend a second on hashing). Throws chem::Error("password", …)
    /// unless it is an Argon2id string.
    void add_with_hash(const QString& login, const QString& display_name, Role role,
                       const QString& argon2id_hash, const QString& actor);

    /// Checks login and password (both components, 21 CFR 11.200(a)(1)). A wrong password adds
    /// one to the account's failed attempts (the fifth locks it); a right one sets them to 0.
    /// Throws chem::Error("password", "wrong login or password …") for a wrong pair (the same
    /// words for an unknown login), chem::Error("login", "… is locked …") for a locked account.
    /// Failures are committed before the throw.
    Account authenticate(const QString& login, const QString& password);

    /// Locks or unlocks an account (unlocking clears the failed attempts). `actor` must be an
    /// administrator (checked against the table). `expected_version` above 0 is the version the
    /// administrator's screen showed: an account changed since (on another bench, or locked by
    /// wrong passwords) is refused with conflict_error (field "version") and nothing is written;
    /// -1 does not check (the CLI reads and writes at once).
    void set_locked(const QString& login, bool locked, const QString& actor,
                    qint64 expected_version = -1);

    /// Sets a new password. `actor` is the account itself (after authenticate with the old one)
    /// or an administrator. `expected_version` as for set_locked.
    void set_password(const QString& login, const QString& new_password, const QString& actor,
                      qint64 expected_version = -1);

    /// Throws chem::Error("who", …) when `login` names an administrator or a locked account: they
    /// may not change records. A name that is no account passes (records made by name, before
    /// accounts). Used by BatchStore before every write.
    static void check_may_edit(QSqlDatabase db, const QString& login);

    /// Test seam: the clock for created_at / changed_at and the audit entries (UTC).
    void set_clock(std::function<QString()> clock) { clock_ = std::move(clock); }

  private:
    void require_administrator(const QString& actor) const;
    /// The UPDATE of an admin edit: checked against `expected_version` (or the version read now,
    /// under the write lock, when it is -1), the version moved on, `actor` as changed_by.
    void write_account(const Account& a, const QString& assignments, const QVariantList& values,
                       const QString& actor, const QString& at, qint64 expected_version);
    QString now() const;

    QSqlDatabase db_;
    std::function<QString()> clock_;
};

} // namespace phaseplan::storage
