// The pressure trace of one method (issue 12): a 10-row gradient sampled every 0.1 min.
// Target on one core: ≤ 50 µs.
//   build/bench_pressure --benchmark_repetitions=5 --benchmark_report_aggregates_only=true
#include "chem/pressure.h"
#include "core/app_data.h"
#include "pressure_fixture.h"

#include <benchmark/benchmark.h>

namespace {

const phaseplan::AppData& data() {
    static const phaseplan::AppData d =
        phaseplan::load_app_data(QStringLiteral(SOURCE_DIR "/data"));
    return d;
}

chem::LineProfile neat(const std::string& id, bool aqueous) {
    chem::LineProfile p;
    p.described = true;
    p.solvent_fraction_v[id] = 1.0;
    (aqueous ? p.aqueous_fraction_v : p.organic_fraction_v) = 1.0;
    return p;
}

/// Water, acetonitrile and methanol lines; 10 rows over 20 min, 25 min run, 5 min re-equilibration
/// (301 points at 0.1 min).
chem::Method ten_rows() {
    chem::Method m;
    m.name = "ten-rows";
    m.flow_ml_min = 0.5;
    for (int r = 0; r < 10; ++r) {
        const double b = 5 + 80.0 * r / 9, c = r % 2 ? 5 : 0;
        m.gradient.push_back({r * 20.0 / 9, {100 - b - c, b, c, 0}});
    }
    m.run_min = 25;
    m.equilibration_min = 5;
    return m;
}

void BM_pressure_trace_10_rows(benchmark::State& state) {
    static const chem::LineProfile a = neat("water", true), b = neat("acetonitrile", false),
                                   c = neat("methanol", false);
    const std::array<const chem::LineProfile*, 4> lines = {&a, &b, &c, nullptr};
    const chem::Method m = ten_rows();
    const chem::Column col = bench::small_particle_column();
    chem::Instrument in = bench::low_dwell_instrument();
    in.system_pressure_bar = 30;
    for (auto _ : state) {
        const chem::PressureTrace t = chem::pressure_trace(data().solvents, lines, m, col, in, 0.1);
        benchmark::DoNotOptimize(t.max_pressure_bar);
    }
    state.counters["points"] = 301;
}

} // namespace

BENCHMARK(BM_pressure_trace_10_rows)->Unit(benchmark::kMicrosecond);
BENCHMARK_MAIN();
