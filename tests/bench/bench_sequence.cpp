// The sequence planner on a large plan: 10,000 injections over 20 methods (four lines, gradient
// tables of 5–8 rows). Target on one core: plan + checks ≤ 5 ms, with the pressure of every
// method on a column (issue 12) still ≤ 5 ms.
//   build-*/bench_sequence --benchmark_repetitions=5 --benchmark_report_aggregates_only=true
#include "chem/checks.h"
#include "chem/line.h"
#include "chem/pressure.h"
#include "chem/recipe.h"
#include "chem/sequence.h"
#include "core/app_data.h"
#include "core/json_util.h"
#include "core/line_commands.h"
#include "pressure_fixture.h"

#include <benchmark/benchmark.h>

#include <QFile>
#include <QJsonArray>
#include <QJsonDocument>
#include <QJsonObject>

namespace {

const phaseplan::AppData& data() {
    static const phaseplan::AppData d =
        phaseplan::load_app_data(QStringLiteral(SOURCE_DIR "/data"));
    return d;
}

/// 20 methods; `rows` rows spread 10,000 injections evenly (10,000 rows of 1 is the worst case).
chem::SequenceInput big_plan(int rows) {
    chem::SequenceInput in;
    for (int l = 0; l < 4; ++l)
        in.lines[l] = chem::BottleSpec{std::string(1, char('A' + l)), 20000, 50, 30};
    for (int m = 0; m < 20; ++m) {
        chem::Method meth;
        meth.name = "method-" + std::to_string(m);
        meth.flow_ml_min = 0.3 + 0.05 * m;
        const int nrows = 5 + m % 4;
        for (int r = 0; r < nrows; ++r) {
            chem::GradientRow g;
            g.t_min = r * (2.0 + 0.1 * m);
            const double b = 5 + 85.0 * r / (nrows - 1);
            g.percent = {100 - b - 2, b, 1, 1};
            meth.gradient.push_back(g);
        }
        meth.run_min = meth.gradient.back().t_min + 2;
        meth.equilibration_min = 3 + 0.1 * m;
        in.methods.push_back(meth);
    }
    const int per_row = 10000 / rows;
    for (int r = 0; r < rows; ++r)
        in.rows.push_back({"method-" + std::to_string(r % 20), per_row, ""});
    in.standby = chem::Standby{0.1, 600, std::nullopt};
    in.waste_capacity_ml = 1.0e5;
    return in;
}

struct Lines {
    std::array<chem::LineProfile, 4> profiles;
    Lines() {
        const auto& d = data();
        chem::RecipeRequest req;
        req.target_ph = 2.5;
        req.route = chem::Route::mix;
        req.acid = "phosphoric-acid";
        req.base = "sodium-dihydrogen-phosphate-monohydrate";
        req.concentration_mol_per_l = 0.02;
        chem::LineSpec a;
        a.field = "lines.A";
        a.parts.push_back({"", chem::design_recipe(d.reagents, req), 1.0});
        chem::LineSpec b;
        b.field = "lines.B";
        b.parts.push_back({"acetonitrile", std::nullopt, 1.0});
        chem::LineSpec c;
        c.field = "lines.C";
        c.parts.push_back({"methanol", std::nullopt, 1.0});
        chem::LineSpec w;
        w.field = "lines.D";
        w.parts.push_back({"water", std::nullopt, 1.0});
        w.additives.push_back({"formic-acid", chem::AmountUnit::percent_v, 0.1});
        const chem::LineSpec specs[4] = {a, b, c, w};
        for (int l = 0; l < 4; ++l)
            profiles[l] = chem::profile_line(d.solvents, d.reagents, specs[l]);
    }
};

void run_plan_and_checks(benchmark::State& state, int rows, bool pressure = false,
                         bool eluent = false) {
    const chem::SequenceInput in = big_plan(rows);
    static const Lines lines;
    const chem::Column column = bench::small_particle_column();
    const chem::Instrument instrument = bench::low_dwell_instrument();
    std::vector<std::optional<chem::PressureTrace>> traces;
    for (auto _ : state) {
        const chem::SequencePlan plan = chem::plan_sequence(in);
        chem::SequenceCheckInput c;
        if (pressure) {
            const std::array<const chem::LineProfile*, 4> p = {
                &lines.profiles[0], &lines.profiles[1], &lines.profiles[2], &lines.profiles[3]};
            traces.clear();
            for (const chem::Method& m : in.methods)
                traces.emplace_back(
                    chem::pressure_trace(data().solvents, p, m, column, instrument));
            c.pressure = &traces;
        }
        c.solvents = &data().solvents;
        c.input = &in;
        c.plan = &plan;
        for (int l = 0; l < 4; ++l)
            c.profiles[l] = &lines.profiles[l];
        c.detector = chem::Detector{chem::DetectorType::uv, 210.0, 10};
        c.column = chem::ColumnLimits{2, 8, 35.0};
        // With the reagent library the checks trace the eluent pH of every method (every row and
        // every 1 % of organic) for column-ph and buffer-range; without it they read the lines.
        if (eluent)
            c.reagents = &data().reagents;
        auto w = chem::check_sequence(c);
        benchmark::DoNotOptimize(plan.total_min);
        benchmark::DoNotOptimize(w.data());
    }
    state.counters["injections"] = 10000;
}

/// Plan and all checks, 10,000 rows of one injection each (worst case for the planner).
void BM_plan_10000_injections_rows_of_1(benchmark::State& state) {
    run_plan_and_checks(state, 10000);
}
/// The same with the pressure trace of each of the 20 methods and the pressure-limit check.
void BM_plan_10000_injections_rows_of_1_with_pressure(benchmark::State& state) {
    run_plan_and_checks(state, 10000, true);
}
/// The same with the eluent pH traces (target: adds ≤ 10 % to the plan above).
void BM_plan_10000_injections_rows_of_1_with_eluent_trace(benchmark::State& state) {
    run_plan_and_checks(state, 10000, false, true);
}
/// The eluent pH traces alone (every row and every 1 % of organic of the 20 methods), the part of
/// the benchmark above that the reagent library adds before the checks read them.
void BM_eluent_traces_20_methods(benchmark::State& state) {
    const chem::SequenceInput in = big_plan(10000);
    static const Lines lines;
    const chem::SequencePlan plan = chem::plan_sequence(in);
    chem::SequenceCheckInput c;
    c.solvents = &data().solvents;
    c.reagents = &data().reagents;
    c.input = &in;
    c.plan = &plan;
    for (int l = 0; l < 4; ++l)
        c.profiles[l] = &lines.profiles[l];
    c.column = chem::ColumnLimits{2, 8, 35.0};
    std::size_t points = 0;
    for (auto _ : state) {
        auto t = chem::eluent_traces(c);
        points = 0;
        for (const auto& tr : t)
            points += tr.points.size();
        benchmark::DoNotOptimize(t.data());
    }
    state.counters["points"] = static_cast<double>(points);
}
/// Plan and all checks, 500 rows of 20 injections.
void BM_plan_10000_injections_rows_of_20(benchmark::State& state) {
    run_plan_and_checks(state, 500);
}

/// The whole `sequence` command in process (JSON in, JSON out with 10,000 rows), for reference.
void BM_sequence_command_10000_rows(benchmark::State& state) {
    QJsonObject methods;
    const chem::SequenceInput in = big_plan(10000);
    for (const auto& m : in.methods) {
        QJsonArray g;
        for (const auto& r : m.gradient)
            g.append(QJsonObject{{"t_min", r.t_min},
                                 {"A", r.percent[0]},
                                 {"B", r.percent[1]},
                                 {"C", r.percent[2]},
                                 {"D", r.percent[3]}});
        methods[QString::fromStdString(m.name)] =
            QJsonObject{{"flow_ml_min", m.flow_ml_min},
                        {"gradient", g},
                        {"run_min", m.run_min},
                        {"equilibration_min", m.equilibration_min}};
    }
    QJsonArray seq;
    for (const auto& r : in.rows)
        seq.append(QJsonObject{{"method", QString::fromStdString(r.method)},
                               {"injections", r.injections}});
    QJsonObject lines;
    for (const char* l : {"A", "B", "C", "D"})
        lines[l] = QJsonObject{
            {"bottle_ml", 20000},
            {"residue_ml", 50},
            {"parts", QJsonArray{QJsonObject{{"solvent", "acetonitrile"}, {"fraction_v", 1}}}}};
    const QJsonObject doc{{"lines", lines},
                          {"methods", methods},
                          {"sequence", seq},
                          {"start", "2026-12-01T18:00:00"},
                          {"detector", QJsonObject{{"type", "uv"}, {"wavelength_nm", 210}}}};
    for (auto _ : state) {
        QJsonObject out = phaseplan::command_sequence(data(), doc, {});
        benchmark::DoNotOptimize(out);
    }
}

/// What `phaseplan-cli sequence` does after loading the libraries, on the demo night with 10,000
/// rows of one injection (the README's file /tmp/seq10k-cli.json, built here the same way):
/// the document's bytes parsed, planned, checked and written as the CLI's text.
void BM_cli_sequence_10000_rows(benchmark::State& state) {
    QFile f(QStringLiteral(SOURCE_DIR "/data/demo/overnight-sequence.json"));
    if (!f.open(QIODevice::ReadOnly)) {
        state.SkipWithError("cannot read data/demo/overnight-sequence.json");
        return;
    }
    QJsonObject demo = QJsonDocument::fromJson(f.readAll()).object();
    const QStringList methods = demo.value("methods").toObject().keys();
    QJsonArray rows;
    for (int i = 0; i < 10000; ++i)
        rows.append(QJsonObject{{"method", methods.at(i % methods.size())},
                                {"injections", 1},
                                {"label", QStringLiteral("row %1").arg(i)}});
    demo["sequence"] = rows;
    const QByteArray bytes = QJsonDocument(demo).toJson(QJsonDocument::Compact);
    std::size_t out_bytes = 0;
    for (auto _ : state) {
        const QJsonObject input = phaseplan::json::parse_document(bytes);
        const QByteArray text = phaseplan::command_sequence_text(data(), input, {});
        out_bytes = static_cast<std::size_t>(text.size());
        benchmark::DoNotOptimize(text.data());
    }
    state.counters["output_bytes"] = static_cast<double>(out_bytes);
}

} // namespace

BENCHMARK(BM_cli_sequence_10000_rows)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_plan_10000_injections_rows_of_1)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_plan_10000_injections_rows_of_1_with_pressure)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_plan_10000_injections_rows_of_1_with_eluent_trace)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_eluent_traces_20_methods)->Unit(benchmark::kMicrosecond);
BENCHMARK(BM_plan_10000_injections_rows_of_20)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_sequence_command_10000_rows)->Unit(benchmark::kMillisecond);
BENCHMARK_MAIN();
