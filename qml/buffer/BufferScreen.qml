import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// The buffer designer: what the method asks for on the left (route, system, target pH, strength,
// volume, temperature), what to weigh or pipette on the right, recomputed on every touch.
ScreenPage {
    id: root

    /// The designer model (BufferDesigner); every number shown comes from it.
    required property BufferDesigner designer
    /// The plan, for the "which buffer" picker.
    property Plan plan

    title: qsTr("Buffer designer")

    /// Focuses the input a check or an error names (a field of the recipe document).
    function focusField(path) {
        var names = { "target_ph": "targetPhField", "concentration_mol_per_l": "concentrationField",
                      "ionic_strength_mol_per_l": "ionicStrengthField", "volume_ml": "volumeField",
                      "temperature_c": "temperatureField", "titrant_mol_per_l": "titrantConcentrationField",
                      "titrant": "titrantChoice", "weigh": "weighChoice", "acid": "acidChoice", "base": "baseChoice",
                      "acid_stock_mol_per_l": "acidStockField", "base_stock_mol_per_l": "baseStockField" }
        var key = path.replace(/^.*\.buffer\./, "")
        root.focusByName(names[key] || "targetPhField")
    }

    /// "Prepare & record" was tapped: the app opens the batch screen.
    signal prepare()

    // Changed on another bench: the refused save with Reload / Save as a copy, or a note.
    dock: ConflictBar {
        objectName: "bufferConflict"
        width: root.contentWidth
        message: root.designer.conflictMessage
        notice: root.designer.remoteNotice
        onReload: root.designer.reloadBuffer()
        onSaveCopy: root.designer.saveBufferAsCopy()
    }

    GridLayout {
        width: root.contentWidth
        columns: root.inPortrait ? 1 : 2
        columnSpacing: Theme.margin
        rowSpacing: Theme.margin

        ColumnLayout {
            Layout.fillWidth: true
            Layout.preferredWidth: root.inPortrait ? root.contentWidth : (root.contentWidth - Theme.margin) * 0.42
            Layout.alignment: Qt.AlignTop
            spacing: Theme.margin

            BufferInputs {
                Layout.fillWidth: true
                designer: root.designer
                plan: root.plan
            }
        }

        ColumnLayout {
            Layout.preferredWidth: root.inPortrait ? root.contentWidth : (root.contentWidth - Theme.margin) * 0.58
            Layout.fillWidth: true
            Layout.alignment: Qt.AlignTop
            spacing: Theme.margin

            RecipeCard {
                Layout.fillWidth: true
                designer: root.designer
                stale: root.pendingInputs > 0
            }
            TouchButton {
                objectName: "prepareButton"
                Layout.alignment: Qt.AlignRight
                text: qsTr("Prepare && record…")
                enabled: root.designer.valid
                onClicked: root.prepare()
            }
            BufferChart {
                Layout.fillWidth: true
                designer: root.designer
                inPortrait: root.inPortrait
            }
            Card {
                Layout.fillWidth: true
                title: qsTr("Steps")
                visible: root.designer.valid
                // A ListView that does not scroll, as tall as its rows: it places each row under
                // the one before whatever order the heights settle in. (A Column here left the
                // rows of the first recipe drawn over each other, at 1280×800 under Xvfb, until
                // the screen was shown again.)
                ListView {
                    id: stepList
                    Layout.fillWidth: true
                    Layout.preferredHeight: contentHeight
                    interactive: false
                    spacing: Theme.gap
                    // The count, not the list: new amounts update the steps in place. Each
                    // row reads its own step (stepAt; stepCount carries the change signal).
                    model: root.designer.stepCount
                    // The number in a label of its own, and the text read when the row is
                    // made and again only when that step changes (stepTextChanged): an edit
                    // makes no JS copy of the steps it leaves as they were (the strings an
                    // edit makes set off the collections of the JS heap).
                    delegate: Row {
                        id: stepRow
                        required property int index
                        width: stepList.width
                        spacing: Theme.gap
                        Label {
                            id: stepNumber
                            text: (stepRow.index + 1) + "."
                            font.pixelSize: Theme.fontSize
                        }
                        Label {
                            id: stepText
                            objectName: "stepText"
                            width: Math.max(0, stepRow.width - stepNumber.width - stepRow.spacing)
                            text: root.designer.stepAt(stepRow.index)
                            wrapMode: Text.Wrap
                            font.pixelSize: Theme.fontSize
                            Connections {
                                target: root.designer
                                function onStepTextChanged(i) {
                                    if (i === stepRow.index)
                                        stepText.text = root.designer.stepAt(i)
                                }
                            }
                        }
                    }
                }
            }
            Card {
                Layout.fillWidth: true
                title: qsTr("Safety")
                // A count read only when the cautions change: `cautions` read from QML is a JS
                // copy of every caution, and `valid` is signalled with every result.
                readonly property bool hasCautions: root.designer.cautions.length > 0
                visible: root.designer.valid && hasCautions
                BulletList {
                    Layout.fillWidth: true
                    items: root.designer.cautions
                }
                Label {
                    Layout.fillWidth: true
                    wrapMode: Text.Wrap
                    color: Theme.dimText
                    font.pixelSize: Theme.smallFont
                    text: qsTr("Read the safety data sheet of each product before use; local rules and licensed practice come first.")
                }
            }
        }
    }
}
