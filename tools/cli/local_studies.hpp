#pragma once
// `flapline trim`, `flapline derivatives`, `flapline modes` (README, "Trim, derivatives, modes").
#include <string>
#include <vector>

namespace flapline::cli {

struct TrimArgs {
  std::string config, out;
  std::vector<std::string> frees, targets, sets;
  bool balance = false, quiet = false, plot = true;
  int threads = 0;
  double tolerance = 1e-6;
};
int trim_command(const TrimArgs& args);

struct DerivativesArgs {
  std::string config, out;
  std::vector<std::string> params, sets;
  bool flight = false, quiet = false, plot = true;
  int threads = 0;
};
int derivatives_command(const DerivativesArgs& args);
int modes_command(const DerivativesArgs& args);

}  // namespace flapline::cli
