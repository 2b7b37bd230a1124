#include "tablet_settings.h"

#include <QSettings>

#include <cstring>

namespace phaseplan::gui {

namespace {

constexpr const char* keyboard_key = "tablet/keyboard";
constexpr const char* vkb_module = "qtvirtualkeyboard";

/// The app's settings file, reachable before QCoreApplication has its names.
QSettings settings() {
    return QSettings(QSettings::IniFormat, QSettings::UserScope, "PhasePlan", "PhasePlan");
}

} // namespace

bool apply_keyboard_choice(int argc, char** argv) {
    int choice = -1; // -1: not given on the command line
    for (int i = 1; i + 1 < argc; ++i)
        if (std::strcmp(argv[i], "--keyboard") == 0) {
            if (std::strcmp(argv[i + 1], "on") == 0)
                choice = 1;
            else if (std::strcmp(argv[i + 1], "off") == 0)
                choice = 0;
        }
    bool on = false;
    {
        QSettings s = settings();
        if (choice >= 0)
            s.setValue(keyboard_key, choice == 1);
        on = s.value(keyboard_key, false).toBool();
    }
    if (on)
        qputenv("QT_IM_MODULE", vkb_module);
    else if (qgetenv("QT_IM_MODULE") == vkb_module)
        qunsetenv("QT_IM_MODULE");
    return on;
}

bool TabletSettings::keyboardEnabled() const {
    return settings().value(keyboard_key, false).toBool();
}

void TabletSettings::setKeyboardEnabled(bool on) {
    if (on == keyboardEnabled())
        return;
    settings().setValue(keyboard_key, on);
    emit keyboardEnabledChanged();
}

bool TabletSettings::keyboardActive() const {
    return qgetenv("QT_IM_MODULE") == vkb_module;
}

} // namespace phaseplan::gui
