#include "sweep.hpp"

#include <atomic>
#include <csignal>
#include <filesystem>
#include <fstream>
#include <iostream>
#include <memory>
#include <sstream>

#include "cli_common.hpp"
#include "flapline/common/errors.hpp"
#include "flapline/io/config.hpp"
#include "flapline/io/sweep.hpp"
#include "flapline/io/writers.hpp"
#include "flapline/studies/runner.hpp"
#include "flapline/studies/table.hpp"
#ifdef FLAPLINE_WITH_MPI
#include "flapline/studies/distributed.hpp"
#endif

namespace flapline::cli {
namespace {

namespace fs = std::filesystem;

volatile std::sig_atomic_t g_interrupted = 0;
/// The first Ctrl-C stops the study between cases; a second one ends the process at once.
extern "C" void on_interrupt(int) {
  g_interrupted = 1;
  std::signal(SIGINT, SIG_DFL);
}

/// SIGINT stops a study between cases (the journal keeps every finished row).
class InterruptGuard {
 public:
  InterruptGuard() { previous_ = std::signal(SIGINT, on_interrupt); }
  ~InterruptGuard() { std::signal(SIGINT, previous_); }

 private:
  void (*previous_)(int) = SIG_DFL;
};

/// A case's own run folder (--keep-cases).
void keep_case(const fs::path& dir, std::size_t index, const RunSummary& s) {
  if (!has_results(s.status)) return;
  io::OutputFolder f(dir / "cases" / ("case_" + std::to_string(index)));
  f.add("history.csv", io::history_csv(s));
  f.add("summary.json", io::summary_json(s));
  f.add("spanwise.csv", io::spanwise_csv(s));
  f.add("drive.csv", io::drive_csv(s));
  f.commit();
}

int lead_sweep(const SweepArgs& a, const io::SweepDefinition& def, const io::Shard& shard,
               const fs::path& folder_path, const io::CaseLoader& loader, int threads,
               void* mpi_session);

}  // namespace

int sweep_command(const SweepArgs& a) {
  io::SweepDefinition def;
  def.config_path = a.config;
  // The base config parsed once (with --set); its text goes into the fingerprint and sweep.json.
  const io::CaseLoader loader(a.config, a.sets, fs::path(a.config).filename().string());
  def.config_text = loader.text();
  def.sets = a.sets;
  def.vary_specs = a.vary;
  def.cases_file = a.cases_file;
  if (!a.cases_file.empty() && !a.vary.empty())
    throw InputError("--cases", "'" + a.cases_file + "'",
                     "give either --cases FILE.csv or --vary KEY=VALUES, not both");
  if (!a.cases_file.empty() && (a.design_given || a.samples > 0 || a.seed_given))
    throw InputError("--cases", "'" + a.cases_file + "'",
                     "a case table is its own design: --design, --samples and --seed do not apply");
  if (a.seed_given && a.design != "latin")
    throw InputError("--seed", std::to_string(a.seed), "applies to --design latin only");
  if (const auto kind = from_string<studies::DesignKind>(a.design);
      kind && *kind != studies::DesignKind::table)
    def.design.kind = *kind;
  else
    throw InputError("--design", "'" + a.design + "'",
                     "must be one of: grid, one_at_a_time, latin");
  if (def.design.kind != studies::DesignKind::latin && a.samples > 0)
    throw InputError("--samples", std::to_string(a.samples), "applies to --design latin only");
  def.design.samples = a.samples;
  def.design.seed = a.seed;
  const io::Shard shard = a.shard.empty() ? io::Shard{} : io::Shard::parse(a.shard);
  io::complete_definition(def);
  const fs::path folder_path =
      a.out.empty() ? fs::path("results") / (fs::path(a.config).stem().string() + "_sweep")
                    : fs::path(a.out);
  io::check_sweep_values(def, loader);

  int threads = a.threads > 0 ? a.threads : studies::default_threads();
#ifdef FLAPLINE_WITH_MPI
  std::unique_ptr<studies::mpi::Session> session;
  if (studies::mpi::launched()) {
    session = std::make_unique<studies::mpi::Session>(nullptr, nullptr);
    if (a.threads <= 0) threads = std::max(1, studies::default_threads() / session->node_size());
  }
  const bool distributed = session && session->size() > 1;
  const bool leader = !session || session->rank() == 0;
  if (distributed && a.keep_cases)
    throw InputError("--keep-cases", "(under MPI)",
                     "writes case folders on one machine only: run without mpirun, or drop it");
#else
  const bool leader = true;
#endif
  if (!leader) {  // an MPI worker: run what rank 0 hands out
#ifdef FLAPLINE_WITH_MPI
    studies::RunnerOptions options;
    options.threads = threads;
    studies::mpi::distribute(
        *session, def.cases, {}, io::case_builders(loader), options,
        [&](std::size_t i, const RunSummary& s) {
          return studies::table_row(i, def.columns, def.cases[i], s);
        },
        [](std::size_t, const std::string&) {});
#endif
    return 0;
  }

#ifdef FLAPLINE_WITH_MPI
  if (distributed) {
    // A failure on rank 0 must end the workers too (they wait for cases).
    try {
      return lead_sweep(a, def, shard, folder_path, loader, threads, session.get());
    } catch (const InputError& e) {
      std::cerr << "flapline: error: " << e.what() << "\n";
      session->abort(kExitInput);
    } catch (const std::exception& e) {
      std::cerr << "flapline: " << e.what() << "\n";
      session->abort(kExitWrite);
    }
  }
#endif
  return lead_sweep(a, def, shard, folder_path, loader, threads, nullptr);
}

namespace {

int lead_sweep(const SweepArgs& a, const io::SweepDefinition& def, const io::Shard& shard,
               const fs::path& folder_path, const io::CaseLoader& loader, int threads,
               void* mpi_session) {
  const bool distributed = mpi_session != nullptr;
  io::SweepFolder folder(folder_path, def, shard);
  std::vector<std::size_t> todo;
  std::size_t owned = 0;
  for (std::size_t i = 0; i < def.cases.size(); ++i) {
    if (!shard.owns(i)) continue;
    ++owned;
    if (!folder.rows().count(i)) todo.push_back(i);
  }
  std::size_t failed = 0, finished = owned - todo.size();
  const std::size_t resumed = finished;
  const std::size_t status_column = 1 + def.columns.size();
  auto is_failure = [status_column](const std::string& row) {
    const std::vector<std::string> cells = studies::csv_split(row.substr(0, row.size() - 1));
    return cells.size() <= status_column || cells[status_column] != "converged";
  };
  for (const auto& [i, row] : folder.rows()) failed += is_failure(row) ? 1 : 0;
  StudyProgress progress(a.quiet, fs::path(a.config).stem().string() + " sweep", owned, resumed);
  auto record = [&](std::size_t index, const std::string& row) {
    folder.append(index, row);
    ++finished;
    if (is_failure(row)) ++failed;
    progress.update(finished, failed);
  };
  studies::RunnerOptions options;
  options.threads = threads;
  options.keep_history = a.keep_cases;
  g_interrupted = 0;
  {
    InterruptGuard guard;
    options.stop = [] { return g_interrupted != 0; };
    if (distributed) {
#ifdef FLAPLINE_WITH_MPI
      studies::mpi::distribute(
          *static_cast<studies::mpi::Session*>(mpi_session), def.cases, todo,
          io::case_builders(loader), options,
          [&](std::size_t i, const RunSummary& s) {
            return studies::table_row(i, def.columns, def.cases[i], s);
          },
          record);
#endif
    } else {
      studies::run_cases(def.cases, todo, io::case_builders(loader), options,
                         [&](std::size_t i, const RunSummary& s) {
                           if (a.keep_cases) keep_case(folder.dir(), i, s);
                           record(i, studies::table_row(i, def.columns, def.cases[i], s));
                         });
    }
  }
  progress.done();
  if (g_interrupted) {
    std::cerr << "flapline: sweep interrupted after " << finished << " of " << owned
              << " cases; run the same command again to resume (journal: "
              << (folder.dir() / "journal.csv").string() << ")\n";
    return kExitInterrupted;
  }
  std::string plot_note;
  folder.finish(a.plot, &plot_note);
  if (!a.quiet) {
    std::cout << "flapline sweep: " << owned << " cases"
              << (shard.count > 1
                      ? " (shard " + a.shard + " of " + std::to_string(def.cases.size()) + ")"
                      : std::string())
              << ", " << (owned - failed) << " converged, " << failed
              << " failed or not converged; " << threads << " thread" << (threads == 1 ? "" : "s")
              << (distributed ? " per worker rank" : "") << "\n";
    std::cout << "results: " << folder.dir().string() << "/ (sweep.csv, sweep.json"
              << (a.plot && plot_note.empty() ? ", figures" : "") << ")\n";
    if (!plot_note.empty()) std::cout << plot_note << "\n";
    std::cout << kCautions << "\n";
  }
  return failed > 0 ? kExitStudyFailures : 0;
}

}  // namespace

int merge_command(const MergeArgs& a) {
  std::vector<fs::path> shards(a.shards.begin(), a.shards.end());
  const fs::path out = a.out.empty() ? fs::path("results") / "merged_sweep" : fs::path(a.out);
  std::string plot_note;
  io::merge_sweeps(shards, out, a.plot, &plot_note);
  if (!a.quiet) {
    std::cout << "flapline merge: " << shards.size() << " shards -> " << out.string()
              << "/ (sweep.csv, sweep.json" << (a.plot && plot_note.empty() ? ", figures" : "")
              << ")\n";
    if (!plot_note.empty()) std::cout << plot_note << "\n";
  }
  return 0;
}

}  // namespace flapline::cli
