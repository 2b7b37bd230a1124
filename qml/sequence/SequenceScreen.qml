import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// Method and sequence: the gradient table with its plot, the sequence rows, the instrument and
// waste, and the night as the core plans it: end time, each bottle's level, the run-dry point.
ScreenPage {
    id: root

    required property Plan plan

    title: qsTr("Method and sequence")

    GridLayout {
        width: root.contentWidth
        columns: root.inPortrait ? 1 : 2
        columnSpacing: Theme.margin
        rowSpacing: Theme.margin

        ColumnLayout {
            Layout.fillWidth: true
            Layout.preferredWidth: root.inPortrait ? root.contentWidth : (root.contentWidth - Theme.margin) * 0.5
            Layout.alignment: Qt.AlignTop
            spacing: Theme.margin

            GradientEditor {
                Layout.fillWidth: true
                plan: root.plan
            }
            SequenceRows {
                Layout.fillWidth: true
                plan: root.plan
            }
            PlanSettings {
                Layout.fillWidth: true
                plan: root.plan
            }
        }
        ColumnLayout {
            Layout.preferredWidth: root.inPortrait ? root.contentWidth : (root.contentWidth - Theme.margin) * 0.5
            Layout.fillWidth: true
            Layout.alignment: Qt.AlignTop
            spacing: Theme.margin

            NightSummary {
                Layout.fillWidth: true
                plan: root.plan
            }
            BottleChart {
                Layout.fillWidth: true
                plan: root.plan
            }
        }
    }
}
