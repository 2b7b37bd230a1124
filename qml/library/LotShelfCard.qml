import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// The lab's reagent-lot shelf (LotShelfModel): each lot with its dates and its state in words,
// a filter by reagent, a form to put a lot on the shelf and "Mark as opened today". Writes are
// made under the person signed in on Prepare & record; otherwise the card says so and the form
// is hidden. Each of the shelf's refusals shows under the field it names.
Card {
    id: root

    required property Workspace workspace
    /// The sign-in of the app (Main.qml); null: a database without accounts is assumed.
    property Session session: null

    title: qsTr("Reagent lots")
    note: qsTr("%n lot(s) shown", "", shelf.count)

    LotShelfModel {
        id: shelf
        workspace: root.workspace
        signInRequired: root.session ? root.session.accountsExist : false
        signedInLogin: root.session && root.session.signedIn && !root.session.locked ? root.session.login : ""
    }

    readonly property bool canWrite: shelf.writeBlock.length === 0
    /// "add" or "open": which action the shelf's last error belongs to.
    property string lastAction
    property string status
    property string reagentId
    property string reagentSearch
    property string receivedOn: shelf.today
    property string openedOn
    property string expiresOn

    /// The shelf's message for a field of the form, led by the label the form shows.
    function errorFor(fields, label) {
        if (root.lastAction !== "add" || !FieldPath.belongsToAny(shelf.errorField, fields))
            return ""
        return label + ": " + shelf.errorMessage
    }
    function pad(n) { return (n < 10 ? "0" : "") + n }
    function iso(y, m, d) { return y + "-" + root.pad(m) + "-" + root.pad(d) }
    /// [year, month 1–12, day] of a YYYY-MM-DD text, today's when it is empty.
    function parts(text) {
        var t = text.length === 10 ? text : shelf.today
        return [parseInt(t.substring(0, 4), 10), parseInt(t.substring(5, 7), 10), parseInt(t.substring(8, 10), 10)]
    }
    function edited() {
        root.status = ""
        if (root.lastAction === "add")
            shelf.clearError()
    }

    // ---- the shelf ----
    ChoiceField {
        objectName: "lotFilter"
        Layout.fillWidth: true
        label: qsTr("Show the lots of")
        choices: { shelf.workspace; shelf.count; return shelf.filterChoices() }
        current: shelf.reagentFilter
        onPicked: function(id) { shelf.reagentFilter = id }
    }
    Label {
        objectName: "lotShelfError"
        Layout.fillWidth: true
        visible: root.lastAction === "open" && shelf.errorMessage.length > 0 && !FieldPath.belongs(shelf.errorField, "version")
        text: shelf.errorMessage
        color: Theme.bad
        wrapMode: Text.Wrap
        font.pixelSize: Theme.smallFont
    }
    // The lot changed on another bench since it was listed here: who and when, and Reload.
    ConflictBar {
        objectName: "lotConflict"
        Layout.fillWidth: true
        copyOffered: false
        message: FieldPath.belongs(shelf.errorField, "version") ? shelf.errorMessage : ""
        onReload: { shelf.reloadShelf(); root.status = "" }
    }
    Label {
        Layout.fillWidth: true
        visible: shelf.count === 0
        text: qsTr("No lots on the shelf yet.")
        color: Theme.dimText
        wrapMode: Text.Wrap
        font.pixelSize: Theme.smallFont
    }
    // The rows in a plain Column, each a RowLayout as wide as it, with its words in a ColumnLayout
    // of wrapping labels: the same arrangement as the night card's bottles. (Labels in a Column
    // inside each RowLayout let the rows' heights go stale and the rows drew over each other.)
    Column {
        id: lotList
        Layout.fillWidth: true
        spacing: Theme.gap
        Repeater {
            model: shelf
            delegate: RowLayout {
                id: lotRow
                required property string reagentName
                required property string reagent
                required property string lot
                required property string supplier
                required property string receivedOn
                required property string openedOn
                required property string expiresOn
                required property string quantity
                required property string state
                required property bool expired
                width: lotList.width
                spacing: Theme.gap
                ColumnLayout {
                    id: lotText
                    Layout.fillWidth: true
                    spacing: 0
                    Label {
                        Layout.fillWidth: true
                        wrapMode: Text.Wrap
                        font.pixelSize: Theme.fontSize
                        font.bold: true
                        text: qsTr("%1 · lot %2").arg(lotRow.reagentName).arg(lotRow.lot)
                    }
                    Label {
                        Layout.fillWidth: true
                        wrapMode: Text.Wrap
                        font.pixelSize: Theme.smallFont
                        color: Theme.dimText
                        text: [lotRow.supplier.length > 0 ? lotRow.supplier : qsTr("supplier not recorded"),
                               qsTr("received\u00a0%1").arg(lotRow.receivedOn),
                               lotRow.openedOn.length > 0 ? qsTr("opened\u00a0%1").arg(lotRow.openedOn) : qsTr("not opened"),
                               qsTr("expires\u00a0%1").arg(lotRow.expiresOn)]
                              .concat(lotRow.quantity.length > 0 ? [lotRow.quantity] : []).join(" · ")
                    }
                    Label {
                        objectName: "lotState"
                        Layout.fillWidth: true
                        wrapMode: Text.Wrap
                        font.pixelSize: Theme.smallFont
                        font.bold: lotRow.expired || lotRow.state !== qsTr("in date")
                        // The word carries the meaning; the colour repeats it.
                        color: lotRow.expired ? Theme.bad : (lotRow.state === qsTr("in date") ? Theme.good : Theme.warn)
                        text: lotRow.expired ? qsTr("EXPIRED") : lotRow.state
                    }
                }
                TouchButton {
                    objectName: "markOpened"
                    visible: root.canWrite && lotRow.openedOn.length === 0
                    text: qsTr("Mark as opened today")
                    Accessible.name: qsTr("Mark lot %1 of %2 as opened today").arg(lotRow.lot).arg(lotRow.reagentName)
                    onClicked: {
                        // The row may be rebuilt by the write: read what the message needs first.
                        const lot = lotRow.lot
                        const shelfModel = shelf
                        root.lastAction = "open"
                        root.status = ""
                        if (shelfModel.markOpenedToday(lotRow.reagent, lot))
                            root.status = qsTr("Lot %1 marked as opened on %2.").arg(lot).arg(shelfModel.today)
                    }
                }
            }
        }
    }

    // ---- who may write ----
    Label {
        objectName: "lotShelfBlock"
        Layout.fillWidth: true
        visible: !root.canWrite
        text: shelf.writeBlock
        color: Theme.warn
        wrapMode: Text.Wrap
        font.pixelSize: Theme.fontSize
    }
    Label {
        objectName: "lotShelfStatus"
        Layout.fillWidth: true
        visible: root.lastAction === "open" && root.status.length > 0
        text: root.status
        color: Theme.good
        wrapMode: Text.Wrap
        font.pixelSize: Theme.smallFont
    }

    // ---- putting a lot on the shelf ----
    ColumnLayout {
        id: form
        objectName: "lotForm"
        visible: root.canWrite
        Layout.fillWidth: true
        spacing: Theme.gap

        Label {
            text: qsTr("Put a lot on the shelf")
            font.pixelSize: Theme.fontSize
            font.bold: true
        }
        // Found by a few letters first: the library is too long for one list on a tablet.
        TextEntry {
            objectName: "lotReagentSearch"
            Layout.fillWidth: true
            label: qsTr("Reagent or solvent: type part of its name")
            placeholder: qsTr("e.g. phosphoric")
            hints: Qt.ImhNoPredictiveText
            onEdited: function(text) {
                root.reagentSearch = text
                var found = shelf.reagentChoices(text)
                root.reagentId = found.length === 1 ? found[0].id : ""
                root.edited()
            }
        }
        ChoiceField {
            objectName: "lotReagent"
            Layout.fillWidth: true
            readonly property var found: { shelf.workspace; shelf.count; root.workspace.libraryRevision; return shelf.reagentChoices(root.reagentSearch) }
            accessibleName: qsTr("Reagent or solvent")
            choices: [{ id: "", name: found.length === 0 ? qsTr("nothing in the library matches")
                                                         : qsTr("Choose one of %1…").arg(found.length) }].concat(found)
            current: root.reagentId
            error: root.errorFor(["reagent"], qsTr("Reagent"))
            onPicked: function(id) { root.reagentId = id; root.edited() }
        }
        GridLayout {
            id: grid
            Layout.fillWidth: true
            columns: form.width > Theme.tap * 9 ? 2 : 1
            columnSpacing: Theme.gap
            rowSpacing: Theme.gap
            TextEntry {
                id: lotEntry
                objectName: "lotNumber"
                Layout.fillWidth: true
                Layout.preferredWidth: Theme.tap // equal shares of the row, whatever an error beneath says
                Layout.alignment: Qt.AlignTop
                label: qsTr("Lot number (as on the label)")
                placeholder: qsTr("e.g. PA-88112")
                hints: Qt.ImhNoPredictiveText | Qt.ImhNoAutoUppercase
                error: root.errorFor(["lot"], qsTr("Lot number"))
                onEdited: root.edited()
            }
            TextEntry {
                id: supplierEntry
                objectName: "lotSupplier"
                Layout.fillWidth: true
                Layout.preferredWidth: Theme.tap // equal shares of the row, whatever an error beneath says
                Layout.alignment: Qt.AlignTop
                label: qsTr("Supplier (optional)")
                error: root.errorFor(["supplier"], qsTr("Supplier"))
                onEdited: root.edited()
            }
            DateTimeField {
                objectName: "lotReceived"
                Layout.fillWidth: true
                Layout.preferredWidth: Theme.tap // equal shares of the row, whatever an error beneath says
                Layout.alignment: Qt.AlignTop
                withTime: false
                label: qsTr("Received on")
                text: root.receivedOn
                year: root.parts(root.receivedOn)[0]
                month: root.parts(root.receivedOn)[1]
                day: root.parts(root.receivedOn)[2]
                error: root.errorFor(["received_on"], qsTr("Received on"))
                onPicked: function(y, m, d) { root.receivedOn = root.iso(y, m, d); root.edited() }
            }
            DateTimeField {
                objectName: "lotExpires"
                Layout.fillWidth: true
                Layout.preferredWidth: Theme.tap // equal shares of the row, whatever an error beneath says
                Layout.alignment: Qt.AlignTop
                withTime: false
                label: qsTr("Expires on (the label's expiry date)")
                text: root.expiresOn.length > 0 ? root.expiresOn : qsTr("choose the day")
                year: root.parts(root.expiresOn)[0]
                month: root.parts(root.expiresOn)[1]
                day: root.parts(root.expiresOn)[2]
                error: root.errorFor(["expires_on"], qsTr("Expires on"))
                onPicked: function(y, m, d) { root.expiresOn = root.iso(y, m, d); root.edited() }
            }
            ColumnLayout {
                Layout.fillWidth: true
                Layout.preferredWidth: Theme.tap // equal shares of the row, whatever an error beneath says
                Layout.alignment: Qt.AlignTop
                spacing: Math.round(Theme.gap / 2)
                DateTimeField {
                    objectName: "lotOpened"
                    Layout.fillWidth: true
                    withTime: false
                    label: qsTr("Opened on (optional)")
                    text: root.openedOn.length > 0 ? root.openedOn : qsTr("not opened")
                    year: root.parts(root.openedOn)[0]
                    month: root.parts(root.openedOn)[1]
                    day: root.parts(root.openedOn)[2]
                    error: root.errorFor(["opened_on"], qsTr("Opened on"))
                    onPicked: function(y, m, d) { root.openedOn = root.iso(y, m, d); root.edited() }
                }
                TouchButton {
                    visible: root.openedOn.length > 0
                    text: qsTr("Not opened")
                    onClicked: { root.openedOn = ""; root.edited() }
                }
            }
            TextEntry {
                id: quantityEntry
                objectName: "lotQuantity"
                Layout.fillWidth: true
                Layout.preferredWidth: Theme.tap // equal shares of the row, whatever an error beneath says
                Layout.alignment: Qt.AlignTop
                label: qsTr("Quantity received (optional)")
                placeholder: qsTr("e.g. 500 g or 2.5 L")
                hints: Qt.ImhNoPredictiveText
                error: root.errorFor(["quantity", "quantity_unit"], qsTr("Quantity"))
                onEdited: root.edited()
            }
        }
        Label {
            objectName: "lotFormError"
            Layout.fillWidth: true
            visible: root.lastAction === "add" && shelf.errorMessage.length > 0
                     && !FieldPath.belongsToAny(shelf.errorField, ["reagent", "lot", "supplier", "received_on",
                                                                   "opened_on", "expires_on", "quantity", "quantity_unit"])
            text: shelf.errorMessage
            color: Theme.bad
            wrapMode: Text.Wrap
            font.pixelSize: Theme.smallFont
        }
        TouchButton {
            objectName: "addLot"
            text: qsTr("Put on the shelf")
            highlighted: true
            onClicked: {
                root.lastAction = "add"
                const lot = lotEntry.field.text.trim()
                if (shelf.add(root.reagentId, lot, supplierEntry.field.text, root.receivedOn,
                              root.openedOn, root.expiresOn, quantityEntry.field.text)) {
                    root.status = qsTr("Lot %1 is on the shelf.").arg(lot)
                    lotEntry.field.text = ""
                    quantityEntry.field.text = ""
                    root.openedOn = ""
                    root.expiresOn = ""
                }
            }
        }
        Label {
            objectName: "lotAddStatus"
            Layout.fillWidth: true
            visible: root.lastAction === "add" && root.status.length > 0
            text: root.status
            color: Theme.good
            wrapMode: Text.Wrap
            font.pixelSize: Theme.smallFont
        }
    }
}
