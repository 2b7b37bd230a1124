import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// What was measured at the bench beside the amounts: the pH read on the meter (checked against
// the target ± the pH tolerance), the meter and the balance used, the vessel's volume (for the
// suggested correction) and a comment. Each value is stored with the batch when editing finishes.
Card {
    id: root

    required property BatchModel batch
    /// The model's message when it names `field`, else "".
    function errorFor(field) {
        return root.batch.errorField === field ? root.batch.errorMessage : ""
    }

    title: qsTr("Measured at the bench")
    note: isNaN(root.batch.measuredPh) ? qsTr("pH not measured yet") : ""

    GridLayout {
        Layout.fillWidth: true
        columns: Theme.columnsFor(width, 2)
        columnSpacing: Theme.margin
        rowSpacing: Theme.gap
        NumberField {
            objectName: "measuredPhField"
            Layout.fillWidth: true
            label: isNaN(root.batch.targetPh) ? qsTr("Measured pH")
                                              : qsTr("Measured pH (target %1)").arg(NumberText.format(root.batch.targetPh, 2))
            optional: true
            applyOnFinish: true
            stepButtons: false
            placeholder: qsTr("not measured")
            from: 0
            to: 14
            decimals: 2
            value: root.batch.measuredPh
            error: root.errorFor("batch.measured_ph")
            onEdited: function(v) { root.batch.measuredPh = v }
        }
        NumberField {
            objectName: "phToleranceField"
            Layout.fillWidth: true
            label: qsTr("pH tolerance")
            unit: "± pH"
            applyOnFinish: true
            stepButtons: false
            from: 0.01
            to: 2
            decimals: 2
            value: root.batch.phTolerance
            error: root.errorFor("batch.ph_tolerance")
            onEdited: function(v) { root.batch.phTolerance = v }
        }
        TextEntry {
            id: meterEntry
            objectName: "phMeterField"
            Layout.fillWidth: true
            label: qsTr("pH meter")
            placeholder: qsTr("meter id")
            value: root.batch.phMeterId
            error: root.errorFor("batch.ph_meter_id")
            Connections {
                target: meterEntry.field
                function onEditingFinished() { root.batch.phMeterId = meterEntry.field.text }
            }
        }
        TextEntry {
            id: balanceEntry
            objectName: "balanceField"
            Layout.fillWidth: true
            label: qsTr("Balance")
            placeholder: qsTr("balance id")
            value: root.batch.balanceId
            error: root.errorFor("batch.balance_id")
            Connections {
                target: balanceEntry.field
                function onEditingFinished() { root.batch.balanceId = balanceEntry.field.text }
            }
        }
        NumberField {
            objectName: "containerField"
            Layout.fillWidth: true
            label: qsTr("Container holds (for the correction)")
            unit: "mL"
            optional: true
            applyOnFinish: true
            stepButtons: false
            placeholder: qsTr("not given")
            from: 1
            to: 1e6
            decimals: 0
            value: root.batch.containerMl
            error: root.errorFor("batch.container_ml")
            onEdited: function(v) { root.batch.containerMl = v }
        }
        TextEntry {
            id: commentEntry
            objectName: "commentField"
            Layout.fillWidth: true
            label: qsTr("Comment")
            placeholder: qsTr("anything the record should say")
            value: root.batch.comment
            error: root.errorFor("batch.comment")
            Connections {
                target: commentEntry.field
                function onEditingFinished() { root.batch.comment = commentEntry.field.text }
            }
        }
    }
}
