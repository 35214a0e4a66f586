// flapline command-line tool: a thin shell over flapline::core, flapline::io and the validation
// runner. Exit status: 0 success, 1 output could not be written, 2 bad input (config, options),
// 3 numerical failure during a run, 4 a validation check failed, 5 a study finished with failed
// or unconverged cases, 130 a study was interrupted (Ctrl-C; rerun to resume).
#include <unistd.h>

#include <CLI/CLI.hpp>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <iostream>
#include <optional>
#include <sstream>
#include <string>
#include <vector>

#include "cli_common.hpp"
#include "flapline/aero/lifting_line.hpp"
#include "flapline/common/errors.hpp"
#include "flapline/io/comparison.hpp"
#include "flapline/io/config.hpp"
#include "flapline/io/plots.hpp"
#include "flapline/io/resolved.hpp"
#include "flapline/io/run_plots.hpp"
#include "flapline/io/writers.hpp"
#include "flapline/simulation/integrate.hpp"
#include "flapline/studies/runner.hpp"
#include "flapline/validation/validation.hpp"
#include "flapline/version.hpp"
#include "local_studies.hpp"
#include "sweep.hpp"

namespace {

using namespace flapline;
namespace fs = std::filesystem;

using namespace flapline::cli;

RunSummary run_model(const Model& model, const std::string& config,
                     const std::vector<std::string>& sets, bool quiet) {
  Progress progress(quiet, fs::path(config).filename().string());
  try {
    RunSummary s = simulate(model, progress.control());
    progress.done();
    return s;
  } catch (InputError& e) {  // e.g. too few steps for the lag states: point at the key
    progress.done();
    io::locate_in_config(e, config, sets);
    throw;
  }
}

// --- run ----------------------------------------------------------------------------------------
struct RunArgs {
  std::string config, out;
  std::vector<std::string> sets;
  bool quiet = false, full = false, plot = true;
  std::optional<double> state_space_time;
};

int run_command(const RunArgs& a) {
  const Model model = io::load_model(a.config, a.sets);
  if (a.state_space_time && model.aero_options().kind == ModelKind::quasi_steady)
    throw InputError("--state-space", format_number(*a.state_space_time),
                     "needs a model with states: model.kind wagner or lifting_line");
  const fs::path dir =
      a.out.empty() ? fs::path("results") / fs::path(a.config).stem() : fs::path(a.out);
  io::OutputFolder::check_claimable(dir);  // before the run, not after it
  const RunSummary summary = run_model(model, a.config, a.sets, a.quiet);
  io::OutputFolder folder(dir, io::OutputFolder::Ownership::whole);
  folder.add("history.csv", io::history_csv(summary));
  folder.add("summary.json", io::summary_json(summary, a.config, &model, a.sets));
  folder.add("resolved.yaml", io::resolved_yaml(model));
  folder.add("spanwise.csv", io::spanwise_csv(summary));
  folder.add("drive.csv", io::drive_csv(summary));
  std::string plot_note;
  if (a.plot) {
    if (io::gnuplot_available())
      for (auto& [name, content] : io::run_plots(summary, model)) folder.add(name, content);
    else
      plot_note = kNoGnuplot;
  }
  if (a.state_space_time) {
    Workspace ws(model);
    folder.add("state_space.json",
               io::state_space_json(frozen_state_space(model, ws, *a.state_space_time), model));
  }
  folder.commit();
  if (!a.quiet) {
    std::cout << (a.full ? summary.full_report() : summary.brief_report());
    std::cout << "results: " << dir.string()
              << "/ (history.csv, summary.json, spanwise.csv, drive.csv, resolved.yaml"
              << (a.state_space_time ? ", state_space.json" : "")
              << (a.plot && plot_note.empty() ? ", figures *.png and *.svg" : "") << ")\n";
    if (!plot_note.empty()) std::cout << plot_note << "\n";
  }
  return 0;
}

// --- compare ------------------------------------------------------------------------------------
struct CompareArgs {
  std::vector<std::string> configs, sets, variants;
  std::string out, model;
  int strips = 0, steps = 0, threads = 0;
  bool quiet = false, plot = true;
};

/// "--variant k=v;k=v" → overrides (';' separates, so values may hold YAML flow lists).
studies::CaseSpec parse_variant(const std::string& text) {
  studies::CaseSpec c;
  std::stringstream ss(text);
  for (std::string part; std::getline(ss, part, ';');) {
    const auto a = part.find_first_not_of(" \t"), b = part.find_last_not_of(" \t");
    if (a == std::string::npos) continue;
    part = part.substr(a, b - a + 1);
    const auto eq = part.find('=');
    if (eq == std::string::npos || eq == 0)
      throw InputError("--variant", "'" + text + "'",
                       "must be key.path=value pairs separated by ';'");
    c.overrides.push_back({part.substr(0, eq), part.substr(eq + 1), false});
  }
  if (c.overrides.empty())
    throw InputError("--variant", "'" + text + "'", "must hold at least one key.path=value");
  return c;
}

int compare_command(const CompareArgs& a) {
  // A comparison is a small study: every case built with the same model and resolution (the
  // first config's unless given here), run in parallel by the studies runner.
  if (!a.variants.empty() && a.configs.size() != 1)
    throw InputError("--variant", "'" + a.variants.front() + "'",
                     "compares variants of one config: give exactly one config file");
  if (a.variants.empty() && a.configs.size() < 2)
    throw InputError("compare", "'" + a.configs.front() + "'",
                     "needs two or more configs, or one config with --variant sets");
  const ModelSpec first = io::load_spec(a.configs.front(), a.sets);
  io::OutputFolder::check_claimable(a.out.empty() ? fs::path("results") / "comparison"
                                                  : fs::path(a.out));
  std::vector<std::string> common = a.sets;
  const std::string kind = a.model.empty() ? std::string(to_string(first.aero.kind)) : a.model;
  const int strips = a.strips > 0 ? a.strips : first.strips.count;
  const int steps = a.steps > 0 ? a.steps : first.simulation.steps_per_cycle;
  common.push_back("model.kind=" + kind);
  common.push_back("wing.strips=" + std::to_string(strips));
  common.push_back("simulation.steps_per_cycle=" + std::to_string(steps));
  common.push_back("simulation.samples_per_cycle=" +
                   std::to_string(first.simulation.samples_per_cycle));
  std::vector<io::CaseLoader> loaders;
  std::vector<studies::CaseSpec> specs;
  std::vector<std::string> names;
  for (std::size_t f = 0; f < a.configs.size(); ++f) {
    loaders.emplace_back(a.configs[f], common);
    if (a.variants.empty()) {
      specs.push_back({});
      specs.back().source = f;
      names.push_back(fs::path(a.configs[f]).stem().string());
    }
  }
  for (const std::string& v : a.variants) {
    specs.push_back(parse_variant(v));
    names.push_back(v);
  }
  // Every case must load before any runs (bad input: one line, nothing written).
  for (std::size_t c = 0; c < specs.size(); ++c) {
    try {
      (void)loaders[specs[c].source].build(specs[c]);
    } catch (InputError& e) {
      if (e.file().rfind("case (", 0) == 0)
        e.locate("command line (--variant " + names[c] + ")", 0);
      throw;
    }
  }
  std::vector<RunSummary> results(specs.size());
  std::vector<std::size_t> indices(specs.size());
  for (std::size_t c = 0; c < specs.size(); ++c) indices[c] = c;
  studies::RunnerOptions options;
  options.threads = a.threads;
  options.keep_history = true;  // the overlays plot the last cycle
  StudyProgress progress(a.quiet, "compare", specs.size());
  std::size_t finished = 0;
  studies::run_cases(
      specs, indices,
      [&loaders] {
        auto own = std::make_shared<std::vector<io::CaseLoader>>(loaders);
        return [own](const studies::CaseSpec& c) { return (*own)[c.source].build(c); };
      },
      options,
      [&](std::size_t i, const RunSummary& s) {
        results[i] = s;
        progress.update(++finished, 0);
      });
  progress.done();
  std::vector<io::ComparedCase> cases;
  for (std::size_t c = 0; c < specs.size(); ++c) {
    if (!has_results(results[c].status)) {  // the exit statuses of `run`
      const bool input = results[c].status == RunStatus::input_error;
      std::cerr << "flapline: " << (input ? "error" : "run stopped") << ": case " << names[c]
                << ": " << results[c].message << "\n";
      return input ? kExitInput : kExitNumerical;
    }
    cases.push_back({names[c], results[c]});
  }
  const std::string settings = "Every case run with model " + kind + ", " + std::to_string(strips) +
                               " strips per wing, " + std::to_string(steps) + " steps and " +
                               std::to_string(first.simulation.samples_per_cycle) +
                               " samples per cycle; cycle means of the last cycle.";
  const fs::path dir = a.out.empty() ? fs::path("results") / "comparison" : fs::path(a.out);
  io::OutputFolder folder(dir, io::OutputFolder::Ownership::whole);
  folder.add("comparison.csv", io::comparison_csv(cases));
  folder.add("comparison.md", io::comparison_markdown(cases, settings));
  std::string plot_note;
  if (a.plot) {
    if (io::gnuplot_available())
      for (auto& [name, content] : io::comparison_plots(cases)) folder.add(name, content);
    else
      plot_note = kNoGnuplot;
  }
  folder.commit();
  if (!a.quiet) {
    std::cout << settings << "\n";
    std::printf("%-32s", "quantity");
    for (const auto& c : cases) std::printf(" %14s", c.name.substr(0, 14).c_str());
    std::printf("\n");
    for (const auto& q : io::compared_quantities()) {
      std::printf("%-32s", q.label.c_str());
      for (const auto& c : cases) std::printf(" %14.5g", q.value(c.summary));
      std::printf("\n");
    }
    std::cout << "results: " << dir.string() << "/ (comparison.csv, comparison.md"
              << (a.plot && plot_note.empty() ? ", lift_overlay and power_overlay figures" : "")
              << ")\n";
    if (!plot_note.empty()) std::cout << plot_note << "\n";
    std::cout << kCautions << "\n";
  }
  return 0;
}

/// `--plot` (the default) and `--no-plot`, shown as two plain flags in --help.
void add_plot_flags(CLI::App* cmd, bool& plot, const std::string& what) {
  cmd->add_flag("--plot", plot, what + " with gnuplot (the default when gnuplot is installed)");
  cmd->add_flag_function(
      "--no-plot", [&plot](std::int64_t) { plot = false; }, "No figures");
}

// --- validate -----------------------------------------------------------------------------------
struct ValidateArgs {
  std::string out, only, cases_dir, integrator;
  bool quiet = false, plot = true;
};

int validate_command(const ValidateArgs& a) {
  const fs::path dir =
      a.cases_dir.empty() ? validation::default_cases_dir() : fs::path(a.cases_dir);
  const std::vector<validation::CaseSpec> cases = validation::load_cases(dir, a.only);
  std::vector<validation::CaseResult> results;
  const bool plots = a.plot && io::gnuplot_available();
  const fs::path out = a.out.empty() ? fs::path("results") / "validation" : fs::path(a.out);
  io::OutputFolder::check_claimable(out);
  io::OutputFolder folder(out, io::OutputFolder::Ownership::whole);
  bool all_ok = true;
  for (const auto& spec : cases) {
    const auto t0 = std::chrono::steady_clock::now();
    std::vector<std::string> overrides;
    if (!a.integrator.empty()) overrides.push_back("simulation.integrator=" + a.integrator);
    results.push_back(validation::run_case(spec, overrides));
    const validation::CaseResult& r = results.back();
    all_ok = all_ok && r.ok();
    if (plots)
      for (std::size_t f = 0; f < r.figures.size(); ++f)
        for (auto& [name, content] : io::render(
                 r.figures[f], spec.name + (f == 0 ? std::string() : "_" + std::to_string(f + 1))))
          folder.add(name, content);
    if (!a.quiet) {
      const long ok = std::count_if(r.checks.begin(), r.checks.end(),
                                    [](const validation::Check& c) { return c.pass; });
      std::printf("%-18s %3ld / %-3zu checks pass  %6.2f s  %s\n", spec.name.c_str(), ok,
                  r.checks.size(),
                  std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count(),
                  r.failure.empty() ? "" : ("could not run: " + r.failure).c_str());
      for (const auto& c : r.checks)
        if (!c.pass)
          std::printf("  FAIL %s: flapline %.6g, reference %.6g, error %.3g > %.3g\n",
                      c.quantity.c_str(), c.value, c.reference, c.error, c.tolerance);
    }
  }
  const std::string note =
      std::string(plots    ? "One figure per case beside this report."
                  : a.plot ? std::string(kNoGnuplot) + "."
                           : "Figures not requested.") +
      (a.integrator.empty()
           ? " Lag states stepped with each case's integrator (default exponential)."
           : " Lag states stepped with simulation.integrator = " + a.integrator +
                 " in every case.");
  folder.add("report.md", validation::report_markdown(results, note));
  folder.commit();
  if (!a.quiet)
    std::cout << (all_ok ? "all validation checks pass" : "VALIDATION FAILED")
              << "; report: " << (out / "report.md").string() << (plots ? "" : " (" + note + ")")
              << "\n";
  return all_ok ? 0 : kExitValidation;
}

}  // namespace

int main(int argc, char** argv) {
  CLI::App app{"flapline: unsteady blade-element aerodynamics of flapping and morphing wings",
               "flapline"};
  app.set_version_flag("--version", std::string("flapline ") + kVersion);
  app.require_subcommand(1);

  RunArgs run;
  CLI::App* cmd_run = app.add_subcommand(
      "run", "Run one case: force and moment histories, cycle means, power, spanwise loading");
  cmd_run->add_option("config", run.config, "YAML case file (keys: configs/README.md)")->required();
  cmd_run->add_option("-o,--out", run.out, "Output folder (default: results/<config name>)");
  cmd_run->add_option("--set", run.sets, "Override a config key, e.g. --set gait.frequency=30")
      ->take_all();
  cmd_run->add_flag("-q,--quiet", run.quiet, "Print nothing on success (and no progress)");
  cmd_run->add_flag("--full", run.full, "Print the full report instead of the short one");
  add_plot_flags(cmd_run, run.plot, "Render figures");
  cmd_run
      ->add_option("--state-space", run.state_space_time,
                   "Also write state_space.json: the frozen-time A, B, C, D of the lag states "
                   "at time T (s)")
      ->check(CLI::Validator(
          [](std::string& v) {
            try {
              const double t = std::stod(v);
              return t >= 0.0 && std::isfinite(t) ? std::string() : "must be a time >= 0 (s)";
            } catch (const std::exception&) {
              return std::string("must be a time >= 0 (s)");
            }
          },
          "TIME>=0"));

  CompareArgs cmp;
  CLI::App* cmd_cmp = app.add_subcommand(
      "compare", "Run several cases with the same model and resolution; tabulate and overlay them");
  cmd_cmp
      ->add_option("configs", cmp.configs,
                   "Two or more YAML case files, or one with --variant sets")
      ->required()
      ->expected(1, -1);
  cmd_cmp
      ->add_option("--variant", cmp.variants,
                   "Compare variants of one config: key.path=value pairs separated by ';' "
                   "(repeat for each variant)")
      ->take_all();
  cmd_cmp->add_option("--threads", cmp.threads, "Worker threads (default: the cores available)")
      ->check(CLI::Range(1, 4096));
  cmd_cmp->add_option("-o,--out", cmp.out, "Output folder (default: results/comparison)");
  cmd_cmp->add_option("--model", cmp.model, "Model for every case (default: the first config's)")
      ->check(CLI::IsMember({"quasi_steady", "wagner", "lifting_line"}));
  cmd_cmp
      ->add_option("--strips", cmp.strips,
                   "Strips per wing for every case (default: the first config's)")
      ->check(CLI::Range(1, 400));
  cmd_cmp
      ->add_option("--steps", cmp.steps,
                   "Steps per cycle for every case (default: the first config's)")
      ->check(CLI::Range(20, 100000));
  cmd_cmp->add_option("--set", cmp.sets, "Override a key in every config")->take_all();
  cmd_cmp->add_flag("-q,--quiet", cmp.quiet, "Print nothing on success");
  add_plot_flags(cmd_cmp, cmp.plot, "Overlay figures");

  SweepArgs sw;
  CLI::App* cmd_sweep = app.add_subcommand(
      "sweep", "Run a design of cases over config keys; one table row per case (sweep.csv)");
  cmd_sweep->add_option("config", sw.config, "YAML base case (keys: configs/README.md)")
      ->required();
  cmd_sweep
      ->add_option("--vary", sw.vary,
                   "KEY=VALUES: a list a,b,c, a range start:stop:count or "
                   "log:start:stop:count (repeat for more keys)")
      ->take_all();
  cmd_sweep->add_option("--design", sw.design, "grid (default), one_at_a_time or latin");
  cmd_sweep->add_option("--samples", sw.samples, "Samples of a latin design")
      ->check(CLI::Range(1, 100000000));
  cmd_sweep->add_option("--seed", sw.seed, "Seed of a latin design (default 1)")
      ->check(CLI::Range(std::uint64_t{0}, std::uint64_t{9007199254740992ull}));
  cmd_sweep->add_option("--cases", sw.cases_file,
                        "An explicit case table (CSV): one column per key path, one row per case");
  cmd_sweep->add_option("--threads", sw.threads, "Worker threads (default: the cores available)")
      ->check(CLI::Range(1, 4096));
  cmd_sweep->add_option("--shard", sw.shard, "K/N: run only cases K, K+N, K+2N, ... (batch jobs)");
  cmd_sweep->add_option("-o,--out", sw.out, "Output folder (default: results/<config name>_sweep)");
  cmd_sweep->add_option("--set", sw.sets, "Override a key of the base case")->take_all();
  cmd_sweep->add_flag("--keep-cases", sw.keep_cases, "Also write every case's run folder (cases/)");
  cmd_sweep->add_flag("-q,--quiet", sw.quiet, "Print nothing on success (and no progress)");
  add_plot_flags(cmd_sweep, sw.plot, "Sweep figures");

  MergeArgs mg;
  CLI::App* cmd_merge = app.add_subcommand(
      "merge", "Join the shard folders of one sweep into the table of an unsharded run");
  cmd_merge->add_option("shards", mg.shards, "The shard folders (all N of them)")
      ->required()
      ->expected(1, -1);
  cmd_merge->add_option("-o,--out", mg.out, "Output folder (default: results/merged_sweep)");
  cmd_merge->add_flag("-q,--quiet", mg.quiet, "Print nothing on success");
  add_plot_flags(cmd_merge, mg.plot, "Sweep figures");

  TrimArgs tr;
  CLI::App* cmd_trim = app.add_subcommand(
      "trim", "Find the free key values that meet targets or balance the vehicle in steady flight");
  cmd_trim->add_option("config", tr.config, "YAML case file")->required();
  cmd_trim->add_option("--free", tr.frees, "KEY=LO:HI: a free key and its bounds (repeat)")
      ->take_all();
  cmd_trim
      ->add_option("--target", tr.targets,
                   "QUANTITY=VALUE: a summary.json key path and its target (repeat)")
      ->take_all();
  cmd_trim->add_flag("--balance", tr.balance, "Steady flight of the vehicle instead of targets");
  cmd_trim->add_option("--tolerance", tr.tolerance,
                       "Scaled residual RMS for 'trimmed' (default 1e-6)");
  cmd_trim->add_option("--threads", tr.threads, "Worker threads (default: the cores available)")
      ->check(CLI::Range(1, 4096));
  cmd_trim->add_option("-o,--out", tr.out, "Output folder (default: results/<config name>_trim)");
  cmd_trim->add_option("--set", tr.sets, "Override a config key")->take_all();
  cmd_trim->add_flag("-q,--quiet", tr.quiet, "Print nothing on success");
  add_plot_flags(cmd_trim, tr.plot, "Figures");

  DerivativesArgs dv, md;
  CLI::App* cmd_der = app.add_subcommand(
      "derivatives", "Control and stability derivatives of the cycle-mean forces, moments, power");
  CLI::App* cmd_modes = app.add_subcommand(
      "modes", "Wing-beat-averaged flight dynamics: linear model, eigenvalues and modes");
  for (auto [cmd, args] :
       {std::pair<CLI::App*, DerivativesArgs*>{cmd_der, &dv}, {cmd_modes, &md}}) {
    cmd->add_option("config", args->config, "YAML case file")->required();
    cmd->add_option("--param", args->params, "A gait or config key to differentiate by (repeat)")
        ->take_all();
    cmd->add_option("--threads", args->threads, "Worker threads (default: the cores available)")
        ->check(CLI::Range(1, 4096));
    cmd->add_option("-o,--out", args->out, "Output folder");
    cmd->add_option("--set", args->sets, "Override a config key")->take_all();
    cmd->add_flag("-q,--quiet", args->quiet, "Print nothing on success");
    add_plot_flags(cmd, args->plot, "Figures");
  }
  cmd_der->add_flag("--flight", dv.flight,
                    "Also the stability derivatives: body velocity u, v, w and rates p, q, r");

  ValidateArgs val;
  CLI::App* cmd_val = app.add_subcommand(
      "validate", "Run the validation cases against classical results and write report.md");
  cmd_val->add_option("-o,--out", val.out, "Output folder (default: results/validation)");
  cmd_val->add_option("--case", val.only, "Run only this case");
  cmd_val->add_option("--cases-dir", val.cases_dir,
                      "Folder of case folders (default: the built-in one)");
  cmd_val
      ->add_option("--integrator", val.integrator,
                   "Step the lag states with this integrator in every case (default: each "
                   "case's own, i.e. the default exponential)")
      ->check(CLI::IsMember({"exponential", "rk4"}));
  cmd_val->add_flag("-q,--quiet", val.quiet, "Print nothing");
  add_plot_flags(cmd_val, val.plot, "One figure per case");

  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    const int code = app.exit(e);
    return code == 0 ? 0 : kExitInput;
  }

  try {
    if (*cmd_run) return run_command(run);
    if (*cmd_cmp) return compare_command(cmp);
    if (*cmd_sweep) {
      sw.design_given = cmd_sweep->count("--design") > 0;
      sw.seed_given = cmd_sweep->count("--seed") > 0;
      return sweep_command(sw);
    }
    if (*cmd_merge) return merge_command(mg);
    if (*cmd_trim) return trim_command(tr);
    if (*cmd_der) return derivatives_command(dv);
    if (*cmd_modes) return modes_command(md);
    if (*cmd_val) return validate_command(val);
  } catch (const InputError& e) {
    std::cerr << "flapline: error: " << e.what() << "\n";
    return kExitInput;
  } catch (const NumericalError& e) {
    std::cerr << "flapline: run stopped: " << e.what() << "\n";
    return kExitNumerical;
  } catch (const std::exception& e) {
    std::cerr << "flapline: " << e.what() << "\n";
    return kExitWrite;
  }
  return 0;
}
