import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// The amount actually weighed or measured: empty until entered, parsed in the user's locale
// ("2,981" in a decimal-comma locale). Text that is not a number is reported here and never
// reaches the model; the core's own check comes in through `error`.
ColumnLayout {
    id: root

    property string label
    property string unit
    /// The stored amount, NaN when none was entered.
    property real value: NaN
    property int decimals: 3
    property string error
    property alias field: input
    readonly property string parseError: input.parseError

    /// A new amount; NaN when the field was cleared.
    signal edited(real value)

    spacing: Math.round(Theme.gap / 2)

    function formatted(v) {
        return isNaN(v) ? "" : Number(v).toLocaleString(Qt.locale(), "f", root.decimals)
    }

    Label {
        text: root.label
        visible: root.label.length > 0
        font.pixelSize: Theme.smallFont
        color: Theme.dimText
        Layout.fillWidth: true
        elide: Text.ElideRight
    }
    RowLayout {
        Layout.fillWidth: true
        spacing: Math.round(Theme.gap / 2)
        TextField {
            id: input
            property string parseError: ""
            Layout.fillWidth: true
            Layout.minimumWidth: Math.round(Theme.tap * 1.6)
            Layout.preferredHeight: Theme.tap
            font.pixelSize: Theme.fontSize
            horizontalAlignment: TextInput.AlignRight
            inputMethodHints: Qt.ImhFormattedNumbersOnly
            placeholderText: qsTr("not entered")
            selectByMouse: true
            // Set, not bound: a binding would overwrite the text while the user types.
            Component.onCompleted: text = root.formatted(root.value)
            Accessible.name: root.label
            onEditingFinished: {
                var t = text.trim()
                if (t.length === 0) {
                    parseError = ""
                    if (!isNaN(root.value))
                        root.edited(NaN)
                    return
                }
                var v = NaN
                try {
                    v = Number.fromLocaleString(Qt.locale(), t)
                } catch (e) {
                    v = NaN
                }
                if (isNaN(v)) {
                    parseError = qsTr("Not a valid number.")
                    return
                }
                parseError = ""
                if (v !== root.value)
                    root.edited(v)
            }
            Connections {
                target: root
                function onValueChanged() {
                    if (!input.activeFocus && input.parseError.length === 0)
                        input.text = root.formatted(root.value)
                }
            }
        }
        Label {
            text: root.unit
            visible: root.unit.length > 0
            font.pixelSize: Theme.fontSize
        }
    }
    Label {
        Layout.fillWidth: true
        visible: text.length > 0
        text: input.parseError.length > 0 ? input.parseError : root.error
        color: Theme.bad
        wrapMode: Text.Wrap
        font.pixelSize: Theme.smallFont
    }
}
