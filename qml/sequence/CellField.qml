import QtQuick
import QtQuick.Controls
import PhasePlan

// A number in a table cell: a touch-height field, parsed in the user's locale, shown in red while
// its text is not a number (the value is then not passed on).
TextField {
    id: root

    property real value: 0
    property int decimals: 1
    property string accessibleName
    property var locale: Qt.locale()
    readonly property bool textValid: !isNaN(root.parsed(text))

    signal edited(real value)

    function parsed(t) {
        try {
            return Number.fromLocaleString(root.locale, t.trim())
        } catch (e) {
            return NaN
        }
    }

    implicitHeight: Theme.tap
    font.pixelSize: Theme.fontSize
    horizontalAlignment: TextInput.AlignRight
    inputMethodHints: Qt.ImhFormattedNumbersOnly
    selectByMouse: true
    color: textValid ? Theme.text : Theme.bad
    // Set, not bound: a binding would overwrite the text while the user types.
    Component.onCompleted: text = Number(root.value).toLocaleString(root.locale, "f", root.decimals)
    Accessible.name: root.accessibleName
    onTextEdited: {
        var v = root.parsed(text)
        if (!isNaN(v))
            root.edited(v)
    }
    onActiveFocusChanged: {
        if (!activeFocus && textValid)
            text = Number(root.value).toLocaleString(root.locale, "f", root.decimals)
    }
    onValueChanged: {
        if (!activeFocus)
            text = Number(root.value).toLocaleString(root.locale, "f", root.decimals)
    }
}
