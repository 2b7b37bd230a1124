import QtQuick
import QtQuick.Controls
import PhasePlan

// One wheel of the time picker (hours or minutes): turns by dragging, by tapping the number above
// or below, by the mouse wheel or touchpad (one stop per notch), and by the Up and Down keys once
// it has focus. The stops are every `stride` values (WheelSteps: the minutes stop at the quarter
// hours); dragging and tapping still reach every value.
Tumbler {
    id: wheel

    /// Values between the stops of a notch or a key (1: every value).
    property int stride: 1

    visibleItemCount: 3
    implicitWidth: Theme.tap * 1.5
    implicitHeight: Theme.tap * 3
    font.pixelSize: Theme.largeFont
    focusPolicy: Qt.StrongFocus
    wrap: true

    function turn(steps) {
        wheel.currentIndex = WheelSteps.turn(wheel.currentIndex, steps, wheel.count, wheel.stride)
    }

    delegate: Label {
        required property int index
        text: (index < 10 ? "0" : "") + index
        horizontalAlignment: Text.AlignHCenter
        verticalAlignment: Text.AlignVCenter
        font.pixelSize: Theme.largeFont
        font.bold: index === wheel.currentIndex && wheel.activeFocus
        opacity: 1.0 - Math.abs(Tumbler.displacement) / 2
        // A tap on a shown number picks it (a finger expects that as much as a swipe).
        TapHandler {
            onTapped: wheel.currentIndex = parent.index
        }
    }

    // Notches are 120 units; a touchpad sends smaller deltas, summed until one step is reached.
    property real pendingDelta: 0
    WheelHandler {
        acceptedDevices: PointerDevice.Mouse | PointerDevice.TouchPad
        onWheel: function(event) {
            // The wheel being turned takes the focus (a typed minute beside it then shows the
            // value the wheel stops at, not what was typed).
            wheel.forceActiveFocus()
            wheel.pendingDelta += event.angleDelta.y
            while (Math.abs(wheel.pendingDelta) >= 120) {
                wheel.turn(wheel.pendingDelta > 0 ? -1 : 1)
                wheel.pendingDelta += wheel.pendingDelta > 0 ? -120 : 120
            }
        }
    }
    Keys.onUpPressed: turn(-1)
    Keys.onDownPressed: turn(1)
}
