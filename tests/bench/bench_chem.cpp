// Speed of the chemistry core (targets on one core: solve <= 5 µs, recipe <= 50 µs).
//   build/tests/bench/bench_chem --benchmark_repetitions=5 --benchmark_report_aggregates_only=true
#include "chem/eluent.h"
#include "chem/equilibrium.h"
#include "chem/line.h"
#include "chem/recipe.h"
#include "core/app_data.h"

#include <benchmark/benchmark.h>

namespace {

const phaseplan::AppData& data() {
    static const phaseplan::AppData d = phaseplan::load_app_data(SOURCE_DIR "/data");
    return d;
}

void BM_SolveThreeSystems(benchmark::State& state) {
    const auto& lib = data().reagents;
    // Ammonium acetate + sodium dihydrogen phosphate + tris: four acid-base systems, three
    // reagents.
    const std::vector<chem::Component> mix = {{&lib.reagent("ammonium-acetate"), 0.01},
                                              {&lib.reagent("sodium-dihydrogen-phosphate"), 0.02},
                                              {&lib.reagent("tris"), 0.015}};
    for (auto _ : state)
        benchmark::DoNotOptimize(chem::solve(lib, mix, 30.0));
}
BENCHMARK(BM_SolveThreeSystems)->Unit(benchmark::kMicrosecond);

void BM_SolvePhosphateReference(benchmark::State& state) {
    const auto& lib = data().reagents;
    const std::vector<chem::Component> mix = {
        {&lib.reagent("potassium-dihydrogen-phosphate"), 0.025},
        {&lib.reagent("disodium-hydrogen-phosphate"), 0.025}};
    for (auto _ : state)
        benchmark::DoNotOptimize(chem::solve(lib, mix, 25.0));
}
BENCHMARK(BM_SolvePhosphateReference)->Unit(benchmark::kMicrosecond);

chem::RecipeRequest mix_request() {
    chem::RecipeRequest r;
    r.target_ph = 2.5;
    r.temperature_c = 22;
    r.volume_ml = 2000;
    r.route = chem::Route::mix;
    r.acid = "phosphoric-acid";
    r.base = "sodium-dihydrogen-phosphate-monohydrate";
    r.concentration_mol_per_l = 0.02;
    return r;
}

void BM_RecipeMixAtConcentration(benchmark::State& state) {
    const auto req = mix_request();
    for (auto _ : state)
        benchmark::DoNotOptimize(chem::design_recipe(data().reagents, req));
}
BENCHMARK(BM_RecipeMixAtConcentration)->Unit(benchmark::kMicrosecond);

chem::RecipeRequest titrate_request(double ph, const char* weigh, const char* titrant, double c) {
    chem::RecipeRequest r;
    r.target_ph = ph;
    r.route = chem::Route::titrate;
    r.weigh = weigh;
    r.titrant = titrant;
    r.concentration_mol_per_l = c;
    return r;
}

void BM_RecipeTitrate(benchmark::State& state) {
    auto r = titrate_request(8.0, "tris", "hydrochloric-acid", 0.05);
    r.titrant_mol_per_l = 1.0;
    for (auto _ : state)
        benchmark::DoNotOptimize(chem::design_recipe(data().reagents, r));
}
BENCHMARK(BM_RecipeTitrate)->Unit(benchmark::kMicrosecond);

void BM_RecipeTitrateNeatSalt(benchmark::State& state) {
    // LC-MS: 10 mM ammonium formate brought to pH 3.0 with formic acid as supplied (searched up to
    // 10 mol/L of titrant).
    auto r = titrate_request(3.0, "ammonium-formate", "formic-acid", 0.01);
    r.titrant_form = chem::TitrantForm::neat;
    r.basis = chem::ConcentrationBasis::salt;
    for (auto _ : state)
        benchmark::DoNotOptimize(chem::design_recipe(data().reagents, r));
}
BENCHMARK(BM_RecipeTitrateNeatSalt)->Unit(benchmark::kMicrosecond);

void BM_RecipeMixAtIonicStrength(benchmark::State& state) {
    auto req = mix_request();
    req.concentration_mol_per_l.reset();
    req.ionic_strength_mol_per_l = 0.05;
    for (auto _ : state)
        benchmark::DoNotOptimize(chem::design_recipe(data().reagents, req));
}
BENCHMARK(BM_RecipeMixAtIonicStrength)->Unit(benchmark::kMicrosecond);

/// 20 mmol/L phosphate pH 2.5 (line A) and acetonitrile (line B) at 35 °C.
const chem::EluentModel& phosphate_acetonitrile() {
    const auto& d = data();
    static const chem::LineProfile pa = [&] {
        chem::LineSpec a;
        a.field = "lines.A";
        a.parts.push_back({"", chem::design_recipe(d.reagents, mix_request()), 1.0});
        return chem::profile_line(d.solvents, d.reagents, a);
    }();
    static const chem::LineProfile pb = [&] {
        chem::LineSpec b;
        b.field = "lines.B";
        b.parts.push_back({"acetonitrile", std::nullopt, 1.0});
        return chem::profile_line(d.solvents, d.reagents, b);
    }();
    static const chem::EluentModel model(d.solvents, d.reagents, {&pa, &pb}, 35.0);
    return model;
}

/// One eluent solve at 55 % B (target ≤ 5 µs): the pH only (EluentModel::point), as the gradient
/// trace and the checks use it.
void BM_EluentPoint(benchmark::State& state) {
    const std::vector<double> percent = {45, 55};
    for (auto _ : state)
        benchmark::DoNotOptimize(phosphate_acetonitrile().point(percent));
}
BENCHMARK(BM_EluentPoint)->Unit(benchmark::kMicrosecond);

/// The full eluent result (the `eluent` command's work without JSON): blend, s_s pH, the aqueous
/// part's w_w pH, pKa list and warnings.
void BM_EluentFull(benchmark::State& state) {
    const std::vector<double> percent = {45, 55};
    for (auto _ : state)
        benchmark::DoNotOptimize(phosphate_acetonitrile().solve(percent));
}
BENCHMARK(BM_EluentFull)->Unit(benchmark::kMicrosecond);

} // namespace

BENCHMARK_MAIN();
