// The one Qt Quick Test runner for tests/qml/tst_*.qml. It creates a QApplication (Qt Charts in
// QML needs Qt Widgets), links the app's QML module as a static plugin, and gives each test a
// fresh folder for its database as the context property `testDir`.
#include "app_runner.h"

#include <QApplication>
#include <QQmlContext>
#include <QQmlEngine>
#include <QQuickStyle>
#include <QStandardPaths>
#include <QTemporaryDir>
#include <QtQml/qqmlextensionplugin.h>
#include <QtQuickTest/quicktest.h>

Q_IMPORT_QML_PLUGIN(PhasePlanPlugin)

class Setup : public QObject {
    Q_OBJECT
  public slots:
    void qmlEngineAvailable(QQmlEngine* engine) {
        phaseplan::gui::prepare_engine(*engine);
        engine->rootContext()->setContextProperty(QStringLiteral("testDir"), dir_.path());
        engine->rootContext()->setContextProperty(QStringLiteral("dataDir"),
                                                  QStringLiteral(SOURCE_DIR "/data"));
    }

  private:
    QTemporaryDir dir_;
};

int main(int argc, char** argv) {
    // Settings the screens keep (the last PDF folder) go to a test location, not the user's.
    QStandardPaths::setTestModeEnabled(true);
    QApplication app(argc, argv);
    QQuickStyle::setStyle(QStringLiteral("Fusion"));
    Setup setup;
    return quick_test_main_with_setup(argc, argv, "phaseplan_qml", QUICK_TEST_SOURCE_DIR, &setup);
}

#include "main.moc"
