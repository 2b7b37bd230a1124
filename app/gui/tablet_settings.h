#pragma once
// Settings of this tablet (not of the lab's database): the on-screen keyboard. Kept with
// QSettings under "tablet/"; the keyboard is chosen before the application starts, because Qt
// reads its input method (QT_IM_MODULE) once, at start.
#include <QObject>
#include <QQmlEngine>

namespace phaseplan::gui {

/// Applies the on-screen keyboard choice for this run, before QApplication exists: the command
/// line's `--keyboard on|off` wins (and is kept), else the saved setting. Sets QT_IM_MODULE to
/// Qt Virtual Keyboard when on; an input method already chosen in the environment is left alone
/// when off. @return whether the keyboard is on for this run.
bool apply_keyboard_choice(int argc, char** argv);

class TabletSettings : public QObject {
    Q_OBJECT
    QML_ELEMENT
    QML_SINGLETON
    /// The saved choice: an on-screen keyboard at the next start.
    Q_PROPERTY(bool keyboardEnabled READ keyboardEnabled WRITE setKeyboardEnabled NOTIFY
                   keyboardEnabledChanged)
    /// The on-screen keyboard is the input method of this run (QT_IM_MODULE).
    Q_PROPERTY(bool keyboardActive READ keyboardActive CONSTANT)

  public:
    explicit TabletSettings(QObject* parent = nullptr) : QObject(parent) {}
    bool keyboardEnabled() const;
    void setKeyboardEnabled(bool on);
    bool keyboardActive() const;

  signals:
    void keyboardEnabledChanged();
};

} // namespace phaseplan::gui
