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
    /// The content shows an earlier state (an input is not applied, or the last valid plan while
    /// an input is wrong): greyed, with `staleText` in place of the note.
    property bool stale: false
    property string staleText: qsTr("not applied")
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

        // Title and note side by side; a note that does not fit goes beneath the title rather
        // than being clipped (portrait). Fixed widths: no layout loop with wrapped text.
        Flow {
            id: header
            Layout.fillWidth: true
            visible: root.title.length > 0 || root.note.length > 0 || root.stale
            spacing: Theme.gap
            Label {
                id: titleLabel
                width: Math.min(implicitWidth, header.width)
                text: root.title
                font.pixelSize: Theme.largeFont
                font.bold: true
                wrapMode: Text.Wrap
            }
            Item {
                // Pushes the note to the right edge when both fit on one line.
                width: Math.max(0, header.width - titleLabel.width - noteLabel.width - 2 * header.spacing)
                height: 1
                visible: titleLabel.width + noteLabel.width + 2 * header.spacing <= header.width
            }
            Label {
                id: noteLabel
                objectName: "cardNote"
                width: Math.min(implicitWidth, header.width)
                text: root.stale ? root.staleText : root.note
                visible: text.length > 0
                color: root.stale ? Theme.warn : root.noteColour
                font.pixelSize: Theme.fontSize
                font.bold: root.stale
                wrapMode: Text.Wrap
            }
        }
        ColumnLayout {
            id: body
            Layout.fillWidth: true
            spacing: Theme.gap
            opacity: root.stale ? 0.45 : 1
        }
    }
}
