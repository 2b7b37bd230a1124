import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// Mobile-phase lines A–D: what goes into each bottle and how much of each part to measure.
ScreenPage {
    id: root

    required property LinesModel lines
    required property Plan plan
    /// For the saved buffers a line can hold.
    property BufferDesigner designer
    /// Opens the buffer designer on a saved buffer.
    signal editBuffer(string name)

    title: qsTr("Mobile-phase lines")

    /// Focuses the field a check or an error names ("lines.B.bottle_ml", "lines.A.parts[0]"),
    /// scrolled into view (ScreenPage follows the focus).
    function focusField(path) {
        var segments = FieldPath.segments(path)
        if (segments.length < 2 || segments[0] !== "lines")
            return
        for (var i = 0; i < cardRepeater.count; ++i) {
            var card = cardRepeater.itemAt(i)
            if (card && card.letter === segments[1]) {
                card.focusField(segments.slice(2))
                return
            }
        }
    }

    // A Flow, not a grid layout: cards of different heights side by side, two per row in
    // landscape, one in portrait.
    Flow {
        width: root.contentWidth
        spacing: Theme.margin

        Repeater {
            id: cardRepeater
            model: root.lines
            delegate: LineCard {
                width: root.inPortrait ? root.contentWidth : (root.contentWidth - Theme.margin) / 2
                linesModel: root.lines
                plan: root.plan
                bufferChoices: root.designer ? root.designer.bufferChoices : []
                onEditBuffer: function(name) { root.editBuffer(name) }
            }
        }
    }
}
