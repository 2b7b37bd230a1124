import QtQuick
import QtTest
import PhasePlan

// NumberField: "." and "," are both decimal marks in every locale; a thousands separator is
// refused, never taken as grouping ("3,161" g is 3.161 g); an incomplete number ("6,") is not
// applied; values are shown with the locale's mark and no grouping; the step buttons clamp to
// the range; the model's error is shown beneath. Run under C, en_US, de_DE and fr_FR.
TestCase {
    id: tc
    name: "NumberField"
    when: windowShown
    visible: true
    width: 700
    height: 300

    Component {
        id: fieldComponent
        NumberField {
            width: 500
            label: "Target pH"
            value: 7
            step: 0.05
            from: 0
            to: 5000
            decimals: 2
            // The way a screen wires it: the model takes the number, the field shows it back.
            onEdited: function(v) { value = v }
        }
    }
    Component {
        id: spyComponent
        SignalSpy { signalName: "edited" }
    }
    Component {
        id: pageComponent
        Item {
            property int pendingInputs: 0
            width: 600
            height: 200
            property alias field: inner
            NumberField { id: inner; width: 500; label: "Volume"; value: 1000; decimals: 0; from: 0; to: 1e6 }
        }
    }

    /// Types `text` one key at a time, as a finger would.
    function typeInto(field, text) {
        field.forceActiveFocus()
        field.selectAll()
        keyClick(Qt.Key_Backspace)
        for (var i = 0; i < text.length; ++i)
            keyClick(text[i])
    }

    readonly property var locales: ["C", "en_US", "de_DE", "fr_FR"]
    readonly property var cases: [
        { tag: "point", text: "7.25", value: 7.25 },
        { tag: "comma", text: "7,25", value: 7.25 },
        { tag: "comma is a decimal, not thousands", text: "3,161", value: 3.161 },
        { tag: "small weighing with comma", text: "0,125", value: 0.125 },
        { tag: "whole", text: "12", value: 12 },
        { tag: "en grouping refused", text: "1,000.5", refused: "thousands separator" },
        { tag: "de grouping refused", text: "1.000,5", refused: "thousands separator" },
        { tag: "space grouping refused", text: "1 000", refused: "thousands separator" },
        { tag: "incomplete", text: "6,", refused: "not complete" },
        { tag: "letters", text: "abc", refused: "not a number" },
        { tag: "exponent", text: "1e3", refused: "not a number" },
    ]

    function test_parse_data() {
        var rows = []
        for (var l = 0; l < locales.length; ++l)
            for (var c = 0; c < cases.length; ++c) {
                var row = Object.assign({}, cases[c])
                row.tag = locales[l] + ": " + cases[c].tag
                row.locale = locales[l]
                rows.push(row)
            }
        return rows
    }
    function test_parse(data) {
        var f = createTemporaryObject(fieldComponent, tc, { locale: Qt.locale(data.locale) })
        var spy = createTemporaryObject(spyComponent, tc, { target: f })
        typeInto(f.field, data.text)
        compare(f.field.text, data.text)
        if (data.refused === undefined) {
            verify(spy.count > 0, "a valid number reaches the model")
            compare(spy.signalArguments[spy.count - 1][0], data.value)
            compare(f.parseError, "")
            verify(!f.pending)
        } else {
            verify(f.parseError.indexOf(data.refused) >= 0, f.parseError)
            verify(f.parseError.indexOf("Target pH") === 0, "the message names the field")
            verify(f.parseError.indexOf(data.text.trim()) >= 0, "the message quotes what was typed")
            verify(f.pending)
            // What reached the model last is not the refused text read some other way.
            for (var i = 0; i < spy.count; ++i)
                verify(spy.signalArguments[i][0] !== 1000 && spy.signalArguments[i][0] !== 1000.5
                       && spy.signalArguments[i][0] !== 3161)
            var shown = findChild(f, "fieldMessage")
            verify(shown.visible)
            compare(shown.text, f.parseError)
        }
    }

    function test_value_shown_in_locale_data() {
        return [
            { tag: "C", locale: "C", small: "6.80", large: "1234.50" },
            { tag: "en_US", locale: "en_US", small: "6.80", large: "1234.50" },
            { tag: "de_DE", locale: "de_DE", small: "6,80", large: "1234,50" },
            { tag: "fr_FR", locale: "fr_FR", small: "6,80", large: "1234,50" },
        ]
    }
    function test_value_shown_in_locale(data) {
        var f = createTemporaryObject(fieldComponent, tc, { locale: Qt.locale(data.locale), value: 6.8 })
        compare(f.field.text, data.small)
        f.value = 1234.5
        compare(f.field.text, data.large, "no group separator: what is shown can be typed back")
    }

    function test_pending_counted_on_page() {
        var page = createTemporaryObject(pageComponent, tc)
        compare(page.pendingInputs, 0)
        typeInto(page.field.field, "12,")
        compare(page.pendingInputs, 1, "an incomplete number is counted as not applied")
        keyClick("5")
        compare(page.pendingInputs, 0)
        typeInto(page.field.field, "1.000,5")
        compare(page.pendingInputs, 1)
        keyClick(Qt.Key_Escape)
        compare(page.pendingInputs, 0, "Escape shows the model's value again")
        compare(page.field.field.text, "1000")
    }

    function test_steps_clamp() {
        var f = createTemporaryObject(fieldComponent, tc, { value: 13.98, to: 14 })
        var spy = createTemporaryObject(spyComponent, tc, { target: f })
        f.stepBy(1)
        compare(f.value, 14, "clamped to the top of the range")
        f.stepBy(-1)
        compare(f.value, 13.95)
        f.value = 0.02
        f.stepBy(-1)
        compare(f.value, 0)
        compare(spy.count, 3)
    }

    function test_out_of_range_refused() {
        var f = createTemporaryObject(fieldComponent, tc, { to: 14 })
        var spy = createTemporaryObject(spyComponent, tc, { target: f })
        typeInto(f.field, "15")
        verify(f.parseError.indexOf("15 is more than 14") >= 0, f.parseError)
        for (var i = 0; i < spy.count; ++i)
            verify(spy.signalArguments[i][0] !== 15)
    }

    function test_below_range_names_only_the_lower_bound() {
        // The upper bound is the wide default (1e9): the message names only the bound crossed.
        var f = createTemporaryObject(fieldComponent, tc, { from: 0, integer: true, label: "Injections" })
        typeInto(f.field, "-3")
        compare(f.parseError, "Injections: -3 is less than 0; not applied.")
    }

    function test_model_error_shown() {
        var f = createTemporaryObject(fieldComponent, tc, { error: "15 is above the limit of 14" })
        var shown = findChild(f, "fieldMessage")
        verify(shown.visible, "the core's message is shown beside the field")
        compare(shown.text, "15 is above the limit of 14")
    }
}
