import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// A number with its label and unit, − and + step buttons, and its message right beneath it.
// Typing is read by NumberText: "." and "," are both decimal marks, a thousands separator is
// refused (never guessed), and a value reaches the model only when the text is a complete number.
// Until then the field says "not applied" and counts itself in the nearest ancestor's
// `pendingInputs`, so the screen can grey the results that still show the old value. The model's
// own check (the core's error naming this field) comes in through `error`.
ColumnLayout {
    id: root

    /// What the number is ("Target pH"); also the field's accessible name and its messages' subject.
    property string label
    /// The unit shown after the field ("mL", "°C"); empty for none.
    property string unit
    /// The value shown when the field is not being typed in.
    property real value: 0
    property real step: 1
    property real from: -1e9
    property real to: 1e9
    /// Decimals shown.
    property int decimals: 2
    /// The message of the model's check for this field, "" when it is fine.
    property string error
    /// Whole numbers only (injections).
    property bool integer: false
    /// Hide the step buttons (narrow table cells).
    property bool stepButtons: true
    property alias field: input
    property var locale: Qt.locale()
    /// Empty text is allowed and means "no value" (NaN, shown as `placeholder`): amounts not
    /// entered yet, a pH not measured.
    property bool optional: false
    property string placeholder
    /// Apply when editing finishes (Enter, or focus leaves) rather than on every complete number:
    /// for records that store each applied value with its history.
    property bool applyOnFinish: false
    /// The message for text that is not (yet) a number; "" when the text is applied.
    readonly property string parseError: input.parseError
    /// The text on screen is not what the model holds (incomplete or invalid).
    readonly property bool pending: input.parseError.length > 0

    /// A new number from typing or the step buttons.
    signal edited(real value)

    spacing: Math.round(Theme.gap / 2)
    // At the top of its cell in a row or grid: the message beneath grows the field downwards,
    // and a field beside it stays where it was (a layout centres its cells by default, so a
    // message under Run moved Flow down by half its height).
    Layout.alignment: Qt.AlignTop

    function formatted(v) {
        if (root.optional && isNaN(v))
            return ""
        return root.integer ? NumberText.formatIn(v, 0, root.locale)
                            : NumberText.shownIn(v, root.decimals, root.locale)
    }
    /// {ok, value, message} for `text`: NaN for an empty optional field.
    function checked(text) {
        if (root.optional && text.trim().length === 0)
            return {ok: true, value: NaN, message: ""}
        var p = NumberText.parse(text, root.integer, root.label)
        if (!p.ok)
            return {ok: false, value: NaN, message: p.message}
        // One bound at a time: the field's other bound may be a wide default nobody set.
        if (p.value < root.from || p.value > root.to)
            return {ok: false, value: NaN,
                    message: (p.value < root.from ? qsTr("%1: %2 is less than %3; not applied.")
                                                   : qsTr("%1: %2 is more than %3; not applied."))
                        .arg(root.label.length > 0 ? root.label : qsTr("This field"))
                        .arg(text.trim())
                        .arg(NumberText.formatIn(p.value < root.from ? root.from : root.to,
                                                 root.integer ? 0 : root.decimals, root.locale))}
        return {ok: true, value: p.value, message: ""}
    }
    function same(a, b) {
        return a === b || (isNaN(a) && isNaN(b))
    }
    function parsed(text) {
        var p = NumberText.parse(text, root.integer, root.label)
        return p.ok ? p.value : NaN
    }
    function stepBy(n) {
        var base = root.pending ? root.value : root.parsed(input.text)
        if (isNaN(base))
            base = root.value
        var v = Math.min(root.to, Math.max(root.from, base + n * root.step))
        // Round to the step's decimals so that 0.1 + 0.2 shows as 0.3.
        v = Number(v.toFixed(root.integer ? 0 : Math.max(root.decimals, 0)))
        input.text = root.formatted(v)
        input.parseError = ""
        root.edited(v)
    }
    /// Drops what was typed: the model gets back the value it held when typing began, and the
    /// field shows it again.
    function revert() {
        input.parseError = ""
        if (input.activeFocus && !root.applyOnFinish && !root.same(root.value, input.valueAtFocus))
            root.edited(input.valueAtFocus)
        input.text = root.formatted(root.value)
    }

    // ---- pending count on the screen ------------------------------------------------------
    property Item pendingHolder: null
    function findHolder() {
        for (var p = root.parent; p; p = p.parent)
            if (p.pendingInputs !== undefined)
                return p
        return null
    }
    onPendingChanged: {
        if (!root.pendingHolder)
            root.pendingHolder = root.findHolder()
        if (root.pendingHolder)
            root.pendingHolder.pendingInputs += root.pending ? 1 : -1
    }
    Component.onDestruction: {
        if (root.pending && root.pendingHolder)
            root.pendingHolder.pendingInputs -= 1
    }

    Label {
        text: root.label
        font.pixelSize: Theme.smallFont
        color: Theme.dimText
        visible: root.label.length > 0
        Layout.fillWidth: true
        wrapMode: Text.Wrap
    }

    RowLayout {
        spacing: Math.round(Theme.gap / 2)
        Layout.fillWidth: true

        Button {
            visible: root.stepButtons
            text: "−"
            font.pixelSize: Theme.largeFont
            Layout.preferredWidth: Theme.tap
            Layout.preferredHeight: Theme.tap
            enabled: root.enabled && root.value > root.from
            focusPolicy: Qt.NoFocus
            Accessible.name: qsTr("Decrease %1").arg(root.label)
            onClicked: root.stepBy(-1)
        }
        TextField {
            id: input
            property string parseError: ""
            /// The model's value when typing began: what the model goes back to while the text
            /// is not a number (a half-typed "1.000,5" never leaves 1 in the model).
            property real valueAtFocus: NaN
            Layout.fillWidth: true
            Layout.minimumWidth: Math.round(Theme.tap * 1.3)
            Layout.preferredHeight: Theme.tap
            font.pixelSize: Theme.fontSize
            horizontalAlignment: TextInput.AlignRight
            // Formatted numbers: the on-screen keyboard offers the digits, "." and ",".
            inputMethodHints: root.integer ? Qt.ImhDigitsOnly : Qt.ImhFormattedNumbersOnly
            selectByMouse: true
            // Set, not bound: a binding would overwrite the text while the user types.
            Component.onCompleted: text = root.formatted(root.value)
            Accessible.name: root.label.length > 0 ? root.label : qsTr("Number")
            Accessible.description: root.unit
            placeholderText: root.placeholder
            onTextEdited: {
                var p = root.checked(text)
                parseError = p.message
                if (root.applyOnFinish)
                    return
                if (p.ok)
                    root.edited(p.value)
                else if (activeFocus && !root.same(root.value, valueAtFocus))
                    root.edited(valueAtFocus)
            }
            onEditingFinished: {
                if (!root.applyOnFinish)
                    return
                var p = root.checked(text)
                parseError = p.message
                if (p.ok && !root.same(p.value, root.value))
                    root.edited(p.value)
            }
            onActiveFocusChanged: {
                if (activeFocus)
                    valueAtFocus = root.value
                // Leaving the field shows the value the model holds, in the locale's format.
                if (!activeFocus && parseError.length === 0)
                    text = root.formatted(root.value)
            }
            Keys.onEscapePressed: root.revert()
            Connections {
                target: root
                function onValueChanged() {
                    if (!input.activeFocus)
                        input.text = root.formatted(root.value)
                }
                function onLocaleChanged() {
                    input.text = root.formatted(root.value)
                }
            }
        }
        Label {
            text: root.unit
            visible: root.unit.length > 0
            font.pixelSize: Theme.fontSize
        }
        Button {
            visible: root.stepButtons
            text: "+"
            font.pixelSize: Theme.largeFont
            Layout.preferredWidth: Theme.tap
            Layout.preferredHeight: Theme.tap
            enabled: root.enabled && root.value < root.to
            focusPolicy: Qt.NoFocus
            Accessible.name: qsTr("Increase %1").arg(root.label)
            onClicked: root.stepBy(1)
        }
    }

    Label {
        id: message
        objectName: "fieldMessage"
        Layout.fillWidth: true
        // The message wraps in the width the field has: its unwrapped width must not widen the
        // field's column and narrow the one beside it.
        Layout.preferredWidth: 0
        visible: text.length > 0
        text: input.parseError.length > 0 ? input.parseError : root.error
        color: input.parseError.length > 0 ? Theme.warn : Theme.bad
        wrapMode: Text.Wrap
        font.pixelSize: Theme.smallFont
    }
}
