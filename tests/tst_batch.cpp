// Batches: actual amounts against the recipe (tolerance flags with their numbers), the solution
// as made and its pH recomputed from the actual amounts, times and shelf life, and the batch
// record in SQLite (every change in the history, a printed batch refuses silent edits).
#include "batch_test_db.h"
#include "chem/batch.h"
#include "chem/batch_correction.h"
#include "chem/error.h"
#include "chem/note_text.h"
#include "chem/recipe.h"
#include "core/chem_json.h"
#include "core/failure.h"
#include "storage/batch_store.h"
#include "storage/database.h"
#include "test_support.h"

#include <QJsonArray>
#include <QJsonDocument>
#include <QSqlDatabase>
#include <QSqlError>
#include <QSqlQuery>
#include <QTemporaryDir>
#include <QtTest>

#include <cmath>

using phaseplan::storage::BatchRecord;
using phaseplan::storage::BatchStore;
using phaseplan::testing::shipped_data;

namespace {

const chem::Library& lib() {
    return shipped_data().reagents;
}

// IUPAC 2021 standard atomic weights, conventional values (Prohaska et al., Pure Appl. Chem. 94
// (2022) 573), for hand-computed molar masses below.
constexpr double H = 1.008, O = 15.999, P = 30.973761998, Na = 22.98976928, K = 39.0983;

/// A line-A buffer of the invented overnight assay (as in data/demo, kept here so that the
/// tests do not move when the demo does): phosphoric acid 85 % + sodium dihydrogen phosphate
/// monohydrate, pH 2.5 at 25 °C, 20 mmol/L, 2000 mL.
QJsonObject demo_input() {
    return QJsonObject{{"name", "Line A buffer: 20 mM sodium phosphate pH 2.5"},
                       {"target_ph", 2.5},
                       {"temperature_c", 25},
                       {"volume_ml", 2000},
                       {"route", "mix"},
                       {"acid", "phosphoric-acid"},
                       {"base", "sodium-dihydrogen-phosphate-monohydrate"},
                       {"concentration_mol_per_l", 0.02}};
}

chem::Recipe design(const QJsonObject& in) {
    return chem::design_recipe(lib(), phaseplan::recipe_request_from_json(lib(), in, ""));
}

const chem::RecipeItem& item(const chem::Recipe& r, const std::string& id) {
    for (const auto& it : r.items)
        if (it.reagent == id)
            return it;
    qFatal("no item %s", id.c_str());
}

const chem::AmountCheck& check(const chem::BatchResult& r, const std::string& id) {
    for (const auto& c : r.checks)
        if (c.reagent == id)
            return c;
    qFatal("no check %s", id.c_str());
}

bool has_code(const std::vector<chem::Warning>& ws, const std::string& code) {
    for (const auto& w : ws)
        if (w.code == code)
            return true;
    return false;
}

chem::Batch batch_with(std::vector<chem::ActualAmount> actual) {
    chem::Batch b;
    b.id = "T-1";
    b.prepared_by = "R. Okafor";
    b.prepared_at = "2026-12-01T16:30:00";
    b.actual = std::move(actual);
    return b;
}

QString expect_error(const std::function<void()>& f) {
    try {
        f();
    } catch (const chem::Error& e) {
        return QString::fromStdString(e.field());
    } catch (const phaseplan::Failure& f) {
        return QString::fromLatin1(f.subject());
    }
    return QStringLiteral("(no error)");
}

} // namespace

class TestBatch : public QObject {
    Q_OBJECT
  private slots:
    void initTestCase() { PHASEPLAN_REQUIRE_BACKEND(); }
    void targetAmountsReproduceThePlan();
    void toleranceFlags_data();
    void toleranceFlags();
    void editedToleranceApplies();
    void liquidByMassIsConverted();
    void compositionFromActualAmountsByHand();
    void phFromActualAmountsMatchesReferenceBuffer();
    void phMovesTheRightWayAndIsFlagged();
    void badBatchFieldsNameTheField_data();
    void badBatchFieldsNameTheField();
    void expiryFromShelfLife_data();
    void expiryFromShelfLife();

    void historyKeepsEveryChange();
    void proposedIdsCountUpPerDay();
    void printedBatchRefusesSilentEdits();
    void historyIsAppendOnlyInTheDatabase();
    void migrationCreatesBatchTables();
    void correctionByHand_data();
    void correctionByHand();
    void correctionRefusesBadVolumes();
    void measuredPhAgainstItsTolerance();
    void benchFieldsStoredAndMigratedFromV4();
};

// Invariant: entering exactly the planned amounts gives the planned composition and pH.
void TestBatch::targetAmountsReproduceThePlan() {
    const chem::Recipe r = design(demo_input());
    std::vector<chem::ActualAmount> actual;
    for (const auto& it : r.items) {
        chem::ActualAmount a;
        a.reagent = it.reagent;
        if (it.kind == chem::ItemKind::solid)
            a.mass_g = it.mass_g;
        else
            a.volume_ml = it.volume_ml;
        actual.push_back(a);
    }
    const chem::BatchResult res = chem::evaluate_batch(lib(), r, batch_with(actual), 48);
    QVERIFY(!has_code(res.warnings, "amount-out-of-tolerance"));
    QVERIFY(!has_code(res.warnings, "ph-off-target"));
    for (size_t i = 0; i < r.composition.size(); ++i)
        QVERIFY(std::abs(res.composition[i].mol_per_l / r.composition[i].mol_per_l - 1) < 1e-9);
    QVERIFY(std::abs(res.predicted.ph - r.predicted.ph) < 1e-6);
}

void TestBatch::toleranceFlags_data() {
    QTest::addColumn<double>("factor");
    QTest::addColumn<bool>("flagged");
    // ± 2 % default tolerance (issue 5 §1).
    QTest::newRow("exact") << 1.0 << false;
    QTest::newRow("+1.9 %") << 1.019 << false;
    QTest::newRow("-1.9 %") << 0.981 << false;
    QTest::newRow("+2.1 %") << 1.021 << true;
    QTest::newRow("-2.5 %") << 0.975 << true;
    QTest::newRow("+30 %") << 1.30 << true;
}

void TestBatch::toleranceFlags() {
    QFETCH(double, factor);
    QFETCH(bool, flagged);
    const chem::Recipe r = design(demo_input());
    const auto& salt = item(r, "sodium-dihydrogen-phosphate-monohydrate");
    chem::ActualAmount a;
    a.reagent = salt.reagent;
    a.mass_g = *salt.mass_g * factor;
    a.lot = "SP-2207";
    const chem::BatchResult res = chem::evaluate_batch(lib(), r, batch_with({a}), 48);
    const auto& c = check(res, salt.reagent);
    QCOMPARE(c.entered, true);
    QCOMPARE(c.within_tolerance, !flagged);
    QCOMPARE(c.lot, std::string("SP-2207"));
    QVERIFY(std::abs(c.deviation_fraction - (factor - 1)) < 1e-9);
    QVERIFY(std::abs(c.low - *salt.mass_g * 0.98) < 1e-9 &&
            std::abs(c.high - *salt.mass_g * 1.02) < 1e-9);
    QCOMPARE(has_code(res.warnings, "amount-out-of-tolerance"), flagged);
    if (flagged) {
        // The message carries the numbers: measured, target, band and deviation.
        std::string msg;
        for (const auto& w : res.warnings)
            if (w.code == "amount-out-of-tolerance")
                msg = w.message;
        QVERIFY2(msg.find(salt.reagent) == 0, msg.c_str());
        const std::string measured = chem::format_fixed(*a.mass_g, 3) + " g measured";
        QVERIFY2(msg.find(measured) != std::string::npos, msg.c_str());
        QVERIFY2(msg.find("± 2 %") != std::string::npos, msg.c_str());
    }
    // The phosphoric acid was not entered: assumed at target, said so.
    QVERIFY(has_code(res.warnings, "amount-not-entered"));
}

void TestBatch::editedToleranceApplies() {
    const chem::Recipe r = design(demo_input());
    const auto& salt = item(r, "sodium-dihydrogen-phosphate-monohydrate");
    chem::ActualAmount a;
    a.reagent = salt.reagent;
    a.mass_g = *salt.mass_g * 1.03;
    chem::Batch b = batch_with({a});
    QVERIFY(!check(chem::evaluate_batch(lib(), r, b, 48), salt.reagent).within_tolerance);
    b.tolerance_fraction = 0.05;
    QVERIFY(check(chem::evaluate_batch(lib(), r, b, 48), salt.reagent).within_tolerance);
    b.tolerance_fraction = 0.01;
    a.mass_g = *salt.mass_g * 1.015;
    b.actual = {a};
    QVERIFY(!check(chem::evaluate_batch(lib(), r, b, 48), salt.reagent).within_tolerance);
}

// A liquid measured by mass instead of volume: compared in g, m = V · ρ.
void TestBatch::liquidByMassIsConverted() {
    const chem::Recipe r = design(demo_input());
    const auto& acid = item(r, "phosphoric-acid");
    const chem::Reagent& pa = lib().reagent("phosphoric-acid");
    chem::ActualAmount a;
    a.reagent = acid.reagent;
    a.mass_g = *acid.volume_ml * pa.density_g_per_ml; // exactly the planned amount, weighed
    const chem::BatchResult res = chem::evaluate_batch(lib(), r, batch_with({a}), 48);
    const auto& c = check(res, acid.reagent);
    QCOMPARE(c.unit, std::string("g"));
    QVERIFY(std::abs(c.deviation_fraction) < 1e-9);
    QVERIFY(c.within_tolerance);
}

// mol/L from the actual amounts, by hand: n = m · assay / M, over the final volume.
void TestBatch::compositionFromActualAmountsByHand() {
    const chem::Recipe r = design(demo_input());
    const chem::Reagent& pa = lib().reagent("phosphoric-acid");
    chem::ActualAmount acid;
    acid.reagent = "phosphoric-acid";
    acid.volume_ml = 1.25;
    chem::ActualAmount salt;
    salt.reagent = "sodium-dihydrogen-phosphate-monohydrate";
    salt.mass_g = 3.0790;
    const chem::BatchResult res = chem::evaluate_batch(lib(), r, batch_with({acid, salt}), 48);
    const double litres = r.request.volume_ml / 1000.0; // the demo's final volume
    // H3PO4: 3·1.008 + 30.973762 + 4·15.999 = 97.993762 g/mol; 1.25 mL · ρ · assay (the library's
    // 85 % w/w, 1.685 g/mL) / M / V.
    const double m_h3po4 = 3 * H + P + 4 * O;
    const double c_acid = 1.25 * pa.density_g_per_ml * pa.assay_fraction / m_h3po4 / litres;
    // NaH2PO4·H2O: 22.98976928 + 2·1.008 + 30.973762 + 4·15.999 + (2·1.008 + 15.999) = 137.990531
    // g/mol.
    const double m_salt = Na + 2 * H + P + 4 * O + (2 * H + O);
    const double c_salt = 3.0790 / m_salt / litres;
    QCOMPARE(res.composition.size(), size_t(2));
    for (const auto& comp : res.composition) {
        const double expect = comp.reagent->id == "phosphoric-acid" ? c_acid : c_salt;
        QVERIFY2(std::abs(comp.mol_per_l / expect - 1) < 1e-5,
                 qPrintable(QString("%1: %2 vs %3")
                                .arg(QString::fromStdString(comp.reagent->id))
                                .arg(comp.mol_per_l)
                                .arg(expect)));
    }
    // The pH reported is solve() of exactly that composition (to the solver's tolerance).
    const chem::Speciation s = chem::solve(lib(), res.composition, r.request.temperature_c);
    QVERIFY(std::abs(s.ph - res.predicted.ph) < 1e-7);
}

// Outside check: a bench that weighs the IUPAC/NIST equimolar phosphate reference amounts
// (0.025 mol KH2PO4 + 0.025 mol Na2HPO4 per litre) gets pH(S) 6.865 at 25 °C (Buck et al.,
// Pure Appl. Chem. 74 (2002) 2169, table of primary standards; from memory), within 0.02 (the
// Davies model at I = 0.1; molal vs molar is below that here).
void TestBatch::phFromActualAmountsMatchesReferenceBuffer() {
    const QJsonObject in{{"target_ph", 6.90},
                         {"temperature_c", 25},
                         {"volume_ml", 1000},
                         {"route", "mix"},
                         {"acid", "potassium-dihydrogen-phosphate"},
                         {"base", "disodium-hydrogen-phosphate"},
                         {"concentration_mol_per_l", 0.05}};
    const chem::Recipe r = design(in);
    chem::ActualAmount kh2po4;
    kh2po4.reagent = "potassium-dihydrogen-phosphate";
    kh2po4.mass_g = 0.025 * (K + 2 * H + P + 4 * O); // 136.084 g/mol
    chem::ActualAmount na2hpo4;
    na2hpo4.reagent = "disodium-hydrogen-phosphate";
    na2hpo4.mass_g = 0.025 * (2 * Na + H + P + 4 * O); // 141.957 g/mol
    const chem::BatchResult res = chem::evaluate_batch(lib(), r, batch_with({kh2po4, na2hpo4}), 48);
    QVERIFY2(std::abs(res.predicted.ph - 6.865) < 0.02,
             qPrintable(QString::number(res.predicted.ph)));
    QVERIFY(r.predicted.ph >
            6.89); // the plan was elsewhere: the number really comes from the amounts
}

void TestBatch::phMovesTheRightWayAndIsFlagged() {
    const chem::Recipe r = design(demo_input());
    const auto& acid = item(r, "phosphoric-acid");
    const auto& salt = item(r, "sodium-dihydrogen-phosphate-monohydrate");
    auto run = [&](double acid_factor, double salt_factor) {
        chem::ActualAmount a;
        a.reagent = acid.reagent;
        a.volume_ml = *acid.volume_ml * acid_factor;
        chem::ActualAmount s;
        s.reagent = salt.reagent;
        s.mass_g = *salt.mass_g * salt_factor;
        return chem::evaluate_batch(lib(), r, batch_with({a, s}), 48);
    };
    // More of the acid form lowers the pH, more of the salt raises it (Henderson–Hasselbalch).
    const auto more_acid = run(1.05, 1.0);
    const auto more_salt = run(1.0, 1.05);
    QVERIFY(more_acid.predicted.ph < r.request.target_ph - 1e-4);
    QVERIFY(more_salt.predicted.ph > r.request.target_ph + 1e-4);
    // A large error shifts the pH by more than 0.05: flagged with the numbers.
    const auto way_off = run(1.6, 1.0);
    QVERIFY(r.request.target_ph - way_off.predicted.ph > 0.05);
    QVERIFY(has_code(way_off.warnings, "ph-off-target"));
    QVERIFY(!has_code(more_salt.warnings, "ph-off-target") ||
            std::abs(more_salt.predicted.ph - r.request.target_ph) > 0.05);
}

void TestBatch::badBatchFieldsNameTheField_data() {
    QTest::addColumn<QString>("what");
    QTest::addColumn<QString>("field");
    QTest::newRow("no id") << "id"
                           << "batch.id";
    QTest::newRow("bad time") << "prepared_at"
                              << "batch.prepared_at";
    QTest::newRow("31 November") << "day"
                                 << "batch.prepared_at";
    QTest::newRow("expiry first") << "expires_at"
                                  << "batch.expires_at";
    QTest::newRow("tolerance 0") << "tolerance"
                                 << "batch.tolerance_percent";
    QTest::newRow("unknown reagent") << "reagent"
                                     << "batch.actual[0].reagent";
    QTest::newRow("twice") << "twice"
                           << "batch.actual[1].reagent";
    QTest::newRow("negative") << "negative"
                              << "batch.actual[0].mass_g";
    QTest::newRow("volume of a solid") << "solid-volume"
                                       << "batch.actual[0].volume_ml";
    QTest::newRow("both amounts") << "both"
                                  << "batch.actual[0].mass_g";
    QTest::newRow("mass of a stock") << "stock-mass"
                                     << "batch.actual[0].mass_g";
    QTest::newRow("absurd amount") << "absurd"
                                   << "batch.actual[0].mass_g";
}

void TestBatch::badBatchFieldsNameTheField() {
    QFETCH(QString, what);
    QFETCH(QString, field);
    chem::Recipe r = design(demo_input());
    chem::ActualAmount salt;
    salt.reagent = "sodium-dihydrogen-phosphate-monohydrate";
    salt.mass_g = 3.0;
    chem::Batch b = batch_with({salt});
    if (what == "id")
        b.id = "  ";
    if (what == "prepared_at")
        b.prepared_at = "1 Dec 2026";
    if (what == "day")
        b.prepared_at = "2026-11-31T10:00:00";
    if (what == "expires_at")
        b.expires_at = "2026-12-01T08:00:00";
    if (what == "tolerance")
        b.tolerance_fraction = 0;
    if (what == "reagent")
        b.actual[0].reagent = "tris";
    if (what == "twice")
        b.actual.push_back(salt);
    if (what == "negative")
        b.actual[0].mass_g = -1;
    if (what == "solid-volume") {
        b.actual[0].mass_g.reset();
        b.actual[0].volume_ml = 2;
    }
    if (what == "both")
        b.actual[0].volume_ml = 2;
    if (what == "absurd")
        b.actual[0].mass_g = 5000; // 5 kg in 2 L: 18 mol/L
    if (what == "stock-mass") {
        r = design(QJsonObject{{"target_ph", 4.75},
                               {"volume_ml", 500},
                               {"route", "stocks"},
                               {"acid", "acetic-acid"},
                               {"base", "sodium-acetate"},
                               {"acid_stock_mol_per_l", 1.0},
                               {"base_stock_mol_per_l", 1.0},
                               {"concentration_mol_per_l", 0.05}});
        b.actual[0].reagent = "acetic-acid";
    }
    QCOMPARE(expect_error([&] { chem::evaluate_batch(lib(), r, b, 48); }), field);
}

void TestBatch::expiryFromShelfLife_data() {
    QTest::addColumn<QString>("prepared");
    QTest::addColumn<double>("hours");
    QTest::addColumn<QString>("expires");
    // Gregorian calendar rules (leap years every 4, not every 100, every 400).
    QTest::newRow("48 h") << "2026-12-01T16:30:00" << 48.0 << "2026-12-03T16:30:00";
    QTest::newRow("new year") << "2026-12-31T20:00:00" << 48.0 << "2027-01-02T20:00:00";
    QTest::newRow("leap day 2028") << "2028-02-28T12:00:00" << 24.0 << "2028-02-29T12:00:00";
    QTest::newRow("no leap day 2100") << "2100-02-28T12:00:00" << 24.0 << "2100-03-01T12:00:00";
    QTest::newRow("leap day 2000") << "2000-02-28T23:59:00" << 24.0 << "2000-02-29T23:59:00";
    QTest::newRow("30 days, minutes only") << "2026-12-01T16:30" << 720.0 << "2026-12-31T16:30:00";
    QTest::newRow("half hour") << "2026-12-01T23:45:10" << 0.5 << "2026-12-02T00:15:10";
}

void TestBatch::expiryFromShelfLife() {
    QFETCH(QString, prepared);
    QFETCH(double, hours);
    QFETCH(QString, expires);
    chem::Batch b;
    b.id = "T-2";
    b.prepared_at = prepared.toStdString();
    QCOMPARE(QString::fromStdString(chem::check_batch_fields(b, hours)), expires);
    // Given explicitly, the expiry wins.
    b.expires_at = "2200-01-01T00:00:00";
    QCOMPARE(QString::fromStdString(chem::check_batch_fields(b, hours)),
             QString("2200-01-01T00:00:00"));
}

// ---- the record in SQLite -----------------------------------------------------------------------

namespace {
using TempDb = phaseplan::testing::TempBatchDb;

BatchRecord demo_record() {
    QJsonObject in = demo_input();
    in["batch"] = QJsonObject{
        {"id", "HR-QC117-A-0042"},
        {"prepared_by", "R. Okafor"},
        {"prepared_at", "2026-12-01T16:30:00"},
        {"actual", QJsonArray{QJsonObject{
                       {"reagent", "phosphoric-acid"}, {"volume_ml", 1.25}, {"lot", "PA-88121"}}}}};
    return BatchRecord::from_input(in);
}

int count_rows(QSqlDatabase db, const QString& sql) {
    QSqlQuery q(db);
    if (!q.exec(sql) || !q.next())
        return -1;
    return q.value(0).toInt();
}
} // namespace

void TestBatch::historyKeepsEveryChange() {
    TempDb t;
    BatchStore store(t.db);
    int tick = 0;
    store.set_clock(
        [&] { return QDateTime(QDate(2026, 12, 1), QTime(16, 0), Qt::UTC).addSecs(60 * tick++); });
    const BatchRecord rec = demo_record();
    store.create(rec, "R. Okafor");
    QCOMPARE(expect_error([&] { store.create(rec, "R. Okafor"); }), QString("batch.id"));
    QCOMPARE(expect_error([&] { store.create(rec, ""); }), QString("who"));

    auto h = store.history(rec.id);
    QVERIFY(!h.empty());
    for (const auto& e : h)
        QCOMPARE(e.action, QString("create"));
    auto created = [&](const QString& field) {
        for (const auto& e : h)
            if (e.field == field)
                return e.new_value;
        return QJsonValue(QJsonValue::Undefined);
    };
    QCOMPARE(created("prepared_by").toString(), QString("R. Okafor"));
    QCOMPARE(created("actual[phosphoric-acid].volume_ml").toDouble(), 1.25);
    QCOMPARE(created("actual[phosphoric-acid].lot").toString(), QString("PA-88121"));

    // Two edits by two people: the salt's weighing is added, then the acid's volume corrected.
    BatchRecord next = *store.load(rec.id);
    QJsonArray actual = next.actual;
    actual.append(QJsonObject{{"reagent", "sodium-dihydrogen-phosphate-monohydrate"},
                              {"mass_g", 3.079},
                              {"lot", "SP-2207"}});
    next.actual = actual;
    QVERIFY(store.edit(rec.id, next, "R. Okafor"));
    QVERIFY(!store.edit(rec.id, next, "R. Okafor")); // no change, nothing recorded
    next = *store.load(rec.id);                      // a save carries the version it was loaded at
    QJsonObject acid = next.actual[0].toObject();
    acid["volume_ml"] = 1.24;
    actual = next.actual;
    actual[0] = acid;
    next.actual = actual;
    next.checked_by = "M. Lindqvist";
    QVERIFY(store.edit(rec.id, next, "M. Lindqvist"));

    const BatchRecord now = *store.load(rec.id);
    QCOMPARE(now.revision, 3);
    QCOMPARE(now.actual.size(), 2);
    QCOMPARE(now.checked_by, QString("M. Lindqvist"));
    h = store.history(rec.id);
    auto find = [&](int revision, const QString& field) -> const phaseplan::storage::HistoryEntry* {
        for (const auto& e : h)
            if (e.revision == revision && e.field == field)
                return &e;
        return nullptr;
    };
    const auto* mass = find(2, "actual[sodium-dihydrogen-phosphate-monohydrate].mass_g");
    QVERIFY(mass);
    QCOMPARE(mass->action, QString("edit"));
    QVERIFY(mass->old_value.isNull());
    QCOMPARE(mass->new_value.toDouble(), 3.079);
    const auto* vol = find(3, "actual[phosphoric-acid].volume_ml");
    QVERIFY(vol);
    QCOMPARE(vol->old_value.toDouble(), 1.25);
    QCOMPARE(vol->new_value.toDouble(), 1.24);
    QCOMPARE(vol->who, QString("M. Lindqvist"));
    const auto* chk = find(3, "checked_by");
    QVERIFY(chk && chk->old_value.isNull() && chk->new_value.toString() == "M. Lindqvist");
    // Oldest first, times from the clock, nothing lost: 3 fields changed over two edits.
    int edits = 0;
    for (size_t i = 1; i < h.size(); ++i)
        QVERIFY(h[i].seq > h[i - 1].seq && h[i].at >= h[i - 1].at);
    for (const auto& e : h)
        edits += e.action == "edit";
    QCOMPARE(edits, 4); // mass_g and lot of the salt; the acid's volume; checked_by
    // The stored batch feeds back into the sheet command unchanged.
    QCOMPARE(now.to_input().value("batch").toObject().value("checked_by").toString(),
             QString("M. Lindqvist"));
}

void TestBatch::proposedIdsCountUpPerDay() {
    TempDb t;
    BatchStore store(t.db);
    const QDate day(2026, 12, 1);
    QCOMPARE(store.propose_id("KV", day), QString("KV-20261201-001"));
    BatchRecord rec = demo_record();
    rec.id = store.propose_id("KV", day);
    store.create(rec, "R. Okafor");
    QCOMPARE(store.propose_id("KV", day), QString("KV-20261201-002"));
    QCOMPARE(store.propose_id("KV", day.addDays(1)), QString("KV-20261202-001"));
    QCOMPARE(store.propose_id("QC", day), QString("QC-20261201-001"));
}

void TestBatch::printedBatchRefusesSilentEdits() {
    TempDb t;
    BatchStore store(t.db);
    const BatchRecord rec = demo_record();
    store.create(rec, "R. Okafor");
    store.mark_printed(rec.id, "R. Okafor", "sheet a4");
    BatchRecord next = *store.load(rec.id);
    QCOMPARE(next.printed_count, 1);
    QVERIFY(!next.first_printed_at.isEmpty());
    next.prepared_by = "someone else";

    // The API refuses an edit, and an amendment without a reason.
    QCOMPARE(expect_error([&] { store.edit(rec.id, next, "X. Person"); }), QString("batch"));
    QCOMPARE(expect_error([&] { store.amend(rec.id, next, "X. Person", "  "); }),
             QString("reason"));
    QCOMPARE(store.load(rec.id)->prepared_by, QString("R. Okafor"));

    // So does the database, for any code that goes around the API.
    QSqlQuery q(t.db);
    QVERIFY(
        !q.exec("UPDATE batches SET prepared_by = 'someone else' WHERE id = 'HR-QC117-A-0042'"));
    QVERIFY(!q.exec("UPDATE batches SET prepared_by = 'someone else', revision = revision + 1 "
                    "WHERE id = 'HR-QC117-A-0042'"));
    QVERIFY(!q.exec("DELETE FROM batches"));
    QCOMPARE(store.load(rec.id)->prepared_by, QString("R. Okafor"));

    // An amendment with a reason is recorded as one.
    QVERIFY(store.amend(rec.id, next, "M. Lindqvist", "name entered wrongly at the bench"));
    const BatchRecord after = *store.load(rec.id);
    QCOMPARE(after.prepared_by, QString("someone else"));
    QCOMPARE(after.revision, 2);
    bool found = false;
    for (const auto& e : store.history(rec.id))
        if (e.action == "amend" && e.field == "prepared_by") {
            found = true;
            QCOMPARE(e.old_value.toString(), QString("R. Okafor"));
            QCOMPARE(e.new_value.toString(), QString("someone else"));
            QCOMPARE(e.reason, QString("name entered wrongly at the bench"));
            QCOMPARE(e.who, QString("M. Lindqvist"));
        }
    QVERIFY(found);
    // Printing again is recorded too, with the revision printed.
    store.mark_printed(rec.id, "M. Lindqvist", "labels label62");
    int prints = 0;
    for (const auto& e : store.history(rec.id))
        if (e.action == "print") {
            ++prints;
            QCOMPARE(e.revision, prints == 1 ? 1 : 2);
        }
    QCOMPARE(prints, 2);
}

void TestBatch::historyIsAppendOnlyInTheDatabase() {
    TempDb t;
    BatchStore store(t.db);
    store.create(demo_record(), "R. Okafor");
    const int rows = count_rows(t.db, "SELECT count(*) FROM batch_history");
    QVERIFY(rows > 0);
    QSqlQuery q(t.db);
    QVERIFY(!q.exec("UPDATE batch_history SET who = 'nobody'"));
    QVERIFY(!q.exec("DELETE FROM batch_history"));
    QCOMPARE(count_rows(t.db, "SELECT count(*) FROM batch_history"), rows);
    QCOMPARE(count_rows(t.db, "SELECT count(*) FROM batch_history WHERE who = 'nobody'"), 0);
    // An unprinted batch changed without history rows: refused as well.
    QVERIFY(!q.exec("UPDATE batches SET checked_by = 'X' WHERE id = 'HR-QC117-A-0042'"));
}

// The app's database gets the batch tables from its migration steps; an older file is migrated.
void TestBatch::migrationCreatesBatchTables() {
    phaseplan::testing::TestDatabases dbs;
    const QString path = dbs.fresh("app.sqlite");
    using phaseplan::storage::Database;
    int batch_version = 0;
    for (const auto& m : phaseplan::storage::migrations())
        if (QString(m.summary).contains("batches"))
            batch_version = m.version;
    QVERIFY(batch_version > 0);
    {
        Database old(path, batch_version - 1);
        QVERIFY(!phaseplan::storage::sql::table_exists(old.connection(), "batches"));
    }
    Database db(path);
    QCOMPARE(db.schema_version(), phaseplan::storage::latest_schema_version());
    BatchStore store(db.connection());
    store.create(demo_record(), "R. Okafor");
    QCOMPARE(store.list(), QStringList{"HR-QC117-A-0042"});
}

// ---- corrections
// --------------------------------------------------------------------------------- Every expected
// value is worked by hand beside its row: two solids A (target 2.000 g) and B (target 5.000 g) in
// 1000 mL at ± 2 %, unless the row says otherwise.

void TestBatch::correctionByHand_data() {
    QTest::addColumn<double>("a");         // actual A, g (NaN = not weighed yet)
    QTest::addColumn<double>("b");         // actual B, g (NaN = not weighed yet)
    QTest::addColumn<double>("container"); // mL (NaN = not given)
    QTest::addColumn<bool>("needed");
    QTest::addColumn<bool>("remake");
    QTest::addColumn<double>("scale");
    QTest::addColumn<double>("volume"); // mL
    QTest::addColumn<double>("add_a");  // g
    QTest::addColumn<double>("add_b");  // g
    const double nan = std::nan("");
    // Both within ± 2 %: nothing to do.
    QTest::newRow("within") << 2.030 << 4.950 << nan << false << false << 1.0 << 1000.0 << 0.0
                            << 0.0;
    // A 5 % under (1.900 g): s = 1, add 2.000 − 1.900 = 0.100 g of A; B on target.
    QTest::newRow("A under") << 1.900 << 5.000 << nan << true << false << 1.0 << 1000.0 << 0.100
                             << 0.0;
    // A 5 % over (2.100 g): s = 2.100 / 2.000 = 1.05, V = 1050 mL; B scaled target 5.250 g,
    // band 5.145–5.355 g; B at 5.000 g is outside: add 5.250 − 5.000 = 0.250 g.
    QTest::newRow("A over") << 2.100 << 5.000 << nan << true << false << 1.05 << 1050.0 << 0.0
                            << 0.250;
    // A 5 % over, B 3 % over (5.150 g): s = max(1.05, 1.03) = 1.05; B against 5.250 g:
    // 5.150 / 5.250 − 1 = −1.905 %, inside ± 2 %: nothing to add to B.
    QTest::newRow("both over") << 2.100 << 5.150 << nan << true << false << 1.05 << 1050.0 << 0.0
                               << 0.0;
    // A 5 % over, B not weighed yet: weigh 5.000 × 1.05 = 5.250 g of B.
    QTest::newRow("B not yet weighed")
        << 2.100 << nan << nan << true << false << 1.05 << 1050.0 << 0.0 << 5.250;
    // A 5 % over in a 1000 mL flask: 1050 mL does not fit: remake.
    QTest::newRow("flask too small")
        << 2.100 << 5.000 << 1000.0 << true << true << 1.05 << 1050.0 << 0.0 << 0.250;
    // The same in a 2000 mL bottle: it fits.
    QTest::newRow("bottle large enough")
        << 2.100 << 5.000 << 2000.0 << true << false << 1.05 << 1050.0 << 0.0 << 0.250;
    // A 10 % over (2.200 g) and B 4 % under (4.800 g): s = 1.10, V = 1100 mL, B to 5.500 g:
    // add 5.500 − 4.800 = 0.700 g.
    QTest::newRow("over and under")
        << 2.200 << 4.800 << nan << true << false << 1.10 << 1100.0 << 0.0 << 0.700;
}

void TestBatch::correctionByHand() {
    QFETCH(double, a);
    QFETCH(double, b);
    QFETCH(double, container);
    QFETCH(bool, needed);
    QFETCH(bool, remake);
    QFETCH(double, scale);
    QFETCH(double, volume);
    QFETCH(double, add_a);
    QFETCH(double, add_b);
    auto opt = [](double v) { return std::isnan(v) ? std::nullopt : std::optional<double>(v); };
    const std::vector<chem::AmountCheck> checks = {chem::check_amount("A", "g", 2.0, opt(a), 0.02),
                                                   chem::check_amount("B", "g", 5.0, opt(b), 0.02)};
    const chem::Correction c = chem::suggest_correction(checks, 0.02, 1000, opt(container));
    QCOMPARE(c.needed, needed);
    QCOMPARE(c.remake, remake);
    QVERIFY2(std::abs(c.scale - scale) < 1e-9, qPrintable(QString::number(c.scale)));
    QVERIFY(std::abs(c.final_volume_ml - volume) < 1e-6);
    QCOMPARE(int(c.steps.size()), 2);
    QVERIFY2(std::abs(c.steps[0].add - add_a) < 1e-9, qPrintable(QString::number(c.steps[0].add)));
    QVERIFY2(std::abs(c.steps[1].add - add_b) < 1e-9, qPrintable(QString::number(c.steps[1].add)));
    if (remake)
        QVERIFY(chem::remake_reason(c).find("1050 mL") != std::string::npos);
    // After the correction every weighed part lies within the band around its scaled target.
    if (needed && !remake)
        for (const auto& s : c.steps)
            QVERIFY2(std::abs(s.after / s.new_target - 1) <= 0.02 + 1e-12, s.reagent.c_str());
}

void TestBatch::correctionRefusesBadVolumes() {
    const std::vector<chem::AmountCheck> checks = {chem::check_amount("A", "g", 2.0, 2.1, 0.02)};
    QCOMPARE(expect_error([&] { chem::suggest_correction(checks, 0.02, 0, std::nullopt); }),
             QString("batch.final_volume_ml"));
    QCOMPARE(expect_error([&] { chem::suggest_correction(checks, 0.02, 1000, -5.0); }),
             QString("batch.container_ml"));
}

// ---- the measured pH --------------------------------------------------------------------------

void TestBatch::measuredPhAgainstItsTolerance() {
    const chem::Recipe r = design(demo_input()); // target pH 2.50
    chem::Batch b = batch_with({});
    // 2.54: 0.04 from 2.50, inside the default ± 0.05 (common practice, no source).
    b.measured_ph = 2.54;
    chem::BatchResult res = chem::evaluate_batch(lib(), r, b, 48);
    QVERIFY(!res.out_of_tolerance);
    QVERIFY(std::abs(*res.measured_ph_deviation - 0.04) < 1e-9);
    // 2.57: 0.07 from 2.50, outside ± 0.05: out of tolerance, warned with the numbers.
    b.measured_ph = 2.57;
    res = chem::evaluate_batch(lib(), r, b, 48);
    QVERIFY(res.out_of_tolerance && res.measured_ph_out);
    QVERIFY(has_code(res.warnings, "measured-ph-out-of-tolerance"));
    // The same reading with ± 0.1 allowed: inside.
    b.ph_tolerance = 0.1;
    QVERIFY(!chem::evaluate_batch(lib(), r, b, 48).out_of_tolerance);
    // Bad values name their field.
    b.measured_ph = 15;
    QCOMPARE(expect_error([&] { chem::evaluate_batch(lib(), r, b, 48); }),
             QString("batch.measured_ph"));
    b.measured_ph = 2.5;
    b.ph_tolerance = 0;
    QCOMPARE(expect_error([&] { chem::evaluate_batch(lib(), r, b, 48); }),
             QString("batch.ph_tolerance"));
    b.ph_tolerance = 0.05;
    b.container_ml = -1;
    QCOMPARE(expect_error([&] { chem::evaluate_batch(lib(), r, b, 48); }),
             QString("batch.container_ml"));
}

void TestBatch::benchFieldsStoredAndMigratedFromV4() {
    phaseplan::testing::TestDatabases dbs;
    const QString path = dbs.fresh("v4.sqlite");
    using phaseplan::storage::Database;
    {
        // A file at step 4 with a batch in it, written with step 4's columns only.
        Database old(path, 4);
        const BatchRecord r = demo_record();
        QSqlQuery q(old.connection());
        q.prepare("INSERT INTO batches (id, document_kind, document, prepared_by, prepared_at,"
                  " tolerance_percent, actual, created_at, updated_at) VALUES (?, ?, ?, ?, ?, 2, "
                  "?, ?, ?)");
        for (const QVariant& v : QVariantList{
                 r.id, r.document_kind,
                 QString::fromUtf8(QJsonDocument(r.document).toJson(QJsonDocument::Compact)),
                 r.prepared_by, r.prepared_at,
                 QString::fromUtf8(QJsonDocument(r.actual).toJson(QJsonDocument::Compact)),
                 "2026-12-01T16:00:00Z", "2026-12-01T16:00:00Z"})
            q.addBindValue(v);
        QVERIFY2(q.exec(), qPrintable(q.lastError().text()));
    }
    Database db(path);
    QCOMPARE(db.schema_version(), phaseplan::storage::latest_schema_version());
    BatchStore store(db.connection());
    BatchRecord rec = *store.load("HR-QC117-A-0042");
    QVERIFY(!rec.measured_ph);
    QCOMPARE(rec.ph_tolerance, 0.05);
    rec.measured_ph = 2.53;
    rec.ph_meter_id = "PHM-3";
    rec.balance_id = "BAL-07";
    rec.comment = "2 L flask";
    rec.container_ml = 2000;
    rec.deviation_note = "used for a trial only";
    rec.deviation_by = "M. Lindqvist";
    rec.deviation_at = "2026-12-01T17:00:00";
    QVERIFY(store.edit(rec.id, rec, "R. Okafor"));
    const BatchRecord back = *store.load(rec.id);
    QCOMPARE(back.measured_ph.value_or(0), 2.53);
    QCOMPARE(back.ph_meter_id, QString("PHM-3"));
    QCOMPARE(back.balance_id, QString("BAL-07"));
    QCOMPARE(back.comment, QString("2 L flask"));
    QCOMPARE(back.container_ml.value_or(0), 2000.0);
    QCOMPARE(back.deviation_note, QString("used for a trial only"));
    QCOMPARE(back.deviation_by, QString("M. Lindqvist"));
    QStringList fields;
    for (const auto& h : store.history(rec.id))
        if (h.revision == back.revision)
            fields << h.field;
    for (const char* f : {"measured_ph", "ph_meter_id", "balance_id", "comment", "container_ml",
                          "deviation.note", "deviation.by", "deviation.at"})
        QVERIFY2(fields.contains(f), f);
    // The contract round trip keeps them.
    const BatchRecord again = BatchRecord::from_input(back.to_input());
    QCOMPARE(again.deviation_note, back.deviation_note);
    QCOMPARE(again.measured_ph.value_or(0), 2.53);
    // The database refuses an unrecorded change of the new columns too.
    QSqlQuery q(db.connection());
    QVERIFY(!q.exec("UPDATE batches SET deviation_note = 'changed quietly'"));
    QVERIFY(!q.exec("UPDATE batches SET measured_ph = 7"));
    QCOMPARE(store.load(rec.id)->deviation_note, QString("used for a trial only"));
}

QTEST_GUILESS_MAIN(TestBatch)
#include "tst_batch.moc"
