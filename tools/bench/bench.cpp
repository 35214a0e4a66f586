// Time per wing-beat of each model (DESIGN §8: 20 strips per wing, 400 steps per cycle, one core).
// Figures go to the docs and closing notes; no test asserts a time.
#include <benchmark/benchmark.h>

#include "flapline/samples/samples.hpp"
#include "flapline/simulation/integrate.hpp"

namespace {

using namespace flapline;

ModelSpec bench_spec(ModelSpec s, int cycles) {
  s.strips.count = 20;
  s.simulation.steps_per_cycle = 400;
  s.simulation.samples_per_cycle = 100;
  s.simulation.min_cycles = s.simulation.max_cycles = cycles;
  return s;
}

// Each iteration is a complete 8-cycle run from a fresh Workspace, so the per-phase caches are
// filled in the first cycle and reused in the other seven: the cost a user sees per wing-beat.
void run_cycles(benchmark::State& state, const ModelSpec& spec) {
  const int cycles = 8;
  const Model model(bench_spec(spec, cycles));
  for (auto _ : state) {
    Workspace ws(model);
    RunSummary r = simulate(model, ws);
    benchmark::DoNotOptimize(r.averages.mean.force);
  }
  state.counters["ms_per_wingbeat"] = benchmark::Counter(
      static_cast<double>(cycles) * 1e-3,
      benchmark::Counter::kIsIterationInvariantRate | benchmark::Counter::kInvert);
}

ModelSpec with_model(ModelSpec s, ModelKind kind) {
  s.aero.kind = kind;
  return s;
}

void quasi_steady_hover(benchmark::State& state) { run_cycles(state, samples::hover_insect()); }
void quasi_steady_forward(benchmark::State& state) { run_cycles(state, samples::forward_bat()); }
void wagner_hover(benchmark::State& state) {
  run_cycles(state, with_model(samples::hover_insect(), ModelKind::wagner));
}
void wagner_forward(benchmark::State& state) {
  run_cycles(state, with_model(samples::forward_bat(), ModelKind::wagner));
}

}  // namespace

BENCHMARK(quasi_steady_hover)->Unit(benchmark::kMillisecond);
BENCHMARK(quasi_steady_forward)->Unit(benchmark::kMillisecond);
BENCHMARK(wagner_hover)->Unit(benchmark::kMillisecond);
BENCHMARK(wagner_forward)->Unit(benchmark::kMillisecond);
BENCHMARK_MAIN();
