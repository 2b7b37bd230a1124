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

    // The model is the count: changed sentences update in place, rows are built only when the
    // number of sentences changes.
    Repeater {
        model: root.items.length
        delegate: Label {
            required property int index
            width: root.width
            text: "•  " + (root.items[index] || "")
            wrapMode: Text.Wrap
            color: root.textColour
            font.pixelSize: root.pixelSize
        }
    }
}
