#pragma once
/// \file
/// Result files of `flapline run` (layouts: configs/README.md, "Output files"). Each function
/// returns the file's text; OutputFolder writes them atomically.

#include <filesystem>
#include <string>
#include <utility>
#include <vector>

#include "flapline/aero/state_space.hpp"
#include "flapline/case/model.hpp"
#include "flapline/simulation/run_summary.hpp"

namespace flapline::io {

/// history.csv: one row per output sample (time, pair and per-wing forces and moments in body
/// axes, power, gait angles).
std::string history_csv(const RunSummary& summary);

/// The columns of history.csv, and the history as numbers (one vector per column, full
/// precision) — the same values history.csv prints (%.9g; cycle as an integer, phase %.6f).
const std::vector<std::string>& history_columns();
std::vector<std::vector<double>> history_table(const RunSummary& summary);

/// drive.csv: one row per output sample (time, cycle, phase), then for each wing and joint
/// coordinate (stroke, deviation, pitch, span ratio, plunge) its rate, the generalised force the
/// drive supplies with its aerodynamic, inertial and gravitational parts, and its power; each
/// wing's power and inertial power; the pair's power (simulation/drive.hpp).
std::string drive_csv(const RunSummary& summary);
const std::vector<std::string>& drive_columns();
std::vector<std::vector<double>> drive_table(const RunSummary& summary);

/// spanwise.csv: per strip at each requested phase and the cycle mean.
std::string spanwise_csv(const RunSummary& summary);

/// The numeric columns of spanwise.csv (all but `phase` and `wing`) and their values, one
/// vector per column at full precision (alpha_deg NaN in the cycle-mean rows).
const std::vector<std::string>& spanwise_numeric_columns();
std::vector<std::vector<double>> spanwise_table(const RunSummary& summary);

/// summary.json: every cycle average and figure, units in the key names.
/// With `model`: also the `--set` overrides as typed (`overrides`) and the full resolved
/// configuration (`configuration`, io/resolved.hpp) for a rerun.
std::string summary_json(const RunSummary& summary, const std::string& config_path = {},
                         const Model* model = nullptr,
                         const std::vector<std::string>& overrides = {});

/// state_space.json: the frozen-time matrices A, B, C, D (row by row) with their dimensions and
/// the ordering of states, inputs and outputs.
std::string state_space_json(const StateSpace& ss, const Model& model);

/// Collects files and writes them all or none: each goes to a temporary name in the target
/// folder and is renamed only when every write succeeded. A failed or abandoned commit leaves no
/// file behind (nor the folder, when it created it).
///
/// A folder a command owns as a whole (`Ownership::whole`: run, compare, validate, trim,
/// derivatives, modes) carries a marker file listing what flapline wrote there. Such a folder
/// must be new, empty or marked; a rerun rewrites its files and removes the earlier run's files
/// that it does not rewrite (only files the marker lists). A non-empty folder without the marker
/// is refused (InputError naming the folder) before anything is written.
class OutputFolder {
 public:
  enum class Ownership { files, whole };
  /// The marker's file name inside an owned folder.
  static constexpr const char* kMarker = ".flapline-output";
  explicit OutputFolder(std::filesystem::path dir, Ownership own = Ownership::files)
      : dir_(std::move(dir)), own_(own) {}
  /// Throws InputError (key `option`, e.g. "--out") when `dir` exists, is not empty and was not
  /// written by flapline: call it before a long run.
  static void check_claimable(const std::filesystem::path& dir,
                              const std::string& option = "--out");
  /// Queue a file (name relative to the folder).
  void add(std::string name, std::string content);
  /// Write everything; throws std::runtime_error naming the file that failed.
  void commit();
  const std::filesystem::path& dir() const noexcept { return dir_; }
  std::vector<std::filesystem::path> paths() const;

 private:
  void write_all();  ///< every queued file under a temporary name, then renamed; all or none
  std::filesystem::path dir_;
  Ownership own_ = Ownership::files;
  std::vector<std::pair<std::string, std::string>> files_;
};

}  // namespace flapline::io
