import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// Add or correct a lab's own reagent. The core checks the entry as it would a shipped one
// (formula, electroneutrality, the system it names) on every change; the message shows beside the
// field it names. A source is required.
Card {
    id: root

    required property ReagentEditor editor
    property string status

    function errorFor(field) {
        return FieldPath.belongs(root.editor.errorField, field) ? root.editor.errorMessage : ""
    }
    function errorUnder(prefix) {
        return FieldPath.belongs(root.editor.errorField, prefix) ? root.editor.errorMessage : ""
    }

    title: root.editor.isLabEntry ? qsTr("Lab entry") : root.editor.editingShipped ? qsTr("Correct a shipped entry") : qsTr("New lab reagent")
    note: root.editor.molarMassGPerMol > 0 ? qsTr("%1 g/mol").arg(NumberText.format(root.editor.molarMassGPerMol, 3)) : ""

    Label {
        Layout.fillWidth: true
        visible: root.editor.editingShipped
        wrapMode: Text.Wrap
        color: Theme.dimText
        font.pixelSize: Theme.smallFont
        text: qsTr("Saving keeps your version apart from the shipped data: an update of the library will not overwrite it.")
    }
    GridLayout {
        id: grid
        Layout.fillWidth: true
        columns: Theme.columnsFor(width, 2)
        columnSpacing: Theme.gap
        TextEntry {
            Layout.preferredWidth: Theme.tap * 5
            objectName: "reagentId"
            Layout.fillWidth: true
            label: qsTr("Id")
            value: root.editor.reagentId
            placeholder: "lab-tris-maleate"
            hints: Qt.ImhNoAutoUppercase | Qt.ImhPreferLowercase | Qt.ImhNoPredictiveText
            error: !root.editor.showErrors ? "" : root.errorFor("id")
            onEdited: function(text) { root.editor.reagentId = text }
        }
        TextEntry {
            Layout.preferredWidth: Theme.tap * 5
            Layout.fillWidth: true
            label: qsTr("Name")
            value: root.editor.name
            error: !root.editor.showErrors ? "" : root.errorFor("name")
            onEdited: function(text) { root.editor.name = text }
        }
        TextEntry {
            Layout.preferredWidth: Theme.tap * 5
            objectName: "reagentFormula"
            Layout.fillWidth: true
            label: qsTr("Formula (hydrate water included)")
            value: root.editor.formula
            placeholder: "Na2HPO4(H2O)7"
            hints: Qt.ImhNoAutoUppercase | Qt.ImhNoPredictiveText
            error: !root.editor.showErrors ? "" : root.errorFor("formula")
            onEdited: function(text) { root.editor.formula = text }
        }
        SegmentedChoice {
            Layout.preferredWidth: Theme.tap * 5
            Layout.fillWidth: true
            label: qsTr("Form")
            options: [{ id: "solid", name: qsTr("Solid") }, { id: "liquid", name: qsTr("Liquid") }]
            current: root.editor.form
            onPicked: function(id) { root.editor.form = id }
        }
        NumberField {
            Layout.preferredWidth: Theme.tap * 5
            Layout.fillWidth: true
            label: qsTr("Assay")
            unit: "% w/w"
            value: root.editor.assayPercent
            step: 0.5
            decimals: 1
            from: 0
            to: 100
            error: !root.editor.showErrors ? "" : root.errorFor("assay_percent")
            onEdited: function(v) { root.editor.assayPercent = v }
        }
        NumberField {
            Layout.preferredWidth: Theme.tap * 5
            Layout.fillWidth: true
            visible: root.editor.form === "liquid"
            label: qsTr("Density")
            unit: "g/mL"
            value: root.editor.densityGPerMl
            step: 0.01
            decimals: 3
            from: 0
            error: !root.editor.showErrors ? "" : root.errorFor("density_g_per_ml")
            onEdited: function(v) { root.editor.densityGPerMl = v }
        }
        TextEntry {
            Layout.preferredWidth: Theme.tap * 5
            Layout.fillWidth: true
            label: qsTr("Hazard statements")
            value: root.editor.hazards
            placeholder: "H290 H314"
            hints: Qt.ImhUppercaseOnly | Qt.ImhNoPredictiveText
            error: !root.editor.showErrors ? "" : root.errorFor("ghs.hazards")
            onEdited: function(text) { root.editor.hazards = text }
        }
        TextEntry {
            Layout.preferredWidth: Theme.tap * 5
            Layout.fillWidth: true
            label: qsTr("Pictograms")
            value: root.editor.pictograms
            placeholder: "GHS05"
            hints: Qt.ImhUppercaseOnly | Qt.ImhNoPredictiveText
            error: !root.editor.showErrors ? "" : root.errorFor("ghs.pictograms")
            onEdited: function(text) { root.editor.pictograms = text }
        }
        TextEntry {
            Layout.preferredWidth: Theme.tap * 5
            Layout.fillWidth: true
            label: qsTr("Spectator ion")
            value: root.editor.spectatorIon
            placeholder: "Na+"
            hints: Qt.ImhNoAutoUppercase | Qt.ImhNoPredictiveText
            error: !root.editor.showErrors ? "" : root.errorUnder("spectators")
            onEdited: function(text) { root.editor.spectatorIon = text }
        }
        GridLayout {
            Layout.preferredWidth: Theme.tap * 5
            Layout.fillWidth: true
            columns: Theme.columnsFor(width, 2)
            NumberField {
                Layout.fillWidth: true
                label: qsTr("Charge")
                integer: true
                value: root.editor.spectatorCharge
                from: -6
                to: 6
                onEdited: function(v) { root.editor.spectatorCharge = Math.round(v) }
            }
            NumberField {
                Layout.fillWidth: true
                label: qsTr("Per formula unit")
                value: root.editor.spectatorCount
                decimals: 0
                from: 0
                onEdited: function(v) { root.editor.spectatorCount = v }
            }
        }
        ChoiceField {
            Layout.preferredWidth: Theme.tap * 5
            Layout.fillWidth: true
            label: qsTr("Acid-base system")
            choices: root.editor.systemChoices()
            current: root.editor.system
            error: !root.editor.showErrors ? "" : root.errorUnder("systems")
            onPicked: function(id) { root.editor.system = id }
        }
        GridLayout {
            Layout.preferredWidth: Theme.tap * 5
            Layout.fillWidth: true
            columns: Theme.columnsFor(width, 2)
            visible: root.editor.system.length > 0
            NumberField {
                Layout.fillWidth: true
                label: qsTr("Units per formula unit")
                value: root.editor.systemCount
                decimals: 0
                from: 0
                onEdited: function(v) { root.editor.systemCount = v }
            }
            NumberField {
                Layout.fillWidth: true
                label: qsTr("Protons removed")
                value: root.editor.protonsRemoved
                decimals: 0
                from: 0
                onEdited: function(v) { root.editor.protonsRemoved = v }
            }
        }
    }
    TextEntry {
        objectName: "reagentSource"
        Layout.fillWidth: true
        label: qsTr("Source of these numbers (required)")
        value: root.editor.source
        placeholder: qsTr("supplier certificate, lot 4411")
        error: !root.editor.showErrors ? "" : root.errorFor("source")
        onEdited: function(text) { root.editor.source = text }
    }
    Label {
        Layout.fillWidth: true
        visible: root.editor.showErrors && !root.editor.valid
                 && !FieldPath.belongsToAny(root.editor.errorField, ["id", "name", "formula", "assay_percent", "density_g_per_ml",
                                                                     "ghs.hazards", "ghs.pictograms", "source", "spectators", "systems",
                                                                     "version"])
        text: (root.editor.errorField.length > 0 ? root.editor.errorField + ": " : "") + root.editor.errorMessage
        color: Theme.bad
        wrapMode: Text.Wrap
        font.pixelSize: Theme.fontSize
    }
    // Saved or removed on another bench since it was opened here: who and when, and Reload.
    ConflictBar {
        objectName: "reagentConflict"
        Layout.fillWidth: true
        copyOffered: false
        message: FieldPath.belongs(root.editor.errorField, "version") ? root.editor.errorMessage : ""
        onReload: { root.editor.reload(); root.status = "" }
    }
    Flow {
        Layout.fillWidth: true
        spacing: Theme.gap
        TouchButton {
            objectName: "saveReagent"
            text: qsTr("Save lab entry")
            enabled: root.editor.valid
            highlighted: true
            onClicked: {
                var e = root.editor.save()
                root.status = e.length === 0 ? qsTr("Saved.") : e
            }
        }
        TouchButton {
            text: qsTr("New")
            onClicked: { root.editor.clear(); root.status = "" }
        }
        TouchButton {
            visible: root.editor.isLabEntry
            text: qsTr("Remove lab entry")
            onClicked: root.status = root.editor.removeLabEntry() ? qsTr("Removed.") : ""
        }
    }
    Label {
        Layout.fillWidth: true
        visible: root.status.length > 0
        text: root.status
        font.pixelSize: Theme.fontSize
        wrapMode: Text.Wrap
    }
}
