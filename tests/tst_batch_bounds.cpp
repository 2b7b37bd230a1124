// Issue 9: stored batches are bounded when read back. A batch row edited by another program to
// hold a huge text, a list of more batches than a screen can show, or a history of more changes
// than the limit, must not hang or exhaust the app: the oversized row is refused by name and left
// unchanged, the list and the history are cut to the newest max_record_array_items entries, and
// each history text to max_record_text_chars (app/storage/database.h). The limits are the
// project's own (common practice, no source).
#include "batch_test_db.h"
#include "chem/error.h"
#include "core/batch_document.h"
#include "core/failure.h"
#include "storage/batch_store.h"
#include "storage/database.h"

#include <QFile>
#include <QJsonDocument>
#include <QSqlDatabase>
#include <QSqlQuery>
#include <QTemporaryDir>
#include <QtTest>

using phaseplan::storage::BatchRecord;
using phaseplan::storage::BatchStore;
namespace storage = phaseplan::storage;

namespace {
using TempDb = phaseplan::testing::TempBatchDb;

BatchRecord demo_record(const QString& id) {
    QFile f(QStringLiteral(SOURCE_DIR "/data/demo/batch-line-a-buffer.json"));
    if (!f.open(QIODevice::ReadOnly))
        qFatal("no demo batch");
    QJsonObject in = QJsonDocument::fromJson(f.readAll()).object();
    QJsonObject batch = in["batch"].toObject();
    batch["id"] = id;
    in["batch"] = batch;
    return BatchRecord::from_input(in);
}

QString error_of(const std::function<void()>& f) {
    try {
        f();
    } catch (const chem::Error& e) {
        return QString::fromStdString(e.field()) + ": " + QString::fromStdString(e.what());
    } catch (const phaseplan::Failure& f) {
        return QString::fromLatin1(f.subject()) + ": " + QString::fromStdString(f.what());
    }
    return {};
}
} // namespace

class TestBatchBounds : public QObject {
    Q_OBJECT
  private slots:
    void initTestCase() { PHASEPLAN_REQUIRE_BACKEND(); }
    void oversizedRowIsRefusedByName();
    void listIsCutToTheNewest();
    void historyIsCut();
};

void TestBatchBounds::oversizedRowIsRefusedByName() {
    TempDb t;
    BatchStore store(t.db);
    store.create(demo_record("B-BIG-001"), "R. Okafor");
    store.create(demo_record("B-OK-001"), "R. Okafor");
    t.drop_trigger("batches_changes_recorded", "batches");
    t.exec(QStringLiteral("UPDATE batches SET comment = '%1' WHERE id = 'B-BIG-001'")
               .arg(QString(storage::max_record_text_chars + 1, QChar('x'))));
    const QString e = error_of([&] { (void)store.load("B-BIG-001"); });
    QVERIFY2(e.startsWith("batch: ") && e.contains("B-BIG-001") && e.contains("too large"),
             qPrintable(e));
    QVERIFY2(e.contains("10001 characters"), qPrintable(e));
    QVERIFY(store.load("B-OK-001").has_value()); // the others still open
    QVERIFY(store.list().contains("B-BIG-001")); // listed, so it can be named and found
}

void TestBatchBounds::listIsCutToTheNewest() {
    TempDb t;
    BatchStore store(t.db);
    store.create(demo_record("B-FIRST-001"), "R. Okafor");
    // More rows than the limit, written directly, all newer than the first.
    t.drop_trigger("batches_changes_recorded", "batches");
    t.exec(QStringLiteral(
               "WITH RECURSIVE n(i) AS (SELECT 1 UNION ALL SELECT i + 1 FROM n WHERE i < %1)"
               " INSERT INTO batches (id, document_kind, document, created_at, updated_at)"
               " SELECT 'B-GEN-' || i, 'recipe', '{}', '2030-01-01T00:00:00',"
               " '2030-01-01T00:00:00' FROM n")
               .arg(storage::max_record_array_items + 10));
    t.exec(QStringLiteral("INSERT INTO batches (id, document_kind, document, created_at,"
                          " updated_at) VALUES ('%1', 'recipe', '{}', '2031-01-01T00:00:00',"
                          " '2031-01-01T00:00:00')")
               .arg(QString(65, QChar('L'))));
    const QStringList ids = store.list();
    QCOMPARE(ids.size(), static_cast<int>(storage::max_record_array_items));
    QVERIFY(!ids.contains("B-FIRST-001"));           // the oldest falls off
    QVERIFY(!ids.contains(QString(65, QChar('L')))); // an id past 64 characters is not listed
}

void TestBatchBounds::historyIsCut() {
    TempDb t;
    BatchStore store(t.db);
    store.create(demo_record("B-HIST-001"), "R. Okafor");
    t.drop_trigger("batch_history_no_update", "batch_history");
    t.exec(QStringLiteral("UPDATE batch_history SET reason = '%1'")
               .arg(QString(storage::max_record_text_chars + 500, QChar('r'))));
    t.exec(QStringLiteral(
               "WITH RECURSIVE n(i) AS (SELECT 1 UNION ALL SELECT i + 1 FROM n WHERE i < %1)"
               " INSERT INTO batch_history (batch_id, revision, at, who, action, field,"
               " old_value, new_value, reason) SELECT 'B-HIST-001', 1, '2030-01-01T00:00:00',"
               " 'X', 'edit', 'comment', '[\"a\"]', '[\"b\"]', '' FROM n")
               .arg(storage::max_record_array_items + 10));
    const auto h = store.history("B-HIST-001");
    QCOMPARE(static_cast<qsizetype>(h.size()), storage::max_record_array_items);
    QCOMPARE(h.back().new_value.toString(), QString("b")); // the newest are kept
    // The first rows (created, long reason) fell off; a cut text reads back as text.
    t.exec(QStringLiteral("UPDATE batch_history SET new_value = '[\"%1\"]' WHERE seq = (SELECT"
                          " max(seq) FROM batch_history)")
               .arg(QString(storage::max_record_text_chars + 5, QChar('v'))));
    const auto h2 = store.history("B-HIST-001");
    QVERIFY(h2.back().new_value.toString().endsWith(QStringLiteral("…")));
    QVERIFY(h2.back().new_value.toString().size() <= storage::max_record_text_chars + 1);
}

QTEST_GUILESS_MAIN(TestBatchBounds)
#include "tst_batch_bounds.moc"
