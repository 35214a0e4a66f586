#pragma once
// Shared by the CLI's commands: exit statuses, terminal progress.
#include <unistd.h>

#include <chrono>
#include <cmath>
#include <cstdio>
#include <string>

#include "flapline/simulation/integrate.hpp"

namespace flapline::cli {

/// Exit statuses (README, "What you get").
constexpr int kExitWrite = 1, kExitInput = 2, kExitNumerical = 3, kExitValidation = 4,
              kExitStudyFailures = 5, kExitNotReachable = 6, kExitNotConverged = 7,
              kExitInterrupted = 130;

inline const char* const kNoGnuplot =
    "figures skipped: gnuplot (with PNG and SVG output) is not installed";

/// Progress of one run on a terminal for runs longer than about a second; silent otherwise.
class Progress {
 public:
  Progress(bool quiet, std::string label)
      : enabled_(!quiet && ::isatty(STDERR_FILENO)),
        label_(std::move(label)),
        start_(std::chrono::steady_clock::now()) {}
  ~Progress() { done(); }
  RunControl control() {
    RunControl c;
    if (enabled_)
      c.on_cycle = [this](int cycles, double change) {
        const double elapsed =
            std::chrono::duration<double>(std::chrono::steady_clock::now() - start_).count();
        if (elapsed < 1.0) return;
        if (std::isfinite(change))
          std::fprintf(stderr, "\r%s: cycle %d, change of the cycle means %.2e   ", label_.c_str(),
                       cycles, change);
        else
          std::fprintf(stderr, "\r%s: cycle %d   ", label_.c_str(), cycles);
        shown_ = true;
      };
    return c;
  }
  void done() {
    if (shown_) std::fprintf(stderr, "\r%*s\r", 78, "");
    shown_ = false;
  }

 private:
  bool enabled_;
  std::string label_;
  std::chrono::steady_clock::time_point start_;
  bool shown_ = false;
};

/// Progress of a study on a terminal: cases done / total, failures, elapsed and remaining time.
class StudyProgress {
 public:
  /// `resumed`: cases already done before this process started (not timed here).
  StudyProgress(bool quiet, std::string label, std::size_t total, std::size_t resumed = 0)
      : enabled_(!quiet && ::isatty(STDERR_FILENO)),
        label_(std::move(label)),
        total_(total),
        resumed_(resumed),
        start_(std::chrono::steady_clock::now()) {}
  ~StudyProgress() { done(); }
  void update(std::size_t finished, std::size_t failed) {
    if (!enabled_) return;
    const auto now = std::chrono::steady_clock::now();
    if (finished < total_ && now - last_ < std::chrono::milliseconds(200)) return;
    last_ = now;
    const double elapsed = std::chrono::duration<double>(now - start_).count();
    const std::size_t here = finished > resumed_ ? finished - resumed_ : 0;
    const double left =
        here > 0 ? elapsed * static_cast<double>(total_ - finished) / static_cast<double>(here)
                 : 0.0;
    std::fprintf(stderr, "\r%s: %zu / %zu cases, %zu failed, %s elapsed, %s left   ",
                 label_.c_str(), finished, total_, failed, clock(elapsed).c_str(),
                 here > 0 ? clock(left).c_str() : "--:--");
    shown_ = true;
  }
  void done() {
    if (shown_) std::fprintf(stderr, "\r%*s\r", 90, "");
    shown_ = false;
  }

 private:
  static std::string clock(double s) {
    char buf[32];
    const long t = std::lround(s);
    if (t >= 3600)
      std::snprintf(buf, sizeof buf, "%ld:%02ld:%02ld", t / 3600, t / 60 % 60, t % 60);
    else
      std::snprintf(buf, sizeof buf, "%02ld:%02ld", t / 60, t % 60);
    return buf;
  }
  bool enabled_;
  std::string label_;
  std::size_t total_, resumed_;
  std::chrono::steady_clock::time_point start_, last_{};
  bool shown_ = false;
};

}  // namespace flapline::cli
