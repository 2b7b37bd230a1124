// The sequence planner: hand-worked integrals of piecewise-linear gradients (arithmetic in the
// comments), run-dry injections and times, the conservation invariant (the lines' volumes add up
// to flow × pumped time), each check of the `sequence` command triggered and not triggered,
// plans summed per line recipe, and malformed documents rejected with the field named.
#include "chem/error.h"
#include "chem/sequence.h"
#include "core/line_commands.h"
#include "test_support.h"

#include <QJsonArray>
#include <QJsonDocument>
#include <QRegularExpression>
#include <QtTest>

#include <cmath>
#include <random>

using phaseplan::testing::run_cli;
using phaseplan::testing::shipped_data;

namespace {

// --- JSON path edits for the data-driven cases: "methods.m.gradient[1].t_min"
QJsonValue set_at(const QJsonValue& node, QStringList tokens, const QJsonValue& value) {
    if (tokens.isEmpty())
        return value;
    const QString t = tokens.takeFirst();
    if (t.startsWith('[')) {
        QJsonArray a = node.toArray();
        const int i = t.mid(1, t.size() - 2).toInt();
        while (a.size() <= i)
            a.append(QJsonValue());
        a[i] = set_at(a.at(i), tokens, value);
        return a;
    }
    QJsonObject o = node.toObject();
    if (tokens.isEmpty() && value.isNull())
        o.remove(t);
    else
        o[t] = set_at(o.value(t), tokens, value);
    return o;
}

QJsonObject set_path(const QJsonObject& doc, const QString& path, const QJsonValue& value) {
    QStringList tokens;
    static const QRegularExpression re(R"(([^.\[\]]+)|(\[\d+\]))");
    for (auto it = re.globalMatch(path); it.hasNext();)
        tokens << it.next().captured(0);
    return set_at(doc, tokens, value).toObject();
}

QJsonObject base_doc() {
    return phaseplan::testing::read_json(TESTS_DATA_DIR "/sequence_bad_input.json")["base"]
        .toObject();
}

QJsonObject run_sequence(const QJsonObject& doc) {
    return phaseplan::command_sequence(shipped_data(), doc, {});
}

QStringList codes(const QJsonObject& out, const QString& severity = {}) {
    QStringList c;
    for (const auto& w : out["warnings"].toArray())
        if (severity.isEmpty() || w.toObject()["severity"].toString() == severity)
            c << w.toObject()["code"].toString();
    return c;
}

QJsonObject warning(const QJsonObject& out, const QString& code) {
    for (const auto& w : out["warnings"].toArray())
        if (w.toObject()["code"].toString() == code)
            return w.toObject();
    return {};
}

QJsonObject buffer_part(const char* json) {
    return QJsonObject{{"buffer", QJsonDocument::fromJson(json).object()}, {"fraction_v", 1.0}};
}
const char* phosphate_k_ph7_25mm =
    R"({"target_ph": 7.0, "route": "mix", "acid": "potassium-dihydrogen-phosphate",
    "base": "dipotassium-hydrogen-phosphate", "concentration_mol_per_l": 0.025})";
const char* phosphate_na_ph25_20mm =
    R"({"target_ph": 2.5, "route": "mix", "acid": "phosphoric-acid",
    "base": "sodium-dihydrogen-phosphate-monohydrate", "concentration_mol_per_l": 0.02})";
const char* formate_ph35_10mm = R"({"target_ph": 3.5, "route": "mix", "acid": "formic-acid",
    "base": "ammonium-formate", "concentration_mol_per_l": 0.01})";

QJsonObject with_buffer_in_a(const char* buffer) {
    return set_path(base_doc(), "lines.A.parts", QJsonArray{buffer_part(buffer)});
}

/// "m<i>" (appended, not operator+: GCC 12 warns falsely on "literal" + std::to_string).
std::string method_name(int i) {
    std::string s = "m";
    s += std::to_string(i);
    return s;
}

chem::GradientRow row(double t, double a, double b, double c = 0) {
    chem::GradientRow r;
    r.t_min = t;
    r.percent = {a, b, c, 0};
    return r;
}

} // namespace

class TestSequence : public QObject {
    Q_OBJECT
  private slots:
    void handWorkedIntegrals();
    void percentAtFollowsTheTable();
    void dryTimeInsideARamp();
    void dryDuringPrimingAndStandby();
    void demoSequence();
    void volumesAddUpToFlowTimesTime();
    void uvCutoffCheck();
    void uvCheckReadsTheEluent();
    void uvCheckReadsPublishedAbsorbance();
    void immiscibleCheck();
    void precipitationCheck();
    void msNonvolatileCheck();
    void columnPhCheck();
    void shelfLifeCheck();
    void runsDryCheck();
    void wasteOverflowCheck();
    void plansSumPerLineRecipe();
    void clockTimesKeepAnOffset();
    void cliTextIsQtsTextOfTheResult();
    void rowsAreReadAlikeInEveryForm();
    void standbyUntilATimeOfDayMovesWithTheStart();
    void badInputIsRejected_data();
    void badInputIsRejected();
};

void TestSequence::handWorkedIntegrals() {
    // (a) 1.0 mL/min; A 95 → 5, B 5 → 95 over 0–10 min; hold to run 15; re-equilibrate 5 min at
    //     the first row. Per injection, in %·min then × flow/100:
    //     A: (95+5)/2·10 = 500; hold 5·5 = 25; equilibration 95·5 = 475 → 1000 → 10.00 mL
    //     B: (5+95)/2·10 = 500; hold 95·5 = 475; equilibration 5·5 = 25 → 1000 → 10.00 mL
    chem::Method a;
    a.name = "a";
    a.flow_ml_min = 1.0;
    a.gradient = {row(0, 95, 5), row(10, 5, 95)};
    a.run_min = 15;
    a.equilibration_min = 5;
    auto v = chem::volume_per_injection_ml(a);
    QCOMPARE(v[0], 10.0);
    QCOMPARE(v[1], 10.0);

    // (b) 0.5 mL/min, three lines, first row at 2 min (held from 0), rows
    //     t=2: A80 B20 C0;  t=8: A20 B50 C30;  t=10: A20 B50 C30;  run 12; equilibration 3.
    //     A: 2·80 = 160; (80+20)/2·6 = 300; 20·2 = 40; hold 20·2 = 40; equil. 80·3 = 240 → 780
    //     %·min → 3.90 mL B: 2·20 = 40;  (20+50)/2·6 = 210; 50·2 = 100; 50·2 = 100; 20·3 = 60 → 510
    //     %·min → 2.55 mL C: 0;          (0+30)/2·6 = 90;   30·2 = 60;  30·2 = 60;  0 → 210 %·min
    //     → 1.05 mL Sum 7.50 mL = 0.5 mL/min × 15 min.
    chem::Method b;
    b.name = "b";
    b.flow_ml_min = 0.5;
    b.gradient = {row(2, 80, 20, 0), row(8, 20, 50, 30), row(10, 20, 50, 30)};
    b.run_min = 12;
    b.equilibration_min = 3;
    v = chem::volume_per_injection_ml(b);
    QVERIFY(std::fabs(v[0] - 3.90) < 1e-12);
    QVERIFY(std::fabs(v[1] - 2.55) < 1e-12);
    QVERIFY(std::fabs(v[2] - 1.05) < 1e-12);
    QCOMPARE(v[3], 0.0);

    // (c) Isocratic 30 % B at 2.0 mL/min for 7.5 min, no equilibration: B = 0.3 · 2 · 7.5 = 4.5 mL.
    chem::Method c;
    c.name = "c";
    c.flow_ml_min = 2.0;
    c.gradient = {row(0, 70, 30)};
    c.run_min = 7.5;
    v = chem::volume_per_injection_ml(c);
    QVERIFY(std::fabs(v[1] - 4.5) < 1e-12);
    QVERIFY(std::fabs(v[0] - 10.5) < 1e-12);
}

void TestSequence::percentAtFollowsTheTable() {
    // Method (b) above: at t = 5 min A is halfway from 80 to 20 → 50; at 11 min the last row
    // holds (20); at 13 min (re-equilibration) the first row's 80.
    chem::Method b;
    b.flow_ml_min = 0.5;
    b.gradient = {row(2, 80, 20, 0), row(8, 20, 50, 30), row(10, 20, 50, 30)};
    b.run_min = 12;
    b.equilibration_min = 3;
    QCOMPARE(b.percent_at(0, 5.0), 50.0);
    QCOMPARE(b.percent_at(0, 11.0), 20.0);
    QCOMPARE(b.percent_at(0, 13.0), 80.0);
    QCOMPARE(b.percent_at(0, 1.0), 80.0);
}

void TestSequence::dryTimeInsideARamp() {
    // One method, 1.0 mL/min, B 0 → 100 % over 10 min, run 10, no equilibration: 5 mL of B per
    // injection. Bottle 20 mL, residue 8 → 12 mL usable, no priming. Two injections use 10 mL;
    // during the third the remaining 2 mL are gone when ∫0^τ (10 t %/min)/100 dt = τ²/20 = 2,
    // τ = √40 = 6.3246 min: dry during injection 3 at 20 + 6.3246 = 26.3246 min.
    chem::SequenceInput in;
    in.lines[0] = chem::BottleSpec{"A", 1000, 0, 0};
    in.lines[1] = chem::BottleSpec{"B", 20, 8, 0};
    chem::Method m;
    m.name = "ramp";
    m.flow_ml_min = 1.0;
    m.gradient = {row(0, 100, 0), row(10, 0, 100)};
    m.run_min = 10;
    in.methods = {m};
    in.rows = {{"ramp", 5, ""}};
    const auto plan = chem::plan_sequence(in);
    const auto& b = plan.lines[1];
    QVERIFY(b.runs_dry);
    QCOMPARE(*b.dry_after_injection, 3);
    QVERIFY(std::fabs(*b.dry_at_min - (20 + std::sqrt(40.0))) < 1e-9);
    QCOMPARE(b.required_ml, 25.0);
    QCOMPARE(b.usable_ml, 12.0);
    // The smallest bottle with 10 % spare: 25 · 1.1 + 8 = 35.5 mL; the next common size 100 mL.
    QVERIFY(std::fabs(b.min_bottle_ml - 35.5) < 1e-12);
    QCOMPARE(b.suggested_bottle_ml, 100.0);
    QVERIFY(!plan.lines[0].runs_dry);
    // A falls linearly 100 → 0: 5 mL per injection as well, 25 mL in all.
    QCOMPARE(plan.lines[0].required_ml, 25.0);
}

void TestSequence::dryDuringPrimingAndStandby() {
    chem::SequenceInput in;
    in.lines[0] = chem::BottleSpec{"A", 100, 10, 95}; // priming 95 mL of 90 usable
    in.lines[1] = chem::BottleSpec{"B", 100, 10, 0};
    chem::Method m;
    m.name = "iso";
    m.flow_ml_min = 1.0;
    m.gradient = {row(0, 50, 50)};
    m.run_min = 10;
    in.methods = {m};
    in.rows = {{"iso", 4, ""}};
    // Standby 0.5 mL/min at 20 % A / 80 % B for 600 min: B takes 0.4 mL/min. B after 4
    // injections: 4 · 5 = 20 mL, 70 left → dry 70/0.4 = 175 min into the standby, at 40 + 175 = 215
    // min.
    in.standby = chem::Standby{0.5, 600, chem::LineValues{20, 80, 0, 0}};
    const auto plan = chem::plan_sequence(in);
    QVERIFY(plan.lines[0].runs_dry);
    QCOMPARE(plan.lines[0].dry_phase, chem::DryPhase::priming);
    QVERIFY(!plan.lines[0].dry_after_injection);
    QVERIFY(plan.lines[1].runs_dry);
    QCOMPARE(plan.lines[1].dry_phase, chem::DryPhase::standby);
    QCOMPARE(*plan.lines[1].dry_after_injection, 4);
    QVERIFY(std::fabs(*plan.lines[1].dry_at_min - 215.0) < 1e-9);
    // Standby: 0.5 · 600 = 300 mL pumped; total 40 + 300 = 340 mL; waste adds the 95 mL priming.
    QVERIFY(std::fabs(plan.pumped_ml - 340.0) < 1e-9);
    QVERIFY(std::fabs(plan.waste_ml - 435.0) < 1e-9);
    QCOMPARE(plan.total_min, 40.0);
}

void TestSequence::demoSequence() {
    // data/demo/overnight-sequence.json, worked by hand:
    //   suitability: 1.0 mL/min, 70/30 A/B, 10 min → A 7 mL, B 3 mL per injection, 6 injections.
    //   assay: 1.2 mL/min, rows 0: 90/10, 9: 45/55, 10: 25/75, 11.5: 25/75, run 12, equil. 4 →
    //     B: (10+55)/2·9 = 292.5; (55+75)/2·1 = 65; 75·1.5 = 112.5; 75·0.5 = 37.5; 10·4 = 40
    //        → 547.5 %·min × 1.2/100 = 6.57 mL per injection; A: 1052.5 %·min → 12.63 mL.
    //     30 injections (2+12+2+12+2), 16 min each.
    //   wash: 1.0 mL/min, C/B 90/10 → 10/90 over 10 min, run 20, equil. 10 → B 15 mL, C 15 mL.
    //   Time: 6·10 + 30·16 + 30 = 570 min → 18:00 + 9 h 30 = 03:30 the next day.
    //   A: priming 25 + 6·7 + 30·12.63 = 445.9 mL.
    //   B: 250 mL bottle, 40 mL residue → 210 usable. Priming 25 + 6·3 = 43 mL before the assay;
    //     167 mL left = 25 injections (164.25 mL) + 2.75 mL into injection 26 of the assay,
    //     i.e. injection 6 + 26 = 32 overall. In its first ramp B delivers
    //     1.2/100·(10 τ + 45 τ²/18) = 2.75 mL → 0.03 τ² + 0.12 τ − 2.75 = 0 →
    //     τ = (−0.12 + √(0.0144 + 0.33))/0.06 = 7.78093 min. Clock: 60 + 25·16 + 7.78093 =
    //     467.78093 min after 18:00 → 01:47:46.9.
    const auto r = run_cli({"sequence", SOURCE_DIR "/data/demo/overnight-sequence.json"});
    QCOMPARE(r.exit_code, 0);
    QVERIFY(r.err.isEmpty());
    const QJsonObject out = QJsonDocument::fromJson(r.out).object();
    QCOMPARE(out["total_min"].toDouble(), 570.0);
    QCOMPARE(out["end"].toString(), QString("2026-12-02T03:30:00"));
    QCOMPARE(out["injections"].toInt(), 37);
    const QJsonObject a = out["lines"]["A"].toObject();
    QVERIFY(std::fabs(a["required_ml"].toDouble() - 445.9) < 1e-9);
    QCOMPARE(a["runs_dry"].toBool(), false);
    QVERIFY(a["dry_after_injection"].isNull());
    QVERIFY(a["dry_at"].isNull());
    const QJsonObject b = out["lines"]["B"].toObject();
    QCOMPARE(b["runs_dry"].toBool(), true);
    QCOMPARE(b["usable_ml"].toDouble(), 210.0);
    QCOMPARE(b["dry_after_injection"].toInt(), 32);
    QVERIFY(std::fabs(b["dry_at_min"].toDouble() - 467.78093) < 1e-4);
    QCOMPARE(b["dry_at"].toString(), QString("2026-12-02T01:47:47"));
    QCOMPARE(codes(out, "warning"), QStringList{"runs-dry"});
    // Waste: priming 75 + 6·10·1.0 + 30·16·1.2 + 30·1.0 + standby 0.2 mL/min · 240 min = 789 mL.
    QVERIFY(std::fabs(out["waste_ml"].toDouble() - 789.0) < 1e-9);
    QCOMPARE(out["standby_min"].toDouble(), 240.0);
}

void TestSequence::volumesAddUpToFlowTimesTime() {
    // Invariant: Σ over lines of the pumped volume = Σ over rows of flow × injections × injection
    // time (+ standby flow × time), since every composition sums to 100 %; the rows' volumes add
    // up to each line's total; waste = pumped + priming. Checked over 200 random plans.
    std::mt19937 rng(20261201);
    std::uniform_real_distribution<double> u(0, 1);
    for (int trial = 0; trial < 200; ++trial) {
        chem::SequenceInput in;
        const int nlines = 2 + static_cast<int>(u(rng) * 3); // 2–4
        for (int l = 0; l < nlines; ++l)
            in.lines[l] = chem::BottleSpec{"", 1e5, 10, 20 * u(rng)};
        const int nmethods = 1 + static_cast<int>(u(rng) * 5);
        for (int mi = 0; mi < nmethods; ++mi) {
            chem::Method m;
            m.name = method_name(mi);
            m.flow_ml_min = 0.1 + 2 * u(rng);
            double t = u(rng) < 0.3 ? 2 * u(rng) : 0;
            const int nrows = 1 + static_cast<int>(u(rng) * 6);
            for (int r = 0; r < nrows; ++r) {
                chem::GradientRow g;
                g.t_min = t;
                double left = 100;
                for (int l = 0; l < nlines - 1; ++l) {
                    g.percent[l] = std::floor(left * u(rng) * 100) / 100;
                    left -= g.percent[l];
                }
                g.percent[nlines - 1] = std::max(0.0, left);
                m.gradient.push_back(g);
                t += 0.5 + 10 * u(rng);
            }
            m.run_min = m.gradient.back().t_min + 5 * u(rng);
            m.equilibration_min = 5 * u(rng);
            in.methods.push_back(m);
        }
        const int nrows = 1 + static_cast<int>(u(rng) * 20);
        for (int r = 0; r < nrows; ++r)
            in.rows.push_back({method_name(static_cast<int>(u(rng) * nmethods)),
                               1 + static_cast<int>(u(rng) * 40), ""});
        if (u(rng) < 0.5)
            in.standby = chem::Standby{0.05 + u(rng), 600 * u(rng), std::nullopt};
        const auto plan = chem::plan_sequence(in);

        double expected = 0, time = 0;
        for (const auto& r : in.rows) {
            const auto it = std::find_if(in.methods.begin(), in.methods.end(),
                                         [&](const chem::Method& m) { return m.name == r.method; });
            expected += it->flow_ml_min * r.injections * it->injection_min();
            time += r.injections * it->injection_min();
        }
        if (in.standby)
            expected += in.standby->flow_ml_min * in.standby->duration_min;
        double pumped = 0, prime = 0;
        for (int l = 0; l < nlines; ++l) {
            pumped += plan.lines[l].pumped_ml;
            prime += plan.lines[l].prime_ml;
            double rows = 0;
            for (const auto& rp : plan.rows)
                rows += rp.volume_ml[l];
            const double standby = in.standby ? plan.lines[l].pumped_ml - rows : 0;
            QVERIFY(standby >= -1e-9 * expected);
            if (!in.standby)
                QVERIFY(std::fabs(rows - plan.lines[l].pumped_ml) <= 1e-9 * (1 + rows));
            QVERIFY(std::fabs(plan.lines[l].required_ml - plan.lines[l].prime_ml -
                              plan.lines[l].pumped_ml) < 1e-9 * (1 + rows));
        }
        QVERIFY2(std::fabs(pumped - expected) <= 1e-9 * expected,
                 qPrintable(QString("trial %1: %2 vs %3").arg(trial).arg(pumped).arg(expected)));
        QVERIFY(std::fabs(plan.pumped_ml - expected) <= 1e-9 * expected);
        QVERIFY(std::fabs(plan.waste_ml - expected - prime) <= 1e-9 * expected);
        QVERIFY(std::fabs(plan.total_min - time) <= 1e-9 * time);
        QCOMPARE(plan.rows.back().end_min, plan.total_min);
    }
}

void TestSequence::uvCutoffCheck() {
    // Methanol: UV cutoff 205 nm (Burdick & Jackson, from memory). Detector at 200 nm: below
    // (warning); 210 nm: within the 10 nm margin (caution); 230 nm: clear. Water/acetonitrile
    // (190 nm) at 210 nm: clear.
    QVERIFY(!codes(run_sequence(base_doc())).contains("uv-cutoff"));
    QJsonObject doc = set_path(base_doc(), "lines.B.parts[0].solvent", "methanol");
    QCOMPARE(codes(run_sequence(set_path(doc, "detector.wavelength_nm", 200)), "warning"),
             QStringList{"uv-cutoff"});
    const QJsonObject caution = run_sequence(doc);
    QCOMPARE(codes(caution, "caution"), QStringList{"uv-cutoff"});
    QCOMPARE(warning(caution, "uv-cutoff")["line"].toString(), QString("B"));
    // The eluent at its worst point, 95 % B at 10 min: A = 0.95 · 10^((205 − 210)/10) + 0.05 ·
    // 10^((190 − 210)/10) = 0.301, a cutoff of 210 + 10 log10 0.301 = 204.8 nm.
    QVERIFY(std::fabs(warning(caution, "uv-cutoff")["cutoff_nm"].toDouble() - 204.78) < 0.01);
    QVERIFY(std::fabs(warning(caution, "uv-cutoff")["absorbance"].toDouble() - 0.3009) < 0.001);
    QCOMPARE(warning(caution, "uv-cutoff")["t_min"].toDouble(), 10.0);
    QCOMPARE(warning(caution, "uv-cutoff")["method"].toString(), QString("m"));
    QCOMPARE(warning(caution, "uv-cutoff")["wavelength_nm"].toDouble(), 210.0);
    QVERIFY(
        !codes(run_sequence(set_path(doc, "detector.wavelength_nm", 230))).contains("uv-cutoff"));
    // An RI detector reads no wavelength: no UV check.
    QVERIFY(!codes(run_sequence(set_path(doc, "detector", QJsonObject{{"type", "ri"}})))
                 .contains("uv-cutoff"));
}

void TestSequence::uvCheckReadsTheEluent() {
    // The detector sees the mixed eluent, not a neat line: absorbance adds by volume fraction
    // (Beer–Lambert). Tetrahydrofuran, UV cutoff 212 nm (Snyder, Kirkland & Dolan 2010, from
    // memory), held at 5 % in water, read at 215 nm: A = 0.05 · 10^((212 − 215)/10) = 0.025,
    // an eluent cutoff of 199 nm, clear of the 10 nm margin (the line alone, neat, would be
    // within it).
    QJsonObject doc = set_path(base_doc(), "lines.B.parts[0].solvent", "tetrahydrofuran");
    doc = set_path(doc, "detector.wavelength_nm", 215);
    const QJsonArray hold{QJsonObject{{"t_min", 0}, {"A", 95}, {"B", 5}},
                          QJsonObject{{"t_min", 10}, {"A", 95}, {"B", 5}}};
    QVERIFY(!codes(run_sequence(set_path(doc, "methods.m.gradient", hold))).contains("uv-cutoff"));
    // The same line run to 95 %: A = 0.95 · 10^(−0.3) = 0.48, within the margin (caution); at
    // 205 nm, 4.8: below the cutoff (warning).
    QCOMPARE(codes(run_sequence(doc), "caution"), QStringList{"uv-cutoff"});
    QCOMPARE(codes(run_sequence(set_path(doc, "detector.wavelength_nm", 205)), "warning"),
             QStringList{"uv-cutoff"});
    // Held at 30 % and read at 215 nm: A = 0.30 · 10^(−0.3) + 0.70 · 10^((190 − 215)/10) (water,
    // 190 nm, same table) = 0.153, above the caution line 0.1.
    const QJsonArray hold30{QJsonObject{{"t_min", 0}, {"A", 70}, {"B", 30}},
                            QJsonObject{{"t_min", 10}, {"A", 70}, {"B", 30}}};
    const QJsonObject w =
        warning(run_sequence(set_path(doc, "methods.m.gradient", hold30)), "uv-cutoff");
    QCOMPARE(w["severity"].toString(), QString("caution"));
    QVERIFY(std::fabs(w["absorbance"].toDouble() -
                      (0.3 * std::pow(10.0, -0.3) + 0.7 * std::pow(10.0, -2.5))) < 1e-6);
    QCOMPARE(w["limited_by"].toString(), QString("tetrahydrofuran"));
}

void TestSequence::uvCheckReadsPublishedAbsorbance() {
    // Acetonitrile has a published table: maximum absorbance 0.12 at 195 nm for a UV/HPLC grade
    // (ChemicalBook acetonitrile property page, CAS 75-05-8; read). Held at 95 % of it with 5 %
    // water (cutoff 190 nm, Snyder, Kirkland & Dolan 2010, from memory; a decade per 10 nm) and
    // read at 195 nm: A = 0.95 · 0.12 + 0.05 · 10^((190 − 195)/10) = 0.130, not the 0.316 of the
    // cutoff model alone. The eluent's cutoff stays 190 nm (both parts absorb 1 there), within the
    // 10 nm margin: a caution, mostly from the acetonitrile.
    QJsonObject doc = set_path(base_doc(), "detector.wavelength_nm", 195);
    const QJsonArray hold{QJsonObject{{"t_min", 0}, {"A", 5}, {"B", 95}},
                          QJsonObject{{"t_min", 10}, {"A", 5}, {"B", 95}}};
    doc = set_path(doc, "methods.m.gradient", hold);
    const QJsonObject w = warning(run_sequence(doc), "uv-cutoff");
    QCOMPARE(w["severity"].toString(), QString("caution"));
    QVERIFY(std::fabs(w["absorbance"].toDouble() - (0.95 * 0.12 + 0.05 * std::pow(10.0, -0.5))) <
            1e-9);
    QVERIFY(std::fabs(w["cutoff_nm"].toDouble() - 190.0) < 1e-6);
    QCOMPARE(w["limited_by"].toString(), QString("acetonitrile"));
    // 201 nm: the cutoff (190 nm) lies more than 10 nm below: no warning.
    QVERIFY(
        !codes(run_sequence(set_path(doc, "detector.wavelength_nm", 201))).contains("uv-cutoff"));
}

void TestSequence::immiscibleCheck() {
    // Water (A) and hexane (B) are immiscible (miscibility chart, Sadek 2002, from memory): they
    // meet from the start of the gradient (95 % A with 5 % B).
    const QJsonObject out =
        run_sequence(set_path(base_doc(), "lines.B.parts[0].solvent", "hexane"));
    QCOMPARE(codes(out, "warning").count("immiscible"), 1);
    const QJsonObject w = warning(out, "immiscible");
    QCOMPARE(w["line_a"].toString(), QString("A"));
    QCOMPARE(w["line_b"].toString(), QString("B"));
    QCOMPARE(w["miscibility"].toString(), QString("immiscible"));
    // The same two bottles never pumped at the same time (one method each at 100 %): no meeting.
    QJsonObject apart = set_path(base_doc(), "lines.B.parts[0].solvent", "hexane");
    apart = set_path(
        apart, "methods",
        QJsonObject{
            {"a", QJsonObject{{"flow_ml_min", 1},
                              {"gradient", QJsonArray{QJsonObject{{"t_min", 0}, {"A", 100}}}},
                              {"run_min", 5}}},
            {"b", QJsonObject{{"flow_ml_min", 1},
                              {"gradient", QJsonArray{QJsonObject{{"t_min", 0}, {"B", 100}}}},
                              {"run_min", 5}}}});
    apart = set_path(apart, "sequence",
                     QJsonArray{QJsonObject{{"method", "a"}, {"injections", 1}},
                                QJsonObject{{"method", "b"}, {"injections", 1}}});
    QVERIFY(!codes(run_sequence(apart)).contains("immiscible"));
    // Water with acetonitrile: miscible.
    QVERIFY(!codes(run_sequence(base_doc())).contains("immiscible"));
}

void TestSequence::precipitationCheck() {
    // 25 mM potassium phosphate pH 7 in A, acetonitrile in B. The phosphate is checked form by
    // form at the eluent's pH against the form tables of data/solvents.json (rule of thumb,
    // common practice, no source): HPO4²⁻ 5 mmol/L at 80 %, 1 at 90 %, 0.5 at 95 % (interpolated
    // 0.75 at 92.5 %); H2PO4⁻ 15 at 80 %, 3 at 90 %.
    //   Gradient to 85 % B: 3.75 mmol/L at 85 % against 3 mmol/L for HPO4²⁻ alone and 9 for
    //   H2PO4⁻ alone: part of it is H2PO4⁻, so the eluent holds between 3 and 9 mmol/L.
    //   Default gradient to 95 % B: 1.25 mmol/L at 95 %, past the H2PO4⁻ (1.5) and HPO4²⁻ (0.5)
    //   limits taken together → warning.
    //   Gradient to 50 % B: 12.5 mmol/L at 50 % against 50 and 100 → clear.
    QJsonObject doc = with_buffer_in_a(phosphate_k_ph7_25mm);
    doc = set_path(doc, "methods.m.gradient[1].A", 15);
    doc = set_path(doc, "methods.m.gradient[1].B", 85);
    const QJsonObject out = run_sequence(doc);
    QVERIFY(codes(out).contains("precipitation"));
    const QJsonObject w = warning(out, "precipitation");
    QCOMPARE(w["group"].toString(), QString("potassium-phosphate"));
    QCOMPARE(w["system"].toString(), QString("phosphate"));
    QVERIFY(std::fabs(w["mmol_per_l"].toDouble() - 3.75) < 1e-6);
    QVERIFY(w["limit_mmol_per_l"].toDouble() > 3.0);
    QVERIFY(w["limit_mmol_per_l"].toDouble() < 9.0);
    QVERIFY(std::fabs(w["organic_fraction_v"].toDouble() - 0.85) < 1e-9);
    QVERIFY(w.contains("ph_s_s"));
    QCOMPARE(w["where"].toString(), QString("in method m at 10 min"));
    // To 95 % the salt is past its limit whatever its form.
    const QJsonObject far = run_sequence(with_buffer_in_a(phosphate_k_ph7_25mm));
    QVERIFY(codes(far, "warning").contains("precipitation"));
    QJsonObject mild = with_buffer_in_a(phosphate_k_ph7_25mm);
    mild = set_path(mild, "methods.m.gradient[1].A", 50);
    mild = set_path(mild, "methods.m.gradient[1].B", 50);
    QVERIFY(!codes(run_sequence(mild)).contains("precipitation"));
}

void TestSequence::msNonvolatileCheck() {
    // Phosphate is not volatile; ammonium formate and formic acid are (Snyder, Kirkland & Dolan
    // 2010, from memory).
    QJsonObject ms =
        set_path(with_buffer_in_a(phosphate_k_ph7_25mm), "detector", QJsonObject{{"type", "ms"}});
    const QJsonObject out = run_sequence(ms);
    QVERIFY(codes(out, "warning").contains("ms-nonvolatile"));
    QCOMPARE(warning(out, "ms-nonvolatile")["line"].toString(), QString("A"));
    QJsonObject formate =
        set_path(with_buffer_in_a(formate_ph35_10mm), "detector", QJsonObject{{"type", "ms"}});
    QVERIFY(!codes(run_sequence(formate)).contains("ms-nonvolatile"));
    // The same phosphate with a UV detector: no MS check.
    QVERIFY(
        !codes(run_sequence(with_buffer_in_a(phosphate_k_ph7_25mm))).contains("ms-nonvolatile"));
}

void TestSequence::columnPhCheck() {
    // The pH 2.5 phosphate buffer (designed to 2.5 ± 0.005) on a pH 3–8 column: warning; on 2–8:
    // clear.
    QJsonObject doc = with_buffer_in_a(phosphate_na_ph25_20mm);
    QVERIFY(!codes(run_sequence(doc)).contains("column-ph"));
    const QJsonObject out = run_sequence(set_path(doc, "column.ph_min", 3));
    QVERIFY(codes(out, "warning").contains("column-ph"));
    // The check reads the eluent's s_w pH along the gradient: lowest at the start (5 % organic),
    // a few hundredths above the aqueous 2.5 (tst_eluent covers the organic's effect).
    const double ph = warning(out, "column-ph")["ph"].toDouble();
    QVERIFY2(ph > 2.5 - 0.005 && ph < 2.6, qPrintable(QString::number(ph)));
    QCOMPARE(warning(out, "column-ph")["t_min"].toDouble(), 0.0);
    QCOMPARE(warning(out, "column-ph")["ph_min"].toDouble(), 3.0);
    // A method's own column (copied from the lab's columns) replaces the plan's range for it;
    // one given for its dimensions only keeps the plan's.
    const QJsonObject own = set_path(doc, "methods.m.column",
                                     QJsonObject{{"name", "narrow"}, {"ph_min", 3}, {"ph_max", 8}});
    const QJsonObject own_out = run_sequence(own);
    QVERIFY(codes(own_out, "warning").contains("column-ph"));
    QCOMPARE(warning(own_out, "column-ph")["ph_min"].toDouble(), 3.0);
    QVERIFY(warning(own_out, "column-ph")["message"].toString().contains("method's column"));
    const QJsonObject wide = set_path(set_path(doc, "column.ph_min", 3), "methods.m.column",
                                      QJsonObject{{"ph_min", 2}, {"ph_max", 8}});
    QVERIFY(!codes(run_sequence(wide)).contains("column-ph"));
    const QJsonObject dims_only =
        set_path(set_path(doc, "column.ph_min", 3), "methods.m.column",
                 QJsonObject{{"length_mm", 150}, {"id_mm", 4.6}, {"particle_um", 3}});
    QVERIFY(codes(run_sequence(dims_only), "warning").contains("column-ph"));
}

void TestSequence::shelfLifeCheck() {
    // Aqueous buffer: 48 h (lab-set default, common practice). Start 2026-12-01T18:00.
    QJsonObject doc = with_buffer_in_a(phosphate_k_ph7_25mm);
    doc = set_path(doc, "methods.m.gradient[1].A", 50); // keep the salt dissolved
    doc = set_path(doc, "methods.m.gradient[1].B", 50);
    // At 50 % acetonitrile the pH 7 phosphate eluent is above pH 8 (column-ph): a column rated
    // to pH 10 keeps this test on the shelf life.
    doc = set_path(doc, "column.ph_max", 10);
    // Prepared 3 days before: past its shelf life at the start.
    QCOMPARE(
        codes(run_sequence(set_path(doc, "lines.A.prepared_at", "2026-11-28T18:00:00")), "warning"),
        QStringList{"shelf-life"});
    // Prepared 40 h before the start, 30 injections of 20 min: it expires 8 h = 480 min in, during
    // injection 480/20 + 1 = 25.
    QJsonObject late = set_path(doc, "lines.A.prepared_at", "2026-11-30T02:00:00");
    late = set_path(late, "sequence[0].injections", 30);
    const QJsonObject out = run_sequence(late);
    const QJsonObject w = warning(out, "shelf-life");
    QCOMPARE(w["severity"].toString(), QString("warning"));
    QCOMPARE(w["expires_at_min"].toDouble(), 480.0);
    QCOMPARE(w["expires_at"].toString(), QString("2026-12-02T02:00:00"));
    QCOMPARE(w["expires_during_injection"].toInt(), 25);
    // Prepared an hour before: clear.
    QVERIFY(!codes(run_sequence(set_path(late, "lines.A.prepared_at", "2026-12-01T17:00:00")))
                 .contains("shelf-life"));
    // No prepared_at but a 50 h sequence (150 × 20 min): longer than 48 h even if made at the
    // start.
    QJsonObject long_run = set_path(doc, "sequence[0].injections", 150);
    long_run = set_path(long_run, "lines.A.bottle_ml", 5000);
    long_run = set_path(long_run, "lines.B.bottle_ml", 5000);
    long_run = set_path(long_run, "waste_ml", 10000);
    QVERIFY(codes(run_sequence(long_run), "warning").contains("shelf-life"));
    // Acetonitrile alone (neat solvent, 720 h) in B never triggers it.
    QCOMPARE(warning(run_sequence(long_run), "shelf-life")["line"].toString(), QString("A"));
}

void TestSequence::runsDryCheck() {
    // Base: A gets (95+5)/2·10 + 5·5 + 95·5 = 1000 %·min → 10 mL per injection; 3 injections
    // + 10 mL priming = 40 mL.
    QVERIFY(!codes(run_sequence(base_doc())).contains("runs-dry"));
    // Bottle 53 mL, residue 30 → 23 usable: 13 left after priming → injection 2 with 3 mL to go.
    // In its first ramp A delivers (95 τ − 90 τ²/20)/100 mL: 0.045 τ² − 0.95 τ + 3 = 0 →
    // τ = (0.95 − √(0.9025 − 0.54))/0.09 = 3.86578 min → dry at 20 + 3.86578 = 23.86578 min,
    // 18:23:52 on the start day.
    const QJsonObject dry = run_sequence(set_path(base_doc(), "lines.A.bottle_ml", 53));
    QCOMPARE(codes(dry, "warning"), QStringList{"runs-dry"});
    const QJsonObject a = dry["lines"]["A"].toObject();
    QCOMPARE(a["dry_after_injection"].toInt(), 2);
    QVERIFY(std::fabs(a["dry_at_min"].toDouble() - 23.86578) < 1e-5);
    QCOMPARE(a["dry_at"].toString(), QString("2026-12-01T18:23:52"));
    const QJsonObject w = warning(dry, "runs-dry");
    QCOMPARE(w["dry_after_injection"].toDouble(), 2.0);
    QCOMPARE(w["dry_at"].toString(), QString("2026-12-01T18:23:52"));
    QVERIFY(std::fabs(w["shortfall_ml"].toDouble() - 17.0) < 1e-9);
    // 40 · 1.1 + 30 = 74 mL is the smallest bottle with 10 % spare.
    QVERIFY(std::fabs(w["min_bottle_ml"].toDouble() - 74.0) < 1e-9);
    // Bottle 72 mL → 42 usable for 40 needed: lasts, but under the 10 % margin → caution.
    QCOMPARE(codes(run_sequence(set_path(base_doc(), "lines.A.bottle_ml", 72)), "caution"),
             QStringList{"runs-dry"});
}

void TestSequence::wasteOverflowCheck() {
    // Waste = priming 20 mL + 3 injections × 20 min × 1 mL/min = 80 mL.
    QCOMPARE(run_sequence(base_doc())["waste_ml"].toDouble(), 80.0);
    QVERIFY(!codes(run_sequence(base_doc())).contains("waste-overflow"));
    // 50 mL container: full at 20 + t = 50 → t = 30 min, during injection 2.
    const QJsonObject out = run_sequence(set_path(base_doc(), "waste_ml", 50));
    const QJsonObject w = warning(out, "waste-overflow");
    QCOMPARE(w["severity"].toString(), QString("warning"));
    QCOMPARE(w["full_at_min"].toDouble(), 30.0);
    QCOMPARE(w["full_during_injection"].toDouble(), 2.0);
    QCOMPARE(w["excess_ml"].toDouble(), 30.0);
    // 85 mL: 94 % full → caution.
    QCOMPARE(codes(run_sequence(set_path(base_doc(), "waste_ml", 85)), "caution"),
             QStringList{"waste-overflow"});
}

void TestSequence::cliTextIsQtsTextOfTheResult() {
    // The CLI writes the rows itself (command_sequence_text); the reference is Qt's own
    // QJsonDocument::toJson(Indented) of command_sequence, byte for byte: one plan, two plans,
    // an offset start, and labels that need escaping (quote, backslash, control characters,
    // non-ASCII text), with one, two and four lines.
    QJsonObject base =
        set_path(base_doc(), "sequence",
                 QJsonArray{QJsonObject{{"method", "m"},
                                        {"injections", 2},
                                        {"label", "plain \"quoted\" back\\slash"}},
                            QJsonObject{{"method", "m"},
                                        {"injections", 1},
                                        {"label", "tab\there\nnew \u007f\u0001"}},
                            QJsonObject{{"method", "m"},
                                        {"injections", 4},
                                        {"label", QString::fromUtf8("pH 3,0 – Ü µ 🙂")}},
                            QJsonObject{{"method", "m"}, {"injections", 1}}});
    QJsonObject offset = set_path(base, "start", "2026-12-31T22:00:00+05:30");
    QJsonObject one_line = set_path(set_path(base, "lines.B", QJsonValue()), "methods.m.gradient",
                                    QJsonArray{QJsonObject{{"t_min", 0}, {"A", 100}}});
    one_line = set_path(one_line, "prime_ml.B", QJsonValue());
    const QJsonObject two = QJsonObject{{"plans", QJsonArray{base, offset}}};
    // A method named with a quote and non-ASCII text: a key of "methods" and "eluent_trace".
    const QString odd = QString::fromUtf8("Méthode \"1\" – 5 µL");
    QJsonObject renamed = base;
    renamed["methods"] = QJsonObject{{odd, base["methods"].toObject()["m"]}};
    for (int i = 0; i < 4; ++i)
        renamed = set_path(renamed, QStringLiteral("sequence[%1].method").arg(i), odd);
    for (const QJsonObject& doc : {base, offset, one_line, two, renamed}) {
        const QByteArray qt = QJsonDocument(run_sequence(doc)).toJson(QJsonDocument::Indented);
        const QByteArray text = phaseplan::command_sequence_text(shipped_data(), doc, {});
        QCOMPARE(text, qt);
    }
}

void TestSequence::rowsAreReadAlikeInEveryForm() {
    // Plain rows take a quick reader; every other form must give what the general readers give
    // (json_util.h's contract: trimmed text, null as absent, near-miss keys refused, extra keys
    // allowed, whole numbers only). Expected texts are the general readers' messages.
    const auto row_doc = [](const QJsonObject& row) {
        return set_path(base_doc(), "sequence", QJsonArray{row});
    };
    const auto error_of = [&](const QJsonObject& row) -> std::pair<std::string, std::string> {
        try {
            run_sequence(row_doc(row));
        } catch (const chem::Error& e) {
            return {e.field(), e.message()};
        }
        return {};
    };
    using E = std::pair<std::string, std::string>;
    QCOMPARE(error_of({{"method", "m"}, {"injections", 1}, {"label", ""}}),
             E("sequence[0].label", "must not be empty"));
    QCOMPARE(error_of({{"method", "m"}, {"injections", 1}, {"injection", 2}}),
             E("sequence[0].injection", "is not a field here; did you mean \"injections\"?"));
    QCOMPARE(error_of({{"method", "m"}, {"injections", 2.5}}),
             E("sequence[0].injections", "2.5 is not a whole number"));
    QCOMPARE(error_of({{"method", "m"}, {"injections", 0}}),
             E("sequence[0].injections", "0 is outside 1 to 1000000"));
    QCOMPARE(error_of({{"method", "m"}, {"injections", "1"}}),
             E("sequence[0].injections", "must be a number, got \"1\""));
    QCOMPARE(error_of({{"injections", 1}}), E("sequence[0].method", "is required but missing"));
    const QJsonArray plain =
        run_sequence(row_doc({{"method", "m"}, {"injections", 3}, {"label", "x"}}))["rows"]
            .toArray();
    for (const QJsonObject& row :
         {QJsonObject{{"method", " m "}, {"injections", 3}, {"label", "x\t"}},
          QJsonObject{{"method", "m"}, {"injections", 3.0}, {"label", "x"}, {"note", 1}}}) {
        const QJsonArray rows = run_sequence(row_doc(row))["rows"].toArray();
        QCOMPARE(rows, plain);
    }
    const QJsonObject unlabelled =
        run_sequence(row_doc({{"method", "m"}, {"injections", 3}, {"label", QJsonValue()}}))["rows"]
            .toArray()
            .at(0)
            .toObject();
    QCOMPARE(unlabelled["label"].toString(), QString());
}

void TestSequence::plansSumPerLineRecipe() {
    // Two instruments on consecutive nights, the same two line recipes: one batch each. The
    // second plan's acetonitrile line is called differently but has the same parts.
    QJsonObject p1 = base_doc();
    QJsonObject p2 = set_path(base_doc(), "start", "2026-12-03T18:00:00");
    p2 = set_path(p2, "lines.B.name", "MeCN (HPLC-02)");
    const QJsonObject one = run_sequence(p1);
    const QJsonObject out = run_sequence(QJsonObject{{"plans", QJsonArray{p1, p2}}});
    QCOMPARE(out["plans"].toArray().size(), 2);
    const QJsonArray batches = out["batches"].toArray();
    QCOMPARE(batches.size(), 2);
    for (const auto& v : batches) {
        const QJsonObject b = v.toObject();
        QCOMPARE(b["lines"].toArray().size(), 2);
        const QString letter = b["lines"].toArray().at(0).toString().right(1);
        QCOMPARE(b["required_ml"].toDouble(), 2 * one["lines"][letter]["required_ml"].toDouble());
        QCOMPARE(b["prepare_ml"].toDouble(), 2 * one["lines"][letter]["min_bottle_ml"].toDouble());
        // 2026-12-01T18:00 to 2026-12-03T19:00: 49 h.
        QCOMPARE(b["span_h"].toDouble(), 49.0);
    }
    // Water (48 h default) made once would be older than 48 h at the end: a batch warning.
    QCOMPARE(codes(out), QStringList{"shelf-life"});
}

void TestSequence::clockTimesKeepAnOffset() {
    const QJsonObject out =
        run_sequence(set_path(base_doc(), "start", "2026-12-01T18:00:00+01:00"));
    QCOMPARE(out["end"].toString(), QString("2026-12-01T19:00:00+01:00"));
    // Without an offset: wall-clock minutes, no daylight-saving jump (a night in late March).
    QJsonObject spring = set_path(base_doc(), "start", "2027-03-27T23:30:00");
    spring = set_path(spring, "sequence[0].injections", 12);
    QCOMPARE(run_sequence(spring)["end"].toString(), QString("2027-03-28T03:30:00"));
}

void TestSequence::standbyUntilATimeOfDayMovesWithTheStart() {
    // The demo's standby runs "until": "07:30": the first 07:30 after the last injection ends.
    // Started 18:00, the injections end at 03:30 next day (570 min, demoSequence): standby
    // 03:30 → 07:30 = 240 min. Started two days later at 21:15, they end 06:45 → 45 min.
    // Started at 23:00 they end 08:30, after 07:30: the standby runs to 07:30 the day after,
    // 23 h later (1380 min). Hand arithmetic on the clock, no source needed.
    const QJsonObject demo =
        phaseplan::testing::read_json(SOURCE_DIR "/data/demo/overnight-sequence.json");
    QCOMPARE(demo["standby"]["until"].toString(), QString("07:30"));
    auto run_at = [&](const char* start) { return run_sequence(set_path(demo, "start", start)); };
    QJsonObject out = run_at("2026-12-01T18:00:00");
    QCOMPARE(out["standby_min"].toDouble(), 240.0);
    QCOMPARE(out["standby_end"].toString(), QString("2026-12-02T07:30:00"));
    out = run_at("2026-12-03T21:15:00");
    QCOMPARE(out["standby_min"].toDouble(), 45.0);
    QCOMPARE(out["standby_end"].toString(), QString("2026-12-04T07:30:00"));
    out = run_at("2026-12-03T23:00:00");
    QCOMPARE(out["standby_min"].toDouble(), 1380.0);
    QCOMPARE(out["standby_end"].toString(), QString("2026-12-05T07:30:00"));
}

void TestSequence::badInputIsRejected_data() {
    QTest::addColumn<QByteArray>("input");
    QTest::addColumn<QString>("field");
    QTest::addColumn<QString>("contains");
    const QJsonObject doc =
        phaseplan::testing::read_json(TESTS_DATA_DIR "/sequence_bad_input.json");
    const QJsonObject base = doc["base"].toObject();
    for (const auto& c : doc["cases"].toArray()) {
        const QJsonObject o = c.toObject();
        QJsonObject bad = base;
        const QJsonObject set = o["set"].toObject();
        for (auto it = set.begin(); it != set.end(); ++it)
            bad = set_path(bad, it.key(), it.value());
        if (o["plans"].toBool())
            bad = QJsonObject{{"plans", QJsonArray{base, bad}}};
        QTest::newRow(o["name"].toString().toUtf8().constData())
            << QJsonDocument(bad).toJson(QJsonDocument::Compact) << o["field"].toString()
            << o["contains"].toString();
    }
    QTest::newRow("not JSON") << QByteArray("{\"lines\": ") << QString("(document)")
                              << QString("JSON");
}

void TestSequence::badInputIsRejected() {
    QFETCH(QByteArray, input);
    QFETCH(QString, field);
    QFETCH(QString, contains);
    phaseplan::testing::verify_rejected(run_cli({"sequence", "-"}, input), field, contains);
}

QTEST_GUILESS_MAIN(TestSequence)
#include "tst_sequence.moc"
