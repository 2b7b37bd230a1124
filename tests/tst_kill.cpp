// Crash safety, measured (issue 9): a helper process saves buffers, plan states and batch edits in
// turn, each in one transaction, and is killed with SIGKILL at random moments until 1,000 saves
// have been committed; then again on a file whose process may not grow it past a small limit
// (RLIMIT_FSIZE, as `ulimit -f` sets), so that saves also fail for lack of space. After every kill:
// PRAGMA integrity_check says "ok", every save the helper reported committed is in the file, and
// the file opens and takes a save. SQLite's promise checked here:
// https://sqlite.org/atomiccommit.html and https://sqlite.org/wal.html (a committed WAL transaction
// survives a process crash).
//
// Helper mode: tst_kill --save-mixed DB FIRST   saves FIRST, FIRST+1, … printing "committed N"
// (or "failed N: why") after each, until killed.
#include "core/failure.h"
#include "storage/batch_store.h"
#include "storage/database.h"

#include <QCoreApplication>
#include <QFileInfo>
#include <QJsonArray>
#include <QProcess>
#include <QRandomGenerator>
#include <QSqlQuery>
#include <QTemporaryDir>
#include <QTest>

#include <csignal>
#include <cstdio>
#include <set>

#include <sys/resource.h>

using namespace phaseplan::storage;

namespace {

const QString batch_id = QStringLiteral("KILL-0001");

QJsonObject recipe_doc(int n) {
    return QJsonObject{{"target_ph", 2.5},
                       {"temperature_c", 25},
                       {"volume_ml", 1000},
                       {"route", "mix"},
                       {"acid", "phosphoric-acid"},
                       {"base", "sodium-dihydrogen-phosphate-monohydrate"},
                       {"concentration_mol_per_l", 0.02},
                       {"save", n}};
}

BatchRecord batch_with(const QString& who) {
    QJsonObject in = recipe_doc(0);
    in["batch"] =
        QJsonObject{{"id", batch_id}, {"prepared_by", who}, {"prepared_at", "2026-12-01T16:30:00"}};
    return BatchRecord::from_input(in);
}

/// Save n: a buffer (n % 3 == 0), a plan state (1) or a batch edit (2), each one transaction.
void save(Database& db, BatchStore& store, int n) {
    switch (n % 3) {
    case 0:
        db.save(DocumentKind::buffer, QStringLiteral("buffer %1").arg(n), recipe_doc(n));
        break;
    case 1:
        db.set_setting(QStringLiteral("plan %1").arg(n), QJsonObject{{"name", "plan"}, {"n", n}});
        break;
    default:
        store.edit(batch_id, batch_with(QStringLiteral("tech %1").arg(n)),
                   QStringLiteral("tech %1").arg(n));
    }
}

bool present(Database& db, int n) {
    switch (n % 3) {
    case 0:
        return db.load(DocumentKind::buffer, QStringLiteral("buffer %1").arg(n)).has_value();
    case 1:
        return db.setting(QStringLiteral("plan %1").arg(n)).toObject().value("n").toInt() == n;
    default: {
        QSqlQuery q = db.exec(
            QStringLiteral("SELECT count(*) FROM batch_history WHERE batch_id = ? AND who = ?"),
            {batch_id, QStringLiteral("tech %1").arg(n)});
        return q.next() && q.value(0).toInt() > 0;
    }
    }
}

int run_helper(const QString& path, int first) {
    std::signal(SIGXFSZ, SIG_IGN); // past the size limit a write fails (EFBIG) instead of killing
    std::setvbuf(stdout, nullptr, _IONBF, 0);
    Database db(path);
    BatchStore store(db.connection());
    for (int n = first;; ++n) {
        try {
            save(db, store, n);
            std::printf("committed %d\n", n);
        } catch (const phaseplan::Failure& e) { // the disk is full
            std::printf("failed %d: %s\n", n, e.what());
        } catch (const chem::Error& e) {
            std::printf("failed %d: %s\n", n, e.what());
        }
    }
}

struct Tally {
    int rounds = 0, committed = 0, failed = 0;
};

} // namespace

class TestKill : public QObject {
    Q_OBJECT
    QTemporaryDir dir_;

    /// Kills helpers until `target` saves were committed (or, with a size limit, attempted).
    void kill_until(const QString& path, int target, qint64 size_step_bytes, Tally& t) {
        {
            Database db(path);
            BatchStore store(db.connection());
            store.create(batch_with("tech 0"), "tech 0");
        }
        QRandomGenerator rng(20261202); // fixed: a failure can be replayed
        std::set<int> committed;
        int next = 1;
        qint64 limit = QFileInfo(path).size();
        while ((size_step_bytes ? t.committed + t.failed : t.committed) < target) {
            QProcess helper;
            if (size_step_bytes) {
                limit += size_step_bytes;
                const rlim_t bytes = static_cast<rlim_t>(limit);
                helper.setChildProcessModifier([bytes] {
                    const rlimit r{bytes, bytes};
                    ::setrlimit(RLIMIT_FSIZE, &r);
                });
            }
            helper.start(QCoreApplication::applicationFilePath(),
                         {"--save-mixed", path, QString::number(next)});
            QVERIFY(helper.waitForStarted(10000));
            QByteArray out;
            while (!out.contains('\n') && helper.waitForReadyRead(20000))
                out += helper.readAllStandardOutput();
            QTest::qWait(static_cast<int>(rng.bounded(40)));
            helper.kill();
            QVERIFY(helper.waitForFinished(10000));
            out += helper.readAllStandardOutput();
            ++t.rounds;
            int last = next - 1;
            for (const QByteArray& l : out.split('\n')) {
                if (l.startsWith("committed ")) {
                    committed.insert(l.mid(10).toInt());
                    ++t.committed;
                    last = l.mid(10).toInt();
                } else if (l.startsWith("failed ")) {
                    ++t.failed;
                    last = l.mid(7, l.indexOf(':') - 7).toInt();
                }
            }
            next = last + 2; // the one in flight at the kill may or may not have landed

            Database db(path);
            QSqlQuery ok = db.exec("PRAGMA integrity_check");
            QVERIFY(ok.next());
            QCOMPARE(ok.value(0).toString(), QString("ok"));
            for (int n : committed)
                QVERIFY2(
                    present(db, n),
                    qPrintable(QStringLiteral(
                                   "save %1 was reported committed but is missing after round %2")
                                   .arg(n)
                                   .arg(t.rounds)));
            if (!size_step_bytes)
                QVERIFY(db.writable()); // the app starts and could save
        }
        qInfo("%s: %d kills, %d saves committed and all present, %d refused for lack of space",
              qPrintable(QFileInfo(path).fileName()), t.rounds, t.committed, t.failed);
    }

  private slots:
    void thousand_saves_killed_at_random_lose_nothing() {
        Tally t;
        kill_until(dir_.filePath("kill.sqlite"), 1000, 0, t);
        QVERIFY(t.committed >= 1000);
    }

    void thousand_saves_on_a_nearly_full_file_lose_nothing() {
        Tally t;
        kill_until(dir_.filePath("full.sqlite"), 1000, 2 * 1024, t);
        QVERIFY(t.committed > 0); // some saves fit …
        QVERIFY(t.failed > 0);    // … and some did not: the limit was reached
    }
};

int main(int argc, char** argv) {
    QCoreApplication app(argc, argv);
    if (argc == 4 && QByteArray(argv[1]) == "--save-mixed")
        return run_helper(QString::fromLocal8Bit(argv[2]), QByteArray(argv[3]).toInt());
    TestKill t;
    return QTest::qExec(&t, argc, argv);
}

#include "tst_kill.moc"
