import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// After the last injection: the pump may keep a low flow running until the morning (a time of
// day, so it moves with the start) or for a set time. It draws on the bottles like an injection.
Card {
    id: root

    required property Plan plan

    function errorFor(field) {
        return FieldPath.belongs(root.plan.errorField, field) ? root.plan.errorMessage : ""
    }

    /// Focuses the field a check or an error names ("standby.flow_ml_min", "standby.until");
    /// otherwise the switch.
    function focusField(path) {
        var target = onSwitch
        if (root.plan.standbyEnabled) {
            if (FieldPath.belongs(path, "standby.flow_ml_min")) target = standbyFlow.field
            else if (FieldPath.belongs(path, "standby.until") && standbyUntil.visible) target = standbyUntil.button
            else if (FieldPath.belongs(path, "standby.duration_min") && standbyDuration.visible) target = standbyDuration.field
        }
        target.forceActiveFocus()
    }

    title: qsTr("After the last injection")
    note: root.plan.standbyText

    Switch {
        id: onSwitch
        objectName: "standbySwitch"
        Layout.fillWidth: true
        text: qsTr("Keep a standby flow running")
        implicitHeight: Theme.tap
        font.pixelSize: Theme.fontSize
        checked: root.plan.standbyEnabled
        Accessible.name: text
        onToggled: root.plan.standbyEnabled = checked
    }
    Label {
        Layout.fillWidth: true
        visible: !root.plan.standbyEnabled
        text: qsTr("The pump stops after the last injection.")
        color: Theme.dimText
        wrapMode: Text.Wrap
        font.pixelSize: Theme.smallFont
    }
    ColumnLayout {
        Layout.fillWidth: true
        visible: root.plan.standbyEnabled
        spacing: Theme.gap
        NumberField {
            id: standbyFlow
            objectName: "standbyFlowField"
            Layout.fillWidth: true
            label: qsTr("Standby flow")
            unit: "mL/min"
            value: root.plan.standbyFlowMlMin
            step: 0.05
            decimals: 2
            from: 0
            error: root.errorFor("standby.flow_ml_min")
            onEdited: function(v) { root.plan.standbyFlowMlMin = v }
        }
        SegmentedChoice {
            Layout.fillWidth: true
            label: qsTr("Runs")
            options: [{ id: "until", name: qsTr("Until a time of day") }, { id: "duration", name: qsTr("For a set time") }]
            current: root.plan.standbyMode
            onPicked: function(id) { root.plan.standbyMode = id }
        }
        DateTimeField {
            id: standbyUntil
            objectName: "standbyUntilField"
            Layout.fillWidth: true
            visible: root.plan.standbyMode === "until"
            withDate: false
            label: qsTr("Until (the first such time after the last injection)")
            text: (root.plan.standbyUntilHour < 10 ? "0" : "") + root.plan.standbyUntilHour + ":"
                  + (root.plan.standbyUntilMinute < 10 ? "0" : "") + root.plan.standbyUntilMinute
            hour: root.plan.standbyUntilHour
            minute: root.plan.standbyUntilMinute
            error: root.errorFor("standby.until")
            onPicked: function(y, mo, d, h, mi) { root.plan.setStandbyUntil(h, mi) }
        }
        NumberField {
            id: standbyDuration
            objectName: "standbyDurationField"
            Layout.fillWidth: true
            visible: root.plan.standbyMode === "duration"
            label: qsTr("Standby time")
            unit: "min"
            value: root.plan.standbyDurationMin
            step: 30
            decimals: 0
            from: 0
            error: root.errorFor("standby.duration_min")
            onEdited: function(v) { root.plan.standbyDurationMin = v }
        }
        Label {
            text: qsTr("Composition")
            color: Theme.dimText
            font.pixelSize: Theme.smallFont
        }
        // A Flow, not a layout, around the Repeater (DEVELOPERS.md: Qt 6.4 views).
        Flow {
            id: compositionFlow
            Layout.fillWidth: true
            spacing: Theme.gap
            Repeater {
                model: root.plan.lineLetters
                delegate: NumberField {
                    required property string modelData
                    width: (compositionFlow.width - Theme.gap) / Theme.columnsFor(compositionFlow.width, 2)
                           - (Theme.columnsFor(compositionFlow.width, 2) > 1 ? 0 : Theme.gap)
                    label: qsTr("Standby, line %1").arg(modelData)
                    unit: "%"
                    value: root.plan.standbyEnabled ? root.plan.standbyPercent(modelData) : 0
                    step: 5
                    decimals: 0
                    from: 0
                    to: 100
                    error: root.errorFor("standby." + modelData)
                    onEdited: function(v) { root.plan.setStandbyPercent(modelData, v) }
                    Connections {
                        target: root.plan
                        function onStandbyChanged() { value = root.plan.standbyPercent(modelData) }
                    }
                }
            }
        }
    }
}
