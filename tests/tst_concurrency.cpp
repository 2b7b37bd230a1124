// Two benches, one record (issue 13, part 2; app/storage/versioning.h): two PROCESSES open the
// same batch, and the same saved buffer, on one database (a SQLite file, or the PostgreSQL test
// cluster on the _pg run, tests/test_backend.h). Both load the record; one saves; then the
// other saves from the version it loaded. The second save must be refused with the first
// person's name and the time, the first person's value must stay, and the second person's edits
// must be kept as a copy. Nothing is lost.
//
// The helper is this same binary run with --edit-batch / --edit-buffer under QProcess. Each
// helper prints "loaded <version>" once it holds the record, then waits for one line on standard
// input before it saves, so the order of the two saves is set by the test, not by timing.
//
// Sources: the rule itself (a save from a stale version is refused, "nothing is silently
// overwritten") is the issue's; optimistic locking with a version column checked in the UPDATE's
// WHERE clause is common practice, no source.
#include "core/failure.h"
#include "storage/accounts.h"
#include "storage/audit_trail.h"
#include "storage/batch_store.h"
#include "storage/database.h"
#include "storage/signatures.h"
#include "storage/versioning.h"
#include "test_backend.h"

#include <QCoreApplication>
#include <QJsonArray>
#include <QJsonDocument>
#include <QProcess>
#include <QTest>

#include <iostream>
#include <string>

using phaseplan::storage::AccountStore;
using phaseplan::storage::BatchRecord;
using phaseplan::storage::BatchStore;
using phaseplan::storage::ConflictError;
using phaseplan::storage::Database;
using phaseplan::storage::DocumentKind;
using phaseplan::storage::Role;

namespace {

const QString batch_id = QStringLiteral("HR-20261202-001");
const QString buffer_name = QStringLiteral("Phosphate 20 mM pH 2.5");

QJsonObject recipe_doc() {
    return QJsonObject{{"name", "Line A buffer: 20 mM sodium phosphate pH 2.5"},
                       {"target_ph", 2.5},
                       {"temperature_c", 25},
                       {"volume_ml", 2000},
                       {"route", "mix"},
                       {"acid", "phosphoric-acid"},
                       {"base", "sodium-dihydrogen-phosphate-monohydrate"},
                       {"concentration_mol_per_l", 0.02}};
}

void say(const QString& line) {
    std::cout << line.toStdString() << std::endl; // flushed: the test waits for it
}

/// The helper: loads the record, says so, waits for a line, saves from the loaded version.
/// Exit 0 saved; 1 refused for a conflict (the message on stdout, and the edits kept as a copy:
/// "copy <id or name>"); 2 anything else.
int run_helper(const QString& mode, const QString& where, const QString& who,
               const QString& value) {
    try {
        Database db(where);
        db.set_actor(who);
        if (mode == "--edit-batch") {
            BatchStore store(db.connection());
            BatchRecord mine = *store.load(batch_id);
            say(QStringLiteral("loaded %1").arg(mine.version));
            std::string go;
            std::getline(std::cin, go);
            mine.comment = value;
            try {
                store.edit(batch_id, mine, who);
                say(QStringLiteral("saved %1").arg(store.load(batch_id)->version));
                return 0;
            } catch (const ConflictError& e) {
                say(QStringLiteral("conflict ") + QString::fromStdString(e.message()));
                say(QStringLiteral("copy ") +
                    store.create_copy(mine, who, QStringLiteral("HR"), QDate(2026, 12, 2)));
                return 1;
            }
        }
        const QJsonObject loaded = *db.load(DocumentKind::buffer, buffer_name);
        const qint64 version = db.stamp(DocumentKind::buffer, buffer_name).version;
        say(QStringLiteral("loaded %1").arg(version));
        std::string go;
        std::getline(std::cin, go);
        if (mode == "--rename-buffer") { // `value` is the new name
            try {
                say(QStringLiteral("saved %1")
                        .arg(db.rename_checked(DocumentKind::buffer, buffer_name, value, version)));
                return 0;
            } catch (const ConflictError& e) {
                say(QStringLiteral("conflict ") + QString::fromStdString(e.message()));
                return 1;
            }
        }
        QJsonObject mine = loaded;
        mine["volume_ml"] = value.toDouble();
        try {
            say(QStringLiteral("saved %1")
                    .arg(db.save_checked(DocumentKind::buffer, buffer_name, mine, {}, version)));
            return 0;
        } catch (const ConflictError& e) {
            say(QStringLiteral("conflict ") + QString::fromStdString(e.message()));
            say(QStringLiteral("copy ") +
                db.save_copy(DocumentKind::buffer, buffer_name, mine, {}));
            return 1;
        }
    } catch (const chem::Error& e) {
        std::cout << "error " << e.what() << std::endl;
        return 2;
    } catch (const phaseplan::Failure& f) {
        std::cout << "error " << f.what() << std::endl;
        return 2;
    }
}

/// One helper process, started and holding the record.
struct Bench {
    QProcess p;
    QByteArray out;
    bool start(const QString& mode, const QString& where, const QString& who,
               const QString& value) {
        p.start(QCoreApplication::applicationFilePath(), {mode, where, who, value});
        if (!p.waitForStarted(30000))
            return false;
        while (!out.contains("\n")) {
            if (!p.waitForReadyRead(30000))
                return false;
            out += p.readAllStandardOutput();
        }
        return out.startsWith("loaded ");
    }
    /// Lets it save; its exit code.
    int save() {
        p.write("save\n");
        p.closeWriteChannel();
        if (!p.waitForFinished(30000))
            return -1;
        out += p.readAllStandardOutput();
        return p.exitCode();
    }
};

/// Mats's save of the demo buffer was refused naming Rosa's change (says so when not).
bool refused_naming_rosa(const QString& said) {
    const bool ok = said.contains(
        "conflict Buffer \"Phosphate 20 mM pH 2.5\": changed by Rosa Okafor (rosa) at ");
    if (!ok)
        qWarning("not refused naming Rosa: %s", qPrintable(said));
    return ok;
}

} // namespace

class TestConcurrency : public QObject {
    Q_OBJECT
    phaseplan::testing::TestDatabases databases_;

    /// A database with two preparers and the record both benches open.
    QString lab() {
        const QString where = databases_.fresh(QStringLiteral("lab.sqlite"));
        Database db(where);
        AccountStore accounts(db.connection());
        accounts.add("admin", "Lab Administrator", Role::administrator, "admin-password-1", {});
        accounts.add("mats", "Mats Lindqvist", Role::reviewer, "mats-password-1", "admin");
        accounts.add("rosa", "Rosa Okafor", Role::preparer, "rosa-password-1", "admin");
        QJsonObject in = recipe_doc();
        in["batch"] = QJsonObject{{"id", batch_id},
                                  {"prepared_by", "Rosa Okafor"},
                                  {"prepared_at", "2026-12-02T16:30:00"},
                                  {"comment", "as prepared"}};
        BatchStore(db.connection()).create(BatchRecord::from_input(in), "rosa");
        db.set_actor("rosa");
        db.save_checked(DocumentKind::buffer, buffer_name, recipe_doc(), {}, 0);
        return where;
    }

  private slots:
    void initTestCase() { PHASEPLAN_REQUIRE_BACKEND(); }

    void migrated_rows_start_at_version_1() {
        // A database built at the step before versions, with a saved buffer and a batch, then
        // opened by this program: both rows read back at version 1 with who and when filled in
        // (the batch's from its history).
        const QString where = databases_.fresh(QStringLiteral("old.sqlite"));
        {
            Database old(where, phaseplan::storage::concurrency_schema_version - 1);
            old.save(DocumentKind::buffer, buffer_name, recipe_doc());
            QJsonObject in = recipe_doc();
            in["batch"] = QJsonObject{{"id", batch_id}};
            BatchStore(old.connection()).create(BatchRecord::from_input(in), "R. Okafor");
            QVERIFY(!old.versioned());
        }
        Database db(where);
        QVERIFY(db.versioned());
        const auto stamp = db.stamp(DocumentKind::buffer, buffer_name);
        QCOMPARE(stamp.version, qint64(1));
        QVERIFY(!stamp.changed_at.isEmpty());
        const BatchRecord b = *BatchStore(db.connection()).load(batch_id);
        QCOMPARE(b.version, qint64(1));
        QCOMPARE(b.changed_by, QString("R. Okafor"));
        QCOMPARE(b.changed_at, b.updated_at);
    }

    void second_batch_save_is_refused_and_nothing_is_lost() {
        const QString where = lab();
        const qint64 counter_before =
            phaseplan::storage::change_counter(Database(where).connection());
        Bench rosa, mats;
        QVERIFY2(rosa.start("--edit-batch", where, "rosa", "pH re-checked at 2.51"), rosa.out);
        QVERIFY2(mats.start("--edit-batch", where, "mats", "label reprinted"), mats.out);
        QCOMPARE(rosa.out.trimmed(), QByteArray("loaded 1"));
        QCOMPARE(mats.out.trimmed(), QByteArray("loaded 1"));
        QCOMPARE(mats.save(), 0);
        QVERIFY2(mats.out.contains("saved 2"), mats.out);
        QCOMPARE(rosa.save(), 1); // loaded at 1, the database holds 2: refused
        const QString said = QString::fromUtf8(rosa.out);
        QVERIFY2(said.contains("conflict Batch HR-20261202-001: changed by Mats Lindqvist (mats) "
                               "at "),
                 qPrintable(said));
        QVERIFY2(said.contains(" UTC after you opened it; reload it, or save yours as a copy"),
                 qPrintable(said));

        Database db(where);
        BatchStore store(db.connection());
        const BatchRecord kept = *store.load(batch_id);
        QCOMPARE(kept.comment, QString("label reprinted")); // the winner's value
        QCOMPARE(kept.version, qint64(2));
        QCOMPARE(kept.changed_by, QString("mats"));
        // The loser's edits, under a new id, with where they came from.
        const QString copy_id = said.section("copy ", 1).trimmed();
        QCOMPARE(copy_id, QString("HR-20261202-002"));
        const BatchRecord copy = *store.load(copy_id);
        QCOMPARE(copy.comment, QString("Copy of HR-20261202-001: pH re-checked at 2.51"));
        QCOMPARE(copy.changed_by, QString("rosa"));
        QCOMPARE(copy.version, qint64(1));
        // The refused save wrote nothing: one edit in the history after the creation.
        int edits = 0;
        for (const auto& h : store.history(batch_id))
            edits += h.action == "edit";
        QCOMPARE(edits, 1);
        QVERIFY(phaseplan::storage::verify_all(db.connection()).intact);
        // Other benches see that something changed.
        QVERIFY(phaseplan::storage::change_counter(db.connection()) > counter_before);
    }

    void second_buffer_save_is_refused_and_nothing_is_lost() {
        const QString where = lab();
        Bench rosa, mats;
        QVERIFY2(rosa.start("--edit-buffer", where, "rosa", "1500"), rosa.out);
        QVERIFY2(mats.start("--edit-buffer", where, "mats", "2500"), mats.out);
        QCOMPARE(rosa.save(), 0);
        QCOMPARE(mats.save(), 1);
        const QString said = QString::fromUtf8(mats.out);
        QVERIFY(refused_naming_rosa(said));
        Database db(where);
        QCOMPARE(db.load(DocumentKind::buffer, buffer_name)->value("volume_ml").toDouble(), 1500.0);
        QCOMPARE(db.stamp(DocumentKind::buffer, buffer_name).version, qint64(2));
        QCOMPARE(db.stamp(DocumentKind::buffer, buffer_name).changed_by, QString("rosa"));
        QCOMPARE(said.section("copy ", 1).trimmed(), buffer_name + " (copy)");
        QCOMPARE(
            db.load(DocumentKind::buffer, buffer_name + " (copy)")->value("volume_ml").toDouble(),
            2500.0);
    }

    void stale_rename_is_refused_and_nothing_is_lost() {
        // Rosa saves the buffer; Mats, who loaded it before, renames it: refused, naming Rosa.
        const QString where = lab();
        Bench rosa, mats;
        QVERIFY2(rosa.start("--edit-buffer", where, "rosa", "1500"), rosa.out);
        QVERIFY2(mats.start("--rename-buffer", where, "mats", "Line A buffer"), mats.out);
        QCOMPARE(rosa.save(), 0);
        QCOMPARE(mats.save(), 1);
        const QString said = QString::fromUtf8(mats.out);
        QVERIFY(refused_naming_rosa(said));
        Database db(where);
        QCOMPARE(db.load(DocumentKind::buffer, buffer_name)->value("volume_ml").toDouble(), 1500.0);
        QVERIFY(!db.load(DocumentKind::buffer, "Line A buffer"));
        // Both rename from the same version: the first wins, the second is told it is gone.
        Bench a, b;
        QVERIFY2(a.start("--rename-buffer", where, "rosa", "Line A buffer"), a.out);
        QVERIFY2(b.start("--rename-buffer", where, "mats", "Assay buffer"), b.out);
        QCOMPARE(a.save(), 0);
        QCOMPARE(b.save(), 1);
        // It says who renamed it, to what, and when (retired_names, app/storage/versioning.h).
        QVERIFY2(QString::fromUtf8(b.out).contains(
                     "conflict Buffer \"Phosphate 20 mM pH 2.5\" was renamed to \"Line A "
                     "buffer\" by Rosa Okafor (rosa) at "),
                 b.out);
        QVERIFY2(QString::fromUtf8(b.out).contains(
                     "after you opened it; reload to open \"Line A buffer\", or save yours as a "
                     "copy"),
                 b.out);
        QCOMPARE(db.current_name(DocumentKind::buffer, buffer_name), QString("Line A buffer"));
        QVERIFY(db.load(DocumentKind::buffer, "Line A buffer"));
        QVERIFY(!db.load(DocumentKind::buffer, "Assay buffer"));
        QCOMPARE(db.stamp(DocumentKind::buffer, "Line A buffer").version, qint64(3));
    }

    void a_name_saved_again_goes_on_from_its_old_versions() {
        // Mats holds version 1 of the buffer. Meanwhile Rosa renames it away and saves a new
        // buffer under the old name. Were the new one at version 1 again, Mats's save would
        // overwrite it silently; it goes on from the old versions, so his save is refused.
        const QString where = lab();
        Bench mats;
        QVERIFY2(mats.start("--edit-buffer", where, "mats", "2500"), mats.out);
        {
            Database db(where);
            db.set_actor("rosa");
            QCOMPARE(db.rename_checked(DocumentKind::buffer, buffer_name, "Old phosphate", 1),
                     qint64(2));
            QJsonObject fresh = recipe_doc();
            fresh["volume_ml"] = 500.0;
            QCOMPARE(db.save_checked(DocumentKind::buffer, buffer_name, fresh, {}, 0), qint64(2));
        }
        QCOMPARE(mats.save(), 1);
        QVERIFY(refused_naming_rosa(QString::fromUtf8(mats.out)));
        Database db(where);
        QCOMPARE(db.load(DocumentKind::buffer, buffer_name)->value("volume_ml").toDouble(), 500.0);
        QCOMPARE(db.load(DocumentKind::buffer, "Old phosphate")->value("volume_ml").toDouble(),
                 2000.0);
        QCOMPARE(db.current_name(DocumentKind::buffer, buffer_name), buffer_name);

        // Removed, then saved again by the unchecked path (demo, import): the same rule.
        db.set_actor("mats");
        QVERIFY(db.remove(DocumentKind::buffer, buffer_name));
        QCOMPARE(db.current_name(DocumentKind::buffer, buffer_name), QString());
        try {
            db.save_checked(DocumentKind::buffer, buffer_name, recipe_doc(), {}, 2);
            QFAIL("a save to a removed buffer went through");
        } catch (const ConflictError& e) {
            const QString said = QString::fromStdString(e.message());
            QVERIFY2(said.startsWith("Buffer \"Phosphate 20 mM pH 2.5\" was removed by Mats "
                                     "Lindqvist (mats) at "),
                     qPrintable(said));
            QVERIFY2(said.endsWith("after you opened it; save yours as a copy to keep your edits"),
                     qPrintable(said));
        }
        db.save(DocumentKind::buffer, buffer_name, recipe_doc());
        QCOMPARE(db.stamp(DocumentKind::buffer, buffer_name).version, qint64(3));

        // Renamed onto a name that once held higher versions: above them too.
        QCOMPARE(db.save_checked(DocumentKind::method, "Assay", QJsonObject{}, {}, 0), qint64(1));
        for (qint64 v = 1; v <= 3; ++v)
            db.save_checked(DocumentKind::method, "Assay", QJsonObject{{"v", v}}, {}, v);
        QVERIFY(db.remove(DocumentKind::method, "Assay"));
        QCOMPARE(db.save_checked(DocumentKind::method, "Draft", QJsonObject{}, {}, 0), qint64(1));
        QCOMPARE(db.rename_checked(DocumentKind::method, "Draft", "Assay", 1), qint64(5));
        // A chain of renames is followed to its end.
        db.rename_checked(DocumentKind::method, "Assay", "Assay v2", 5);
        QCOMPARE(db.current_name(DocumentKind::method, "Draft"), QString("Assay v2"));
    }

    void taken_names_are_refused_naming_who_saved_them() {
        // A rename onto a name someone saved, and a save_all whose sequence must be new: refused
        // with field "name" and the person and time; nothing of either is written (all or none).
        const QString where = lab();
        Database db(where);
        db.set_actor("mats");
        db.save_checked(DocumentKind::buffer, "Assay buffer", recipe_doc(), "mats's", 0);
        db.set_actor("rosa");
        try {
            db.rename_checked(DocumentKind::buffer, buffer_name, "Assay buffer", 1);
            QFAIL("a rename onto a taken name went through");
        } catch (const ConflictError& e) {
            QCOMPARE(QString::fromStdString(e.field()), QString("name"));
            const QString said = QString::fromStdString(e.message());
            QVERIFY2(said.startsWith("A buffer named \"Assay buffer\" was saved by Mats Lindqvist "
                                     "(mats) at "),
                     qPrintable(said));
            QVERIFY2(said.endsWith(" UTC; choose another name, or open it"), qPrintable(said));
        }
        QCOMPARE(db.list(DocumentKind::buffer).size(), size_t(2));
        QCOMPARE(db.info(DocumentKind::buffer, "Assay buffer")->note, QString("mats's"));
        db.set_actor("mats");
        db.save_checked(DocumentKind::sequence, "Tonight", QJsonObject{{"note", "mats"}}, {}, 0);
        db.set_actor("rosa");
        phaseplan::storage::SavedDocument seq{
            DocumentKind::sequence, "Tonight", QJsonObject{{"note", "rosa"}}, {}};
        seq.expected_version = 0;
        phaseplan::storage::SavedDocument method{
            DocumentKind::method, "Assay", QJsonObject{{"flow_ml_min", 1.0}}, {}};
        method.expected_version = 0;
        try {
            db.save_all({method, seq});
            QFAIL("a Save as onto a taken plan name went through");
        } catch (const ConflictError& e) {
            QVERIFY2(QString::fromStdString(e.message())
                         .startsWith("A plan named \"Tonight\" was saved by Mats Lindqvist (mats)"),
                     e.what());
        }
        QCOMPARE(db.load(DocumentKind::sequence, "Tonight")->value("note").toString(),
                 QString("mats"));
        QVERIFY(!db.load(DocumentKind::method, "Assay")); // all or none
        // A stale version in save_all: refused too; the loaded version goes through.
        seq.expected_version = 1;
        db.save_all({method, seq});
        QCOMPARE(db.load(DocumentKind::sequence, "Tonight")->value("note").toString(),
                 QString("rosa"));
        QVERIFY_THROWS_EXCEPTION(ConflictError, db.save_all({seq}));
        QCOMPARE(db.stamp(DocumentKind::sequence, "Tonight").version, qint64(2));
    }

    void same_process_stale_save_is_refused_too() {
        // The check is in the database, not in the helper: a stale version from the same
        // connection is refused as well, and a new name must be new.
        const QString where = lab();
        Database db(where);
        db.set_actor("mats");
        QCOMPARE(db.save_checked(DocumentKind::buffer, buffer_name, recipe_doc(), "a", 1),
                 qint64(2));
        QVERIFY_THROWS_EXCEPTION(ConflictError, db.save_checked(DocumentKind::buffer, buffer_name,
                                                                recipe_doc(), "b", 1));
        QVERIFY_THROWS_EXCEPTION(ConflictError, db.save_checked(DocumentKind::buffer, buffer_name,
                                                                recipe_doc(), "c", 0));
        QCOMPARE(db.list(DocumentKind::buffer).front().note, QString("a"));
        // Printing from a stale screen is refused as well.
        BatchStore store(db.connection());
        BatchRecord b = *store.load(batch_id);
        b.comment = "changed";
        QVERIFY(store.edit(batch_id, b, "mats"));
        // Signing what the signer was not shown is refused as well (21 CFR 11.70: a signature is
        // bound to the record it was given to; the version check is this program's way).
        phaseplan::storage::SignatureStore signatures(db.connection());
        QVERIFY_THROWS_EXCEPTION(ConflictError, signatures.sign(batch_id, "rosa", "rosa-password-1",
                                                                "prepared", b.version));
        QVERIFY(signatures.list(batch_id).empty());
        signatures.sign(batch_id, "rosa", "rosa-password-1", "prepared",
                        store.load(batch_id)->version);
        QCOMPARE(signatures.list(batch_id).size(), size_t(1));
        QVERIFY_THROWS_EXCEPTION(ConflictError,
                                 store.mark_printed(batch_id, "rosa", "sheet a4", b.version));
        store.mark_printed(batch_id, "rosa", "sheet a4", store.load(batch_id)->version);
        QCOMPARE(store.load(batch_id)->version, qint64(3));
    }

    void words_for_people_and_times() {
        // Display name and login for an account; the name as recorded otherwise.
        const QString where = lab();
        Database db(where);
        QCOMPARE(phaseplan::storage::person_words(db.connection(), "mats"),
                 QString("Mats Lindqvist (mats)"));
        QCOMPARE(phaseplan::storage::person_words(db.connection(), "R. Okafor"),
                 QString("R. Okafor"));
        QCOMPARE(phaseplan::storage::person_words(db.connection(), ""), QString("someone"));
        QCOMPARE(phaseplan::storage::utc_time_words("2026-12-02T19:04:31.250Z"),
                 QString("2026-12-02 19:04 UTC"));
        QCOMPARE(phaseplan::storage::utc_time_words("not a time"), QString("an unknown time"));
    }
};

int main(int argc, char** argv) {
    QCoreApplication app(argc, argv);
    if (argc == 5 &&
        (QByteArray(argv[1]) == "--edit-batch" || QByteArray(argv[1]) == "--edit-buffer" ||
         QByteArray(argv[1]) == "--rename-buffer"))
        return run_helper(QString::fromLocal8Bit(argv[1]), QString::fromLocal8Bit(argv[2]),
                          QString::fromLocal8Bit(argv[3]), QString::fromLocal8Bit(argv[4]));
    TestConcurrency t;
    return QTest::qExec(&t, argc, argv);
}

#include "tst_concurrency.moc"
