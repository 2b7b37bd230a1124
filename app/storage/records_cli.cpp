#include "storage/records_cli.h"

#include "chem/error.h"
#include "chem/guard.h"
#include "storage/accounts.h"
#include "storage/audit_trail.h"
#include "storage/database.h"
#include "storage/demo.h"
#include "storage/signatures.h"
#include "storage/sql_util.h"

#include <QFileInfo>
#include <QJsonArray>
#include <QJsonDocument>
#include <QSaveFile>
#include <QSqlError>
#include <QSqlQuery>

#include <cerrno>
#include <cstring>
#include <map>
#include <memory>

#include <sys/stat.h>
#include <unistd.h>

namespace phaseplan::storage {

namespace {

std::string quoted(const QString& s) {
    return chem::guard::quote_id(s.toStdString());
}

/// The options of one subcommand: --flag VALUE pairs and the positional words.
struct Options {
    std::map<QString, QString> values;
    QStringList positional;

    QString value(const QString& flag) const {
        auto it = values.find(flag);
        return it == values.end() ? QString() : it->second;
    }
    bool has(const QString& flag) const { return values.count(flag) > 0; }
    QString required(const QString& flag) const {
        if (!has(flag) || value(flag).isEmpty())
            throw chem::Error(flag.mid(flag.startsWith("--") ? 2 : 1).toStdString(),
                              "is required: give " + flag.toStdString() + " VALUE");
        return value(flag);
    }
};

Options parse(const QStringList& args, const QStringList& allowed) {
    Options o;
    for (int i = 0; i < args.size(); ++i) {
        const QString& a = args[i];
        if (a.startsWith(QLatin1Char('-')) && a.size() > 1) {
            if (a == QLatin1String("--password") || a.startsWith(QLatin1String("--password=")))
                throw chem::Error("password", "is never given on the command line: it is read "
                                              "from standard input or typed at the prompt");
            if (!allowed.contains(a))
                throw chem::Error("option", quoted(a) + " is not an option here (options: " +
                                                allowed.join(", ").toStdString() + ")");
            if (i + 1 >= args.size())
                throw chem::Error(a.mid(a.startsWith("--") ? 2 : 1).toStdString(), "needs a value");
            if (o.has(a))
                throw chem::Error(a.mid(a.startsWith("--") ? 2 : 1).toStdString(),
                                  "is given twice");
            o.values[a] = args[++i];
        } else {
            o.positional << a;
        }
    }
    return o;
}

void no_positional(const Options& o, int max) {
    if (o.positional.size() > max)
        throw chem::Error("input", "unexpected argument " + quoted(o.positional.at(max)));
}

/// Opens an existing PhasePlan file read-only, for audit verify and export: nothing is written,
/// not even a migration.
class ReadOnlyFile {
  public:
    explicit ReadOnlyFile(const QString& path)
        : name_(QStringLiteral("audit-ro-%1").arg(++count_)) {
        const QFileInfo fi(path);
        if (!fi.exists())
            throw chem::Error("database", "no file " + quoted(path));
        if (!fi.isFile())
            throw chem::Error("database", quoted(path) + " is not a file");
        db_ = QSqlDatabase::addDatabase(QStringLiteral("QSQLITE"), name_);
        db_.setDatabaseName(path);
        db_.setConnectOptions(QStringLiteral("QSQLITE_OPEN_READONLY;QSQLITE_BUSY_TIMEOUT=3000"));
        if (!db_.open())
            throw chem::Error("database", "cannot open " + quoted(path) + ": " +
                                              db_.lastError().text().toStdString());
        QSqlQuery q(db_);
        qint64 app_id = -1;
        if (q.exec(QStringLiteral("PRAGMA application_id")) && q.next())
            app_id = q.value(0).toLongLong();
        if (app_id != phaseplan_application_id)
            throw chem::Error("database", quoted(path) + " is not a PhasePlan database");
        if (!has_audit_schema(db_)) {
            int version = 0;
            QSqlQuery v(db_);
            if (v.exec(QStringLiteral("PRAGMA user_version")) && v.next())
                version = v.value(0).toInt();
            throw chem::Error("database", quoted(path) +
                                              " has no audit trail yet (schema version " +
                                              std::to_string(version) +
                                              "): open it once with this PhasePlan to add it");
        }
    }
    ~ReadOnlyFile() {
        db_.close();
        db_ = QSqlDatabase();
        QSqlDatabase::removeDatabase(name_);
    }
    QSqlDatabase db() const { return db_; }

  private:
    static inline int count_ = 0;
    QString name_;
    QSqlDatabase db_;
};

/// Opens (or, for user add, creates) the database through the app's checks and migrations.
std::unique_ptr<Database> open_database(const QString& path, bool may_create) {
    if (!may_create && !QFileInfo::exists(path))
        throw chem::Error("database", "no file " + quoted(path));
    auto db = std::make_unique<Database>(path);
    if (!db->writable())
        throw chem::Error("database", db->read_only_reason().toStdString());
    return db;
}

QByteArray csv_field(const QString& s) {
    QString t = s;
    if (t.contains(QLatin1Char('"')) || t.contains(QLatin1Char(',')) ||
        t.contains(QLatin1Char('\n')) || t.contains(QLatin1Char('\r'))) {
        t.replace(QLatin1String("\""), QLatin1String("\"\""));
        t = QLatin1Char('"') + t + QLatin1Char('"');
    }
    return t.toUtf8();
}

/// Writes `bytes` to a regular file or a new path (never through a link, onto a device or a
/// folder), atomically.
void write_output(const QString& path, const QByteArray& bytes) {
    struct stat st {};
    const QByteArray p = QFile::encodeName(path);
    if (::lstat(p.constData(), &st) == 0) {
        if (S_ISLNK(st.st_mode))
            throw chem::Error("-o", quoted(path) + " is a symbolic link; PhasePlan does not write "
                                                   "through one");
        if (!S_ISREG(st.st_mode))
            throw chem::Error("-o", quoted(path) + " is not a regular file");
        if (::access(p.constData(), W_OK) != 0)
            throw chem::Error("-o", quoted(path) + " is read-only; PhasePlan does not replace it");
    } else if (errno != ENOENT) {
        throw chem::Error("-o", "cannot write " + quoted(path) + ": " + std::strerror(errno));
    }
    QSaveFile f(path);
    if (!f.open(QIODevice::WriteOnly) || f.write(bytes) != bytes.size() || !f.commit())
        throw chem::Error("-o",
                          "cannot write " + quoted(path) + ": " + f.errorString().toStdString());
}

QJsonObject entry_json(const AuditEntry& e) {
    return {{"seq", e.seq},
            {"logged_at", e.logged_at},
            {"login", e.login},
            {"action", e.action},
            {"record_type", e.record_type},
            {"record_id", e.record_id},
            {"reason", e.reason},
            {"changes", QJsonDocument::fromJson(e.changes.toUtf8()).object()},
            {"words", audit_words(e)},
            {"prev_hash", e.prev_hash},
            {"hash", e.hash}};
}

QJsonObject verification_json(const AuditVerification& v) {
    QJsonObject o{{"intact", v.intact}, {"entries", v.entries}};
    if (v.intact) {
        o["head_seq"] = v.head_seq;
        o["head_hash"] = v.head_hash;
    } else {
        o["first_bad_seq"] = v.first_bad_seq;
        o["problem"] = v.problem;
    }
    return o;
}

CliOutput audit_command(const QStringList& args) {
    if (args.isEmpty())
        throw chem::Error("command", "audit needs verify or export");
    const QString sub = args.first();
    if (sub == QLatin1String("verify")) {
        const Options o = parse(args.mid(1), {"--database"});
        no_positional(o, 0);
        ReadOnlyFile file(o.required("--database"));
        const AuditVerification v = verify_all(file.db());
        CliOutput out;
        if (v.intact) {
            out.out = QStringLiteral("intact: %1 entries; last entry %2, hash %3\n")
                          .arg(v.entries)
                          .arg(v.head_seq)
                          .arg(v.head_hash.isEmpty() ? QStringLiteral("(none)") : v.head_hash)
                          .toUtf8();
        } else {
            out.status = 1;
            out.out = QStringLiteral("broken at entry %1: %2\n")
                          .arg(v.first_bad_seq)
                          .arg(v.problem)
                          .toUtf8();
        }
        return out;
    }
    if (sub == QLatin1String("export")) {
        const Options o =
            parse(args.mid(1), {"--database", "--batch", "-o", "--output", "--format"});
        no_positional(o, 0);
        const QString path = o.has("-o") ? o.value("-o") : o.value("--output");
        QString format = o.value("--format");
        if (format.isEmpty())
            format = path.endsWith(QLatin1String(".csv"), Qt::CaseInsensitive)
                         ? QStringLiteral("csv")
                         : QStringLiteral("json");
        if (format != QLatin1String("json") && format != QLatin1String("csv"))
            throw chem::Error("format", quoted(format) + " is not json or csv");
        ReadOnlyFile file(o.required("--database"));
        AuditFilter filter;
        if (o.has("--batch")) {
            filter.record_type = QStringLiteral("batch");
            filter.record_id = o.value("--batch");
            QSqlQuery q =
                sql::run(file.db(), "SELECT 1 FROM batches WHERE id = ?", {filter.record_id});
            if (!q.next())
                throw chem::Error("batch", "no batch " + quoted(filter.record_id));
        }
        const std::vector<AuditEntry> entries = audit_entries(file.db(), filter);
        const AuditVerification v = verify_all(file.db());
        QByteArray bytes;
        if (format == QLatin1String("json")) {
            QJsonArray list;
            for (const AuditEntry& e : entries)
                list.append(entry_json(e));
            QJsonObject doc{{"database", QFileInfo(o.value("--database")).fileName()},
                            {"hash", "SHA-256 over phaseplan-audit-v1 (see the contributor guide)"},
                            {"chain", verification_json(v)},
                            {"entries", list}};
            if (!filter.record_id.isEmpty()) {
                doc["batch"] = filter.record_id;
                QJsonArray sigs;
                for (const Signature& s : SignatureStore(file.db()).list(filter.record_id))
                    sigs.append(QJsonObject{{"login", s.login},
                                            {"name", s.display_name},
                                            {"meaning", s.meaning},
                                            {"signed_at", s.signed_at},
                                            {"revision", s.revision},
                                            {"content_sha256", s.content_sha256},
                                            {"holds", s.holds},
                                            {"words", SignatureStore::manifestation(s)}});
                doc["signatures"] = sigs;
            }
            bytes = QJsonDocument(doc).toJson(QJsonDocument::Indented);
        } else {
            bytes = "seq,logged_at,login,action,record_type,record_id,reason,words,changes,"
                    "prev_hash,hash\r\n";
            for (const AuditEntry& e : entries) {
                const QStringList cols = {QString::number(e.seq),
                                          e.logged_at,
                                          e.login,
                                          e.action,
                                          e.record_type,
                                          e.record_id,
                                          e.reason,
                                          audit_words(e),
                                          e.changes,
                                          e.prev_hash,
                                          e.hash};
                QList<QByteArray> fields;
                for (const QString& c : cols)
                    fields << csv_field(c);
                bytes += fields.join(',') + "\r\n";
            }
        }
        CliOutput out;
        if (path.isEmpty())
            out.out = bytes;
        else
            write_output(path, bytes);
        return out;
    }
    throw chem::Error("command", "audit " + quoted(sub) + " is not verify or export");
}

QJsonObject account_json(const Account& a) {
    return {{"login", a.login},
            {"name", a.display_name},
            {"role", role_name(a.role)},
            {"locked", a.locked},
            {"failed_attempts", a.failed_attempts},
            {"created_at", a.created_at},
            {"changed_at", a.changed_at}};
}

QString login_argument(const Options& o) {
    if (o.positional.isEmpty())
        throw chem::Error("login", "is required: give the account's login");
    no_positional(o, 1);
    return o.positional.first().trimmed();
}

/// Signs in `as` with a password read now (the administrator or the account itself).
Account sign_in(AccountStore& accounts, const QString& as, const SecretReader& read_secret) {
    const QString pw = read_secret(QStringLiteral("password of %1").arg(as));
    return accounts.authenticate(as, pw);
}

CliOutput user_command(const QStringList& args, const SecretReader& read_secret) {
    if (args.isEmpty())
        throw chem::Error("command", "user needs add, list, lock, unlock or passwd");
    const QString sub = args.first();
    CliOutput out;
    if (sub == QLatin1String("list")) {
        const Options o = parse(args.mid(1), {"--database"});
        no_positional(o, 0);
        auto db = open_database(o.required("--database"), false);
        QJsonArray list;
        for (const Account& a : AccountStore(db->connection()).list())
            list.append(account_json(a));
        out.out = QJsonDocument(QJsonObject{{"users", list}}).toJson(QJsonDocument::Indented);
        return out;
    }
    if (sub == QLatin1String("add")) {
        const Options o = parse(args.mid(1), {"--database", "--name", "--role", "--as"});
        const QString login = login_argument(o);
        const QString name = o.required("--name");
        const Role role = role_from_name(o.required("--role"));
        auto db = open_database(o.required("--database"), true);
        AccountStore accounts(db->connection());
        QString actor;
        if (accounts.any()) {
            if (!o.has("--as"))
                throw chem::Error("as", "is required: an administrator adds accounts (--as "
                                        "LOGIN; the password is read first)");
            actor = sign_in(accounts, o.value("--as"), read_secret).login;
        } else if (o.has("--as")) {
            throw chem::Error("as", "there are no accounts yet: the first one is added without "
                                    "--as and must be an administrator");
        }
        const QString pw = read_secret(QStringLiteral("new password of %1").arg(login));
        accounts.add(login, name, role, pw, actor);
        out.out =
            QJsonDocument(account_json(*accounts.find(login))).toJson(QJsonDocument::Indented);
        return out;
    }
    if (sub == QLatin1String("lock") || sub == QLatin1String("unlock")) {
        const Options o = parse(args.mid(1), {"--database", "--as"});
        const QString login = login_argument(o);
        const QString as = o.required("--as");
        auto db = open_database(o.required("--database"), false);
        AccountStore accounts(db->connection());
        const Account admin = sign_in(accounts, as, read_secret);
        accounts.set_locked(login, sub == QLatin1String("lock"), admin.login);
        out.out =
            QJsonDocument(account_json(*accounts.find(login))).toJson(QJsonDocument::Indented);
        return out;
    }
    if (sub == QLatin1String("passwd")) {
        const Options o = parse(args.mid(1), {"--database", "--as"});
        const QString login = login_argument(o);
        const QString as = o.has("--as") ? o.value("--as") : login;
        auto db = open_database(o.required("--database"), false);
        AccountStore accounts(db->connection());
        if (!accounts.find(login))
            throw chem::Error("login", "no account " + quoted(login));
        const Account actor = sign_in(accounts, as, read_secret);
        const QString pw = read_secret(QStringLiteral("new password of %1").arg(login));
        accounts.set_password(login, pw, actor.login);
        out.out =
            QJsonDocument(account_json(*accounts.find(login))).toJson(QJsonDocument::Indented);
        return out;
    }
    throw chem::Error("command",
                      "user " + quoted(sub) + " is not add, list, lock, unlock or passwd");
}

CliOutput db_command(const QStringList& args, const QString& data_dir) {
    if (args.isEmpty() || args.first() != QLatin1String("demo"))
        throw chem::Error("command", "db needs demo");
    const Options o = parse(args.mid(1), {"--database"});
    no_positional(o, 0);
    const QString path = o.required("--database");
    if (QFileInfo::exists(path) || QFileInfo(path).isSymLink())
        throw chem::Error("database", quoted(path) + " exists: the demo goes only into a new file");
    Database db(path, -1, [&](Database& d) { seed_demo(d, data_dir); });
    const AuditVerification v = verify_all(db.connection());
    CliOutput out;
    out.out = QJsonDocument(QJsonObject{{"database", path},
                                        {"batch", demo_batch_id()},
                                        {"chain", verification_json(v)}})
                  .toJson(QJsonDocument::Indented);
    return out;
}

} // namespace

CliOutput records_command(const QString& group, const QStringList& args,
                          const SecretReader& read_secret, const QString& data_dir) {
    if (group == QLatin1String("audit"))
        return audit_command(args);
    if (group == QLatin1String("user"))
        return user_command(args, read_secret);
    if (group == QLatin1String("db"))
        return db_command(args, data_dir);
    throw chem::Error("command", "unknown command " + quoted(group));
}

} // namespace phaseplan::storage
