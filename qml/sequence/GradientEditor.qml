import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// A method: flow, run and re-equilibration times, and its gradient table (time, % of each line),
// with the plot of the table. The core checks the table (times ascending, rows summing to 100 %)
// and its message shows on the row it names.
Card {
    id: root

    required property Plan plan
    readonly property GradientModel gradient: gradientModel

    title: qsTr("Method")
    note: gradientModel.errorMessage.length > 0 ? qsTr("needs a fix") : ""
    noteColour: Theme.bad

    GradientModel {
        id: gradientModel
        plan: root.plan
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
            current: gradientModel.methodName
            onPicked: function(id) { gradientModel.methodName = id }
        }
        TouchButton {
            text: qsTr("Copy")
            onClicked: gradientModel.methodName = root.plan.addMethod(gradientModel.methodName)
        }
    }
    GridLayout {
        Layout.fillWidth: true
        columns: Theme.columnsFor(width, 3)
        columnSpacing: Theme.gap
        NumberField {
            Layout.fillWidth: true
            label: qsTr("Flow")
            unit: "mL/min"
            value: gradientModel.flowMlMin
            step: 0.05
            decimals: 2
            from: 0
            error: gradientModel.errorField === "flow_ml_min" ? gradientModel.errorMessage : ""
            onEdited: function(v) { gradientModel.flowMlMin = v }
        }
        NumberField {
            Layout.fillWidth: true
            label: qsTr("Run")
            unit: "min"
            value: gradientModel.runMin
            step: 1
            decimals: 1
            from: 0
            error: gradientModel.errorField === "run_min" ? gradientModel.errorMessage : ""
            onEdited: function(v) { gradientModel.runMin = v }
        }
        NumberField {
            Layout.fillWidth: true
            label: qsTr("Re-equilibration")
            unit: "min"
            value: gradientModel.equilibrationMin
            step: 1
            decimals: 1
            from: 0
            error: gradientModel.errorField === "equilibration_min" ? gradientModel.errorMessage : ""
            onEdited: function(v) { gradientModel.equilibrationMin = v }
        }
    }

    // Header of the table.
    RowLayout {
        Layout.fillWidth: true
        spacing: Theme.gap
        Label {
            Layout.preferredWidth: Theme.tap * 2.2
            text: qsTr("Time (min)")
            color: Theme.dimText
            font.pixelSize: Theme.smallFont
        }
        Repeater {
            model: gradientModel.letters
            delegate: Label {
                required property string modelData
                required property int index
                Layout.fillWidth: true
                text: qsTr("%1 (%)").arg(modelData)
                color: Theme.lineColours[index % 4]
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
                RowLayout {
                    Layout.fillWidth: true
                    spacing: Theme.gap
                    CellField {
                        Layout.preferredWidth: Theme.tap * 2.2
                        value: row.tMin
                        decimals: 1
                        accessibleName: qsTr("Time of row %1").arg(row.index + 1)
                        onEdited: function(v) { gradientModel.setTime(row.index, v) }
                    }
                    Repeater {
                        model: gradientModel.letters
                        delegate: CellField {
                            required property string modelData
                            Layout.fillWidth: true
                            value: row.percents[modelData] || 0
                            decimals: 1
                            accessibleName: qsTr("Line %1 in row %2").arg(modelData).arg(row.index + 1)
                            onEdited: function(v) { gradientModel.setPercent(row.index, modelData, v) }
                        }
                    }
                    TouchButton {
                        text: "✕"
                        Accessible.name: qsTr("Remove row %1").arg(row.index + 1)
                        enabled: gradientModel.rowCount() > 1
                        onClicked: gradientModel.removeRow(row.index)
                    }
                }
                Label {
                    Layout.fillWidth: true
                    visible: row.rowError.length > 0 || Math.abs(row.sum - 100) > 0.01
                    text: row.rowError.length > 0 ? row.rowError : qsTr("Row adds up to %1 %").arg(Number(row.sum).toLocaleString(Qt.locale(), "f", 1))
                    color: Theme.bad
                    wrapMode: Text.Wrap
                    font.pixelSize: Theme.smallFont
                }
            }
        }
    }
    Label {
        Layout.fillWidth: true
        visible: gradientModel.errorMessage.length > 0 && gradientModel.errorRow < 0
        text: gradientModel.errorField + ": " + gradientModel.errorMessage
        color: Theme.bad
        wrapMode: Text.Wrap
        font.pixelSize: Theme.fontSize
    }
    TouchButton {
        text: qsTr("+ Row")
        onClicked: gradientModel.addRow()
    }
    GradientChart {
        Layout.fillWidth: true
        gradient: gradientModel
    }
}
