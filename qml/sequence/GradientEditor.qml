import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// A method: flow, run and re-equilibration times, and its gradient table (time, % of each line),
// with the plot of the table. Methods are made, copied, renamed and deleted here. Typing one
// line's % fills the other when two lines are in use; with more, the last line takes the rest
// until it is typed in itself. The core checks the table (times ascending, rows summing to
// 100 %) and its message shows on the row it names; the rest of the plan keeps its last valid
// state meanwhile.
Card {
    id: root

    required property Plan plan
    readonly property GradientModel gradient: gradientModel

    title: qsTr("Method")
    note: gradientModel.errorMessage.length > 0 ? qsTr("needs a fix") : ""
    noteColour: Theme.bad

    /// Focuses a field of the method for "Open ›" from the checks ("gradient[2].A", "flow_ml_min").
    function focusField(field) {
        var m = /^gradient\[(\d+)\]\.?(.*)$/.exec(field)
        if (m) {
            var row = rowRepeater.itemAt(parseInt(m[1]))
            if (row)
                row.focusCell(m[2])
            return
        }
        if (field === "flow_ml_min") flowField.field.forceActiveFocus()
        else if (field === "run_min") runField.field.forceActiveFocus()
        else if (field === "equilibration_min") equilibrationField.field.forceActiveFocus()
    }

    GradientModel {
        id: gradientModel
        plan: root.plan
    }

    NameDialog {
        id: nameDialog
        property string mode: "new" // "new", "copy", "rename"
        title: mode === "rename" ? qsTr("Rename method “%1”").arg(gradientModel.methodName)
             : mode === "copy" ? qsTr("Copy method “%1”").arg(gradientModel.methodName)
             : qsTr("New method")
        label: qsTr("Method name")
        onAccepted: function(name) {
            if (name.length === 0) { showError(qsTr("Method name: type a name")); return }
            if (mode === "rename") {
                var why = root.plan.renameMethod(gradientModel.methodName, name)
                if (why.length > 0) { showError(why); return }
                gradientModel.methodName = name
            } else {
                if (root.plan.methodNames.indexOf(name) >= 0) {
                    showError(qsTr("Method name: “%1” is taken by another method").arg(name))
                    return
                }
                var made = root.plan.addMethod(mode === "copy" ? gradientModel.methodName : "")
                root.plan.renameMethod(made, name)
                gradientModel.methodName = name
            }
            close()
        }
    }
    ConfirmDialog {
        id: deleteDialog
        title: qsTr("Delete method “%1”?").arg(gradientModel.methodName)
        text: qsTr("Its gradient table goes with it. Saved plans keep their own copy.")
        onConfirmed: {
            var why = root.plan.removeMethod(gradientModel.methodName)
            methodMessage.text = why
        }
    }

    RowLayout {
        Layout.fillWidth: true
        spacing: Theme.gap
        ChoiceField {
            objectName: "methodChoice"
            Layout.fillWidth: true
            label: qsTr("Method")
            choices: {
                var c = []
                var names = root.plan.methodNames
                for (var i = 0; i < names.length; ++i)
                    c.push({ id: names[i], name: names[i] })
                return c
            }
            current: gradientModel.methodName
            onPicked: function(id) { gradientModel.methodName = id; methodMessage.text = "" }
        }
    }
    Flow {
        Layout.fillWidth: true
        spacing: Theme.gap
        TouchButton {
            objectName: "newMethod"
            text: qsTr("New")
            Accessible.name: qsTr("New method")
            onClicked: { nameDialog.mode = "new"; nameDialog.ask("") }
        }
        TouchButton {
            objectName: "copyMethod"
            text: qsTr("Copy")
            Accessible.name: qsTr("Copy method")
            onClicked: { nameDialog.mode = "copy"; nameDialog.ask(gradientModel.methodName + " " + qsTr("copy")) }
        }
        TouchButton {
            objectName: "renameMethod"
            text: qsTr("Rename")
            Accessible.name: qsTr("Rename method")
            onClicked: { nameDialog.mode = "rename"; nameDialog.ask(gradientModel.methodName) }
        }
        TouchButton {
            objectName: "deleteMethod"
            text: qsTr("Delete")
            Accessible.name: qsTr("Delete method")
            focusPolicy: Qt.NoFocus
            enabled: root.plan.methodNames.length > 1 && (root.plan.methodUse[gradientModel.methodName] || 0) === 0
            onClicked: deleteDialog.open()
        }
    }
    Label {
        Layout.fillWidth: true
        visible: root.plan.methodNames.length > 1 && (root.plan.methodUse[gradientModel.methodName] || 0) > 0
        text: qsTr("Delete is off: %n sequence row(s) run this method.", "", (root.plan.methodUse[gradientModel.methodName] || 0))
        color: Theme.dimText
        wrapMode: Text.Wrap
        font.pixelSize: Theme.smallFont
    }
    Label {
        id: methodMessage
        Layout.fillWidth: true
        visible: text.length > 0
        color: Theme.bad
        wrapMode: Text.Wrap
        font.pixelSize: Theme.smallFont
    }
    GridLayout {
        Layout.fillWidth: true
        columns: Theme.columnsFor(width, 3)
        columnSpacing: Theme.gap
        NumberField {
            id: flowField
            objectName: "flowField"
            Layout.fillWidth: true
            label: qsTr("Flow")
            unit: "mL/min"
            value: gradientModel.flowMlMin
            step: 0.05
            decimals: 2
            from: 0
            error: FieldPath.belongs(gradientModel.errorField, "flow_ml_min") ? gradientModel.errorMessage : ""
            onEdited: function(v) { gradientModel.flowMlMin = v }
        }
        NumberField {
            id: runField
            objectName: "runField"
            Layout.fillWidth: true
            label: qsTr("Run")
            unit: "min"
            value: gradientModel.runMin
            step: 1
            decimals: 1
            from: 0
            error: FieldPath.belongs(gradientModel.errorField, "run_min") ? gradientModel.errorMessage : ""
            onEdited: function(v) { gradientModel.runMin = v }
        }
        NumberField {
            id: equilibrationField
            objectName: "equilibrationField"
            Layout.fillWidth: true
            label: qsTr("Re-equilibration")
            unit: "min"
            value: gradientModel.equilibrationMin
            step: 1
            decimals: 1
            from: 0
            error: FieldPath.belongs(gradientModel.errorField, "equilibration_min") ? gradientModel.errorMessage : ""
            onEdited: function(v) { gradientModel.equilibrationMin = v }
        }
    }

    // Header of the table.
    RowLayout {
        Layout.fillWidth: true
        spacing: Theme.gap
        Label {
            Layout.preferredWidth: Theme.tap * 1.8
            text: qsTr("Time (min)")
            wrapMode: Text.Wrap
            color: Theme.dimText
            font.pixelSize: Theme.smallFont
        }
        Repeater {
            model: gradientModel.letters
            delegate: Label {
                required property string modelData
                required property int index
                Layout.fillWidth: true
                Layout.minimumWidth: Theme.tap
                text: qsTr("%1 %").arg(modelData)
                color: Theme.lineColours["ABCD".indexOf(modelData)]
                font.pixelSize: Theme.smallFont
                font.bold: true
            }
        }
        Item { Layout.preferredWidth: Theme.tap }
    }
    Column {
        id: rowList
        Layout.fillWidth: true
        spacing: Theme.gap
        Repeater {
            id: rowRepeater
            model: gradientModel
            delegate: ColumnLayout {
                id: row
                required property int index
                required property real tMin
                required property var percents
                required property real sum
                required property string rowError
                width: rowList.width
                spacing: 2
                /// The first cell's message while its text is not a number.
                property string cellMessage: ""

                function focusCell(key) {
                    if (key === "t_min" || key === "") { timeCell.forceActiveFocus(); return }
                    for (var i = 0; i < cells.count; ++i)
                        if (cells.itemAt(i).modelData === key) { cells.itemAt(i).forceActiveFocus(); return }
                }
                function refreshMessage() {
                    var m = timeCell.parseError
                    for (var i = 0; m.length === 0 && i < cells.count; ++i)
                        if (cells.itemAt(i)) m = cells.itemAt(i).parseError
                    cellMessage = m
                }

                RowLayout {
                    Layout.fillWidth: true
                    spacing: Theme.gap
                    CellField {
                        id: timeCell
                        objectName: "timeCell"
                        Layout.preferredWidth: Theme.tap * 1.8
                        value: row.tMin
                        decimals: 1
                        accessibleName: qsTr("Time of gradient row %1").arg(row.index + 1)
                        onEdited: function(v) { gradientModel.setTime(row.index, v) }
                        onParseErrorChanged: row.refreshMessage()
                    }
                    Repeater {
                        id: cells
                        model: gradientModel.letters
                        delegate: CellField {
                            required property string modelData
                            objectName: "cell" + modelData
                            Layout.fillWidth: true
                            Layout.minimumWidth: Theme.tap
                            value: row.percents[modelData] || 0
                            decimals: 1
                            accessibleName: qsTr("%1 % of line %2, gradient row %3").arg(modelData).arg(modelData).arg(row.index + 1)
                            onEdited: function(v) { gradientModel.setPercent(row.index, modelData, v) }
                            onParseErrorChanged: row.refreshMessage()
                        }
                    }
                    TouchButton {
                        objectName: "removeGradientRow"
                        text: "✕"
                        // Destructive: reached by touch, never by Tab.
                        focusPolicy: Qt.NoFocus
                        Accessible.name: qsTr("Remove gradient row %1").arg(row.index + 1)
                        enabled: gradientModel.rowCount() > 1
                        onClicked: gradientModel.removeRow(row.index)
                    }
                }
                Label {
                    objectName: "rowMessage"
                    Layout.fillWidth: true
                    visible: text.length > 0
                    text: row.cellMessage.length > 0 ? row.cellMessage
                        : row.rowError.length > 0 ? row.rowError
                        : Math.abs(row.sum - 100) > 0.01 ? qsTr("Row %1 adds up to %2 %, not 100 %").arg(row.index + 1).arg(NumberText.format(row.sum, 1))
                        : ""
                    color: row.cellMessage.length > 0 ? Theme.warn : Theme.bad
                    wrapMode: Text.Wrap
                    font.pixelSize: Theme.smallFont
                }
            }
        }
    }
    Label {
        Layout.fillWidth: true
        visible: gradientModel.errorMessage.length > 0 && gradientModel.errorRow < 0
        text: gradientModel.errorPlace + ": " + gradientModel.errorMessage
        color: Theme.bad
        wrapMode: Text.Wrap
        font.pixelSize: Theme.fontSize
    }
    UndoBar {
        Layout.fillWidth: true
        text: gradientModel.undoText
        onUndo: gradientModel.undoRemove()
    }
    TouchButton {
        objectName: "addGradientRow"
        text: qsTr("+ Row")
        Accessible.name: qsTr("Add a gradient row")
        onClicked: gradientModel.addRow()
    }
    GradientChart {
        Layout.fillWidth: true
        gradient: gradientModel
        pausedText: FieldPath.belongs(gradientModel.errorField, "gradient")
                    ? qsTr("Chart paused until the gradient table is fixed: %1").arg(gradientModel.errorMessage)
                    : ""
    }
}
