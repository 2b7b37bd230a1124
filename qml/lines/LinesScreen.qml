import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// Mobile-phase lines A–D: what goes into each bottle and how much of each part to measure.
ScreenPage {
    id: root

    required property LinesModel lines
    required property Plan plan
    /// Opens the buffer designer on a line's aqueous buffer.
    signal editBuffer(string letter)

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
                onEditBuffer: function(letter) { root.editBuffer(letter) }
            }
        }
    }
}
