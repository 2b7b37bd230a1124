#include "tablet_settings.h"

#include "chem/error.h"
#include "storage/sql_dialect.h"

#include <QDir>
#include <QFileInfo>
#include <QSettings>

#include <cstring>

namespace phaseplan::gui {

namespace {

constexpr const char* keyboard_key = "tablet/keyboard";
constexpr const char* database_key = "tablet/database";

QString& database_in_use() {
    static QString location;
    return location;
}
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

QString saved_database_location() {
    return settings().value(database_key).toString();
}

void set_database_in_use(const QString& location) {
    database_in_use() = location;
}

QString TabletSettings::database() const {
    return saved_database_location();
}

QString TabletSettings::databaseInUse() const {
    return database_in_use();
}

QString TabletSettings::setDatabase(const QString& location) {
    const QString text = location.trimmed();
    if (storage::sql::is_postgresql_uri(text)) {
        try {
            storage::sql::parse_postgresql_uri(text);
        } catch (const chem::Error& e) {
            return tr("Database: %1").arg(QString::fromStdString(e.message()));
        }
    } else if (!text.isEmpty()) {
        const QFileInfo file(text);
        if (!file.isAbsolute())
            return tr("Database: \"%1\" is not a full path; give a file from the top folder "
                      "(/…) or a postgresql://user@host:port/dbname address")
                .arg(text);
        if (!file.dir().exists())
            return tr("Database: the folder %1 does not exist").arg(file.dir().path());
        if (file.isDir())
            return tr("Database: %1 is a folder; name a file in it").arg(text);
    }
    if (text == database())
        return {};
    settings().setValue(database_key, text);
    emit databaseChanged();
    return {};
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
