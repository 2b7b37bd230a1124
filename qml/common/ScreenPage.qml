import QtQuick
import QtQuick.Controls

// One main screen: a vertically scrolling page with margins; screens put their layout inside and
// size it to contentWidth. A field that takes the focus (by Tab, by "Open ›" from the checks) is
// scrolled into view.
Item {
    id: root

    property string title
    /// Number fields on this page whose text is not applied yet (NumberField counts itself here):
    /// results that depend on them are greyed and marked "not applied".
    property int pendingInputs: 0
    /// Taller than wide (800 × 1280): screens stack their columns.
    property bool inPortrait: height > width
    readonly property real contentWidth: Math.max(0, width - 2 * Theme.margin)
    default property alias content: holder.data
    /// Items docked at the bottom of the page, over the content (which scrolls past them): a
    /// message that comes and goes (ConflictBar) without moving the fields under the finger.
    property alias dock: dockColumn.data
    /// For tests and the screenshot seam: the flickable of the page.
    readonly property alias flickable: flick

    /// The first item below `from` whose objectName is `name` (null when none).
    function findByName(name, from) {
        var start = from || holder
        for (var i = 0; i < start.children.length; ++i) {
            var c = start.children[i]
            if (c.objectName === name)
                return c
            var deeper = root.findByName(name, c)
            if (deeper)
                return deeper
        }
        return null
    }
    /// Focuses the field named `name` (a NumberField, TextEntry or control) and scrolls to it.
    function focusByName(name) {
        var item = root.findByName(name)
        if (!item)
            return false
        var target = item.field !== undefined && item.field ? item.field
                   : item.box !== undefined && item.box ? item.box
                   : item.button !== undefined && item.button ? item.button : item
        target.forceActiveFocus()
        root.ensureVisible(target)
        return true
    }
    /// The first shown entry below `from` whose text is not applied (a NumberField or a table
    /// cell counting itself in pendingInputs), or null.
    function findPending(from) {
        var start = from || holder
        for (var i = 0; i < start.children.length; ++i) {
            var c = start.children[i]
            if (!c.visible)
                continue
            if (c.pending === true)
                return c
            var deeper = root.findPending(c)
            if (deeper)
                return deeper
        }
        return null
    }
    /// Focuses the first entry whose text is not applied and scrolls to it ("Show ›" on the
    /// checks); false when there is none.
    function focusPending() {
        var item = root.findPending()
        if (!item)
            return false
        var target = item.field !== undefined && item.field ? item.field : item
        target.forceActiveFocus()
        root.ensureVisible(target)
        return true
    }
    function ensureVisible(item) {
        var p = item.mapToItem(flick.contentItem, 0, 0)
        var top = p.y - Theme.margin
        var bottom = p.y + item.height + Theme.margin
        if (top < flick.contentY)
            flick.contentY = Math.max(0, top)
        else if (bottom > flick.contentY + flick.height)
            flick.contentY = Math.min(Math.max(0, flick.contentHeight - flick.height), bottom - flick.height)
    }
    function isInside(item) {
        for (var p = item; p; p = p.parent)
            if (p === holder)
                return true
        return false
    }

    Connections {
        target: root.Window.window
        function onActiveFocusItemChanged() {
            var f = root.Window.window ? root.Window.window.activeFocusItem : null
            if (f && root.visible && root.isInside(f))
                root.ensureVisible(f)
        }
    }

    // Shrunk (the on-screen keyboard came up): keep the field being typed in on screen.
    onHeightChanged: {
        var f = root.Window.window ? root.Window.window.activeFocusItem : null
        if (f && root.visible && root.isInside(f))
            Qt.callLater(root.ensureVisible, f)
    }

    Flickable {
        id: flick
        anchors.fill: parent
        clip: true
        contentWidth: width
        contentHeight: holder.childrenRect.height + 2 * Theme.margin
        bottomMargin: dockColumn.height > 0 ? dockColumn.height + Theme.margin : 0
        boundsBehavior: Flickable.StopAtBounds
        ScrollIndicator.vertical: ScrollIndicator { }

        Item {
            id: holder
            x: Theme.margin
            y: Theme.margin
            width: root.contentWidth
            height: childrenRect.height
        }
    }

    Column {
        id: dockColumn
        x: Theme.margin
        width: root.contentWidth
        anchors.bottom: parent.bottom
        anchors.bottomMargin: Theme.gap
        spacing: Theme.gap
    }
}
