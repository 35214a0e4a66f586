#pragma once
// `flapline sweep` and `flapline merge` (README, "Sweeps").
#include <cstdint>
#include <string>
#include <vector>

namespace flapline::cli {

struct SweepArgs {
  std::string config, out, design = "grid", cases_file, shard;
  std::vector<std::string> vary, sets;
  int samples = 0, threads = 0;
  std::uint64_t seed = 1;
  bool quiet = false, plot = true, keep_cases = false;
  bool design_given = false, seed_given = false;  ///< typed on the command line
};
int sweep_command(const SweepArgs& args);

struct MergeArgs {
  std::vector<std::string> shards;
  std::string out;
  bool quiet = false, plot = true;
};
int merge_command(const MergeArgs& args);

}  // namespace flapline::cli
