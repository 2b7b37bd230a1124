import QtQuick
import QtTest
import PhasePlan

// The buffer designer screen over the real models and data: a new target pH typed in changes
// the recipe shown; text that is not a number and input the core refuses show their message at
// the field; every control is a touch target of at least 9 mm.
TestCase {
    id: tc
    name: "BufferScreen"
    when: windowShown
    visible: true
    width: 1280
    height: 800

    Component {
        id: screenComponent
        Item {
            id: box
            property alias designer: designerModel
            property alias screen: page
            width: tc.width
            height: tc.height
            Workspace {
                id: ws
                databasePath: testDir + "/buffer-screen-" + Date.now() + ".sqlite"
                dataDir: dataDir
            }
            Plan {
                id: planModel
                workspace: ws
            }
            BufferDesigner {
                id: designerModel
                workspace: ws
                plan: planModel
            }
            BufferScreen {
                id: page
                anchors.fill: parent
                designer: designerModel
                plan: planModel
            }
        }
    }

    function typeInto(field, text) {
        field.forceActiveFocus()
        field.selectAll()
        keyClick(Qt.Key_Backspace)
        for (var i = 0; i < text.length; ++i)
            keyClick(text[i])
    }
    function findAll(item, name, out) {
        if (item.objectName === name)
            out.push(item)
        for (var i = 0; i < item.children.length; ++i)
            findAll(item.children[i], name, out)
        return out
    }
    function shownAmounts(root) {
        var labels = findAll(root, "amount", [])
        var texts = []
        for (var i = 0; i < labels.length; ++i)
            if (labels[i].visible)
                texts.push(labels[i].text)
        return texts.join(" | ")
    }

    function makeScreen() {
        var s = createTemporaryObject(screenComponent, tc)
        verify(s !== null)
        // The first run shows the demo's saved buffer (20 mM phosphate, pH 2.5).
        tryCompare(s.designer, "valid", true)
        return s
    }

    function test_target_ph_changes_the_recipe() {
        var s = makeScreen()
        var field = findAll(s, "targetPhField", [])[0]
        verify(field)
        var before = shownAmounts(s)
        verify(before.length > 0, "a recipe is shown")
        var ph = findAll(s, "predictedPh", [])[0]
        compare(ph.text, Number(s.designer.predictedPh).toLocaleString(Qt.locale(), "f", 2))

        // The first run opens the demo's line-A buffer (phosphoric acid + dihydrogen phosphate).
        typeInto(field.field, "3.1")
        tryCompare(s.designer, "targetPh", 3.1)
        verify(s.designer.valid, s.designer.errorField + ": " + s.designer.errorMessage)
        var after = shownAmounts(s)
        verify(after !== before, "the amounts shown follow the target: " + before + " -> " + after)
        compare(ph.text, Number(3.1).toLocaleString(Qt.locale(), "f", 2))
    }

    // Each step's row reads its text again only when that step changes (stepTextChanged): after
    // an edit, every row shows the designer's step as it is now, and a step with an amount in it
    // reads differently (the designer's contract in buffer_designer.h).
    function shownSteps(root) {
        var labels = findAll(root, "stepText", [])
        var texts = []
        for (var i = 0; i < labels.length; ++i)
            texts.push(labels[i].text)
        return texts
    }
    // The steps of the first recipe stand one under the other, each as tall as its wrapped text:
    // at 1280×800 they were once drawn over each other on one line until the screen was shown
    // again (the rows of a Column that never placed them).
    function test_steps_stand_one_under_another() {
        var s = makeScreen()
        tryVerify(function() { return findAll(s, "stepText", []).length === s.designer.stepCount })
        waitForRendering(s)
        var labels = findAll(s, "stepText", [])
        verify(labels.length > 2, "the steps are shown")
        var bottom = -1
        for (var i = 0; i < labels.length; ++i) {
            var top = labels[i].mapToItem(s, 0, 0).y
            verify(labels[i].height > 0, "step " + (i + 1) + " has a height")
            verify(labels[i].lineCount >= 1)
            verify(top >= bottom, "step " + (i + 1) + " starts at " + top + ", above the end of the one before (" + bottom + ")")
            bottom = top + labels[i].height
        }
    }

    function test_steps_follow_the_edit() {
        var s = makeScreen()
        var field = findAll(s, "targetPhField", [])[0]
        verify(field)
        // The rows are made when the list is laid out, after the first result.
        tryVerify(function() { return shownSteps(s).length === s.designer.stepCount })
        var before = shownSteps(s)
        compare(before.length, s.designer.stepCount)
        verify(before.length > 0, "the steps are shown")
        typeInto(field.field, "3.1")
        tryCompare(s.designer, "targetPh", 3.1)
        verify(s.designer.valid, s.designer.errorField + ": " + s.designer.errorMessage)
        var after = shownSteps(s)
        compare(after.length, s.designer.stepCount)
        var changed = 0
        for (var i = 0; i < after.length; ++i) {
            compare(after[i], s.designer.stepAt(i))
            if (i < before.length && after[i] !== before[i])
                ++changed
        }
        verify(changed > 0, "a step with an amount reads the new amount: " + after.join(" / "))
    }

    function test_not_a_number_stays_at_the_field() {
        var s = makeScreen()
        var field = findAll(s, "targetPhField", [])[0]
        var before = s.designer.targetPh
        typeInto(field.field, "abc")
        verify(field.parseError.indexOf("is not a number") >= 0, field.parseError)
        verify(field.parseError.indexOf("Target pH") === 0, "the message names the field")
        compare(s.designer.targetPh, before)
        verify(s.designer.valid)
    }

    function test_core_error_beside_its_field() {
        var s = makeScreen()
        var volume = findAll(s, "volumeField", [])[0]
        typeInto(volume.field, "-5")
        verify(volume.parseError.indexOf("-5 is less than") >= 0, "the field's own range stops -5: " + volume.parseError)
        typeInto(volume.field, "0")
        tryCompare(s.designer, "errorField", "volume_ml")
        verify(volume.error.length > 0, "the volume field shows the core's message")
        verify(volume.error.indexOf("0") >= 0, volume.error)
        var target = findAll(s, "targetPhField", [])[0]
        compare(target.error, "", "other fields stay clean")
        var recipeError = findAll(s, "recipeError", [])[0]
        verify(recipeError.visible)
        typeInto(volume.field, "500")
        tryCompare(s.designer, "valid", true)
        compare(volume.error, "")
    }

    function test_touch_targets() {
        var s = makeScreen()
        wait(50)
        var small = []
        function visit(item) {
            if (!item.visible)
                return
            var isButton = item.hasOwnProperty("pressed") && item.hasOwnProperty("checkable") && item.hasOwnProperty("flat")
            var isField = item.hasOwnProperty("inputMethodHints") && item.hasOwnProperty("selectByMouse")
            var isCombo = item.hasOwnProperty("displayText") && item.hasOwnProperty("currentIndex")
            if ((isButton || isField || isCombo) && item.height < Theme.tap - 0.5)
                small.push(item + " " + item.height)
            for (var i = 0; i < item.children.length; ++i)
                visit(item.children[i])
        }
        visit(s.screen)
        verify(Theme.tap >= Math.round(9 * Theme.pxPerMm), "the touch unit is 9 mm")
        compare(small.length, 0, "controls below 9 mm: " + small.join(", "))
    }
}
