#pragma once
// Helpers shared by the tests: relative comparison, paths, running the CLI.
#include <sys/wait.h>
#include <unistd.h>
#include <cmath>
#include <cstdlib>
#include <filesystem>
#include <string>

#include <atomic>

namespace flapline::test {

/// |a − b| <= tol · max(|b|, floor): relative check with an absolute floor for values near 0.
inline bool close(double a, double b, double tol, double floor = 1e-300) {
  return std::abs(a - b) <= tol * std::max(std::abs(b), floor);
}

inline std::string source_path(const std::string& relative) {
  return std::string(FLAPLINE_SOURCE_DIR) + "/" + relative;
}

/// Run the CLI with `args` (shell words), capturing stdout+stderr into `output`; returns the exit
/// status.
inline int run_cli(const std::string& args, std::string& output) {
  static std::atomic<int> counter{0};
  const std::filesystem::path log =
      std::filesystem::temp_directory_path() /
      ("flapline_cli_" + std::to_string(::getpid()) + "_" + std::to_string(counter++) + ".log");
  const std::string cmd =
      std::string("\"") + FLAPLINE_CLI + "\" " + args + " > \"" + log.string() + "\" 2>&1";
  const int raw = std::system(cmd.c_str());
  output.clear();
  if (FILE* f = std::fopen(log.string().c_str(), "r")) {
    char buf[4096];
    std::size_t n;
    while ((n = std::fread(buf, 1, sizeof buf, f)) > 0) output.append(buf, n);
    std::fclose(f);
  }
  std::filesystem::remove(log);
  return WIFEXITED(raw) ? WEXITSTATUS(raw) : -1;
}

/// A fresh empty folder under the system temp folder, unique to this test process (so `ctest -j`
/// never collides).
inline std::filesystem::path fresh_folder(const std::string& name) {
  const auto p = std::filesystem::temp_directory_path() /
                 ("flapline_test_" + std::to_string(::getpid()) + "_" + name);
  std::filesystem::remove_all(p);
  return p;
}

}  // namespace flapline::test
