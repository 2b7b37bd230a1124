import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// The night at a glance: when it ends, how much waste, and for each bottle what it needs,
// whether it lasts, and if not when it runs dry and what to fill instead.
Card {
    id: root

    required property Plan plan

    title: qsTr("The night")

    Label {
        objectName: "planError"
        Layout.fillWidth: true
        visible: !root.plan.valid
        text: root.plan.errorField.length > 0 ? root.plan.errorField + ": " + root.plan.errorMessage : root.plan.errorMessage
        color: Theme.bad
        wrapMode: Text.Wrap
        font.pixelSize: Theme.fontSize
    }
    RowLayout {
        Layout.fillWidth: true
        visible: root.plan.valid
        spacing: Theme.margin
        ColumnLayout {
            spacing: 0
            Label { text: qsTr("Ends"); color: Theme.dimText; font.pixelSize: Theme.smallFont }
            Label {
                objectName: "endText"
                text: root.plan.endText
                font.pixelSize: Theme.hugeFont
                font.bold: true
            }
        }
        ColumnLayout {
            spacing: 0
            Label { text: qsTr("Run time"); color: Theme.dimText; font.pixelSize: Theme.smallFont }
            Label {
                text: qsTr("%1 h").arg(Number(root.plan.totalMin / 60).toLocaleString(Qt.locale(), "f", 1))
                font.pixelSize: Theme.largeFont
            }
        }
        ColumnLayout {
            spacing: 0
            Label { text: qsTr("Waste"); color: Theme.dimText; font.pixelSize: Theme.smallFont }
            Label {
                text: qsTr("%1 mL").arg(Number(root.plan.wasteMl).toLocaleString(Qt.locale(), "f", 0))
                font.pixelSize: Theme.largeFont
                color: root.plan.wasteCapacityMl > 0 && root.plan.wasteMl > root.plan.wasteCapacityMl ? Theme.bad : Theme.text
            }
        }
        Item { Layout.fillWidth: true }
    }
    Column {
        id: bottleList
        Layout.fillWidth: true
        spacing: Theme.gap
        Repeater {
            model: root.plan.bottles
            delegate: RowLayout {
                required property var modelData
                required property int index
                width: bottleList.width
                spacing: Theme.gap
                Rectangle {
                    Layout.preferredWidth: Theme.tap * 0.8
                    Layout.preferredHeight: Theme.tap * 0.8
                    radius: width / 2
                    color: Theme.lineColours["ABCD".indexOf(modelData.letter)]
                    Label {
                        anchors.centerIn: parent
                        text: modelData.letter
                        color: Theme.card
                        font.bold: true
                        font.pixelSize: Theme.fontSize
                    }
                }
                ColumnLayout {
                    Layout.fillWidth: true
                    spacing: 0
                    Label {
                        Layout.fillWidth: true
                        text: modelData.name
                        elide: Text.ElideRight
                        font.pixelSize: Theme.fontSize
                    }
                    Label {
                        Layout.fillWidth: true
                        wrapMode: Text.Wrap
                        font.pixelSize: Theme.smallFont
                        color: modelData.runs_dry ? Theme.bad : Theme.dimText
                        text: modelData.runs_dry
                              ? qsTr("needs %1 mL of %2 usable: runs dry during injection %3 at %4; fill at least %5 mL")
                                    .arg(Number(modelData.required_ml).toLocaleString(Qt.locale(), "f", 0))
                                    .arg(Number(modelData.usable_ml).toLocaleString(Qt.locale(), "f", 0))
                                    .arg(modelData.dry_after_injection)
                                    .arg(modelData.dry_text)
                                    .arg(Number(modelData.min_bottle_ml || 0).toLocaleString(Qt.locale(), "f", 0))
                              : qsTr("needs %1 mL of %2 usable: lasts")
                                    .arg(Number(modelData.required_ml).toLocaleString(Qt.locale(), "f", 0))
                                    .arg(Number(modelData.usable_ml).toLocaleString(Qt.locale(), "f", 0))
                    }
                }
            }
        }
    }
}
