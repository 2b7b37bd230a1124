import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// One reagent of the batch: what the recipe asks for and its band, what was actually weighed or
// measured and the lot, and whether it is within the band. Every number comes from the model.
Rectangle {
    id: root

    required property int index
    required property string name
    required property string unit
    required property real target
    required property real low
    required property real high
    required property bool entered
    required property real actual
    required property real deviationPercent
    required property bool withinTolerance
    required property string lot
    required property string error
    /// The BatchModel the row belongs to.
    property BatchModel batch
    property bool narrow: false

    /// About four significant figures, as the sheet prints amounts.
    function decimalsFor(v) {
        if (!(v > 0))
            return 3
        return Math.max(0, Math.min(4, 3 - Math.floor(Math.log(v) / Math.LN10)))
    }
    function amount(v) {
        return Number(v).toLocaleString(Qt.locale(), "f", decimalsFor(root.target))
    }
    readonly property bool flagged: root.entered && !root.withinTolerance

    implicitHeight: grid.implicitHeight + 2 * Theme.gap
    radius: Theme.radius
    color: "transparent"
    border.color: flagged ? Theme.bad : Theme.line
    border.width: flagged ? 2 : 1

    GridLayout {
        id: grid
        anchors.fill: parent
        anchors.margins: Theme.gap
        columns: root.narrow ? 2 : 4
        columnSpacing: Theme.margin
        rowSpacing: Theme.gap

        ColumnLayout {
            Layout.columnSpan: root.narrow ? 2 : 1
            Layout.fillWidth: true
            Layout.preferredWidth: Theme.tap * 4
            Layout.alignment: Qt.AlignTop
            spacing: 2
            Label {
                Layout.fillWidth: true
                text: root.name
                font.bold: true
                font.pixelSize: Theme.fontSize
                wrapMode: Text.Wrap
            }
            Label {
                objectName: "band"
                Layout.fillWidth: true
                text: qsTr("target %1 %2 · band %3–%4 %2").arg(root.amount(root.target)).arg(root.unit)
                                                              .arg(root.amount(root.low)).arg(root.amount(root.high))
                color: Theme.dimText
                font.pixelSize: Theme.smallFont
                wrapMode: Text.Wrap
            }
            Label {
                objectName: "flag"
                Layout.fillWidth: true
                text: !root.entered ? qsTr("not entered yet")
                                    : (root.withinTolerance ? qsTr("✓ within band (%1 %)")
                                                            : qsTr("⚠ outside band (%1 %)"))
                                      .arg((root.deviationPercent >= 0 ? "+" : "") + NumberText.format(root.deviationPercent, 1))
                color: !root.entered ? Theme.dimText : (root.withinTolerance ? Theme.good : Theme.bad)
                font.pixelSize: Theme.smallFont
                font.bold: root.flagged
                wrapMode: Text.Wrap
            }
        }
        AmountEntry {
            objectName: "actualField"
            Layout.fillWidth: true
            Layout.preferredWidth: Theme.tap * 3
            Layout.alignment: Qt.AlignTop
            label: qsTr("Actual")
            unit: root.unit
            value: root.entered ? root.actual : NaN
            decimals: root.decimalsFor(root.target)
            error: root.error
            onEdited: function(v) { root.batch.setActual(root.index, v) }
        }
        TextEntry {
            id: lotEntry
            objectName: "lotField"
            Layout.fillWidth: true
            Layout.preferredWidth: Theme.tap * 3
            Layout.alignment: Qt.AlignTop
            label: qsTr("Lot")
            value: root.lot
            placeholder: qsTr("lot number")
            Connections {
                target: lotEntry.field
                function onEditingFinished() { root.batch.setLot(root.index, lotEntry.field.text) }
            }
        }
    }
}
