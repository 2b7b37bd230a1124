import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// Every warning of tonight's plan in one place, worst first, each once, with what to do about it
// and a way to the field it concerns.
ScreenPage {
    id: root

    required property ChecksModel checks
    /// Opens the screen a check belongs to ("buffer", "lines", "sequence") and focuses the field it
    /// names (a contract path such as "lines.B.bottle_ml"; empty: the screen alone).
    signal open(string screen, string focus)

    title: qsTr("Checks")

    ColumnLayout {
        width: root.contentWidth
        spacing: Theme.margin

        Card {
            Layout.fillWidth: true
            title: root.checks.count === 0 ? qsTr("No warnings") : qsTr("%n check(s) to read", "", root.checks.count)
            note: root.checks.warningCount > 0 ? qsTr("%n to fix before the start", "", root.checks.warningCount) : ""
            noteColour: Theme.bad
            Label {
                Layout.fillWidth: true
                wrapMode: Text.Wrap
                color: Theme.dimText
                font.pixelSize: Theme.smallFont
                text: qsTr("The checks cover the buffer, each line and the whole sequence. They help; they do not replace the safety data sheets, the method, or local rules.")
            }
        }
        Column {
            id: checkList
            Layout.fillWidth: true
            spacing: Theme.gap
            Repeater {
                model: root.checks
                delegate: Card {
                    id: entry
                    required property string severity
                    required property string message
                    required property string advice
                    required property string source
                    required property string screen
                    required property string focusPath
                    width: checkList.width
                    RowLayout {
                        Layout.fillWidth: true
                        spacing: Theme.gap
                        WarningRow {
                            Layout.fillWidth: true
                            severity: entry.severity
                            message: entry.message
                            advice: entry.advice
                            source: entry.source
                        }
                        TouchButton {
                            Layout.alignment: Qt.AlignVCenter
                            text: qsTr("Open ›")
                            Accessible.name: qsTr("Open the field: %1").arg(entry.message)
                            onClicked: root.open(entry.screen, entry.focusPath)
                        }
                    }
                }
            }
        }
    }
}
