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
    /// Entries typed on the screens whose text is not applied (the window's count), and the
    /// screen that holds the first of them ("buffer", "sequence", ...; "" when none).
    property int entriesNotApplied: 0
    property string entryScreen
    property string entryScreenName

    title: qsTr("Checks")

    ColumnLayout {
        width: root.contentWidth
        spacing: Theme.margin

        Card {
            Layout.fillWidth: true
            title: root.checks.count === 0 ? (root.entriesNotApplied > 0 ? qsTr("No warnings for the values applied")
                                                                          : qsTr("No warnings"))
                                           : qsTr("%n check(s) to read", "", root.checks.count)
            note: root.checks.warningCount > 0 ? qsTr("%n to fix before the start", "", root.checks.warningCount) : ""
            noteColour: Theme.bad
            // What was typed but not applied is not checked: said before the checks, with a way
            // back to it.
            RowLayout {
                Layout.fillWidth: true
                visible: root.entriesNotApplied > 0
                spacing: Theme.gap
                Label {
                    objectName: "entriesNotApplied"
                    Layout.fillWidth: true
                    wrapMode: Text.Wrap
                    color: Theme.warn
                    font.pixelSize: Theme.fontSize
                    text: (root.entriesNotApplied === 1
                           ? qsTr("1 entry on the %1 screen is not applied: its text is not a number yet.")
                                 .arg(root.entryScreenName)
                           : qsTr("%1 entries are not applied (the first on the %2 screen): their text is not a number yet.")
                                 .arg(root.entriesNotApplied).arg(root.entryScreenName))
                          + " " + qsTr("These checks are of the values from before.")
                }
                TouchButton {
                    Layout.alignment: Qt.AlignVCenter
                    text: qsTr("Show ›")
                    Accessible.name: qsTr("Show the entry that is not applied")
                    onClicked: root.open(root.entryScreen, "")
                }
            }
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
