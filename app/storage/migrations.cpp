// The schema of the lab's database, as an ordered list of forward steps.
//
// HOW TO ADD A STEP (e.g. batches and their history):
//   1. Append one entry at the END of the list below with the next version number
//      ({4, "batches and their append-only history", [](Database& db) { db.exec("CREATE …"); }}).
//   2. Never edit or reorder a step that has shipped: files in the field are at that version
//      already and will only run the steps after it.
//   3. All pending steps run inside one BEGIN IMMEDIATE transaction together with
//      `PRAGMA user_version` (read under that lock), so a failure (or a kill) leaves the file at
//      its previous version, unchanged, and two programs opening it at once cannot both migrate.
//   4. Add a case to tests/tst_storage.cpp (migrate_from_older) that builds a file at the previous
//      version with Database(path, version - 1), fills it, and reopens it at the latest.
// Opening a file whose version is newer than the last step is refused (an older program must not
// write a newer file).
#include "storage/database.h"

#include "storage/audit_trail.h"
#include "storage/batch_store.h"
#include "storage/lot_store.h"
#include "storage/versioning.h"

#include <QJsonArray>
#include <QJsonDocument>
#include <QSqlQuery>

namespace phaseplan::storage {

namespace {

void create_document_table(Database& db, const char* table) {
    // name is the key the lab sees and types; the document is the JSON of the CLI contract.
    db.exec(QStringLiteral("CREATE TABLE %1 ("
                           " name TEXT PRIMARY KEY NOT NULL CHECK (length(name) > 0),"
                           " document TEXT NOT NULL CHECK (json_valid(document)),"
                           " created_at TEXT NOT NULL,"
                           " updated_at TEXT NOT NULL)")
                .arg(QLatin1String(table)));
}

QJsonValue history_value(const QVariant& v) {
    if (v.isNull())
        return QJsonValue::Null;
    const QJsonArray a = QJsonDocument::fromJson(v.toString().toUtf8()).array();
    return a.isEmpty() ? QJsonValue(QJsonValue::Null) : a.at(0);
}

/// The batch history written before step 10 becomes the start of the audit trail: one entry per
/// change (rows of one batch, revision, action, time, person and reason), in the order written,
/// with the time and the name recorded then.
void backfill_audit_from_history(Database& db) {
    QSqlQuery q = db.exec(QStringLiteral(
        "SELECT batch_id, revision, at, who, action, field, old_value, new_value, reason"
        " FROM batch_history ORDER BY seq"));
    struct Group {
        QString batch, at, who, action, reason;
        int revision = 0;
        QJsonObject changes;
    };
    std::vector<Group> groups;
    while (q.next()) {
        Group g;
        g.batch = q.value(0).toString();
        g.revision = q.value(1).toInt();
        g.at = q.value(2).toString();
        g.who = q.value(3).toString();
        g.action = q.value(4).toString();
        g.reason = q.value(8).toString();
        if (groups.empty() || groups.back().batch != g.batch ||
            groups.back().revision != g.revision || groups.back().at != g.at ||
            groups.back().who != g.who || groups.back().action != g.action ||
            groups.back().reason != g.reason)
            groups.push_back(g);
        groups.back().changes.insert(
            q.value(5).toString(),
            QJsonObject{{"old", history_value(q.value(6))}, {"new", history_value(q.value(7))}});
    }
    for (const Group& g : groups)
        append_audit(db.connection(), g.at, g.who, g.action, QStringLiteral("batch"), g.batch,
                     g.reason, g.changes);
}

} // namespace

const std::vector<Migration>& migrations() {
    static const std::vector<Migration> steps = {
        {1, "saved buffers, lines, methods, sequences; settings",
         [](Database& db) {
             // PostgreSQL: json_valid() for the CHECKs below and in later steps.
             for (const QString& sql : sql::json_function_statements(db.dialect()))
                 db.exec(sql);
             for (const char* t : {"buffers", "lines", "methods", "sequences"})
                 create_document_table(db, t);
             db.exec("CREATE TABLE settings (key TEXT PRIMARY KEY NOT NULL, value TEXT NOT NULL)");
         }},
        {2, "library: shipped files and entries, the lab's own entries kept apart",
         [](Database& db) {
             // The content of each data/ file as last seeded, to notice an update of data/.
             db.exec_ddl("CREATE TABLE library_files ("
                         " file TEXT PRIMARY KEY NOT NULL, sha256 TEXT NOT NULL,"
                         " content {blob} NOT NULL, seeded_at TEXT NOT NULL)");
             // Replaced wholesale from data/ on an update.
             db.exec("CREATE TABLE library_shipped ("
                     " kind TEXT NOT NULL, id TEXT NOT NULL, file TEXT NOT NULL,"
                     " document TEXT NOT NULL CHECK (json_valid(document)),"
                     " PRIMARY KEY (kind, id))");
             // Written only by the lab; wins over library_shipped on the same (kind, id).
             db.exec("CREATE TABLE library_user ("
                     " kind TEXT NOT NULL, id TEXT NOT NULL,"
                     " document TEXT NOT NULL CHECK (json_valid(document)),"
                     " source TEXT NOT NULL CHECK (length(source) > 0),"
                     " created_at TEXT NOT NULL, updated_at TEXT NOT NULL,"
                     " PRIMARY KEY (kind, id))");
         }},
        {3, "a note on each saved document; saved work listed by date",
         [](Database& db) {
             for (const char* t : {"buffers", "lines", "methods", "sequences"}) {
                 db.exec(QStringLiteral("ALTER TABLE %1 ADD COLUMN note TEXT NOT NULL DEFAULT ''")
                             .arg(QLatin1String(t)));
                 db.exec(QStringLiteral("CREATE INDEX %1_updated ON %1 (updated_at)")
                             .arg(QLatin1String(t)));
             }
         }},
        {4, "batches and their append-only history (app/storage/batch_store.h)",
         [](Database& db) {
             for (const QString& sql : batch_schema_statements(db.dialect()))
                 db.exec(sql);
         }},
        {5, "the lab's balances and pH meters (app/devices/device_store.h)",
         [](Database& db) {
             db.exec(
                 "CREATE TABLE devices ("
                 " id TEXT PRIMARY KEY NOT NULL CHECK (length(id) > 0),"
                 " name TEXT NOT NULL,"
                 " kind TEXT NOT NULL CHECK (kind IN ('balance', 'ph_meter')),"
                 " port TEXT NOT NULL,"
                 " baud INTEGER NOT NULL CHECK (baud > 0),"
                 " data_bits INTEGER NOT NULL CHECK (data_bits BETWEEN 5 AND 8),"
                 " parity TEXT NOT NULL CHECK (parity IN ('none', 'even', 'odd', 'mark', 'space')),"
                 " stop_bits TEXT NOT NULL CHECK (stop_bits IN ('1', '1.5', '2')),"
                 " flow_control TEXT NOT NULL CHECK (flow_control IN ('none', 'hardware', "
                 "'software')),"
                 " line_format TEXT NOT NULL,"
                 " unit TEXT NOT NULL,"
                 " calibration_due TEXT,"
                 " created_at TEXT NOT NULL, updated_at TEXT NOT NULL)");
         }},
        {6,
         "batch record at the bench: measured pH and its tolerance, pH meter, balance, comment, "
         "container, deviation note with who and when",
         [](Database& db) {
             for (const QString& sql : batch_schema_bench_statements(db.dialect()))
                 db.exec(sql);
         }},
        {7, "records over the read-back limits, set aside at open and named (never replayed)",
         [](Database& db) {
             db.exec_ddl(
                 "CREATE TABLE set_aside ("
                 " id {rowid_pk}, source TEXT NOT NULL, name TEXT NOT NULL,"
                 " content TEXT NOT NULL, reason TEXT NOT NULL, set_aside_at TEXT NOT NULL)");
         }},
        {8,
         "values taken from the instruments: the pH meter's capture record (the balance's is kept "
         "with each actual amount)",
         [](Database& db) {
             for (const QString& sql : batch_schema_capture_statements(db.dialect()))
                 db.exec(sql);
         }},
        {9,
         "the lab's columns: name and the `column` object of the pressure command "
         "(app/gui/column_library.h)",
         [](Database& db) {
             // document: {"length_mm", "id_mm", "particle_um", "porosity"?, "max_pressure_bar"?,
             // "ph_min"?, "ph_max"?, "temperature_c"?, "reference"?} as the CLI reads a column.
             db.exec_ddl("CREATE TABLE columns ("
                         " id {rowid_pk},"
                         " name TEXT NOT NULL UNIQUE CHECK (length(name) > 0),"
                         " document TEXT NOT NULL CHECK (json_valid(document)),"
                         " created_at TEXT NOT NULL, updated_at TEXT NOT NULL)");
         }},
        {10,
         "people and roles, the hash-chained audit trail, electronic signatures "
         "(app/storage/audit_trail.h, accounts.h, signatures.h); the batch history so far copied "
         "into the trail",
         [](Database& db) {
             for (const QString& sql : audit_schema_statements())
                 db.exec(sql);
             for (const QString& sql : audit_guard_statements(db.dialect()))
                 db.exec(sql);
             backfill_audit_from_history(db);
         }},
        {concurrency_schema_version,
         "two benches, one record: a version, who changed it last and when on every saved "
         "document and batch; the change counter other benches poll (app/storage/versioning.h)",
         [](Database& db) {
             for (const QString& sql : versioning_schema_statements(db.dialect()))
                 db.exec(sql);
         }},
        {lot_schema_version,
         "the reagent-lot shelf: each lot's number, supplier, received, opened and expiry dates "
         "and quantity (app/storage/lot_store.h)",
         [](Database& db) {
             for (const QString& sql : lot_schema_statements(db.dialect()))
                 db.exec(sql);
         }},
        {row_version_schema_version,
         "versions on what else people edit: the lab's library entries, instruments, columns, "
         "reagent lots and accounts, watched by the change counter (app/storage/versioning.h)",
         [](Database& db) {
             for (const QString& sql : row_version_schema_statements(db.dialect()))
                 db.exec(sql);
         }},
        {retired_names_schema_version,
         "names a saved document left (renamed away or removed), with its last version, whom and "
         "when: a document saved again under such a name goes on from there "
         "(app/storage/versioning.h)",
         [](Database& db) {
             for (const QString& sql : retired_names_schema_statements())
                 db.exec(sql);
         }},
        // Append new steps here (see the comment at the top of this file).
    };
    return steps;
}

int latest_schema_version() {
    return migrations().empty() ? 0 : migrations().back().version;
}

} // namespace phaseplan::storage
