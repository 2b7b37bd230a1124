import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// Who is recording on this tablet (Session). With accounts in the database, Prepare & record needs
// someone signed in: this card signs in, continues a session locked after the lab's idle time,
// switches user, and shows who is signed in. A database without accounts offers to create the
// lab's first administrator.
Card {
    id: root

    required property Session session
    /// "signin", "locked", "signedin" or "setup" (no accounts yet).
    readonly property string mode: !session.accountsExist ? "setup"
                                   : !session.signedIn ? "signin"
                                   : session.locked ? "locked" : "signedin"
    property bool switching: false

    function fieldError(names) {
        return FieldPath.belongsToAny(root.session.errorField, names) ? root.session.errorMessage : ""
    }
    function clearPasswords() {
        passwordEntry.field.text = ""
        repeatEntry.field.text = ""
    }

    objectName: "sessionCard"
    title: mode === "setup" ? qsTr("Accounts")
         : mode === "signin" ? qsTr("Sign in to record")
         : mode === "locked" ? qsTr("Locked")
         : qsTr("Signed in")
    note: mode === "signedin" ? root.session.role
        : mode === "locked" && root.session.lockedByIdle ? qsTr("after %n min idle", "", root.session.idleMinutes) : ""
    noteColour: mode === "locked" ? Theme.bad : Theme.dimText

    Label {
        objectName: "sessionText"
        Layout.fillWidth: true
        wrapMode: Text.Wrap
        font.pixelSize: Theme.fontSize
        text: root.mode === "setup"
              ? qsTr("This database has no accounts: batches are recorded under the name typed. Create the lab's administrator to have everyone sign in.")
              : root.mode === "signin"
                ? qsTr("Batches are recorded under the person signed in. Sign in with your login and password.")
                  + (root.session.demoAccountsOpen
                     ? " " + qsTr("This database still has the demo's accounts (demo-prep, demo-review, demo-approve, demo-admin), whose passwords are listed in the README for trying the demo only; a lab locks them or starts a new database.")
                     : "")
                : root.switching
                  ? qsTr("Sign in as someone else; %1 (%2) is signed out when you do.").arg(root.session.displayName).arg(root.session.login)
              : root.mode === "locked"
                  ? qsTr("%1 (%2) was signed in. Enter the password to continue, or switch user.").arg(root.session.displayName).arg(root.session.login)
                  : root.session.role === "administrator"
                    ? qsTr("%1 (%2). The administrator manages accounts and records nothing: switch user to record.").arg(root.session.displayName).arg(root.session.login)
                    : qsTr("%1 (%2): every change is recorded under this login.").arg(root.session.displayName).arg(root.session.login)
    }

    TextEntry {
        id: loginEntry
        objectName: "sessionLogin"
        Layout.fillWidth: true
        visible: root.mode === "setup" || root.mode === "signin" || root.switching
        label: qsTr("Login")
        hints: Qt.ImhNoAutoUppercase | Qt.ImhNoPredictiveText
        error: root.fieldError(["login"])
    }
    TextEntry {
        id: nameEntry
        objectName: "sessionName"
        Layout.fillWidth: true
        visible: root.mode === "setup"
        label: qsTr("Name as printed on records")
        error: root.fieldError(["display_name", "name"])
    }
    TextEntry {
        id: passwordEntry
        objectName: "sessionPassword"
        Layout.fillWidth: true
        visible: root.mode !== "signedin" || root.switching
        label: qsTr("Password")
        hints: Qt.ImhHiddenText | Qt.ImhNoPredictiveText | Qt.ImhSensitiveData
        field.echoMode: TextInput.Password
        error: root.fieldError(["password"])
        field.onAccepted: goButton.clicked()
    }
    TextEntry {
        id: repeatEntry
        objectName: "sessionRepeat"
        Layout.fillWidth: true
        visible: root.mode === "setup"
        label: qsTr("Password again")
        hints: Qt.ImhHiddenText | Qt.ImhNoPredictiveText | Qt.ImhSensitiveData
        field.echoMode: TextInput.Password
        error: root.fieldError(["repeat"])
    }
    Flow {
        Layout.fillWidth: true
        spacing: Theme.gap
        TouchButton {
            id: goButton
            objectName: "sessionGo"
            visible: root.mode !== "signedin" || root.switching
            text: root.mode === "setup" ? qsTr("Create the administrator")
                : root.mode === "locked" && !root.switching ? qsTr("Continue")
                : qsTr("Sign in")
            onClicked: {
                var ok
                if (root.mode === "setup")
                    ok = root.session.createAdministrator(loginEntry.field.text, nameEntry.field.text,
                                                          passwordEntry.field.text, repeatEntry.field.text)
                else if (root.mode === "locked" && !root.switching)
                    ok = root.session.unlock(passwordEntry.field.text)
                else
                    ok = root.session.signIn(loginEntry.field.text, passwordEntry.field.text)
                root.clearPasswords() // never kept, right or wrong
                if (ok) {
                    loginEntry.field.text = ""
                    root.switching = false
                }
            }
        }
        TouchButton {
            objectName: "sessionSwitch"
            visible: (root.mode === "signedin" || root.mode === "locked") && !root.switching
            text: qsTr("Switch user")
            onClicked: root.switching = true
        }
        TouchButton {
            objectName: "sessionCancelSwitch"
            visible: root.switching
            text: qsTr("Cancel")
            onClicked: { root.switching = false; root.clearPasswords() }
        }
        TouchButton {
            objectName: "sessionLock"
            visible: root.mode === "signedin" && !root.switching
            text: qsTr("Lock")
            onClicked: root.session.lock()
        }
        TouchButton {
            objectName: "sessionSignOut"
            visible: (root.mode === "signedin" || root.mode === "locked") && !root.switching
            text: qsTr("Sign out")
            onClicked: root.session.signOut()
        }
    }
    // The administrator adds the lab's people.
    ColumnLayout {
        id: addAccount
        objectName: "addAccount"
        Layout.fillWidth: true
        visible: root.mode === "signedin" && root.session.role === "administrator" && !root.switching
        spacing: Theme.gap
        property string role: "preparer"
        property string added: ""
        Label {
            Layout.fillWidth: true
            text: qsTr("Add an account")
            font.pixelSize: Theme.fontSize
            font.bold: true
        }
        TextEntry {
            id: newLogin
            objectName: "newLogin"
            Layout.fillWidth: true
            label: qsTr("New login")
            hints: Qt.ImhNoAutoUppercase | Qt.ImhNoPredictiveText
            error: root.fieldError(["login"])
        }
        TextEntry {
            id: newName
            objectName: "newName"
            Layout.fillWidth: true
            label: qsTr("Name as printed on records")
            error: root.fieldError(["display_name", "name"])
        }
        SegmentedChoice {
            Layout.fillWidth: true
            label: qsTr("Role")
            options: [{id: "preparer", name: qsTr("Preparer")}, {id: "reviewer", name: qsTr("Reviewer")},
                      {id: "approver", name: qsTr("Approver")}, {id: "administrator", name: qsTr("Administrator")}]
            current: addAccount.role
            onPicked: function(id) { addAccount.role = id }
        }
        TextEntry {
            id: newPassword
            objectName: "newPassword"
            Layout.fillWidth: true
            label: qsTr("First password")
            hints: Qt.ImhHiddenText | Qt.ImhNoPredictiveText | Qt.ImhSensitiveData
            field.echoMode: TextInput.Password
            error: root.fieldError(["password"])
        }
        TextEntry {
            id: newRepeat
            objectName: "newRepeat"
            Layout.fillWidth: true
            label: qsTr("Password again")
            hints: Qt.ImhHiddenText | Qt.ImhNoPredictiveText | Qt.ImhSensitiveData
            field.echoMode: TextInput.Password
            error: root.fieldError(["repeat"])
        }
        TouchButton {
            objectName: "addAccountButton"
            text: qsTr("Add the account")
            onClicked: {
                var ok = root.session.addAccount(newLogin.field.text, newName.field.text, addAccount.role,
                                                 newPassword.field.text, newRepeat.field.text)
                newPassword.field.text = ""
                newRepeat.field.text = ""
                addAccount.added = ok ? qsTr("Added %1 (%2) as %3.").arg(newName.field.text).arg(newLogin.field.text).arg(addAccount.role) : ""
                if (ok) {
                    newLogin.field.text = ""
                    newName.field.text = ""
                }
            }
        }
        Label {
            objectName: "accountAdded"
            Layout.fillWidth: true
            visible: addAccount.added.length > 0
            text: addAccount.added
            color: Theme.good
            wrapMode: Text.Wrap
            font.pixelSize: Theme.fontSize
        }
    }
    // The lab's idle time, set by the administrator.
    NumberField {
        objectName: "idleMinutes"
        Layout.fillWidth: true
        visible: root.mode === "signedin" && root.session.role === "administrator" && !root.switching
        label: qsTr("Lock tablets after idle")
        unit: qsTr("min")
        integer: true
        decimals: 0
        from: 1
        to: 240
        applyOnFinish: true
        value: root.session.idleMinutes
        error: root.fieldError(["idle_minutes"])
        onEdited: function(v) { root.session.setIdleMinutes(Math.round(v)) }
    }
}
