import QtQuick
import QtQuick.Controls

// Short sentences as a bulleted list (steps' notes, safety notes). A Column, not a layout:
// wrapped text settles in one pass.
Column {
    id: root

    /// The sentences.
    property var items: []
    property color textColour: Theme.text
    property int pixelSize: Theme.fontSize

    spacing: Math.round(Theme.gap / 2)

    Repeater {
        model: root.items
        delegate: Label {
            required property string modelData
            width: root.width
            text: "•  " + modelData
            wrapMode: Text.Wrap
            color: root.textColour
            font.pixelSize: root.pixelSize
        }
    }
}
