import QtQuick
import QtQuick.Controls
import QtQuick.Layouts

// A titled panel on the window colour: one group of inputs or results.
Pane {
    id: root

    property string title
    /// Shown at the right of the title (a status, a total).
    property string note
    property color noteColour: Theme.dimText
    default property alias content: body.data

    padding: Theme.margin
    background: Rectangle {
        color: Theme.card
        radius: Theme.radius
        border.color: Theme.line
    }

    ColumnLayout {
        id: column
        anchors.fill: parent
        spacing: Theme.gap

        RowLayout {
            Layout.fillWidth: true
            visible: root.title.length > 0 || root.note.length > 0
            Label {
                text: root.title
                font.pixelSize: Theme.largeFont
                font.bold: true
                Layout.fillWidth: true
                elide: Text.ElideRight
            }
            Label {
                text: root.note
                color: root.noteColour
                font.pixelSize: Theme.fontSize
            }
        }
        ColumnLayout {
            id: body
            Layout.fillWidth: true
            spacing: Theme.gap
        }
    }
}
