import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// The lab's balances and pH meters: listed, added, edited and removed. Each is read over a serial
// port (RS-232 or USB serial) by the line format it sends; Prepare & record takes weights and
// the measured pH from them. The core checks every field (DeviceCapture.saveDevice) and names
// the one at fault.
Card {
    id: root

    required property Workspace workspace

    title: qsTr("Balances and pH meters")
    note: qsTr("%n instrument(s)", "", capture.balances.length + capture.meters.length)

    DeviceCapture {
        id: capture
        workspace: root.workspace
    }

    /// The record being edited (a copy); its id is "" for a new instrument.
    property var draft: ({})
    property string status
    /// The core's message for `field`, led by the field's label as the form shows it.
    function errorFor(field, label) {
        return FieldPath.belongs(capture.errorField, field) ? label + ": " + capture.errorMessage : ""
    }
    function edit(device) {
        root.status = ""
        root.draft = device ? Object.assign({}, device)
                            : { id: "", name: "", kind: "balance", port: "/dev/ttyUSB0", baud: 9600,
                                data_bits: 8, parity: "none", stop_bits: "1", flow_control: "none",
                                format: "flag-number-unit", unit: "g", calibration_due: "" }
        idEntry.field.text = root.draft.id
        nameEntry.field.text = root.draft.name
        portEntry.field.text = root.draft.port
        dueEntry.field.text = root.draft.calibration_due || ""
        form.visible = true
    }
    /// After a refused save: the instrument as stored now (the form closes when it was removed).
    function reloadDraft() {
        capture.clearError()
        capture.reloadDevices()
        var all = capture.balances.concat(capture.meters)
        for (var i = 0; i < all.length; ++i)
            if (all[i].id === root.draft.id) {
                root.edit(all[i])
                return
            }
        form.visible = false
        root.status = qsTr("%1 was removed on another bench.").arg(root.draft.id)
    }
    function set(key, value) {
        var d = Object.assign({}, root.draft)
        d[key] = value
        if (key === "kind") {
            d.unit = value === "ph_meter" ? "pH" : "g"
            d.format = value === "ph_meter" ? "ph-temperature" : "flag-number-unit"
        }
        root.draft = d
    }

    Repeater {
        model: capture.balances.concat(capture.meters)
        delegate: RowLayout {
            required property var modelData
            Layout.fillWidth: true
            spacing: Theme.gap
            Label {
                Layout.fillWidth: true
                wrapMode: Text.Wrap
                font.pixelSize: Theme.fontSize
                text: modelData.id + " · " + modelData.name + "\n" + modelData.port + ", " + modelData.baud + " baud, "
                      + modelData.format + (modelData.calibration_due ? qsTr(", calibration due %1").arg(modelData.calibration_due) : "")
            }
            TouchButton {
                text: qsTr("Edit")
                Accessible.name: qsTr("Edit instrument %1").arg(modelData.id)
                onClicked: root.edit(modelData)
            }
            TouchButton {
                text: "✕"
                focusPolicy: Qt.NoFocus
                Accessible.name: qsTr("Remove instrument %1").arg(modelData.id)
                onClicked: { removeDialog.deviceVersion = modelData.version || -1; removeDialog.ask(modelData.id) }
            }
        }
    }
    ConfirmDialog {
        id: removeDialog
        property string deviceId
        function ask(id) { deviceId = id; open() }
        title: qsTr("Remove the instrument %1?").arg(deviceId)
        text: qsTr("Values already taken from it stay in their batch records.")
        property int deviceVersion: -1
        onConfirmed: {
            if (!capture.removeDevice(deviceId, deviceVersion))
                root.status = capture.errorMessage
        }
    }
    TouchButton {
        objectName: "addInstrument"
        text: qsTr("+ Instrument")
        Accessible.name: qsTr("Add a balance or pH meter")
        onClicked: root.edit(null)
    }

    ColumnLayout {
        id: form
        objectName: "instrumentForm"
        visible: false
        Layout.fillWidth: true
        spacing: Theme.gap
        SegmentedChoice {
            Layout.fillWidth: true
            label: qsTr("Kind")
            options: [{ id: "balance", name: qsTr("Balance") }, { id: "ph_meter", name: qsTr("pH meter") }]
            current: root.draft.kind || "balance"
            onPicked: function(id) { root.set("kind", id) }
        }
        TextEntry {
            id: idEntry
            Layout.fillWidth: true
            label: qsTr("Instrument id (as on its label)")
            placeholder: "BAL-01"
            // An instrument keeps its id (the key other benches and the batches know it by).
            enabled: !(root.draft.version > 0)
            error: root.errorFor("id", qsTr("Instrument id"))
            onEdited: function(text) { root.set("id", text) }
        }
        TextEntry {
            id: nameEntry
            Layout.fillWidth: true
            label: qsTr("Name")
            placeholder: qsTr("e.g. analytical balance, 0.1 mg, bench 1")
            error: root.errorFor("name", qsTr("Name"))
            onEdited: function(text) { root.set("name", text) }
        }
        TextEntry {
            id: portEntry
            Layout.fillWidth: true
            label: qsTr("Serial port")
            placeholder: "/dev/ttyUSB0"
            error: root.errorFor("port", qsTr("Serial port"))
            onEdited: function(text) { root.set("port", text) }
        }
        NumberField {
            Layout.fillWidth: true
            label: qsTr("Baud rate")
            integer: true
            stepButtons: false
            value: root.draft.baud || 9600
            from: 1
            error: root.errorFor("baud", qsTr("Baud rate"))
            onEdited: function(v) { root.set("baud", Math.round(v)) }
        }
        SegmentedChoice {
            Layout.fillWidth: true
            label: qsTr("Data bits, parity, stop bits")
            options: [{ id: "8N1", name: "8N1" }, { id: "7E1", name: "7E1" }, { id: "7O1", name: "7O1" }, { id: "8N2", name: "8N2" }]
            current: (root.draft.data_bits || 8) + ({ none: "N", even: "E", odd: "O" }[root.draft.parity || "none"] || "N")
                     + (root.draft.stop_bits || "1")
            onPicked: function(id) {
                root.set("data_bits", parseInt(id.charAt(0)))
                root.set("parity", { N: "none", E: "even", O: "odd" }[id.charAt(1)])
                root.set("stop_bits", id.charAt(2))
            }
        }
        ChoiceField {
            Layout.fillWidth: true
            label: qsTr("What it sends (line format)")
            choices: [{ id: "number-unit", name: qsTr("the number and its unit (“3.1610 g”)") },
                      { id: "flag-number-unit", name: qsTr("a settled mark, then number and unit (“S S 3.1610 g”)") },
                      { id: "id-flag-number-unit", name: qsTr("its id, a settled mark, number and unit") },
                      { id: "ph-temperature", name: qsTr("pH and temperature (“7.012 pH 25.1 °C”)") }]
            current: root.draft.format || ""
            error: root.errorFor("format", qsTr("Line format"))
            onPicked: function(id) { root.set("format", id) }
        }
        TextEntry {
            id: dueEntry
            Layout.fillWidth: true
            label: qsTr("Calibration due (YYYY-MM-DD)")
            placeholder: "2027-06-30"
            error: root.errorFor("calibration_due", qsTr("Calibration due"))
            onEdited: function(text) { root.set("calibration_due", text) }
        }
        // Saved on another bench since it was listed here: who and when, and Reload.
        ConflictBar {
            objectName: "instrumentConflict"
            Layout.fillWidth: true
            copyOffered: false
            message: FieldPath.belongs(capture.errorField, "version") ? capture.errorMessage : ""
            onReload: root.reloadDraft()
        }
        RowLayout {
            spacing: Theme.gap
            TouchButton {
                text: qsTr("Cancel")
                onClicked: form.visible = false
            }
            TouchButton {
                objectName: "saveInstrument"
                text: qsTr("Save instrument")
                highlighted: true
                onClicked: {
                    if (capture.saveDevice(root.draft)) {
                        root.status = qsTr("Saved %1.").arg(root.draft.id)
                        form.visible = false
                    } else if (capture.errorField.length === 0) {
                        root.status = capture.errorMessage
                    }
                }
            }
        }
    }
    Label {
        Layout.fillWidth: true
        visible: root.status.length > 0
        text: root.status
        wrapMode: Text.Wrap
        font.pixelSize: Theme.smallFont
    }
}
