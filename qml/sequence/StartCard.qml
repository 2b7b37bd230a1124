import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// When tonight's sequence starts: the first thing planned, so it heads the night's column (the
// top of the page in portrait), above the summary it moves. Never greyed: it is an input, and it
// stays usable while another entry is not applied.
Card {
    id: root

    required property Plan plan
    readonly property alias field: startField

    title: qsTr("Start")

    DateTimeField {
        id: startField
        objectName: "startField"
        Layout.fillWidth: true
        label: qsTr("Start of the sequence")
        text: root.plan.startText
        buttonFontSize: Theme.largeFont
        buttonHeight: Theme.tap * 1.25
        year: root.plan.startParts.year || 2026
        month: root.plan.startParts.month || 1
        day: root.plan.startParts.day || 1
        hour: root.plan.startParts.hour || 0
        minute: root.plan.startParts.minute || 0
        error: FieldPath.belongs(root.plan.errorField, "start") ? root.plan.errorMessage : ""
        note: root.plan.startNote
        onPicked: function(y, mo, d, h, mi) { root.plan.setStartAt(y, mo, d, h, mi) }
    }
}
