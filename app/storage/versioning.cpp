#include "storage/versioning.h"

#include "storage/accounts.h"
#include "storage/sql_util.h"

#include <QDateTime>
#include <QSqlQuery>

namespace phaseplan::storage {

namespace {

/// The tables whose rows people edit and save (each gets version, changed_by, changed_at).
const char* const versioned_tables[] = {"buffers", "lines", "methods", "sequences", "batches"};
/// Writes to these move the change counter (signatures change what a batch shows).
const char* const counted_tables[] = {"buffers",   "lines",   "methods",
                                      "sequences", "batches", "signatures"};

} // namespace

QStringList versioning_schema_statements(sql::Dialect d, bool documents) {
    QStringList s;
    const auto skip = [&](const char* t) {
        return !documents && QLatin1String(t) != QLatin1String("batches") &&
               QLatin1String(t) != QLatin1String("signatures");
    };
    for (const char* t : versioned_tables) {
        if (skip(t))
            continue;
        const QString table = QLatin1String(t);
        s << QStringLiteral("ALTER TABLE %1 ADD COLUMN version INTEGER NOT NULL DEFAULT 1"
                            " CHECK (version >= 1)")
                 .arg(table);
        s << QStringLiteral("ALTER TABLE %1 ADD COLUMN changed_by TEXT NOT NULL DEFAULT ''")
                 .arg(table);
        s << QStringLiteral("ALTER TABLE %1 ADD COLUMN changed_at TEXT NOT NULL DEFAULT ''")
                 .arg(table);
    }
    // Rows saved before this step: version 1 (the default above), changed when last updated; a
    // batch by whoever wrote its last history row.
    for (const char* t : {"buffers", "lines", "methods", "sequences"})
        if (!skip(t))
            s << QStringLiteral("UPDATE %1 SET changed_at = updated_at").arg(QLatin1String(t));
    s << QStringLiteral(
        "UPDATE batches SET changed_at = updated_at, changed_by = COALESCE((SELECT h.who FROM"
        " batch_history h WHERE h.batch_id = batches.id ORDER BY h.seq DESC LIMIT 1), '')");
    s << QStringLiteral("CREATE TABLE change_counter ("
                        " id INTEGER PRIMARY KEY NOT NULL CHECK (id = 1),"
                        " counter BIGINT NOT NULL DEFAULT 0)");
    s << QStringLiteral("INSERT INTO change_counter (id, counter) VALUES (1, 0)");
    if (d == sql::Dialect::postgresql)
        s << QStringLiteral("CREATE OR REPLACE FUNCTION change_counter_bump() RETURNS trigger"
                            " LANGUAGE plpgsql AS $fn$ BEGIN UPDATE change_counter SET counter ="
                            " counter + 1 WHERE id = 1; RETURN NULL; END $fn$");
    for (const char* t : counted_tables) {
        if (skip(t))
            continue;
        const QString table = QLatin1String(t);
        if (d == sql::Dialect::postgresql) {
            s << QStringLiteral("CREATE TRIGGER %1_counted AFTER INSERT OR UPDATE OR DELETE ON %1"
                                " FOR EACH STATEMENT EXECUTE FUNCTION change_counter_bump()")
                     .arg(table);
            continue;
        }
        for (const char* event : {"INSERT", "UPDATE", "DELETE"})
            s << QStringLiteral("CREATE TRIGGER %1_counted_%2 AFTER %3 ON %1 BEGIN UPDATE"
                                " change_counter SET counter = counter + 1 WHERE id = 1; END")
                     .arg(table, QString::fromLatin1(event).toLower(), QLatin1String(event));
    }
    return s;
}

QStringList retired_names_schema_statements() {
    // `kind` is the table ("buffers", "lines", "methods", "sequences"). One row per name: a name
    // retired again keeps only its latest retirement (its versions only go up).
    return {QStringLiteral("CREATE TABLE retired_names ("
                           " kind TEXT NOT NULL, name TEXT NOT NULL,"
                           " last_version INTEGER NOT NULL CHECK (last_version >= 1),"
                           " renamed_to TEXT, retired_by TEXT NOT NULL, retired_at TEXT NOT NULL,"
                           " PRIMARY KEY (kind, name))")};
}

bool has_versioning(QSqlDatabase db) {
    return sql::column_exists(db, QStringLiteral("batches"), QStringLiteral("version"));
}

ConflictError::ConflictError(const QString& message, RowStamp theirs, QString person_words,
                             QString time_words, const std::string& field)
    : chem::Error(field, message.toStdString()), theirs_(std::move(theirs)),
      person_(std::move(person_words)), time_(std::move(time_words)) {}

QString person_words(QSqlDatabase db, const QString& login) {
    const QString who = login.trimmed();
    if (who.isEmpty())
        return QStringLiteral("someone");
    if (sql::table_exists(db, QStringLiteral("users"))) {
        const std::optional<Account> a = AccountStore(db).find(who);
        if (a && !a->display_name.trimmed().isEmpty() && a->display_name.trimmed() != who)
            return QStringLiteral("%1 (%2)").arg(a->display_name.trimmed(), who);
    }
    return who;
}

QString utc_time_words(const QString& utc_iso) {
    QDateTime t = QDateTime::fromString(utc_iso, Qt::ISODateWithMs);
    if (!t.isValid())
        t = QDateTime::fromString(utc_iso, Qt::ISODate);
    if (!t.isValid())
        return QStringLiteral("an unknown time");
    return t.toUTC().toString(QStringLiteral("yyyy-MM-dd HH:mm")) + QStringLiteral(" UTC");
}

ConflictError conflict_error(QSqlDatabase db, const QString& record, const RowStamp& theirs) {
    if (theirs.version == 0)
        return ConflictError(
            QStringLiteral(
                "%1 was renamed or removed on another bench after you opened it; save yours as a "
                "copy to keep your edits")
                .arg(record),
            theirs, QStringLiteral("someone"), QStringLiteral("an unknown time"));
    const QString person = person_words(db, theirs.changed_by);
    const QString time = utc_time_words(theirs.changed_at);
    return ConflictError(QStringLiteral("%1: changed by %2 at %3 after you opened it; reload it, "
                                        "or save yours as a copy")
                             .arg(record, person, time),
                         theirs, person, time);
}

ConflictError retired_error(QSqlDatabase db, const QString& record, const Retirement& gone) {
    const QString person = person_words(db, gone.retired_by);
    const QString time = utc_time_words(gone.retired_at);
    const QString sentence =
        gone.renamed_to.isEmpty()
            ? QStringLiteral("%1 was removed by %2 at %3 after you opened it; save yours as a "
                             "copy to keep your edits")
                  .arg(record, person, time)
            : QStringLiteral("%1 was renamed to \"%2\" by %3 at %4 after you opened it; reload "
                             "to open \"%2\", or save yours as a copy")
                  .arg(record, gone.renamed_to, person, time);
    return ConflictError(sentence, RowStamp{}, person, time);
}

ConflictError name_taken_error(QSqlDatabase db, const QString& what, const QString& name,
                               const RowStamp& theirs) {
    const QString person = person_words(db, theirs.changed_by);
    const QString time = utc_time_words(theirs.changed_at);
    const QString article =
        QStringLiteral("aeiou").contains(what.left(1)) ? QStringLiteral("An") : QStringLiteral("A");
    return ConflictError(QStringLiteral("%1 %2 named \"%3\" was saved by %4 at %5; choose another "
                                        "name, or open it")
                             .arg(article, what, name, person, time),
                         theirs, person, time, "name");
}

qint64 change_counter(QSqlDatabase db) {
    if (!sql::table_exists(db, QStringLiteral("change_counter")))
        return 0;
    QSqlQuery q = sql::run(db, QStringLiteral("SELECT counter FROM change_counter WHERE id = 1"));
    return q.next() ? q.value(0).toLongLong() : 0;
}

} // namespace phaseplan::storage
