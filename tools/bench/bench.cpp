// Time per wing-beat of each model (DESIGN §8: 20 strips per wing, 400 steps per cycle, one core).
// Figures go to the docs and closing notes; no test asserts a time.
#include <benchmark/benchmark.h>

#include <Eigen/LU>

#include <memory>
#include <optional>

#include "flapline/aero/lifting_line.hpp"
#include "flapline/io/config.hpp"
#include "flapline/samples/samples.hpp"
#include "flapline/simulation/integrate.hpp"
#include "flapline/studies/derivatives.hpp"
#include "flapline/studies/runner.hpp"
#include "flapline/studies/trim.hpp"

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
// `strips`/`spacing`: as bench_spec sets them (20 per wing, the spec's spacing) unless given.
void run_cycles(benchmark::State& state, const ModelSpec& spec, int strips = 20,
                std::optional<StripSpacing> spacing = std::nullopt) {
  const int cycles = 8;
  ModelSpec s = bench_spec(spec, cycles);
  s.strips.count = strips;
  if (spacing) s.strips.spacing = *spacing;
  const Model model(s);
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

void quasi_steady_hover(benchmark::State& state) {
  run_cycles(state, samples::hover_insect());
}
void quasi_steady_forward(benchmark::State& state) {
  run_cycles(state, samples::forward_bat());
}
void wagner_hover(benchmark::State& state) {
  run_cycles(state, with_model(samples::hover_insect(), ModelKind::wagner));
}
void wagner_forward(benchmark::State& state) {
  run_cycles(state, with_model(samples::forward_bat(), ModelKind::wagner));
}

void lifting_line_hover(benchmark::State& state) {
  run_cycles(state, with_model(samples::hover_insect(), ModelKind::lifting_line));
}
void lifting_line_forward(benchmark::State& state) {
  run_cycles(state, with_model(samples::forward_bat(), ModelKind::lifting_line));
}

// Time per wing-beat against the strip count per wing (hover demo, fresh 8-cycle runs from rest,
// 400 steps). `uniform`: strips of equal width (comparable with every earlier version); `cosine`:
// strips clustered at the tip.
void hover_strips(benchmark::State& state, ModelKind kind, StripSpacing spacing) {
  run_cycles(state, with_model(samples::hover_insect(), kind), static_cast<int>(state.range(0)),
             spacing);
}
void hover_uniform_quasi_steady(benchmark::State& state) {
  hover_strips(state, ModelKind::quasi_steady, StripSpacing::uniform);
}
void hover_uniform_wagner(benchmark::State& state) {
  hover_strips(state, ModelKind::wagner, StripSpacing::uniform);
}
void hover_uniform_lifting_line(benchmark::State& state) {
  hover_strips(state, ModelKind::lifting_line, StripSpacing::uniform);
}
void hover_cosine_quasi_steady(benchmark::State& state) {
  hover_strips(state, ModelKind::quasi_steady, StripSpacing::cosine);
}
void hover_cosine_wagner(benchmark::State& state) {
  hover_strips(state, ModelKind::wagner, StripSpacing::cosine);
}
void hover_cosine_lifting_line(benchmark::State& state) {
  hover_strips(state, ModelKind::lifting_line, StripSpacing::cosine);
}

// Cost breakdown of one uncached lifting-line stage (20 strips per wing): assembling K, factorising
// I − D₀K, and the rest of a derivative once the phase is cached.
const Model& forward_lifting_line() {
  static const Model model(
      bench_spec(with_model(samples::forward_bat(), ModelKind::lifting_line), 8));
  return model;
}
void lifting_line_assemble_k(benchmark::State& state) {
  const Model& model = forward_lifting_line();
  Workspace ws(model);
  double t = 0.0;
  for (auto _ : state) {
    Eigen::MatrixXd k = influence_matrix(model, ws, t);
    benchmark::DoNotOptimize(k.data());
    t += 1e-4;
  }
}
void lifting_line_factorise(benchmark::State& state) {
  const Model& model = forward_lifting_line();
  Workspace ws(model);
  const Eigen::MatrixXd k = influence_matrix(model, ws, 0.1);
  const Eigen::Index n2 = model.strip_count();
  const Eigen::MatrixXd s = Eigen::MatrixXd::Identity(n2, n2) - 0.5 * k;
  Eigen::PartialPivLU<Eigen::MatrixXd> lu(n2);
  for (auto _ : state) {
    lu.compute(s);
    benchmark::DoNotOptimize(lu.matrixLU().data());
  }
}
void lifting_line_uncached_derivative(benchmark::State& state) {
  const Model& model = forward_lifting_line();
  Workspace ws(model);  // no prepare_run: every stage assembles and factorises
  attach_aero(model, ws).initial_state(model, ws, 0.0, StartMode::quasi_steady, ws.state);
  Eigen::VectorXd dx(ws.state.size());
  const double dt = model.period() / model.simulation().steps_per_cycle;
  for (auto _ : state) {
    attach_aero(model, ws).derivative(model, ws, dt, ws.state, dx);
    benchmark::DoNotOptimize(dx.data());
  }
}
void lifting_line_cached_derivative(benchmark::State& state) {
  const Model& model = forward_lifting_line();
  Workspace ws(model);
  attach_aero(model, ws).prepare_run(model, ws);  // allocates the per-phase caches
  attach_aero(model, ws).initial_state(model, ws, 0.0, StartMode::quasi_steady, ws.state);
  Eigen::VectorXd dx(ws.state.size());
  const double dt = model.period() / model.simulation().steps_per_cycle;
  attach_aero(model, ws).derivative(model, ws, dt, ws.state, dx);  // fills the phase
  for (auto _ : state) {
    attach_aero(model, ws).derivative(model, ws, dt, ws.state, dx);
    benchmark::DoNotOptimize(dx.data());
  }
}

// Sweeps (design studies): the hover demo config, every case built from YAML with its
// override and run to convergence (quasi_steady) or for a fixed-tolerance run from rest (wagner),
// as `flapline sweep` does; argument = threads.
void sweep(benchmark::State& state, const char* model, int cases) {
  const io::CaseLoader loader(
      std::string(FLAPLINE_SOURCE_DIR) + "/configs/hover_insect.yaml",
      {std::string("model.kind=") + model, "wing.strips=20", "simulation.steps_per_cycle=400",
       "simulation.samples_per_cycle=100"});
  studies::Design d;
  d.keys = {studies::parse_vary("gait.frequency=20:30:" + std::to_string(cases))};
  const std::vector<studies::CaseSpec> specs = studies::make_cases(d);
  std::vector<std::size_t> all(specs.size());
  for (std::size_t i = 0; i < all.size(); ++i) all[i] = i;
  studies::RunnerOptions options;
  options.threads = static_cast<int>(state.range(0));
  long converged = 0;
  for (auto _ : state) {
    converged = 0;
    studies::run_cases(
        specs, all, io::case_builders(loader), options,
        [&](std::size_t, const RunSummary& r) { converged += r.status == RunStatus::converged; });
  }
  state.counters["cases"] = static_cast<double>(cases);
  state.counters["converged"] = static_cast<double>(converged);
}
void sweep_quasi_steady_hover_10000(benchmark::State& state) {
  sweep(state, "quasi_steady", 10000);
}
void sweep_wagner_hover_1000(benchmark::State& state) {
  sweep(state, "wagner", 1000);
}

// Trim and derivatives of the hover vehicle demo (inner runs as `flapline trim` makes them).
studies::Parameter free_key(const io::CaseLoader& l, const char* key, double lo, double hi) {
  studies::Parameter p;
  p.name = key;
  p.base = *l.number_at(key);
  p.low = lo;
  p.high = hi;
  return p;
}
void trim_hover(benchmark::State& state, const char* model) {
  const io::CaseLoader loader(std::string(FLAPLINE_SOURCE_DIR) + "/configs/hover_vehicle.yaml",
                              {std::string("model.kind=") + model, "wing.strips=20",
                               "simulation.start=periodic", "simulation.tolerance=1e-9"});
  const std::vector<studies::Parameter> free{
      free_key(loader, "gait.left.stroke.amplitude", 40, 75),
      free_key(loader, "gait.right.stroke.amplitude", 40, 75),
      free_key(loader, "gait.pitch.mean", 60, 120)};
  const std::vector<studies::Target> targets{
      {"cycle_mean.lift_N", 0.0196133}, {"cycle_mean.L_roll_Nm", 2e-5}, {"cycle_mean.X_N", 0.0}};
  studies::TrimOptions o;
  o.runner.threads = static_cast<int>(state.range(0));
  int runs = 0;
  for (auto _ : state) {
    const studies::TrimResult r = studies::trim(free, targets, {}, io::case_builders(loader), o);
    runs = r.runs;
    benchmark::DoNotOptimize(r.values.data());
  }
  state.counters["runs"] = runs;
}
void trim_quasi_steady_3_free(benchmark::State& state) {
  trim_hover(state, "quasi_steady");
}
void trim_lifting_line_3_free(benchmark::State& state) {
  trim_hover(state, "lifting_line");
}
void derivatives_6_params_and_flight(benchmark::State& state) {
  const io::CaseLoader loader(std::string(FLAPLINE_SOURCE_DIR) + "/configs/level_bat.yaml",
                              {"simulation.start=periodic", "simulation.tolerance=1e-9"});
  std::vector<studies::Parameter> params = studies::Parameter::flight_state();
  for (const char* k :
       {"gait.frequency", "gait.stroke.amplitude", "gait.pitch.mean", "gait.pitch.amplitude",
        "gait.span_ratio.amplitude", "vehicle.attitude.pitch"})
    params.push_back(free_key(loader, k, -1e300, 1e300));
  studies::RunnerOptions o;
  o.threads = static_cast<int>(state.range(0));
  for (auto _ : state) {
    const studies::DerivativeTable t = studies::derivatives(
        params, studies::derivative_quantities(), {}, io::case_builders(loader), o);
    benchmark::DoNotOptimize(t.value.data());
  }
}

}  // namespace

BENCHMARK(trim_quasi_steady_3_free)->Arg(2)->UseRealTime()->Unit(benchmark::kMillisecond);
BENCHMARK(trim_lifting_line_3_free)->Arg(2)->Iterations(1)->UseRealTime()->Unit(benchmark::kSecond);
BENCHMARK(derivatives_6_params_and_flight)->Arg(2)->UseRealTime()->Unit(benchmark::kMillisecond);
BENCHMARK(sweep_quasi_steady_hover_10000)
    ->Arg(1)
    ->Arg(2)
    ->Iterations(1)
    ->UseRealTime()
    ->Unit(benchmark::kSecond);
BENCHMARK(sweep_wagner_hover_1000)
    ->Arg(1)
    ->Arg(2)
    ->Iterations(1)
    ->UseRealTime()
    ->Unit(benchmark::kSecond);
BENCHMARK(lifting_line_hover)->Unit(benchmark::kMillisecond);
BENCHMARK(lifting_line_forward)->Unit(benchmark::kMillisecond);
BENCHMARK(lifting_line_assemble_k)->Unit(benchmark::kMicrosecond);
BENCHMARK(lifting_line_factorise)->Unit(benchmark::kMicrosecond);
BENCHMARK(lifting_line_uncached_derivative)->Unit(benchmark::kMicrosecond);
BENCHMARK(lifting_line_cached_derivative)->Unit(benchmark::kMicrosecond);
BENCHMARK(quasi_steady_hover)->Unit(benchmark::kMillisecond);
BENCHMARK(quasi_steady_forward)->Unit(benchmark::kMillisecond);
BENCHMARK(wagner_hover)->Unit(benchmark::kMillisecond);
BENCHMARK(wagner_forward)->Unit(benchmark::kMillisecond);
BENCHMARK(hover_uniform_quasi_steady)
    ->Arg(20)
    ->Arg(40)
    ->Arg(100)
    ->Arg(200)
    ->Unit(benchmark::kMillisecond);
BENCHMARK(hover_uniform_wagner)
    ->Arg(20)
    ->Arg(40)
    ->Arg(100)
    ->Arg(200)
    ->Unit(benchmark::kMillisecond);
BENCHMARK(hover_uniform_lifting_line)->Arg(20)->Arg(40)->Unit(benchmark::kMillisecond);
BENCHMARK(hover_uniform_lifting_line)->Arg(100)->Arg(200)->Iterations(1)->Unit(benchmark::kSecond);
// Cosine strips (the default) on the beta planform need the exponential integrator (the default):
// earlier versions refuse these cases at 400 steps.
BENCHMARK(hover_cosine_quasi_steady)
    ->Arg(20)
    ->Arg(40)
    ->Arg(100)
    ->Arg(200)
    ->Unit(benchmark::kMillisecond);
BENCHMARK(hover_cosine_wagner)->Arg(20)->Arg(40)->Arg(100)->Arg(200)->Unit(benchmark::kMillisecond);
BENCHMARK(hover_cosine_lifting_line)->Arg(20)->Arg(40)->Unit(benchmark::kMillisecond);
BENCHMARK(hover_cosine_lifting_line)->Arg(100)->Arg(200)->Iterations(1)->Unit(benchmark::kSecond);
BENCHMARK_MAIN();
