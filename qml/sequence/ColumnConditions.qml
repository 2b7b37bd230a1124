import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import QtCharts
import PhasePlan

// What the column sees during one injection of the method being edited: the eluent's pH (s_s
// scale: the buffer diluted into the organic part, at the column's temperature) and the pressure
// the gradient makes, against the column's or the pump's limit. Both come from the core's
// sequence result (eluent_trace, methods.<name>.pressure); the card shows the last valid plan.
Card {
    id: root

    required property Plan plan
    /// The method shown.
    property string method

    // Hidden (another screen shown), the card does not follow the plan: a buffer edit changes the
    // eluent's pH on every keystroke, and the card is brought up to date when it shows again.
    property var conditions: ({})
    function refresh() {
        if (!root.visible)
            return
        root.conditions = root.plan.methodConditions(root.method)
        root.plan.fillConditionSeries(phSeries, root.method, "ph")
        root.plan.fillConditionSeries(barSeries, root.method, "pressure")
        root.plan.fillConditionSeries(limitSeries, root.method, "limit")
    }
    onMethodChanged: { refresh(); refreshColumn() }
    onVisibleChanged: if (visible) { refresh(); refreshColumn() }
    Component.onCompleted: { refresh(); refreshColumn() }
    Connections {
        target: root.plan
        function onResultChanged() { root.refresh() }
    }

    title: qsTr("What the column sees")
    note: root.method.length > 0 ? qsTr("method “%1”, one injection").arg(root.method) : ""

    ColumnLibrary {
        id: columns
        workspace: root.plan.workspace
    }
    /// The method's column: {own, name, document, has}.
    property var methodColumn: ({})
    function refreshColumn() {
        if (root.visible)
            root.methodColumn = root.plan.methodColumn(root.method)
    }
    Connections {
        target: root.plan
        function onDocumentChanged() { root.refreshColumn() }
    }
    ChoiceField {
        objectName: "methodColumnPicker"
        Layout.fillWidth: true
        label: qsTr("Column for method “%1”").arg(root.method)
        accessibleName: qsTr("Column for method %1").arg(root.method)
        choices: {
            // The plan's column alone, and the names read once: each read of a list property
            // is a new JS copy of it.
            var pc = root.plan.column
            var planName = pc.name ? pc.name : (pc.length_mm ? columns.summary(pc) : qsTr("no size given"))
            var out = [{ id: "\u0001plan", name: qsTr("The plan's column (%1)").arg(planName) }]
            var names = columns.names
            for (var i = 0; i < names.length; ++i)
                out.push({ id: names[i], name: names[i] })
            var mc = root.methodColumn
            if (mc.own && names.indexOf(mc.name) < 0)
                out.push({ id: mc.name, name: qsTr("%1 (kept with the method)").arg(mc.name) })
            return out
        }
        current: root.methodColumn.own ? root.methodColumn.name : "\u0001plan"
        onPicked: function(id) {
            if (id === "\u0001plan")
                root.plan.setMethodColumn(root.method, {})
            else if (columns.names.indexOf(id) >= 0)
                root.plan.setMethodColumn(root.method, columns.document(id))
        }
    }
    Label {
        Layout.fillWidth: true
        wrapMode: Text.Wrap
        font.pixelSize: Theme.smallFont
        color: Theme.dimText
        text: root.methodColumn.has ? columns.summary(root.methodColumn.document)
                                    : qsTr("This column has no length, inner diameter and particle size: no pressure. Pick a column from the library (Library › Columns).")
    }

    Label {
        objectName: "conditionsText"
        Layout.fillWidth: true
        wrapMode: Text.Wrap
        font.pixelSize: Theme.smallFont
        text: {
            var c = root.conditions
            var parts = []
            if (c.hasEluent)
                parts.push(qsTr("Eluent pH %1 to %2 (s_s scale)%3")
                           .arg(NumberText.format(c.phMin, 2)).arg(NumberText.format(c.phMax, 2))
                           .arg(c.extrapolated ? qsTr(", partly estimated beyond measured data") : ""))
            if (c.hasPressure)
                parts.push(qsTr("pressure up to %1 bar at %2 min%3%4")
                           .arg(NumberText.format(c.maxBar, 0)).arg(NumberText.format(c.maxAtMin, 1))
                           .arg(c.limitBar > 0 ? (c.limitedBy === "column" ? qsTr(" (the column's limit: %1 bar)") : qsTr(" (the pump's limit: %1 bar)"))
                                                 .arg(NumberText.format(c.limitBar, 0)) : "")
                           .arg(c.calibrated ? "" : qsTr("; estimated, not calibrated on this column")))
            if (parts.length === 0)
                return qsTr("No eluent pH or pressure for this method: the plan needs a buffered line and the column's dimensions.")
            return parts.join("; ") + "."
        }
    }

    ChartView {
        id: phChart
        objectName: "eluentPhChart"
        visible: root.conditions.hasEluent === true
        Layout.fillWidth: true
        Layout.preferredHeight: Theme.tap * 4
        antialiasing: true
        localizeNumbers: true
        backgroundColor: Theme.card
        plotAreaColor: Theme.card
        legend.visible: false
        margins { left: 0; right: 0; top: 0; bottom: 0 }
        ValueAxis {
            id: phX
            min: 0
            max: Math.max(1, root.conditions.spanMin || 1)
            labelsColor: Theme.text
            gridLineColor: Theme.line
            labelsFont.pixelSize: Theme.smallFont
            labelFormat: max < 6 ? "%.1f" : "%.0f"
            titleText: qsTr("min")
            titleBrush: Theme.text
        }
        ValueAxis {
            id: phY
            min: Math.floor(((root.conditions.phMin || 0) - 0.25) * 2) / 2
            max: Math.ceil(((root.conditions.phMax || 1) + 0.25) * 2) / 2
            labelsColor: Theme.text
            gridLineColor: Theme.line
            labelsFont.pixelSize: Theme.smallFont
            labelFormat: "%.1f"
            titleText: qsTr("eluent pH")
            titleBrush: Theme.text
        }
        LineSeries { id: phSeries; axisX: phX; axisY: phY; color: Theme.lineColours[0]; width: 3 }
    }

    ChartView {
        id: barChart
        objectName: "pressureChart"
        visible: root.conditions.hasPressure === true
        Layout.fillWidth: true
        Layout.preferredHeight: Theme.tap * 4
        antialiasing: true
        backgroundColor: Theme.card
        plotAreaColor: Theme.card
        legend.visible: false
        margins { left: 0; right: 0; top: 0; bottom: 0 }
        ValueAxis {
            id: barX
            min: 0
            max: Math.max(1, root.conditions.spanMin || 1)
            labelsColor: Theme.text
            gridLineColor: Theme.line
            labelsFont.pixelSize: Theme.smallFont
            labelFormat: max < 6 ? "%.1f" : "%.0f"
            titleText: qsTr("min")
            titleBrush: Theme.text
        }
        ValueAxis {
            id: barY
            min: 0
            max: Math.max(50, 1.1 * Math.max(root.conditions.maxBar || 0, root.conditions.limitBar || 0))
            labelsColor: Theme.text
            gridLineColor: Theme.line
            labelsFont.pixelSize: Theme.smallFont
            labelFormat: "%.0f"
            titleText: qsTr("bar")
            titleBrush: Theme.text
        }
        LineSeries { id: barSeries; axisX: barX; axisY: barY; color: Theme.lineColours[1]; width: 3 }
        LineSeries { id: limitSeries; axisX: barX; axisY: barY; color: Theme.bad; width: 2; style: Qt.DashLine }
    }
}
