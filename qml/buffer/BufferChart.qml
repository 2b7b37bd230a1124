import QtQuick
import QtQuick.Layouts
import QtCharts
import PhasePlan

// The titration curve of this buffer (pH against base fraction or titrant volume, the target
// marked) and its buffer capacity against pH. The points come from the designer (repeated solves
// in the core); this view only draws them.
Card {
    id: root

    required property BufferDesigner designer
    property bool inPortrait: false

    title: qsTr("Curves")
    visible: root.designer.valid && root.designer.curvePointCount > 1

    function refill() {
        root.designer.fillSeries(phSeries, "ph")
        root.designer.fillSeries(targetSeries, "target")
        root.designer.fillSeries(recipeSeries, "recipe")
        root.designer.fillSeries(betaSeries, "beta")
        root.designer.fillSeries(betaTarget, "targetBeta")
        // Axis ends and ticks on round numbers (set here, not bound: applyNiceNumbers moves them).
        by.min = 0
        by.max = root.designer.betaMaxMmolPerL
        by.applyNiceNumbers()
    }
    Connections {
        target: root.designer
        function onResultChanged() { if (root.visible) root.refill() }
    }
    // Hidden (another screen shown): drawn when it shows again, not on every edit.
    onVisibleChanged: if (visible) refill()
    Component.onCompleted: refill()

    GridLayout {
        Layout.fillWidth: true
        columns: root.inPortrait ? 2 : 1
        columnSpacing: Theme.gap
        rowSpacing: Theme.gap

        ChartView {

            // Axis numbers with the locale's decimal mark ("0,25" under de_DE).
            localizeNumbers: true
            id: phChart
            objectName: "phChart"
            Layout.fillWidth: true
            Layout.preferredHeight: Theme.tap * 6
            antialiasing: false
            legend.visible: false
            backgroundColor: Theme.card
            plotAreaColor: Theme.card
            margins { left: 0; right: 0; top: 0; bottom: 0 }
            title: qsTr("pH against %1").arg(root.designer.curveXLabel.toLowerCase())
            titleColor: Theme.text
            titleFont.pixelSize: Theme.smallFont

            ValueAxis {
                id: xAxis
                min: 0
                max: root.designer.curveXMax
                labelsColor: Theme.text
                gridLineColor: Theme.line
                labelsFont.pixelSize: Theme.smallFont
                tickCount: 5
                labelFormat: "%.2g"
            }
            ValueAxis {
                id: yAxis
                min: root.designer.curvePhMin
                max: root.designer.curvePhMax
                labelsColor: Theme.text
                gridLineColor: Theme.line
                labelsFont.pixelSize: Theme.smallFont
                tickCount: 5
                labelFormat: "%.1f"
            }
            LineSeries {
                id: phSeries
                axisX: xAxis
                axisY: yAxis
                color: Theme.accent
                width: 3
            }
            LineSeries {
                id: targetSeries
                axisX: xAxis
                axisY: yAxis
                color: Theme.warn
                width: 2
                style: Qt.DashLine
            }
            ScatterSeries {
                id: recipeSeries
                axisX: xAxis
                axisY: yAxis
                color: Theme.warn
                borderColor: Theme.text
                markerSize: Math.round(Theme.gap * 2.2)
            }
        }
        ChartView {
            // Axis numbers with the locale's decimal mark ("0,25" under de_DE).
            localizeNumbers: true
            id: betaChart
            objectName: "betaChart"
            Layout.fillWidth: true
            Layout.preferredHeight: Theme.tap * 6
            antialiasing: false
            legend.visible: false
            backgroundColor: Theme.card
            plotAreaColor: Theme.card
            margins { left: 0; right: 0; top: 0; bottom: 0 }
            title: qsTr("Buffer capacity β (mmol/L per pH) against pH")
            titleColor: Theme.text
            titleFont.pixelSize: Theme.smallFont

            ValueAxis {
                id: bx
                min: root.designer.curvePhMin
                max: root.designer.curvePhMax
                labelsColor: Theme.text
                gridLineColor: Theme.line
                labelsFont.pixelSize: Theme.smallFont
                tickCount: 5
                labelFormat: "%.1f"
            }
            ValueAxis {
                id: by
                labelsColor: Theme.text
                gridLineColor: Theme.line
                labelsFont.pixelSize: Theme.smallFont
                labelFormat: "%.3g"
            }
            LineSeries {
                id: betaSeries
                axisX: bx
                axisY: by
                color: Theme.accent
                width: 3
            }
            LineSeries {
                id: betaTarget
                axisX: bx
                axisY: by
                color: Theme.warn
                width: 2
                style: Qt.DashLine
            }
        }
    }
}
