import QtQuick
import QtQuick.Controls

// One main screen: a vertically scrolling page with margins; screens put their layout inside and
// size it to contentWidth.
Item {
    id: root

    property string title
    /// Taller than wide (800 × 1280): screens stack their columns.
    property bool inPortrait: height > width
    readonly property real contentWidth: Math.max(0, width - 2 * Theme.margin)
    default property alias content: holder.data
    /// For tests and the screenshot seam: the flickable of the page.
    readonly property alias flickable: flick

    Flickable {
        id: flick
        anchors.fill: parent
        clip: true
        contentWidth: width
        contentHeight: holder.childrenRect.height + 2 * Theme.margin
        boundsBehavior: Flickable.StopAtBounds
        ScrollIndicator.vertical: ScrollIndicator { }

        Item {
            id: holder
            x: Theme.margin
            y: Theme.margin
            width: root.contentWidth
            height: childrenRect.height
        }
    }
}
