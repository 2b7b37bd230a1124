// Two benches, one record, for the rest of what people edit (issue 13, part 2; schema step
// row_version_schema_version, app/storage/versioning.h): the lab's own library entries,
// instruments, reagent lots and accounts. (The lab's columns live in the app's library and are
// tested the same way in tst_gui_row_versions.) Run on SQLite and, as tst_row_versions_pg, on
// PostgreSQL (tests/test_backend.h).
//
// Each case opens TWO connections on one database, as two benches would: both read the row, one
// saves, then the other saves from the version it read. The second save must be refused with the
// first person's name and the time (field "version"), the first person's value must stay, the
// version must have moved by one, and a save from the fresh version must then pass. A new record
// under a key that is taken is refused naming who saved it (field of the key). Keys and texts hold
// quotes, ";" and "--": every value is bound, never written into the SQL.
//
// Sources: the rule (a save from a stale version is refused, "nothing is silently overwritten")
// is the issue's; optimistic locking with a version column checked in the UPDATE's WHERE clause is
// common practice, no source.
#include "chem/error.h"
#include "core/failure.h"
#include "devices/device_store.h"
#include "storage/accounts.h"
#include "storage/audit_trail.h"
#include "storage/database.h"
#include "storage/lot_store.h"
#include "storage/signatures.h"
#include "storage/versioning.h"
#include "test_backend.h"

#include <QJsonObject>
#include <QSqlQuery>
#include <QtTest>

using namespace phaseplan::storage;
using phaseplan::devices::DeviceKind;
using phaseplan::devices::DeviceRecord;
using phaseplan::devices::DeviceStore;

namespace {

using phaseplan::testing::error_of;

/// True when `e` is field `field` and its sentence starts with `start` and names the time in
/// UTC; says what was said otherwise.
/// (A record removed meanwhile has no time to name: `timed` false.)
bool refused(const std::pair<QString, QString>& e, const QString& field, const QString& start,
             bool timed = true) {
    const bool ok =
        e.first == field && e.second.startsWith(start) && (!timed || e.second.contains(" UTC"));
    if (!ok)
        qWarning("expected %s: %s…, got %s: %s", qPrintable(field), qPrintable(start),
                 qPrintable(e.first), qPrintable(e.second));
    return ok;
}

/// Texts that would break SQL built by pasting (quotes, ";", "--").
const QString odd_id = QStringLiteral("lab-o'brien\"; DROP TABLE library_user; --");
const QString odd_device = QStringLiteral("BAL-'07\"; DELETE FROM devices; --");
const QString odd_lot = QStringLiteral("PA-'88\"; DELETE FROM reagent_lots; --");

QJsonObject entry(const QString& id, const QString& name) {
    return QJsonObject{{"id", id}, {"name", name}, {"formula", "NaCl"}};
}

DeviceRecord balance(const QString& id, const QString& name) {
    DeviceRecord d;
    d.id = id;
    d.name = name;
    d.kind = DeviceKind::balance;
    d.port.port = QStringLiteral("/dev/ttyUSB0");
    d.format = QStringLiteral("flag-number-unit");
    d.unit = QStringLiteral("g");
    return d;
}

ReagentLot lot_of(const QString& lot) {
    ReagentLot l;
    l.reagent = QStringLiteral("phosphoric-acid");
    l.lot = lot;
    l.supplier = QStringLiteral("O'Neil & Sons; -- supplies");
    l.received_on = QStringLiteral("2026-10-01");
    l.expires_on = QStringLiteral("2027-10-01");
    return l;
}

} // namespace

class TestRowVersions : public QObject {
    Q_OBJECT
    phaseplan::testing::TestDatabases databases_;
    QString hash_; ///< one Argon2id hash for every account (hashing is slow on purpose)

    /// A database with an administrator and two people, as two benches would share it.
    QString lab() {
        const QString where = databases_.fresh(QStringLiteral("lab.sqlite"));
        Database db(where);
        AccountStore a(db.connection());
        a.add_with_hash("admin", "Lab Administrator", Role::administrator, hash_, {});
        a.add_with_hash("rosa", "Rosa Okafor", Role::preparer, hash_, "admin");
        a.add_with_hash("mats", "Mats Lindqvist", Role::reviewer, hash_, "admin");
        a.add_with_hash("boss", "Second Administrator", Role::administrator, hash_, "admin");
        return where;
    }

  private slots:
    void initTestCase() {
        PHASEPLAN_REQUIRE_BACKEND();
        hash_ = hash_password(QStringLiteral("a-password-1"));
    }

    void migrated_rows_start_at_version_1() {
        // A database at the step before, holding one row of each table, opened by this program:
        // every row at version 1, changed_at from updated_at, a lot's and an account's
        // changed_by from the audit trail.
        const QString where = databases_.fresh(QStringLiteral("old.sqlite"));
        {
            Database old(where, row_version_schema_version - 1);
            QVERIFY(!old.rows_versioned());
            old.save_user_entry("reagents", entry(odd_id, "Lab salt"), "lab measurement");
            DeviceStore(old).save(balance(odd_device, "Old balance"));
            old.exec("INSERT INTO columns (name, document, created_at, updated_at)"
                     " VALUES (?, ?, ?, ?)",
                     {"C18 'old'", R"({"length_mm": 150, "id_mm": 4.6, "particle_um": 5})",
                      "2026-11-01T10:00:00.000Z", "2026-11-02T10:00:00.000Z"});
            AccountStore a(old.connection());
            a.add_with_hash("admin", "Lab Administrator", Role::administrator, hash_, {});
            a.add_with_hash("rosa", "Rosa Okafor", Role::preparer, hash_, "admin");
            LotStore(old.connection()).add(lot_of(odd_lot), "rosa");
            LotStore(old.connection()).set_opened("phosphoric-acid", odd_lot, "2026-10-05", "rosa");
        }
        Database db(where);
        QVERIFY(db.rows_versioned());
        QCOMPARE(db.schema_version(), latest_schema_version());
        const auto e = db.user_entries("reagents");
        QCOMPARE(e.size(), size_t(1));
        QCOMPARE(e[0].version, qint64(1));
        QVERIFY(!e[0].changed_at.isEmpty());
        QCOMPARE(DeviceStore(db).load(odd_device)->version, qint64(1));
        QSqlQuery c =
            db.exec("SELECT version, changed_at FROM columns WHERE name = ?", {"C18 'old'"});
        QVERIFY(c.next());
        QCOMPARE(c.value(0).toLongLong(), qint64(1));
        QCOMPARE(c.value(1).toString(), QString("2026-11-02T10:00:00.000Z")); // updated_at
        const ReagentLot l = *LotStore(db.connection()).find("phosphoric-acid", odd_lot);
        QCOMPARE(l.version, qint64(1));
        QCOMPARE(l.changed_by, QString("rosa")); // the open-lot entry of the trail
        QCOMPARE(AccountStore(db.connection()).find("rosa")->version, qint64(1));
        QCOMPARE(AccountStore(db.connection()).find("rosa")->changed_by,
                 QString("admin")); // the add-user entry
        // The shelf still equals its trail, field by field, after the new columns.
        QVERIFY(verify_all(db.connection()).intact);
    }

    void stale_library_entry_is_refused() {
        const QString where = lab();
        Database rosa(where), mats(where);
        rosa.set_actor("rosa");
        mats.set_actor("mats");
        QCOMPARE(rosa.save_user_entry("reagents", entry(odd_id, "first"), "lab; --", 0), qint64(1));
        const qint64 mats_saw = mats.user_entry_stamp("reagents", odd_id).version;
        QCOMPARE(mats_saw, qint64(1));
        QCOMPARE(rosa.save_user_entry("reagents", entry(odd_id, "Rosa's"), "lab", 1), qint64(2));
        QVERIFY(refused(
            error_of([&] {
                mats.save_user_entry("reagents", entry(odd_id, "Mats's"), "lab", mats_saw);
            }),
            "version", "Library entry \"" + odd_id + "\": changed by Rosa Okafor (rosa) at "));
        QCOMPARE(mats.user_entries("reagents")[0].document.value("name").toString(),
                 QString("Rosa's"));
        QCOMPARE(mats.user_entry_stamp("reagents", odd_id).version, qint64(2));
        // From the fresh version it passes, and the version moves on by one.
        QCOMPARE(mats.save_user_entry("reagents", entry(odd_id, "Mats's"), "lab", 2), qint64(3));
        QCOMPARE(rosa.user_entry_stamp("reagents", odd_id).changed_by, QString("mats"));
        // A new entry under the same id: taken, naming who saved it.
        QVERIFY(refused(
            error_of([&] { rosa.save_user_entry("reagents", entry(odd_id, "again"), "lab", 0); }),
            "id",
            "A lab library entry named \"" + odd_id + "\" was saved by Mats Lindqvist (mats) at "));
        // A removal from a stale version is refused too, and removes nothing.
        QVERIFY(refused(error_of([&] { rosa.remove_user_entry("reagents", odd_id, 2); }), "version",
                        "Library entry \"" + odd_id + "\": changed by Mats"));
        QCOMPARE(rosa.user_entries("reagents").size(), size_t(1));
        QVERIFY(rosa.remove_user_entry("reagents", odd_id, 3));
        QVERIFY(
            refused(error_of([&] { mats.save_user_entry("reagents", entry(odd_id, "x"), "l", 3); }),
                    "version", "Library entry \"" + odd_id + "\" was renamed or removed", false));
        QVERIFY(mats.user_entries("reagents").empty());
    }

    void stale_instrument_is_refused() {
        const QString where = lab();
        Database rosa(where), mats(where);
        rosa.set_actor("rosa");
        mats.set_actor("mats");
        QCOMPARE(DeviceStore(rosa).save_checked(balance(odd_device, "Bench 2")), qint64(1));
        DeviceRecord theirs = *DeviceStore(mats).load(odd_device);
        DeviceRecord mine = *DeviceStore(rosa).load(odd_device);
        QCOMPARE(theirs.version, qint64(1));
        mine.name = QStringLiteral("Rosa's bench; -- 2");
        QCOMPARE(DeviceStore(rosa).save_checked(mine), qint64(2));
        theirs.name = QStringLiteral("Mats's bench");
        QVERIFY(refused(error_of([&] { DeviceStore(mats).save_checked(theirs); }), "version",
                        "Instrument \"" + odd_device + "\": changed by Rosa Okafor (rosa) at "));
        const DeviceRecord kept = *DeviceStore(mats).load(odd_device);
        QCOMPARE(kept.name, QString("Rosa's bench; -- 2"));
        QCOMPARE(kept.version, qint64(2));
        QCOMPARE(kept.changed_by, QString("rosa"));
        theirs.version = kept.version;
        QCOMPARE(DeviceStore(mats).save_checked(theirs), qint64(3));
        // A new instrument under a taken id; a stale removal; then a fresh one.
        QVERIFY(refused(
            error_of([&] { DeviceStore(rosa).save_checked(balance(odd_device, "another")); }), "id",
            "An instrument named \"" + odd_device + "\" was saved by Mats Lindqvist (mats)"));
        QVERIFY(refused(error_of([&] { DeviceStore(rosa).remove(odd_device, 2); }), "version",
                        "Instrument \"" + odd_device + "\": changed by Mats"));
        QCOMPARE(DeviceStore(rosa).list().size(), size_t(1));
        QVERIFY(DeviceStore(rosa).remove(odd_device, 3));
        QVERIFY(DeviceStore(rosa).list().empty());
    }

    void stale_lot_open_is_refused() {
        const QString where = lab();
        Database a(where), b(where);
        LotStore rosa(a.connection()), mats(b.connection());
        QCOMPARE(rosa.add(lot_of(odd_lot), "rosa").version, qint64(1));
        const qint64 mats_saw = mats.find("phosphoric-acid", odd_lot)->version;
        QCOMPARE(rosa.set_opened("phosphoric-acid", odd_lot, "2026-11-20", "rosa", 1).version,
                 qint64(2));
        QVERIFY(refused(
            error_of([&] {
                mats.set_opened("phosphoric-acid", odd_lot, "2026-11-21", "mats", mats_saw);
            }),
            "version",
            "Lot \"" + odd_lot + "\" of phosphoric-acid: changed by Rosa Okafor (rosa) at "));
        const ReagentLot kept = *mats.find("phosphoric-acid", odd_lot);
        QCOMPARE(kept.opened_on, QString("2026-11-20"));
        QCOMPARE(kept.version, qint64(2));
        QCOMPARE(kept.changed_by, QString("rosa"));
        QCOMPARE(mats.set_opened("phosphoric-acid", odd_lot, "2026-11-21", "mats", 2).version,
                 qint64(3));
        QCOMPARE(rosa.find("phosphoric-acid", odd_lot)->changed_by, QString("mats"));
        // The same lot put on the shelf again: taken, naming who changed it last.
        QVERIFY(refused(error_of([&] { rosa.add(lot_of(odd_lot), "rosa"); }), "lot",
                        "A lot of phosphoric-acid named \"" + odd_lot +
                            "\" was saved by Mats Lindqvist (mats) at "));
        QCOMPARE(rosa.list().size(), size_t(1));
        // The refused write left no trace in the trail: the shelf equals it.
        QVERIFY(verify_all(a.connection()).intact);
    }

    void stale_account_change_is_refused() {
        const QString where = lab();
        Database a(where), b(where);
        AccountStore admin(a.connection()), boss(b.connection());
        const qint64 seen = admin.find("rosa")->version;
        QCOMPARE(seen, qint64(1));
        boss.set_locked("rosa", true, "boss", seen);
        QCOMPARE(boss.find("rosa")->version, qint64(2));
        QCOMPARE(boss.find("rosa")->changed_by, QString("boss"));
        // The administrator's screen still shows version 1: unlocking, or a new password, from it
        // is refused naming who locked the account; nothing is written.
        QVERIFY(refused(error_of([&] { admin.set_locked("rosa", false, "admin", seen); }),
                        "version",
                        "The account \"rosa\": changed by Second Administrator (boss) at "));
        QVERIFY(
            refused(error_of([&] { admin.set_password("rosa", "new-password-1", "admin", seen); }),
                    "version", "The account \"rosa\": changed by Second Administrator"));
        QVERIFY(admin.find("rosa")->locked);
        QCOMPARE(admin.find("rosa")->version, qint64(2));
        admin.set_locked("rosa", false, "admin", 2);
        QCOMPARE(admin.find("rosa")->version, qint64(3));
        QCOMPARE(admin.find("rosa")->changed_by, QString("admin"));
        // A login that is taken, naming who added it.
        QVERIFY(
            refused(error_of([&] {
                        admin.add_with_hash("mats", "Another Mats", Role::preparer, hash_, "admin");
                    }),
                    "login", "An account named \"mats\" was saved by Lab Administrator (admin)"));
        // A wrong password only counts; the fifth, which locks the account, is a change.
        const qint64 before = admin.find("mats")->version;
        for (int i = 1; i <= max_failed_attempts; ++i) {
            (void)error_of([&] { admin.authenticate("mats", "wrong-password"); });
            QCOMPARE(admin.find("mats")->version, i < max_failed_attempts ? before : before + 1);
        }
        QCOMPARE(admin.find("mats")->changed_by, QString("mats"));
        QVERIFY(verify_all(a.connection()).intact);
    }

    void writes_move_the_change_counter() {
        // Other benches poll the counter (Workspace::pollChanges): each kind of write moves it.
        const QString where = lab();
        Database db(where);
        db.set_actor("rosa");
        qint64 last = change_counter(db.connection());
        const auto moved = [&] {
            const qint64 now = change_counter(db.connection());
            const bool ok = now > last;
            last = now;
            return ok;
        };
        db.save_user_entry("reagents", entry("lab-salt", "Lab salt"), "lab", 0);
        QVERIFY(moved());
        DeviceStore(db).save_checked(balance("BAL-01", "Bench 1"));
        QVERIFY(moved());
        db.exec("INSERT INTO columns (name, document, created_at, updated_at) VALUES (?, ?, ?, ?)",
                {"C18", R"({"length_mm": 150, "id_mm": 4.6, "particle_um": 5})", "t", "t"});
        QVERIFY(moved());
        LotStore(db.connection()).add(lot_of("PA-1"), "rosa");
        QVERIFY(moved());
        AccountStore(db.connection()).set_locked("mats", true, "admin");
        QVERIFY(moved());
        QVERIFY(!moved()); // and only a write moves it
    }
};

QTEST_GUILESS_MAIN(TestRowVersions)
#include "tst_row_versions.moc"
