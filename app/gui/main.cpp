// phaseplan: the Qt Quick app for the prep bench.
//   phaseplan [--database FILE|URI] [--data DIR]  run the app (first run opens the demo); URI:
//                                                 postgresql://user@host:port/dbname
//   phaseplan --no-demo [--database NEW_FILE|URI] a new database starts empty (the lab's first
//                                                 run: Prepare & record creates the administrator)
//   phaseplan --screenshot DIR                   render every main screen in both orientations
//                                                to DIR/<screen>-<orientation>.png and exit;
//                                                status 1 on any QML warning or error
//   phaseplan --self-test                        the same without writing files
//   phaseplan --measure                          print start-up and recompute+redraw times
//   phaseplan --dark                             a dark palette, as a dark system theme gives
// --screenshot, --self-test and --measure use a fresh temporary database unless --database is
// given.
#include "app_runner.h"
#include "core/runtime_dir.h"
#include "tablet_settings.h"

#include <QApplication>
#include <QtQml/qqmlextensionplugin.h>

// The QML module is a static plugin linked into the binary (toolchain.md, quirk 3).
Q_IMPORT_QML_PLUGIN(PhasePlanPlugin)

int main(int argc, char** argv) {
    phaseplan::gui::start_clock();
    // The on-screen keyboard is an input method: chosen before Qt starts (--keyboard on|off).
    phaseplan::gui::apply_keyboard_choice(argc, argv);
    // Without XDG_RUNTIME_DIR Qt warns on stderr at start; a private folder keeps stderr quiet.
    const phaseplan::PrivateRuntimeDir runtime_dir;
    // Qt Charts in QML needs a QApplication (Qt Widgets), not a QGuiApplication.
    QApplication app(argc, argv);
    return phaseplan::gui::run_app(app);
}
