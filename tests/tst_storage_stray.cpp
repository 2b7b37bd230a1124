// Issue 9: a first run killed while it built the new database left "<file>.new-<pid>-<ms>" beside
// it for good. The next first run removes such files (and their -wal/-shm/-journal) when their
// process is gone, and leaves those of a process still running (another first run, now).
#include "storage/database.h"

#include <QCoreApplication>
#include <QFile>
#include <QProcess>
#include <QTemporaryDir>
#include <QtTest>

namespace storage = phaseplan::storage;

class TestStorageStray : public QObject {
    Q_OBJECT
  private slots:
    void strayFilesOfDeadRunsAreRemoved();
};

void TestStorageStray::strayFilesOfDeadRunsAreRemoved() {
    QTemporaryDir dir;
    const QString db = dir.filePath("lab.sqlite");
    // The pid of a process that has since finished: nothing runs under it now.
    QProcess q;
    q.start("sleep", {"0.2"});
    QVERIFY(q.waitForStarted());
    const qint64 gone = q.processId();
    QVERIFY(q.waitForFinished());
    const QString stale = db + QStringLiteral(".new-%1-1764600000000").arg(gone);
    const QString live =
        db + QStringLiteral(".new-%1-1764600000001").arg(QCoreApplication::applicationPid());
    for (const QString& f : {stale, stale + "-wal", stale + "-journal", live}) {
        QFile out(f);
        QVERIFY(out.open(QIODevice::WriteOnly));
        out.write("half-made");
    }
    {
        storage::Database opened(db);
        QVERIFY(opened.created());
    }
    QVERIFY(!QFile::exists(stale));
    QVERIFY(!QFile::exists(stale + "-wal"));
    QVERIFY(!QFile::exists(stale + "-journal"));
    QVERIFY(QFile::exists(live)); // a running process's file is not touched
    QVERIFY(QFile::exists(db));
}

QTEST_GUILESS_MAIN(TestStorageStray)
#include "tst_storage_stray.moc"
