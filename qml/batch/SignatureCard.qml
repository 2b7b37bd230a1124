import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// The batch's electronic signatures: who signed, when (UTC) and as what, each marked void once a
// later change made it no longer match the content signed. Signing asks for the login and the
// password again (21 CFR 11.200(a)(1)); a wrong password counts towards the account's lock.
Card {
    id: root

    required property BatchModel batch
    property string meaning: "prepared"

    function holdingCount() {
        var n = 0
        for (var i = 0; i < root.batch.signatures.length; ++i)
            if (root.batch.signatures[i].holds)
                ++n
        return n
    }
    function fieldError(names) {
        return names.indexOf(root.batch.errorField) >= 0 ? root.batch.errorMessage : ""
    }

    title: qsTr("Signed by")
    note: root.batch.released ? qsTr("released")
                              : root.batch.signatures.length === 0
                                ? qsTr("not signed, not released")
                                : qsTr("%n holding, not released", "", root.holdingCount())
    noteColour: root.batch.released ? Theme.good : Theme.bad

    Repeater {
        model: root.batch.signatures
        delegate: Label {
            required property var modelData
            Layout.fillWidth: true
            wrapMode: Text.Wrap
            font.pixelSize: Theme.fontSize
            font.strikeout: !modelData.holds
            color: modelData.holds ? Theme.text : Theme.bad
            text: modelData.words
        }
    }
    // The release, as the sheet and every label print it.
    Label {
        objectName: "releaseText"
        Layout.fillWidth: true
        wrapMode: Text.Wrap
        font.pixelSize: Theme.fontSize
        font.bold: true
        color: root.batch.released ? Theme.good : Theme.bad
        text: root.batch.releaseText
        Accessible.name: text
    }
    SegmentedChoice {
        objectName: "signMeaning"
        Layout.fillWidth: true
        label: qsTr("Sign as")
        options: [{id: "prepared", name: qsTr("Prepared")}, {id: "reviewed", name: qsTr("Reviewed")},
                  {id: "approved", name: qsTr("Approved")}]
        current: root.meaning
        onPicked: function(id) { root.meaning = id }
    }
    TextEntry {
        id: loginEntry
        objectName: "signLogin"
        Layout.fillWidth: true
        label: qsTr("Login")
        hints: Qt.ImhNoAutoUppercase | Qt.ImhNoPredictiveText
        error: root.fieldError(["login"])
    }
    TextEntry {
        id: passwordEntry
        objectName: "signPassword"
        Layout.fillWidth: true
        label: qsTr("Password")
        hints: Qt.ImhHiddenText | Qt.ImhNoPredictiveText | Qt.ImhSensitiveData
        field.echoMode: TextInput.Password
        error: root.fieldError(["password", "meaning", "signature", "batch.id"])
    }
    TouchButton {
        objectName: "signButton"
        text: qsTr("Sign")
        enabled: !root.batch.pendingAmendment && loginEntry.field.text.length > 0
                 && passwordEntry.field.text.length > 0
        onClicked: {
            if (root.batch.sign(loginEntry.field.text, passwordEntry.field.text, root.meaning))
                loginEntry.field.text = ""
            passwordEntry.field.text = "" // never kept, right or wrong
        }
    }
}
