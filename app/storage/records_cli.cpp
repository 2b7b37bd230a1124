#include "storage/records_cli.h"
#include "core/failure.h"

#include "chem/batch.h"
#include "chem/error.h"
#include "chem/guard.h"
#include "chem/text.h"
#include "core/app_data.h"
#include "storage/accounts.h"
#include "storage/audit_trail.h"
#include "storage/database.h"
#include "storage/demo.h"
#include "storage/lot_store.h"
#include "storage/signatures.h"
#include "storage/sql_util.h"

#include <QFileInfo>
#include <QJsonArray>
#include <QJsonDocument>
#include <QRegularExpression>
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

/// The file's name, or "dbname at HOST" for the lab's PostgreSQL database.
QString shown_location(const QString& location) {
    if (sql::is_postgresql_uri(location)) {
        const sql::PgLocation loc = sql::parse_postgresql_uri(location);
        return loc.dbname + QStringLiteral(" at ") + loc.where();
    }
    return QFileInfo(location).fileName();
}

/// Opens an existing PhasePlan file read-only, for audit verify and export: nothing is written,
/// not even a migration.
class ReadOnlyFile {
  public:
    explicit ReadOnlyFile(const QString& path)
        : name_(QStringLiteral("audit-ro-%1").arg(++count_)) {
        if (sql::is_postgresql_uri(path)) {
            // A read-only session (default_transaction_read_only): nothing is written.
            const sql::PgLocation loc = sql::parse_postgresql_uri(path);
            db_ = sql::open_postgresql(loc, name_, true);
            if (sql::application_id(db_) != phaseplan_application_id)
                throw Failure(Failure::Kind::database, "the database " + quoted(loc.dbname) +
                                                           " at " + loc.where().toStdString() +
                                                           " is not a PhasePlan database");
            if (!has_audit_schema(db_))
                throw Failure(Failure::Kind::database,
                              "the database " + quoted(loc.dbname) + " at " +
                                  loc.where().toStdString() +
                                  " has no audit trail yet: open it once with "
                                  "this PhasePlan to add it");
            return;
        }
        const QFileInfo fi(path);
        if (!fi.exists())
            throw Failure(Failure::Kind::database, "no file " + quoted(path));
        if (!fi.isFile())
            throw Failure(Failure::Kind::database, quoted(path) + " is not a file");
        db_ = QSqlDatabase::addDatabase(QStringLiteral("QSQLITE"), name_);
        db_.setDatabaseName(path);
        db_.setConnectOptions(QStringLiteral("QSQLITE_OPEN_READONLY;QSQLITE_BUSY_TIMEOUT=3000"));
        if (!db_.open())
            throw Failure(Failure::Kind::database, "cannot open " + quoted(path) + ": " +
                                                       db_.lastError().text().toStdString());
        QSqlQuery q(db_);
        qint64 app_id = -1;
        if (q.exec(QStringLiteral("PRAGMA application_id")) && q.next())
            app_id = q.value(0).toLongLong();
        if (app_id != phaseplan_application_id)
            throw Failure(Failure::Kind::database, quoted(path) + " is not a PhasePlan database");
        if (!has_audit_schema(db_)) {
            int version = 0;
            QSqlQuery v(db_);
            if (v.exec(QStringLiteral("PRAGMA user_version")) && v.next())
                version = v.value(0).toInt();
            throw Failure(Failure::Kind::database,
                          quoted(path) + " has no audit trail yet (schema version " +
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
    if (!may_create && !sql::is_postgresql_uri(path) && !QFileInfo::exists(path))
        throw Failure(Failure::Kind::database, "no file " + quoted(path));
    auto db = std::make_unique<Database>(path);
    if (!db->writable())
        throw Failure(Failure::Kind::database, db->read_only_reason().toStdString());
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
            QJsonObject doc{{"database", shown_location(o.value("--database"))},
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

QJsonObject lot_json(const ReagentLot& l) {
    QJsonObject o{{"reagent", l.reagent},         {"lot", l.lot},
                  {"received_on", l.received_on}, {"expires_on", l.expires_on},
                  {"created_at", l.created_at},   {"created_by", l.created_by}};
    if (!l.supplier.isEmpty())
        o["supplier"] = l.supplier;
    if (!l.opened_on.isEmpty())
        o["opened_on"] = l.opened_on;
    if (l.quantity) {
        o["quantity"] = *l.quantity;
        o["quantity_unit"] = l.quantity_unit;
    }
    return o;
}

/// Is `id` a reagent or solvent of the library (shipped, or the lab's own entry)? Throws
/// chem::Error
/// ("reagent", …) naming the nearest id otherwise.
void require_library_reagent(const QString& id, const QString& data_dir, const Database& db) {
    const AppData data = load_app_data(data_dir);
    // A solvent (acetonitrile for line B) has lots too.
    if (data.reagents.find_reagent(id.toStdString()) ||
        data.solvents.find_solvent(id.toStdString()))
        return;
    std::vector<std::string> ids;
    for (const chem::Reagent& r : data.reagents.reagents())
        ids.push_back(r.id);
    for (const chem::Solvent& r : data.solvents.solvents())
        ids.push_back(r.id);
    for (const LibraryEntry& e : db.user_entries(QStringLiteral("reagents"))) {
        if (e.id == id)
            return;
        ids.push_back(e.id.toStdString());
    }
    std::string nearest;
    int best = 4; // a suggestion only when it is close
    const std::string wanted = id.left(qsizetype(chem::guard::max_id_chars)).toStdString();
    for (const std::string& c : ids) {
        const int d = chem::edit_distance(wanted, c);
        if (d < best) {
            best = d;
            nearest = c;
        }
    }
    throw chem::Error("reagent", quoted(id) + " is not a reagent of the library" +
                                     (nearest.empty() ? std::string(" (phaseplan-cli reagents "
                                                                    "lists them)")
                                                      : " (did you mean \"" + nearest + "\"?)"));
}

CliOutput lot_command(const QStringList& args, const SecretReader& read_secret,
                      const QString& data_dir) {
    if (args.isEmpty())
        throw chem::Error("command", "lot needs add, list or open");
    const QString sub = args.first();
    CliOutput out;
    if (sub == QLatin1String("list")) {
        const Options o = parse(args.mid(1), {"--database", "--reagent"});
        no_positional(o, 0);
        auto db = open_database(o.required("--database"), false);
        QJsonArray list;
        for (const ReagentLot& l : LotStore(db->connection()).list(o.value("--reagent").trimmed()))
            list.append(lot_json(l));
        out.out = QJsonDocument(QJsonObject{{"lots", list}}).toJson(QJsonDocument::Indented);
        return out;
    }
    if (sub == QLatin1String("add")) {
        const Options o =
            parse(args.mid(1), {"--database", "--reagent", "--lot", "--supplier", "--received-on",
                                "--opened-on", "--expires-on", "--quantity", "--as"});
        no_positional(o, 0);
        ReagentLot l;
        l.reagent = o.value("--reagent").trimmed();
        l.lot = o.value("--lot").trimmed();
        l.supplier = o.value("--supplier").trimmed();
        l.received_on = o.value("--received-on").trimmed();
        l.opened_on = o.value("--opened-on").trimmed();
        l.expires_on = o.value("--expires-on").trimmed();
        if (o.has("--quantity"))
            read_lot_quantity(o.value("--quantity"), l);
        validate_lot(l); // every field before the database is opened or a password read
        auto db = open_database(o.required("--database"), false);
        require_library_reagent(l.reagent, data_dir, *db);
        AccountStore accounts(db->connection());
        QString who = o.value("--as").trimmed();
        if (who.isEmpty())
            throw chem::Error("as", "is required: the login that puts the lot on the shelf (its "
                                    "password is read first)");
        if (accounts.any())
            who = sign_in(accounts, who, read_secret).login;
        const ReagentLot stored = LotStore(db->connection()).add(l, who);
        out.out = QJsonDocument(lot_json(stored)).toJson(QJsonDocument::Indented);
        return out;
    }
    if (sub == QLatin1String("open")) {
        const Options o =
            parse(args.mid(1), {"--database", "--reagent", "--lot", "--opened-on", "--as"});
        no_positional(o, 0);
        const QString reagent = o.value("--reagent").trimmed();
        const QString lot = o.value("--lot").trimmed();
        const QString opened_on = o.value("--opened-on").trimmed();
        if (reagent.isEmpty())
            throw chem::Error("reagent", "is required: the library reagent the lot is of");
        if (lot.isEmpty())
            throw chem::Error("lot", "is required: the lot number on the supplier's label");
        if (opened_on.isEmpty())
            throw chem::Error("opened_on", "is required: the day the lot was opened (YYYY-MM-DD)");
        chem::parse_local_date(opened_on.toStdString(), "opened_on"); // before a password is read
        QString who = o.value("--as").trimmed();
        if (who.isEmpty())
            throw chem::Error("as", "is required: the login that records the opening (its "
                                    "password is read first)");
        auto db = open_database(o.required("--database"), false);
        LotStore shelf(db->connection());
        if (!shelf.find(reagent, lot))
            throw chem::Error("lot", "no lot " + quoted(lot) + " of " + quoted(reagent) +
                                         " on the shelf (phaseplan-cli lot list shows them)");
        AccountStore accounts(db->connection());
        if (accounts.any())
            who = sign_in(accounts, who, read_secret).login;
        const ReagentLot stored = shelf.set_opened(reagent, lot, opened_on, who);
        out.out = QJsonDocument(lot_json(stored)).toJson(QJsonDocument::Indented);
        return out;
    }
    throw chem::Error("command", "lot " + quoted(sub) + " is not add, list or open");
}

/// The tables in the order of the migration steps (a table before the ones that refer to it).
const char* const copied_tables[] = {
    "buffers",       "lines",           "methods",      "sequences",    "settings",
    "library_files", "library_shipped", "library_user", "batches",      "batch_history",
    "devices",       "set_aside",       "columns",      "users",        "audit_log",
    "audit_anchor",  "signatures",      "reagent_lots", "retired_names"};

/// The columns of `table` in the source (SQLite), in their order.
QStringList sqlite_columns(QSqlDatabase db, const QString& table) {
    QSqlQuery q = sql::run(db, "SELECT name FROM pragma_table_info(?) ORDER BY cid", {table});
    QStringList out;
    while (q.next())
        out << q.value(0).toString();
    return out;
}

CliOutput db_copy(const Options& o) {
    const QString from = o.required("--from");
    const QString to = o.required("--to");
    if (sql::is_postgresql_uri(from))
        throw chem::Error("from", "give the bench's SQLite file (FILE.db); the lab database is "
                                  "the target, --to");
    ReadOnlyFile source(from);
    const int version = sql::schema_version(source.db());
    if (version != latest_schema_version())
        throw chem::Error("from", quoted(from) + " has schema version " + std::to_string(version) +
                                      ", not this program's " +
                                      std::to_string(latest_schema_version()) +
                                      ": open it once with this PhasePlan first");
    const AuditVerification before = verify_all(source.db());
    if (!before.intact)
        throw chem::Error("from", quoted(from) + "'s audit trail is broken at entry " +
                                      std::to_string(before.first_bad_seq) +
                                      ": run audit verify on it; nothing was copied");
    Database target(to);
    if (!target.writable())
        throw chem::Error("to", target.read_only_reason().toStdString());
    // Never overwrite: every table of the target must be empty.
    QStringList holding;
    for (const char* table : copied_tables) {
        QSqlQuery n = target.exec(QStringLiteral("SELECT count(*) FROM %1").arg(table));
        if (n.next() && n.value(0).toLongLong() > 0)
            holding << QStringLiteral("%1 %2").arg(n.value(0).toLongLong()).arg(table);
    }
    if (!holding.isEmpty())
        throw chem::Error("to", "the target " + shown_location(to).toStdString() +
                                    " already holds records (" +
                                    holding.mid(0, 3).join(", ").toStdString() +
                                    "): db copy never overwrites; give an empty database");
    QJsonObject counts;
    {
        Database::Transaction t(target);
        QSqlDatabase dst = target.connection();
        for (const char* table : copied_tables) {
            // Column names come from the file, so only names the target's own schema has are
            // written into the INSERT (never a name as the file spells it otherwise).
            const QStringList cols = sqlite_columns(source.db(), table);
            for (const QString& c : cols)
                if (!sql::column_exists(dst, QString::fromLatin1(table), c))
                    throw chem::Error("from", quoted(from) + " has a column " + quoted(c) + " in " +
                                                  table +
                                                  " that PhasePlan's schema does not have; "
                                                  "nothing was copied");
            QStringList marks;
            for (int i = 0; i < cols.size(); ++i)
                marks << QStringLiteral("?");
            QSqlQuery insert(dst);
            if (!insert.prepare(QStringLiteral("INSERT INTO %1 (%2) VALUES (%3)")
                                    .arg(table, cols.join(", "), marks.join(", "))))
                throw Failure(Failure::Kind::database,
                              sql::failure_sentence(insert.lastError()).toStdString());
            QSqlQuery rows = sql::run(
                source.db(),
                QStringLiteral("SELECT %1 FROM %2 ORDER BY rowid").arg(cols.join(", "), table));
            qint64 n = 0;
            while (rows.next()) {
                for (int i = 0; i < cols.size(); ++i)
                    insert.bindValue(i, rows.value(i)); // NULL stays NULL
                if (!insert.exec())
                    throw Failure(Failure::Kind::database,
                                  QStringLiteral("copying %1 row %2: %3")
                                      .arg(table)
                                      .arg(n + 1)
                                      .arg(sql::failure_sentence(insert.lastError()))
                                      .toStdString());
                ++n;
            }
            counts[table] = n;
        }
        // Ids given by the engine go on after the copied ones.
        if (target.is_postgresql())
            for (const auto& [table, column] : {std::pair{"batch_history", "seq"},
                                                {"set_aside", "id"},
                                                {"columns", "id"},
                                                {"reagent_lots", "id"}})
                target.exec(QStringLiteral("SELECT setval(pg_get_serial_sequence('%1', '%2'),"
                                           " coalesce(max(%2), 0) + 1, false) FROM %1")
                                .arg(table, column));
        t.commit();
    }
    const AuditVerification after = verify_all(target.connection());
    if (!after.intact || after.entries != before.entries || after.head_hash != before.head_hash)
        throw chem::Error("to", "the copy's audit trail does not verify (" +
                                    after.problem.toStdString() + ")");
    CliOutput out;
    out.out = QJsonDocument(QJsonObject{{"from", QFileInfo(from).fileName()},
                                        {"to", shown_location(to)},
                                        {"rows", counts},
                                        {"chain", verification_json(after)}})
                  .toJson(QJsonDocument::Indented);
    return out;
}

CliOutput db_command(const QStringList& args, const QString& data_dir) {
    if (!args.isEmpty() && args.first() == QLatin1String("copy")) {
        const Options o = parse(args.mid(1), {"--from", "--to"});
        no_positional(o, 0);
        return db_copy(o);
    }
    if (args.isEmpty() || args.first() != QLatin1String("demo"))
        throw chem::Error("command", "db needs demo or copy");
    const Options o = parse(args.mid(1), {"--database"});
    no_positional(o, 0);
    const QString path = o.required("--database");
    if (!sql::is_postgresql_uri(path) && (QFileInfo::exists(path) || QFileInfo(path).isSymLink()))
        throw Failure(Failure::Kind::database,
                      quoted(path) + " exists: the demo goes only into a new file");
    Database db(path, -1, [&](Database& d) { seed_demo(d, data_dir); });
    if (!db.created())
        throw Failure(Failure::Kind::database,
                      "the lab database " + shown_location(path).toStdString() +
                          " already holds a PhasePlan schema: the demo goes "
                          "only into an empty database");
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
    if (group == QLatin1String("lot"))
        return lot_command(args, read_secret, data_dir);
    throw chem::Error("command", "unknown command " + quoted(group));
}

} // namespace phaseplan::storage
