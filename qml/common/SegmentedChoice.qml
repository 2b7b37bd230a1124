import QtQuick
import QtQuick.Controls
import QtQuick.Layouts

// A few mutually exclusive options side by side (route, basis, detector), each a touch target.
ColumnLayout {
    id: root

    property string label
    /// [{id, name}]
    property var options: []
    property string current

    signal picked(string id)

    spacing: Math.round(Theme.gap / 2)

    Label {
        text: root.label
        visible: root.label.length > 0
        font.pixelSize: Theme.smallFont
        color: Theme.dimText
    }
    Flow {
        id: flow
        Layout.fillWidth: true
        // A wrapping row reports the width of its current rows; letting the card chase that
        // width makes the layout loop. Ask for a fixed width and take the height the rows need.
        Layout.preferredWidth: 8 * Theme.tap
        Layout.preferredHeight: flow.childrenRect.height
        spacing: Math.round(Theme.gap / 2)
        Repeater {
            model: root.options
            delegate: Button {
                required property var modelData
                text: modelData.name
                checkable: true
                checked: root.current === modelData.id
                height: Theme.tap
                leftPadding: Theme.margin
                rightPadding: Theme.margin
                font.pixelSize: Theme.fontSize
                onClicked: {
                    checked = Qt.binding(function() { return root.current === modelData.id })
                    root.picked(modelData.id)
                }
            }
        }
    }
}
