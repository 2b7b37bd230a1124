import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// The amount actually weighed or measured: empty until entered. It is the common NumberField
// (typing read by NumberText: "." and "," are both decimal marks, a thousands separator is
// refused), optional (cleared = not entered) and applied when editing finishes, so that each
// stored value, with its history row, is the number the preparer meant. The core's own check
// comes in through `error`.
NumberField {
    id: root

    optional: true
    applyOnFinish: true
    stepButtons: false
    from: 0
    to: 1e6
    decimals: 3
    value: NaN
    placeholder: qsTr("not entered")
}
