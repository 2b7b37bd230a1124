import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// The method being edited, moved to another (smaller) column: the scaled flow, gradient times
// and injection volume, the solvent it would use per injection and over tonight's injections,
// the change in column length over particle size against the allowed band, and the pressure on
// the new column. All numbers come from the core's `transfer` (ColumnTransfer); one touch adds
// the result to the plan as a new method.
Card {
    id: root

    required property Plan plan
    property string method
    /// A method was added: the screen opens it in the method editor.
    signal methodAdded(string name)

    title: qsTr("Run it on a smaller column")
    note: root.method.length > 0 ? qsTr("method “%1”").arg(root.method) : ""

    ColumnLibrary {
        id: columns
        workspace: root.plan.workspace
    }
    ColumnTransfer {
        id: move
        plan: root.plan
        method: root.method
    }
    readonly property var r: move.result
    /// "typed" or a library column's name.
    property string targetChoice
    property var typed: ({ length_mm: 50, id_mm: 2.1, particle_um: 1.7, max_pressure_bar: NaN })
    property string status

    function num(v, d) { return NumberText.format(v, d) }
    /// "+37", "−31" or "0": a true minus sign, the sign taken after rounding to whole percent.
    function signedPercent(fraction) {
        var p = Math.round(100 * fraction)
        return (p > 0 ? "+" : p < 0 ? "−" : "") + root.num(Math.abs(p), 0)
    }
    function applyTarget() {
        if (root.targetChoice === "typed") {
            var t = { length_mm: root.typed.length_mm, id_mm: root.typed.id_mm, particle_um: root.typed.particle_um }
            if (!isNaN(root.typed.max_pressure_bar))
                t.max_pressure_bar = root.typed.max_pressure_bar
            move.target = t
        } else if (root.targetChoice.length > 0) {
            move.target = columns.document(root.targetChoice)
        } else {
            move.target = {}
        }
        nameEntry.field.text = move.valid ? root.r.defaultName : ""
    }
    function setTyped(key, v) {
        var t = Object.assign({}, root.typed)
        t[key] = v
        root.typed = t
        root.applyTarget()
    }
    function errorFor(field, label) {
        var m = move.errors[field]
        return m ? label + ": " + m : ""
    }
    // Another method: start again from "choose", nothing carried over from the last one.
    onMethodChanged: {
        root.status = ""
        root.targetChoice = ""
        move.target = {}
        nameEntry.field.text = ""
    }

    Label {
        Layout.fillWidth: true
        wrapMode: Text.Wrap
        font.pixelSize: Theme.smallFont
        text: root.r.fromText ? qsTr("Now on: %1").arg(root.r.fromText) : ""
        visible: text.length > 0
    }
    ChoiceField {
        objectName: "smallerTarget"
        Layout.fillWidth: true
        label: qsTr("Move to")
        accessibleName: qsTr("Column to move method %1 to").arg(root.method)
        choices: {
            var out = []
            var names = columns.names // once: each read is a new JS copy of the list
            for (var i = 0; i < names.length; ++i)
                out.push({ id: names[i], name: names[i] })
            out.push({ id: "typed", name: qsTr("Another size (type it)") })
            return out
        }
        current: root.targetChoice
        onPicked: function(id) { root.targetChoice = id; root.applyTarget() }
    }
    GridLayout {
        visible: root.targetChoice === "typed"
        Layout.fillWidth: true
        columns: root.width > Theme.tap * 9 ? 2 : 1
        columnSpacing: Theme.gap
        rowSpacing: Theme.gap
        NumberField {
            objectName: "smallerLength"
            Layout.fillWidth: true
            label: qsTr("New length")
            unit: "mm"
            decimals: 0
            step: 10
            value: root.typed.length_mm
            error: root.errorFor("length_mm", qsTr("New length"))
            onEdited: function(v) { root.setTyped("length_mm", v) }
        }
        NumberField {
            objectName: "smallerId"
            Layout.fillWidth: true
            label: qsTr("New inner diameter")
            unit: "mm"
            decimals: 1
            step: 0.1
            value: root.typed.id_mm
            error: root.errorFor("id_mm", qsTr("New inner diameter"))
            onEdited: function(v) { root.setTyped("id_mm", v) }
        }
        NumberField {
            objectName: "smallerParticle"
            Layout.fillWidth: true
            label: qsTr("New particle size")
            unit: "µm"
            decimals: 1
            step: 0.1
            value: root.typed.particle_um
            error: root.errorFor("particle_um", qsTr("New particle size"))
            onEdited: function(v) { root.setTyped("particle_um", v) }
        }
        NumberField {
            objectName: "smallerMaxPressure"
            Layout.fillWidth: true
            label: qsTr("Its pressure limit (optional)")
            unit: "bar"
            decimals: 0
            step: 50
            optional: true
            placeholder: qsTr("none")
            value: root.typed.max_pressure_bar
            error: root.errorFor("max_pressure_bar", qsTr("Pressure limit"))
            onEdited: function(v) { root.setTyped("max_pressure_bar", v) }
        }
    }
    GridLayout {
        Layout.fillWidth: true
        columns: root.width > Theme.tap * 9 ? 2 : 1
        columnSpacing: Theme.gap
        rowSpacing: Theme.gap
        NumberField {
            objectName: "smallerFlow"
            Layout.fillWidth: true
            label: qsTr("Flow on the new column (empty: scaled)")
            unit: "mL/min"
            decimals: 3
            step: 0.05
            optional: true
            placeholder: root.r.scaledFlowMlMin ? root.num(root.r.scaledFlowMlMin, 3) : qsTr("scaled")
            value: move.targetFlowMlMin
            error: root.errorFor("flow_ml_min", qsTr("Flow on the new column"))
            onEdited: function(v) { move.targetFlowMlMin = v }
        }
        NumberField {
            objectName: "smallerInjection"
            Layout.fillWidth: true
            label: qsTr("Injection volume now")
            unit: "µL"
            decimals: 1
            step: 1
            value: move.injectionUl
            error: root.errorFor("injection_ul", qsTr("Injection volume"))
            onEdited: function(v) { move.injectionUl = v }
        }
    }
    Label {
        objectName: "smallerProblem"
        Layout.fillWidth: true
        visible: move.problem.length > 0 && root.targetChoice.length > 0
        text: move.problem
        color: Theme.warn
        wrapMode: Text.Wrap
        font.pixelSize: Theme.smallFont
    }

    ColumnLayout {
        objectName: "smallerResult"
        visible: move.valid
        Layout.fillWidth: true
        spacing: Math.round(Theme.gap / 2)
        Label {
            objectName: "smallerFlowText"
            Layout.fillWidth: true
            wrapMode: Text.Wrap
            font.pixelSize: Theme.fontSize
            text: qsTr("Flow %1 → %2 mL/min; times × %3")
                  .arg(root.num(root.r.flowFromMlMin, 3)).arg(root.num(root.r.flowToMlMin, 3))
                  .arg(root.num(root.r.timeFactor, 3))
        }
        Label {
            Layout.fillWidth: true
            text: qsTr("Gradient table (min), now → new:")
            font.pixelSize: Theme.smallFont
            color: Theme.dimText
            wrapMode: Text.Wrap
        }
        Flow {
            Layout.fillWidth: true
            spacing: Theme.gap
            Repeater {
                model: root.r.rows ? root.r.rows.length : 0
                delegate: Label {
                    required property int index
                    readonly property var row: root.r.rows[index]
                    font.pixelSize: Theme.smallFont
                    text: (isNaN(row.fromMin) ? qsTr("hold") : root.num(row.fromMin, 2)) + " → " + root.num(row.toMin, 2)
                }
            }
        }
        Label {
            objectName: "smallerTimesText"
            Layout.fillWidth: true
            wrapMode: Text.Wrap
            font.pixelSize: Theme.smallFont
            text: qsTr("Run %1 → %2 min; re-equilibration %3 → %4 min; injection %5 → %6 µL")
                  .arg(root.num(root.r.runFromMin, 1)).arg(root.num(root.r.runToMin, 2))
                  .arg(root.num(root.r.equilibrationFromMin, 1)).arg(root.num(root.r.equilibrationToMin, 2))
                  .arg(root.num(root.r.injectionFromUl, 1)).arg(root.num(root.r.injectionToUl, 2))
        }
        Label {
            Layout.fillWidth: true
            visible: root.r.holdAddedMin > 0
            wrapMode: Text.Wrap
            font.pixelSize: Theme.smallFont
            text: qsTr("The gradient starts after a %1 min hold, so it reaches the column as late as before (the pump's dwell volume).")
                  .arg(root.num(root.r.holdAddedMin, 2))
        }
        Label {
            objectName: "smallerSolventText"
            Layout.fillWidth: true
            wrapMode: Text.Wrap
            font.pixelSize: Theme.fontSize
            font.bold: true
            text: qsTr("Solvent per injection %1 → %2 mL: %3 % less")
                  .arg(root.num(root.r.solventFromMl, 1)).arg(root.num(root.r.solventToMl, 2))
                  .arg(root.num(100 * root.r.savingFraction, 0))
        }
        Label {
            objectName: "smallerNightText"
            Layout.fillWidth: true
            wrapMode: Text.Wrap
            font.pixelSize: Theme.smallFont
            text: root.r.nightInjections > 0
                  ? qsTr("Tonight's %n injection(s) of this method: %1 → %2 mL, %3 mL less", "", root.r.nightInjections)
                    .arg(root.num(root.r.nightFromMl, 0)).arg(root.num(root.r.nightToMl, 0)).arg(root.num(root.r.nightSavingMl, 0))
                  : qsTr("This method is not in tonight's sequence.")
        }
        Label {
            objectName: "smallerLdpText"
            Layout.fillWidth: true
            wrapMode: Text.Wrap
            font.pixelSize: Theme.smallFont
            color: root.r.withinAllowed ? Theme.text : Theme.warn
            text: qsTr("Length over particle size changes by %1 %: %2")
                  .arg(root.signedPercent(root.r.lOverDpChange))
                  .arg(root.r.withinAllowed ? qsTr("within the allowed −25 % to +50 % (USP <621>)")
                                            : qsTr("outside the allowed −25 % to +50 % (USP <621>): the method would need revalidation"))
        }
        Label {
            objectName: "smallerPressureText"
            Layout.fillWidth: true
            wrapMode: Text.Wrap
            font.pixelSize: Theme.smallFont
            color: root.r.hasPressure && root.r.limitBar > 0 && root.r.maxBar > root.r.limitBar ? Theme.bad : Theme.text
            text: {
                if (!root.r.hasPressure)
                    return root.r.pressureNote || ""
                var s = qsTr("Pressure up to %1 bar at %2 min").arg(root.num(root.r.maxBar, 0)).arg(root.num(root.r.maxAtMin, 1))
                if (root.r.limitBar > 0)
                    s += (root.r.maxBar > root.r.limitBar ? qsTr(", over the %1 limit of %2 bar") : qsTr(", under the %1 limit of %2 bar"))
                         .arg(root.r.limitedBy === "column" ? qsTr("column's") : qsTr("pump's")).arg(root.num(root.r.limitBar, 0))
                else
                    s += qsTr(" (no limit given)")
                if (!root.r.calibrated)
                    s += qsTr("; an estimate, not measured on this column")
                return s
            }
        }
        Column {
            id: warningList
            Layout.fillWidth: true
            Repeater {
                model: root.r.warnings || []
                delegate: Label {
                    required property string modelData
                    width: warningList.width
                    wrapMode: Text.Wrap
                    font.pixelSize: Theme.smallFont
                    color: Theme.warn
                    text: modelData
                }
            }
        }
        TextEntry {
            id: nameEntry
            objectName: "smallerName"
            Layout.fillWidth: true
            label: qsTr("Name of the new method")
        }
        TouchButton {
            objectName: "smallerAdd"
            text: qsTr("Add as a new method")
            highlighted: true
            onClicked: {
                var name = nameEntry.field.text.trim()
                var why = move.addAsMethod(name)
                if (why.length > 0) {
                    root.status = why
                    return
                }
                root.methodAdded(name)
                root.status = qsTr("Added “%1” to the plan's methods and opened it above; add it to a sequence row to run it.").arg(name)
            }
        }
    }
    Label {
        objectName: "smallerStatus"
        Layout.fillWidth: true
        visible: root.status.length > 0
        text: root.status
        wrapMode: Text.Wrap
        font.pixelSize: Theme.smallFont
    }
}
