import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// The sequence: rows of (method, injections, label) in run order.
Card {
    id: root

    required property Plan plan
    readonly property SequenceRowsModel rows: rowsModel

    /// Focuses a field of a row for "Open ›" from the checks (row index, "injections" or "method").
    function focusField(rowIndex, field) {
        var r = rowRepeater.itemAt(rowIndex)
        if (r)
            r.focusField(field)
    }

    title: qsTr("Sequence")
    note: qsTr("%n injection(s)", "", rowsModel.totalInjections)

    SequenceRowsModel {
        id: rowsModel
        plan: root.plan
    }

    Column {
        id: rowList
        Layout.fillWidth: true
        spacing: Theme.gap
        Repeater {
            id: rowRepeater
            model: rowsModel
            delegate: ColumnLayout {
                id: row
                function focusField(field) {
                    if (field === "method") methodPicker.box.forceActiveFocus()
                    else if (field === "label") labelEntry.field.forceActiveFocus()
                    else injectionsField.field.forceActiveFocus()
                }
                required property int index
                required property string method
                required property int injections
                required property string label
                required property string rowError
                required property string rowErrorField
                width: rowList.width
                spacing: Math.round(Theme.gap / 2)

                RowLayout {
                    Layout.fillWidth: true
                    spacing: Theme.gap
                    Label {
                        text: (row.index + 1) + "."
                        font.pixelSize: Theme.largeFont
                        Layout.preferredWidth: Theme.tap * 0.7
                    }
                    TextEntry {
                        id: labelEntry
                        Layout.fillWidth: true
                        value: row.label
                        label: ""
                        accessibleName: qsTr("Label of sequence row %1").arg(row.index + 1)
                        placeholder: qsTr("label")
                        onEdited: function(text) { rowsModel.setLabel(row.index, text) }
                    }
                    TouchButton {
                        text: "↑"
                        focusPolicy: Qt.NoFocus
                        Accessible.name: qsTr("Move sequence row %1 up").arg(row.index + 1)
                        enabled: row.index > 0
                        onClicked: rowsModel.moveRow(row.index, row.index - 1)
                    }
                    TouchButton {
                        objectName: "removeSequenceRow"
                        text: "✕"
                        // Destructive: reached by touch, never by Tab; Undo puts the row back.
                        focusPolicy: Qt.NoFocus
                        Accessible.name: qsTr("Remove sequence row %1").arg(row.index + 1)
                        onClicked: rowsModel.removeRow(row.index)
                    }
                }
                RowLayout {
                    Layout.fillWidth: true
                    spacing: Theme.gap
                    ChoiceField {
                        id: methodPicker
                        Layout.fillWidth: true
                        // Labelled as the injections beside it, so both pickers line up at the
                        // top and a message under either moves neither.
                        label: qsTr("Method")
                        accessibleName: qsTr("Method of sequence row %1").arg(row.index + 1)
                        choices: {
                            var c = []
                            var names = root.plan.methodNames
                            for (var i = 0; i < names.length; ++i)
                                c.push({ id: names[i], name: names[i] })
                            return c
                        }
                        current: row.method
                        error: FieldPath.belongs(row.rowErrorField, "method") ? row.rowError : ""
                        onPicked: function(id) { rowsModel.setMethod(row.index, id) }
                    }
                    NumberField {
                        id: injectionsField
                        objectName: "injectionsField"
                        Layout.preferredWidth: Theme.tap * 5
                        label: qsTr("Injections, row %1").arg(row.index + 1)
                        integer: true
                        unit: qsTr("inj.")
                        value: row.injections
                        step: 1
                        from: 0
                        error: FieldPath.belongs(row.rowErrorField, "injections") ? row.rowError : ""
                        onEdited: function(v) { rowsModel.setInjections(row.index, Math.round(v)) }
                    }
                }
                Label {
                    Layout.fillWidth: true
                    visible: row.rowError.length > 0 && !FieldPath.belongsToAny(row.rowErrorField, ["method", "injections"])
                    text: row.rowError
                    color: Theme.bad
                    wrapMode: Text.Wrap
                    font.pixelSize: Theme.smallFont
                }
            }
        }
    }
    UndoBar {
        Layout.fillWidth: true
        text: rowsModel.undoText
        onUndo: rowsModel.undoRemove()
    }
    TouchButton {
        objectName: "addSequenceRow"
        text: qsTr("+ Row")
        Accessible.name: qsTr("Add a sequence row")
        onClicked: rowsModel.addRow()
    }
}
