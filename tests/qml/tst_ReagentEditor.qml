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
}
