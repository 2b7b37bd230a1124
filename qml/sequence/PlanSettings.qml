import QtQuick
import QtQuick.Controls
import QtQuick.Layouts
import PhasePlan

// The instrument and the night: waste container, detector, column pH range (the start has its
// own card at the head of the night, StartCard).
Card {
    id: root

    required property Plan plan

    function errorFor(field) {
        return FieldPath.belongs(root.plan.errorField, field) ? root.plan.errorMessage : ""
    }
    /// Focuses the field a check or an error names ("detector.wavelength_nm", "column.ph_max",
    /// "waste_ml"); anything else on this card focuses the waste field, its first.
    function focusField(path) {
        var target = wasteField.field
        if (FieldPath.belongs(path, "column.ph_min")) target = columnPhMinField.field
        else if (FieldPath.belongs(path, "column.ph_max")) target = columnPhMaxField.field
        else if (FieldPath.belongs(path, "detector"))
            target = wavelengthField.visible ? wavelengthField.field : detectorChoice
        target.forceActiveFocus()
    }

    title: qsTr("Instrument and waste")

    NumberField {
        id: wasteField
        objectName: "wasteField"
        Layout.fillWidth: true
        label: qsTr("Free volume in the waste container")
        unit: "mL"
        value: root.plan.wasteCapacityMl
        step: 500
        decimals: 0
        from: 0
        error: root.errorFor("waste_ml")
        onEdited: function(v) { root.plan.wasteCapacityMl = v }
    }
    SegmentedChoice {
        id: detectorChoice
        Layout.fillWidth: true
        label: qsTr("Detector")
        objectName: "detectorChoice"
        options: root.plan.detectorTypes
        current: root.plan.detectorType
        onPicked: function(id) { root.plan.detectorType = id }
    }
    NumberField {
        id: wavelengthField
        objectName: "wavelengthField"
        Layout.fillWidth: true
        visible: root.plan.detectorReadsUv
        label: qsTr("Detection wavelength")
        unit: "nm"
        value: root.plan.detectorWavelengthNm
        step: 5
        decimals: 0
        from: 0
        error: root.errorFor("detector")
        onEdited: function(v) { root.plan.detectorWavelengthNm = v }
    }
    GridLayout {
        Layout.fillWidth: true
        columns: Theme.columnsFor(width, 2)
        columnSpacing: Theme.gap
        NumberField {
            id: columnPhMinField
            objectName: "columnPhMinField"
            Layout.fillWidth: true
            label: qsTr("Column pH, lowest")
            value: root.plan.columnPhMin
            step: 0.5
            decimals: 1
            from: 0
            to: 14
            error: root.errorFor("column.ph_min")
            onEdited: function(v) { root.plan.columnPhMin = v }
        }
        NumberField {
            id: columnPhMaxField
            objectName: "columnPhMaxField"
            Layout.fillWidth: true
            label: qsTr("Column pH, highest")
            value: root.plan.columnPhMax
            step: 0.5
            decimals: 1
            from: 0
            to: 14
            error: root.errorFor("column.ph_max")
            onEdited: function(v) { root.plan.columnPhMax = v }
        }
    }
}
