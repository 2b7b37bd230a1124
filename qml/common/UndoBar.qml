import QtQuick
import QtQuick.Controls
import QtQuick.Layouts

// What was just removed, with an Undo button: shown while `text` is not empty.
Rectangle {
    id: root

    /// "Sequence row 3 removed"; empty hides the bar.
    property string text

    signal undo()

    visible: root.text.length > 0
    implicitHeight: row.implicitHeight + Theme.gap
    radius: Theme.radius
    color: Qt.tint(Theme.card, Qt.rgba(Theme.info.r, Theme.info.g, Theme.info.b, 0.12))
    border.color: Theme.line

    RowLayout {
        id: row
        anchors.fill: parent
        anchors.margins: Math.round(Theme.gap / 2)
        anchors.leftMargin: Theme.gap
        Label {
            Layout.fillWidth: true
            text: root.text
            wrapMode: Text.Wrap
            font.pixelSize: Theme.fontSize
        }
        TouchButton {
            objectName: "undoButton"
            text: qsTr("Undo")
            Accessible.name: qsTr("Undo: %1").arg(root.text)
            onClicked: root.undo()
        }
    }
}
