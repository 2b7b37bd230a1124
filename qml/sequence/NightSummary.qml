import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// The night at a glance: when it starts and ends (with the day), the standby, how much waste,
// and for each bottle what it needs, whether it lasts, and if not when it runs dry and what to
// fill instead. While an input is wrong it keeps showing the last valid plan, greyed.
Card {
    id: root

    required property Plan plan
    /// An input of the screen is typed but not applied yet.
    property bool inputsPending: false

    title: qsTr("The night")
    stale: root.plan.stale || root.inputsPending
    staleText: root.plan.stale ? qsTr("last valid plan") : qsTr("not applied")

    Label {
        objectName: "planError"
        Layout.fillWidth: true
        visible: !root.plan.valid
        text: root.plan.stale
              ? qsTr("Not updated: %1 needs fixing. %2").arg(root.plan.errorPlace).arg(root.plan.errorMessage)
              : (root.plan.errorPlace.length > 0 ? root.plan.errorPlace + ": " : "") + root.plan.errorMessage
        color: Theme.bad
        wrapMode: Text.Wrap
        font.pixelSize: Theme.fontSize
    }
    GridLayout {
        Layout.fillWidth: true
        visible: root.plan.valid || root.plan.stale
        columns: 3
        columnSpacing: Theme.margin
        rowSpacing: 0
        // Equal thirds that wrap, so the card never grows wider than the column it sits in (at
        // 1280 px "Fri 4 Dec 03:30" in the large font would otherwise push the card past the edge).
        Label { text: qsTr("Starts"); color: Theme.dimText; font.pixelSize: Theme.smallFont; Layout.fillWidth: true; Layout.preferredWidth: 1 }
        Label { text: qsTr("Ends"); color: Theme.dimText; font.pixelSize: Theme.smallFont; Layout.fillWidth: true; Layout.preferredWidth: 1 }
        Label { text: qsTr("Waste"); color: Theme.dimText; font.pixelSize: Theme.smallFont; Layout.fillWidth: true; Layout.preferredWidth: 1 }
        Label {
            objectName: "startText"
            text: root.plan.startText
            font.pixelSize: Theme.largeFont
            Layout.fillWidth: true
            Layout.preferredWidth: 1
            wrapMode: Text.Wrap
        }
        Label {
            objectName: "endText"
            text: root.plan.endText
            font.pixelSize: Theme.largeFont
            Layout.fillWidth: true
            Layout.preferredWidth: 1
            wrapMode: Text.Wrap
            font.bold: true
        }
        Label {
            text: qsTr("%1 mL").arg(NumberText.format(root.plan.wasteMl, 0))
            font.pixelSize: Theme.largeFont
            Layout.fillWidth: true
            Layout.preferredWidth: 1
            wrapMode: Text.Wrap
            color: root.plan.wasteCapacityMl > 0 && root.plan.wasteMl > root.plan.wasteCapacityMl ? Theme.bad : Theme.text
        }
    }
    Label {
        Layout.fillWidth: true
        visible: (root.plan.valid || root.plan.stale)
        text: qsTr("Injections run for %1%2").arg(NumberText.format(root.plan.totalMin / 60, 1) + " h")
              .arg(root.plan.standbyText.length > 0 ? qsTr("; standby %1").arg(root.plan.standbyText) : qsTr("; no standby"))
        color: Theme.dimText
        wrapMode: Text.Wrap
        font.pixelSize: Theme.smallFont
    }
    Column {
        id: bottleList
        Layout.fillWidth: true
        spacing: Theme.gap
        Repeater {
            // The count, not the list: a new result updates the rows in place, each reading its
            // own bottle (bottleAt; bottleCount carries the change signal).
            model: root.plan.bottleCount
            delegate: RowLayout {
                required property int index
                readonly property var modelData: root.plan.bottleCount > index ? root.plan.bottleAt(index) : ({})
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
                        wrapMode: Text.Wrap
                        font.pixelSize: Theme.fontSize
                    }
                    Label {
                        Layout.fillWidth: true
                        wrapMode: Text.Wrap
                        font.pixelSize: Theme.smallFont
                        color: modelData.runs_dry ? Theme.bad : Theme.dimText
                        text: modelData.runs_dry
                              ? qsTr("needs %1 mL of %2 usable: runs dry during injection %3, %4; fill at least %5 mL")
                                    .arg(NumberText.format(modelData.required_ml, 0))
                                    .arg(NumberText.format(modelData.usable_ml, 0))
                                    .arg(modelData.dry_after_injection)
                                    .arg(modelData.dry_text)
                                    .arg(NumberText.format(Math.ceil(modelData.min_bottle_ml || 0), 0)) // at least: up, as the check says
                              : qsTr("needs %1 mL of %2 usable: lasts")
                                    .arg(NumberText.format(modelData.required_ml, 0))
                                    .arg(NumberText.format(modelData.usable_ml, 0))
                    }
                }
            }
        }
    }
}
