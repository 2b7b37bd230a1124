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
    /// [{id, name}] of the saved buffers, for a buffer part.
    property var bufferChoices: []
    /// The plan, for field names in people's words.
    property Plan plan
    readonly property real remainingPercent: {
        var used = 0
        for (var i = 0; i < root.parts.length; ++i)
            used += root.parts[i].percent_v
        return Math.max(0, Math.round((100 - used) * 1000) / 1000)
    }
    readonly property bool hasBuffer: {
        for (var i = 0; i < root.parts.length; ++i)
            if (root.parts[i].kind === "buffer")
                return true
        return false
    }

    /// Opens the buffer designer on a saved buffer.
    signal editBuffer(string name)

    function errorFor(field) {
        return FieldPath.belongs(root.errorField, field) ? root.errorMessage : ""
    }
    /// Focuses the field a check or an error names, given the segments of its path below the
    /// line ("bottle_ml"; "parts", "1", "fraction_v"); a field the card does not show (the time
    /// the line was prepared) focuses the line's name.
    function focusField(segments) {
        var key = segments.length > 0 ? segments[0] : ""
        var index = segments.length > 1 ? parseInt(segments[1]) : 0
        if (isNaN(index))
            index = 0
        var target = null
        if (key === "bottle_ml") target = bottleField.field
        else if (key === "residue_ml") target = residueField.field
        else if (key === "prime_ml") target = primeField.field
        else if (key === "parts" && partRepeater.count > 0)
            target = partRepeater.itemAt(Math.min(index, partRepeater.count - 1)).percentField.field
        else if (key === "additives" && additiveRepeater.count > 0)
            target = additiveRepeater.itemAt(Math.min(index, additiveRepeater.count - 1)).amountField.field
        if (!target)
            target = nameEntry.field
        target.forceActiveFocus()
    }

    title: qsTr("Line %1").arg(root.letter)
    note: root.defined && root.uvCutoffNm > 0 ? qsTr("UV cutoff %1 nm").arg(NumberText.format(root.uvCutoffNm, 0)) : ""

    TouchButton {
        visible: !root.defined
        text: qsTr("Use line %1").arg(root.letter)
        onClicked: root.linesModel.addLine(root.letter)
    }
    ConfirmDialog {
        id: stopDialog
        title: qsTr("Stop using line %1?").arg(root.letter)
        text: qsTr("Its parts, bottle and priming are removed from tonight's plan. Methods that pump line %1 then need changing.").arg(root.letter)
        actionText: qsTr("Stop using it")
        onConfirmed: root.linesModel.removeLine(root.letter)
    }

    ColumnLayout {
        Layout.fillWidth: true
        visible: root.defined
        spacing: Theme.gap

        TextEntry {
            id: nameEntry
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
                id: bottleField
                objectName: "bottleField"
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
                id: residueField
                objectName: "residueField"
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
                id: primeField
                objectName: "primeField"
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
                id: partRepeater
                model: root.parts
                delegate: ColumnLayout {
                    id: part
                    required property var modelData
                    required property int index
                    readonly property alias percentField: percentField
                    width: partList.width
                    spacing: Math.round(Theme.gap / 2)
                    RowLayout {
                        Layout.fillWidth: true
                        spacing: Theme.gap
                        ChoiceField {
                            Layout.fillWidth: true
                            visible: part.modelData.kind === "solvent"
                            accessibleName: qsTr("Solvent of part %1 of line %2").arg(part.index + 1).arg(root.letter)
                            choices: root.linesModel.solventChoices
                            current: part.modelData.id
                            error: root.errorFor("parts[" + part.index + "].solvent")
                            onPicked: function(id) { root.linesModel.setPartSolvent(root.letter, part.index, id) }
                        }
                        ChoiceField {
                            Layout.fillWidth: true
                            visible: part.modelData.kind === "buffer"
                            accessibleName: qsTr("Buffer of line %1").arg(root.letter)
                            choices: (part.modelData.ref || "").length > 0 ? root.bufferChoices
                                     : [{ id: "", name: qsTr("%1 (own copy)").arg(part.modelData.name) }].concat(root.bufferChoices)
                            current: part.modelData.ref || ""
                            onPicked: function(id) { if (id.length > 0) root.linesModel.setPartBuffer(root.letter, part.index, id) }
                        }
                        TouchButton {
                            visible: part.modelData.kind === "buffer" && (part.modelData.ref || "").length > 0
                            text: qsTr("Edit ›")
                            Accessible.name: qsTr("Edit buffer %1").arg(part.modelData.name)
                            onClicked: root.editBuffer(part.modelData.ref)
                        }
                        TouchButton {
                            text: "✕"
                            focusPolicy: Qt.NoFocus
                            Accessible.name: qsTr("Remove part %1 of line %2").arg(part.index + 1).arg(root.letter)
                            enabled: root.parts.length > 1
                            onClicked: root.linesModel.removePart(root.letter, part.index)
                        }
                    }
                    NumberField {
                        id: percentField
                        Layout.fillWidth: true
                        label: qsTr("Part %1 of line %2").arg(part.index + 1).arg(root.letter)
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
                objectName: "addSolventPart"
                text: qsTr("+ Solvent")
                Accessible.name: qsTr("Add a solvent to line %1").arg(root.letter)
                enabled: root.remainingPercent > 0
                onClicked: root.linesModel.addSolventPart(root.letter, "water")
            }
            TouchButton {
                objectName: "addBufferPart"
                text: qsTr("+ Saved buffer")
                Accessible.name: qsTr("Add a saved buffer to line %1").arg(root.letter)
                enabled: root.remainingPercent > 0 && !root.hasBuffer && root.bufferChoices.length > 0
                onClicked: bufferMenu.open()
                Menu {
                    id: bufferMenu
                    Repeater {
                        model: root.bufferChoices
                        delegate: MenuItem {
                            required property var modelData
                            text: modelData.name
                            height: Theme.tap
                            font.pixelSize: Theme.fontSize
                            onTriggered: root.linesModel.addBufferPart(root.letter, modelData.id)
                        }
                    }
                }
            }
            TouchButton {
                text: qsTr("+ Additive")
                Accessible.name: qsTr("Add an additive to line %1").arg(root.letter)
                onClicked: root.linesModel.addAdditive(root.letter, "formic-acid")
            }
        }
        Label {
            objectName: "partsWhyDisabled"
            Layout.fillWidth: true
            visible: text.length > 0
            text: root.remainingPercent <= 0
                  ? qsTr("The parts fill the line (100 %): lower one before adding another.")
                  : root.hasBuffer ? qsTr("%1 % v/v left for a new part. A line holds one aqueous buffer.").arg(NumberText.format(root.remainingPercent, 1))
                  : root.bufferChoices.length === 0 ? qsTr("%1 % v/v left for a new part. Save a buffer on the Buffer screen to add it here.").arg(NumberText.format(root.remainingPercent, 1))
                  : qsTr("%1 % v/v left for a new part.").arg(NumberText.format(root.remainingPercent, 1))
            color: Theme.dimText
            wrapMode: Text.Wrap
            font.pixelSize: Theme.smallFont
        }

        Column {
            id: additiveList
            Layout.fillWidth: true
            spacing: Theme.gap
            Repeater {
                id: additiveRepeater
                model: root.additives
                delegate: ColumnLayout {
                    id: add
                    required property var modelData
                    required property int index
                    readonly property alias amountField: amountField
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
                            focusPolicy: Qt.NoFocus
                            Accessible.name: qsTr("Remove additive %1 of line %2").arg(add.index + 1).arg(root.letter)
                            onClicked: root.linesModel.removeAdditive(root.letter, add.index)
                        }
                    }
                    RowLayout {
                        Layout.fillWidth: true
                        NumberField {
                            id: amountField
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
                            Accessible.name: qsTr("Unit of %1").arg(add.modelData.name || add.modelData.id)
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
            text: (root.plan ? root.plan.fieldWords("lines." + root.letter + "." + root.errorField) : root.errorField)
                  + ": " + root.errorMessage
            color: Theme.bad
            wrapMode: Text.Wrap
            font.pixelSize: Theme.fontSize
        }

        Label {
            visible: root.items.length > 0
            text: qsTr("For a %1 mL bottle, measure separately").arg(NumberText.format(root.bottleMl, 0))
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
            focusPolicy: Qt.NoFocus
            onClicked: stopDialog.open()
        }
    }
}
