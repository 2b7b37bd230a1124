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
    // Centred, or above the on-screen keyboard while it is up.
    x: parent ? Math.round((parent.width - width) / 2) : 0
    y: parent ? Math.round(ApplicationWindow.window && ApplicationWindow.window.keyboardHeight > 0
                           ? Math.max(Theme.margin, Math.min((parent.height - height) / 2,
                                                             parent.height - ApplicationWindow.window.keyboardHeight - height - Theme.margin))
                           : (parent.height - height) / 2) : 0
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
