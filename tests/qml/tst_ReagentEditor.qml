import QtQuick
import QtTest
import PhasePlan

// The lab's own reagent: typed in, checked by the core as a shipped entry would be, the message
// beside the field it names; nothing is saved while it is invalid.
TestCase {
    id: tc
    name: "ReagentEditor"
    when: windowShown
    visible: true
    width: 800
    height: 1000

    Component {
        id: cardComponent
        Item {
            property alias editor: editorModel
            property alias card: editorCard
            width: tc.width
            height: tc.height
            Workspace {
                id: ws
                databasePath: testDir + "/reagent-editor-" + Date.now() + ".sqlite"
                dataDir: dataDir
            }
            ReagentEditor {
                id: editorModel
                workspace: ws
            }
            ReagentEditorCard {
                id: editorCard
                width: parent.width
                editor: editorModel
            }
        }
    }

    // Two benches on one file: Rosa's editor without a card, Mats's with the card the screen shows.
    Component {
        id: benchesComponent
        Item {
            id: benches
            property alias rosa: rosaEditor
            property alias mats: matsEditor
            property alias matsWorkspace: matsWs
            readonly property string path: testDir + "/two-benches-" + Date.now() + ".sqlite"
            width: tc.width
            height: tc.height
            Workspace {
                id: rosaWs
                databasePath: benches.path
                dataDir: dataDir
                actor: "demo-prep"
            }
            Workspace {
                id: matsWs
                databasePath: benches.path
                dataDir: dataDir
                actor: "demo-review"
            }
            ReagentEditor {
                id: rosaEditor
                workspace: rosaWs
            }
            ReagentEditor {
                id: matsEditor
                workspace: matsWs
            }
            ReagentEditorCard {
                width: parent.width
                editor: matsEditor
            }
        }
    }

    function findAll(item, name, out) {
        if (item.objectName === name)
            out.push(item)
        for (var i = 0; i < item.children.length; ++i)
            findAll(item.children[i], name, out)
        return out
    }
    function typeInto(field, text) {
        field.forceActiveFocus()
        field.selectAll()
        keyClick(Qt.Key_Backspace)
        for (var i = 0; i < text.length; ++i)
            keyClick(text[i])
    }

    function test_fresh_form_shows_no_error() {
        var c = createTemporaryObject(cardComponent, tc)
        verify(!c.editor.valid)
        compare(findAll(c, "reagentId", [])[0].error, "")
        verify(!findAll(c, "saveReagent", [])[0].enabled)
    }

    function test_bad_formula_named_beside_it() {
        var c = createTemporaryObject(cardComponent, tc)
        c.editor.reagentId = "lab-salt"
        c.editor.name = "Lab salt"
        c.editor.source = "lab measurement"
        var formula = findAll(c, "reagentFormula", [])[0]
        typeInto(formula.field, "NaQq")
        tryCompare(c.editor, "errorField", "formula")
        verify(formula.error.length > 0, "the formula field shows the core's message")
        verify(!findAll(c, "saveReagent", [])[0].enabled)
        // Acetate as supplied with one proton removed carries −1: without its Na+ the entry is
        // not electroneutral and the core refuses it; with Na+ it loads.
        typeInto(formula.field, "CH3COONa")
        c.editor.system = "acetate"
        c.editor.systemCount = 1
        c.editor.protonsRemoved = 1
        verify(!c.editor.valid)
        verify(c.editor.errorMessage.length > 0)
        c.editor.spectatorIon = "Na+"
        c.editor.spectatorCharge = 1
        c.editor.spectatorCount = 1
        tryCompare(c.editor, "valid", true)
        compare(formula.error, "")
    }

    function test_missing_source_blocks_saving() {
        var c = createTemporaryObject(cardComponent, tc)
        c.editor.reagentId = "lab-sodium-acetate"
        c.editor.name = "Sodium acetate, lab lot"
        c.editor.formula = "CH3COONa"
        c.editor.spectatorIon = "Na+"
        c.editor.spectatorCharge = 1
        c.editor.spectatorCount = 1
        c.editor.system = "acetate"
        c.editor.systemCount = 1
        c.editor.protonsRemoved = 1
        compare(c.editor.errorField, "source")
        verify(findAll(c, "reagentSource", [])[0].error.length > 0)
        var source = findAll(c, "reagentSource", [])[0]
        typeInto(source.field, "certificate")
        tryCompare(c.editor, "valid", true)
        verify(findAll(c, "saveReagent", [])[0].enabled)
        compare(c.editor.save(), "")
        verify(c.editor.isLabEntry)
    }

    // Issue 13, part 2: a save from a version another bench changed is refused beside the form,
    // naming who and when (the demo's invented Rosa Okafor, demo-prep), and Reload shows theirs.
    function test_entry_changed_on_another_bench_offers_reload() {
        var c = createTemporaryObject(benchesComponent, tc)
        verify(c.rosa.edit("phosphoric-acid"))
        c.rosa.source = "supplier certificate"
        compare(c.rosa.save(), "")
        c.matsWorkspace.pollChanges() // what the 3 s timer does
        verify(c.mats.edit("phosphoric-acid"))
        compare(c.mats.loadedVersion, 1)
        c.rosa.name = "Phosphoric acid 85 % (Rosa's bottle)"
        compare(c.rosa.save(), "")
        c.mats.name = "Phosphoric acid 85 % (bench 2)"
        var bar = findAll(c, "reagentConflict", [])[0]
        verify(!bar.visible)
        findAll(c, "saveReagent", [])[0].clicked()
        verify(bar.visible)
        var said = findAll(bar, "conflictMessage", [])[0].text
        verify(said.indexOf("Library entry \"phosphoric-acid\": changed by Rosa Okafor (demo-prep) at ") === 0, said)
        verify(!findAll(bar, "conflictSaveCopy", [])[0].visible, "Reload only, no copy of a library entry")
        compare(c.mats.name, "Phosphoric acid 85 % (bench 2)") // the edit stays until Reload
        findAll(bar, "conflictReload", [])[0].clicked()
        compare(c.mats.name, "Phosphoric acid 85 % (Rosa's bottle)")
        compare(c.mats.loadedVersion, 2)
        verify(!bar.visible)
    }
}
