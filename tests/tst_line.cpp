// The `line` subcommand: parts measured separately and by mass, against handbook densities,
// viscosities and UV cutoffs written independently of data/solvents.json; the mixing contraction
// against a published mixture-density table; additive UV cutoffs and pH; the per-line checks;
// malformed documents rejected with the field named.
#include "chem/line.h"
#include "core/line_commands.h"
#include "test_support.h"

#include <QJsonArray>
#include <QJsonDocument>
#include <QRegularExpression>
#include <QTemporaryDir>
#include <QtTest>

#include <cmath>

using phaseplan::testing::run_cli;
using phaseplan::testing::shipped_data;

namespace {

QJsonObject run_line(const QJsonObject& doc) {
    return phaseplan::command_line(shipped_data(), doc, {});
}

QJsonObject parse(const char* json) {
    return QJsonDocument::fromJson(QByteArray(json)).object();
}

QJsonObject single_solvent(const QString& id, double volume_ml) {
    return QJsonObject{{"volume_ml", volume_ml},
                       {"parts", QJsonArray{QJsonObject{{"solvent", id}, {"fraction_v", 1.0}}}}};
}

QJsonObject item(const QJsonObject& out, const QString& part) {
    for (const auto& v : out["items"].toArray())
        if (v.toObject()["part"].toString() == part)
            return v.toObject();
    return {};
}

QStringList codes(const QJsonObject& out, const QString& severity = {}) {
    QStringList c;
    for (const auto& w : out["warnings"].toArray())
        if (severity.isEmpty() || w.toObject()["severity"].toString() == severity)
            c << w.toObject()["code"].toString();
    return c;
}

const char* phosphate_ph25_buffer =
    R"({"target_ph": 2.5, "route": "mix", "acid": "phosphoric-acid",
        "base": "sodium-dihydrogen-phosphate-monohydrate", "concentration_mol_per_l": 0.02})";

QJsonObject buffer_line(const QJsonObject& buffer, double buffer_fraction, const QString& organic,
                        double volume_ml) {
    QJsonArray parts{QJsonObject{{"buffer", buffer}, {"fraction_v", buffer_fraction}}};
    if (buffer_fraction < 1)
        parts.append(QJsonObject{{"solvent", organic}, {"fraction_v", 1 - buffer_fraction}});
    return QJsonObject{{"name", "test line"}, {"volume_ml", volume_ml}, {"parts", parts}};
}

QJsonObject potassium_phosphate_ph7(double mol_per_l) {
    return QJsonObject{{"target_ph", 7.0},
                       {"route", "mix"},
                       {"acid", "potassium-dihydrogen-phosphate"},
                       {"base", "dipotassium-hydrogen-phosphate"},
                       {"concentration_mol_per_l", mol_per_l}};
}

} // namespace

class TestLine : public QObject {
    Q_OBJECT
  private slots:
    void handbookSolvents_data();
    void handbookSolvents();
    void gravimetricMassesOfAMixedLine();
    void bufferPartMassLiesBetweenWaterAndWaterPlusSolids();
    void methanolWaterContraction_data();
    void methanolWaterContraction();
    void acetonitrileContractsLessThanMethanol();
    void additiveUvCutoffs_data();
    void additiveUvCutoffs();
    void lineCutoffIsTheHighestPart();
    void phOfAqueousAdditives_data();
    void phOfAqueousAdditives();
    void bufferLineMeasuresPhBeforeOrganic();
    void immiscibleParts();
    void precipitationInTheBottle();
    void msAndColumnChecks();
    void cautionsDeferToSdsAndLocalRules();
    void densitiesAtTheLineTemperature();
    void hydroxideHasAUvFigure();
    void triethylamineMsBackground();
    void badInputIsRejected_data();
    void badInputIsRejected();
};

void TestLine::handbookSolvents_data() {
    QTest::addColumn<QString>("solvent");
    QTest::addColumn<double>("density_20c");
    QTest::addColumn<double>("viscosity_25c");
    QTest::addColumn<double>("uv_cutoff_nm");
    const QJsonObject doc =
        phaseplan::testing::read_json(TESTS_DATA_DIR "/line_handbook_solvents.json");
    for (const auto& v : doc["rows"].toArray()) {
        const QJsonObject r = v.toObject();
        QTest::newRow(r["solvent"].toString().toUtf8().constData())
            << r["solvent"].toString() << r["density_20c"].toDouble()
            << r["viscosity_25c"].toDouble() << r["uv_cutoff_nm"].toDouble();
    }
}

void TestLine::handbookSolvents() {
    // Sources and tolerances: tests/data/line_handbook_solvents.json ("about").
    QFETCH(QString, solvent);
    QFETCH(double, density_20c);
    QFETCH(double, viscosity_25c);
    QFETCH(double, uv_cutoff_nm);
    const QJsonObject out = run_line(single_solvent(solvent, 1000));
    const QJsonObject it = item(out, solvent);
    QCOMPARE(it["volume_ml"].toDouble(), 1000.0);
    // The handbook column is at 20 °C: the line must state the temperature its mass refers to.
    QCOMPARE(it["density_temperature_c"].toDouble(), 20.0);
    const double mass = it["mass_g"].toDouble();
    QVERIFY2(
        std::fabs(mass / 1000.0 - density_20c) <= 0.003 * density_20c,
        qPrintable(QString("%1 g for 1000 mL vs handbook %2 g/mL").arg(mass).arg(density_20c)));
    const double cutoff = out["uv_cutoff_nm"].toDouble();
    QVERIFY2(std::fabs(cutoff - uv_cutoff_nm) <= 5.0,
             qPrintable(QString("cutoff %1 nm vs %2 nm").arg(cutoff).arg(uv_cutoff_nm)));
    const QJsonObject props = out["solvents"].toArray().at(0).toObject();
    QCOMPARE(props["viscosity_temperature_c"].toDouble(), 25.0);
    const double eta = props["viscosity_mpa_s"].toDouble();
    QVERIFY2(std::fabs(eta - viscosity_25c) <= 0.10 * viscosity_25c,
             qPrintable(QString("viscosity %1 vs %2 mPa s").arg(eta).arg(viscosity_25c)));
    // Every number carries a source.
    for (const char* k :
         {"density", "viscosity", "uv_cutoff", "boiling_point", "flash_point", "ghs"})
        QVERIFY2(!props["sources"].toObject()[k].toString().isEmpty(), k);
}

void TestLine::gravimetricMassesOfAMixedLine() {
    // 2000 mL of acetonitrile–water 60:40 measured separately: 1200 mL acetonitrile and 800 mL
    // water. By mass, with handbook densities at 20 °C (acetonitrile 0.7857 g/mL, Merck Index;
    // water 0.998207 g/mL, Tanaka et al., Metrologia 38 (2001) 301; from memory):
    //   1200 × 0.7857 = 942.84 g,   800 × 0.998207 = 798.57 g.
    const QJsonObject out = run_line(parse(R"({"volume_ml": 2000, "parts": [
        {"solvent": "acetonitrile", "fraction_v": 0.6}, {"solvent": "water", "fraction_v": 0.4}]})"));
    QCOMPARE(item(out, "acetonitrile")["volume_ml"].toDouble(), 1200.0);
    QCOMPARE(item(out, "water")["volume_ml"].toDouble(), 800.0);
    QVERIFY(std::fabs(item(out, "acetonitrile")["mass_g"].toDouble() - 942.84) < 0.003 * 942.84);
    QVERIFY(std::fabs(item(out, "water")["mass_g"].toDouble() - 798.57) < 0.0005 * 798.57);
    // The parts are measured separately, and the note says why not to make up to volume.
    QVERIFY(out["steps"].toArray().at(0).toString().contains("separately"));
}

void TestLine::bufferPartMassLiesBetweenWaterAndWaterPlusSolids() {
    // 900 mL of a 20 mM phosphate buffer: its mass is at least that of 900 mL of water at 20 °C
    // (0.998207 g/mL, Tanaka 2001, from memory: 898.39 g) and at most that plus every gram of
    // reagent weighed in for 900 mL (the dissolved solids displace some water).
    QJsonObject doc = buffer_line(parse(phosphate_ph25_buffer), 0.9, "acetonitrile", 1000);
    const QJsonObject out = run_line(doc);
    const double mass = item(out, "buffer")["mass_g"].toDouble();
    double solids_g = 0;
    for (const auto& v : out["buffer"].toObject()["items"].toArray())
        solids_g += v.toObject()["mass_g"].toDouble();
    QVERIFY(solids_g > 0);
    QCOMPARE(out["buffer"].toObject()["volume_ml"].toDouble(), 900.0);
    QVERIFY2(mass >= 898.39 - 0.05 && mass <= 898.39 + solids_g + 0.05,
             qPrintable(QString("buffer part %1 g, solids %2 g").arg(mass).arg(solids_g)));
}

void TestLine::methanolWaterContraction_data() {
    // Density at 20 °C of methanol–water by mass per cent: CRC Handbook of Chemistry and Physics,
    // "Concentrative properties of aqueous solutions: methanol" (from memory). Independent of the
    // excess-volume curve in data/solvents.json (Benson & Kiyohara 1980).
    QTest::addColumn<double>("wt_percent");
    QTest::addColumn<double>("density_mix");
    QTest::newRow("20 wt%") << 20.0 << 0.9666;
    QTest::newRow("40 wt%") << 40.0 << 0.9345;
    QTest::newRow("60 wt%") << 60.0 << 0.8946;
    QTest::newRow("80 wt%") << 80.0 << 0.8469;
}

void TestLine::methanolWaterContraction() {
    // For 100 g of mixture: methanol w/0.7914 mL and water (100−w)/0.99821 mL measured
    // separately (20 °C); the handbook mixture occupies 100/ρ mL. The contraction the line
    // predicts must match ideal − actual within 0.5 mL per 100 g (the two-term Redlich–Kister
    // curve is flatter than the data at the water-rich end, where the error is largest, and the
    // excess volumes are at 25 °C against densities at 20 °C).
    QFETCH(double, wt_percent);
    QFETCH(double, density_mix);
    const double v_meoh = wt_percent / 0.7914;
    const double v_water = (100 - wt_percent) / 0.99821;
    const double v_total = v_meoh + v_water;
    const double expected = v_total - 100.0 / density_mix;
    QJsonObject doc{
        {"volume_ml", v_total},
        {"parts",
         QJsonArray{QJsonObject{{"solvent", "methanol"}, {"fraction_v", v_meoh / v_total}},
                    QJsonObject{{"solvent", "water"}, {"fraction_v", v_water / v_total}}}}};
    const QJsonObject out = run_line(doc);
    const double got = out["contraction_ml"].toDouble();
    QVERIFY2(expected > 1.5, "the handbook table implies a contraction");
    QVERIFY2(std::fabs(got - expected) <= 0.5,
             qPrintable(QString("contraction %1 mL vs handbook %2 mL").arg(got).arg(expected)));
    QCOMPARE(out["mixed_volume_ml"].toDouble(), v_total - got);
    QVERIFY(!out["contraction_sources"].toArray().isEmpty());
}

void TestLine::acetonitrileContractsLessThanMethanol() {
    // Published excess molar volumes at 25 °C: water–methanol has its minimum near −1.0 cm³/mol,
    // water–acetonitrile near −0.5 cm³/mol (from memory): mixing 500 + 500 mL contracts, and
    // less with acetonitrile.
    auto contraction = [](const char* organic) {
        QJsonObject doc{
            {"volume_ml", 1000},
            {"parts", QJsonArray{QJsonObject{{"solvent", organic}, {"fraction_v", 0.5}},
                                 QJsonObject{{"solvent", "water"}, {"fraction_v", 0.5}}}}};
        return run_line(doc)["contraction_ml"].toDouble();
    };
    const double meoh = contraction("methanol");
    const double mecn = contraction("acetonitrile");
    QVERIFY2(mecn > 0 && mecn < meoh,
             qPrintable(QString("MeCN %1 mL, MeOH %2 mL").arg(mecn).arg(meoh)));
    // No contraction is claimed for a single solvent.
    QCOMPARE(run_line(single_solvent("methanol", 1000))["contraction_ml"].toDouble(), 0.0);
}

void TestLine::additiveUvCutoffs_data() {
    // UV cutoffs of common mobile-phase additives in water (1 cm, A ≈ 1), from the buffer tables of
    // Dolan's LCGC columns and Sadek, The HPLC Solvent Guide (Wiley 2002); from memory, ±5 nm.
    QTest::addColumn<QString>("additive");
    QTest::addColumn<QString>("unit");
    QTest::addColumn<double>("amount");
    QTest::addColumn<double>("cutoff_nm");
    QTest::newRow("TFA 0.1 %") << "trifluoroacetic-acid"
                               << "percent_v" << 0.1 << 210.0;
    QTest::newRow("formic acid 0.1 %") << "formic-acid"
                                       << "percent_v" << 0.1 << 210.0;
    QTest::newRow("acetic acid 1 %") << "acetic-acid"
                                     << "percent_v" << 1.0 << 230.0;
    QTest::newRow("phosphoric acid 0.1 %") << "phosphoric-acid"
                                           << "percent_v" << 0.1 << 200.0;
    QTest::newRow("ammonium acetate 10 mM") << "ammonium-acetate"
                                            << "mmol_per_l" << 10.0 << 210.0;
    QTest::newRow("ammonium formate 10 mM") << "ammonium-formate"
                                            << "mmol_per_l" << 10.0 << 210.0;
    QTest::newRow("ammonium bicarbonate 10 mM") << "ammonium-bicarbonate"
                                                << "mmol_per_l" << 10.0 << 200.0;
    QTest::newRow("triethylamine 0.1 %") << "triethylamine"
                                         << "percent_v" << 0.1 << 235.0;
}

void TestLine::additiveUvCutoffs() {
    QFETCH(QString, additive);
    QFETCH(QString, unit);
    QFETCH(double, amount);
    QFETCH(double, cutoff_nm);
    QJsonObject doc = single_solvent("water", 1000);
    doc["additives"] = QJsonArray{QJsonObject{{"additive", additive}, {unit, amount}}};
    const QJsonObject out = run_line(doc);
    QVERIFY2(
        std::fabs(out["uv_cutoff_nm"].toDouble() - cutoff_nm) <= 5.0,
        qPrintable(QString("%1 nm vs %2 nm").arg(out["uv_cutoff_nm"].toDouble()).arg(cutoff_nm)));
    QCOMPARE(out["uv_limited_by"].toString(), additive);
    // One item per part and per additive, each named.
    QCOMPARE(out["items"].toArray().size(), 2);
    QVERIFY(item(out, additive)["mass_g"].toDouble() > 0);
}

void TestLine::lineCutoffIsTheHighestPart() {
    // Acetonitrile 190 nm with 0.1 % TFA (210 nm): the TFA sets the line's cutoff. Acetone (330 nm,
    // Burdick & Jackson, from memory) at 10 % in water: absorbance adds by parts, so the line
    // reaches absorbance 1 where 0.1 · A_acetone = 1, one decade (10 nm) above acetone's cutoff
    // falls to 320 nm (the decade-per-10-nm shape is a rule, common practice, no source).
    const QJsonObject a = run_line(
        parse(R"({"volume_ml": 1000, "parts": [{"solvent": "acetonitrile", "fraction_v": 1}],
        "additives": [{"additive": "trifluoroacetic-acid", "percent_v": 0.1}]})"));
    QVERIFY(std::fabs(a["uv_cutoff_nm"].toDouble() - 210) <= 5);
    const QJsonObject b =
        run_line(parse(R"({"volume_ml": 1000, "parts": [{"solvent": "water", "fraction_v": 0.9},
        {"solvent": "acetone", "fraction_v": 0.1}]})"));
    QVERIFY(std::fabs(b["uv_cutoff_nm"].toDouble() - 320) <= 0.01);
    QCOMPARE(b["uv_limited_by"].toString(), QString("acetone"));
    // Two weak absorbers add: 5 % tetrahydrofuran (212 nm) and 5 % acetone (330 nm) in water give
    // 10·log10(0.05·10^21.2 + 0.05·10^33 + 0.9·10^19) = 317 nm, and 5 % THF alone 200 nm.
    const QJsonObject thf = run_line(parse(
        R"({"volume_ml": 1000, "parts": [{"solvent": "water", "fraction_v": 0.95},
        {"solvent": "tetrahydrofuran", "fraction_v": 0.05}]})"));
    QVERIFY2(std::fabs(thf["uv_cutoff_nm"].toDouble() - 199.5) <= 0.1,
             qPrintable(QString::number(thf["uv_cutoff_nm"].toDouble())));
    // The detector check: 254 nm is below the line's cutoff (warning), 325 nm is within 10 nm of
    // it (caution), 400 nm is clear.
    auto with_detector = [&](double nm) {
        QJsonObject d =
            parse(R"({"volume_ml": 1000, "parts": [{"solvent": "water", "fraction_v": 0.9},
            {"solvent": "acetone", "fraction_v": 0.1}]})");
        d["detector"] = QJsonObject{{"type", "uv"}, {"wavelength_nm", nm}};
        return run_line(d);
    };
    QCOMPARE(codes(with_detector(254), "warning"), QStringList{"uv-cutoff"});
    QCOMPARE(codes(with_detector(325), "caution"), QStringList{"uv-cutoff"});
    QVERIFY(!codes(with_detector(400)).contains("uv-cutoff"));
}

void TestLine::phOfAqueousAdditives_data() {
    QTest::addColumn<QString>("additive");
    QTest::addColumn<QString>("unit");
    QTest::addColumn<double>("amount");
    QTest::addColumn<double>("ph");
    QTest::addColumn<double>("tolerance");
    // "0.1 % formic acid in water is about pH 2.7" (common practice, no source).
    QTest::newRow("formic acid 0.1 %") << "formic-acid"
                                       << "percent_v" << 0.1 << 2.7 << 0.1;
    // "0.1 % TFA is about pH 2" (common practice, no source).
    QTest::newRow("TFA 0.1 %") << "trifluoroacetic-acid"
                               << "percent_v" << 0.1 << 2.0 << 0.15;
    // Ammonium acetate: pH ≈ (pKa(acetic acid) 4.756 + pKa(NH4+) 9.245)/2 = 7.00 (pKa values:
    // Harned & Ehlers 1933; Bates & Pinching 1949; from memory).
    QTest::newRow("ammonium acetate 10 mM") << "ammonium-acetate"
                                            << "mmol_per_l" << 10.0 << 7.0 << 0.05;
}

void TestLine::phOfAqueousAdditives() {
    QFETCH(QString, additive);
    QFETCH(QString, unit);
    QFETCH(double, amount);
    QFETCH(double, ph);
    QFETCH(double, tolerance);
    QJsonObject doc = single_solvent("water", 1000);
    doc["additives"] = QJsonArray{QJsonObject{{"additive", additive}, {unit, amount}}};
    const QJsonObject out = run_line(doc);
    QVERIFY(out["ph"].isDouble());
    QVERIFY2(std::fabs(out["ph"].toDouble() - ph) <= tolerance,
             qPrintable(QString("pH %1").arg(out["ph"].toDouble())));
    // With organic in the line there is no aqueous pH to state.
    doc["parts"] = QJsonArray{QJsonObject{{"solvent", "water"}, {"fraction_v", 0.5}},
                              QJsonObject{{"solvent", "methanol"}, {"fraction_v", 0.5}}};
    QVERIFY(run_line(doc)["ph"].isNull());
}

void TestLine::bufferLineMeasuresPhBeforeOrganic() {
    const QJsonObject out =
        run_line(buffer_line(parse(phosphate_ph25_buffer), 0.9, "acetonitrile", 1000));
    // The designer's contract: the buffer as made lands within 0.005 of its target.
    QVERIFY(std::fabs(out["ph"].toDouble() - 2.5) <= 0.005);
    QCOMPARE(item(out, "buffer")["volume_ml"].toDouble(), 900.0);
    QCOMPARE(item(out, "acetonitrile")["volume_ml"].toDouble(), 100.0);
    const QString first = out["steps"].toArray().at(0).toString();
    QVERIFY2(first.contains("pH") && first.contains("before any organic"), qPrintable(first));
    bool note = false;
    for (const auto& n : out["notes"].toArray())
        note |= n.toString().contains("measured in the aqueous part before");
    QVERIFY(note);
    QCOMPARE(out["composition"].toObject()["shelf_kind"].toString(),
             QString("buffer-with-organic"));
}

void TestLine::immiscibleParts() {
    // Miscibility chart (Sadek 2002; Burdick & Jackson; from memory): water–hexane immiscible,
    // water–ethyl acetate partly miscible, water–acetonitrile miscible.
    auto warn = [](const char* organic) {
        QJsonObject d{
            {"volume_ml", 1000},
            {"parts", QJsonArray{QJsonObject{{"solvent", "water"}, {"fraction_v", 0.5}},
                                 QJsonObject{{"solvent", organic}, {"fraction_v", 0.5}}}}};
        return run_line(d);
    };
    QCOMPARE(codes(warn("hexane"), "warning"), QStringList{"immiscible"});
    QCOMPARE(codes(warn("ethyl-acetate"), "caution"), QStringList{"immiscible"});
    QVERIFY(!codes(warn("acetonitrile")).contains("immiscible"));
    QVERIFY(!codes(warn("methanol")).contains("immiscible"));
}

void TestLine::precipitationInTheBottle() {
    // Potassium phosphate pH 7 in water–acetonitrile, checked form by form at the bottle's pH
    // against the conservative rules of thumb of data/solvents.json (common practice, no
    // source): HPO4²⁻ 5 mmol/L at 80 %, 30 at 60 %; H2PO4⁻ 15 at 80 %, 60 at 60 %.
    //   50 mM buffer, 20 % buffer / 80 % MeCN → 10 mmol/L at 80 %: above 5 and 15 in part →
    //   the bottle holds between 5 and 15 mmol/L, fewer than 10 → warning.
    //   50 mM buffer, 40 % / 60 %            → 20 mmol/L at 60 %: below 30 → none.
    const QJsonObject over =
        run_line(buffer_line(potassium_phosphate_ph7(0.05), 0.2, "acetonitrile", 1000));
    QCOMPARE(codes(over, "warning"), QStringList{"precipitation"});
    for (const auto& w : over["warnings"].toArray())
        if (w.toObject()["code"] == "precipitation") {
            QVERIFY(std::fabs(w.toObject()["mmol_per_l"].toDouble() - 10.0) < 0.01);
            QCOMPARE(w.toObject()["form_limit_mmol_per_l"].toDouble(), 5.0);
            QCOMPARE(w.toObject()["form"].toString(), QString("hydrogen-phosphate"));
            QVERIFY(w.toObject()["limit_mmol_per_l"].toDouble() > 5.0);
            QVERIFY(w.toObject()["limit_mmol_per_l"].toDouble() < 10.0);
            QCOMPARE(w.toObject()["basis"].toString(), QString("rule-of-thumb"));
        }
    const QJsonObject fine =
        run_line(buffer_line(potassium_phosphate_ph7(0.05), 0.4, "acetonitrile", 1000));
    QVERIFY(!codes(fine).contains("precipitation"));
}

void TestLine::msAndColumnChecks() {
    QJsonObject phosphate = buffer_line(parse(phosphate_ph25_buffer), 1.0, "", 1000);
    phosphate["detector"] = QJsonObject{{"type", "ms"}};
    phosphate["column"] = QJsonObject{{"ph_min", 3.0}, {"ph_max", 8.0}};
    const QJsonObject a = run_line(phosphate);
    QVERIFY(codes(a, "warning").contains("ms-nonvolatile"));
    QVERIFY(codes(a, "warning").contains("column-ph"));
    // 0.1 % formic acid (volatile, Snyder, Kirkland & Dolan 2010, from memory) at pH ~2.7 on a
    // pH 2–8 column: neither check fires.
    QJsonObject formic =
        parse(R"({"volume_ml": 1000, "parts": [{"solvent": "water", "fraction_v": 1}],
        "additives": [{"additive": "formic-acid", "percent_v": 0.1}],
        "detector": {"type": "ms"}, "column": {"ph_min": 2, "ph_max": 8}})");
    const QJsonObject b = run_line(formic);
    QVERIFY(!codes(b).contains("ms-nonvolatile"));
    QVERIFY(!codes(b).contains("column-ph"));
}

void TestLine::cautionsDeferToSdsAndLocalRules() {
    const QJsonObject out =
        run_line(parse(R"({"volume_ml": 1000, "parts": [{"solvent": "methanol", "fraction_v": 0.5},
        {"solvent": "water", "fraction_v": 0.5}], "additives": [{"additive": "formic-acid", "percent_v": 0.1}]})"));
    const QJsonArray c = out["cautions"].toArray();
    QVERIFY(c.size() >= 3);
    QVERIFY(c.last().toString().contains("safety data sheet"));
    QVERIFY(c.last().toString().contains("local rules"));
    bool flammable = false, corrosive = false;
    for (const auto& v : c) {
        flammable |= v.toString().contains("H225") && v.toString().contains("flammable");
        corrosive |= v.toString().contains("H314") && v.toString().contains("corrosive");
        QVERIFY2(!v.toString().contains(QRegularExpression("\\bsafe\\b")),
                 qPrintable(v.toString()));
    }
    QVERIFY(flammable && corrosive);
}

void TestLine::badInputIsRejected_data() {
    QTest::addColumn<QByteArray>("input");
    QTest::addColumn<QString>("field");
    QTest::addColumn<QString>("contains");
    const QJsonObject doc = phaseplan::testing::read_json(TESTS_DATA_DIR "/line_bad_input.json");
    for (const auto& c : doc["cases"].toArray()) {
        const QJsonObject o = c.toObject();
        QTest::newRow(o["name"].toString().toUtf8().constData())
            << QJsonDocument(o["input"].toObject()).toJson(QJsonDocument::Compact)
            << o["field"].toString() << o["contains"].toString();
    }
}

void TestLine::badInputIsRejected() {
    QFETCH(QByteArray, input);
    QFETCH(QString, field);
    QFETCH(QString, contains);
    phaseplan::testing::verify_rejected(run_cli({"line", "-"}, input), field, contains);
}

void TestLine::densitiesAtTheLineTemperature() {
    // Acetonitrile 0.7857 g/mL at 20 °C with α = 1.37e-3 1/K (CRC, from memory): 0.7803 g/mL at
    // 25 °C; water from Tanaka et al. (2001): 0.997047 g/mL at 25 °C (IAPWS-95 gives 0.99705).
    QJsonObject d = parse(R"({"volume_ml": 1000, "temperature_c": 25, "parts": [
        {"solvent": "water", "fraction_v": 0.5}, {"solvent": "acetonitrile", "fraction_v": 0.5}]})");
    const QJsonObject out = run_line(d);
    QVERIFY(std::fabs(item(out, "acetonitrile")["density_g_per_ml"].toDouble() - 0.7803) < 2e-4);
    QVERIFY(std::fabs(item(out, "water")["density_g_per_ml"].toDouble() - 0.99705) < 2e-5);
    QCOMPARE(item(out, "acetonitrile")["density_temperature_c"].toDouble(), 25.0);
    d["temperature_c"] = 20;
    QVERIFY(std::fabs(item(run_line(d), "acetonitrile")["density_g_per_ml"].toDouble() - 0.7857) <
            1e-9);
}

void TestLine::hydroxideHasAUvFigure() {
    // NaOH and KOH carry a UV figure (no chromophore above ~200 nm, common practice, no source):
    // no "no UV cutoff figure" caution at 210 nm.
    for (const char* base : {"sodium-hydroxide", "potassium-hydroxide"}) {
        QJsonObject d{
            {"volume_ml", 1000},
            {"parts", QJsonArray{QJsonObject{{"solvent", "water"}, {"fraction_v", 1}}}},
            {"additives", QJsonArray{QJsonObject{{"additive", base}, {"mmol_per_l", 10}}}},
            {"detector", QJsonObject{{"type", "uv"}, {"wavelength_nm", 210}}}};
        QVERIFY2(!codes(run_line(d)).contains("uv-cutoff"), base);
    }
}

void TestLine::triethylamineMsBackground() {
    // Triethylamine is volatile, yet lingers in an MS source (common practice, no source): a
    // caution with an MS detector, none with UV.
    QJsonObject d{
        {"volume_ml", 1000},
        {"parts", QJsonArray{QJsonObject{{"solvent", "water"}, {"fraction_v", 1}}}},
        {"additives", QJsonArray{QJsonObject{{"additive", "triethylamine"}, {"percent_v", 0.1}}}},
        {"detector", QJsonObject{{"type", "ms"}}}};
    const QJsonObject ms = run_line(d);
    QVERIFY(codes(ms, "caution").contains("ms-nonvolatile"));
    QVERIFY(!codes(ms, "warning").contains("ms-nonvolatile"));
    d["detector"] = QJsonObject{{"type", "uv"}, {"wavelength_nm", 260}};
    QVERIFY(!codes(run_line(d)).contains("ms-nonvolatile"));
}

QTEST_GUILESS_MAIN(TestLine)
#include "tst_line.moc"
