pragma Singleton
import QtQuick

// Touch sizes from the screen's physical density, and colours from the system palette (light or
// dark). Every view takes its sizes and colours from here: no pixel literals, no colour literals
// outside this file.
QtObject {
    id: theme

    /// Pixels per millimetre of the screen the app starts on.
    readonly property real pxPerMm: Qt.application.screens.length > 0 && Qt.application.screens[0].pixelDensity > 0
                                    ? Qt.application.screens[0].pixelDensity : 4
    /// The smallest hit target: 9 mm, and never under 44 px on a low-density screen.
    readonly property int tap: Math.max(Math.round(9 * pxPerMm), 44)
    /// Text read at arm's length from a tablet propped by the balance.
    readonly property int fontSize: Math.max(17, Math.round(3 * pxPerMm))
    readonly property int smallFont: Math.round(fontSize * 0.85)
    readonly property int largeFont: Math.round(fontSize * 1.3)
    readonly property int hugeFont: Math.round(fontSize * 1.9)
    readonly property int gap: Math.max(6, Math.round(1.6 * pxPerMm))
    readonly property int margin: Math.max(10, Math.round(3 * pxPerMm))
    readonly property int radius: Math.round(gap * 0.8)

    readonly property SystemPalette palette: SystemPalette { colorGroup: SystemPalette.Active }
    readonly property bool dark: palette.window.hslLightness < 0.5

    readonly property color window: palette.window
    /// Panels: halfway between the window and the input fields, so a field stands out on its card
    /// in a light and in a dark palette.
    readonly property color card: Qt.tint(palette.window, Qt.rgba(palette.base.r, palette.base.g, palette.base.b, 0.5))
    readonly property color field: palette.base
    readonly property color text: palette.windowText
    readonly property color dimText: Qt.rgba(text.r, text.g, text.b, 0.68)
    readonly property color line: Qt.rgba(text.r, text.g, text.b, 0.18)
    readonly property color accent: palette.highlight
    readonly property color accentText: palette.highlightedText
    readonly property color button: palette.button
    readonly property color buttonText: palette.buttonText
    readonly property color placeholder: palette.placeholderText

    // Severity colours, readable on the card colour in both palettes.
    readonly property color bad: dark ? "#ff8a80" : "#b3261e"
    readonly property color warn: dark ? "#ffd180" : "#8a5300"
    readonly property color info: dark ? "#82b1ff" : "#1a5fb4"
    readonly property color good: dark ? "#9ccc65" : "#2e7d32"
    /// Series colours of lines A–D in the plots.
    readonly property var lineColours: dark ? ["#64b5f6", "#ffb74d", "#81c784", "#e57373"]
                                            : ["#1565c0", "#e65100", "#2e7d32", "#c62828"]

    /// Columns for a grid of number fields in `width` px: as many as fit, at most `most`.
    function columnsFor(width, most) {
        return Math.max(1, Math.min(most, Math.floor(width / (tap * 5.8))))
    }

    function severityColour(severity) {
        if (severity === "error" || severity === "warning")
            return bad
        if (severity === "caution")
            return warn
        return info
    }
}
