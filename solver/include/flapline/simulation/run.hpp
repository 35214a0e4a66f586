#pragma once
/// \file
/// Running a case — the public entry points (installed API). A run integrates the lag states
/// with fixed steps over whole cycles until the cycle means stop changing (DESIGN §5) and
/// ends in a RunSummary. The per-run buffers (the Workspace) stay internal: `simulate` makes
/// its own, and a `CaseRunner` keeps one for many cases (one runner per thread).

#include <functional>
#include <memory>

#include "flapline/case/model.hpp"
#include "flapline/simulation/run_summary.hpp"

namespace flapline {

class Workspace;  // internal (case/workspace.hpp)

/// Optional hooks of a run.
struct RunControl {
  /// Called after every cycle with the number of cycles done and the relative change of the
  /// cycle means (NaN after the first cycle).
  std::function<void(int cycles_done, double change)> on_cycle;
  /// False: record no history (studies need only the cycle statistics; every other result is
  /// the same).
  bool keep_history = true;
};

/// Run a case. Throws InputError when a rule that needs the whole case fails (the lag models'
/// step-size check) and NumericalError when a state or a load becomes non-finite.
RunSummary simulate(const Model& model, const RunControl& control = {});

/// The same, but a failed run is a value: status input_error (with error_key) or blew_up and the
/// message; never throws those two.
RunSummary run_case(const Model& model, const RunControl& control = {});

/// Runs cases one after another on one set of buffers (reset for every case, so a result never
/// depends on the cases run before). Not thread-safe: one CaseRunner per thread.
class CaseRunner {
 public:
  CaseRunner();
  ~CaseRunner();
  CaseRunner(CaseRunner&&) noexcept;
  CaseRunner& operator=(CaseRunner&&) noexcept;
  /// simulate() / run_case() on the runner's buffers.
  RunSummary simulate(const Model& model, const RunControl& control = {});
  RunSummary run_case(const Model& model, const RunControl& control = {});

 private:
  Workspace& workspace_for(const Model& model);
  std::unique_ptr<Workspace> ws_;
};

}  // namespace flapline
