import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// "Take from balance" / "Take from meter" beside a field: starts a DeviceCapture wait for the next
// stable reading of the chosen instrument, shows that it waits (and an unsettled reading, which
// may be accepted), and lets the wait be cancelled. The value itself goes to the batch through
// DeviceCapture.captured (BatchScreen); a fault comes back as the capture's errorField/errorMessage
// and is shown by the field this sits beside.
ColumnLayout {
    id: root

    /// The screen's DeviceCapture.
    property DeviceCapture instruments
    /// The field the reading is for ("batch.actual[2].mass_g", "batch.measured_ph").
    property string target
    /// true: the balance (instruments.balanceId), false: the pH meter (instruments.meterId).
    property bool balance: true
    /// What is taken, for the screen reader ("the amount of Sodium dihydrogen phosphate").
    property string subject

    readonly property string deviceId: !root.instruments ? ""
                                       : (root.balance ? root.instruments.balanceId : root.instruments.meterId)
    readonly property bool waiting: !!root.instruments && root.instruments.busy && root.instruments.target === root.target
    readonly property bool available: !!root.instruments && root.deviceId.length > 0

    spacing: Math.round(Theme.gap / 2)

    TouchButton {
        objectName: root.balance ? "takeFromBalance" : "takeFromMeter"
        Layout.fillWidth: true
        visible: !root.waiting
        enabled: root.available && !root.instruments.busy
        text: root.balance ? qsTr("Take from balance") : qsTr("Take from meter")
        Accessible.name: root.balance ? qsTr("Take %1 from balance %2").arg(root.subject).arg(root.deviceId)
                                      : qsTr("Take %1 from pH meter %2").arg(root.subject).arg(root.deviceId)
        onClicked: root.balance ? root.instruments.takeFromBalance(root.target)
                                : root.instruments.takeFromMeter(root.target)
    }
    Label {
        objectName: "waitingNote"
        Layout.fillWidth: true
        visible: root.waiting
        wrapMode: Text.Wrap
        font.pixelSize: Theme.smallFont
        color: Theme.dimText
        text: root.instruments && root.instruments.unstable.value !== undefined
              ? qsTr("%1: %2 %3, not settled yet").arg(root.deviceId)
                    .arg(NumberText.format(root.instruments.unstable.value, 4)).arg(root.instruments.unstable.unit)
              : qsTr("Waiting for a stable reading from %1…").arg(root.deviceId)
    }
    RowLayout {
        Layout.fillWidth: true
        visible: root.waiting
        spacing: Theme.gap
        TouchButton {
            objectName: "acceptUnsettled"
            visible: !!root.instruments && root.instruments.unstable.value !== undefined
            text: qsTr("Take it unsettled")
            Accessible.name: qsTr("Take the unsettled reading for %1").arg(root.subject)
            onClicked: root.instruments.acceptUnstable()
        }
        TouchButton {
            objectName: "cancelTake"
            text: qsTr("Cancel")
            Accessible.name: qsTr("Stop waiting for %1").arg(root.deviceId)
            onClicked: root.instruments.cancel()
        }
    }
}
