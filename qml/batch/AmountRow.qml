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
    /// The balance's record when the amount was taken from it, {} when typed.
    required property var capture
    /// "from balance BAL-03", "typed", "" when not entered.
    required property string source
    /// The target DeviceCapture is called with for this row.
    required property string captureTarget
    /// The shelf's lots of this reagent ([{id, name, expiresOn, expired}]); [] = typed lot.
    required property var lotChoices
    required property string lotExpiresOn
    /// The chosen lot expired before the preparation and is not overridden.
    required property bool lotExpired
    required property string lotStatus
    required property string lotError
    /// The BatchModel the row belongs to.
    property BatchModel batch
    /// The screen's DeviceCapture (null: no "Take from balance").
    property DeviceCapture instruments
    /// A change typed over a captured amount, waiting for its reason; NaN when none.
    property real handValue: NaN
    readonly property bool captured: root.capture !== undefined && root.capture.device_id !== undefined
    /// The instrument's fault for this row (the field keeps its value), "" when none.
    readonly property string captureError: root.instruments && !root.instruments.busy
                                           && FieldPath.belongs(root.instruments.errorField, root.captureTarget)
                                           ? root.instruments.errorMessage : ""
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
    /// The row whose override form was used last (its errors show there, not on other rows).
    property bool overrideTried: false
    function overrideError(field) {
        return root.overrideTried && root.batch && FieldPath.belongs(root.batch.errorField, field) ? root.batch.errorMessage : ""
    }

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
        ColumnLayout {
            Layout.fillWidth: true
            Layout.preferredWidth: Theme.tap * 3
            Layout.alignment: Qt.AlignTop
            spacing: Math.round(Theme.gap / 2)
            AmountEntry {
                id: actualField
                objectName: "actualField"
                Layout.fillWidth: true
                label: qsTr("Actual")
                unit: root.unit
                value: root.entered ? root.actual : NaN
                decimals: root.decimalsFor(root.target)
                error: root.captureError.length > 0 ? root.captureError : root.error
                onEdited: function(v) {
                    if (!root.batch.setActual(root.index, v) && root.captured)
                        root.handValue = v
                }
            }
            Label {
                objectName: "sourceMark"
                Layout.fillWidth: true
                visible: root.source.length > 0
                text: root.captured ? qsTr("from %1").arg(root.capture.device_id)
                                      + (root.capture.accepted_unstable ? qsTr(" (taken unsettled)") : "")
                                    : qsTr("typed")
                color: root.captured ? Theme.info : Theme.dimText
                font.pixelSize: Theme.smallFont
                wrapMode: Text.Wrap
            }
            Label {
                objectName: "calibrationCaution"
                Layout.fillWidth: true
                visible: root.captured && (root.capture.calibration_caution || "").length > 0
                text: "⚠ " + (root.capture.calibration_caution || "")
                color: Theme.warn
                font.pixelSize: Theme.smallFont
                wrapMode: Text.Wrap
            }
            // A captured amount changed by hand: the reason, then the change (recorded as typed).
            TextEntry {
                id: handReason
                objectName: "handReasonField"
                Layout.fillWidth: true
                visible: root.captured && !isNaN(root.handValue)
                label: qsTr("Why change the balance's value by hand?")
                placeholder: qsTr("reason")
            }
            RowLayout {
                Layout.fillWidth: true
                visible: handReason.visible
                spacing: Theme.gap
                TouchButton {
                    objectName: "applyByHand"
                    text: qsTr("Change to %1 %2").arg(root.amount(root.handValue)).arg(root.unit)
                    Accessible.name: qsTr("Change the amount of %1 by hand").arg(root.name)
                    onClicked: {
                        if (root.batch.setActualByHand(root.index, root.handValue, handReason.field.text)) {
                            root.handValue = NaN
                            handReason.field.text = ""
                        }
                    }
                }
                TouchButton {
                    objectName: "keepCaptured"
                    text: qsTr("Keep")
                    Accessible.name: qsTr("Keep the balance's value of %1").arg(root.name)
                    onClicked: {
                        root.handValue = NaN
                        root.batch.setActual(root.index, root.actual) // clears the message
                        actualField.value = NaN
                        actualField.value = Qt.binding(function() { return root.entered ? root.actual : NaN })
                    }
                }
            }
            TakeFromInstrument {
                objectName: "takeFromBalanceRow"
                Layout.fillWidth: true
                visible: root.unit === "g" && !!root.instruments && root.instruments.balances.length > 0
                instruments: root.instruments
                target: root.captureTarget
                balance: true
                subject: qsTr("the amount of %1").arg(root.name)
            }
        }
        ColumnLayout {
            Layout.fillWidth: true
            Layout.preferredWidth: Theme.tap * 3
            Layout.alignment: Qt.AlignTop
            spacing: Math.round(Theme.gap / 2)
            // With lots of this reagent on the shelf the lot is picked from them, so its expiry
            // is known and checked; a lot typed by hand would escape that. Without any, the lot
            // is typed as before (and the status says its expiry is not checked).
            ChoiceField {
                objectName: "lotChoice"
                Layout.fillWidth: true
                visible: root.lotChoices.length > 0
                label: qsTr("Lot (from the shelf)")
                accessibleName: qsTr("Lot of %1").arg(root.name)
                choices: root.lotChoices
                current: root.lot
                error: root.lotError
                onPicked: function(id) { root.batch.setLot(root.index, id) }
            }
            TextEntry {
                id: lotEntry
                objectName: "lotField"
                Layout.fillWidth: true
                visible: root.lotChoices.length === 0
                label: qsTr("Lot")
                value: root.lot
                placeholder: qsTr("lot number")
                error: root.lotError
                Connections {
                    target: lotEntry.field
                    function onEditingFinished() { root.batch.setLot(root.index, lotEntry.field.text) }
                }
            }
            Label {
                objectName: "lotStatus"
                Layout.fillWidth: true
                // The refusal beside the picker says the same in full.
                visible: root.lotStatus.length > 0 && root.lotError.length === 0
                text: (root.lotExpired ? "⚠ " : "") + root.lotStatus
                color: root.lotExpired ? Theme.bad : Theme.dimText
                font.pixelSize: Theme.smallFont
                font.bold: root.lotExpired
                wrapMode: Text.Wrap
            }
        }
        // An expired lot: refused unless an approver accepts it here, with the password again
        // and a reason (recorded in the audit trail and printed on the sheet).
        ColumnLayout {
            objectName: "lotOverride"
            Layout.columnSpan: grid.columns
            Layout.fillWidth: true
            visible: root.lotExpired
            spacing: Math.round(Theme.gap / 2)
            Label {
                Layout.fillWidth: true
                text: qsTr("Only an approver may accept an expired lot: the approver's login, "
                           + "password and reason are recorded.")
                font.pixelSize: Theme.smallFont
                wrapMode: Text.Wrap
            }
            RowLayout {
                Layout.fillWidth: true
                spacing: Theme.gap
                TextEntry {
                    id: approverLogin
                    objectName: "overrideLogin"
                    Layout.fillWidth: true
                    Layout.preferredWidth: Theme.tap * 3 // the two share the row equally
                    label: qsTr("Approver's login")
                    accessibleName: qsTr("Approver's login for the lot of %1").arg(root.name)
                    error: root.overrideError("lot_override.login")
                }
                TextEntry {
                    id: approverPassword
                    objectName: "overridePassword"
                    Layout.fillWidth: true
                    Layout.preferredWidth: Theme.tap * 3 // the two share the row equally
                    label: qsTr("Password")
                    accessibleName: qsTr("Approver's password for the lot of %1").arg(root.name)
                    field.echoMode: TextInput.Password
                    error: root.overrideError("lot_override.password")
                }
            }
            TextEntry {
                id: overrideReason
                objectName: "overrideReason"
                Layout.fillWidth: true
                label: qsTr("Why may this expired lot be used?")
                accessibleName: qsTr("Reason to use the expired lot of %1").arg(root.name)
                error: root.overrideError("lot_override.reason") || root.overrideError("lot_override")
            }
            TouchButton {
                objectName: "overrideButton"
                text: qsTr("Accept the expired lot as approver")
                Accessible.name: qsTr("Accept the expired lot of %1 as approver").arg(root.name)
                enabled: approverLogin.field.text.length > 0 && approverPassword.field.text.length > 0
                onClicked: {
                    root.overrideTried = true
                    if (root.batch.overrideExpiredLot(root.index, approverLogin.field.text,
                                                      approverPassword.field.text, overrideReason.field.text)) {
                        approverLogin.field.text = ""
                        overrideReason.field.text = ""
                    }
                    approverPassword.field.text = "" // never kept, right or wrong
                }
            }
        }
    }
}
