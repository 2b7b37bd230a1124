import QtQuick
import QtQuick.Controls

// A button no smaller than the touch target.
Button {
    implicitHeight: Math.max(Theme.tap, implicitContentHeight + topPadding + bottomPadding)
    implicitWidth: Math.max(Theme.tap, implicitContentWidth + leftPadding + rightPadding)
    leftPadding: Theme.margin
    rightPadding: Theme.margin
    font.pixelSize: Theme.fontSize
}
