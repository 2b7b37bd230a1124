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
    /// The screen's DeviceCapture (null: no "Take from meter").
    property DeviceCapture instruments
    /// A pH typed over the meter's value, waiting for its reason; NaN when none.
    property real handPh: NaN
    readonly property bool phCaptured: root.batch.measuredPhCapture.device_id !== undefined
    /// The meter's fault for the pH field (it keeps its value), "" when none.
    readonly property string captureError: root.instruments && !root.instruments.busy
                                           && FieldPath.belongs(root.instruments.errorField, "batch.measured_ph")
                                           ? root.instruments.errorMessage : ""
    /// [{id, name}] for a picker: "PHM-01 — Bench pH meter …".
    function choicesOf(list) {
        var out = []
        for (var i = 0; i < list.length; ++i)
            out.push({ id: list[i].id, name: list[i].id + " — " + list[i].name })
        return out
    }
    function cautionOf(list, id) {
        for (var i = 0; i < list.length; ++i)
            if (list[i].id === id)
                return list[i].calibrationCaution
        return ""
    }
    /// The model's message when it names `field`, else "".
    function errorFor(field) {
        return FieldPath.belongs(root.batch.errorField, field) ? root.batch.errorMessage : ""
    }

    title: qsTr("Measured at the bench")
    note: isNaN(root.batch.measuredPh) ? qsTr("pH not measured yet") : ""

    GridLayout {
        Layout.fillWidth: true
        columns: Theme.columnsFor(width, 2)
        columnSpacing: Theme.margin
        rowSpacing: Theme.gap
        ColumnLayout {
            Layout.fillWidth: true
            Layout.alignment: Qt.AlignTop
            spacing: Math.round(Theme.gap / 2)
            NumberField {
                id: phField
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
                error: root.captureError.length > 0 ? root.captureError : root.errorFor("batch.measured_ph")
                onEdited: function(v) {
                    if (root.phCaptured && v !== root.batch.measuredPh)
                        root.handPh = v
                    root.batch.measuredPh = v
                }
            }
            Label {
                objectName: "phSourceMark"
                Layout.fillWidth: true
                visible: root.batch.measuredPhSource.length > 0
                text: root.phCaptured ? qsTr("from %1").arg(root.batch.measuredPhCapture.device_id)
                                        + (root.batch.measuredPhCapture.accepted_unstable ? qsTr(" (taken unsettled)") : "")
                                      : qsTr("typed")
                color: root.phCaptured ? Theme.info : Theme.dimText
                font.pixelSize: Theme.smallFont
                wrapMode: Text.Wrap
            }
            Label {
                objectName: "phCalibrationCaution"
                Layout.fillWidth: true
                visible: root.phCaptured && (root.batch.measuredPhCapture.calibration_caution || "").length > 0
                text: "⚠ " + (root.batch.measuredPhCapture.calibration_caution || "")
                color: Theme.warn
                font.pixelSize: Theme.smallFont
                wrapMode: Text.Wrap
            }
            TextEntry {
                id: phReason
                objectName: "phReasonField"
                Layout.fillWidth: true
                visible: root.phCaptured && !isNaN(root.handPh)
                label: qsTr("Why change the meter's pH by hand?")
                placeholder: qsTr("reason")
            }
            RowLayout {
                Layout.fillWidth: true
                visible: phReason.visible
                spacing: Theme.gap
                TouchButton {
                    objectName: "applyPhByHand"
                    text: qsTr("Change to pH %1").arg(NumberText.format(root.handPh, 2))
                    Accessible.name: qsTr("Change the measured pH by hand")
                    onClicked: {
                        if (root.batch.setMeasuredPhByHand(root.handPh, phReason.field.text)) {
                            root.handPh = NaN
                            phReason.field.text = ""
                        }
                    }
                }
                TouchButton {
                    objectName: "keepPh"
                    text: qsTr("Keep")
                    Accessible.name: qsTr("Keep the meter's pH")
                    onClicked: {
                        root.handPh = NaN
                        phField.value = NaN
                        phField.value = Qt.binding(function() { return root.batch.measuredPh })
                    }
                }
            }
            ChoiceField {
                objectName: "meterPicker"
                Layout.fillWidth: true
                visible: !!root.instruments && root.instruments.meters.length > 1
                label: qsTr("pH meter to read")
                choices: root.instruments ? root.choicesOf(root.instruments.meters) : []
                current: root.instruments ? root.instruments.meterId : ""
                onPicked: function(id) { root.instruments.meterId = id }
            }
            Label {
                objectName: "meterCaution"
                Layout.fillWidth: true
                visible: text.length > 0 && !root.phCaptured
                text: root.instruments ? root.cautionOf(root.instruments.meters, root.instruments.meterId) : ""
                color: Theme.warn
                font.pixelSize: Theme.smallFont
                wrapMode: Text.Wrap
            }
            TakeFromInstrument {
                Layout.fillWidth: true
                visible: !!root.instruments && root.instruments.meters.length > 0
                instruments: root.instruments
                target: "batch.measured_ph"
                balance: false
                subject: qsTr("the measured pH")
            }
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
