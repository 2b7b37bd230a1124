import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// Method and sequence: the gradient table with its plot, the sequence rows, the instrument and
// waste, the standby, and the night as the core plans it: start and end with their day, each
// bottle's level, the run-dry point. In landscape the night stays in view in its own column
// while the editors scroll; in portrait everything scrolls as one page.
Item {
    id: root

    required property Plan plan
    property bool inPortrait: height > width
    property string title: qsTr("Method and sequence")
    /// Fields typed but not applied, on either column.
    readonly property int pendingInputs: root.inPortrait ? single.pendingInputs : editorsPage.pendingInputs + nightPage.pendingInputs
    /// For the screenshot seam and tests: the page that scrolls the editors.
    readonly property Flickable flickable: root.inPortrait ? single.flickable : editorsPage.flickable

    /// Shows and focuses the field a check or an error names (a contract path, e.g.
    /// "methods.assay.gradient[2].A", "sequence[3].injections", "start", "standby.flow_ml_min").
    function focusField(path) {
        if (path === "start") {
            var night = root.inPortrait ? singleNight.item : sideNight.item
            if (night) {
                night.startCard.field.button.forceActiveFocus()
                return
            }
        }
        var editors = root.inPortrait ? singleEditors.item : sideEditors.item
        if (editors)
            editors.focusField(path)
    }

    /// Focuses the first entry whose text is not applied ("Show ›" on the checks).
    function focusPending() {
        if (root.inPortrait)
            return single.focusPending()
        return editorsPage.focusPending() || nightPage.focusPending()
    }

    Component {
        id: editorsComponent
        ColumnLayout {
            id: editors
            spacing: Theme.margin
            function focusField(path) {
                var m = /^methods\.(.+?)\.((flow_ml_min|run_min|equilibration_min|gradient\[\d+\].*))$/.exec(path)
                if (m) {
                    gradientEditor.gradient.methodName = m[1]
                    gradientEditor.focusField(m[2])
                    return
                }
                var s = /^sequence\[(\d+)\]\.?(.*)$/.exec(path)
                if (s) {
                    sequenceRows.focusField(parseInt(s[1]), s[2])
                    return
                }
                if (FieldPath.belongs(path, "standby")) {
                    standby.focusField(path)
                    return
                }
                settings.focusField(path)
            }
            GradientEditor {
                id: gradientEditor
                Layout.fillWidth: true
                plan: root.plan
            }
            ColumnConditions {
                Layout.fillWidth: true
                plan: root.plan
                method: gradientEditor.gradient.methodName
            }
            SmallerColumn {
                Layout.fillWidth: true
                plan: root.plan
                method: gradientEditor.gradient.methodName
                onMethodAdded: function(name) { gradientEditor.gradient.methodName = name }
            }
            SequenceRows {
                id: sequenceRows
                Layout.fillWidth: true
                plan: root.plan
            }
            PlanSettings {
                id: settings
                Layout.fillWidth: true
                plan: root.plan
            }
            StandbyCard {
                id: standby
                Layout.fillWidth: true
                plan: root.plan
            }
        }
    }
    Component {
        id: nightComponent
        ColumnLayout {
            spacing: Theme.margin
            readonly property alias startCard: startCard
            StartCard {
                id: startCard
                Layout.fillWidth: true
                plan: root.plan
            }
            NightSummary {
                Layout.fillWidth: true
                plan: root.plan
                inputsPending: root.pendingInputs > 0
            }
            BottleChart {
                Layout.fillWidth: true
                plan: root.plan
                // The levels are the last valid plan's while an input is wrong or not applied.
                stale: root.plan.stale || root.pendingInputs > 0
                staleText: root.plan.stale ? qsTr("last valid plan") : qsTr("not applied")
            }
        }
    }

    // Portrait: one page.
    ScreenPage {
        id: single
        anchors.fill: parent
        visible: root.inPortrait
        inPortrait: true
        ColumnLayout {
            width: single.contentWidth
            spacing: Theme.margin
            Loader {
                id: singleNight
                Layout.fillWidth: true
                active: root.inPortrait
                sourceComponent: nightComponent
            }
            Loader {
                id: singleEditors
                Layout.fillWidth: true
                active: root.inPortrait
                sourceComponent: editorsComponent
            }
        }
    }
    // Landscape: editors on the left, the night on the right, each scrolling on its own.
    RowLayout {
        anchors.fill: parent
        visible: !root.inPortrait
        spacing: 0
        ScreenPage {
            id: editorsPage
            // The editors get the larger share: a gradient row of 9 mm cells must fit.
            Layout.preferredWidth: parent.width * 0.58
            Layout.fillHeight: true
            inPortrait: false
            Loader {
                id: sideEditors
                width: editorsPage.contentWidth
                active: !root.inPortrait
                sourceComponent: editorsComponent
            }
        }
        ScreenPage {
            id: nightPage
            Layout.fillWidth: true
            Layout.fillHeight: true
            inPortrait: false
            Loader {
                id: sideNight
                width: nightPage.contentWidth
                active: !root.inPortrait
                sourceComponent: nightComponent
            }
        }
    }
}
