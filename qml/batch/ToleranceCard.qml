import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// Shown while the batch is out of tolerance: why (each amount outside its band, the measured pH
// outside its tolerance), what to do about it (the core's suggested correction: what to add, the
// new final volume, or a remake), and the deviation note that printing requires, with who
// recorded it and when.
Card {
    id: root

    required property BatchModel batch

    title: qsTr("Out of tolerance")
    note: root.batch.needsDeviationNote ? qsTr("deviation note required") : qsTr("deviation note recorded")
    noteColour: root.batch.needsDeviationNote ? Theme.bad : Theme.warn
    background: Rectangle {
        color: Theme.card
        radius: Theme.radius
        border.color: Theme.bad
        border.width: 3
    }

    Column {
        Layout.fillWidth: true
        spacing: 2
        Repeater {
            model: root.batch.outOfToleranceReasons
            delegate: Label {
                required property string modelData
                width: parent ? parent.width : 0
                text: "⚠ " + modelData
                color: Theme.bad
                wrapMode: Text.Wrap
                font.pixelSize: Theme.fontSize
            }
        }
    }

    Label {
        Layout.fillWidth: true
        visible: root.batch.correction.length > 0
        text: root.batch.correctionIsRemake ? qsTr("Correction: remake") : qsTr("Suggested correction")
        font.bold: true
        font.pixelSize: Theme.fontSize
        wrapMode: Text.Wrap
    }
    Column {
        objectName: "correctionList"
        Layout.fillWidth: true
        spacing: 2
        Repeater {
            model: root.batch.correction
            delegate: Label {
                required property string modelData
                width: parent ? parent.width : 0
                text: "• " + modelData
                wrapMode: Text.Wrap
                font.pixelSize: Theme.fontSize
            }
        }
    }

    Label {
        objectName: "deviationRecorded"
        Layout.fillWidth: true
        visible: root.batch.deviationNote.length > 0
        text: qsTr("Deviation note: %1 — recorded by %2, %3").arg(root.batch.deviationNote)
                  .arg(root.batch.deviationBy).arg(root.batch.deviationAt.replace("T", " ").substring(0, 16))
        wrapMode: Text.Wrap
        font.pixelSize: Theme.fontSize
    }
    DeviationEntry {
        Layout.fillWidth: true
        batch: root.batch
        visible: root.batch.needsDeviationNote
    }
}
