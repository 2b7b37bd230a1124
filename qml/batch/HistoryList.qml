import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// The batch's record, newest first: who changed what, when, from what to what, and why.
Column {
    id: root

    /// BatchModel.history: [{seq, at, who, action, field, oldValue, newValue, reason, label, text}],
    /// oldest first; `text` is the change in the screens' words.
    property var entries: []
    /// How many of the newest to show.
    property int shown: 12

    spacing: Theme.gap

    function valueText(v) {
        if (v === undefined || v === null)
            return "–"
        if (typeof v === "number")
            return Number(v).toLocaleString(Qt.locale(), "f", Math.abs(v) >= 100 ? 1 : 4).replace(/0+$/, "").replace(/[.,]$/, "")
        if (typeof v === "object")
            return JSON.stringify(v).substring(0, 60)
        return String(v)
    }
    function actionWords(action) {
        switch (action) {
        case "create": return qsTr("Created")
        case "edit": return qsTr("Changed")
        case "amend": return qsTr("Amended")
        case "print": return qsTr("Printed")
        }
        return action
    }
    function at(index) {
        return root.entries[root.entries.length - 1 - index]
    }

    Repeater {
        model: Math.min(root.entries.length, root.shown)
        delegate: Column {
            id: entry
            required property int index
            readonly property var item: root.at(index)
            width: root.width
            spacing: 2
            Label {
                width: entry.width
                text: qsTr("%1 · %2 · %3").arg(root.actionWords(entry.item.action))
                                            .arg(Qt.formatDateTime(new Date(entry.item.at), "yyyy-MM-dd HH:mm"))
                                            .arg(entry.item.who)
                color: entry.item.action === "amend" ? Theme.warn : Theme.dimText
                font.pixelSize: Theme.smallFont
                font.bold: true
                elide: Text.ElideRight
            }
            Label {
                width: entry.width
                visible: entry.item.field.length > 0
                text: entry.item.text !== undefined ? entry.item.text
                      : qsTr("%1: %2 → %3").arg(entry.item.field).arg(root.valueText(entry.item.oldValue))
                                          .arg(root.valueText(entry.item.newValue))
                wrapMode: Text.Wrap
                font.pixelSize: Theme.fontSize
            }
            Label {
                width: entry.width
                visible: entry.item.reason.length > 0
                text: qsTr("Reason: %1").arg(entry.item.reason)
                wrapMode: Text.Wrap
                color: Theme.dimText
                font.pixelSize: Theme.smallFont
            }
        }
    }
    Label {
        width: root.width
        visible: root.entries.length > root.shown
        text: qsTr("… and %n earlier change(s)", "", root.entries.length - root.shown)
        color: Theme.dimText
        font.pixelSize: Theme.smallFont
    }
}
