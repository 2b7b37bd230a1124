import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// Save the recipe sheet and the labels as PDF, or print them. Each save or print is recorded in
// the batch's history; after it, changes need an amendment.
Card {
    id: root

    required property BatchModel batch

    property string sheetPaper: "a4"
    property string labelPaper: "label62"

    title: qsTr("Sheet and labels")
    note: root.batch.printed ? qsTr("printed") : qsTr("not printed yet")
    noteColour: root.batch.printed ? Theme.good : Theme.dimText

    SegmentedChoice {
        Layout.fillWidth: true
        label: qsTr("Sheet paper")
        options: [{id: "a4", name: "A4"}, {id: "letter", name: "US Letter"}]
        current: root.sheetPaper
        onPicked: function(id) { root.sheetPaper = id }
    }
    SegmentedChoice {
        Layout.fillWidth: true
        label: qsTr("Label paper")
        options: [{id: "label62", name: qsTr("62 mm label")}, {id: "a4", name: qsTr("A4 sheet")},
                  {id: "letter", name: qsTr("Letter sheet")}]
        current: root.labelPaper
        onPicked: function(id) { root.labelPaper = id }
    }
    Flow {
        Layout.fillWidth: true
        spacing: Theme.gap
        TouchButton {
            objectName: "saveSheetButton"
            text: qsTr("Save sheet as PDF")
            enabled: root.batch.valid && !root.batch.pendingAmendment
            onClicked: root.batch.saveSheet("", root.sheetPaper)
        }
        TouchButton {
            objectName: "saveLabelsButton"
            text: qsTr("Save labels as PDF")
            enabled: root.batch.valid && !root.batch.pendingAmendment
            onClicked: root.batch.saveLabels("", root.labelPaper)
        }
        TouchButton {
            text: qsTr("Print sheet")
            enabled: root.batch.valid && !root.batch.pendingAmendment && root.batch.printers.length > 0
            onClicked: root.batch.printSheet("", root.sheetPaper)
        }
        TouchButton {
            text: qsTr("Print labels")
            enabled: root.batch.valid && !root.batch.pendingAmendment && root.batch.printers.length > 0
            onClicked: root.batch.printLabels("", root.labelPaper)
        }
    }
    Label {
        Layout.fillWidth: true
        wrapMode: Text.Wrap
        color: Theme.dimText
        font.pixelSize: Theme.smallFont
        text: root.batch.lastSavedPath.length > 0
              ? qsTr("Saved: %1").arg(root.batch.lastSavedPath)
              : qsTr("PDFs go to %1").arg(root.batch.outputDir)
                + (root.batch.printers.length === 0 ? qsTr(" · no printer is set up on this system") : "")
    }
}
