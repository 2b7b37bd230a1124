import QtQuick
import QtQuick.Controls

// One entry of the navigation: a touch-sized, checkable button with an optional count badge.
Button {
    id: root

    /// A count shown in a red badge (warnings to fix); hidden at 0.
    property int badge: 0
    /// The screen shown.
    property bool current: false

    highlighted: current
    implicitHeight: Math.round(Theme.tap * 1.15)
    font.pixelSize: Theme.fontSize
    font.bold: current

    Rectangle {
        visible: root.badge > 0
        anchors.right: parent.right
        anchors.top: parent.top
        anchors.margins: 2
        width: Math.max(height, badgeText.implicitWidth + Theme.gap)
        height: Math.round(Theme.smallFont * 1.5)
        radius: height / 2
        color: Theme.bad
        Label {
            id: badgeText
            anchors.centerIn: parent
            text: root.badge
            color: Theme.card
            font.pixelSize: Theme.smallFont
            font.bold: true
        }
    }
}
