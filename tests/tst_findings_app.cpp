// The app's warnings as findings (issue 10, "Data, not sentences"): an instrument past its
// calibration date, a value taken from one, an expired lot used by override and one batch of a
// line recipe used past its shelf life carry a code, a typed subject and their dates and numbers;
// chem::describe words them. And the sequence sheet prints each line from the sequence's typed
// result (SequenceLineResult::spec and line_profile), not from a second parse of its document.
//
// Sources: the calibration-due rule (due on or before the day of the reading) and the lot rule
// are the app's own (README, "Instruments" and "Reagent lots"); triethylamine's GHS codes are
// data/reagents.json's (a typical supplier SDS, from memory there).
#include "chem/finding_text.h"
#include "core/batch_document.h"
#include "core/commands.h"
#include "core/line_commands.h"
#include "core/sequence_result.h"
#include "devices/device_store.h"
#include "print/sheet_parts.h"
#include "test_support.h"

#include <QJsonArray>
#include <QtTest>

using namespace phaseplan;
using namespace phaseplan::testing;

namespace {

QJsonObject demo_recipe_batch() {
    return read_json(QStringLiteral(SOURCE_DIR "/data/demo/batch-line-a-buffer.json"));
}

QJsonObject capture(const QString& device, const QString& kind, const QString& due,
                    const QString& received_at) {
    return QJsonObject{{"device_id", device},
                       {"raw", "S S 1.2700 g"},
                       {"received_at", received_at},
                       {"device_kind", kind},
                       {"calibration_due", due}};
}

QStringList keys_of(const QJsonObject& o) {
    QStringList k = o.keys();
    k.sort();
    return k;
}

} // namespace

class TestFindingsApp : public QObject {
    Q_OBJECT

  private slots:
    void readingFromAnOverdueInstrumentIsAFinding() {
        QJsonObject doc = demo_recipe_batch();
        QJsonObject b = doc["batch"].toObject();
        QJsonArray actual = b["actual"].toArray();
        QJsonObject a0 = actual[0].toObject();
        // Due on the day of the reading: overdue (README: "had come on the day of the reading").
        a0["capture"] = capture("BAL-03", "balance", "2026-12-01", "2026-12-01T10:24:34.925");
        actual[0] = a0;
        QJsonObject a1 = actual[1].toObject();
        a1["capture"] = capture("BAL-04", "balance", "2026-12-02", "2026-12-01T10:30:00");
        actual[1] = a1; // due the day after: no caution
        b["actual"] = actual;
        b["measured_ph"] = 2.5;
        b["measured_ph_capture"] =
            capture("PHM-01", "ph_meter", "2026-11-30", "2026-12-01T11:00:00");
        doc["batch"] = b;
        const BatchDocument d = read_batch_document(shipped_data(), doc);
        std::vector<const BatchWarning*> due;
        for (const BatchWarning& w : d.evaluation.warnings)
            if (w.code == "device-calibration-due")
                due.push_back(&w);
        QCOMPARE(int(due.size()), 2);
        const chem::Finding& amount = *due[0]->finding;
        QVERIFY(amount.kind == chem::FindingKind::reading_calibration_due);
        QVERIFY(amount.subject == chem::Subject::of_reagent("phosphoric-acid"));
        QVERIFY(amount.where == chem::Subject::of_device("BAL-03"));
        QCOMPARE(QString::fromStdString(amount.text_of("calibration_due")), QString("2026-12-01"));
        QCOMPARE(due[0]->message,
                 part_display_name(shipped_data(), "phosphoric-acid").prepend("The amount of ") +
                     " was taken from balance BAL-03, which was due for "
                     "calibration on 2026-12-01");
        QCOMPARE(keys_of(due[0]->json),
                 (QStringList{"calibration_due", "code", "device", "message", "severity"}));
        QCOMPARE(due[0]->json["device"].toString(), QString("BAL-03"));
        const chem::Finding& ph = *due[1]->finding;
        QVERIFY(ph.subject.kind == chem::Subject::Kind::none);
        QCOMPARE(due[1]->message, QString("The measured pH was taken from pH meter PHM-01, which "
                                          "was due for calibration on 2026-11-30"));
    }

    void instrumentPastItsDateIsAFinding() {
        devices::DeviceRecord m;
        m.id = "PHM-01";
        m.kind = devices::DeviceKind::ph_meter;
        m.calibration_due = QDate(2026, 11, 30);
        QVERIFY(!devices::calibration_finding(m, QDate(2026, 11, 29)));
        const auto f = devices::calibration_finding(m, QDate(2026, 11, 30));
        QVERIFY(f);
        QVERIFY(f->kind == chem::FindingKind::device_calibration_due);
        QVERIFY(f->subject == chem::Subject::of_device("PHM-01"));
        const QJsonObject j = *devices::calibration_caution(m, QDate(2026, 12, 2));
        QCOMPARE(keys_of(j),
                 (QStringList{"calibration_due", "code", "device", "message", "severity"}));
        QCOMPARE(j["message"].toString(), QString("pH meter PHM-01 was due for calibration on "
                                                  "2026-11-30: calibrate it or use another pH "
                                                  "meter"));
    }

    void expiredLotOverrideIsAFinding() {
        QJsonObject doc = demo_recipe_batch();
        QJsonObject b = doc["batch"].toObject();
        QJsonArray actual = b["actual"].toArray();
        QJsonObject a1 = actual[1].toObject();
        a1["lot_expires_on"] = "2026-11-30"; // before the day of preparation, 2026-12-01
        a1["lot_override"] = QJsonObject{{"by", "appr"},
                                         {"name", "Ari Approver"},
                                         {"at", "2026-12-01T16:00:00Z"},
                                         {"reason", "Only lot; assay checked"}};
        actual[1] = a1;
        b["actual"] = actual;
        doc["batch"] = b;
        const BatchDocument d = read_batch_document(shipped_data(), doc);
        const BatchWarning* w = nullptr;
        for (const BatchWarning& x : d.evaluation.warnings)
            if (x.code == "expired-lot-override")
                w = &x;
        QVERIFY(w && w->finding);
        QVERIFY(w->finding->kind == chem::FindingKind::expired_lot_override);
        QVERIFY(w->finding->subject ==
                chem::Subject::of_reagent("sodium-dihydrogen-phosphate-monohydrate"));
        QCOMPARE(keys_of(w->json), (QStringList{"code", "message", "severity"}));
        QCOMPARE(w->message,
                 "Lot SP-2207 of " +
                     part_display_name(shipped_data(), "sodium-dihydrogen-phosphate-monohydrate") +
                     " expired on 2026-11-30; used by override of Ari Approver (appr) at "
                     "2026-12-01 16:00:00 UTC: Only lot; assay checked");
        QCOMPARE(d.lot_override_text, QStringList{w->message});
        QCOMPARE(d.lot_overrides[0].toObject()["text"].toString(), w->message);
    }

    void batchesPastTheirShelfLifeAreAFinding() {
        QJsonObject one =
            read_json(QStringLiteral(SOURCE_DIR "/data/demo/overnight-sequence.json"));
        QJsonObject lines = one["lines"].toObject();
        QJsonObject a = lines["A"].toObject();
        a.remove("prepared_at");
        a["shelf_life_h"] = 2.5;
        lines["A"] = a;
        one["lines"] = lines;
        QJsonObject two = one;
        two["start"] = "2026-12-02T18:00:00";
        const SequenceResult r = sequence_result(
            shipped_data(), QJsonObject{{"plans", QJsonArray{one, two}}}, CommandOptions{});
        const SequenceWarning* w = nullptr;
        for (const SequenceWarning& x : r.warnings)
            if (x.json["code"].toString() == "shelf-life" && x.json["recipe"] == a["name"])
                w = &x;
        QVERIFY(w && w->finding);
        QVERIFY(w->finding->kind == chem::FindingKind::batch_shelf_life);
        QVERIFY(w->finding->subject == chem::Subject::of_batch(a["name"].toString().toStdString()));
        QVERIFY(w->json["span_h"].toDouble() > 24); // two nights a day apart
        QCOMPARE(w->json["shelf_life_h"].toDouble(), 2.5);
        QCOMPARE(w->json["batches"].toDouble(), std::ceil(w->json["span_h"].toDouble() / 2.5));
        // 2.5 h is written as Qt wrote it with no decimals: "3", not "2".
        QVERIFY2(w->json["message"].toString().contains("longer than its shelf life of 3 h"),
                 qPrintable(w->json["message"].toString()));
    }

    void sequenceSheetPrintsTheTypedLines() {
        QJsonObject input =
            read_json(QStringLiteral(SOURCE_DIR "/data/demo/overnight-sequence.json"));
        input["batch"] = QJsonObject{{"id", "SEQ-1"}, {"prepared_at", "2026-12-01T15:00:00"}};
        BatchDocument doc = read_batch_document(shipped_data(), input);
        PlanResult& plan = doc.sequence->plans.front();
        SequenceLineResult* c = nullptr;
        for (SequenceLineResult& l : plan.lines)
            if (l.letter() == "C")
                c = &l;
        QVERIFY(c);
        QVERIFY(c->line_profile.described);
        QCOMPARE(int(c->spec.parts.size()), 1);
        QCOMPARE(QString::fromStdString(c->spec.parts[0].solvent), QString("water"));
        // Change the typed line only: the sheet and the label follow it, not the document.
        c->spec.additives.push_back({"triethylamine", chem::AmountUnit::percent_v, 0.1});
        c->line_profile.solvent_fraction_v["water"] = 0.5;
        const print::PrintJob job =
            print::sequence_job(shipped_data(), doc, input, "2026-12-01 15:00", BatchRelease{});
        const print::LabelData* label = nullptr;
        for (const print::LabelData& l : job.labels)
            if (l.title.startsWith("Line C"))
                label = &l;
        QVERIFY(label);
        QVERIFY2(label->hazard_codes.contains("H331"), qPrintable(label->hazard_codes.join(",")));
        QVERIFY2(label->composition.contains("Water 50 % v/v"),
                 qPrintable(label->composition.join("|")));
    }
};

QTEST_GUILESS_MAIN(TestFindingsApp)
#include "tst_findings_app.moc"
