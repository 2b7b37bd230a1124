import QtQuick
import QtQuick.VirtualKeyboard

// The on-screen keyboard (Qt Virtual Keyboard), for tablets without one. Loaded by Main.qml only
// when the keyboard is this run's input method (TabletSettings.keyboardActive).
InputPanel {
    objectName: "keyboardPanel"
}
