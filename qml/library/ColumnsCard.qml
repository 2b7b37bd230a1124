import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// The lab's HPLC columns: listed, added, edited and removed. A method takes a copy of one on the
// sequence screen, for its pressure and for moving it to a smaller column. The core checks every
// field (ColumnLibrary.check, the same code as the command-line tool) and each bad one gets its
// message beside it.
Card {
    id: root

    required property Workspace workspace

    title: qsTr("Columns")
    note: qsTr("%n column(s)", "", library.columns.length)

    ColumnLibrary {
        id: library
        workspace: root.workspace
    }

    /// The column being edited (a copy); id 0 for a new one. NaN: not given.
    property var draft: root.blank()
    function blank() {
        return { id: 0, name: "", length_mm: 150, id_mm: 4.6, particle_um: 5, porosity: NaN,
                 max_pressure_bar: NaN, ph_min: NaN, ph_max: NaN, temperature_c: NaN,
                 reference_pressure_bar: NaN, reference_flow_ml_min: NaN,
                 reference_percent_b: NaN, reference_temperature_c: NaN }
    }
    property string status
    /// Fields typed in since the form opened; their messages show at once, the others after Save.
    property var touched: ({})
    property bool tried: false
    /// The checks of the draft, and what the last save was refused for (a taken name).
    readonly property var problems: form.visible ? Object.assign({}, library.errors, library.check(root.draft)) : ({})
    /// The message for `field`, led by the label the form shows.
    function errorFor(field, label) {
        var m = root.problems[field]
        if (!m || !(root.tried || root.touched[field]))
            return ""
        return label + ": " + m
    }
    function edit(column) {
        root.status = ""
        root.tried = false
        root.touched = {}
        library.clearErrors()
        var blank = root.blank()
        root.draft = column ? Object.assign(blank, column) : blank
        nameEntry.field.text = root.draft.name
        form.visible = true
        nameEntry.field.forceActiveFocus()
    }
    /// After a refused save: the column as stored now (the form closes when it was removed).
    function reloadDraft() {
        library.clearErrors()
        library.reload()
        for (var i = 0; i < library.columns.length; ++i)
            if (library.columns[i].id === root.draft.id) {
                root.edit(library.columns[i])
                return
            }
        form.visible = false
        root.status = qsTr("%1 was removed on another bench.").arg(root.draft.name)
    }
    function set(key, value) {
        if (key === "name" && library.errors["name"] !== undefined)
            library.clearErrors() // the taken name is being changed
        var d = Object.assign({}, root.draft)
        d[key] = value
        root.draft = d
        root.status = ""
        var t = Object.assign({}, root.touched)
        t[key] = true
        if (key.indexOf("reference_") === 0) {
            t["reference"] = true
            t["reference." + key.substring(10).replace("percent_b", "B")] = true
        }
        root.touched = t
    }

    Label {
        Layout.fillWidth: true
        visible: library.skippedText.length > 0
        text: library.skippedText
        color: Theme.warn
        wrapMode: Text.Wrap
        font.pixelSize: Theme.smallFont
    }
    Repeater {
        model: library.columns
        delegate: RowLayout {
            required property var modelData
            Layout.fillWidth: true
            spacing: Theme.gap
            Label {
                Layout.fillWidth: true
                wrapMode: Text.Wrap
                font.pixelSize: Theme.fontSize
                text: modelData.name + "\n" + modelData.summary
            }
            TouchButton {
                text: qsTr("Edit")
                Accessible.name: qsTr("Edit column %1").arg(modelData.name)
                onClicked: root.edit(modelData)
            }
            TouchButton {
                text: "✕"
                focusPolicy: Qt.NoFocus
                Accessible.name: qsTr("Remove column %1").arg(modelData.name)
                onClicked: removeDialog.ask(modelData.id, modelData.name, modelData.version)
            }
        }
    }
    ConfirmDialog {
        id: removeDialog
        property var columnId: 0
        property string columnName
        property int columnVersion: -1
        function ask(id, name, version) { columnId = id; columnName = name; columnVersion = version || -1; open() }
        title: qsTr("Remove the column %1?").arg(columnName)
        text: qsTr("Methods that run on it keep their own copy of its sizes and limits.")
        onConfirmed: {
            if (!library.remove(columnId, columnVersion))
                root.status = library.errors["version"] || library.generalError
        }
    }
    TouchButton {
        objectName: "addColumn"
        text: qsTr("+ Column")
        Accessible.name: qsTr("Add a column")
        onClicked: root.edit(null)
    }

    ColumnLayout {
        id: form
        objectName: "columnForm"
        visible: false
        Layout.fillWidth: true
        spacing: Theme.gap

        TextEntry {
            id: nameEntry
            objectName: "columnName"
            Layout.fillWidth: true
            label: qsTr("Name (as on the column's label or the lab's log)")
            placeholder: qsTr("e.g. C18 150×4.6 mm 3 µm, bench 2")
            error: root.errorFor("name", qsTr("Name"))
            onEdited: function(text) { root.set("name", text) }
        }
        GridLayout {
            Layout.fillWidth: true
            columns: form.width > Theme.tap * 9 ? 2 : 1
            columnSpacing: Theme.gap
            rowSpacing: Theme.gap
            NumberField {
                objectName: "columnLength"
                Layout.fillWidth: true
                label: qsTr("Length")
                unit: "mm"
                decimals: 0
                step: 50
                value: root.draft.length_mm
                error: root.errorFor("length_mm", qsTr("Length"))
                onEdited: function(v) { root.set("length_mm", v) }
            }
            NumberField {
                objectName: "columnId"
                Layout.fillWidth: true
                label: qsTr("Inner diameter")
                unit: "mm"
                decimals: 1
                step: 0.1
                value: root.draft.id_mm
                error: root.errorFor("id_mm", qsTr("Inner diameter"))
                onEdited: function(v) { root.set("id_mm", v) }
            }
            NumberField {
                objectName: "columnParticle"
                Layout.fillWidth: true
                label: qsTr("Particle size")
                unit: "µm"
                decimals: 1
                step: 0.1
                value: root.draft.particle_um
                error: root.errorFor("particle_um", qsTr("Particle size"))
                onEdited: function(v) { root.set("particle_um", v) }
            }
            NumberField {
                objectName: "columnMaxPressure"
                Layout.fillWidth: true
                label: qsTr("Pressure limit (optional)")
                unit: "bar"
                decimals: 0
                step: 50
                optional: true
                placeholder: qsTr("none")
                value: root.draft.max_pressure_bar
                error: root.errorFor("max_pressure_bar", qsTr("Pressure limit"))
                onEdited: function(v) { root.set("max_pressure_bar", v) }
            }
            NumberField {
                objectName: "columnPhMin"
                Layout.fillWidth: true
                label: qsTr("Lowest pH (optional)")
                decimals: 1
                step: 0.5
                optional: true
                placeholder: qsTr("none")
                value: root.draft.ph_min
                error: root.errorFor("ph_min", qsTr("Lowest pH"))
                onEdited: function(v) { root.set("ph_min", v) }
            }
            NumberField {
                objectName: "columnPhMax"
                Layout.fillWidth: true
                label: qsTr("Highest pH (optional)")
                decimals: 1
                step: 0.5
                optional: true
                placeholder: qsTr("none")
                value: root.draft.ph_max
                error: root.errorFor("ph_max", qsTr("Highest pH"))
                onEdited: function(v) { root.set("ph_max", v) }
            }
            NumberField {
                objectName: "columnPorosity"
                Layout.fillWidth: true
                label: qsTr("Porosity between particles (optional, 0.4 if empty)")
                decimals: 2
                step: 0.05
                optional: true
                placeholder: qsTr("0.4")
                value: root.draft.porosity
                error: root.errorFor("porosity", qsTr("Porosity"))
                onEdited: function(v) { root.set("porosity", v) }
            }
            NumberField {
                objectName: "columnTemperature"
                Layout.fillWidth: true
                label: qsTr("Oven temperature (optional, 25 °C if empty)")
                unit: "°C"
                decimals: 0
                optional: true
                placeholder: qsTr("25")
                value: root.draft.temperature_c
                error: root.errorFor("temperature_c", qsTr("Oven temperature"))
                onEdited: function(v) { root.set("temperature_c", v) }
            }
        }
        Label {
            Layout.fillWidth: true
            text: qsTr("Pressure measured on this column (optional): it makes the pressure estimates match your column.")
            wrapMode: Text.Wrap
            font.pixelSize: Theme.smallFont
            color: Theme.dimText
        }
        GridLayout {
            Layout.fillWidth: true
            columns: form.width > Theme.tap * 9 ? 2 : 1
            columnSpacing: Theme.gap
            rowSpacing: Theme.gap
            NumberField {
                objectName: "columnRefPressure"
                Layout.fillWidth: true
                label: qsTr("Measured pressure")
                unit: "bar"
                decimals: 0
                step: 10
                optional: true
                placeholder: qsTr("none")
                value: root.draft.reference_pressure_bar
                error: root.errorFor("reference.pressure_bar", qsTr("Measured pressure"))
                onEdited: function(v) { root.set("reference_pressure_bar", v) }
            }
            NumberField {
                objectName: "columnRefFlow"
                Layout.fillWidth: true
                label: qsTr("measured at a flow of")
                unit: "mL/min"
                decimals: 2
                step: 0.1
                optional: true
                placeholder: qsTr("none")
                value: root.draft.reference_flow_ml_min
                error: root.errorFor("reference.flow_ml_min", qsTr("Flow of the measured pressure"))
                onEdited: function(v) { root.set("reference_flow_ml_min", v) }
            }
            NumberField {
                objectName: "columnRefPercentB"
                Layout.fillWidth: true
                label: qsTr("measured at this % of line B (the rest line A)")
                unit: "%"
                decimals: 0
                step: 5
                optional: true
                placeholder: qsTr("0")
                value: root.draft.reference_percent_b
                error: root.errorFor("reference", qsTr("Composition of the measured pressure"))
                       || root.errorFor("reference.B", qsTr("Line B of the measured pressure"))
                onEdited: function(v) { root.set("reference_percent_b", v) }
            }
            NumberField {
                objectName: "columnRefTemperature"
                Layout.fillWidth: true
                label: qsTr("measured at an oven temperature of (optional)")
                unit: "°C"
                decimals: 0
                optional: true
                placeholder: qsTr("as above")
                value: root.draft.reference_temperature_c
                error: root.errorFor("reference.temperature_c", qsTr("Temperature of the measured pressure"))
                onEdited: function(v) { root.set("reference_temperature_c", v) }
            }
        }
        // Saved on another bench since it was listed here: who and when, and Reload.
        ConflictBar {
            objectName: "columnConflict"
            Layout.fillWidth: true
            copyOffered: false
            message: library.errors["version"] || ""
            onReload: root.reloadDraft()
        }
        RowLayout {
            spacing: Theme.gap
            TouchButton {
                text: qsTr("Cancel")
                Accessible.name: qsTr("Cancel the column")
                onClicked: form.visible = false
            }
            TouchButton {
                objectName: "saveColumn"
                text: qsTr("Save column")
                highlighted: true
                onClicked: {
                    root.tried = true
                    if (library.save(root.draft)) {
                        root.status = qsTr("Saved %1.").arg(root.draft.name)
                        form.visible = false
                    } else {
                        var n = Object.keys(library.errors).length
                        root.status = library.generalError.length > 0 ? library.generalError
                                    : qsTr("Not saved: %n field(s) to correct.", "", n)
                    }
                }
            }
        }
    }
    Label {
        objectName: "columnStatus"
        Layout.fillWidth: true
        visible: root.status.length > 0
        text: root.status
        wrapMode: Text.Wrap
        font.pixelSize: Theme.smallFont
    }
}
