import QtQuick
import QtTest
import PhasePlan

// NumberField: locale-aware parsing (C and a decimal-comma locale), text that is not a number
// stopped at the field, step buttons clamped to the range, the model's error shown beneath.
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
            to: 14
            decimals: 2
            // The way a screen wires it: the model takes the number, the field shows it back.
            onEdited: function(v) { value = v }
        }
    }
    Component {
        id: spyComponent
        SignalSpy { signalName: "edited" }
    }

    /// Types `text` one key at a time, as a finger would.
    function typeInto(field, text) {
        field.forceActiveFocus()
        field.selectAll()
        keyClick(Qt.Key_Backspace)
        for (var i = 0; i < text.length; ++i)
            keyClick(text[i])
    }

    function test_parse_data() {
        return [
            { tag: "C point", locale: "C", text: "7.25", valid: true, value: 7.25 },
            { tag: "de_DE comma", locale: "de_DE", text: "7,25", valid: true, value: 7.25 },
            { tag: "de_DE grouping", locale: "de_DE", text: "1.000", valid: true, value: 1000 },
            { tag: "en_US grouping", locale: "en_US", text: "1,000.5", valid: true, value: 1000.5 },
            { tag: "letters", locale: "C", text: "abc", valid: false },
            { tag: "two points", locale: "C", text: "7.2.5", valid: false },
        ]
    }
    function test_parse(data) {
        var f = createTemporaryObject(fieldComponent, tc, { locale: Qt.locale(data.locale) })
        var spy = createTemporaryObject(spyComponent, tc, { target: f })
        typeInto(f.field, data.text.slice(0, -1))
        var before = spy.count
        keyClick(data.text[data.text.length - 1])
        compare(f.field.text, data.text)
        if (data.valid) {
            verify(spy.count > 0, "a valid number reaches the model")
            compare(spy.signalArguments[spy.count - 1][0], data.value)
            compare(f.parseError, "")
        } else {
            compare(f.parseError, "Not a valid number.")
            compare(spy.count, before, "the last key made it not a number: nothing reached the model")
            // The message is on screen beneath the field.
            var shown = false
            for (var i = 0; i < f.children.length; ++i)
                if (f.children[i].text === "Not a valid number." && f.children[i].visible)
                    shown = true
            verify(shown)
        }
    }

    function test_value_shown_in_locale() {
        var f = createTemporaryObject(fieldComponent, tc, { locale: Qt.locale("de_DE"), value: 6.8 })
        compare(f.field.text, "6,80")
        f.value = 7.25
        compare(f.field.text, "7,25")
    }

    function test_steps_clamp() {
        var f = createTemporaryObject(fieldComponent, tc, { value: 13.98 })
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

    function test_model_error_shown() {
        var f = createTemporaryObject(fieldComponent, tc, { error: "15 is above the limit of 14" })
        var shown = false
        for (var i = 0; i < f.children.length; ++i)
            if (f.children[i].text === "15 is above the limit of 14" && f.children[i].visible)
                shown = true
        verify(shown, "the core's message is shown beside the field")
    }
}
