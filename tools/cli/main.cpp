// flapline command-line tool. Exit status: 0 success, 1 output could not be written,
// 2 bad input (config, options), 3 numerical failure during the run.
#include <CLI/CLI.hpp>
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <iostream>
#include <optional>
#include <string>
#include <vector>

#include "flapline/common/errors.hpp"
#include "flapline/io/config.hpp"
#include "flapline/io/writers.hpp"
#include "flapline/simulation/integrate.hpp"

namespace {

constexpr int kExitWrite = 1, kExitInput = 2, kExitNumerical = 3;

struct RunArgs {
  std::string config;
  std::string out;
  std::vector<std::string> sets;
  bool quiet = false;
  bool full = false;
  std::optional<double> state_space_time;
};

int run_command(const RunArgs& a) {
  using namespace flapline;
  const Model model = io::load_model(a.config, a.sets);
  RunSummary summary;
  try {
    summary = simulate(model);
  } catch (InputError& e) {  // e.g. too few steps for the lag states: point at the key
    io::locate_in_config(e, a.config, a.sets);
    throw;
  }
  const std::filesystem::path dir =
      a.out.empty() ? std::filesystem::path("results") / std::filesystem::path(a.config).stem()
                    : std::filesystem::path(a.out);
  io::OutputFolder folder(dir);
  folder.add("history.csv", io::history_csv(summary));
  folder.add("summary.json", io::summary_json(summary, a.config));
  folder.add("spanwise.csv", io::spanwise_csv(summary));
  if (a.state_space_time) {
    if (model.aero_options().kind == ModelKind::quasi_steady)
      throw InputError("--state-space", format_number(*a.state_space_time),
                       "needs a model with states: model.kind wagner or lifting_line");
    Workspace ws(model);
    folder.add("state_space.json",
               io::state_space_json(frozen_state_space(model, ws, *a.state_space_time), model));
  }
  folder.commit();
  if (!a.quiet) {
    std::cout << (a.full ? summary.full_report() : summary.brief_report());
    std::cout << "results: " << dir.string() << "/ (history.csv, summary.json, spanwise.csv"
              << (a.state_space_time ? ", state_space.json" : "") << ")\n";
  }
  return 0;
}

}  // namespace

int main(int argc, char** argv) {
  CLI::App app{"flapline: unsteady blade-element aerodynamics of flapping and morphing wings"};
  app.set_version_flag("--version", std::string("flapline ") + FLAPLINE_VERSION);
  app.require_subcommand(1);

  RunArgs run;
  CLI::App* cmd_run = app.add_subcommand(
      "run", "Run one case: force and moment histories, cycle means, power, spanwise loading");
  cmd_run->add_option("config", run.config, "YAML case file (keys: configs/README.md)")->required();
  cmd_run->add_option("-o,--out", run.out, "Output folder (default: results/<config name>)");
  cmd_run->add_option("--set", run.sets,
                      "Override a config key, e.g. --set gait.frequency=30 (repeatable)")
      ->take_all();
  cmd_run->add_flag("-q,--quiet", run.quiet, "Print nothing on success");
  cmd_run->add_flag("--full", run.full, "Print the full report instead of the short one");
  cmd_run->add_option("--state-space", run.state_space_time,
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

  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    const int code = app.exit(e);
    return code == 0 ? 0 : kExitInput;
  }

  try {
    if (*cmd_run) return run_command(run);
  } catch (const flapline::InputError& e) {
    std::cerr << "flapline: error: " << e.what() << "\n";
    return kExitInput;
  } catch (const flapline::NumericalError& e) {
    std::cerr << "flapline: run stopped: " << e.what() << "\n";
    return kExitNumerical;
  } catch (const std::exception& e) {
    std::cerr << "flapline: " << e.what() << "\n";
    return kExitWrite;
  }
  return 0;
}
