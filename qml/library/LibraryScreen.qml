import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// The reagent and solvent library: browse and search; the lab's own reagents are added or
// corrected in the editor beside the list and kept apart from the shipped data; the lots of the
// lab's reagents are kept on the shelf card below it.
ScreenPage {
    id: root

    required property Workspace workspace
    /// The app's sign-in (Main.qml): the lot shelf writes under the person signed in.
    property Session session: null

    title: qsTr("Library")

    LibraryModel {
        id: library
        workspace: root.workspace
    }
    ReagentEditor {
        id: editor
        workspace: root.workspace
    }

    GridLayout {
        width: root.contentWidth
        columns: root.inPortrait ? 1 : 2
        columnSpacing: Theme.margin
        rowSpacing: Theme.margin

        Card {
            Layout.fillWidth: true
            Layout.alignment: Qt.AlignTop
            Layout.preferredWidth: root.inPortrait ? root.contentWidth : (root.contentWidth - Theme.margin) * 0.5
            title: qsTr("Reagents and solvents")
            note: qsTr("%n shown", "", library.count)

            TextEntry {
                objectName: "librarySearch"
                Layout.fillWidth: true
                placeholder: qsTr("Search by name, id or formula")
                hints: Qt.ImhNoPredictiveText
                onEdited: function(text) { library.search = text }
            }
            SegmentedChoice {
                Layout.fillWidth: true
                options: [{ id: "all", name: qsTr("All") }, { id: "reagents", name: qsTr("Reagents") },
                          { id: "solvents", name: qsTr("Solvents") }]
                current: library.kind
                onPicked: function(id) { library.kind = id }
            }
            Column {
                id: entryList
                Layout.fillWidth: true
                spacing: Theme.gap
                Repeater {
                    model: library
                    delegate: ItemDelegate {
                        id: item
                        required property string entryId
                        required property string name
                        required property string kind
                        required property string formula
                        required property string detail
                        required property string hazards
                        required property string sources
                        required property bool userDefined
                        width: entryList.width
                        implicitHeight: Math.max(Theme.tap, content.implicitHeight + Theme.gap * 2)
                        highlighted: editor.reagentId === entryId
                        Accessible.name: item.name
                        onClicked: if (kind === "reagents") editor.edit(entryId)
                        contentItem: ColumnLayout {
                            id: content
                            spacing: 0
                            Label {
                                Layout.fillWidth: true
                                text: item.name + (item.userDefined ? qsTr("  · lab entry") : "")
                                font.pixelSize: Theme.fontSize
                                font.bold: item.userDefined
                                wrapMode: Text.Wrap
                            }
                            Label {
                                Layout.fillWidth: true
                                text: item.formula + (item.detail.length > 0 ? " · " + item.detail : "")
                                      + (item.hazards.length > 0 ? " · " + item.hazards : "")
                                color: Theme.dimText
                                font.pixelSize: Theme.smallFont
                                wrapMode: Text.Wrap
                            }
                        }
                    }
                }
            }
        }

        // The lab's own entries, columns and instruments beside the list (below it in portrait),
        // so each is in view without scrolling past the whole library.
        ColumnLayout {
            Layout.preferredWidth: root.inPortrait ? root.contentWidth : (root.contentWidth - Theme.margin) * 0.5
            Layout.fillWidth: true
            Layout.alignment: Qt.AlignTop
            spacing: Theme.margin
            ReagentEditorCard {
                Layout.fillWidth: true
                editor: editor
            }
            LotShelfCard {
                Layout.fillWidth: true
                workspace: root.workspace
                session: root.session
            }
            ColumnsCard {
                Layout.fillWidth: true
                workspace: root.workspace
            }
            InstrumentsCard {
                Layout.fillWidth: true
                workspace: root.workspace
            }
        }
    }
}
