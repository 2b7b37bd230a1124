import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// Shown before the main window when the lab's PostgreSQL database does not open: it asks for
// the password (for this run only: kept in memory, never saved) when the server wants one, and
// otherwise says why and offers to try again or to work in this tablet's own file.
ApplicationWindow {
    id: root

    /// The server as the messages name it ("db.lab.example:5432").
    property string address
    /// The user the server was asked for.
    property string user
    /// True: the server wants a password. False: it could not be reached or refused us.
    property bool askPassword: true
    /// Why the last try failed, in words ("" on the first ask for a password).
    property string message
    /// What the user chose: "password" (with `typed`), "retry", "own-file" or "quit".
    property string choice: "quit"
    property string typed
    signal decided()

    width: 600
    height: 380
    visible: true
    title: qsTr("PhasePlan: lab database")
    color: Theme.window
    font.pixelSize: Theme.fontSize
    onClosing: { root.choice = "quit"; root.decided() }

    function decide(what) {
        if (what === "password") {
            if (password.text.length === 0) {
                root.message = qsTr("Password: nothing typed")
                return
            }
            root.typed = password.text
            password.text = ""
        }
        root.choice = what
        root.decided()
    }

    ColumnLayout {
        anchors.fill: parent
        anchors.margins: Theme.margin
        spacing: Theme.gap
        Label {
            Layout.fillWidth: true
            text: root.askPassword ? qsTr("Sign in to the lab database") : qsTr("The lab database did not open")
            font.pixelSize: Theme.largeFont
            font.bold: true
        }
        Label {
            Layout.fillWidth: true
            wrapMode: Text.Wrap
            visible: root.askPassword
            text: qsTr("The lab database at %1 asks for the password of user %2. It is used for this run only and not saved; a line in ~/.pgpass saves typing it at each start.")
                  .arg(root.address).arg(root.user)
        }
        Label {
            visible: root.askPassword
            text: qsTr("Password")
            font.pixelSize: Theme.smallFont
            color: Theme.dimText
        }
        TextField {
            id: password
            objectName: "databasePassword"
            visible: root.askPassword
            Layout.fillWidth: true
            Layout.preferredHeight: Theme.tap
            echoMode: TextInput.Password
            focus: true
            Accessible.name: qsTr("Password of the lab database")
            onAccepted: root.decide("password")
            onTextEdited: if (root.message === qsTr("Password: nothing typed")) root.message = ""
        }
        Label {
            objectName: "databaseStartMessage"
            Layout.fillWidth: true
            visible: root.message.length > 0
            text: root.message
            color: Theme.bad
            wrapMode: Text.Wrap
            font.pixelSize: root.askPassword ? Theme.smallFont : Theme.fontSize
        }
        Label {
            Layout.fillWidth: true
            visible: !root.askPassword
            wrapMode: Text.Wrap
            color: Theme.dimText
            font.pixelSize: Theme.smallFont
            text: qsTr("Work done in this tablet's own file stays on this tablet; the lab's database is unchanged.")
        }
        Item { Layout.fillHeight: true }
        Flow {
            Layout.fillWidth: true
            layoutDirection: Qt.RightToLeft
            spacing: Theme.gap
            TouchButton {
                objectName: "databaseConnect"
                visible: root.askPassword
                text: qsTr("Connect")
                highlighted: true
                onClicked: root.decide("password")
            }
            TouchButton {
                objectName: "databaseRetry"
                visible: !root.askPassword
                text: qsTr("Try again")
                highlighted: true
                onClicked: root.decide("retry")
            }
            TouchButton {
                objectName: "databaseOwnFile"
                text: qsTr("Use this tablet's own file")
                onClicked: root.decide("own-file")
            }
            TouchButton {
                text: qsTr("Quit")
                onClicked: root.decide("quit")
            }
        }
    }
}
