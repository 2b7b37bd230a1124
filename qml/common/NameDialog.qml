import QtQuick
import QtQuick.Controls
import QtQuick.Layouts

// Asks for a name (a new buffer, a renamed method). The caller checks the name in accepted() and
// calls showError() when it is refused; the dialog then stays open with the message beneath.
Popup {
    id: root

    property string title
    property string label: qsTr("Name")
    property string actionText: qsTr("Save")

    signal accepted(string name)

    function ask(initial) {
        input.text = initial || ""
        message.text = ""
        open()
        input.forceActiveFocus()
        input.selectAll()
    }
    function showError(text) {
        message.text = text
        input.forceActiveFocus()
    }

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
            text: root.label
            color: Theme.dimText
            font.pixelSize: Theme.smallFont
        }
        TextField {
            id: input
            objectName: "nameInput"
            Layout.fillWidth: true
            Layout.preferredHeight: Theme.tap
            font.pixelSize: Theme.fontSize
            selectByMouse: true
            maximumLength: 64
            Accessible.name: root.label
            onAccepted: root.accepted(text.trim())
        }
        Label {
            id: message
            Layout.fillWidth: true
            visible: text.length > 0
            color: Theme.bad
            wrapMode: Text.Wrap
            font.pixelSize: Theme.smallFont
        }
        RowLayout {
            Layout.alignment: Qt.AlignRight
            spacing: Theme.gap
            TouchButton {
                text: qsTr("Cancel")
                onClicked: root.close()
            }
            TouchButton {
                objectName: "nameAccept"
                text: root.actionText
                highlighted: true
                onClicked: root.accepted(input.text.trim())
            }
        }
    }
}
