// Two benches, one record, on the Library screen's models (no QML): two Workspaces on one
// database are two benches (a file, or the PostgreSQL test cluster on the _pg run). The lab's
// columns (ColumnLibrary), its own reagents (ReagentEditor), its instruments (DeviceCapture) and
// the lot shelf (LotShelfModel) each save from the version they listed: a save from a stale one
// shows who changed the record and when under the field "version" (the sentence the ConflictBar
// beside the form shows), writes nothing, and Reload brings the stored record back, from which a
// save passes. The change poll (Workspace::pollChanges, what the timer's timeout calls) brings
// the other bench's lists up to date. No timing: the poll is called directly.
//
// Sources: the behaviour is issue 13, part 2; the demo's people (Rosa Okafor, demo-prep; Mats
// Lindqvist, demo-review) are app/storage/demo.cpp's invented accounts.
#include "column_library.h"
#include "device_capture.h"
#include "gui_test_support.h"
#include "library_models.h"
#include "lot_shelf.h"
#include "storage/lot_store.h"
#include "test_backend.h"
#include "workspace.h"

#include <QSignalSpy>
#include <QTest>

using namespace phaseplan::gui;
using phaseplan::testing::open_workspace;

namespace {

/// True when `said` is a refusal naming Rosa (demo-prep) and the time; says what was said if not.
bool names_rosa(const QString& said, const QString& record) {
    const bool ok = said.startsWith(record + ": changed by Rosa Okafor (demo-prep) at ") &&
                    said.endsWith(" UTC after you opened it; reload it, or save yours as a copy");
    if (!ok)
        qWarning("not a refusal of %s naming Rosa: %s", qPrintable(record), qPrintable(said));
    return ok;
}

/// Two benches on one new database (the demo seeded by the first).
struct Lab {
    std::unique_ptr<Workspace> rosa, mats;
    explicit Lab(const QString& where) : rosa(open_workspace(where)), mats(open_workspace(where)) {
        rosa->setActor("demo-prep");
        mats->setActor("demo-review");
    }
};

} // namespace

class TestGuiRowVersions : public QObject {
    Q_OBJECT
    phaseplan::testing::TestDatabases dbs_;

  private slots:
    void initTestCase() {
        PHASEPLAN_REQUIRE_BACKEND();
        phaseplan::testing::use_test_settings("tst_gui_row_versions");
    }

    void column_changed_on_another_bench() {
        Lab lab(dbs_.fresh());
        ColumnLibrary a, b;
        a.setWorkspace(lab.rosa.get());
        b.setWorkspace(lab.mats.get());
        QVERIFY(!a.columns().isEmpty()); // the demo's columns
        QVariantMap rosa = a.columns()[0].toMap(), mats = b.columns()[0].toMap();
        QCOMPARE(mats.value("id"), rosa.value("id"));
        QCOMPARE(rosa.value("version").toLongLong(), qint64(1));
        const QString name = rosa.value("name").toString();

        rosa["max_pressure_bar"] = 350.0;
        QVERIFY2(a.save(rosa), qPrintable(a.errors().values().value(0).toString()));
        mats["max_pressure_bar"] = 600.0;
        QVERIFY(!b.save(mats)); // from version 1; the database holds 2
        QVERIFY(names_rosa(b.errors().value("version").toString(), "Column \"" + name + "\""));
        // Nothing overwritten: Rosa's value is stored.
        a.reload();
        QCOMPARE(a.columns()[0].toMap().value("max_pressure_bar").toDouble(), 350.0);
        QCOMPARE(a.columns()[0].toMap().value("version").toLongLong(), qint64(2));

        // Mats's list follows the poll; Reload (what the ConflictBar's button does: the list
        // re-read, the form refilled from it) then a save passes, and the version moves on.
        QSignalSpy listed(&b, &ColumnLibrary::columnsChanged);
        QVERIFY(lab.mats->pollChanges());
        QCOMPARE(listed.count(), 1);
        mats = b.columns()[0].toMap();
        QCOMPARE(mats.value("max_pressure_bar").toDouble(), 350.0);
        QCOMPARE(mats.value("changedBy").toString(), QString("demo-prep"));
        mats["max_pressure_bar"] = 600.0;
        QVERIFY(b.save(mats));
        QVERIFY(b.errors().isEmpty());
        b.reload();
        QCOMPARE(b.columns()[0].toMap().value("version").toLongLong(), qint64(3));
        // A stale removal is refused as well.
        QVERIFY(!a.remove(rosa.value("id").toLongLong(), 2));
        QVERIFY(a.errors().value("version").toString().contains("changed by Mats Lindqvist"));
        QCOMPARE(b.columns().size(), a.columns().size());
    }

    void lab_reagent_changed_on_another_bench() {
        Lab lab(dbs_.fresh());
        ReagentEditor a, b;
        a.setWorkspace(lab.rosa.get());
        b.setWorkspace(lab.mats.get());
        // Rosa corrects a shipped entry: the lab's own entry, version 1.
        QVERIFY(a.edit("phosphoric-acid"));
        QCOMPARE(a.loadedVersion(), qint64(0));
        a.setSource("supplier certificate, lot 4411; -- 'as received'");
        QVERIFY2(a.save().isEmpty(), qPrintable(a.errorMessage()));
        QCOMPARE(a.loadedVersion(), qint64(1));
        // Mats's library follows the poll (rebuilt because a lab entry changed).
        QSignalSpy rebuilt(lab.mats.get(), &Workspace::libraryChanged);
        QVERIFY(lab.mats->pollChanges());
        QCOMPARE(rebuilt.count(), 1);
        QVERIFY(b.edit("phosphoric-acid"));
        QVERIFY(b.isLabEntry());
        QCOMPARE(b.loadedVersion(), qint64(1));

        a.setName("Phosphoric acid 85 % (Rosa's bottle)");
        QVERIFY(a.save().isEmpty());
        b.setName("Phosphoric acid 85 % (bench 2)");
        const QString said = b.save();
        QCOMPARE(b.errorField(), QString("version"));
        QVERIFY(names_rosa(said, "Library entry \"phosphoric-acid\""));
        QCOMPARE(b.name(), QString("Phosphoric acid 85 % (bench 2)")); // kept on screen
        // Reload: Rosa's entry, from which Mats's save passes.
        b.reload();
        QCOMPARE(b.name(), QString("Phosphoric acid 85 % (Rosa's bottle)"));
        QCOMPARE(b.loadedVersion(), qint64(2));
        QVERIFY(b.errorField().isEmpty());
        b.setName("Phosphoric acid 85 % (bench 2)");
        QVERIFY(b.save().isEmpty());
        QCOMPARE(b.loadedVersion(), qint64(3));

        // Both correct the same shipped entry at once: the second is told whose entry is there.
        ReagentEditor c, d;
        c.setWorkspace(lab.rosa.get());
        d.setWorkspace(lab.mats.get());
        QVERIFY(c.edit("acetic-acid"));
        QVERIFY(d.edit("acetic-acid"));
        c.setSource("lab measurement");
        d.setSource("lab measurement");
        QVERIFY(c.save().isEmpty());
        QVERIFY(!d.save().isEmpty());
        QCOMPARE(d.errorField(), QString("id"));
        QVERIFY2(d.errorMessage().startsWith(
                     "A lab library entry named \"acetic-acid\" was saved by Rosa Okafor"),
                 qPrintable(d.errorMessage()));
    }

    void instrument_changed_on_another_bench() {
        Lab lab(dbs_.fresh());
        DeviceCapture a, b;
        a.setWorkspace(lab.rosa.get());
        b.setWorkspace(lab.mats.get());
        QVERIFY(!a.balances().isEmpty()); // the demo's instruments
        QVariantMap rosa = a.balances()[0].toMap(), mats = b.balances()[0].toMap();
        const QString id = rosa.value("id").toString();
        QCOMPARE(mats.value("version"), rosa.value("version"));
        rosa["name"] = "Analytical balance, Rosa's bench";
        QVERIFY2(a.saveDevice(rosa), qPrintable(a.errorMessage()));
        mats["name"] = "Analytical balance; -- bench 2";
        QVERIFY(!b.saveDevice(mats));
        QCOMPARE(b.errorField(), QString("version"));
        QVERIFY(names_rosa(b.errorMessage(), "Instrument \"" + id + "\""));
        QSignalSpy listed(&b, &DeviceCapture::devicesChanged);
        QVERIFY(lab.mats->pollChanges());
        QVERIFY(listed.count() >= 1);
        mats = b.balances()[0].toMap();
        QCOMPARE(mats.value("name").toString(), QString("Analytical balance, Rosa's bench"));
        mats["name"] = "Analytical balance; -- bench 2";
        b.clearError();
        QVERIFY2(b.saveDevice(mats), qPrintable(b.errorMessage()));
        // A new instrument under a taken id is refused at the id.
        QVariantMap again = mats;
        again.remove("version");
        QVERIFY(!a.saveDevice(again));
        QCOMPARE(a.errorField(), QString("id"));
    }

    void lot_opened_on_another_bench() {
        Lab lab(dbs_.fresh());
        LotShelfModel a, b;
        a.setWorkspace(lab.rosa.get());
        b.setWorkspace(lab.mats.get());
        a.setSignedInLogin("demo-prep");
        b.setSignedInLogin("demo-review");
        QVERIFY(
            a.add("phosphoric-acid", "PA-'7; --", "O'Neil", "2026-10-01", "", "2027-10-01", ""));
        QVERIFY(lab.mats->pollChanges()); // Mats's shelf lists it, at version 1
        // Rosa opens it; Mats, whose list still shows it unopened at version 1, too.
        QVERIFY2(a.markOpenedToday("phosphoric-acid", "PA-'7; --"), qPrintable(a.errorMessage()));
        QVERIFY(!b.markOpenedToday("phosphoric-acid", "PA-'7; --"));
        QCOMPARE(b.errorField(), QString("version"));
        QVERIFY(names_rosa(b.errorMessage(), "Lot \"PA-'7; --\" of phosphoric-acid"));
        b.reloadShelf();
        QVERIFY(b.errorField().isEmpty());
        const auto lot = phaseplan::storage::LotStore(lab.mats->database()->connection())
                             .find("phosphoric-acid", "PA-'7; --");
        QCOMPARE(lot->version, qint64(2));
        QCOMPARE(lot->changed_by, QString("demo-prep"));
    }
};

QTEST_MAIN(TestGuiRowVersions)
#include "tst_gui_row_versions.moc"
