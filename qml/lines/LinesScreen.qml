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

    // A Flow, not a grid layout: cards of different heights side by side, two per row in
    // landscape, one in portrait.
    Flow {
        width: root.contentWidth
        spacing: Theme.margin

        Repeater {
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
