import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// One line: its bottle, its parts and additives as edited, and the core's amounts for the
// bottle (by volume and by mass), UV cutoff and warnings.
Card {
    id: root

    required property LinesModel linesModel
    required property string letter
    required property bool defined
    required property string name
    required property real bottleMl
    required property real residueMl
    required property real primeMl
    required property var parts
    required property var additives
    required property var items
    required property real uvCutoffNm
    required property var warnings
    required property string errorField
    required property string errorMessage
    required property var bufferItems
    required property var cautions
    required property var notes

    signal editBuffer(string letter)

    function errorFor(field) {
        return root.errorField === field ? root.errorMessage : ""
    }

    title: qsTr("Line %1").arg(root.letter)
    note: root.defined && root.uvCutoffNm > 0 ? qsTr("UV cutoff %1 nm").arg(root.uvCutoffNm) : ""

    TouchButton {
        visible: !root.defined
        text: qsTr("Use line %1").arg(root.letter)
        onClicked: root.linesModel.addLine(root.letter)
    }

    ColumnLayout {
        Layout.fillWidth: true
        visible: root.defined
        spacing: Theme.gap

        TextEntry {
            Layout.fillWidth: true
            label: qsTr("Name on the bottle")
            value: root.name
            error: root.errorFor("name")
            onEdited: function(text) { root.linesModel.setName(root.letter, text) }
        }
        GridLayout {
            Layout.fillWidth: true
            columns: Theme.columnsFor(width, 2)
            columnSpacing: Theme.gap
            NumberField {
                Layout.fillWidth: true
                Layout.columnSpan: 2
                label: qsTr("Bottle volume")
                unit: "mL"
                value: root.bottleMl
                step: 250
                decimals: 0
                from: 0
                error: root.errorFor("bottle_ml")
                onEdited: function(v) { root.linesModel.setBottleMl(root.letter, v) }
            }
            NumberField {
                Layout.fillWidth: true
                label: qsTr("Residue")
                unit: "mL"
                value: root.residueMl
                step: 10
                decimals: 0
                from: 0
                error: root.errorFor("residue_ml")
                onEdited: function(v) { root.linesModel.setResidueMl(root.letter, v) }
            }
            NumberField {
                Layout.fillWidth: true
                label: qsTr("Priming")
                unit: "mL"
                value: root.primeMl
                step: 5
                decimals: 0
                from: 0
                onEdited: function(v) { root.linesModel.setPrimeMl(root.letter, v) }
            }
        }

        Label {
            text: qsTr("Parts (by volume)")
            font.bold: true
            font.pixelSize: Theme.fontSize
        }
        Column {
            id: partList
            Layout.fillWidth: true
            spacing: Theme.gap
            Repeater {
                model: root.parts
                delegate: ColumnLayout {
                    id: part
                    required property var modelData
                    required property int index
                    width: partList.width
                    spacing: Math.round(Theme.gap / 2)
                    RowLayout {
                        Layout.fillWidth: true
                        spacing: Theme.gap
                        ChoiceField {
                            Layout.fillWidth: true
                            visible: part.modelData.kind === "solvent"
                            choices: root.linesModel.solventChoices
                            current: part.modelData.id
                            error: root.errorFor("parts[" + part.index + "].solvent")
                            onPicked: function(id) { root.linesModel.setPartSolvent(root.letter, part.index, id) }
                        }
                        TouchButton {
                            Layout.fillWidth: true
                            visible: part.modelData.kind === "buffer"
                            text: qsTr("Buffer: %1 ›").arg(part.modelData.name)
                            onClicked: root.editBuffer(root.letter)
                        }
                        TouchButton {
                            text: "✕"
                            Accessible.name: qsTr("Remove part")
                            enabled: root.parts.length > 1
                            onClicked: root.linesModel.removePart(root.letter, part.index)
                        }
                    }
                    NumberField {
                        Layout.fillWidth: true
                        unit: "% v/v"
                        value: part.modelData.percent_v
                        step: 5
                        decimals: 1
                        from: 0
                        to: 100
                        error: root.errorFor("parts[" + part.index + "].fraction_v")
                        onEdited: function(v) { root.linesModel.setPartPercent(root.letter, part.index, v) }
                    }
                }
            }
        }
        Flow {
            Layout.fillWidth: true
            spacing: Theme.gap
            TouchButton {
                text: qsTr("+ Solvent")
                onClicked: root.linesModel.addSolventPart(root.letter, "acetonitrile")
            }
            TouchButton {
                text: qsTr("+ Aqueous buffer")
                visible: {
                    for (var i = 0; i < root.parts.length; ++i)
                        if (root.parts[i].kind === "buffer")
                            return false
                    return true
                }
                onClicked: root.linesModel.addBufferPart(root.letter)
            }
            TouchButton {
                text: qsTr("+ Additive")
                onClicked: root.linesModel.addAdditive(root.letter, "formic-acid")
            }
        }

        Column {
            id: additiveList
            Layout.fillWidth: true
            spacing: Theme.gap
            Repeater {
                model: root.additives
                delegate: ColumnLayout {
                    id: add
                    required property var modelData
                    required property int index
                    width: additiveList.width
                    spacing: Math.round(Theme.gap / 2)
                    RowLayout {
                        Layout.fillWidth: true
                        ChoiceField {
                            Layout.fillWidth: true
                            choices: root.linesModel.additiveChoices
                            current: add.modelData.id
                            error: root.errorFor("additives[" + add.index + "].additive")
                            onPicked: function(id) { root.linesModel.setAdditive(root.letter, add.index, id, add.modelData.amount, add.modelData.unit) }
                        }
                        TouchButton {
                            text: "✕"
                            Accessible.name: qsTr("Remove additive")
                            onClicked: root.linesModel.removeAdditive(root.letter, add.index)
                        }
                    }
                    RowLayout {
                        Layout.fillWidth: true
                        NumberField {
                            Layout.fillWidth: true
                            value: add.modelData.amount
                            step: add.modelData.unit === "mmol_per_l" ? 1 : 0.05
                            decimals: add.modelData.unit === "mmol_per_l" ? 1 : 2
                            from: 0
                            error: root.errorFor("additives[" + add.index + "]." + add.modelData.unit)
                            onEdited: function(v) { root.linesModel.setAdditive(root.letter, add.index, add.modelData.id, v, add.modelData.unit) }
                        }
                        ComboBox {
                            Layout.preferredHeight: Theme.tap
                            Layout.preferredWidth: Theme.tap * 2.6
                            font.pixelSize: Theme.fontSize
                            model: [{ id: "percent_v", name: "% v/v" }, { id: "percent_w", name: "% w/v" }, { id: "mmol_per_l", name: "mmol/L" }]
                            textRole: "name"
                            valueRole: "id"
                            currentIndex: add.modelData.unit === "percent_w" ? 1 : add.modelData.unit === "mmol_per_l" ? 2 : 0
                            onActivated: function(i) { root.linesModel.setAdditive(root.letter, add.index, add.modelData.id, add.modelData.amount, currentValue) }
                        }
                    }
                }
            }
        }

        Label {
            Layout.fillWidth: true
            visible: root.errorMessage.length > 0
            text: root.errorField + ": " + root.errorMessage
            color: Theme.bad
            wrapMode: Text.Wrap
            font.pixelSize: Theme.fontSize
        }

        Label {
            visible: root.items.length > 0
            text: qsTr("For a %1 mL bottle, measure separately").arg(Number(root.bottleMl).toLocaleString(Qt.locale(), "f", 0))
            font.bold: true
            font.pixelSize: Theme.fontSize
        }
        Column {
            id: itemList
            Layout.fillWidth: true
            spacing: Theme.gap
            Repeater {
                model: root.items
                delegate: RowLayout {
                    required property var modelData
                    width: itemList.width
                    spacing: Theme.gap
                    Label {
                        Layout.fillWidth: true
                        text: modelData.name
                        wrapMode: Text.Wrap
                        font.pixelSize: Theme.fontSize
                    }
                    Label {
                        text: modelData.volume_text || ""
                        font.pixelSize: Theme.fontSize
                        font.bold: true
                    }
                    Label {
                        text: modelData.mass_text ? qsTr("or %1").arg(modelData.mass_text) : ""
                        color: Theme.dimText
                        font.pixelSize: Theme.fontSize
                    }
                }
            }
        }
        Column {
            id: warningList
            Layout.fillWidth: true
            spacing: Theme.gap
            Repeater {
                model: root.warnings
                delegate: WarningRow {
                    required property var modelData
                    width: warningList.width
                    severity: modelData.severity
                    message: modelData.message
                }
            }
        }
        Label {
            visible: root.bufferItems.length > 0
            text: qsTr("The aqueous buffer, for its share")
            font.bold: true
            font.pixelSize: Theme.fontSize
        }
        Column {
            id: bufferList
            Layout.fillWidth: true
            spacing: Math.round(Theme.gap / 2)
            Repeater {
                model: root.bufferItems
                delegate: RowLayout {
                    required property var modelData
                    width: bufferList.width
                    Label {
                        Layout.fillWidth: true
                        text: modelData.name
                        wrapMode: Text.Wrap
                        font.pixelSize: Theme.fontSize
                    }
                    Label {
                        text: modelData.amount
                        font.bold: true
                        font.pixelSize: Theme.fontSize
                    }
                }
            }
        }
        Column {
            id: noteList
            Layout.fillWidth: true
            spacing: Math.round(Theme.gap / 2)
            Repeater {
                model: root.notes
                delegate: Label {
                    required property string modelData
                    width: noteList.width
                    text: modelData
                    wrapMode: Text.Wrap
                    color: Theme.dimText
                    font.pixelSize: Theme.smallFont
                }
            }
        }
        Label {
            visible: root.cautions.length > 0
            text: qsTr("Safety")
            font.bold: true
            color: Theme.warn
            font.pixelSize: Theme.fontSize
        }
        BulletList {
            Layout.fillWidth: true
            items: root.cautions
            pixelSize: Theme.smallFont
        }
        TouchButton {
            text: qsTr("Stop using line %1").arg(root.letter)
            flat: true
            onClicked: root.linesModel.removeLine(root.letter)
        }
    }
}
