import QtQuick
import QtQuick.Controls
import PhasePlan

// A number in a table cell: a touch-height field read by NumberText ("." or "," as the decimal
// mark, thousands separators refused). While its text is not a complete number it is shown in
// the warning colour, its message is in `parseError` (the row shows it), the value is not passed
// on, and it counts itself in the page's `pendingInputs`.
TextField {
    id: root

    property real value: 0
    property int decimals: 1
    property string accessibleName
    property var locale: Qt.locale()
    property string parseError: ""
    /// The model's value when typing began, restored while the text is not a number.
    property real valueAtFocus: NaN
    readonly property bool pending: parseError.length > 0

    signal edited(real value)

    function formatted(v) { return NumberText.shownIn(v, root.decimals, root.locale) }

    property Item pendingHolder: null
    onPendingChanged: {
        if (!pendingHolder)
            for (var p = root.parent; p; p = p.parent)
                if (p.pendingInputs !== undefined) { pendingHolder = p; break }
        if (pendingHolder)
            pendingHolder.pendingInputs += pending ? 1 : -1
    }
    Component.onDestruction: if (pending && pendingHolder) pendingHolder.pendingInputs -= 1

    implicitHeight: Theme.tap
    font.pixelSize: Theme.fontSize
    horizontalAlignment: TextInput.AlignRight
    inputMethodHints: Qt.ImhFormattedNumbersOnly
    selectByMouse: true
    color: pending ? Theme.warn : Theme.text
    // Set, not bound: a binding would overwrite the text while the user types.
    Component.onCompleted: text = formatted(root.value)
    Accessible.name: root.accessibleName
    onTextEdited: {
        var p = NumberText.parse(text, false, root.accessibleName)
        if (!p.ok) {
            parseError = p.message
            if (activeFocus && !isNaN(valueAtFocus) && root.value !== valueAtFocus)
                root.edited(valueAtFocus)
            return
        }
        parseError = ""
        root.edited(p.value)
    }
    onActiveFocusChanged: {
        if (activeFocus)
            valueAtFocus = root.value
        if (!activeFocus && !pending)
            text = formatted(root.value)
    }
    Keys.onEscapePressed: {
        parseError = ""
        if (!isNaN(valueAtFocus) && root.value !== valueAtFocus)
            root.edited(valueAtFocus)
        text = formatted(root.value)
    }
    onValueChanged: {
        if (!activeFocus)
            text = formatted(root.value)
    }
}
