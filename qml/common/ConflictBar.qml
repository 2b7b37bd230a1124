import QtQuick
import QtQuick.Controls
import QtQuick.Layouts

// Two benches, one record: a save refused because the record changed on another bench since it
// was opened here (`message`, with Reload and Save as a copy), or a note that it changed there
// (`notice`). Hidden while both are empty.
Rectangle {
    id: root

    /// The refusal: "Batch …: changed by <name> at <time> UTC after you opened it; …".
    property string message
    /// "Changed on another bench by <name> at <time> …".
    property string notice
    /// False where a copy makes no sense (an instrument, a lot, an account): Reload alone.
    property bool copyOffered: true

    /// Discard the edits made here and show the record as stored.
    signal reload()
    /// Keep the edits made here under a new name or id.
    signal saveCopy()

    visible: root.message.length > 0 || root.notice.length > 0
    implicitHeight: column.implicitHeight + Theme.gap * 2
    radius: Theme.radius
    color: Qt.tint(Theme.card, Qt.rgba(root.message.length > 0 ? Theme.bad.r : Theme.info.r,
                                       root.message.length > 0 ? Theme.bad.g : Theme.info.g,
                                       root.message.length > 0 ? Theme.bad.b : Theme.info.b, 0.12))
    border.color: root.message.length > 0 ? Theme.bad : Theme.line

    ColumnLayout {
        id: column
        anchors.fill: parent
        anchors.margins: Theme.gap
        spacing: Theme.gap
        Label {
            objectName: "conflictMessage"
            Layout.fillWidth: true
            visible: root.message.length > 0
            text: root.message
            color: Theme.bad
            wrapMode: Text.Wrap
            font.pixelSize: Theme.fontSize
        }
        Label {
            objectName: "remoteNotice"
            Layout.fillWidth: true
            visible: root.notice.length > 0
            text: root.notice
            wrapMode: Text.Wrap
            font.pixelSize: Theme.smallFont
        }
        Flow {
            Layout.fillWidth: true
            visible: root.message.length > 0
            spacing: Theme.gap
            TouchButton {
                objectName: "conflictReload"
                text: qsTr("Reload")
                Accessible.name: qsTr("Reload: drop my changes and show the saved version")
                onClicked: root.reload()
            }
            TouchButton {
                objectName: "conflictSaveCopy"
                visible: root.copyOffered
                text: qsTr("Save as a copy")
                Accessible.name: qsTr("Save my changes as a copy")
                onClicked: root.saveCopy()
            }
        }
    }
}
