import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// The sequence: rows of (method, injections, label) in run order.
Card {
    id: root

    required property Plan plan

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
            model: rowsModel
            delegate: ColumnLayout {
                id: row
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
                        Layout.fillWidth: true
                        value: row.label
                        placeholder: qsTr("label")
                        onEdited: function(text) { rowsModel.setLabel(row.index, text) }
                    }
                    TouchButton {
                        text: "↑"
                        Accessible.name: qsTr("Move row up")
                        enabled: row.index > 0
                        onClicked: rowsModel.moveRow(row.index, row.index - 1)
                    }
                    TouchButton {
                        text: "✕"
                        Accessible.name: qsTr("Remove row")
                        onClicked: rowsModel.removeRow(row.index)
                    }
                }
                RowLayout {
                    Layout.fillWidth: true
                    spacing: Theme.gap
                    ChoiceField {
                        Layout.fillWidth: true
                        choices: {
                            var c = []
                            var names = root.plan.methodNames
                            for (var i = 0; i < names.length; ++i)
                                c.push({ id: names[i], name: names[i] })
                            return c
                        }
                        current: row.method
                        error: row.rowErrorField === "method" ? row.rowError : ""
                        onPicked: function(id) { rowsModel.setMethod(row.index, id) }
                    }
                    NumberField {
                        Layout.preferredWidth: Theme.tap * 5
                        integer: true
                        unit: qsTr("inj.")
                        value: row.injections
                        step: 1
                        from: 0
                        error: row.rowErrorField === "injections" ? row.rowError : ""
                        onEdited: function(v) { rowsModel.setInjections(row.index, Math.round(v)) }
                    }
                }
                Label {
                    Layout.fillWidth: true
                    visible: row.rowError.length > 0 && row.rowErrorField !== "method" && row.rowErrorField !== "injections"
                    text: row.rowError
                    color: Theme.bad
                    wrapMode: Text.Wrap
                    font.pixelSize: Theme.smallFont
                }
            }
        }
    }
    TouchButton {
        text: qsTr("+ Row")
        onClicked: rowsModel.addRow()
    }
}
