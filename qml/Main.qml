import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// The app window: the models shared by every screen, and the navigation (a rail at the side in
// landscape, a bar at the bottom in portrait).
ApplicationWindow {
    id: window

    /// The data, the database and the merged library (set by main.cpp).
    required property Workspace workspace
    /// Index into screenKeys of the screen shown. Reopening shows the screen that was open (read
    /// here, before the screens are made, so that the one shown is made first).
    property int currentScreen: Math.max(0, screenKeys.indexOf(workspace.setting("screen")))
    /// The screens, by key (the screenshot seam names its files after these).
    readonly property var screenKeys: ["buffer", "lines", "sequence", "checks", "library", "saved", "batch"]
    readonly property var screenNames: [qsTr("Buffer"), qsTr("Lines"), qsTr("Sequence"), qsTr("Checks"),
                                        qsTr("Library"), qsTr("Saved"), qsTr("Prepare")]
    readonly property bool inPortrait: height > width
    // The models as the screens see them: inside a screen's Component, `plan`, `designer` and
    // `session` name the screen's own properties.
    readonly property Plan planModel: plan
    readonly property BufferDesigner designerModel: designer
    readonly property Session sessionModel: session
    /// The screens before this index are made (besides the one shown): counted up after the
    /// first frame, one screen per turn of the event loop.
    property int screensMade: 0
    onFrameSwapped: if (screensMade === 0 && !makeNextScreen.running) makeNextScreen.start()
    Timer {
        id: makeNextScreen
        interval: 0
        onTriggered: {
            window.screensMade++
            if (window.screensMade < window.screenKeys.length)
                start()
            else
                Qt.callLater(gc) // what making the screens left behind, before the first edit
        }
    }
    // The JS heap is collected when editing pauses. Left to itself it collects in the middle of an
    // edit (the marking alone takes 7-16 ms on this app's heap), and that edit misses its frame.
    Timer {
        id: idleCollect
        interval: 1000
        onTriggered: gc()
    }
    Connections {
        target: designer
        function onEdited() { idleCollect.restart() }
    }
    Connections {
        target: plan
        function onDocumentChanged() { idleCollect.restart() }
    }

    /// Number fields typed on any screen whose text is not applied (each screen's pendingInputs):
    /// the header badge says so, whichever screen is shown.
    readonly property int pendingInputs: pendingOf(screen0) + pendingOf(screen1) + pendingOf(screen2)
                                         + pendingOf(screen3) + pendingOf(screen4) + pendingOf(screen5)
                                         + pendingOf(screen6)
    function pendingOf(loader) {
        return loader && loader.item && loader.item.pendingInputs !== undefined ? loader.item.pendingInputs : 0
    }
    /// The key of the first screen holding an entry that is not applied ("" when none).
    function pendingScreen() {
        var loaders = [screen0, screen1, screen2, screen3, screen4, screen5, screen6]
        if (pendingOf(loaders[currentScreen]) > 0)
            return screenKeys[currentScreen]
        for (var i = 0; i < loaders.length; ++i)
            if (pendingOf(loaders[i]) > 0)
                return screenKeys[i]
        return ""
    }

    function show(key) {
        var i = screenKeys.indexOf(key)
        if (i >= 0)
            currentScreen = i
    }
    /// Shows a screen and focuses the field a check or an error names (a contract path); with
    /// no path, the screen's first entry whose text is not applied, if it has one.
    function showField(key, path) {
        show(key)
        var loader = stack.children[screenKeys.indexOf(key)]
        var screen = loader ? loader.item : null
        if (!screen)
            return
        if (path.length > 0 && screen.focusField !== undefined)
            Qt.callLater(function() { screen.focusField(path) })
        else if (path.length === 0 && screen.focusPending !== undefined)
            Qt.callLater(function() { screen.focusPending() })
    }

    width: 1280
    height: 800
    visible: true
    title: qsTr("PhasePlan: %1").arg(plan.name)
    color: Theme.window
    font.pixelSize: Theme.fontSize
    // Every control takes its colours from the system palette (light or dark) through here.
    palette.window: Theme.window
    palette.windowText: Theme.text
    palette.base: Theme.field
    palette.alternateBase: Theme.window
    palette.text: Theme.text
    palette.button: Theme.button
    palette.buttonText: Theme.buttonText
    palette.highlight: Theme.accent
    palette.highlightedText: Theme.accentText
    palette.placeholderText: Theme.placeholder

    Plan {
        id: plan
        objectName: "plan"
        restore: true
        workspace: window.workspace
    }
    BufferDesigner {
        id: designer
        objectName: "designer"
        workspace: window.workspace
        plan: plan
        autosaveKey: "current_buffer"
    }
    LinesModel {
        id: linesModel
        objectName: "lines"
        plan: plan
        // Hidden cards are brought up to date when the screen shows, not on every edit.
        viewsActive: window.screenKeys[window.currentScreen] === "lines"
    }
    Session {
        id: session
        objectName: "session"
        workspace: window.workspace
    }
    BatchModel {
        id: batchModel
        objectName: "batch"
        workspace: window.workspace
        signInRequired: session.accountsExist
        signedInLogin: session.canRecord ? session.login : ""
    }
    // Saves of buffers, lines and sequences are recorded under the person signed in, else the
    // name typed at the bench (app/storage/versioning.h).
    Binding {
        target: window.workspace
        property: "actor"
        value: session.canRecord ? session.login : batchModel.preparer
    }
    // "Prepared by" of a new batch is the person signed in.
    Connections {
        target: session
        function onChanged() {
            if (session.canRecord)
                batchModel.preparer = session.displayName
        }
    }
    ChecksModel {
        id: checksModel
        objectName: "checks"
        plan: plan
        lines: linesModel
        designer: designer
    }

    onCurrentScreenChanged: workspace.setSetting("screen", screenKeys[currentScreen])
    onClosing: {
        designer.flushAutosave() // first: its automatic rename moves the lines' references
        plan.flushAutosave()
    }

    /// Height of the on-screen keyboard while it is up (dialogs move above it), else 0.
    readonly property real keyboardHeight: keyboard.item && keyboard.item.active ? keyboard.item.height : 0

    // The on-screen keyboard, above everything, sliding up while a field is being typed in.
    Loader {
        id: keyboard
        objectName: "keyboardLoader"
        active: TabletSettings.keyboardActive
        source: "common/KeyboardPanel.qml"
        parent: Overlay.overlay
        z: 1000
        width: parent ? parent.width : 0
        y: parent ? (item && item.active ? parent.height - item.height : parent.height) : 0
    }

    header: ToolBar {
        implicitHeight: Math.max(Theme.tap, headerRow.implicitHeight) + Theme.gap
        RowLayout {
            id: headerRow
            anchors.fill: parent
            anchors.leftMargin: Theme.margin
            anchors.rightMargin: Theme.margin
            spacing: Theme.margin
            Label {
                text: "PhasePlan"
                font.pixelSize: Theme.largeFont
                font.bold: true
            }
            Label {
                Layout.fillWidth: true
                text: plan.name + (plan.valid && plan.endText.length > 0 ? qsTr(" · ends %1").arg(plan.endText) : "")
                wrapMode: Text.Wrap
                maximumLineCount: 2
                elide: Text.ElideRight
                font.pixelSize: Theme.fontSize
            }
            // The checks at a glance. An entry typed but not applied (its text is not a number
            // yet) is said first: the checks ran on the value from before, so "no warnings" would
            // not be the truth about what is on screen. A tap shows the screen with that entry.
            Button {
                objectName: "checksBadge"
                implicitHeight: Theme.tap
                font.pixelSize: Theme.fontSize
                text: {
                    var parts = []
                    if (window.pendingInputs > 0)
                        parts.push(window.pendingInputs === 1 ? qsTr("✎ 1 entry not applied")
                                                              : qsTr("✎ %1 entries not applied").arg(window.pendingInputs))
                    if (checksModel.warningCount > 0)
                        parts.push(qsTr("⚠ %n to fix", "", checksModel.warningCount))
                    else if (window.pendingInputs === 0)
                        parts.push(qsTr("✓ no warnings"))
                    return parts.join(" · ")
                }
                palette.buttonText: checksModel.warningCount > 0 ? Theme.bad
                                  : window.pendingInputs > 0 ? Theme.warn : Theme.good
                Accessible.description: window.pendingInputs > 0
                                        ? qsTr("Checks are of the values from before the entry that is not applied")
                                        : ""
                onClicked: {
                    var key = window.pendingScreen()
                    window.show(key.length > 0 ? key : "checks")
                }
            }
        }
    }

    // The database cannot be saved to (read-only, locked) or had records set aside: said here.
    footer: Pane {
        visible: window.workspace.storageNotice.length > 0
        padding: Theme.gap
        background: Rectangle { color: Theme.card; border.color: Theme.bad }
        Label {
            objectName: "storageBanner"
            width: parent.width
            text: window.workspace.storageNotice
            wrapMode: Text.Wrap
            color: Theme.bad
        }
    }

    GridLayout {
        anchors.fill: parent
        // The on-screen keyboard takes the bottom of the window: the screens shrink above it, and
        // the field being typed in scrolls back into view (ScreenPage).
        anchors.bottomMargin: keyboard.item && keyboard.item.active ? keyboard.item.height : 0
        columns: window.inPortrait ? 1 : 2
        rowSpacing: 0
        columnSpacing: 0

        // Navigation rail (landscape).
        Pane {
            visible: !window.inPortrait
            Layout.fillHeight: true
            Layout.preferredWidth: Theme.tap * 3.2
            padding: Theme.gap
            background: Rectangle { color: Theme.card; border.color: Theme.line }
            ColumnLayout {
                anchors.fill: parent
                spacing: Theme.gap
                Repeater {
                    model: window.screenNames
                    delegate: NavButton {
                        required property string modelData
                        required property int index
                        Layout.fillWidth: true
                        text: modelData
                        badge: index === 3 ? checksModel.warningCount : 0
                        current: window.currentScreen === index
                        onClicked: window.currentScreen = index
                    }
                }
                Item { Layout.fillHeight: true }
            }
        }

        // Each screen in a Loader: the one shown at start is made before the first frame, the
        // others after it, one per turn of the event loop (screensMade), and at once when one is
        // shown before its turn. A screen once made stays.
        StackLayout {
            id: stack
            Layout.fillWidth: true
            Layout.fillHeight: true
            currentIndex: window.currentScreen

            Loader {
                id: screen0
                active: window.currentScreen === 0 || 0 < window.screensMade || item !== null
                sourceComponent: Component {
                    BufferScreen {
                        designer: window.designerModel
                        plan: window.planModel
                        inPortrait: window.inPortrait
                        onPrepare: window.show("batch")
                    }
                }
            }
            Loader {
                id: screen1
                active: window.currentScreen === 1 || 1 < window.screensMade || item !== null
                sourceComponent: Component {
                    LinesScreen {
                        lines: linesModel
                        plan: window.planModel
                        inPortrait: window.inPortrait
                        designer: window.designerModel
                        onEditBuffer: function(name) {
                            designer.openBuffer(name)
                            window.show("buffer")
                        }
                    }
                }
            }
            Loader {
                id: screen2
                active: window.currentScreen === 2 || 2 < window.screensMade || item !== null
                sourceComponent: Component {
                    SequenceScreen {
                        plan: window.planModel
                        inPortrait: window.inPortrait
                    }
                }
            }
            Loader {
                id: screen3
                active: window.currentScreen === 3 || 3 < window.screensMade || item !== null
                sourceComponent: Component {
                    ChecksScreen {
                        checks: checksModel
                        entriesNotApplied: window.pendingInputs
                        entryScreen: window.pendingInputs > 0 ? window.pendingScreen() : ""
                        entryScreenName: entryScreen.length > 0 ? window.screenNames[window.screenKeys.indexOf(entryScreen)] : ""
                        inPortrait: window.inPortrait
                        onOpen: function(screen, focus) { window.showField(screen, focus) }
                    }
                }
            }
            Loader {
                id: screen4
                active: window.currentScreen === 4 || 4 < window.screensMade || item !== null
                sourceComponent: Component {
                    LibraryScreen {
                        workspace: window.workspace
                        session: window.sessionModel
                        inPortrait: window.inPortrait
                    }
                }
            }
            Loader {
                id: screen5
                active: window.currentScreen === 5 || 5 < window.screensMade || item !== null
                sourceComponent: Component {
                    SavedScreen {
                        workspace: window.workspace
                        plan: window.planModel
                        designer: window.designerModel
                        inPortrait: window.inPortrait
                        onOpen: function(screen) { window.show(screen) }
                    }
                }
            }
            Loader {
                id: screen6
                active: window.currentScreen === 6 || 6 < window.screensMade || item !== null
                sourceComponent: Component {
                    BatchScreen {
                        batch: batchModel
                        designer: window.designerModel
                        session: window.sessionModel
                        inPortrait: window.inPortrait
                    }
                }
            }
        }

        // Navigation bar (portrait).
        Pane {
            visible: window.inPortrait
            Layout.fillWidth: true
            padding: Math.round(Theme.gap / 2)
            background: Rectangle { color: Theme.card; border.color: Theme.line }
            RowLayout {
                anchors.fill: parent
                spacing: Math.round(Theme.gap / 2)
                Repeater {
                    model: window.screenNames
                    delegate: NavButton {
                        required property string modelData
                        required property int index
                        Layout.fillWidth: true
                        text: modelData
                        badge: index === 3 ? checksModel.warningCount : 0
                        current: window.currentScreen === index
                        onClicked: window.currentScreen = index
                    }
                }
            }
        }
    }
}
