import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// A date and time (or a time of day alone) chosen with pickers: a button that shows the value
// with its day ("today 18:00"), opening a calendar and hour and minute wheels. The minute wheel
// stops at the quarter hours for the mouse wheel and the keys; any minute can be typed beside it.
// The value is held as plain parts (year, month 1–12, day, hour, minute) of a wall-clock time.
ColumnLayout {
    id: root

    property string label
    /// The value as the model words it ("today 18:00"); shown on the button.
    property string text
    property int year: 2026
    property int month: 1
    property int day: 1
    property int hour: 18
    property int minute: 0
    /// False: a time of day only (no calendar).
    property bool withDate: true
    /// False: a day only (no hour and minute wheels; `picked` passes hour and minute unchanged).
    property bool withTime: true
    property string error
    /// A caution that is not an error (a start in the past), shown under the value.
    property string note
    property alias button: open
    /// The button's text size and height (at least the touch target).
    property int buttonFontSize: Theme.fontSize
    property real buttonHeight: Theme.tap

    /// The user set a new value.
    signal picked(int year, int month, int day, int hour, int minute)

    spacing: Math.round(Theme.gap / 2)

    Label {
        text: root.label
        visible: root.label.length > 0
        font.pixelSize: Theme.smallFont
        color: Theme.dimText
        Layout.fillWidth: true
        wrapMode: Text.Wrap
    }
    Button {
        id: open
        objectName: "dateTimeButton"
        Layout.fillWidth: true
        Layout.preferredHeight: Math.max(Theme.tap, root.buttonHeight)
        font.pixelSize: root.buttonFontSize
        text: root.text + "  ▾"
        Accessible.name: root.label
        Accessible.description: root.text
        onClicked: {
            popup.shownYear = root.year
            popup.shownMonth = root.month - 1
            popup.pickYear = root.year
            popup.pickMonth = root.month
            popup.pickDay = root.day
            hours.currentIndex = root.hour
            minutes.currentIndex = root.minute
            popup.open()
        }
    }
    Label {
        Layout.fillWidth: true
        visible: root.error.length > 0
        text: root.error
        color: Theme.bad
        wrapMode: Text.Wrap
        font.pixelSize: Theme.smallFont
    }
    Label {
        objectName: "dateTimeNote"
        Layout.fillWidth: true
        visible: root.error.length === 0 && root.note.length > 0
        text: root.note
        color: Theme.warn
        wrapMode: Text.Wrap
        font.pixelSize: Theme.smallFont
    }

    Popup {
        id: popup
        objectName: "dateTimePopup"
        parent: Overlay.overlay
        modal: true
        focus: true
        anchors.centerIn: parent
        padding: Theme.margin
        property int shownYear: 2026
        property int shownMonth: 0 // 0–11, as MonthGrid counts
        property int pickYear: 2026
        property int pickMonth: 1
        property int pickDay: 1

        function pickDate(d) {
            pickYear = d.getFullYear()
            pickMonth = d.getMonth() + 1
            pickDay = d.getDate()
            shownYear = pickYear
            shownMonth = pickMonth - 1
        }

        background: Rectangle { color: Theme.card; radius: Theme.radius; border.color: Theme.line }

        ColumnLayout {
            spacing: Theme.gap
            Label {
                text: root.label
                font.pixelSize: Theme.largeFont
                font.bold: true
            }
            RowLayout {
                visible: root.withDate
                spacing: Theme.gap
                TouchButton {
                    text: qsTr("Today")
                    onClicked: popup.pickDate(new Date())
                }
                TouchButton {
                    text: qsTr("Tomorrow")
                    onClicked: { var d = new Date(); d.setDate(d.getDate() + 1); popup.pickDate(d) }
                }
            }
            RowLayout {
                visible: root.withDate
                Layout.fillWidth: true
                TouchButton {
                    // A day alone is often years away (an expiry date): a year at a time too.
                    visible: !root.withTime
                    text: "«"
                    Accessible.name: qsTr("Previous year")
                    onClicked: popup.shownYear -= 1
                }
                TouchButton {
                    text: "‹"
                    Accessible.name: qsTr("Previous month")
                    onClicked: {
                        if (popup.shownMonth === 0) { popup.shownMonth = 11; popup.shownYear -= 1 }
                        else popup.shownMonth -= 1
                    }
                }
                Label {
                    Layout.fillWidth: true
                    horizontalAlignment: Text.AlignHCenter
                    font.pixelSize: Theme.fontSize
                    font.bold: true
                    text: new Date(popup.shownYear, popup.shownMonth, 1).toLocaleDateString(Qt.locale(), "MMMM yyyy")
                }
                TouchButton {
                    text: "›"
                    Accessible.name: qsTr("Next month")
                    onClicked: {
                        if (popup.shownMonth === 11) { popup.shownMonth = 0; popup.shownYear += 1 }
                        else popup.shownMonth += 1
                    }
                }
                TouchButton {
                    visible: !root.withTime
                    text: "»"
                    Accessible.name: qsTr("Next year")
                    onClicked: popup.shownYear += 1
                }
            }
            DayOfWeekRow {
                visible: root.withDate
                Layout.fillWidth: true
                locale: Qt.locale()
                font.pixelSize: Theme.smallFont
            }
            MonthGrid {
                id: grid
                visible: root.withDate
                Layout.fillWidth: true
                Layout.preferredWidth: Theme.tap * 7
                year: popup.shownYear
                month: popup.shownMonth
                locale: Qt.locale()
                delegate: Rectangle {
                    required property var model
                    implicitWidth: Theme.tap
                    implicitHeight: Theme.tap
                    radius: Theme.radius
                    readonly property bool chosen: model.year === popup.pickYear && model.month + 1 === popup.pickMonth
                                                   && model.day === popup.pickDay
                    color: chosen ? Theme.accent : "transparent"
                    border.color: model.today ? Theme.accent : "transparent"
                    opacity: model.month === grid.month ? 1 : 0.4
                    Accessible.role: Accessible.Button
                    Accessible.name: model.date.toLocaleDateString(Qt.locale(), Locale.LongFormat)
                    Label {
                        anchors.centerIn: parent
                        text: model.day
                        color: parent.chosen ? Theme.accentText : Theme.text
                        font.pixelSize: Theme.fontSize
                    }
                }
                onClicked: function(date) { popup.pickDate(date) }
            }
            RowLayout {
                visible: root.withTime
                spacing: Theme.gap
                Layout.alignment: Qt.AlignHCenter
                ClockWheel {
                    id: hours
                    objectName: "hourTumbler"
                    model: 24
                    Accessible.name: qsTr("Hour")
                }
                Label { text: ":"; font.pixelSize: Theme.largeFont; font.bold: true }
                ClockWheel {
                    id: minutes
                    objectName: "minuteTumbler"
                    model: 60
                    stride: WheelSteps.minuteStride
                    Accessible.name: qsTr("Minute")
                }
                // Any minute, typed (the wheel's notches stop at the quarter hours).
                NumberField {
                    id: typedMinute
                    objectName: "typedMinute"
                    Layout.preferredWidth: Theme.tap * 2.2
                    label: qsTr("Minute, typed")
                    integer: true
                    stepButtons: false
                    from: 0
                    to: 59
                    value: minutes.currentIndex
                    onEdited: function(v) { minutes.currentIndex = Math.round(v) }
                }
            }
            RowLayout {
                Layout.alignment: Qt.AlignRight
                spacing: Theme.gap
                TouchButton {
                    text: qsTr("Cancel")
                    onClicked: popup.close()
                }
                TouchButton {
                    objectName: "dateTimeSet"
                    text: qsTr("Set")
                    highlighted: true
                    onClicked: {
                        popup.close()
                        root.picked(popup.pickYear, popup.pickMonth, popup.pickDay, hours.currentIndex, minutes.currentIndex)
                    }
                }
            }
        }
    }
}
