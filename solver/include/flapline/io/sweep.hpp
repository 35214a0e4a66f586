#pragma once
/// \file
/// The files of `flapline sweep` and `flapline merge` (layouts: configs/README.md, "Sweeps"):
/// the definition of a sweep and its fingerprint, the case table of `--cases`, the up-front check
/// of every varied value, the journal that makes a sweep resumable, sweep.csv / sweep.json, the
/// merge of shards and the sweep figures.

#include <cstddef>
#include <cstdio>
#include <filesystem>
#include <map>
#include <string>
#include <vector>

#include "flapline/io/config.hpp"
#include "flapline/studies/design.hpp"

namespace flapline::io {

/// Everything that defines a sweep; the fingerprint covers the configuration's content, the
/// --set overrides and the cases (so the design, seed and samples), not threads or shards.
struct SweepDefinition {
  std::string config_path;              ///< as given on the command line
  std::string config_text;              ///< the file's content
  std::vector<std::string> sets;        ///< --set overrides, as typed
  studies::Design design;               ///< kind table for --cases
  std::vector<std::string> vary_specs;  ///< --vary arguments, as typed
  std::string cases_file;               ///< --cases FILE (table designs)
  std::vector<std::string> columns;     ///< varied key paths (table columns after `case`)
  std::vector<studies::CaseSpec> cases;
  std::string fingerprint;
};

/// Fill columns, cases and fingerprint from config_text, sets, design (or cases_file). Throws
/// InputError for a malformed design or case table (file and line named).
void complete_definition(SweepDefinition& def);

/// Check every varied key and value before any case runs: each distinct value of each key (a
/// latin design: its bounds) is applied alone to the base configuration. A value its key refuses
/// (out of range, not a whole number, not a known key, …) is a one-line InputError located on the
/// command line; problems that need the whole case are left to the cases.
void check_sweep_values(const SweepDefinition& def, const CaseLoader& loader);

/// `--shard K/N`: this process runs cases K, K + N, K + 2N, …
struct Shard {
  int index = 0, count = 1;
  bool owns(std::size_t c) const {
    return static_cast<int>(c % static_cast<std::size_t>(count)) == index;
  }
  /// Parse "K/N" (0 <= K < N); throws InputError naming --shard.
  static Shard parse(const std::string& text);
};

/// sweep.json: version, config (path and content), overrides, design (kind, varied keys, VALUES
/// as typed, samples, seed, case table), case count, fingerprint, and for a shard its K/N.
std::string sweep_json(const SweepDefinition& def, const Shard& shard);

/// The result folder of a sweep (or of one shard): a journal (`journal.csv`, every finished row
/// appended and flushed) that a rerun of the same sweep resumes from, and at the end sweep.csv,
/// sweep.json and the figures, written atomically.
class SweepFolder {
 public:
  /// Opens DIR, creating it when missing. Refuses (InputError naming -o) a folder that holds
  /// another sweep (fingerprint or shard mismatch) or files flapline did not write.
  SweepFolder(std::filesystem::path dir, const SweepDefinition& def, const Shard& shard);
  ~SweepFolder();
  SweepFolder(const SweepFolder&) = delete;
  SweepFolder& operator=(const SweepFolder&) = delete;

  /// Rows already in the journal, by case index.
  const std::map<std::size_t, std::string>& rows() const noexcept { return rows_; }
  /// Record a finished case (the row with its newline); flushed at once.
  void append(std::size_t index, const std::string& row);
  /// Write sweep.csv (rows in case order), sweep.json and (with `plots`) the figures.
  void finish(bool plots, std::string* plot_note = nullptr);
  const std::filesystem::path& dir() const noexcept { return dir_; }

 private:
  std::filesystem::path dir_;
  const SweepDefinition& def_;
  Shard shard_;
  std::string header_;
  std::map<std::size_t, std::string> rows_;
  std::FILE* journal_ = nullptr;
};

/// The text of sweep.csv for rows by case index.
std::string sweep_csv(const std::vector<std::string>& columns,
                      const std::map<std::size_t, std::string>& rows);

/// Figures of a finished sweep: one varied key — every main result against it; two keys of a
/// grid — maps of lift and power; otherwise each result against each key. {file: content}.
std::map<std::string, std::string> sweep_plots(studies::DesignKind kind,
                                               const std::vector<std::string>& columns,
                                               const std::map<std::size_t, std::string>& rows);

/// `flapline merge`: check that the shard folders hold all N shards of one sweep, complete, and
/// write OUT/sweep.csv (byte for byte the unsharded table), sweep.json and the figures. Throws
/// InputError (missing shard, different sweeps, incomplete shard) before writing anything.
void merge_sweeps(const std::vector<std::filesystem::path>& shards,
                  const std::filesystem::path& out, bool plots, std::string* plot_note = nullptr);

}  // namespace flapline::io
