import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// Saved work: save tonight's plan or the current buffer under a name, and find and open last
// week's in two touches.
ScreenPage {
    id: root

    required property Workspace workspace
    required property Plan plan
    required property BufferDesigner designer
    /// Opens a screen after opening a saved document.
    signal open(string screen)

    title: qsTr("Saved work")

    SavedWorkModel {
        id: saved
        workspace: root.workspace
    }

    GridLayout {
        width: root.contentWidth
        columns: root.inPortrait ? 1 : 2
        columnSpacing: Theme.margin
        rowSpacing: Theme.margin

        Card {
            id: saveCard
            Layout.fillWidth: true
            Layout.alignment: Qt.AlignTop
            Layout.preferredWidth: root.inPortrait ? root.contentWidth : (root.contentWidth - Theme.margin) * 0.4
            title: qsTr("Save")
            property string status

            TextEntry {
                id: planName
                Layout.fillWidth: true
                label: qsTr("Plan name")
                value: root.plan.name
            }
            // A refused save, under the name it was about: who saved that name (or changed the
            // plan) and when. Overwriting theirs is a choice of its own, never a side effect.
            ColumnLayout {
                objectName: "planSaveClash"
                Layout.fillWidth: true
                visible: root.plan.saveClash.length > 0
                spacing: Theme.gap
                Label {
                    Layout.fillWidth: true
                    text: root.plan.saveClash
                    color: Theme.bad
                    wrapMode: Text.Wrap
                    font.pixelSize: Theme.fontSize
                }
                Flow {
                    Layout.fillWidth: true
                    spacing: Theme.gap
                    TouchButton {
                        text: qsTr("Open theirs")
                        Accessible.name: qsTr("Open the saved plan %1, dropping the edits here").arg(root.plan.saveClashName)
                        onClicked: {
                            if (root.plan.openClashing())
                                root.open("sequence")
                        }
                    }
                    TouchButton {
                        text: qsTr("Save as a copy")
                        onClicked: {
                            var e = root.plan.saveAsCopy()
                            saveCard.status = e.length === 0 ? qsTr("Plan saved as “%1”.").arg(root.plan.name) : e
                        }
                    }
                    TouchButton {
                        text: qsTr("Replace theirs")
                        Accessible.name: qsTr("Replace the saved plan %1 with this one").arg(root.plan.saveClashName)
                        onClicked: {
                            var e = root.plan.replaceSaved()
                            saveCard.status = e.length === 0 ? (qsTr("Plan saved; the earlier one is replaced.") + " " + root.plan.saveNote).trim() : ""
                        }
                    }
                }
            }
            TouchButton {
                text: qsTr("Save plan with its lines and methods")
                highlighted: true
                onClicked: {
                    var e = root.plan.saveAs(planName.field.text)
                    saveCard.status = e.length === 0 ? (qsTr("Plan saved.") + " " + root.plan.saveNote).trim() : ""
                }
            }
            TextEntry {
                id: bufferName
                Layout.fillWidth: true
                label: qsTr("Buffer name")
                value: root.designer.name
                placeholder: qsTr("e.g. phosphate pH 2.5, 20 mM")
            }
            TouchButton {
                text: qsTr("Save buffer")
                onClicked: {
                    var e = root.designer.saveAs(bufferName.field.text)
                    saveCard.status = e.length === 0 ? qsTr("Buffer saved.") : e
                }
            }
            Label {
                Layout.fillWidth: true
                visible: saveCard.status.length > 0
                text: saveCard.status
                wrapMode: Text.Wrap
                font.pixelSize: Theme.fontSize
            }
            Label {
                Layout.fillWidth: true
                wrapMode: Text.Wrap
                color: Theme.dimText
                font.pixelSize: Theme.smallFont
                text: qsTr("Your edits are kept as you go; saving under a name keeps a copy you can find again.")
            }
        }

        Card {
            Layout.preferredWidth: root.inPortrait ? root.contentWidth : (root.contentWidth - Theme.margin) * 0.6
            Layout.fillWidth: true
            Layout.alignment: Qt.AlignTop
            title: qsTr("Open")
            note: qsTr("%n saved", "", saved.count)

            TextEntry {
                Layout.fillWidth: true
                placeholder: qsTr("Search saved work")
                hints: Qt.ImhNoPredictiveText
                onEdited: function(text) { saved.search = text }
            }
            SegmentedChoice {
                Layout.fillWidth: true
                options: [{ id: "all", name: qsTr("All") }, { id: "sequence", name: qsTr("Plans") },
                          { id: "buffer", name: qsTr("Buffers") }, { id: "line", name: qsTr("Lines") },
                          { id: "method", name: qsTr("Methods") }]
                current: saved.kind
                onPicked: function(id) { saved.kind = id }
            }
            Column {
                id: entryList
                Layout.fillWidth: true
                spacing: Theme.gap
                Repeater {
                    model: saved
                    delegate: RowLayout {
                        id: entry
                        required property string kind
                        required property string name
                        required property string summary
                        required property string updated
                        required property string changed
                        width: entryList.width
                        spacing: Theme.gap
                        ColumnLayout {
                            Layout.fillWidth: true
                            spacing: 0
                            Label {
                                Layout.fillWidth: true
                                text: entry.name
                                font.pixelSize: Theme.fontSize
                                wrapMode: Text.Wrap
                            }
                            Label {
                                Layout.fillWidth: true
                                text: entry.kind + " · " + entry.summary + " · "
                                      + (entry.changed.length > 0 ? entry.changed : entry.updated)
                                color: Theme.dimText
                                font.pixelSize: Theme.smallFont
                                wrapMode: Text.Wrap
                            }
                        }
                        TouchButton {
                            text: qsTr("Open")
                            Accessible.name: qsTr("Open %1").arg(entry.name)
                            visible: entry.kind === "sequence" || entry.kind === "buffer"
                            onClicked: {
                                if (entry.kind === "sequence") {
                                    root.plan.loadSaved(entry.name)
                                    root.open("sequence")
                                } else {
                                    root.designer.openBuffer(entry.name)
                                    root.open("buffer")
                                }
                            }
                        }
                        TouchButton {
                            text: qsTr("Add to plan")
                            Accessible.name: qsTr("Add %1 to the plan").arg(entry.name)
                            visible: entry.kind === "method"
                            onClicked: {
                                root.plan.setMethodDocument(entry.name, saved.load(entry.kind, entry.name))
                                root.open("sequence")
                            }
                        }
                        // A saved line goes onto the line the user picks.
                        Label {
                            visible: entry.kind === "line"
                            text: qsTr("put on")
                            color: Theme.dimText
                            font.pixelSize: Theme.smallFont
                        }
                        Repeater {
                            model: entry.kind === "line" ? ["A", "B", "C", "D"] : []
                            delegate: TouchButton {
                                required property string modelData
                                text: modelData
                                Accessible.name: qsTr("Put %1 on line %2").arg(entry.name).arg(modelData)
                                onClicked: {
                                    root.plan.setLineDocument(modelData, saved.load(entry.kind, entry.name))
                                    root.open("lines")
                                }
                            }
                        }
                        // Two touches to delete: the first arms, the second deletes.
                        TouchButton {
                            property bool armed: false
                            text: armed ? qsTr("Delete?") : "✕"
                            palette.buttonText: armed ? Theme.bad : Theme.text
                            Accessible.name: qsTr("Delete %1").arg(entry.name)
                            onClicked: {
                                if (armed)
                                    saved.remove(entry.kind, entry.name)
                                armed = !armed
                            }
                        }
                    }
                }
            }
        }

        // Settings of this tablet, not of the lab's database.
        Card {
            objectName: "tabletCard"
            Layout.fillWidth: true
            Layout.alignment: Qt.AlignTop
            Layout.preferredWidth: root.inPortrait ? root.contentWidth : (root.contentWidth - Theme.margin) * 0.4
            title: qsTr("This tablet")
            Switch {
                objectName: "keyboardSwitch"
                Layout.fillWidth: true
                implicitHeight: Theme.tap
                text: qsTr("On-screen keyboard")
                font.pixelSize: Theme.fontSize
                checked: TabletSettings.keyboardEnabled
                Accessible.name: text
                onToggled: TabletSettings.keyboardEnabled = checked
            }
            Label {
                Layout.fillWidth: true
                wrapMode: Text.Wrap
                color: Theme.dimText
                font.pixelSize: Theme.smallFont
                text: TabletSettings.keyboardEnabled === TabletSettings.keyboardActive
                      ? (TabletSettings.keyboardActive ? qsTr("The keyboard slides up when a field is typed in.")
                                                       : qsTr("For tablets without a keyboard."))
                      : qsTr("Takes effect when PhasePlan is started again.")
            }
            // Which database to open at the next start: this tablet's own file, another file, or
            // the lab's shared PostgreSQL database (the password from ~/.pgpass, or asked then).
            Label {
                Layout.fillWidth: true
                Layout.topMargin: Theme.gap
                text: qsTr("Database")
                font.pixelSize: Theme.smallFont
                color: Theme.dimText
            }
            TextField {
                id: databaseField
                objectName: "databaseField"
                Layout.fillWidth: true
                Layout.preferredHeight: Theme.tap
                text: TabletSettings.database
                placeholderText: qsTr("this tablet's own file")
                inputMethodHints: Qt.ImhNoAutoUppercase | Qt.ImhNoPredictiveText | Qt.ImhUrlCharactersOnly
                Accessible.name: qsTr("Database to open at the next start")
                onTextEdited: databaseMessage.text = ""
                onAccepted: useDatabase.clicked()
            }
            Label {
                id: databaseMessage
                objectName: "databaseMessage"
                Layout.fillWidth: true
                visible: text.length > 0
                color: Theme.bad
                wrapMode: Text.Wrap
                font.pixelSize: Theme.smallFont
            }
            TouchButton {
                id: useDatabase
                objectName: "useDatabase"
                text: qsTr("Use at the next start")
                onClicked: databaseMessage.text = TabletSettings.setDatabase(databaseField.text)
            }
            Label {
                Layout.fillWidth: true
                wrapMode: Text.WrapAnywhere
                color: Theme.dimText
                font.pixelSize: Theme.smallFont
                text: qsTr("In use now: %1").arg(TabletSettings.databaseInUse)
                      + ((TabletSettings.database.length > 0 ? TabletSettings.database : "") !== ""
                         && TabletSettings.database !== TabletSettings.databaseInUse
                         ? "\n" + qsTr("From the next start: %1").arg(TabletSettings.database) : "")
            }
        }
    }
}
