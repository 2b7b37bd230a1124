#pragma once
// How the time picker's wheels turn (qml/common/ClockWheel.qml): a notch of the mouse wheel or
// touchpad, or an Up/Down key, moves the wheel to its next stop. The minute wheel stops at the
// quarter hours (00, 15, 30, 45: a bench user plans tonight's start to the quarter hour; common
// practice, no source); any other minute is typed, and the next turn from it goes to the stop in
// the direction turned.
#include <QObject>
#include <QQmlEngine>

namespace phaseplan::gui {

/// The value a wheel of `count` values (0 … count − 1, wrapping: minutes 0–59) shows after
/// `notches` notches (positive: to larger values), stopping only at multiples of `stride`
/// (1: every value). A value between stops counts its first notch to the neighbouring stop in
/// that direction: from 07 with stride 15, +1 is 15 and −1 is 00. `stride` must divide `count`;
/// otherwise (or when it is below 2) every value is a stop.
int turn_wheel(int value, int notches, int count, int stride);

class WheelSteps : public QObject {
    Q_OBJECT
    QML_ELEMENT
    QML_SINGLETON

  public:
    using QObject::QObject;

    /// turn_wheel() for a view.
    Q_INVOKABLE static int turn(int value, int notches, int count, int stride) {
        return turn_wheel(value, notches, count, stride);
    }
    /// The stops of the minute wheel, minutes apart (15: 00, 15, 30, 45).
    static constexpr int minute_stride = 15;
    Q_PROPERTY(int minuteStride READ minuteStride CONSTANT)
    int minuteStride() const { return minute_stride; }
};

} // namespace phaseplan::gui
