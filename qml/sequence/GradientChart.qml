import QtQuick
import QtQuick.Layouts
import QtCharts
import PhasePlan

// The gradient table as the pump runs it: % of each line against time over one injection.
ChartView {
    // Axis numbers with the locale's decimal mark ("0,25" under de_DE).
    localizeNumbers: true
    id: root

    required property GradientModel gradient
    /// Set while the gradient table has an error: the lines as typed would mislead (times out of
    /// order draw lines that run backwards), so they are faded under a notice.
    property string pausedText: ""

    Layout.preferredHeight: Theme.tap * 5
    antialiasing: true
    backgroundColor: Theme.card
    plotAreaColor: Theme.card
    legend.labelColor: Theme.text
    legend.font.pixelSize: Theme.smallFont
    legend.alignment: Qt.AlignBottom
    margins { left: 0; right: 0; top: 0; bottom: 0 }

    function refill() {
        var letters = root.gradient.letters
        for (var i = 0; i < 4; ++i) {
            var s = [sa, sb, sc, sd][i]
            s.visible = i < letters.length
            s.name = i < letters.length ? qsTr("Line %1").arg(letters[i]) : ""
            root.gradient.fillSeries(s, i < letters.length ? letters[i] : "")
        }
    }
    Connections {
        target: root.gradient
        function onMethodChanged() { if (root.visible) root.refill() }
    }
    onVisibleChanged: if (visible) refill()
    Component.onCompleted: refill()

    ValueAxis {
        id: tx
        min: 0
        max: Math.max(1, root.gradient.runMin + root.gradient.equilibrationMin)
        labelsColor: Theme.text
        gridLineColor: Theme.line
        labelsFont.pixelSize: Theme.smallFont
        titleText: qsTr("min")
        titleBrush: Theme.text
        // A short method (a few minutes, as after a move to a smaller column) needs tenths, or
        // ticks at 0.5 and 1.0 both read "1".
        labelFormat: max < 6 ? "%.1f" : "%.0f"
    }
    ValueAxis {
        id: py
        min: 0
        max: 100
        labelsColor: Theme.text
        gridLineColor: Theme.line
        labelsFont.pixelSize: Theme.smallFont
        labelFormat: "%.0f"
        tickCount: 5
    }
    LineSeries { id: sa; axisX: tx; axisY: py; color: Theme.lineColours[0]; width: 3; opacity: root.pausedText ? 0.15 : 1 }
    LineSeries { id: sb; axisX: tx; axisY: py; color: Theme.lineColours[1]; width: 3; opacity: root.pausedText ? 0.15 : 1 }
    LineSeries { id: sc; axisX: tx; axisY: py; color: Theme.lineColours[2]; width: 3; opacity: root.pausedText ? 0.15 : 1 }
    LineSeries { id: sd; axisX: tx; axisY: py; color: Theme.lineColours[3]; width: 3; opacity: root.pausedText ? 0.15 : 1 }

    Rectangle {
        objectName: "gradientChartPaused"
        visible: root.pausedText.length > 0
        x: root.plotArea.x
        y: root.plotArea.y
        width: root.plotArea.width
        height: root.plotArea.height
        color: Qt.rgba(Theme.card.r, Theme.card.g, Theme.card.b, 0.8)
        Text {
            anchors.fill: parent
            anchors.margins: Theme.gap
            horizontalAlignment: Text.AlignHCenter
            verticalAlignment: Text.AlignVCenter
            wrapMode: Text.Wrap
            color: Theme.text
            font.pixelSize: Theme.fontSize
            text: root.pausedText
        }
    }
}
