// The reagent-lot shelf (app/storage/lot_store.h) and what it does to a batch (chem::use_by,
// BatchStore::override_expired_lot), on SQLite and, as tst_lots_pg, on PostgreSQL
// (tests/test_backend.h). The rules checked, and where they come from:
//   - a lot is opened no earlier than it is received, and expires after it is received: common
//     practice, no source;
//   - a lot may be used on its expiry date, not after; a lot whose expiry date lies before the
//     day of preparation is expired: common practice, no source;
//   - a prepared solution is not used after the expiry of any reagent in it, so its use-by is
//     clamped to the earliest lot: common practice, no source (issue 13, part 7);
//   - using an expired lot needs an approver, who signs in again with the password and gives a
//     reason (21 CFR 11.200(a)(1), two components, and EU GMP Annex 11 §9, the reason for a
//     GMP-relevant change; from memory); the override, who, when and why go into the audit
//     trail.
// Every expected date below was worked out by hand from the dates given in the test.
#include "chem/batch.h"
#include "chem/error.h"
#include "core/app_data.h"
#include "core/batch_document.h"
#include "core/failure.h"
#include "print/documents.h"
#include "storage/accounts.h"
#include "storage/audit_trail.h"
#include "storage/batch_store.h"
#include "storage/database.h"
#include "storage/demo.h"
#include "storage/lot_store.h"
#include "storage/signatures.h"
#include "test_backend.h"

#include <QDate>
#include <QFile>
#include <QJsonArray>
#include <QJsonDocument>
#include <QSqlQuery>
#include <QtTest>

using namespace phaseplan::storage;

namespace {

using phaseplan::testing::error_of;

phaseplan::testing::TestDatabases* current_databases = nullptr;

const char* const acid = "phosphoric-acid";
const char* const salt = "sodium-dihydrogen-phosphate-monohydrate";

/// A database with one administrator, preparer, reviewer and approver, and an empty shelf.
struct Lab {
    std::unique_ptr<Database> db;
    Lab() {
        db = std::make_unique<Database>(current_databases->fresh("lots.sqlite"));
        AccountStore a(db->connection());
        a.add("admin", "Ada Admin", Role::administrator, "admin-password", {});
        a.add("prep", "Piet Preparer", Role::preparer, "prep-password", "admin");
        a.add("rev", "Rhea Reviewer", Role::reviewer, "rev-password", "admin");
        a.add("appr", "Ari Approver", Role::approver, "appr-password", "admin");
    }
    QSqlDatabase c() const { return db->connection(); }

    ReagentLot put(const char* reagent, const char* lot, const char* received, const char* expires,
                   const char* opened = "") {
        ReagentLot l;
        l.reagent = reagent;
        l.lot = lot;
        l.received_on = received;
        l.expires_on = expires;
        l.opened_on = opened;
        return LotStore(c()).add(l, "prep");
    }
    qint64 trail_length() const { return verify_audit(c()).entries; }
};

/// The demo buffer (data/demo/batch-line-a-buffer.json) as batch T-1, prepared
/// 2026-12-01T16:30:00, with the lots given (free text until resolved against the shelf).
BatchRecord demo_batch(const QString& acid_lot, const QString& salt_lot) {
    QFile f(QStringLiteral(SOURCE_DIR "/data/demo/batch-line-a-buffer.json"));
    if (!f.open(QIODevice::ReadOnly))
        qFatal("demo batch missing");
    QJsonObject in = QJsonDocument::fromJson(f.readAll()).object();
    QJsonObject b = in.value("batch").toObject();
    b["id"] = "T-1";
    QJsonArray actual = b.value("actual").toArray();
    QJsonObject a0 = actual[0].toObject(), a1 = actual[1].toObject();
    a0["lot"] = acid_lot;
    a1["lot"] = salt_lot;
    actual[0] = a0;
    actual[1] = a1;
    b["actual"] = actual;
    in["batch"] = b;
    return BatchRecord::from_input(in);
}

const phaseplan::AppData& app_data() {
    static const phaseplan::AppData data = phaseplan::load_app_data(SOURCE_DIR "/data");
    return data;
}

phaseplan::BatchDocument document_of(const BatchRecord& b) {
    return phaseplan::read_batch_document(app_data(), b.to_input());
}

/// Every text of the printed sheet, one string (headings, fields, table cells, list items).
QString sheet_text(const phaseplan::print::PrintJob& job) {
    QStringList out;
    for (const auto& b : job.sheet.blocks) {
        out << b.text << b.items;
        for (const auto& kv : b.fields)
            out << kv.key + ": " + kv.value;
        for (const QStringList& row : b.table.rows)
            out << row;
    }
    return out.join('\n');
}

} // namespace

class TestLots : public QObject {
    Q_OBJECT
    phaseplan::testing::TestDatabases dbs_;

  public:
    TestLots() { current_databases = &dbs_; }

  private slots:
    void initTestCase() { PHASEPLAN_REQUIRE_BACKEND(); }

    // ---- the shelf --------------------------------------------------------------------------

    void lotDatesValidated_data() {
        QTest::addColumn<QString>("received");
        QTest::addColumn<QString>("opened");
        QTest::addColumn<QString>("expires");
        QTest::addColumn<QString>("field");
        QTest::addColumn<QString>("words"); // the value as typed, in the message
        QTest::newRow("opened before received") << "2026-11-15"
                                                << "2026-11-14"
                                                << "2027-11-15"
                                                << "opened_on"
                                                << "2026-11-14";
        QTest::newRow("expires on the day received") << "2026-11-15"
                                                     << ""
                                                     << "2026-11-15"
                                                     << "expires_on"
                                                     << "2026-11-15";
        QTest::newRow("expires before received") << "2026-11-15"
                                                 << ""
                                                 << "2025-11-15"
                                                 << "expires_on"
                                                 << "2025-11-15";
        QTest::newRow("30 February") << "2026-02-30"
                                     << ""
                                     << "2027-01-01"
                                     << "received_on"
                                     << "2026-02-30";
        QTest::newRow("month 13") << "2026-11-15"
                                  << ""
                                  << "2027-13-01"
                                  << "expires_on"
                                  << "2027-13-01";
        QTest::newRow("day first") << "15/11/2026"
                                   << ""
                                   << "2027-11-15"
                                   << "received_on"
                                   << "15/11/2026";
        QTest::newRow("no expiry") << "2026-11-15"
                                   << ""
                                   << ""
                                   << "expires_on"
                                   << "required";
        QTest::newRow("opened with a time") << "2026-11-15"
                                            << "2026-11-16T08:00"
                                            << "2027-11-15"
                                            << "opened_on"
                                            << "2026-11-16T08:00";
    }
    void lotDatesValidated() {
        QFETCH(QString, received);
        QFETCH(QString, opened);
        QFETCH(QString, expires);
        QFETCH(QString, field);
        QFETCH(QString, words);
        Lab lab;
        const qint64 before = lab.trail_length();
        ReagentLot l;
        l.reagent = acid;
        l.lot = "PA-1";
        l.received_on = received;
        l.opened_on = opened;
        l.expires_on = expires;
        const auto [f, message] = error_of([&] { LotStore(lab.c()).add(l, "prep"); });
        QCOMPARE(f, field);
        QVERIFY2(message.contains(words), qPrintable(message));
        QVERIFY(LotStore(lab.c()).list().empty());
        QCOMPARE(lab.trail_length(), before); // nothing recorded
    }

    void lotsOpenedOnTheDayReceivedAreFine() {
        Lab lab;
        const ReagentLot l = lab.put(acid, "PA-1", "2026-11-15", "2026-11-16", "2026-11-15");
        QCOMPARE(l.opened_on, QString("2026-11-15"));
        QCOMPARE(l.expires_on, QString("2026-11-16"));
    }

    void quantityNeedsItsUnit() {
        Lab lab;
        ReagentLot l;
        l.reagent = salt;
        l.lot = "SP-1";
        l.received_on = "2026-11-15";
        l.expires_on = "2027-11-15";
        l.quantity = 500;
        l.quantity_unit = "lb";
        QCOMPARE(error_of([&] { LotStore(lab.c()).add(l, "prep"); }).first,
                 QString("quantity_unit"));
        l.quantity = -1;
        l.quantity_unit = "g";
        QCOMPARE(error_of([&] { LotStore(lab.c()).add(l, "prep"); }).first, QString("quantity"));
        l.quantity = 500;
        QCOMPARE(*LotStore(lab.c()).add(l, "prep").quantity, 500.0);
    }

    void shelfChangesAreAudited() {
        Lab lab;
        const qint64 before = lab.trail_length();
        // A lot number holding quotes, ";" and "--" is data, never SQL (issue 13, part 8).
        const char* odd = "PA-'1'; DROP TABLE reagent_lots; --";
        lab.put(acid, odd, "2026-11-15", "2027-11-15");
        LotStore(lab.c()).set_opened(acid, odd, "2026-11-20", "rev");
        const auto entries = audit_entries(lab.c(), {"lot", QString(acid) + "/" + odd});
        QCOMPARE(entries.size(), size_t(2));
        QCOMPARE(entries[0].action, QString("add-lot"));
        QCOMPARE(entries[0].login, QString("prep"));
        const QJsonObject added = QJsonDocument::fromJson(entries[0].changes.toUtf8()).object();
        QCOMPARE(added.value("expires_on").toObject().value("new").toString(),
                 QString("2027-11-15"));
        QCOMPARE(added.value("lot").toObject().value("new").toString(), QString(odd));
        QCOMPARE(entries[1].action, QString("open-lot"));
        QCOMPARE(entries[1].login, QString("rev"));
        QVERIFY2(audit_words(entries[1]).contains("\"2026-11-20\""),
                 qPrintable(audit_words(entries[1])));
        QCOMPARE(lab.trail_length(), before + 2);
        QCOMPARE(LotStore(lab.c()).find(acid, odd)->opened_on, QString("2026-11-20"));
        const AuditVerification v = verify_all(lab.c());
        QVERIFY2(v.intact, qPrintable(v.problem));
        // The administrator keeps no shelf; the same lot twice is refused; neither is recorded.
        ReagentLot again = *LotStore(lab.c()).find(acid, odd);
        again.lot = "PA-2";
        QCOMPARE(error_of([&] { LotStore(lab.c()).add(again, "admin"); }).first, QString("who"));
        again.lot = odd;
        QCOMPARE(error_of([&] { LotStore(lab.c()).add(again, "prep"); }).first, QString("lot"));
        // An opening before the lot came in is refused like a new lot's.
        QCOMPARE(
            error_of([&] { LotStore(lab.c()).set_opened(acid, odd, "2026-11-01", "prep"); }).first,
            QString("opened_on"));
        QCOMPARE(lab.trail_length(), before + 2);
        // Lots are never removed, and keep their number.
        QSqlQuery q(lab.c());
        QVERIFY(!q.exec("DELETE FROM reagent_lots"));
        QVERIFY(!q.exec("UPDATE reagent_lots SET lot = 'PA-9'"));
        QCOMPARE(LotStore(lab.c()).list().size(), size_t(1));
    }

    // Someone with the file (or the database's owner) drops the guards and edits the shelf: an
    // expired lot made to look in date, a lot slipped in, a lot removed. audit verify names each.
    void shelfChangedBehindTheTrailIsFound() {
        struct Tamper {
            const char* name;
            QString statement;
            QString words;      // in the problem
            bool refused_first; // the guards refuse it while they are in place
        };
        const QString add = "INSERT INTO reagent_lots (reagent, lot, supplier, received_on,"
                            " opened_on, expires_on, quantity_unit, created_at, created_by,"
                            " changed_at) VALUES ('phosphoric-acid', 'PA-X', '', '2026-01-01',"
                            " '', '2028-01-01', '', 'x', 'prep', 'x')";
        const Tamper cases[] = {
            {"expiry moved", "UPDATE reagent_lots SET expires_on = '2029-01-01'", "expires_on",
             true},
            {"lot slipped in", add, "PA-X", false}, // inserts are not guarded: verify finds it
            {"lot removed", "DELETE FROM reagent_lots", "does not hold it", true},
        };
        for (const Tamper& t : cases) {
            Lab lab;
            lab.put(salt, "SP-0", "2025-10-01", "2026-11-30");
            const qint64 added = lab.trail_length();
            QVERIFY(verify_all(lab.c()).intact);
            if (t.refused_first) {
                QSqlQuery guarded(lab.c());
                QVERIFY2(!guarded.exec(t.statement), t.name);
                QVERIFY(verify_all(lab.c()).intact);
            }
            for (const char* g : {"reagent_lots_fixed", "reagent_lots_no_delete"})
                for (const QString& s :
                     sql::drop_guard_statements(sql::dialect_of(lab.c()), g, "reagent_lots")) {
                    QSqlQuery q(lab.c());
                    QVERIFY2(q.exec(s), qPrintable(s));
                }
            QSqlQuery q(lab.c());
            QVERIFY2(q.exec(t.statement), qPrintable(t.statement));
            const AuditVerification v = verify_all(lab.c());
            QVERIFY2(!v.intact, t.name);
            QVERIFY2(v.problem.contains(t.words), qPrintable(v.problem));
            if (t.refused_first) // named by the entry that put the lot on the shelf
                QCOMPARE(v.first_bad_seq, added);
        }
    }

    // ---- the batch's use-by -----------------------------------------------------------------

    // prepared 2026-12-01T16:30 + 48 h (data/solvents.json, aqueous-buffer) = 2026-12-03T16:30;
    // lot SP-2 expires 2026-12-02, so the use-by is 2026-12-02T23:59.
    void useByClampedToTheEarliestLot() {
        Lab lab;
        lab.put(acid, "PA-1", "2026-10-01", "2027-10-01");
        lab.put(salt, "SP-2", "2026-06-01", "2026-12-02");
        BatchStore batches(lab.c());
        batches.create(demo_batch("PA-1", "SP-2"), "prep");
        const BatchRecord stored = *batches.load("T-1");
        QCOMPARE(stored.actual[0].toObject().value("lot_expires_on").toString(),
                 QString("2027-10-01"));
        QCOMPARE(stored.actual[1].toObject().value("lot_expires_on").toString(),
                 QString("2026-12-02"));
        const phaseplan::BatchDocument doc = document_of(stored);
        QCOMPARE(doc.expires_at, QString("2026-12-02T23:59:00"));
        QCOMPARE(doc.expiry_limited_by, 1);
        QVERIFY(doc.expiry_limit);
        QVERIFY(*doc.expiry_limit == (chem::UseByLimit{"sodium-dihydrogen-phosphate-monohydrate",
                                                       "SP-2", "2026-12-02"}));
        QCOMPARE(phaseplan::expiry_limit_text(app_data(), doc),
                 QString("lot SP-2 of Sodium dihydrogen phosphate monohydrate, which expires on "
                         "2026-12-02"));
        QCOMPARE(doc.summary.value("batch")
                     .toObject()
                     .value("expires_limited_by")
                     .toObject()
                     .value("lot")
                     .toString(),
                 QString("SP-2"));
        // On paper: the sheet's expiry says which lot limits it, the table gives each lot's
        // expiry, every label names the lot.
        const auto job = phaseplan::print::build_print_job(app_data(), stored.to_input(), "now");
        const QString text = sheet_text(job);
        QVERIFY2(text.contains("Expires at: 2026-12-02 23:59\nlimited by lot SP-2 of Sodium "
                               "dihydrogen phosphate monohydrate, which expires on 2026-12-02"),
                 qPrintable(text));
        QVERIFY2(text.contains("SP-2\nexp. 2026-12-02"), qPrintable(text));
        QCOMPARE(job.labels.size(), 1);
        QCOMPARE(job.labels[0].expires_at, QString("2026-12-02 23:59 (lot SP-2)"));
        // The lot changes to one that expires later: the shelf life sets the use-by again.
        lab.put(salt, "SP-3", "2026-11-01", "2027-11-01");
        BatchRecord next = stored;
        QJsonObject e = next.actual[1].toObject();
        e["lot"] = "SP-3";
        next.actual[1] = e;
        QVERIFY(batches.edit("T-1", next, "prep"));
        const phaseplan::BatchDocument later = document_of(*batches.load("T-1"));
        QCOMPARE(later.expires_at, QString("2026-12-03T16:30:00"));
        QCOMPARE(later.expiry_limited_by, -1);
        QVERIFY(!later.expiry_limit);
        QVERIFY(phaseplan::expiry_limit_text(app_data(), later).isEmpty());
    }

    // An expiry entered by hand later than a lot's is clamped too; one earlier stays.
    void enteredExpiryIsClampedToo() {
        chem::Batch b;
        b.id = "T-1";
        b.prepared_at = "2026-12-01T16:30:00";
        b.expires_at = "2026-12-20T08:00:00";
        chem::ActualAmount a;
        a.reagent = salt;
        a.mass_g = 2.981;
        a.lot = "SP-2";
        a.lot_expires_on = "2026-12-10";
        b.actual.push_back(a);
        chem::UseBy u = chem::use_by(b, 48);
        QCOMPARE(QString::fromStdString(u.expires_at), QString("2026-12-10T23:59:00"));
        QCOMPARE(u.limited_by, 0);
        b.expires_at = "2026-12-05T08:00:00";
        u = chem::use_by(b, 48);
        QCOMPARE(QString::fromStdString(u.expires_at), QString("2026-12-05T08:00:00"));
        QCOMPARE(u.limited_by, -1);
    }

    // ---- expired lots -----------------------------------------------------------------------

    // SP-0 expired 2026-11-30; the batch is prepared on 2026-12-01: refused. A lot that expires
    // on the day of preparation may still be used that day.
    void expiredLotRefused() {
        Lab lab;
        lab.put(acid, "PA-1", "2026-10-01", "2027-10-01");
        lab.put(salt, "SP-0", "2025-10-01", "2026-11-30");
        lab.put(salt, "SP-D", "2025-10-01", "2026-12-01");
        BatchStore batches(lab.c());
        const qint64 before = lab.trail_length();
        const auto [field, message] =
            error_of([&] { batches.create(demo_batch("PA-1", "SP-0"), "prep"); });
        QCOMPARE(field, QString("batch.actual[1].lot"));
        QVERIFY2(message.contains("\"SP-0\"") && message.contains("2026-11-30") &&
                     message.contains("2026-12-01") && message.contains("approver"),
                 qPrintable(message));
        QVERIFY(!batches.load("T-1"));
        QCOMPARE(lab.trail_length(), before);
        // The document path (the sheet, the screen) refuses it the same way.
        BatchRecord doc_only = demo_batch("PA-1", "SP-0");
        QJsonObject e = doc_only.actual[1].toObject();
        e["lot_expires_on"] = "2026-11-30";
        doc_only.actual[1] = e;
        QCOMPARE(error_of([&] { document_of(doc_only); }).first, QString("batch.actual[1].lot"));
        // Expiring on the day of preparation: accepted, and the use-by is that day's end.
        batches.create(demo_batch("PA-1", "SP-D"), "prep");
        QCOMPARE(document_of(*batches.load("T-1")).expires_at, QString("2026-12-01T23:59:00"));
    }

    // While the shelf holds lots of a reagent, a lot that is not on it is refused; a reagent
    // without lots on the shelf keeps its lot as typed (no expiry known).
    void lotNotOnTheShelf() {
        Lab lab;
        lab.put(salt, "SP-1", "2026-10-01", "2027-10-01");
        BatchStore batches(lab.c());
        const auto [field, message] =
            error_of([&] { batches.create(demo_batch("PA-typed", "SP-9"), "prep"); });
        QCOMPARE(field, QString("batch.actual[1].lot"));
        QVERIFY2(message.contains("SP-1") && message.contains("not on the shelf"),
                 qPrintable(message));
        batches.create(demo_batch("PA-typed", "SP-1"), "prep");
        const BatchRecord b = *batches.load("T-1");
        QCOMPARE(b.actual[0].toObject().value("lot").toString(), QString("PA-typed"));
        QVERIFY(!b.actual[0].toObject().contains("lot_expires_on"));
        // A caller cannot set an expiry or an override itself: the shelf's is kept.
        BatchRecord forged = b;
        QJsonObject e = forged.actual[1].toObject();
        e["lot_expires_on"] = "2099-01-01";
        e["lot_override"] = QJsonObject{{"by", "appr"}, {"reason", "forged"}};
        forged.actual[1] = e;
        batches.edit("T-1", forged, "prep");
        const QJsonObject kept = batches.load("T-1")->actual[1].toObject();
        QCOMPARE(kept.value("lot_expires_on").toString(), QString("2027-10-01"));
        QVERIFY(!kept.contains("lot_override"));
    }

    void approverOverrideRecorded() {
        Lab lab;
        lab.put(acid, "PA-1", "2026-10-01", "2027-10-01");
        lab.put(salt, "SP-1", "2026-10-01", "2027-10-01");
        lab.put(salt, "SP-0", "2025-10-01", "2026-11-30");
        BatchStore batches(lab.c());
        batches.create(demo_batch("PA-1", "SP-1"), "prep");
        BatchRecord next = *batches.load("T-1");
        QJsonObject e = next.actual[1].toObject();
        e["lot"] = "SP-0";
        next.actual[1] = e;
        QCOMPARE(error_of([&] { batches.edit("T-1", next, "prep"); }).first,
                 QString("batch.actual[1].lot"));
        // The screen ties the amounts to the shelf before it shows them (BatchModel), so the
        // override receives the expired lot with its expiry date already in place.
        const BatchRecord current = *batches.load("T-1");
        resolve_batch_lots(lab.c(), &current, next);
        QCOMPARE(next.actual[1].toObject().value("lot_expires_on").toString(),
                 QString("2026-11-30"));
        const qint64 before = lab.trail_length();
        BatchStore::LotOverrideRequest r{salt, "SP-0", "appr", "appr-password",
                                         "requalified: assay 99.6 % on 2026-11-28, QC-ref 4471"};
        QVERIFY(batches.override_expired_lot("T-1", next, "prep", r));
        const BatchRecord stored = *batches.load("T-1");
        const QJsonObject ov = stored.actual[1].toObject().value("lot_override").toObject();
        QCOMPARE(ov.value("by").toString(), QString("appr"));
        QCOMPARE(ov.value("name").toString(), QString("Ari Approver"));
        QCOMPARE(ov.value("reason").toString(), r.reason);
        QVERIFY(!ov.value("at").toString().isEmpty());
        QCOMPARE(stored.actual[1].toObject().value("lot").toString(), QString("SP-0"));
        // The trail: the approver's acceptance, then the change under the preparer.
        const auto entries = audit_entries(lab.c(), {"batch", "T-1"});
        QCOMPARE(lab.trail_length(), before + 2);
        const AuditEntry& accept = entries[entries.size() - 2];
        const AuditEntry& change = entries.back();
        QCOMPARE(accept.action, QString("override-expired-lot"));
        QCOMPARE(accept.login, QString("appr"));
        QCOMPARE(accept.reason, r.reason);
        QVERIFY2(accept.changes.contains("SP-0 (expired 2026-11-30)"), qPrintable(accept.changes));
        QCOMPARE(change.action, QString("edit"));
        QCOMPARE(change.login, QString("prep"));
        QVERIFY2(change.changes.contains(QString("actual[%1].lot_override").arg(salt)),
                 qPrintable(change.changes));
        QCOMPARE(ov.value("at").toString(), accept.logged_at);
        const AuditVerification v = verify_all(lab.c());
        QVERIFY2(v.intact, qPrintable(v.problem));
        // The sheet: the override in words, as a warning; the expired lot does not set the use-by
        // (the shelf life does: 2026-12-01T16:30 + 48 h).
        const phaseplan::BatchDocument doc = document_of(stored);
        QCOMPARE(doc.lot_override_text.size(), 1);
        QVERIFY2(doc.lot_override_text[0].contains("SP-0") &&
                     doc.lot_override_text[0].contains("Ari Approver (appr)") &&
                     doc.lot_override_text[0].contains(r.reason),
                 qPrintable(doc.lot_override_text[0]));
        QCOMPARE(doc.expires_at, QString("2026-12-03T16:30:00"));
        bool warned = false;
        for (const QJsonValue& w : doc.warnings)
            warned |= w.toObject().value("code").toString() == "expired-lot-override";
        QVERIFY(warned);
        const auto job = phaseplan::print::build_print_job(app_data(), stored.to_input(), "now");
        const QString text = sheet_text(job);
        QVERIFY2(text.contains("Expired lots used by an approver's override") &&
                     text.contains(doc.lot_override_text[0]) &&
                     text.contains("SP-0\nexp. 2026-11-30\nEXPIRED: override"),
                 qPrintable(text));
        QVERIFY2(job.labels[0].mark.contains("EXPIRED LOT USED BY OVERRIDE"),
                 qPrintable(job.labels[0].mark));
        // A later change keeps the override with its lot.
        BatchRecord later = stored;
        later.comment = "degassed 10 min";
        QVERIFY(batches.edit("T-1", later, "prep"));
        QCOMPARE(batches.load("T-1")->actual[1].toObject().value("lot_override").toObject(), ov);
    }

    void nonApproverOverrideRefused() {
        Lab lab;
        lab.put(acid, "PA-1", "2026-10-01", "2027-10-01");
        lab.put(salt, "SP-0", "2025-10-01", "2026-11-30");
        lab.put(salt, "SP-1", "2026-10-01", "2027-10-01");
        BatchStore batches(lab.c());
        batches.create(demo_batch("PA-1", "SP-1"), "prep");
        BatchRecord next = *batches.load("T-1");
        QJsonObject e = next.actual[1].toObject();
        e["lot"] = "SP-0";
        next.actual[1] = e;
        const qint64 before = lab.trail_length();
        auto attempt = [&](const char* login, const char* password, const char* reason) {
            BatchStore::LotOverrideRequest r{salt, "SP-0", login, password, reason};
            return error_of([&] { batches.override_expired_lot("T-1", next, "prep", r); });
        };
        for (const auto& [login, password] : {std::pair{"prep", "prep-password"},
                                              {"rev", "rev-password"},
                                              {"admin", "admin-password"}}) {
            const auto [field, message] = attempt(login, password, "needed tonight");
            QCOMPARE(field, QString("login"));
            QVERIFY2(message.contains("only an approver"), qPrintable(message));
        }
        QCOMPARE(lab.trail_length(), before); // right passwords: nothing recorded
        // The approver with a wrong password: refused, and counted towards the lock.
        QCOMPARE(attempt("appr", "wrong-password", "needed tonight").first, QString("password"));
        QCOMPARE(AccountStore(lab.c()).find("appr")->failed_attempts, 1);
        QCOMPARE(audit_entries(lab.c()).back().action, QString("sign-in-failed"));
        // No reason: refused before anything is asked.
        QCOMPARE(attempt("appr", "appr-password", "  ").first, QString("lot_override.reason"));
        // A lot that has not expired needs no override.
        BatchRecord fine = next;
        e["lot"] = "SP-1";
        fine.actual[1] = e;
        BatchStore::LotOverrideRequest r{salt, "SP-1", "appr", "appr-password", "just in case"};
        QCOMPARE(error_of([&] { batches.override_expired_lot("T-1", fine, "prep", r); }).first,
                 QString("lot_override"));
        const BatchRecord stored = *batches.load("T-1");
        QCOMPARE(stored.actual[1].toObject().value("lot").toString(), QString("SP-1"));
        QCOMPARE(stored.revision, 1);
        for (const AuditEntry& a : audit_entries(lab.c()))
            QVERIFY(a.action != "override-expired-lot");
    }

    // A printed batch changes only by amendment: the override's words are its reason.
    void overrideOnAPrintedBatchIsAnAmendment() {
        Lab lab;
        lab.put(acid, "PA-1", "2026-10-01", "2027-10-01");
        lab.put(salt, "SP-1", "2026-10-01", "2027-10-01");
        lab.put(salt, "SP-0", "2025-10-01", "2026-11-30");
        BatchStore batches(lab.c());
        batches.create(demo_batch("PA-1", "SP-1"), "prep");
        batches.mark_printed("T-1", "prep", "sheet a4");
        BatchRecord next = *batches.load("T-1");
        QJsonObject e = next.actual[1].toObject();
        e["lot"] = "SP-0";
        next.actual[1] = e;
        BatchStore::LotOverrideRequest r{salt, "SP-0", "appr", "appr-password", "bridging lot"};
        QVERIFY(batches.override_expired_lot("T-1", next, "prep", r));
        const AuditEntry last = audit_entries(lab.c(), {"batch", "T-1"}).back();
        QCOMPARE(last.action, QString("amend"));
        QVERIFY2(last.reason.contains("SP-0") && last.reason.contains("bridging lot") &&
                     last.reason.contains("Ari Approver"),
                 qPrintable(last.reason));
        QVERIFY(verify_all(lab.c()).intact);
    }

    // ---- schema and demo ----------------------------------------------------------------------

    void migrationAddsTheShelf() {
        const QString path = current_databases->fresh("old.sqlite");
        {
            Database old(path, lot_schema_version - 1);
            QVERIFY(!sql::table_exists(old.connection(), "reagent_lots"));
            BatchStore(old.connection()).create(demo_batch("PA-1", "SP-1"), "R. Okafor");
        }
        Database db(path);
        QCOMPARE(db.schema_version(), latest_schema_version());
        QVERIFY(sql::table_exists(db.connection(), "reagent_lots"));
        // The batch from before the shelf keeps its typed lots; the trail still verifies.
        const BatchRecord b = *BatchStore(db.connection()).load("T-1");
        QVERIFY(!b.actual[1].toObject().contains("lot_expires_on"));
        QVERIFY(verify_all(db.connection()).intact);
    }

    void demoShelf() {
        Database db(current_databases->fresh("demo.sqlite"), -1,
                    [](Database& d) { seed_demo_records(d, QStringLiteral(SOURCE_DIR "/data")); });
        const QString today = QDate::currentDate().toString(Qt::ISODate);
        const std::vector<ReagentLot> lots = LotStore(db.connection()).list();
        QCOMPARE(lots.size(), demo_lots().size());
        int expired = 0;
        for (const ReagentLot& l : lots)
            expired += l.expired_on(today);
        QCOMPARE(expired, 1); // SP-1987, so the refusal can be seen
        QVERIFY(LotStore(db.connection()).find(salt, "SP-1987")->expired_on(today));
        // The demo batch keeps its history: its lots were typed before the shelf was filled.
        const BatchRecord b = *BatchStore(db.connection()).load(demo_batch_id());
        for (const QJsonValue& v : b.actual)
            QVERIFY(!v.toObject().contains("lot_expires_on"));
        const AuditVerification v = verify_all(db.connection());
        QVERIFY2(v.intact, qPrintable(v.problem));
        QCOMPARE(v.entries, qint64(10 + demo_lots().size()));
    }
};

QTEST_MAIN(TestLots)
#include "tst_lots.moc"
