import QtQuick
import QtQuick.Controls

// One warning: its severity as a coloured bar and word, the core's message, and what to do.
// Built from anchors and a Column rather than nested layouts: wrapped text whose height depends
// on its width settles in one pass this way.
Item {
    id: root

    property string severity: "info"
    property string message
    /// What to do about it; hidden when empty.
    property string advice
    /// Where it comes from ("Line A"); hidden when empty.
    property string source

    implicitWidth: Theme.tap * 6
    implicitHeight: column.implicitHeight

    Rectangle {
        id: bar
        anchors.left: parent.left
        anchors.top: parent.top
        anchors.bottom: parent.bottom
        width: Math.max(4, Math.round(Theme.gap / 1.5))
        radius: width / 2
        color: Theme.severityColour(root.severity)
    }
    Column {
        id: column
        anchors.left: bar.right
        anchors.leftMargin: Theme.gap
        anchors.right: parent.right
        spacing: 2
        Label {
            width: column.width
            text: (root.source.length > 0 ? root.source + " · " : "") + root.severity.toUpperCase()
            color: Theme.severityColour(root.severity)
            font.pixelSize: Theme.smallFont
            font.bold: true
            elide: Text.ElideRight
        }
        Label {
            width: column.width
            text: root.message
            wrapMode: Text.Wrap
            font.pixelSize: Theme.fontSize
        }
        Label {
            width: column.width
            visible: root.advice.length > 0
            text: qsTr("What to do: %1").arg(root.advice)
            wrapMode: Text.Wrap
            color: Theme.dimText
            font.pixelSize: Theme.smallFont
        }
    }
}
