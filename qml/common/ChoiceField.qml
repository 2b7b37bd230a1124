import QtQuick
import QtQuick.Controls
import QtQuick.Layouts

// A labelled picker over a list of {id, name} entries (from a model), with its error beneath.
ColumnLayout {
    id: root

    property string label
    /// [{id, name}] as the models give them.
    property var choices: []
    /// The id shown as chosen.
    property string current
    property string error
    readonly property alias box: combo
    /// The name a screen reader and the tests find the picker by (the label by default).
    property string accessibleName: label

    /// The user picked an id.
    signal picked(string id)

    spacing: Math.round(Theme.gap / 2)
    // At the top of its cell, as NumberField: a message beside it or beneath it moves nothing.
    Layout.alignment: Qt.AlignTop

    function indexOfId(id) {
        for (var i = 0; i < root.choices.length; ++i)
            if (root.choices[i].id === id)
                return i
        return -1
    }

    Label {
        text: root.label
        visible: root.label.length > 0
        font.pixelSize: Theme.smallFont
        color: Theme.dimText
        Layout.fillWidth: true
        elide: Text.ElideRight
    }
    ComboBox {
        id: combo
        Layout.fillWidth: true
        Layout.preferredHeight: Theme.tap
        font.pixelSize: Theme.fontSize
        model: root.choices
        textRole: "name"
        valueRole: "id"
        currentIndex: root.indexOfId(root.current)
        displayText: currentIndex < 0 ? (root.current.length > 0 ? root.current : qsTr("(choose)")) : currentText
        Accessible.name: root.accessibleName
        delegate: ItemDelegate {
            required property var modelData
            required property int index
            width: combo.width
            height: Theme.tap
            text: modelData.name
            font.pixelSize: Theme.fontSize
            highlighted: combo.highlightedIndex === index
        }
        onActivated: function(index) { root.picked(root.choices[index].id) }
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
