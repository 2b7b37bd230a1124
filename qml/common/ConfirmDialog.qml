import QtQuick
import QtQuick.Controls
import QtQuick.Layouts

// Asks before something that cannot be taken back (deleting a saved buffer or a method).
Popup {
    id: root

    property string title
    property string text
    property string actionText: qsTr("Delete")

    signal confirmed()

    parent: Overlay.overlay
    anchors.centerIn: parent
    modal: true
    focus: true
    padding: Theme.margin
    width: Math.min(parent ? parent.width - 2 * Theme.margin : 600, Theme.tap * 12)
    background: Rectangle { color: Theme.card; radius: Theme.radius; border.color: Theme.line }

    ColumnLayout {
        anchors.fill: parent
        spacing: Theme.gap
        Label {
            Layout.fillWidth: true
            text: root.title
            font.pixelSize: Theme.largeFont
            font.bold: true
            wrapMode: Text.Wrap
        }
        Label {
            Layout.fillWidth: true
            text: root.text
            wrapMode: Text.Wrap
            font.pixelSize: Theme.fontSize
        }
        RowLayout {
            Layout.alignment: Qt.AlignRight
            spacing: Theme.gap
            TouchButton {
                objectName: "confirmCancel"
                text: qsTr("Keep it")
                onClicked: root.close()
            }
            TouchButton {
                objectName: "confirmAction"
                text: root.actionText
                palette.buttonText: Theme.bad
                onClicked: {
                    root.close()
                    root.confirmed()
                }
            }
        }
    }
}
