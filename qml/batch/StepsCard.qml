import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// The steps as the sheet prints them (BatchModel.steps comes from the same core list as the
// sheet's numbered blocks), with the locale's decimal mark as the amounts on this screen.
Card {
    id: root

    required property BatchModel batch

    title: qsTr("Steps")
    note: qsTr("as printed on the sheet")

    Column {
        objectName: "stepsList"
        Layout.fillWidth: true
        spacing: Theme.gap
        Repeater {
            model: root.batch.steps
            delegate: Column {
                id: section
                required property var modelData
                width: parent ? parent.width : 0
                spacing: 2
                Label {
                    width: section.width
                    visible: root.batch.steps.length > 1
                    text: section.modelData.heading
                    font.bold: true
                    font.pixelSize: Theme.fontSize
                    wrapMode: Text.Wrap
                }
                Repeater {
                    model: section.modelData.steps
                    delegate: Label {
                        required property int index
                        required property string modelData
                        width: section.width
                        text: (index + 1) + ". " + modelData
                        wrapMode: Text.Wrap
                        font.pixelSize: Theme.fontSize
                    }
                }
            }
        }
    }
}
