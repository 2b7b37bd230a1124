// What one edit costs in the app's models (no drawing): the buffer designer's recompute (the
// recipe and 2 × 41 solves for its curves; the automatic rename and the save follow when the
// edit settles, BM_BufferDesignerEditSettled), the plan's recompute (the sequence command and the
// bottle levels) and the four lines. The full edit-to-frame time, drawing included, comes from
// `phaseplan --measure`. Target: the model part well under one 16 ms frame.
//   build/bench_gui_recompute --benchmark_repetitions=5 --benchmark_report_aggregates_only=true
#include "buffer_designer.h"
#include "lines_model.h"
#include "plan.h"
#include "workspace.h"

#include <QCoreApplication>
#include <QTemporaryDir>

#include <benchmark/benchmark.h>

#include <memory>

using namespace phaseplan::gui;

namespace {

struct Fixture {
    QTemporaryDir dir;
    Workspace ws;
    Plan plan;
    LinesModel lines;
    BufferDesigner designer;
    Fixture() {
        ws.setDatabasePath(dir.filePath("bench.sqlite"));
        ws.setDataDir(QStringLiteral(SOURCE_DIR "/data"));
        if (!ws.open())
            qFatal("%s", qPrintable(ws.errorMessage()));
        plan.setRestore(true);
        plan.setWorkspace(&ws); // the overnight demo
        lines.setPlan(&plan);
        designer.setWorkspace(&ws);
        designer.setPlan(&plan);
        designer.openBuffer(plan.lineBufferRef("A")); // line A's buffer, held by reference
    }
};

Fixture& fixture() {
    static Fixture f;
    return f;
}

void BM_BufferDesignerEdit(benchmark::State& state) {
    Fixture& f = fixture();
    // Its own buffer: the edit does not reach the plan.
    BufferDesigner d;
    d.setWorkspace(&f.ws);
    d.newBuffer(); // a new saved buffer (pH 7 phosphate by default), not line A's pH 2.5 one
    d.setRoute("mix");
    d.setSystem("phosphate");
    d.setAcid("sodium-dihydrogen-phosphate-monohydrate");
    d.setBase("disodium-hydrogen-phosphate-heptahydrate");
    double ph = 6.8;
    for (auto _ : state) {
        ph = ph > 7.4 ? 6.8 : ph + 0.05;
        d.setTargetPh(ph);
        benchmark::DoNotOptimize(d.predictedPh());
    }
    if (!d.valid())
        state.SkipWithError(qPrintable(d.errorMessage()));
}
BENCHMARK(BM_BufferDesignerEdit)->Unit(benchmark::kMillisecond);

// What the edit leaves for when it settles (the autosave, 300 ms after the last edit): the
// automatic rename and the save, both checked writes to the database, with the edit itself.
// Every other edit here changes the name ("… pH 6.8" to "… pH 6.9").
void BM_BufferDesignerEditSettled(benchmark::State& state) {
    Fixture& f = fixture();
    BufferDesigner d;
    d.setWorkspace(&f.ws);
    d.newBuffer();
    double ph = 6.8;
    for (auto _ : state) {
        ph = ph > 7.4 ? 6.8 : ph + 0.05;
        d.setTargetPh(ph);
        d.flushAutosave();
        benchmark::DoNotOptimize(d.bufferName());
    }
    if (!d.valid() || !d.conflictMessage().isEmpty())
        state.SkipWithError(qPrintable(d.errorMessage() + d.conflictMessage()));
}
BENCHMARK(BM_BufferDesignerEditSettled)->Unit(benchmark::kMillisecond);

void BM_LineBufferEditWithPlanAndLines(benchmark::State& state) {
    Fixture& f = fixture();
    double ph = 2.4;
    for (auto _ : state) {
        ph = ph > 2.8 ? 2.4 : ph + 0.05;
        f.designer.setTargetPh(ph); // the designer's recompute, written into line A
        f.plan.recomputeNow();      // the sequence and the bottle levels
        f.lines.recomputeNow();     // the four lines
        benchmark::DoNotOptimize(f.plan.endTime());
    }
    if (!f.plan.valid())
        state.SkipWithError(qPrintable(f.plan.errorMessage()));
}
BENCHMARK(BM_LineBufferEditWithPlanAndLines)->Unit(benchmark::kMillisecond);

void BM_PlanRecompute(benchmark::State& state) {
    Fixture& f = fixture();
    int minutes = 0;
    for (auto _ : state) {
        f.plan.shiftStart(++minutes % 2 ? 15 : -15);
        f.plan.recomputeNow();
        benchmark::DoNotOptimize(f.plan.wasteMl());
    }
}
BENCHMARK(BM_PlanRecompute)->Unit(benchmark::kMillisecond);

} // namespace

int main(int argc, char** argv) {
    QCoreApplication app(argc, argv);
    benchmark::Initialize(&argc, argv);
    benchmark::RunSpecifiedBenchmarks();
    benchmark::Shutdown();
    return 0;
}
