// Nothing is silently overwritten, for the saves that used to be last-writer-wins: renaming a
// buffer, the automatic rename when a buffer's name follows its inputs, the Saved screen's
// "Save buffer" under a new name, and a plan saved under a name with its lines and methods. Two
// Workspaces on one database file are two benches (as in tst_gui_conflict). Also: the Saved
// list says who changed each record last, and when.
//
// Sources: the behaviour is issue 13, part 2; the demo's people (Rosa Okafor, demo-prep; Mats
// Lindqvist, demo-review) are app/storage/demo.cpp's invented accounts. No timing: the poll is
// called directly.
#include "buffer_designer.h"
#include "gui_test_support.h"
#include "plan.h"
#include "saved_model.h"
#include "workspace.h"

#include <QCoreApplication>
#include <QRegularExpression>
#include <QSettings>
#include <QStandardPaths>
#include <QTemporaryDir>
#include <QTest>

using namespace phaseplan::gui;
using phaseplan::storage::DocumentKind;
using phaseplan::testing::open_workspace;

namespace {

/// Two benches on one file: Rosa (demo-prep) on a, Mats (demo-review) on b.
struct TwoBenches {
    std::unique_ptr<Workspace> a, b;
    explicit TwoBenches(const QString& db) : a(open_workspace(db)), b(open_workspace(db)) {
        a->setActor("demo-prep");
        b->setActor("demo-review");
    }
};

double stored_volume(Workspace& ws, const QString& buffer) {
    return ws.database()->load(DocumentKind::buffer, buffer)->value("volume_ml").toDouble();
}

/// "… at 2026-12-02 19:04 UTC …": a time in utc_time_words' form somewhere in `s`.
bool has_utc_time(const QString& s) {
    return s.contains(QRegularExpression(" at 20\\d\\d-\\d\\d-\\d\\d \\d\\d:\\d\\d UTC"));
}

} // namespace

class TestGuiConflictSaves : public QObject {
    Q_OBJECT
    QTemporaryDir dir_;

  private slots:
    void initTestCase() { phaseplan::testing::use_test_settings("tst_gui_conflict_saves"); }

    void stale_rename_is_refused_naming_who_changed_it() {
        TwoBenches lab(dir_.filePath("rename.sqlite"));
        BufferDesigner a, b;
        a.setWorkspace(lab.a.get());
        b.setWorkspace(lab.b.get());
        a.newBuffer();
        QCOMPARE(a.renameBuffer("Assay buffer"), QString());
        QVERIFY(b.openBuffer("Assay buffer"));
        a.setVolumeMl(1500); // Rosa's edit, saved
        a.flushAutosave();

        // Mats renames from the version he opened: refused, naming Rosa, in the conflict bar.
        const QString said = b.renameBuffer("Line A buffer");
        QVERIFY2(said.startsWith("Buffer \"Assay buffer\": changed by Rosa Okafor (demo-prep) at "),
                 qPrintable(said));
        QVERIFY2(has_utc_time(said), qPrintable(said));
        QCOMPARE(b.conflictMessage(), said);
        QCOMPARE(b.bufferName(), QString("Assay buffer"));
        // Nothing renamed, nothing overwritten.
        QVERIFY(!lab.a->database()->load(DocumentKind::buffer, "Line A buffer"));
        QCOMPARE(stored_volume(*lab.a, "Assay buffer"), 1500.0);
        // After Reload the rename goes through, from the version now stored.
        QVERIFY(b.reloadBuffer());
        QCOMPARE(b.renameBuffer("Line A buffer"), QString());
        QCOMPARE(stored_volume(*lab.a, "Line A buffer"), 1500.0);
        QVERIFY(!lab.a->database()->load(DocumentKind::buffer, "Assay buffer"));

        // Rosa still holds the old name: her next save says it went, and keeps her edits.
        a.setVolumeMl(1800);
        a.flushAutosave();
        const QString gone = a.conflictMessage();
        QVERIFY2(gone.startsWith("Buffer \"Assay buffer\" was renamed to \"Line A buffer\" by "
                                 "Mats Lindqvist (demo-review) at "),
                 qPrintable(gone));
        QVERIFY2(has_utc_time(gone), qPrintable(gone));
        QCOMPARE(stored_volume(*lab.a, "Line A buffer"), 1500.0);
        // Reload follows the rename: Rosa now holds "Line A buffer" as saved, at its version.
        QVERIFY(a.reloadBuffer());
        QCOMPARE(a.bufferName(), QString("Line A buffer"));
        QCOMPARE(a.conflictMessage(), QString());
        a.setVolumeMl(1800);
        a.flushAutosave();
        QCOMPARE(a.conflictMessage(), QString());
        QCOMPARE(stored_volume(*lab.a, "Line A buffer"), 1800.0);
    }

    void rename_onto_a_name_saved_meanwhile_names_who_saved_it() {
        TwoBenches lab(dir_.filePath("taken.sqlite"));
        BufferDesigner a, b;
        a.setWorkspace(lab.a.get());
        b.setWorkspace(lab.b.get());
        a.newBuffer();
        QCOMPARE(a.renameBuffer("Rosa's buffer"), QString());
        b.newBuffer();
        QCOMPARE(b.renameBuffer("Mats's buffer"), QString());
        b.setVolumeMl(700);
        b.flushAutosave();
        a.setVolumeMl(1200);
        a.flushAutosave();
        // Rosa saves "Line A buffer" first; Mats then picks the same name.
        QCOMPARE(a.renameBuffer("Line A buffer"), QString());
        const QString said = b.renameBuffer("Line A buffer");
        QVERIFY2(said.startsWith("A buffer named \"Line A buffer\" was saved by Rosa Okafor "
                                 "(demo-prep) at "),
                 qPrintable(said));
        QVERIFY2(said.endsWith(" UTC; choose another name, or open it"), qPrintable(said));
        QVERIFY(b.conflictMessage().isEmpty()); // a name to change, not a record to reload
        QCOMPARE(b.bufferName(), QString("Mats's buffer"));
        QCOMPARE(stored_volume(*lab.a, "Line A buffer"), 1200.0);
        QCOMPARE(stored_volume(*lab.a, "Mats's buffer"), 700.0);
        // "Save buffer" under that name (the Saved screen) is refused the same way.
        const QString again = b.saveAs("Line A buffer");
        QVERIFY2(again.startsWith("A buffer named \"Line A buffer\" was saved by Rosa Okafor"),
                 qPrintable(again));
        QCOMPARE(b.bufferName(), QString("Mats's buffer"));
        QCOMPARE(stored_volume(*lab.a, "Line A buffer"), 1200.0);
    }

    void automatic_name_does_not_overwrite_another_benchs_save() {
        TwoBenches lab(dir_.filePath("auto.sqlite"));
        BufferDesigner a, b;
        a.setWorkspace(lab.a.get());
        b.setWorkspace(lab.b.get());
        const QString name = a.newBuffer(); // its name follows its inputs
        const size_t buffers = lab.a->database()->list(DocumentKind::buffer).size();
        QVERIFY(b.openBuffer(name));
        QVERIFY(b.autoName());
        a.setVolumeMl(1500); // the volume is not in the name: Rosa's save keeps it
        a.flushAutosave();
        QCOMPARE(a.bufferName(), name);
        // Mats changes the pH, which would rename the buffer when the edit settles: refused,
        // naming Rosa.
        b.setTargetPh(3.0);
        QVERIFY(b.conflictMessage().isEmpty()); // nothing written yet
        b.flushAutosave();
        QVERIFY2(b.conflictMessage().startsWith("Buffer \"" + name +
                                                "\": changed by Rosa Okafor (demo-prep) at "),
                 qPrintable(b.conflictMessage()));
        QCOMPARE(b.bufferName(), name);
        QCOMPARE(b.targetPh(), 3.0); // the edit stays on screen
        QCOMPARE(stored_volume(*lab.a, name), 1500.0);
        QCOMPARE(lab.a->database()->list(DocumentKind::buffer).size(), buffers); // none added
    }

    void plan_save_as_a_taken_name_is_refused_until_replaced_on_purpose() {
        TwoBenches lab(dir_.filePath("plan.sqlite"));
        Plan a, b;
        a.setWorkspace(lab.a.get());
        b.setWorkspace(lab.b.get());
        a.setStandbyFlowMlMin(0.21);
        b.setStandbyFlowMlMin(0.3);
        // The demo's line "Acetonitrile" (saved when the file was made) differs from the new
        // plan's: kept as it is, and the note says so.
        const auto demo_line = lab.a->database()->load(DocumentKind::line, "Acetonitrile");
        QVERIFY(demo_line);
        QCOMPARE(a.saveAs("Tonight"), QString());
        QVERIFY2(a.saveNote().contains("line “Acetonitrile”"), qPrintable(a.saveNote()));
        QCOMPARE(lab.a->database()->load(DocumentKind::line, "Acetonitrile"), demo_line);
        auto stored_flow = [&] {
            return lab.a->database()
                ->load(DocumentKind::sequence, "Tonight")
                ->value("standby")
                .toObject()
                .value("flow_ml_min")
                .toDouble();
        };
        const double rosas = stored_flow();
        QCOMPARE(rosas, a.standbyFlowMlMin());

        // Mats saves his plan under the same name: refused, naming Rosa; nothing overwritten.
        const QString said = b.saveAs("Tonight");
        QVERIFY2(
            said.startsWith("A plan named \"Tonight\" was saved by Rosa Okafor (demo-prep) at "),
            qPrintable(said));
        QVERIFY2(said.endsWith(" UTC; choose another name, or open it"), qPrintable(said));
        QCOMPARE(b.saveClash(), said);
        QCOMPARE(b.saveClashName(), QString("Tonight"));
        QCOMPARE(stored_flow(), rosas);
        // Overwriting is an explicit choice.
        QCOMPARE(b.replaceSaved(), QString());
        QVERIFY(b.saveClash().isEmpty());
        QCOMPARE(stored_flow(), b.standbyFlowMlMin());
        QVERIFY(stored_flow() != rosas);

        // Rosa, still at the version she saved, saves again: refused, naming Mats.
        a.setStandbyFlowMlMin(0.25);
        const QString stale = a.saveAs("Tonight");
        QVERIFY2(stale.startsWith("Plan \"Tonight\": changed by Mats Lindqvist (demo-review) at "),
                 qPrintable(stale));
        QCOMPARE(stored_flow(), b.standbyFlowMlMin());
        // Save as a copy keeps hers under a new name, theirs untouched.
        QCOMPARE(a.saveAsCopy(), QString());
        QCOMPARE(a.name(), QString("Tonight (copy)"));
        QCOMPARE(lab.a->database()
                     ->load(DocumentKind::sequence, "Tonight (copy)")
                     ->value("standby")
                     .toObject()
                     .value("flow_ml_min")
                     .toDouble(),
                 a.standbyFlowMlMin());
        QCOMPARE(stored_flow(), b.standbyFlowMlMin());

        // A Replace from an old refusal is refused once it changed again meanwhile.
        QVERIFY(!b.saveAs("Tonight (copy)").isEmpty());
        a.setStandbyFlowMlMin(0.35);
        QCOMPARE(a.saveAs("Tonight (copy)"), QString());
        QVERIFY2(b.replaceSaved().startsWith(
                     "Plan \"Tonight (copy)\": changed by Rosa Okafor (demo-prep) at "),
                 qPrintable(b.saveClash()));
        // Open theirs: the stored plan, and its next save goes through.
        QVERIFY(b.openClashing());
        QCOMPARE(b.standbyFlowMlMin(), a.standbyFlowMlMin());
        QVERIFY(b.saveClash().isEmpty());
        b.setStandbyFlowMlMin(0.4);
        QCOMPARE(b.saveAs("Tonight (copy)"), QString());

        // Renamed on Rosa's bench while Mats holds it: his save names her and the new name, and
        // Open theirs follows the rename.
        lab.a->database()->set_actor("demo-prep");
        lab.a->database()->rename_checked(
            DocumentKind::sequence, "Tonight (copy)", "Tonight, column 2",
            lab.a->database()->stamp(DocumentKind::sequence, "Tonight (copy)").version);
        b.setStandbyFlowMlMin(0.45);
        const QString moved = b.saveAs("Tonight (copy)");
        QVERIFY2(moved.startsWith("Plan \"Tonight (copy)\" was renamed to \"Tonight, column 2\" "
                                  "by Rosa Okafor (demo-prep) at "),
                 qPrintable(moved));
        QVERIFY(b.openClashing());
        QCOMPARE(b.name(), QString("Tonight, column 2"));
        QCOMPARE(b.standbyFlowMlMin(), 0.4);
    }

    void plan_save_does_not_bring_back_a_renamed_buffer() {
        // The demo plan's line A holds the demo buffer by reference; renaming the buffer and
        // then saving the plan must not write the plan's copy under the old name again.
        TwoBenches lab(dir_.filePath("resurrect.sqlite"));
        Plan plan;
        plan.setRestore(true);
        plan.setWorkspace(lab.a.get());
        BufferDesigner d;
        d.setPlan(&plan);
        d.setWorkspace(lab.a.get());
        const QString ref = plan.lineBufferRef("A");
        QVERIFY(!ref.isEmpty());
        QVERIFY(d.openBuffer(ref));
        QCOMPARE(d.renameBuffer("Line A buffer"), QString());
        QCOMPARE(plan.lineBufferRef("A"), QString("Line A buffer"));
        QCOMPARE(plan.saveAs("Tonight"), QString());
        QVERIFY(!lab.a->database()->load(DocumentKind::buffer, ref));
        QVERIFY(lab.a->database()->load(DocumentKind::buffer, "Line A buffer"));
    }

    void saved_list_says_who_changed_each_record_and_when() {
        TwoBenches lab(dir_.filePath("list.sqlite"));
        BufferDesigner b;
        b.setWorkspace(lab.b.get());
        b.newBuffer();
        QCOMPARE(b.renameBuffer("Mats's buffer"), QString());
        SavedWorkModel list;
        list.setWorkspace(lab.a.get()); // Rosa's bench lists what Mats saved
        list.setKind("buffer");
        list.refresh();
        QString changed;
        for (int r = 0; r < list.rowCount(); ++r) {
            const QModelIndex i = list.index(r);
            if (list.data(i, SavedWorkModel::NameRole).toString() == "Mats's buffer")
                changed = list.data(i, SavedWorkModel::ChangedRole).toString();
        }
        QVERIFY2(changed.startsWith("changed by Mats Lindqvist (demo-review), 20"),
                 qPrintable(changed));
        QVERIFY2(changed.endsWith(" UTC"), qPrintable(changed));
        // Rosa's later save shows her.
        BufferDesigner a;
        a.setWorkspace(lab.a.get());
        QVERIFY(a.openBuffer("Mats's buffer"));
        a.setVolumeMl(900);
        a.flushAutosave();
        list.refresh();
        for (int r = 0; r < list.rowCount(); ++r) {
            const QModelIndex i = list.index(r);
            if (list.data(i, SavedWorkModel::NameRole).toString() == "Mats's buffer")
                changed = list.data(i, SavedWorkModel::ChangedRole).toString();
        }
        QVERIFY2(changed.startsWith("changed by Rosa Okafor (demo-prep), "), qPrintable(changed));
        QVERIFY(list.roleNames().value(SavedWorkModel::ChangedRole) == "changed");
    }
};

QTEST_MAIN(TestGuiConflictSaves)
#include "tst_gui_conflict_saves.moc"
