#pragma once
// What the GUI model tests share: a Workspace on a database file with the shipped data.
#include "workspace.h"

#include <QCoreApplication>
#include <QFile>
#include <QJsonDocument>
#include <QJsonObject>
#include <QSettings>
#include <QStandardPaths>
#include <QString>
#include <QVariantMap>

#include <memory>

namespace phaseplan::testing {

/// Settings and standard paths of the test's own (QStandardPaths test mode, organisation
/// "PhasePlanTest", application `app_name`), emptied: nothing read or left from a real run.
inline void use_test_settings(const char* app_name) {
    QStandardPaths::setTestModeEnabled(true);
    QCoreApplication::setOrganizationName(QStringLiteral("PhasePlanTest"));
    QCoreApplication::setApplicationName(QString::fromLatin1(app_name));
    QSettings().clear();
}

/// Opens (a new file: creates, with the demo) the database at `path` with the shipped data;
/// stops the test run when it cannot.
inline std::unique_ptr<gui::Workspace> open_workspace(const QString& path) {
    auto ws = std::make_unique<gui::Workspace>();
    ws->setDatabasePath(path);
    ws->setDataDir(QStringLiteral(SOURCE_DIR "/data"));
    if (!ws->open())
        qFatal("workspace did not open: %s", qPrintable(ws->errorMessage()));
    return ws;
}

/// The demo's pH 2.5 phosphate buffer document (data/demo), as the screens pass it.
inline QVariantMap demo_buffer() {
    QFile f(QStringLiteral(SOURCE_DIR "/data/demo/buffer-phosphate-ph2.5.json"));
    if (!f.open(QIODevice::ReadOnly))
        qFatal("cannot open the demo buffer");
    return QJsonDocument::fromJson(f.readAll()).object().toVariantMap();
}

} // namespace phaseplan::testing
