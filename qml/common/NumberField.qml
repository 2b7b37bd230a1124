import QtQuick
import QtQuick.Controls
import QtQuick.Layouts

// A number with its label and unit, − and + step buttons, and its error shown right beneath it.
// Text is parsed in the user's locale (Number.fromLocaleString: "7,25" in a decimal-comma
// locale); text that is not a number is reported here and never reaches the model. The model's
// own check (the core's error naming this field) comes in through `error`.
ColumnLayout {
    id: root

    /// What the number is ("Target pH").
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
    property alias field: input
    property var locale: Qt.locale()
    /// The message for text that is not a number (read by the tests).
    readonly property string parseError: input.parseError

    /// A new number from typing or the step buttons.
    signal edited(real value)

    spacing: Math.round(Theme.gap / 2)

    function formatted(v) {
        return Number(v).toLocaleString(root.locale, "f", root.integer ? 0 : root.decimals)
    }
    function stepBy(n) {
        var base = input.acceptableInput ? root.parsed(input.text) : root.value
        if (isNaN(base))
            base = root.value
        var v = Math.min(root.to, Math.max(root.from, base + n * root.step))
        // Round to the step's decimals so that 0.1 + 0.2 shows as 0.3.
        v = Number(v.toFixed(root.integer ? 0 : Math.max(root.decimals, 0)))
        input.text = root.formatted(v)
        input.parseError = ""
        root.edited(v)
    }
    function parsed(text) {
        try {
            return Number.fromLocaleString(root.locale, text.trim())
        } catch (e) {
            return NaN
        }
    }

    Label {
        text: root.label
        font.pixelSize: Theme.smallFont
        color: Theme.dimText
        visible: root.label.length > 0
        Layout.fillWidth: true
        elide: Text.ElideRight
    }

    RowLayout {
        spacing: Math.round(Theme.gap / 2)
        Layout.fillWidth: true

        Button {
            text: "−"
            font.pixelSize: Theme.largeFont
            Layout.preferredWidth: Theme.tap
            Layout.preferredHeight: Theme.tap
            enabled: root.enabled && root.value > root.from
            Accessible.name: qsTr("Decrease %1").arg(root.label)
            onClicked: root.stepBy(-1)
        }
        TextField {
            id: input
            property string parseError: ""
            Layout.fillWidth: true
            Layout.minimumWidth: Math.round(Theme.tap * 1.3)
            Layout.preferredHeight: Theme.tap
            font.pixelSize: Theme.fontSize
            horizontalAlignment: TextInput.AlignRight
            inputMethodHints: root.integer ? Qt.ImhDigitsOnly : Qt.ImhFormattedNumbersOnly
            selectByMouse: true
            // Set, not bound: a binding would overwrite the text while the user types.
            Component.onCompleted: text = root.formatted(root.value)
            Accessible.name: root.label
            onTextEdited: {
                var v = root.parsed(text)
                if (text.trim().length === 0 || isNaN(v)) {
                    parseError = qsTr("Not a valid number.")
                    return
                }
                if (root.integer && Math.round(v) !== v) {
                    parseError = qsTr("Enter a whole number.")
                    return
                }
                parseError = ""
                root.edited(v)
            }
            onActiveFocusChanged: {
                // Leaving the field shows the value the model holds, in the locale's format.
                if (!activeFocus && parseError.length === 0)
                    text = root.formatted(root.value)
            }
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
            text: "+"
            font.pixelSize: Theme.largeFont
            Layout.preferredWidth: Theme.tap
            Layout.preferredHeight: Theme.tap
            enabled: root.enabled && root.value < root.to
            Accessible.name: qsTr("Increase %1").arg(root.label)
            onClicked: root.stepBy(1)
        }
    }

    Label {
        id: message
        Layout.fillWidth: true
        visible: text.length > 0
        text: input.parseError.length > 0 ? input.parseError : root.error
        color: Theme.bad
        wrapMode: Text.Wrap
        font.pixelSize: Theme.smallFont
    }
}
