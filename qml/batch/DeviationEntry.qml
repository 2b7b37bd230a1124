import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// Why an out-of-tolerance batch is still used: a note that cannot be empty, recorded with the
// preparer's name and the time.
ColumnLayout {
    id: root

    required property BatchModel batch
    /// The note was recorded.
    signal recorded()

    spacing: Theme.gap

    TextEntry {
        id: noteEntry
        objectName: "deviationNoteField"
        Layout.fillWidth: true
        label: qsTr("Deviation note (required before printing or use)")
        placeholder: qsTr("why the batch is used as it is, or what was done")
        error: FieldPath.belongs(root.batch.errorField, "batch.deviation.note") ? root.batch.errorMessage : ""
    }
    TouchButton {
        objectName: "recordDeviationButton"
        text: qsTr("Record deviation note")
        onClicked: {
            if (root.batch.recordDeviation(noteEntry.field.text)) {
                noteEntry.field.text = ""
                root.recorded()
            }
        }
    }
}
