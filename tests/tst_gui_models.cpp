// The app's models, each built alone on a temporary database (no QML): that they pass the core's
// answers through unchanged, keep the invariants the screens rely on, map the core's errors to
// the field or row they name, and keep the lab's work across a reopen.
//
// Outside references: the recipe lands on its target within 0.005 pH and pH rises monotonically
// with added base (the recipe designer's contract, issue 2); bottles only drain and the level at
// the end is the bottle less the core's required volume (mass balance); the count of solvents
// equals data/solvents.json read independently here.
#include "buffer_designer.h"
#include "checks_model.h"
#include "core/commands.h"
#include "core/line_commands.h"
#include "library_models.h"
#include "lines_model.h"
#include "method_models.h"
#include "plan.h"
#include "saved_model.h"
#include "workspace.h"

#include <QDir>
#include <QFile>
#include <QJsonArray>
#include <QJsonDocument>
#include <QLineSeries>
#include <QLocale>
#include <QRegularExpression>
#include <QSignalSpy>
#include <QTemporaryDir>
#include <QTest>

#include <memory>

using namespace phaseplan::gui;

namespace {

const QString data_dir = QStringLiteral(SOURCE_DIR "/data");

QJsonObject read_json(const QString& path) {
    QFile f(path);
    if (!f.open(QIODevice::ReadOnly))
        qFatal("cannot open %s", qPrintable(path));
    return QJsonDocument::fromJson(f.readAll()).object();
}

std::unique_ptr<Workspace> open_workspace(const QString& db, const QString& data = data_dir) {
    auto ws = std::make_unique<Workspace>();
    ws->setDatabasePath(db);
    ws->setDataDir(data);
    if (!ws->open())
        qFatal("workspace did not open: %s", qPrintable(ws->errorMessage()));
    return ws;
}

double item_mass(const QVariantList& items, const QString& reagent) {
    for (const QVariant& v : items)
        if (v.toMap().value("reagent").toString() == reagent)
            return v.toMap().value("mass_g").toDouble();
    return -1;
}

/// Linear interpolation of y at x on a curve sorted by x.
double interpolate(const QList<QPointF>& c, double x) {
    for (int i = 1; i < c.size(); ++i)
        if (c[i].x() >= x) {
            const double f = (x - c[i - 1].x()) / (c[i].x() - c[i - 1].x());
            return c[i - 1].y() + f * (c[i].y() - c[i - 1].y());
        }
    return c.isEmpty() ? 0 : c.back().y();
}

/// A workspace opened on `db` and the plan it restores (the demo, on a new database): the setup
/// most tests here start from. The plan is declared after the workspace, so it goes first.
struct DemoPlan {
    explicit DemoPlan(const QString& db) : ws(open_workspace(db)) {
        plan.setRestore(true);
        plan.setWorkspace(ws.get());
    }
    std::unique_ptr<Workspace> ws;
    Plan plan;
};

/// A phosphate buffer by the mix route on `d`: the two forms, the concentration (mmol/L), the
/// volume (mL) and the target pH.
void set_phosphate_mix(BufferDesigner& d, const QString& acid, const QString& base,
                       double mmol_per_l, double volume_ml, double ph) {
    d.setRoute("mix");
    d.setSystem("phosphate");
    d.setAcid(acid);
    d.setBase(base);
    d.setConcentrationMmolPerL(mmol_per_l);
    d.setVolumeMl(volume_ml);
    d.setTargetPh(ph);
}

} // namespace

class TestGuiModels : public QObject {
    Q_OBJECT
    QTemporaryDir dir_;
    int n_ = 0;
    QString fresh_db() { return dir_.filePath(QStringLiteral("db-%1.sqlite").arg(++n_)); }

  private slots:
    void initTestCase() {
        // One "today" for every run: the screens word times relative to it.
        qputenv("PHASEPLAN_NOW", "2026-12-02T14:00:00");
    }

    void first_run_opens_the_demo() {
        const QString db = fresh_db();
        auto ws = open_workspace(db);
        QVERIFY(ws->firstRun());
        Plan plan;
        plan.setRestore(true);
        plan.setWorkspace(ws.get());
        plan.recomputeNow();
        QJsonObject demo = read_json(data_dir + "/demo/overnight-sequence.json");
        QCOMPARE(plan.name(), Workspace::demoName());
        // The demo is tonight's plan: PHASEPLAN_NOW is 2026-12-02T14:00, so it starts at the next
        // 18:00, a day after the file's start, and every other time moves with it, except that no
        // bottle is prepared after now: line A's 14:30 stays at 14:00. Line A holds its buffer by
        // reference to the saved buffer the demo seeded.
        demo.insert("start", "2026-12-02T18:00:00");
        QJsonObject lines = demo.value("lines").toObject();
        QJsonObject a = lines.value("A").toObject();
        a.insert("prepared_at", "2026-12-02T14:00:00");
        QJsonArray parts = a.value("parts").toArray();
        QJsonObject part = parts[0].toObject();
        part.insert("buffer_ref", "20 mM sodium phosphate pH 2.5 buffer");
        parts[0] = part;
        a.insert("parts", parts);
        lines.insert("A", a);
        demo.insert("lines", lines);
        QCOMPARE(plan.json(), demo);
        QCOMPARE(plan.startText(), QString("today 18:00"));
        QCOMPARE(plan.endText(), QString("tomorrow 03:30"));
        QCOMPARE(plan.standbyText(), QString("until tomorrow 07:30 (4 h 00 min)"));
        QVERIFY2(plan.valid(), qPrintable(plan.errorField() + ": " + plan.errorMessage()));
        // The plan shows exactly what the core's sequence command says for the same document.
        const QJsonObject direct = phaseplan::command_sequence(ws->data(), demo, {});
        QCOMPARE(plan.endTime(), direct.value("end").toString());
        QCOMPARE(plan.totalMin(), direct.value("total_min").toDouble());
        QCOMPARE(plan.warnings().size(), direct.value("warnings").toArray().size());
        // The model reads the typed result's fields; the command's JSON of the same document is
        // the reference (the contract's own output, no outside source): a field read from the
        // wrong place differs here.
        QCOMPARE(plan.wasteMl(), direct.value("waste_ml").toDouble());
        // Waste is everything pumped plus the priming (chem/sequence.h, SequencePlan::waste_ml).
        QVERIFY(std::abs(plan.wasteMl() - direct.value("pumped_ml").toDouble() -
                         direct.value("prime_ml").toDouble()) < 1e-6);
        const QJsonArray direct_warnings = direct.value("warnings").toArray();
        for (int i = 0; i < direct_warnings.size(); ++i) {
            const QVariantMap w = plan.warnings()[i].toMap();
            QCOMPARE(w.value("code").toString(), direct_warnings[i]["code"].toString());
            // (The messages differ in their clock words: the screen says "tomorrow 01:47".)
            QCOMPARE(w.value("severity").toString(), direct_warnings[i]["severity"].toString());
            QCOMPARE(w.value("line").toString(), direct_warnings[i]["line"].toString());
        }
        const QJsonObject direct_lines = direct.value("lines").toObject();
        QCOMPARE(plan.bottleCount(), int(direct_lines.size()));
        for (int i = 0; i < plan.bottleCount(); ++i) {
            const QVariantMap b = plan.bottleAt(i);
            const QJsonObject d = direct_lines.value(b.value("letter").toString()).toObject();
            QVERIFY(!d.isEmpty());
            for (const char* key : {"required_ml", "usable_ml", "prime_ml", "pumped_ml", "spare_ml",
                                    "min_bottle_ml", "suggested_bottle_ml", "uv_cutoff_nm"})
                QVERIFY2(b.value(key).toDouble() == d.value(key).toDouble(), key);
            QCOMPARE(b.value("runs_dry").toBool(), d.value("runs_dry").toBool());
            QCOMPARE(b.value("dry_at").toString(), d.value("dry_at").toString());
            QCOMPARE(b.value("shelf_kind").toString(), d.value("shelf_kind").toString());
            QVERIFY(b.value("required_ml").toDouble() >= b.value("prime_ml").toDouble());
        }
        const phaseplan::PlanResult* typed = plan.planResult();
        QVERIFY(typed);
        const QJsonArray direct_rows = direct.value("rows").toArray();
        QCOMPARE(qsizetype(typed->rows.size()), direct_rows.size());
        for (std::size_t i = 0; i < typed->rows.size(); ++i) {
            QCOMPARE(typed->row_end(i), direct_rows[qsizetype(i)]["end"].toString());
            QCOMPARE(typed->rows[i].volume_ml[0],
                     direct_rows[qsizetype(i)]["volume_ml"]["A"].toDouble());
        }
        QCOMPARE(typed->standby_end, direct.value("standby_end").toString());
        QCOMPARE(typed->standby_min, direct.value("standby_min").toDouble());
        // The demo was seeded as saved work too.
        QVERIFY(ws->database()->load(phaseplan::storage::DocumentKind::sequence,
                                     Workspace::demoName()));
        auto again = open_workspace(db);
        QVERIFY(!again->firstRun());
    }

    /// A first run in the evening (18:10, after the demo's 18:00): the demo starts tomorrow 18:00,
    /// but line A's buffer is not "prepared" tomorrow afternoon; it stays at now. So a user who
    /// brings the start forward to tonight 19:00 gets a valid plan, not "prepared at … is after
    /// the sequence start".
    void an_evening_first_run_can_start_tonight() {
        qputenv("PHASEPLAN_NOW", "2026-12-02T18:10:30");
        DemoPlan demo(fresh_db());
        Plan& plan = demo.plan;
        plan.recomputeNow();
        const QJsonObject doc = plan.json();
        QCOMPARE(doc.value("start").toString(), QString("2026-12-03T18:00:00"));
        QCOMPARE(
            doc.value("lines").toObject().value("A").toObject().value("prepared_at").toString(),
            QString("2026-12-02T18:10:00"));
        plan.setStartAt(2026, 12, 2, 19, 0);
        plan.recomputeNow();
        QVERIFY2(plan.valid(), qPrintable(plan.errorField() + ": " + plan.errorMessage()));
        QCOMPARE(plan.startText(), QString("today 19:00"));
        QCOMPARE(plan.startNote(), QString()); // later than now: nothing to say
        // A start already past (today 18:00 at 18:10) is planned, with a word under the field.
        plan.setStartAt(2026, 12, 2, 18, 0);
        plan.recomputeNow();
        QVERIFY(plan.startNote().startsWith("Today 18:00 was 10 min ago"));
        // Within the same minute is "now", not the past.
        plan.setStartAt(2026, 12, 2, 18, 10);
        QCOMPARE(plan.startNote(), QString());
        qputenv("PHASEPLAN_NOW", "2026-12-02T14:00:00");
    }

    void recipe_follows_target_ph_data() {
        QTest::addColumn<QString>("locale");
        QTest::newRow("C") << "C";
        QTest::newRow("decimal comma (de_DE)") << "de_DE";
    }
    void recipe_follows_target_ph() {
        QFETCH(QString, locale);
        QLocale::setDefault(QLocale(locale));
        auto ws = open_workspace(fresh_db());
        BufferDesigner d;
        d.setWorkspace(ws.get());
        set_phosphate_mix(d, "sodium-dihydrogen-phosphate-monohydrate",
                          "disodium-hydrogen-phosphate-heptahydrate", 25, 1000, 6.8);
        QVERIFY2(d.valid(), qPrintable(d.errorMessage()));
        const double base_at_68 = item_mass(d.items(), "disodium-hydrogen-phosphate-heptahydrate");
        QVERIFY(std::abs(d.predictedPh() - 6.8) < 0.005);
        d.setTargetPh(7.4);
        QVERIFY(d.valid());
        const double base_at_74 = item_mass(d.items(), "disodium-hydrogen-phosphate-heptahydrate");
        QVERIFY(std::abs(d.predictedPh() - 7.4) < 0.005);
        QVERIFY2(base_at_74 > base_at_68, "a higher pH takes more of the base form");
        // The model passes the core's numbers through unchanged.
        const QJsonObject direct = phaseplan::command_recipe(ws->data(), d.requestDocument(), {});
        QCOMPARE(d.predictedPh(), direct.value("ph").toDouble());
        QVariantList direct_items;
        for (const QJsonValue& v : direct.value("items").toArray())
            direct_items.append(v.toObject().toVariantMap());
        QCOMPARE(base_at_74, item_mass(direct_items, "disodium-hydrogen-phosphate-heptahydrate"));
        // The amount shown uses the locale's decimal separator.
        QString amount;
        for (const QVariant& v : d.items())
            if (v.toMap().value("reagent") == "disodium-hydrogen-phosphate-heptahydrate")
                amount = v.toMap().value("amount").toString();
        QVERIFY2(amount.contains(QLocale().decimalPoint()), qPrintable(amount));
        QLocale::setDefault(QLocale::c());
    }

    // The card and the steps write an amount by one rule (chem::measure_decimals): the card's
    // text of each amount, decimal mark aside, stands in a step. The reference is the step the
    // core words for the same recipe; the rule's own decimals are checked in
    // chem_error_path (MeasureText). A card or a step that rounds by another rule fails here, as
    // "0.756 mL (1.276 g)" on the card beside "Measure 0.7556 mL" in the steps did.
    void card_amounts_read_as_the_steps_data() {
        QTest::addColumn<QString>("locale");
        QTest::addColumn<QString>("route");
        QTest::addColumn<double>("volume_ml");
        QTest::newRow("mix, liquid acid under 1 mL") << "C"
                                                     << "mix" << 1200.0;
        QTest::newRow("mix, decimal comma (de_DE)") << "de_DE"
                                                    << "mix" << 1200.0;
        QTest::newRow("mix, 20 L") << "C"
                                   << "mix" << 20000.0;
        QTest::newRow("titrate, neat titrant") << "C"
                                               << "titrate" << 500.0;
    }
    void card_amounts_read_as_the_steps() {
        QFETCH(QString, locale);
        QFETCH(QString, route);
        QFETCH(double, volume_ml);
        QLocale::setDefault(QLocale(locale));
        auto ws = open_workspace(fresh_db());
        BufferDesigner d;
        d.setWorkspace(ws.get());
        set_phosphate_mix(d, "phosphoric-acid", "sodium-dihydrogen-phosphate-monohydrate", 20,
                          volume_ml, 2.5);
        if (route == "titrate") {
            d.setSystem("formate");
            d.setAcid("formic-acid");
            d.setBase("ammonium-formate");
            d.setTargetPh(3.0);
            d.setConcentrationMmolPerL(10);
            d.setRoute("titrate");
        }
        QVERIFY2(d.valid(), qPrintable(d.errorMessage()));
        const QStringList steps = d.steps();
        QVERIFY(!d.items().isEmpty());
        // The steps write every number with the card's decimal mark ("2,975 g" under de_DE):
        // no "." between two digits is left where the mark is ",".
        if (QLocale().decimalPoint() != QLatin1String("."))
            for (const QString& s : steps)
                QVERIFY2(!s.contains(QRegularExpression(QStringLiteral("\\d\\.\\d"))),
                         qPrintable("a step keeps \".\" as its decimal mark: " + s));
        for (const QVariant& v : d.items()) {
            const QVariantMap item = v.toMap();
            const QString amount = item.value("amount").toString();
            QVERIFY(!amount.isEmpty());
            bool found = false;
            for (const QString& s : steps)
                found |= s.contains(amount);
            QVERIFY2(found, qPrintable(item.value("reagent").toString() + ": the card shows \"" +
                                       amount + "\", no step says it:\n" + steps.join("\n")));
        }
        QLocale::setDefault(QLocale::c());
    }

    void bad_input_names_the_field() {
        auto ws = open_workspace(fresh_db());
        BufferDesigner d;
        d.setWorkspace(ws.get());
        d.setVolumeMl(-250);
        QVERIFY(!d.valid());
        QCOMPARE(d.errorField(), QString("volume_ml"));
        QVERIFY2(d.errorMessage().contains("-250"), qPrintable(d.errorMessage()));
        QVERIFY(d.items().isEmpty());
        QVERIFY(d.errorIs("volume_ml"));
        d.setVolumeMl(500);
        QVERIFY(d.valid());
        d.setTemperatureC(85);
        QCOMPARE(d.errorField(), QString("temperature_c"));
        d.setTemperatureC(25);
        d.setAcid("no-such-reagent");
        QCOMPARE(d.errorField(), QString("acid"));
        // pH 9 cannot come from an acetate mix: a clear error on the target, not a recipe.
        d.setSystem("acetate");
        d.setAcid("acetic-acid");
        d.setBase("sodium-acetate");
        d.setTargetPh(9.0);
        QCOMPARE(d.errorField(), QString("target_ph"));
    }

    // Issue "buffer conventions": the LC-MS way of writing a buffer (10 mM ammonium formate,
    // brought to pH 3.0 with formic acid) can be chosen, is said on screen, and a route change
    // never swaps a reagent silently. Expected totals: tst_recipe's hand calculation (formate
    // 67.5 mmol/L in all with pKa 3.752, Harned & Embree 1934, from memory).
    void buffer_conventions_are_said_and_kept() {
        auto ws = open_workspace(fresh_db());
        BufferDesigner d;
        d.setWorkspace(ws.get());
        d.setSystem("formate");
        d.setAcid("formic-acid");
        d.setBase("ammonium-formate");
        d.setTargetPh(3.0);
        d.setConcentrationMmolPerL(10);
        QVERIFY2(d.valid(), qPrintable(d.errorMessage()));
        QCOMPARE(d.concentrationBasis(), QString("total"));
        QVERIFY2(d.basisText().contains("total formate"), qPrintable(d.basisText()));
        // The pickers show formulas and only fitting forms: no acid form is offered as a base.
        auto ids = [](const QVariantList& l) {
            QStringList out;
            for (const QVariant& v : l)
                out << v.toMap().value("id").toString();
            return out;
        };
        QVERIFY(ids(d.acidChoices()).contains("formic-acid"));
        QVERIFY(!ids(d.baseChoices()).contains("formic-acid"));
        QVERIFY(d.acidChoices().first().toMap().value("name").toString().contains("HCOOH"));
        // Titrate: the salt is weighed, its partner becomes the titrant, neat, and a note says so.
        d.setRoute("titrate");
        QCOMPARE(d.weigh(), QString("ammonium-formate"));
        QCOMPARE(d.titrant(), QString("formic-acid"));
        QCOMPARE(d.titrantForm(), QString("neat"));
        QVERIFY(!d.routeNotes().isEmpty());
        const QStringList titrants = ids(d.titrantChoices());
        for (const char* id :
             {"formic-acid", "ammonia", "trifluoroacetic-acid", "hydrochloric-acid"})
            QVERIFY2(titrants.contains(id), id);
        QVERIFY(!titrants.contains("sodium-formate"));
        d.setConcentrationBasis("salt");
        QVERIFY2(d.valid(), qPrintable(d.errorMessage()));
        QVERIFY2(d.basisText().startsWith(
                     "10 mmol/L ammonium formate, brought to pH 3.00 with formic acid"),
                 qPrintable(d.basisText()));
        QVERIFY2(d.basisText().contains("67.5 mmol/L"), qPrintable(d.basisText()));
        QVERIFY2(d.defaultName().contains("ammonium formate") &&
                     d.defaultName().contains("salt basis"),
                 qPrintable(d.defaultName()));
        // A neat liquid is pipetted: its volume comes first.
        bool pipetted = false;
        for (const QVariant& v : d.items()) {
            const QVariantMap it = v.toMap();
            if (it.value("reagent") == "formic-acid")
                pipetted =
                    it.value("amount").toString().contains(QRegularExpression("^[0-9.,]+ mL \\("));
        }
        QVERIFY(pipetted);
        // The saved inputs keep the basis and the form.
        const QVariantMap doc = d.document();
        QCOMPARE(doc.value("concentration_basis").toString(), QString("salt"));
        QCOMPARE(doc.value("titrant_form").toString(), QString("neat"));
        QVERIFY(!doc.contains("titrant_mol_per_l"));
        // A solid strong titrant cannot be neat: picking NaOH makes it a solution.
        d.setTitrant("sodium-hydroxide");
        QCOMPARE(d.titrantForm(), QString("solution"));
    }

    // "What the column sees": the card reads the eluent pH and the pressure of one method from
    // the plan's own result, the same numbers the command-line tool prints for the document.
    void column_conditions_come_from_the_plan() {
        DemoPlan demo(fresh_db());
        auto& ws = demo.ws;
        Plan& plan = demo.plan;
        plan.recomputeNow();
        QVERIFY2(plan.valid(), qPrintable(plan.errorMessage()));
        const QVariantMap c = plan.methodConditions("assay");
        QVERIFY(c.value("hasEluent").toBool());
        QVERIFY(c.value("phMin").toDouble() < c.value("phMax").toDouble());
        QVERIFY(c.value("hasPressure").toBool());
        QCOMPARE(c.value("limitBar").toDouble(), 400.0); // the demo column's stated limit
        QLineSeries ph, bar;
        plan.fillConditionSeries(&ph, "assay", "ph");
        plan.fillConditionSeries(&bar, "assay", "pressure");
        QVERIFY(ph.count() > 10 && bar.count() > 10);
        double lo = 14, top = 0;
        for (const QPointF& p : ph.points())
            lo = std::min(lo, p.y());
        for (const QPointF& p : bar.points())
            top = std::max(top, p.y());
        QVERIFY(std::abs(lo - c.value("phMin").toDouble()) < 1e-9);
        QVERIFY(std::abs(top - c.value("maxBar").toDouble()) < 1e-6 * top);
        QVERIFY(!plan.methodConditions("no such method").value("hasEluent").toBool());
        // The model keeps the traces typed (sequence_result); the command's JSON of
        // the same document is the reference: every method's figures and points agree.
        const QJsonObject doc = QJsonObject::fromVariantMap(plan.documentMap());
        const QJsonObject out = phaseplan::command_sequence(ws->data(), doc, {});
        for (const QString& m : plan.methodNames()) {
            const QVariantMap mc = plan.methodConditions(m);
            const QJsonArray pts = out["eluent_trace"].toObject()[m].toObject()["points"].toArray();
            const QJsonObject pr = out["methods"].toObject()[m].toObject()["pressure"].toObject();
            QCOMPARE(mc.value("hasEluent").toBool(), !pts.isEmpty());
            QCOMPARE(mc.value("hasPressure").toBool(), !pr["trace"].toArray().isEmpty());
            QLineSeries phs, bars, limit;
            plan.fillConditionSeries(&phs, m, "ph");
            plan.fillConditionSeries(&bars, m, "pressure");
            plan.fillConditionSeries(&limit, m, "limit");
            QCOMPARE(phs.count(), int(pts.size()));
            for (int i = 0; i < pts.size(); ++i) {
                QCOMPARE(phs.at(i).x(), pts[i].toObject()["t_min"].toDouble());
                QCOMPARE(phs.at(i).y(), pts[i].toObject()["ph_s_s"].toDouble());
            }
            const QJsonArray trace = pr["trace"].toArray();
            QCOMPARE(bars.count(), int(trace.size()));
            for (int i = 0; i < trace.size(); ++i)
                QCOMPARE(bars.at(i).y(), trace[i].toObject()["pressure_bar"].toDouble());
            if (!trace.isEmpty()) {
                QCOMPARE(mc.value("maxBar").toDouble(), pr["max_pressure_bar"].toDouble());
                QCOMPARE(mc.value("maxAtMin").toDouble(), pr["max_at_t_min"].toDouble());
                QCOMPARE(mc.value("limitBar").toDouble(), pr["limit_bar"].toDouble());
                QCOMPARE(mc.value("limitedBy").toString(), pr["limited_by"].toString());
                QCOMPARE(limit.count(), pr["limit_bar"].toDouble() > 0 ? 2 : 0);
            }
        }
    }

    void every_detector_type_can_be_picked() {
        // The picker offers each type the `sequence` contract accepts (README, "detector"), and
        // the wavelength applies to the UV readers only: a plan saved with "pda" shows PDA picked
        // and its wavelength (it once offered five types and hid the wavelength for pda).
        DemoPlan demo(fresh_db());
        Plan& plan = demo.plan;
        QStringList ids;
        for (const QVariant& v : Plan::detectorTypes())
            ids << v.toMap().value("id").toString();
        QCOMPARE(ids, QStringList({"uv", "dad", "pda", "uv-ms", "ms", "elsd", "cad", "fluorescence",
                                   "ri"}));
        for (const QString& id : ids) {
            plan.setDetectorType(id);
            plan.setDetectorWavelengthNm(254);
            plan.recomputeNow();
            QVERIFY2(plan.valid(), qPrintable(id + ": " + plan.errorMessage()));
            const bool uv = id == "uv" || id == "dad" || id == "pda" || id == "uv-ms";
            QCOMPARE(plan.detectorReadsUv(), uv);
        }
    }

    void curves_agree_with_the_recipe() {
        auto ws = open_workspace(fresh_db());
        BufferDesigner d;
        d.setWorkspace(ws.get());
        d.setSystem("acetate");
        d.setAcid("acetic-acid");
        d.setBase("sodium-acetate-trihydrate");
        d.setConcentrationMmolPerL(20);
        d.setTargetPh(4.8);
        QVERIFY2(d.valid(), qPrintable(d.errorMessage()));
        const QList<QPointF>& ph = d.phCurve();
        QVERIFY(ph.size() > 20);
        for (int i = 1; i < ph.size(); ++i)
            QVERIFY2(ph[i].y() > ph[i - 1].y(), "pH rises with the base fraction");
        // The recipe's own point lies on its curve, and β at its pH matches the recipe's β.
        QVERIFY(std::abs(interpolate(ph, d.recipePoint().x()) - d.predictedPh()) < 0.02);
        const double beta = interpolate(d.betaCurve(), d.predictedPh());
        QVERIFY2(std::abs(beta - d.bufferCapacityMmolPerL()) < 0.05 * d.bufferCapacityMmolPerL(),
                 qPrintable(QStringLiteral("%1 vs %2").arg(beta).arg(d.bufferCapacityMmolPerL())));
        QVERIFY(d.lastRecomputeMs() > 0);

        d.setRoute("titrate");
        d.setWeigh("acetic-acid");
        d.setTitrant("sodium-hydroxide");
        d.setTitrantMolPerL(1.0);
        QVERIFY2(d.valid(), qPrintable(d.errorMessage()));
        QVERIFY(d.curveXLabel().contains("mL"));
        const QList<QPointF>& t = d.phCurve();
        for (int i = 1; i < t.size(); ++i)
            QVERIFY(t[i].y() > t[i - 1].y());
        QVERIFY(std::abs(interpolate(t, d.recipePoint().x()) - d.predictedPh()) < 0.02);
    }

    void designer_edits_the_line_buffer() {
        // The demo's line A holds its buffer by reference: the designer opens that saved buffer,
        // and the line follows every edit.
        DemoPlan demo(fresh_db());
        auto& ws = demo.ws;
        Plan& plan = demo.plan;
        LinesModel lines;
        lines.setPlan(&plan);
        BufferDesigner d;
        d.setWorkspace(ws.get());
        d.setPlan(&plan);
        const QString ref = plan.lineBufferRef("A");
        QVERIFY(!ref.isEmpty());
        QVERIFY(d.openBuffer(ref));
        QCOMPARE(d.usedByLines(), QStringList{"A"});
        QCOMPARE(d.targetPh(), plan.lineBuffer("A").value("target_ph").toDouble());
        const QVariantList before =
            lines.data(lines.index(0), LinesModel::BufferItemsRole).toList();
        d.setTargetPh(d.targetPh() + 0.3);
        QCOMPARE(plan.lineBuffer("A").value("target_ph").toDouble(), d.targetPh());
        lines.recomputeNow();
        const QVariantList after = lines.data(lines.index(0), LinesModel::BufferItemsRole).toList();
        QVERIFY(!before.isEmpty());
        QVERIFY2(before != after, "the line's buffer amounts follow the designer");
        // Renamed, the line holds the new name; deleted, the line keeps its own copy.
        QCOMPARE(d.renameBuffer("Line A buffer, night shift"), QString());
        QCOMPARE(plan.lineBufferRef("A"), QString("Line A buffer, night shift"));
        QVERIFY(!d.autoName());
        QCOMPARE(d.deleteBuffer(), QString());
        QCOMPARE(plan.lineBufferRef("A"), QString());
        QCOMPARE(plan.lineBuffer("A").value("target_ph").toDouble(), 2.8);
    }

    void methods_rows_and_time_edit_like_at_the_bench() {
        DemoPlan demo(fresh_db());
        Plan& plan = demo.plan;
        GradientModel g;
        g.setPlan(&plan);
        // A new method, renamed; the rows that run a method follow its new name.
        const QString made = plan.addMethod();
        QCOMPARE(plan.renameMethod(made, "gradient 5-95"), QString());
        QVERIFY(plan.renameMethod("gradient 5-95", "assay").contains("taken"));
        QCOMPARE(plan.renameMethod("assay", "assay v2"), QString());
        for (const QJsonValue& r : plan.rows())
            QVERIFY(r.toObject().value("method").toString() != "assay");
        QVERIFY(plan.removeMethod("assay v2").contains("sequence row"));
        QCOMPARE(plan.removeMethod("gradient 5-95"), QString());
        // Two lines in use: typing one percentage fills the other.
        g.setMethodName("assay v2");
        g.setPercent(0, "A", 95);
        QCOMPARE(g.percentAt(0, "B"), 5.0);
        // An invalid row: the plan keeps its last valid result, greyed (stale), and names the row.
        plan.recomputeNow();
        QVERIFY(plan.valid());
        const QString end = plan.endText();
        g.setTime(1, -3);
        plan.recomputeNow();
        QVERIFY(!plan.valid());
        QVERIFY(plan.stale());
        QCOMPARE(plan.endText(), end);
        QVERIFY2(plan.errorPlace().startsWith("Method “assay v2”, gradient row 2"),
                 qPrintable(plan.errorPlace()));
        QCOMPARE(g.errorRow(), 1);
        g.setTime(1, 9);
        plan.recomputeNow();
        QVERIFY(plan.valid() && !plan.stale());
        // Removing a row can be undone, in place.
        const int rows = g.rowCount();
        const double t2 = g.data(g.index(2), GradientModel::TimeRole).toDouble();
        g.removeRow(2);
        QCOMPARE(g.rowCount(), rows - 1);
        QVERIFY(g.undoText().contains("row 3"));
        g.undoRemove();
        QCOMPARE(g.rowCount(), rows);
        QCOMPARE(g.data(g.index(2), GradientModel::TimeRole).toDouble(), t2);
        SequenceRowsModel seq;
        seq.setPlan(&plan);
        const QJsonArray before = plan.rows();
        seq.removeRow(0);
        QVERIFY(seq.undoText().contains("SST"));
        seq.undoRemove();
        QCOMPARE(plan.rows(), before);
        // The start is picked, and the standby moves with it: until 07:30 after the last injection.
        plan.setStartAt(2026, 12, 2, 21, 15);
        plan.recomputeNow();
        QCOMPARE(plan.startText(), QString("today 21:15"));
        QCOMPARE(plan.endText(), QString("tomorrow 06:45"));
        QCOMPARE(plan.standbyText(), QString("until tomorrow 07:30 (45 min)"));
        plan.setStandbyEnabled(false);
        plan.recomputeNow();
        QCOMPARE(plan.standbyText(), QString());
        plan.setStandbyEnabled(true);
        QCOMPARE(plan.standbyUntilHour(), 7);
        QCOMPARE(plan.standbyUntilMinute(), 30);
    }

    void buffers_are_made_named_duplicated_and_deleted() {
        DemoPlan demo(fresh_db());
        auto& ws = demo.ws;
        Plan& plan = demo.plan;
        BufferDesigner d;
        d.setWorkspace(ws.get());
        d.setPlan(&plan);
        const QString made = d.newBuffer();
        QVERIFY(d.autoName());
        QCOMPARE(made, d.defaultName());
        QCOMPARE(made, QString("25 mM sodium phosphate pH 7.0"));
        // The name follows the inputs until the buffer is named, once the edit settles (the
        // autosave): until then it stays the name the buffer is stored under.
        d.setTargetPh(6.8);
        QCOMPARE(d.bufferName(), QString("25 mM sodium phosphate pH 7.0"));
        QVERIFY(ws->database()->load(phaseplan::storage::DocumentKind::buffer,
                                     "25 mM sodium phosphate pH 7.0"));
        d.flushAutosave();
        QCOMPARE(d.bufferName(), QString("25 mM sodium phosphate pH 6.8"));
        QVERIFY(ws->database()->load(phaseplan::storage::DocumentKind::buffer,
                                     "25 mM sodium phosphate pH 6.8"));
        QVERIFY(!ws->database()->load(phaseplan::storage::DocumentKind::buffer,
                                      "25 mM sodium phosphate pH 7.0"));
        QCOMPARE(d.renameBuffer("Assay buffer"), QString());
        d.setTargetPh(6.9);
        QCOMPARE(d.bufferName(), QString("Assay buffer"));
        // A name taken by another buffer is refused, with the name in the message.
        QCOMPARE(d.duplicateBuffer("Assay buffer 2"), QString());
        QCOMPARE(d.bufferName(), QString("Assay buffer 2"));
        QVERIFY(d.renameBuffer("Assay buffer").contains("Assay buffer"));
        QCOMPARE(d.bufferName(), QString("Assay buffer 2"));
        // Both are in the list; deleting opens another.
        QStringList names;
        for (const QVariant& v : d.bufferChoices())
            names << v.toMap().value("id").toString();
        QVERIFY(names.contains("Assay buffer") && names.contains("Assay buffer 2"));
        QCOMPARE(d.deleteBuffer(), QString());
        QVERIFY(d.bufferName() != "Assay buffer 2");
        QVERIFY(!ws->database()->load(phaseplan::storage::DocumentKind::buffer, "Assay buffer 2"));
        // A line takes a saved buffer for the fraction its parts leave.
        LinesModel lines;
        lines.setPlan(&plan);
        lines.setPartPercent("C", 0, 60);
        QCOMPARE(lines.remainingPercent("C"), 40.0);
        lines.addBufferPart("C", "Assay buffer");
        QCOMPARE(plan.lineBufferRef("C"), QString("Assay buffer"));
        QCOMPARE(lines.remainingPercent("C"), 0.0);
        QVERIFY(d.openBuffer("Assay buffer"));
        QCOMPARE(d.usedByLines(), QStringList{"C"});
    }

    void plan_levels_balance() {
        DemoPlan demo(fresh_db());
        Plan& plan = demo.plan;
        plan.recomputeNow();
        QVERIFY(plan.valid());
        QSignalSpy none(&plan, &Plan::resultChanged);
        for (const QVariant& b : plan.bottles()) {
            const QVariantMap m = b.toMap();
            const QString l = m.value("letter").toString();
            QLineSeries series;
            plan.fillLevelSeries(&series, l);
            const QList<QPointF> pts = series.points();
            // A point at the start and at the end of every sequence row (the demo runs several
            // rows, so a straight line from start to end means the rows went missing).
            const int rows = int(plan.planResult()->rows.size());
            QVERIFY(rows >= 2);
            QVERIFY2(pts.size() >= rows + 1, qPrintable(QString::number(pts.size())));
            // Bottles only drain; the first point is the bottle less priming, the last the
            // bottle less everything the core says the night needs (floored at empty).
            for (int i = 1; i < pts.size(); ++i)
                QVERIFY(pts[i].y() <= pts[i - 1].y() + 1e-9);
            QCOMPARE(pts.first().y(), m.value("bottle_ml").toDouble() - plan.primeMl(l));
            QVERIFY(std::abs(pts.last().y() -
                             std::max(0.0, m.value("bottle_ml").toDouble() -
                                               m.value("required_ml").toDouble())) < 1e-6);
            QLineSeries dry;
            plan.fillDrySeries(&dry, l);
            QCOMPARE(dry.count(), m.value("runs_dry").toBool() ? 1 : 0);
        }
        QLineSeries waste;
        plan.fillWasteSeries(&waste);
        QVERIFY(std::abs(waste.points().last().y() - plan.wasteMl()) < 1e-6);
        QCOMPARE(none.count(), 0); // reading does not recompute
    }

    // Each part of the plan signals only when it changes, so that views of one part (on a screen
    // shown or not) are not re-evaluated on every edit elsewhere (the signals' contract in plan.h).
    void plan_signals_only_the_parts_that_change() {
        DemoPlan demo(fresh_db());
        Plan& plan = demo.plan;
        plan.recomputeNow();
        QVERIFY(plan.valid());
        QSignalSpy document(&plan, &Plan::documentChanged), result(&plan, &Plan::resultChanged),
            name(&plan, &Plan::nameChanged), start(&plan, &Plan::startChanged),
            standby(&plan, &Plan::standbyChanged), settings(&plan, &Plan::settingsChanged),
            summary(&plan, &Plan::summaryChanged), error(&plan, &Plan::errorChanged),
            bottles(&plan, &Plan::bottlesChanged);
        const auto counts = [&] {
            return QList<qsizetype>{document.count(), result.count(),  name.count(),
                                    start.count(),    standby.count(), settings.count(),
                                    summary.count(),  error.count(),   bottles.count()};
        };
        const auto reset = [&] {
            for (QSignalSpy* s : {&document, &result, &name, &start, &standby, &settings, &summary,
                                  &error, &bottles})
                s->clear();
        };
        // A buffer edit (the line's buffer 0.1 pH up): the document and the result change, the
        // volumes, times, settings and errors do not.
        QString letter;
        for (const QString& l : plan.lineLetters())
            if (letter.isEmpty() && !plan.lineBuffer(l).isEmpty())
                letter = l;
        QVERIFY2(!letter.isEmpty(), "the demo plan has a line with a buffer");
        QJsonObject recipe = plan.lineBuffer(letter);
        recipe.insert("target_ph", recipe.value("target_ph").toDouble() + 0.1);
        const double required_ml = plan.bottleAt(0).value("required_ml").toDouble();
        plan.setLineBuffer(letter, recipe);
        plan.recomputeNow();
        QVERIFY2(plan.valid(), qPrintable(plan.errorMessage()));
        QCOMPARE(plan.bottleAt(0).value("required_ml").toDouble(), required_ml);
        QCOMPARE(counts(), (QList<qsizetype>{1, 1, 0, 0, 0, 0, 0, 0, 0}));
        // The start an hour later: the start and the end move, and so does the clock time of a
        // bottle that runs dry.
        reset();
        const QString end = plan.endTime();
        qsizetype dry = 0;
        for (int i = 0; i < plan.bottleCount(); ++i)
            dry += plan.bottleAt(i).value("dry_at").toString().isEmpty() ? 0 : 1;
        plan.shiftStart(60);
        plan.recomputeNow();
        QVERIFY(plan.endTime() != end);
        QCOMPARE(counts(), (QList<qsizetype>{1, 1, 0, 1, 0, 0, 1, 0, dry > 0 ? 1 : 0}));
        // The detector's wavelength: a setting.
        reset();
        plan.setDetectorWavelengthNm(plan.detectorWavelengthNm() + 10);
        QCOMPARE(settings.count(), 1);
        QCOMPARE(start.count() + standby.count() + name.count(), 0);
        // A bottle that cannot be: the error, and nothing of the last valid plan's summary.
        reset();
        plan.setLineField(letter, "bottle_ml", -100);
        plan.recomputeNow();
        QVERIFY(!plan.valid() && plan.stale());
        QCOMPARE(error.count(), 1);
        QCOMPARE(summary.count(), 0);
        // The name.
        reset();
        plan.setName("Night of the test");
        QCOMPARE(name.count(), 1);
        QCOMPARE(start.count() + standby.count() + settings.count(), 0);
    }

    void errors_land_on_their_row() {
        DemoPlan demo(fresh_db());
        Plan& plan = demo.plan;
        GradientModel g;
        g.setPlan(&plan);
        g.setMethodName("assay");
        QVERIFY(g.rowCount() >= 3);
        g.setTime(2, 1.0); // before row 1: times must ascend
        plan.recomputeNow();
        QVERIFY(!plan.valid());
        QVERIFY2(plan.errorField().startsWith("methods.assay.gradient["),
                 qPrintable(plan.errorField()));
        QVERIFY(g.errorRow() == 1 || g.errorRow() == 2);
        QVERIFY(!g.data(g.index(g.errorRow()), GradientModel::RowErrorRole).toString().isEmpty());
        g.setTime(2, 10.0);
        plan.recomputeNow();
        QVERIFY2(plan.valid(), qPrintable(plan.errorMessage()));
        QCOMPARE(g.errorRow(), -1);

        SequenceRowsModel rows;
        rows.setPlan(&plan);
        rows.setMethod(1, "no-such-method");
        plan.recomputeNow();
        QCOMPARE(plan.errorField(), QString("sequence[1].method"));
        QCOMPARE(rows.data(rows.index(1), SequenceRowsModel::RowErrorFieldRole).toString(),
                 QString("method"));
        QVERIFY(rows.data(rows.index(0), SequenceRowsModel::RowErrorRole).toString().isEmpty());
    }

    void checks_gather_and_clear() {
        DemoPlan demo(fresh_db());
        Plan& plan = demo.plan;
        LinesModel lines;
        lines.setPlan(&plan);
        ChecksModel checks;
        checks.setPlan(&plan);
        checks.setLines(&lines);
        plan.recomputeNow();
        checks.refreshNow();
        // The demo's acetonitrile bottle is too small for the night (the scenario says so).
        auto has_code = [&](const QString& code) -> bool {
            for (int i = 0; i < checks.rowCount(); ++i)
                if (checks.data(checks.index(i), ChecksModel::CodeRole).toString() == code)
                    return !checks.data(checks.index(i), ChecksModel::AdviceRole)
                                .toString()
                                .isEmpty();
            return false;
        };
        QVERIFY(has_code("runs-dry"));
        QVERIFY(checks.warningCount() >= 1);
        // The plan's findings carry their subject typed: the bottle that runs dry is line B's.
        bool typed = false;
        for (const QVariant& v : plan.warnings()) {
            const QVariantMap w = v.toMap();
            if (w.value("code").toString() != QLatin1String("runs-dry"))
                continue;
            const QVariantMap subject = w.value("subject").toMap();
            QCOMPARE(subject.value("kind").toString(), QString("line"));
            QCOMPARE(subject.value("id").toString(), QString("B"));
            typed = true;
        }
        QVERIFY(typed);
        // Worst first.
        QCOMPARE(checks.data(checks.index(0), ChecksModel::SeverityRole).toString(),
                 QString("warning"));
        lines.setBottleMl("B", 1000);
        plan.recomputeNow();
        lines.recomputeNow();
        checks.refreshNow();
        QVERIFY(!has_code("runs-dry"));
    }

    // A salt that comes out in the mixer during a method is fixed at that method's gradient: the
    // focus comes from the finding's typed place, not from its "where" words (which read
    // "in method assay at 10.5 min" and once made the path "methods.in method assay…").
    void checks_focus_from_the_typed_place() {
        auto ws = open_workspace(fresh_db());
        QJsonObject doc = read_json(data_dir + "/demo/overnight-sequence.json");
        QJsonObject lines = doc.value("lines").toObject();
        QJsonObject a = lines.value("A").toObject();
        // 60 mmol/L dipotassium hydrogen phosphate (mostly HPO4²⁻): above its form's limit at
        // 75 % acetonitrile in data/solvents.json's solubility tables (the check's own data;
        // common practice). The more soluble KH2PO4 at 60 mmol/L no longer reaches its own.
        a.insert("additives", QJsonArray{QJsonObject{{"additive", "dipotassium-hydrogen-phosphate"},
                                                     {"mmol_per_l", 60}}});
        lines.insert("A", a);
        doc.insert("lines", lines);
        const phaseplan::SequenceResult out = phaseplan::sequence_result(ws->data(), doc, {});
        bool seen = false;
        for (const phaseplan::SequenceWarning& sw : out.plans.front().warnings) {
            if (!sw.finding)
                continue;
            const chem::Finding& f = *sw.finding;
            if (f.kind != chem::FindingKind::precipitation ||
                f.where.kind != chem::Subject::Kind::method)
                continue;
            QVariantMap w = sw.json.toVariantMap();
            QCOMPARE(w.value("code").toString(), QString("precipitation"));
            w.insert(phaseplan::finding_references(f));
            QCOMPARE(ChecksModel::focusFor("precipitation", w.value("line").toString(), w),
                     QString("methods.%1.gradient[0]").arg(QString::fromStdString(f.where.id)));
            seen = true;
        }
        QVERIFY2(seen, "no precipitation in a method");
    }

    void lines_amounts_fill_the_bottle() {
        DemoPlan demo(fresh_db());
        Plan& plan = demo.plan;
        LinesModel lines;
        lines.setPlan(&plan);
        lines.setBottleMl("B", 1500);
        lines.recomputeNow();
        const QModelIndex b = lines.index(lines.rowOf("B"));
        QCOMPARE(lines.data(b, LinesModel::BottleMlRole).toDouble(), 1500.0);
        double total = 0;
        for (const QVariant& v : lines.data(b, LinesModel::ItemsRole).toList())
            total += v.toMap().value("volume_ml").toDouble();
        QVERIFY(std::abs(total - 1500) < 1e-6); // one solvent at 100 %: the whole bottle
        QVERIFY(lines.data(b, LinesModel::UvCutoffNmRole).toDouble() > 0);
        lines.setPartPercent("B", 0, 250); // not a fraction: the core refuses, naming the part
        lines.recomputeNow();
        QVERIFY2(lines.data(b, LinesModel::ErrorFieldRole).toString().contains("fraction_v"),
                 qPrintable(lines.data(b, LinesModel::ErrorFieldRole).toString()));
        QVERIFY(lines.data(b, LinesModel::ItemsRole).toList().isEmpty());
    }

    // The line cards read the line's typed result; what they show is what the `line` command
    // writes for the same line: each part's volume and mass, the buffer's amounts and the
    // warnings, in order.
    void line_cards_match_the_line_command() {
        DemoPlan demo(fresh_db());
        auto& ws = demo.ws;
        Plan& plan = demo.plan;
        LinesModel lines;
        lines.setPlan(&plan);
        // 60 mmol/L of a phosphate salt in the organic line: the line's own check finds the salt
        // above its solubility, so there is a warning to compare.
        lines.addAdditive("B", "potassium-dihydrogen-phosphate");
        lines.setAdditive("B", 0, "potassium-dihydrogen-phosphate", 60, "mmol_per_l");
        lines.recomputeNow();
        int checked = 0, warned = 0;
        for (const QString letter : {"A", "B", "C", "D"}) {
            const QJsonObject l = plan.line(letter);
            if (l.isEmpty())
                continue;
            QJsonObject input = l;
            input.insert("volume_ml", l.value("bottle_ml"));
            const QJsonObject direct = phaseplan::command_line(ws->data(), input, {});
            const QModelIndex i = lines.index(lines.rowOf(letter));
            const QVariantList items = lines.data(i, LinesModel::ItemsRole).toList();
            const QJsonArray want = direct.value("items").toArray();
            QCOMPARE(items.size(), want.size());
            for (int k = 0; k < want.size(); ++k) {
                const QVariantMap got = items[k].toMap();
                const QJsonObject w = want[k].toObject();
                QCOMPARE(got.value("part").toString(), w.value("part").toString());
                QCOMPARE(got.contains("volume_ml"), w.value("volume_ml").isDouble());
                QCOMPARE(got.contains("mass_g"), w.value("mass_g").isDouble());
                QCOMPARE(got.value("volume_ml").toDouble(), w.value("volume_ml").toDouble());
                QCOMPARE(got.value("mass_g").toDouble(), w.value("mass_g").toDouble());
                QCOMPARE(got.contains("volume_text"), w.value("volume_ml").isDouble());
            }
            const QVariantList buffer = lines.data(i, LinesModel::BufferItemsRole).toList();
            QCOMPARE(buffer.size(),
                     direct.value("buffer").toObject().value("items").toArray().size());
            for (const QVariant& b : buffer)
                QVERIFY2(!b.toMap().value("amount").toString().isEmpty(),
                         qPrintable(b.toMap().value("name").toString()));
            const QVariantList warnings = lines.data(i, LinesModel::WarningsRole).toList();
            const QJsonArray want_w = direct.value("warnings").toArray();
            QCOMPARE(warnings.size(), want_w.size());
            for (int k = 0; k < want_w.size(); ++k)
                QCOMPARE(warnings[k].toMap().value("message").toString(),
                         want_w[k].toObject().value("message").toString());
            QCOMPARE(lines.data(i, LinesModel::UvCutoffNmRole).toDouble(),
                     direct.value("uv_cutoff_nm").toDouble());
            ++checked;
            warned += int(!warnings.isEmpty());
        }
        QVERIFY2(checked >= 2, "the demo plan has at least two lines");
        QVERIFY2(warned >= 1, "the salted organic line has a warning");
    }

    void library_search_and_lab_entries() {
        const QString db = fresh_db();
        auto ws = open_workspace(db);
        LibraryModel lib;
        lib.setWorkspace(ws.get());
        const int all = lib.count();
        lib.setKind("solvents");
        QCOMPARE(lib.count(),
                 int(read_json(data_dir + "/solvents.json").value("solvents").toArray().size()));
        lib.setKind("all");
        lib.setSearch("phosphate sodium");
        QVERIFY(lib.count() > 0 && lib.count() < all);
        for (int i = 0; i < lib.count(); ++i) {
            const QString hay = (lib.data(lib.index(i), LibraryModel::NameRole).toString() + ' ' +
                                 lib.data(lib.index(i), LibraryModel::IdRole).toString())
                                    .toLower();
            QVERIFY(hay.contains("phosphate") && hay.contains("sodium"));
        }

        ReagentEditor e;
        e.setWorkspace(ws.get());
        QVERIFY(!e.showErrors());
        e.setReagentId("lab-sodium-acetate-99");
        e.setName("Sodium acetate, our 99 % lot");
        e.setFormula("CH3COONa");
        e.setAssayPercent(99);
        e.setSpectatorIon("Na+");
        e.setSpectatorCharge(1);
        e.setSpectatorCount(1);
        e.setSystem("acetate");
        e.setSystemCount(1);
        e.setProtonsRemoved(1);
        QCOMPARE(e.errorField(), QString("source")); // everything else is fine
        // Molar mass from the formula by the core: C2H3NaO2 = 82.034 g/mol (IUPAC 2021 weights;
        // CRC Handbook lists 82.03 for sodium acetate, from memory).
        QVERIFY(std::abs(e.molarMassGPerMol() - 82.034) < 0.005);
        e.setFormula("CH3COOXx");
        QCOMPARE(e.errorField(), QString("formula"));
        e.setFormula("CH3COONa");
        e.setSpectatorCount(2); // two Na+ on one acetate: not electroneutral
        e.setSource("certificate of analysis, lot 7781");
        QVERIFY(!e.valid());
        e.setSpectatorCount(1);
        QVERIFY2(e.valid(), qPrintable(e.errorField() + ": " + e.errorMessage()));
        QCOMPARE(e.save(), QString());
        const chem::Reagent* r = ws->data().reagents.find_reagent("lab-sodium-acetate-99");
        QVERIFY(r && r->user_defined);
        QVERIFY(std::abs(r->assay_fraction - 0.99) < 1e-12);

        // A lab correction of a shipped entry wins, also after a reopen.
        QVERIFY(e.edit("sodium-acetate"));
        QVERIFY(e.editingShipped());
        e.setAssayPercent(98.5);
        e.setSource("our lot's certificate");
        QCOMPARE(e.save(), QString());
        ws.reset();
        auto again = open_workspace(db);
        QVERIFY(again->data().reagents.find_reagent("lab-sodium-acetate-99"));
        QVERIFY(std::abs(again->data().reagents.reagent("sodium-acetate").assay_fraction - 0.985) <
                1e-12);
        // The recipe uses the lab's entry.
        BufferDesigner d;
        d.setWorkspace(again.get());
        d.setSystem("acetate");
        d.setAcid("acetic-acid");
        d.setBase("lab-sodium-acetate-99");
        d.setTargetPh(4.7);
        QVERIFY2(d.valid(), qPrintable(d.errorMessage()));
    }

    void shipped_update_keeps_lab_edits() {
        // A copy of data/ whose reagents.json is then "updated" (a shipped name changes).
        QTemporaryDir data;
        QDir().mkpath(data.filePath("demo"));
        for (const QString f : {"reagents.json", "solvents.json", "demo/overnight-sequence.json"})
            QVERIFY(QFile::copy(data_dir + "/" + f, data.filePath(f)));
        const QString db = fresh_db();
        {
            auto ws = open_workspace(db, data.path());
            ReagentEditor e;
            e.setWorkspace(ws.get());
            QVERIFY(e.edit("sodium-acetate"));
            e.setName("Sodium acetate (lab bottle 3)");
            e.setSource("label of bottle 3");
            QCOMPARE(e.save(), QString());
        }
        QJsonObject r = read_json(data.filePath("reagents.json"));
        QJsonArray list = r.value("reagents").toArray();
        for (int i = 0; i < list.size(); ++i) {
            QJsonObject o = list[i].toObject();
            if (o.value("id") == "sodium-acetate")
                o.insert("name", "Sodium acetate, anhydrous (renamed upstream)");
            if (o.value("id") == "acetic-acid")
                o.insert("name", "Acetic acid, glacial (renamed upstream)");
            list[i] = o;
        }
        r.insert("reagents", list);
        QFile f(data.filePath("reagents.json"));
        QVERIFY(f.open(QIODevice::WriteOnly | QIODevice::Truncate));
        f.write(QJsonDocument(r).toJson());
        f.close();
        auto ws = open_workspace(db, data.path());
        QCOMPARE(QString::fromStdString(ws->data().reagents.reagent("sodium-acetate").name),
                 QString("Sodium acetate (lab bottle 3)"));
        QCOMPARE(QString::fromStdString(ws->data().reagents.reagent("acetic-acid").name),
                 QString("Acetic acid, glacial (renamed upstream)"));
    }

    void saved_work_and_autosave_survive_reopen() {
        const QString db = fresh_db();
        QJsonObject edited_plan;
        {
            DemoPlan demo(db);
            auto& ws = demo.ws;
            Plan& plan = demo.plan;
            LinesModel lines;
            lines.setPlan(&plan);
            lines.setBottleMl("B", 750);
            plan.setStart("2026-12-03T19:15:00");
            edited_plan = plan.json();
            QCOMPARE(plan.saveAs("Thursday night"), QString());
            SavedWorkModel saved;
            saved.setWorkspace(ws.get());
            saved.setKind("sequence");
            QCOMPARE(saved.count(), 2); // the demo and Thursday
            saved.setSearch("thursday");
            QCOMPARE(saved.count(), 1);
            QCOMPARE(QJsonObject::fromVariantMap(saved.load("sequence", "Thursday night")),
                     edited_plan);

            BufferDesigner d;
            d.setWorkspace(ws.get());
            d.setAutosaveKey("current_buffer");
            d.newBuffer();
            QCOMPARE(d.renameBuffer("Thursday buffer"), QString());
            d.setTargetPh(5.55);
            plan.setStart("2026-12-03T19:30:00"); // an edit after the save: autosaved, not saved
            edited_plan = plan.json();
        } // destructors flush the autosaves, as closing the app does
        DemoPlan demo(db);
        auto& ws = demo.ws;
        Plan& plan = demo.plan;
        QCOMPARE(plan.json(), edited_plan);
        QCOMPARE(plan.name(), QString("Thursday night"));
        BufferDesigner d;
        d.setWorkspace(ws.get());
        d.setAutosaveKey("current_buffer");
        QCOMPARE(d.bufferName(), QString("Thursday buffer"));
        QCOMPARE(d.targetPh(), 5.55);
        SavedWorkModel saved;
        saved.setWorkspace(ws.get());
        QVERIFY(saved.remove("sequence", "Thursday night"));
        saved.setKind("sequence");
        QCOMPARE(saved.count(), 1);
    }
};

QTEST_MAIN(TestGuiModels)
#include "tst_gui_models.moc"
