import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// What to weigh or pipette, the pH the core predicts for the solution as made, its ionic
// strength and buffer capacity, and the recipe's warnings. An input the core refuses shows here
// too, with the field it names.
Card {
    id: root

    required property BufferDesigner designer

    title: qsTr("Recipe")
    note: root.designer.valid ? qsTr("for %1 mL").arg(NumberText.format(root.designer.volumeMl, 0)) : ""

    Label {
        objectName: "recipeError"
        Layout.fillWidth: true
        visible: !root.designer.valid
        text: root.designer.errorPlace.length > 0
              ? qsTr("%1: %2").arg(root.designer.errorPlace).arg(root.designer.errorMessage)
              : root.designer.errorMessage
        color: Theme.bad
        wrapMode: Text.Wrap
        font.pixelSize: Theme.fontSize
    }

    Column {
        id: itemList
        Layout.fillWidth: true
        spacing: Theme.gap
        // The model is the count, not the list: an edit that changes the amounts updates the
        // rows in place instead of building them again. Each row reads its own item (itemAt;
        // itemCount carries the change signal), not a JS copy of the whole list.
        Repeater {
            objectName: "recipeItems"
            model: root.designer.itemCount
            delegate: RowLayout {
                id: itemRow
                required property int index
                readonly property var modelData: root.designer.itemCount > index ? root.designer.itemAt(index) : ({})
                width: itemList.width
                spacing: Theme.gap
                ColumnLayout {
                    Layout.fillWidth: true
                    spacing: 0
                    Label {
                        Layout.fillWidth: true
                        text: itemRow.modelData.name || ""
                        font.pixelSize: Theme.fontSize
                        wrapMode: Text.Wrap
                    }
                    Label {
                        Layout.fillWidth: true
                        text: itemRow.modelData.as || ""
                        color: Theme.dimText
                        font.pixelSize: Theme.smallFont
                    }
                }
                Label {
                    objectName: "amount"
                    text: itemRow.modelData.amount || ""
                    font.pixelSize: Theme.largeFont
                    font.bold: true
                    horizontalAlignment: Text.AlignRight
                }
            }
        }
    }

    RowLayout {
        Layout.fillWidth: true
        visible: root.designer.valid
        spacing: Theme.margin
        ColumnLayout {
            spacing: 0
            Label { text: qsTr("Predicted pH"); color: Theme.dimText; font.pixelSize: Theme.smallFont }
            Label {
                objectName: "predictedPh"
                text: NumberText.format(root.designer.predictedPh, 2)
                font.pixelSize: Theme.hugeFont
                font.bold: true
            }
        }
        ColumnLayout {
            spacing: 0
            Label { text: qsTr("Ionic strength"); color: Theme.dimText; font.pixelSize: Theme.smallFont }
            Label {
                text: qsTr("%1 mmol/L").arg(NumberText.format(root.designer.ionicStrengthResultMmolPerL, 1))
                font.pixelSize: Theme.largeFont
            }
        }
        ColumnLayout {
            spacing: 0
            Label { text: qsTr("Buffer capacity β"); color: Theme.dimText; font.pixelSize: Theme.smallFont }
            Label {
                text: qsTr("%1 mmol/L/pH").arg(NumberText.format(root.designer.bufferCapacityMmolPerL, 2))
                font.pixelSize: Theme.largeFont
            }
        }
        Item { Layout.fillWidth: true }
    }

    Column {
        id: warningList
        Layout.fillWidth: true
        spacing: Theme.gap
        Repeater {
            model: root.designer.warnings
            delegate: WarningRow {
                required property var modelData
                width: warningList.width
                severity: modelData.severity
                message: modelData.message
            }
        }
    }
}
