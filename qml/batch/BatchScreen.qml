import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// Prepare & record: mark the current buffer as prepared (a batch with its own id), enter what was
// actually weighed or measured and the lots, see the solution as made, save or print the sheet and
// the labels. Every number comes from the batch model (the core); this view lays them out.
ScreenPage {
    id: root

    /// The batch model (BatchModel).
    required property BatchModel batch
    /// The buffer designer whose recipe "Mark as prepared" takes.
    property BufferDesigner designer
    /// Who is at the tablet (null: no sign-in, records by the name typed, as in the tests).
    property Session session: null
    /// With accounts in the database and nobody able to record (not signed in, locked, or the
    /// administrator): only the session card shows.
    readonly property bool gated: session !== null && session.accountsExist && !session.canRecord

    title: qsTr("Prepare & record")

    /// The model's message when it names `field`, else "".
    function errorFor(field) {
        return FieldPath.belongs(root.batch.errorField, field) ? root.batch.errorMessage : ""
    }
    readonly property var fieldsShownInline: ["batch.prepared_by", "batch.prepared_at", "batch.expires_at",
                                              "batch.checked_by", "batch.tolerance_percent", "reason",
                                              "batch.measured_ph", "batch.ph_tolerance", "batch.ph_meter_id",
                                              "batch.balance_id", "batch.comment", "batch.container_ml",
                                              "batch.deviation.note", "output", "path", "printer",
                                              "lot_override"]
    readonly property string otherError: root.batch.errorMessage.length > 0
                                         && !FieldPath.belongsToAny(root.batch.errorField, fieldsShownInline)
                                         && !FieldPath.belongs(root.batch.errorField, "batch.actual")
                                         ? root.batch.errorMessage : ""
    /// "2026-12-01T16:30:00" → "2026-12-01 16:30", as the sheet prints it; "–" when empty.
    function dateWords(iso) {
        return iso.length >= 16 ? iso.substring(0, 10) + " " + iso.substring(11, 16) : "–"
    }
    /// A number from a fixed position of an ISO date-time, or `fallback`.
    function part(iso, at, n, fallback) {
        var v = parseInt(iso.substring(at, at + n), 10)
        return isNaN(v) ? fallback : v
    }
    function two(n) {
        return (n < 10 ? "0" : "") + n
    }
    function iso(y, mo, d, h, mi) {
        return y + "-" + two(mo) + "-" + two(d) + "T" + two(h) + ":" + two(mi) + ":00"
    }
    function ph(v) {
        return isNaN(v) ? "–" : NumberText.format(v, 2)
    }
    function mmol(v) {
        return isNaN(v) ? "–" : NumberText.format(v, 2)
    }

    // The balances and pH meters: "Take from balance" / "Take from meter" hand their reading to the
    // batch, which stores it with the device, the raw line and the time.
    DeviceCapture {
        id: deviceCapture
        workspace: root.batch.workspace
    }
    Connections {
        target: deviceCapture
        function onCaptured(c) { root.batch.applyCapture(c) }
    }
    /// [{id, name}] for a picker: "BAL-03 — Analytical balance …".
    function choicesOf(list) {
        var out = []
        for (var i = 0; i < list.length; ++i)
            out.push({ id: list[i].id, name: list[i].id + " — " + list[i].name })
        return out
    }
    function cautionOf(list, id) {
        for (var i = 0; i < list.length; ++i)
            if (list[i].id === id)
                return list[i].calibrationCaution
        return ""
    }

    // The printer and PDF writer, handed to the model (which knows only its interface).
    PrintService {
        id: printService
        workspace: root.batch.workspace
    }
    Binding {
        target: root.batch
        property: "output"
        value: printService
    }

    // Changed on another bench: the refused save with Reload / Save as a copy, or a note. Docked at
    // the bottom, so that it never moves the fields being touched.
    dock: ConflictBar {
        objectName: "batchConflict"
        width: root.contentWidth
        visible: root.batch.active && !root.gated
                 && (root.batch.conflictMessage.length > 0 || root.batch.remoteNotice.length > 0)
        message: root.batch.conflictMessage
        notice: root.batch.remoteNotice
        onReload: root.batch.reloadTheirs()
        onSaveCopy: root.batch.saveAsCopy()
    }

    ColumnLayout {
        width: root.contentWidth
        spacing: Theme.margin

        SessionCard {
            Layout.fillWidth: true
            visible: root.session !== null
            session: root.session
        }

        Label {
            objectName: "batchError"
            Layout.fillWidth: true
            visible: root.otherError.length > 0 && !root.gated
            text: root.otherError
            color: Theme.bad
            wrapMode: Text.Wrap
            font.pixelSize: Theme.fontSize
        }

        // ---- start a batch ----------------------------------------------------------------
        Card {
            objectName: "startCard"
            Layout.fillWidth: true
            visible: !root.batch.active && !root.gated
            title: qsTr("Start a batch")
            Label {
                // The buffer's name, read on every buffer edit, into a string property that
                // signals only when it changes: the sentence is made again only then.
                readonly property string bufferShown: root.designer && root.designer.valid
                                                      ? (root.designer.name.length > 0 ? root.designer.name : qsTr("(unnamed)"))
                                                      : ""
                Layout.fillWidth: true
                wrapMode: Text.Wrap
                text: bufferShown.length > 0 ? qsTr("Current buffer: %1").arg(bufferShown)
                                             : qsTr("The buffer designer has no valid recipe yet.")
                font.pixelSize: Theme.fontSize
            }
            TextEntry {
                objectName: "preparerField"
                Layout.fillWidth: true
                label: qsTr("Prepared by")
                placeholder: qsTr("your name")
                // Signed in: the account's name, not typed.
                field.readOnly: root.session !== null && root.session.canRecord
                value: root.batch.preparer
                error: root.errorFor("batch.prepared_by")
                onEdited: function(text) { root.batch.preparer = text }
            }
            TouchButton {
                objectName: "markPreparedButton"
                text: qsTr("Mark as prepared")
                enabled: root.designer !== null && root.designer.valid
                onClicked: root.batch.markPrepared(root.designer.document())
            }
            Label {
                Layout.fillWidth: true
                visible: root.batch.batchIds.length > 0
                text: qsTr("Or open a recorded batch:")
                color: Theme.dimText
                font.pixelSize: Theme.smallFont
            }
            Flow {
                Layout.fillWidth: true
                spacing: Theme.gap
                Repeater {
                    model: root.batch.batchIds.slice(0, 8)
                    delegate: TouchButton {
                        required property string modelData
                        text: modelData
                        onClicked: root.batch.open(modelData)
                    }
                }
            }
        }

        // ---- the open batch ---------------------------------------------------------------
        // Out of tolerance: across the top, above everything else, until a deviation note is
        // recorded (and after, with the note).
        ToleranceCard {
            objectName: "toleranceCard"
            Layout.fillWidth: true
            visible: root.batch.active && root.batch.outOfTolerance && !root.gated
            batch: root.batch
        }

        GridLayout {
            Layout.fillWidth: true
            visible: root.batch.active && !root.gated
            columns: root.inPortrait ? 1 : 2
            columnSpacing: Theme.margin
            rowSpacing: Theme.margin

            ColumnLayout {
                Layout.fillWidth: true
                Layout.preferredWidth: root.inPortrait ? root.contentWidth : (root.contentWidth - Theme.margin) * 0.56
                Layout.alignment: Qt.AlignTop
                spacing: Theme.margin

                Card {
                    objectName: "batchCard"
                    Layout.fillWidth: true
                    title: qsTr("Batch %1").arg(root.batch.batchId)
                    note: qsTr("revision %1").arg(root.batch.revision)
                    Label {
                        Layout.fillWidth: true
                        text: root.batch.title
                        wrapMode: Text.Wrap
                        font.pixelSize: Theme.fontSize
                    }
                    GridLayout {
                        Layout.fillWidth: true
                        columns: Theme.columnsFor(width, 2)
                        columnSpacing: Theme.margin
                        rowSpacing: Theme.gap
                        TextEntry {
                            id: preparedByEntry
                            Layout.fillWidth: true
                            label: qsTr("Prepared by")
                            value: root.batch.preparedBy
                            error: root.errorFor("batch.prepared_by")
                            Connections {
                                target: preparedByEntry.field
                                function onEditingFinished() { root.batch.preparedBy = preparedByEntry.field.text }
                            }
                        }
                        // With accounts the second person is whoever signs the batch as reviewed
                        // (below), not a name anyone can type.
                        TextEntry {
                            objectName: "checkedBySignature"
                            visible: root.batch.signInRequired
                            Layout.fillWidth: true
                            label: qsTr("Checked by")
                            value: root.batch.reviewedBy
                            placeholder: qsTr("a second person signs as Reviewed")
                            field.readOnly: true
                        }
                        TextEntry {
                            id: checkedByEntry
                            visible: !root.batch.signInRequired
                            Layout.fillWidth: true
                            label: qsTr("Checked by")
                            value: root.batch.checkedBy
                            placeholder: qsTr("second person")
                            error: root.errorFor("batch.checked_by")
                            Connections {
                                target: checkedByEntry.field
                                function onEditingFinished() { root.batch.checkedBy = checkedByEntry.field.text }
                            }
                        }
                        DateTimeField {
                            objectName: "preparedAtField"
                            Layout.fillWidth: true
                            label: qsTr("Prepared at")
                            text: root.dateWords(root.batch.preparedAt)
                            year: root.part(root.batch.preparedAt, 0, 4, 2026)
                            month: root.part(root.batch.preparedAt, 5, 2, 1)
                            day: root.part(root.batch.preparedAt, 8, 2, 1)
                            hour: root.part(root.batch.preparedAt, 11, 2, 12)
                            minute: root.part(root.batch.preparedAt, 14, 2, 0)
                            error: root.errorFor("batch.prepared_at")
                            onPicked: function(y, mo, d, h, mi) { root.batch.preparedAt = root.iso(y, mo, d, h, mi) }
                        }
                        DateTimeField {
                            objectName: "expiresAtField"
                            Layout.fillWidth: true
                            // A lot that expires sooner sets the use-by below: the label says
                            // this date is not the one printed.
                            label: root.batch.useByLimit.length > 0
                                   ? qsTr("Expires at by shelf life (%n h); a lot expires sooner, see Use by", "", Math.round(root.batch.shelfLifeH))
                                   : qsTr("Expires at (default: %n h shelf life)", "", Math.round(root.batch.shelfLifeH))
                            text: root.dateWords(root.batch.expiresAt)
                            year: root.part(root.batch.expiresAt, 0, 4, 2026)
                            month: root.part(root.batch.expiresAt, 5, 2, 1)
                            day: root.part(root.batch.expiresAt, 8, 2, 1)
                            hour: root.part(root.batch.expiresAt, 11, 2, 12)
                            minute: root.part(root.batch.expiresAt, 14, 2, 0)
                            error: root.errorFor("batch.expires_at")
                            onPicked: function(y, mo, d, h, mi) { root.batch.expiresAt = root.iso(y, mo, d, h, mi) }
                        }
                    }
                    // The use-by printed on the sheet and labels: never after a lot's expiry.
                    Label {
                        objectName: "useByText"
                        Layout.fillWidth: true
                        visible: root.batch.useByLimit.length > 0
                        text: qsTr("Use by %1: limited by %2").arg(root.dateWords(root.batch.useByAt))
                                                                 .arg(root.batch.useByLimit)
                        color: Theme.warn
                        font.pixelSize: Theme.smallFont
                        font.bold: true
                        wrapMode: Text.Wrap
                    }
                    Label {
                        objectName: "lotOverridesText"
                        Layout.fillWidth: true
                        visible: root.batch.lotOverrides.length > 0
                        text: "⚠ " + root.batch.lotOverrides.join("\n⚠ ")
                        color: Theme.bad
                        font.pixelSize: Theme.smallFont
                        wrapMode: Text.Wrap
                    }
                    NumberField {
                        objectName: "toleranceField"
                        Layout.fillWidth: true
                        label: qsTr("Tolerance of each amount")
                        unit: "± %"
                        value: root.batch.tolerancePercent
                        step: 0.5
                        from: 0.1
                        to: 50
                        decimals: 1
                        error: root.errorFor("batch.tolerance_percent")
                        onEdited: function(v) { root.batch.tolerancePercent = v }
                    }
                }

                Card {
                    objectName: "amountsCard"
                    Layout.fillWidth: true
                    title: qsTr("Actual amounts and lots")
                    note: root.batch.flaggedCount > 0 ? qsTr("⚠ %n outside band", "", root.batch.flaggedCount)
                          : (root.batch.missingCount > 0 ? qsTr("%n to enter", "", root.batch.missingCount) : qsTr("✓ all within band"))
                    noteColour: root.batch.flaggedCount > 0 ? Theme.bad : (root.batch.missingCount > 0 ? Theme.dimText : Theme.good)
                    ChoiceField {
                        objectName: "balancePicker"
                        Layout.fillWidth: true
                        visible: deviceCapture.balances.length > 1
                        label: qsTr("Balance to read")
                        choices: root.choicesOf(deviceCapture.balances)
                        current: deviceCapture.balanceId
                        onPicked: function(id) { deviceCapture.balanceId = id }
                    }
                    Label {
                        objectName: "balanceCaution"
                        Layout.fillWidth: true
                        visible: text.length > 0
                        text: root.cautionOf(deviceCapture.balances, deviceCapture.balanceId)
                        color: Theme.warn
                        font.pixelSize: Theme.smallFont
                        wrapMode: Text.Wrap
                    }
                    Repeater {
                        model: root.batch
                        delegate: AmountRow {
                            Layout.fillWidth: true
                            instruments: deviceCapture
                            batch: root.batch
                            narrow: root.inPortrait ? root.contentWidth < Theme.tap * 14 : true
                        }
                    }
                }

                BenchCard {
                    objectName: "benchCard"
                    Layout.fillWidth: true
                    batch: root.batch
                    instruments: deviceCapture
                }

                Card {
                    objectName: "amendCard"
                    Layout.fillWidth: true
                    visible: root.batch.pendingAmendment || root.errorFor("reason").length > 0
                    title: qsTr("Amendment")
                    Label {
                        Layout.fillWidth: true
                        wrapMode: Text.Wrap
                        font.pixelSize: Theme.fontSize
                        text: qsTr("This batch has been printed: the change is recorded as an amendment, with a reason.")
                    }
                    TextEntry {
                        objectName: "reasonField"
                        Layout.fillWidth: true
                        label: qsTr("Reason")
                        placeholder: qsTr("why the record changes")
                        value: root.batch.amendReason
                        error: root.errorFor("reason")
                        onEdited: function(text) { root.batch.amendReason = text }
                    }
                    Flow {
                        Layout.fillWidth: true
                        spacing: Theme.gap
                        TouchButton {
                            objectName: "amendButton"
                            text: qsTr("Record amendment")
                            enabled: root.batch.pendingAmendment
                            onClicked: root.batch.amend()
                        }
                        TouchButton {
                            text: qsTr("Discard change")
                            enabled: root.batch.pendingAmendment
                            onClicked: root.batch.discardPending()
                        }
                    }
                }
            }

            ColumnLayout {
                Layout.fillWidth: true
                Layout.preferredWidth: root.inPortrait ? root.contentWidth : (root.contentWidth - Theme.margin) * 0.44
                Layout.alignment: Qt.AlignTop
                spacing: Theme.margin

                Card {
                    objectName: "asMadeCard"
                    Layout.fillWidth: true
                    title: qsTr("As made")
                    note: isNaN(root.batch.targetPh) ? "" : qsTr("target pH %1").arg(root.ph(root.batch.targetPh))
                    RowLayout {
                        Layout.fillWidth: true
                        spacing: Theme.margin
                        Label {
                            text: qsTr("pH")
                            font.pixelSize: Theme.largeFont
                        }
                        Label {
                            objectName: "asMadePh"
                            text: root.batch.valid ? root.ph(root.batch.predictedPh) : "–"
                            font.pixelSize: Theme.hugeFont
                            font.bold: true
                        }
                        Item { Layout.fillWidth: true }
                    }
                    Label {
                        Layout.fillWidth: true
                        visible: root.batch.valid && !isNaN(root.batch.ionicStrengthMmolPerL)
                        text: qsTr("Ionic strength %1 mmol/L · β %2 mmol/L per pH")
                              .arg(root.mmol(root.batch.ionicStrengthMmolPerL)).arg(root.mmol(root.batch.bufferCapacityMmolPerL))
                        wrapMode: Text.Wrap
                        font.pixelSize: Theme.fontSize
                    }
                    Repeater {
                        model: root.batch.composition
                        delegate: Label {
                            required property var modelData
                            Layout.fillWidth: true
                            text: qsTr("%1: %2 mmol/L").arg(modelData.name).arg(root.mmol(modelData.mmolPerL))
                            wrapMode: Text.Wrap
                            color: Theme.dimText
                            font.pixelSize: Theme.smallFont
                        }
                    }
                    Repeater {
                        model: root.batch.warnings
                        delegate: WarningRow {
                            required property var modelData
                            Layout.fillWidth: true
                            severity: modelData.severity
                            message: modelData.message
                        }
                    }
                }

                PrintCard {
                    objectName: "printCard"
                    Layout.fillWidth: true
                    batch: root.batch
                }

                SignatureCard {
                    objectName: "signatureCard"
                    Layout.fillWidth: true
                    visible: root.batch.signingAvailable
                    batch: root.batch
                }

                StepsCard {
                    objectName: "stepsCard"
                    Layout.fillWidth: true
                    batch: root.batch
                }

                Card {
                    objectName: "historyCard"
                    Layout.fillWidth: true
                    title: qsTr("Record")
                    note: qsTr("%n change(s)", "", root.batch.history.length)
                    HistoryList {
                        Layout.fillWidth: true
                        entries: root.batch.history
                        shown: 8
                    }
                    TouchButton {
                        text: qsTr("Close batch")
                        onClicked: root.batch.close()
                    }
                }
            }
        }
    }
}
