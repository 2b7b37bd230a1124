import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import QtCharts
import PhasePlan

// Each bottle's level through the night (from the core's volumes at each row's end), the
// unusable residue, the run-dry points, and the waste container filling up.
Card {
    id: root

    required property Plan plan

    title: qsTr("Bottles through the night")

    function refill() {
        var letters = root.plan.lineLetters
        var series = [la, lb, lc, ld]
        var dry = [da, db, dc, dd]
        for (var i = 0; i < 4; ++i) {
            var l = "ABCD"[i]
            var on = letters.indexOf(l) >= 0
            series[i].visible = on
            dry[i].visible = on
            root.plan.fillLevelSeries(series[i], on ? l : "")
            root.plan.fillDrySeries(dry[i], on ? l : "")
        }
        root.plan.fillWasteSeries(waste)
        // Round axis ends and ticks (set here, not bound: applyNiceNumbers moves them).
        hx.min = 0
        hx.max = root.plan.chartHours
        hx.applyNiceNumbers()
        my.min = 0
        my.max = root.plan.chartMaxMl
        my.applyNiceNumbers()
    }
    Connections {
        target: root.plan
        function onResultChanged() { if (root.visible) root.refill() }
    }
    // Hidden (another screen shown): drawn when it shows again, not on every edit.
    onVisibleChanged: if (visible) refill()
    Component.onCompleted: refill()

    ChartView {
        // Whole mL ("%.0f") left unlocalized: a localized axis groups thousands ("4.000" mL under
        // de_DE reads as 4 mL).
        objectName: "bottleChart"
        Layout.fillWidth: true
        Layout.preferredHeight: Theme.tap * 7
        antialiasing: true
        backgroundColor: Theme.card
        plotAreaColor: Theme.card
        legend.visible: false
        margins { left: 0; right: 0; top: 0; bottom: 0 }

        ValueAxis {
            id: hx
            labelsColor: Theme.text
            gridLineColor: Theme.line
            labelsFont.pixelSize: Theme.smallFont
            titleText: qsTr("hours from the start")
            titleBrush: Theme.text
            labelFormat: "%.0f"
        }
        ValueAxis {
            id: my
            labelsColor: Theme.text
            gridLineColor: Theme.line
            labelsFont.pixelSize: Theme.smallFont
            titleText: "mL"
            titleBrush: Theme.text
            labelFormat: "%.0f"
        }
        LineSeries { id: la; axisX: hx; axisY: my; color: Theme.lineColours[0]; width: 3 }
        LineSeries { id: lb; axisX: hx; axisY: my; color: Theme.lineColours[1]; width: 3 }
        LineSeries { id: lc; axisX: hx; axisY: my; color: Theme.lineColours[2]; width: 3 }
        LineSeries { id: ld; axisX: hx; axisY: my; color: Theme.lineColours[3]; width: 3 }
        LineSeries { id: waste; axisX: hx; axisY: my; color: Theme.dimText; width: 2; style: Qt.DashLine }
        ScatterSeries { id: da; axisX: hx; axisY: my; color: Theme.bad; markerSize: Theme.gap * 2.5 }
        ScatterSeries { id: db; axisX: hx; axisY: my; color: Theme.bad; markerSize: Theme.gap * 2.5 }
        ScatterSeries { id: dc; axisX: hx; axisY: my; color: Theme.bad; markerSize: Theme.gap * 2.5 }
        ScatterSeries { id: dd; axisX: hx; axisY: my; color: Theme.bad; markerSize: Theme.gap * 2.5 }
    }

    // The legend as touch-readable text: which colour is which bottle, the waste, the dry point.
    Flow {
        Layout.fillWidth: true
        spacing: Theme.margin
        Repeater {
            // The count, not the list: rows updated in place (see NightSummary).
            model: root.plan.bottleCount
            delegate: Row {
                required property int index
                readonly property var modelData: root.plan.bottleCount > index ? root.plan.bottleAt(index) : ({})
                spacing: Math.round(Theme.gap / 2)
                Rectangle {
                    width: Theme.gap * 3
                    height: 4
                    anchors.verticalCenter: parent.verticalCenter
                    color: Theme.lineColours["ABCD".indexOf(modelData.letter)]
                }
                Label {
                    text: modelData.letter + ": " + modelData.name
                    font.pixelSize: Theme.smallFont
                }
            }
        }
        Row {
            spacing: Math.round(Theme.gap / 2)
            Rectangle {
                width: Theme.gap * 3
                height: 2
                anchors.verticalCenter: parent.verticalCenter
                color: Theme.dimText
            }
            Label {
                text: qsTr("waste (dashed)")
                font.pixelSize: Theme.smallFont
            }
        }
        Row {
            spacing: Math.round(Theme.gap / 2)
            Rectangle {
                width: Theme.gap * 2
                height: width
                radius: width / 2
                anchors.verticalCenter: parent.verticalCenter
                color: Theme.bad
            }
            Label {
                text: qsTr("runs dry")
                font.pixelSize: Theme.smallFont
            }
        }
    }
}
