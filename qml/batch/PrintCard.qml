import QtQuick
import QtQuick.Controls
import QtQuick.Dialogs
import QtQuick.Layouts
import PhasePlan

// Save the sheet and the labels as PDF (a file dialog asks where, starting in the last folder
// used) or print them. Each save or print is recorded in the batch's history; after it, changes
// need an amendment. An out-of-tolerance batch asks for its deviation note first. Every failure
// is said here, beside the buttons.
Card {
    id: root

    required property BatchModel batch

    property string sheetPaper: "a4"
    property string labelPaper: "label62"
    /// Why the last save or print failed, "" after a success.
    property string failure: ""
    /// What waits for the deviation note: "sheet-pdf", "labels-pdf", "sheet-print", "labels-print".
    property string waiting: ""
    /// The file dialog that asks where a PDF goes (tests drive it).
    readonly property alias saveDialog: saveDialog

    title: qsTr("Sheet and labels")
    note: root.batch.printed ? qsTr("printed") : qsTr("not printed yet")
    noteColour: root.batch.printed ? Theme.good : Theme.dimText

    function fileUrl(path) {
        return "file://" + (path.charAt(0) === "/" ? "" : "/") + path
    }
    /// Runs `what` now, or first asks for the deviation note.
    function start(what) {
        root.failure = ""
        if (root.batch.needsDeviationNote) {
            root.waiting = what
            deviationPopup.open()
            return
        }
        root.run(what)
    }
    function run(what) {
        if (what === "sheet-pdf" || what === "labels-pdf") {
            var kind = what === "sheet-pdf" ? "sheet" : "labels"
            saveDialog.kind = kind
            saveDialog.currentFolder = root.fileUrl(root.batch.outputDir)
            saveDialog.selectedFile = root.fileUrl(root.batch.defaultPath(kind))
            saveDialog.open()
            return
        }
        var ok = what === "sheet-print" ? root.batch.printSheet("", root.sheetPaper)
                                        : root.batch.printLabels("", root.labelPaper)
        root.failure = ok ? "" : root.batch.errorMessage
    }

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
            text: qsTr("Save sheet as PDF…")
            enabled: root.batch.valid && !root.batch.pendingAmendment
            onClicked: root.start("sheet-pdf")
        }
        TouchButton {
            objectName: "saveLabelsButton"
            text: qsTr("Save labels as PDF…")
            enabled: root.batch.valid && !root.batch.pendingAmendment
            onClicked: root.start("labels-pdf")
        }
        TouchButton {
            objectName: "printSheetButton"
            text: qsTr("Print sheet")
            enabled: root.batch.valid && !root.batch.pendingAmendment && root.batch.printers.length > 0
            onClicked: root.start("sheet-print")
        }
        TouchButton {
            objectName: "printLabelsButton"
            text: qsTr("Print labels")
            enabled: root.batch.valid && !root.batch.pendingAmendment && root.batch.printers.length > 0
            onClicked: root.start("labels-print")
        }
    }
    Label {
        objectName: "printDisabledReason"
        Layout.fillWidth: true
        visible: text.length > 0
        wrapMode: Text.Wrap
        color: Theme.dimText
        font.pixelSize: Theme.smallFont
        text: root.batch.pendingAmendment ? qsTr("Record or discard the pending amendment before printing.")
              : (!root.batch.valid ? qsTr("Correct the entry marked in red before printing.") : "")
    }
    Label {
        objectName: "printError"
        Layout.fillWidth: true
        visible: root.failure.length > 0
        text: root.failure
        color: Theme.bad
        wrapMode: Text.Wrap
        font.pixelSize: Theme.fontSize
    }
    Label {
        Layout.fillWidth: true
        wrapMode: Text.Wrap
        color: Theme.dimText
        font.pixelSize: Theme.smallFont
        text: root.batch.lastSavedPath.length > 0
              ? qsTr("Saved: %1").arg(root.batch.lastSavedPath)
              : qsTr("PDFs are saved where you choose; the dialog opens in %1").arg(root.batch.outputDir)
                + (root.batch.printers.length === 0 ? qsTr(" · no printer is set up on this system") : "")
    }

    FileDialog {
        id: saveDialog
        property string kind: "sheet"
        title: kind === "sheet" ? qsTr("Save the sheet as PDF") : qsTr("Save the labels as PDF")
        fileMode: FileDialog.SaveFile
        acceptLabel: qsTr("Save")
        defaultSuffix: "pdf"
        nameFilters: [qsTr("PDF files (*.pdf)")]
        onAccepted: {
            var path = String(selectedFile)
            var ok = kind === "sheet" ? root.batch.saveSheet(path, root.sheetPaper)
                                      : root.batch.saveLabels(path, root.labelPaper)
            root.failure = ok ? "" : root.batch.errorMessage
        }
    }

    Popup {
        id: deviationPopup
        objectName: "deviationPopup"
        parent: Overlay.overlay
        // Centred, or above the on-screen keyboard while it is up.
        x: parent ? Math.round((parent.width - width) / 2) : 0
        y: parent ? Math.round(ApplicationWindow.window && ApplicationWindow.window.keyboardHeight > 0
                               ? Math.max(Theme.margin, Math.min((parent.height - height) / 2,
                                                                 parent.height - ApplicationWindow.window.keyboardHeight - height - Theme.margin))
                               : (parent.height - height) / 2) : 0
        modal: true
        focus: true
        padding: Theme.margin
        width: Math.min(parent ? parent.width - 2 * Theme.margin : 600, Theme.tap * 14)
        background: Rectangle { color: Theme.card; radius: Theme.radius; border.color: Theme.bad; border.width: 3 }
        ColumnLayout {
            anchors.fill: parent
            spacing: Theme.gap
            Label {
                Layout.fillWidth: true
                text: qsTr("This batch is out of tolerance")
                font.pixelSize: Theme.largeFont
                font.bold: true
                color: Theme.bad
                wrapMode: Text.Wrap
            }
            Label {
                Layout.fillWidth: true
                text: root.batch.outOfToleranceReasons.join("\n")
                wrapMode: Text.Wrap
                font.pixelSize: Theme.fontSize
            }
            DeviationEntry {
                objectName: "popupDeviationEntry"
                Layout.fillWidth: true
                batch: root.batch
                onRecorded: {
                    deviationPopup.close()
                    var what = root.waiting
                    root.waiting = ""
                    root.run(what)
                }
            }
            TouchButton {
                objectName: "deviationCancel"
                text: qsTr("Not now")
                Layout.alignment: Qt.AlignRight
                onClicked: {
                    root.waiting = ""
                    deviationPopup.close()
                }
            }
        }
    }
}
