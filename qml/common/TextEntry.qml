import QtQuick
import QtQuick.Controls
import QtQuick.Layouts

// A labelled line of text (a name, a label, a citation) with its error beneath.
ColumnLayout {
    id: root

    property string label
    property string value
    property string placeholder
    property string error
    property int hints: Qt.ImhNone
    property alias field: input
    /// The name a screen reader and the tests find the field by (the label by default).
    property string accessibleName: label.length > 0 ? label : placeholder

    /// The text changed by typing.
    signal edited(string text)

    spacing: Math.round(Theme.gap / 2)
    // At the top of its cell, as NumberField: a message beside it or beneath it moves nothing.
    Layout.alignment: Qt.AlignTop

    Label {
        text: root.label
        visible: root.label.length > 0
        font.pixelSize: Theme.smallFont
        color: Theme.dimText
        Layout.fillWidth: true
        wrapMode: Text.Wrap
    }
    TextField {
        id: input
        Layout.fillWidth: true
        Layout.preferredHeight: Theme.tap
        font.pixelSize: Theme.fontSize
        // Set, not bound: a binding would overwrite the text while the user types.
        Component.onCompleted: text = root.value
        placeholderText: root.placeholder
        inputMethodHints: root.hints
        selectByMouse: true
        Accessible.name: root.accessibleName
        onTextEdited: root.edited(text)
        Connections {
            target: root
            function onValueChanged() {
                if (!input.activeFocus)
                    input.text = root.value
            }
        }
    }
    Label {
        Layout.fillWidth: true
        Layout.preferredWidth: 0 // wraps in the field's width, widening no column
        visible: root.error.length > 0
        text: root.error
        color: Theme.bad
        wrapMode: Text.Wrap
        font.pixelSize: Theme.smallFont
    }
}
