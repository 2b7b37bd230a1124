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

    function errorFor(field) {
        return root.designer.errorField === field ? root.designer.errorMessage : ""
    }

    Card {
        Layout.fillWidth: true
        title: qsTr("Which buffer")

        ChoiceField {
            Layout.fillWidth: true
            label: qsTr("Editing")
            choices: [{ id: "", name: qsTr("A buffer of its own") }].concat(root.plan ? root.plan.bufferLines : [])
            current: root.designer.lineLetter
            onPicked: function(id) { root.designer.lineLetter = id }
        }
        TextEntry {
            Layout.fillWidth: true
            label: qsTr("Name")
            value: root.designer.name
            placeholder: qsTr("e.g. phosphate pH 2.5, 20 mM")
            onEdited: function(text) { root.designer.name = text }
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
        ChoiceField {
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
            choices: root.designer.reagentChoices
            current: root.designer.acid
            error: root.errorFor("acid")
            onPicked: function(id) { root.designer.acid = id }
        }
        ChoiceField {
            Layout.fillWidth: true
            visible: root.designer.route !== "titrate"
            label: qsTr("Base form")
            choices: root.designer.reagentChoices
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
            Layout.fillWidth: true
            visible: root.designer.route === "titrate"
            label: qsTr("Weigh")
            choices: root.designer.reagentChoices
            current: root.designer.weigh
            error: root.errorFor("weigh")
            onPicked: function(id) { root.designer.weigh = id }
        }
        ChoiceField {
            Layout.fillWidth: true
            visible: root.designer.route === "titrate"
            label: qsTr("Titrant")
            choices: root.designer.titrantChoices
            current: root.designer.titrant
            error: root.errorFor("titrant")
            onPicked: function(id) { root.designer.titrant = id }
        }
        NumberField {
            Layout.fillWidth: true
            visible: root.designer.route === "titrate"
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
        NumberField {
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
