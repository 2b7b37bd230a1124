import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// The designer's inputs. Each field shows the core's error for its own JSON field beside it.
ColumnLayout {
    id: root

    required property BufferDesigner designer
    property Plan plan

    spacing: Theme.margin

    // The error read once per result into string properties, which signal only when they change:
    // the fields' bindings below then run again only when the error does, not on every edit (the
    // designer signals errorField and errorMessage with every new result).
    readonly property string shownErrorField: root.designer.errorField
    readonly property string shownErrorMessage: root.designer.errorMessage
    function errorFor(field) {
        return root.shownErrorField.length > 0 && FieldPath.belongs(root.shownErrorField, field)
               ? root.shownErrorMessage : ""
    }

    NameDialog {
        id: nameDialog
        property string mode: "rename" // "rename" or "duplicate"
        title: mode === "rename" ? qsTr("Name this buffer") : qsTr("Duplicate “%1”").arg(root.designer.bufferName)
        label: qsTr("Buffer name")
        onAccepted: function(name) {
            var why = mode === "rename" ? root.designer.renameBuffer(name) : root.designer.duplicateBuffer(name)
            if (why.length > 0)
                showError(why)
            else
                close()
        }
    }
    ConfirmDialog {
        id: deleteDialog
        title: qsTr("Delete the buffer “%1”?").arg(root.designer.bufferName)
        text: root.designer.usedByLines.length > 0
              ? qsTr("Line %1 holds it: the line keeps its own copy of the recipe, which no longer follows edits.").arg(root.designer.usedByLines.join(", "))
              : qsTr("No line of tonight's plan holds it.")
        onConfirmed: root.designer.deleteBuffer()
    }

    Card {
        Layout.fillWidth: true
        title: qsTr("Which buffer")
        note: root.designer.usedByLines.length > 0 ? qsTr("used by line %1").arg(root.designer.usedByLines.join(", ")) : ""

        ChoiceField {
            objectName: "bufferChoice"
            Layout.fillWidth: true
            label: qsTr("Saved buffer")
            choices: root.designer.bufferChoices
            current: root.designer.bufferName
            onPicked: function(id) { root.designer.openBuffer(id) }
        }
        Label {
            Layout.fillWidth: true
            visible: root.designer.autoName
            text: qsTr("The name follows the inputs until you name the buffer.")
            color: Theme.dimText
            wrapMode: Text.Wrap
            font.pixelSize: Theme.smallFont
        }
        Flow {
            Layout.fillWidth: true
            spacing: Theme.gap
            TouchButton {
                objectName: "newBuffer"
                text: qsTr("New")
                Accessible.name: qsTr("New buffer")
                onClicked: root.designer.newBuffer()
            }
            TouchButton {
                objectName: "duplicateBuffer"
                text: qsTr("Duplicate")
                Accessible.name: qsTr("Duplicate buffer")
                onClicked: { nameDialog.mode = "duplicate"; nameDialog.ask(qsTr("%1 (copy)").arg(root.designer.bufferName)) }
            }
            TouchButton {
                objectName: "renameBuffer"
                text: qsTr("Rename")
                Accessible.name: qsTr("Rename buffer")
                onClicked: { nameDialog.mode = "rename"; nameDialog.ask(root.designer.bufferName) }
            }
            TouchButton {
                objectName: "deleteBuffer"
                text: qsTr("Delete")
                Accessible.name: qsTr("Delete buffer")
                focusPolicy: Qt.NoFocus
                onClicked: deleteDialog.open()
            }
        }
    }

    Card {
        Layout.fillWidth: true
        title: qsTr("How it is made")

        SegmentedChoice {
            objectName: "routeChoice"
            Layout.fillWidth: true
            label: qsTr("Route")
            options: [{ id: "mix", name: qsTr("Mix acid + base form") },
                      { id: "titrate", name: qsTr("Weigh, titrate") },
                      { id: "stocks", name: qsTr("From stocks") }]
            current: root.designer.route
            onPicked: function(id) { root.designer.route = id }
        }
        // What the route change did to the reagents: never a silent swap.
        Repeater {
            model: root.designer.routeNotes
            delegate: Label {
                required property var modelData
                objectName: "routeNote"
                Layout.fillWidth: true
                text: modelData.message
                color: Theme.warn
                wrapMode: Text.Wrap
                font.pixelSize: Theme.smallFont
                Accessible.name: text
            }
        }
        ChoiceField {
            objectName: "systemChoice"
            Layout.fillWidth: true
            label: qsTr("Buffer system")
            choices: root.designer.systemChoices
            current: root.designer.system
            onPicked: function(id) { root.designer.system = id }
        }
        ChoiceField {
            objectName: "acidChoice"
            Layout.fillWidth: true
            visible: root.designer.route !== "titrate"
            label: qsTr("Acid form")
            choices: root.designer.acidChoices
            current: root.designer.acid
            error: root.errorFor("acid")
            onPicked: function(id) { root.designer.acid = id }
        }
        ChoiceField {
            objectName: "baseChoice"
            Layout.fillWidth: true
            visible: root.designer.route !== "titrate"
            label: qsTr("Base form")
            choices: root.designer.baseChoices
            current: root.designer.base
            error: root.errorFor("base")
            onPicked: function(id) { root.designer.base = id }
        }
        GridLayout {
            Layout.fillWidth: true
            visible: root.designer.route === "stocks"
            columns: Theme.columnsFor(width, 2)
            columnSpacing: Theme.gap
            NumberField {
                objectName: "acidStockField"
                Layout.fillWidth: true
                label: qsTr("Acid stock")
                unit: "mol/L"
                value: root.designer.acidStockMolPerL
                step: 0.05
                decimals: 3
                from: 0
                error: root.errorFor("acid_stock_mol_per_l")
                onEdited: function(v) { root.designer.acidStockMolPerL = v }
            }
            NumberField {
                objectName: "baseStockField"
                Layout.fillWidth: true
                label: qsTr("Base stock")
                unit: "mol/L"
                value: root.designer.baseStockMolPerL
                step: 0.05
                decimals: 3
                from: 0
                error: root.errorFor("base_stock_mol_per_l")
                onEdited: function(v) { root.designer.baseStockMolPerL = v }
            }
        }
        ChoiceField {
            objectName: "weighChoice"
            Layout.fillWidth: true
            visible: root.designer.route === "titrate"
            label: qsTr("Weigh")
            choices: root.designer.weighChoices
            current: root.designer.weigh
            error: root.errorFor("weigh")
            onPicked: function(id) { root.designer.weigh = id }
        }
        ChoiceField {
            objectName: "titrantChoice"
            Layout.fillWidth: true
            visible: root.designer.route === "titrate"
            label: qsTr("Titrant")
            choices: root.designer.titrantChoices
            current: root.designer.titrant
            error: root.errorFor("titrant")
            onPicked: function(id) { root.designer.titrant = id }
        }
        SegmentedChoice {
            objectName: "titrantFormChoice"
            Layout.fillWidth: true
            visible: root.designer.route === "titrate"
            label: qsTr("Titrant added")
            options: [{ id: "solution", name: qsTr("As a solution") },
                      { id: "neat", name: qsTr("As supplied (neat)") }]
            current: root.designer.titrantForm
            onPicked: function(id) { root.designer.titrantForm = id }
        }
        Label {
            Layout.fillWidth: true
            visible: root.errorFor("titrant_form").length > 0
            text: root.errorFor("titrant_form")
            color: Theme.bad
            wrapMode: Text.Wrap
            font.pixelSize: Theme.smallFont
        }
        NumberField {
            objectName: "titrantConcentrationField"
            Layout.fillWidth: true
            visible: root.designer.route === "titrate" && root.designer.titrantForm !== "neat"
            label: qsTr("Titrant concentration")
            unit: "mol/L"
            value: root.designer.titrantMolPerL
            step: 0.1
            decimals: 3
            from: 0
            error: root.errorFor("titrant_mol_per_l")
            onEdited: function(v) { root.designer.titrantMolPerL = v }
        }
    }

    Card {
        Layout.fillWidth: true
        title: qsTr("What the method asks for")

        NumberField {
            objectName: "targetPhField"
            Layout.fillWidth: true
            label: qsTr("Target pH")
            value: root.designer.targetPh
            step: 0.05
            decimals: 2
            from: 0
            to: 14
            error: root.errorFor("target_ph")
            onEdited: function(v) { root.designer.targetPh = v }
        }
        SegmentedChoice {
            Layout.fillWidth: true
            label: qsTr("Strength given as")
            options: [{ id: "concentration", name: qsTr("Buffer concentration") },
                      { id: "ionic_strength", name: qsTr("Ionic strength") }]
            current: root.designer.strengthBasis
            onPicked: function(id) { root.designer.strengthBasis = id }
        }
        NumberField {
            objectName: "concentrationField"
            Layout.fillWidth: true
            visible: root.designer.strengthBasis === "concentration"
            label: qsTr("Buffer concentration")
            unit: "mmol/L"
            value: root.designer.concentrationMmolPerL
            step: 5
            decimals: 1
            from: 0
            error: root.errorFor("concentration_mol_per_l")
            onEdited: function(v) { root.designer.concentrationMmolPerL = v }
        }
        SegmentedChoice {
            objectName: "basisChoice"
            Layout.fillWidth: true
            visible: root.designer.strengthBasis === "concentration"
            label: qsTr("The concentration counts")
            options: [{ id: "total", name: qsTr("The buffer in all its forms") },
                      { id: "salt", name: qsTr("The salt, brought to pH with its partner") }]
            current: root.designer.concentrationBasis
            onPicked: function(id) { root.designer.concentrationBasis = id }
        }
        Label {
            objectName: "basisText"
            Layout.fillWidth: true
            visible: text.length > 0
            text: root.errorFor("concentration_basis").length > 0 ? root.errorFor("concentration_basis")
                                                                    : root.designer.basisText
            color: root.errorFor("concentration_basis").length > 0 ? Theme.bad : Theme.text
            wrapMode: Text.Wrap
            font.pixelSize: Theme.smallFont
            Accessible.name: qsTr("Basis: %1").arg(text)
        }
        NumberField {
            objectName: "ionicStrengthField"
            Layout.fillWidth: true
            visible: root.designer.strengthBasis === "ionic_strength"
            label: qsTr("Ionic strength")
            unit: "mmol/L"
            value: root.designer.ionicStrengthMmolPerL
            step: 5
            decimals: 1
            from: 0
            error: root.errorFor("ionic_strength_mol_per_l")
            onEdited: function(v) { root.designer.ionicStrengthMmolPerL = v }
        }
        GridLayout {
            Layout.fillWidth: true
            columns: Theme.columnsFor(width, 2)
            columnSpacing: Theme.gap
            NumberField {
                objectName: "volumeField"
                Layout.fillWidth: true
                label: qsTr("Final volume")
                unit: "mL"
                value: root.designer.volumeMl
                step: 100
                decimals: 0
                from: 0
                error: root.errorFor("volume_ml")
                onEdited: function(v) { root.designer.volumeMl = v }
            }
            NumberField {
                objectName: "temperatureField"
                Layout.fillWidth: true
                label: qsTr("Temperature")
                unit: "°C"
                value: root.designer.temperatureC
                step: 1
                decimals: 1
                from: 0
                to: 60
                error: root.errorFor("temperature_c")
                onEdited: function(v) { root.designer.temperatureC = v }
            }
        }
    }
}
