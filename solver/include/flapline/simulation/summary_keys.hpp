#pragma once
/// \file
/// The names of a run's scalar results, frozen: summary.json's numeric groups are written from
/// this list, studies name their table columns by these dot-joined key paths, and trim targets
/// and derivatives address quantities by them. Units are in the names (SI; angles in degrees).
///
/// Groups: `run` (resolution and convergence), `air`, `wing` (planform), `cycle_mean` (pair, and
/// `right_wing` / `left_wing`), `power`, `derived` (reference speed, non-dimensional groups,
/// flow shares).

#include <optional>
#include <string>
#include <vector>

#include "flapline/simulation/run_summary.hpp"

namespace flapline {

/// One scalar of a summary: its key path (e.g. "cycle_mean.Z_N") and how to read it. `value`
/// is empty where the quantity is undefined (e.g. an advance ratio without a stroke).
struct SummaryKey {
  std::string path;
  std::optional<double> (*value)(const RunSummary&);
  bool integer = false;  ///< a count (written without a fraction in JSON)
  bool vehicle = false;  ///< exists only with a vehicle section (omitted from summary.json without)
  bool inflow = false;   ///< exists only with model.inflow (omitted from summary.json without)
};

/// Every scalar of summary.json, in the order it is written.
const std::vector<SummaryKey>& summary_keys();

/// The key named `path`, or null.
const SummaryKey* find_summary_key(const std::string& path);

}  // namespace flapline
