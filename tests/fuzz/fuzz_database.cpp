// libFuzzer target: bytes as a database file. Opening must either refuse the file with
// chem::Error (not PhasePlan's, not SQLite, newer schema, corrupt) or give a database whose saved
// work, settings and library read back within the limits; nothing else.
//
// PHASEPLAN_FUZZ_WRITE_SEED=DIR writes a seed (a PhasePlan file with the demo's documents) to
// DIR/phaseplan.sqlite and exits: .ci/fuzz.sh seeds the corpus with it.
#include "core/failure.h"
#include "fuzz_common.h"
#include "storage/database.h"

#include <QDir>
#include <QFile>
#include <QJsonDocument>
#include <QSqlDatabase>
#include <QSqlQuery>
#include <QTemporaryDir>

#include <cstdio>

namespace {

QString scratch() {
    // In memory (/dev/shm) when there is one: every open syncs, and a disk makes that slow.
    static QTemporaryDir dir(QDir(QStringLiteral("/dev/shm")).exists()
                                 ? QStringLiteral("/dev/shm/phaseplan-fuzz-XXXXXX")
                                 : QDir::tempPath() + QStringLiteral("/phaseplan-fuzz-XXXXXX"));
    return dir.filePath(QStringLiteral("fuzz.sqlite"));
}

void remove_all(const QString& path) {
    for (const char* suffix : {"", "-wal", "-shm"})
        QFile::remove(path + QLatin1String(suffix));
}

} // namespace

extern "C" int LLVMFuzzerInitialize(int*, char***) {
    phaseplan::fuzz::app();
    const QByteArray seed_dir = qgetenv("PHASEPLAN_FUZZ_WRITE_SEED");
    if (seed_dir.isEmpty())
        return 0;
    const QString path = QString::fromLocal8Bit(seed_dir) + QStringLiteral("/phaseplan.sqlite");
    remove_all(path);
    QFile demo(QStringLiteral(PHASEPLAN_SOURCE_DATA_DIR "/demo/overnight-sequence.json"));
    demo.open(QIODevice::ReadOnly);
    const QJsonObject doc = QJsonDocument::fromJson(demo.readAll()).object();
    {
        phaseplan::storage::Database db(path, -1, [&](phaseplan::storage::Database& d) {
            d.save(phaseplan::storage::DocumentKind::sequence, QStringLiteral("demo"), doc);
            d.set_setting(QStringLiteral("current_plan"),
                          QJsonObject{{"name", "demo"}, {"document", doc}});
        });
        db.exec(QStringLiteral("PRAGMA wal_checkpoint(TRUNCATE)"));
    }
    {
        // Small pages keep the seed small (about 20 KB instead of 120 KB): faster mutations.
        QSqlDatabase raw =
            QSqlDatabase::addDatabase(QStringLiteral("QSQLITE"), QStringLiteral("seed"));
        raw.setDatabaseName(path);
        raw.open();
        QSqlQuery q(raw);
        q.exec(QStringLiteral("PRAGMA journal_mode=DELETE"));
        q.exec(QStringLiteral("PRAGMA page_size=512"));
        q.exec(QStringLiteral("VACUUM"));
        raw.close();
    }
    QSqlDatabase::removeDatabase(QStringLiteral("seed"));
    std::printf("wrote %s\n", qPrintable(path));
    std::exit(0);
}

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* bytes, std::size_t size) {
    using namespace phaseplan::storage;
    const QString path = scratch();
    remove_all(path);
    {
        QFile f(path);
        if (!f.open(QIODevice::WriteOnly))
            std::abort();
        f.write(reinterpret_cast<const char*>(bytes), static_cast<qint64>(size));
    }
    try {
        Database db(path);
        for (const DocumentInfo& i : db.list_all())
            (void)db.load(i.kind, i.name);
        (void)db.setting(QStringLiteral("current_plan"));
        (void)db.merged_file(QStringLiteral("reagents.json"));
        for (const SetAsideRecord& r : db.set_aside())
            if (r.reason.isEmpty())
                std::abort(); // a record set aside says why
    } catch (const chem::Error&) {
        // an input refused with the field named
    } catch (const phaseplan::Failure&) {
        // a file that is not a PhasePlan database, said in one sentence and left unchanged
    }
    remove_all(path);
    return 0;
}
