#pragma once
/// \file
/// Running many cases (DESIGN §9): each worker thread builds its cases' Models with its own
/// CaseBuilder and runs them on its own Workspace (reset per case), so a result never depends on
/// the thread, the order or the cases run before. A case that fails — refused while building, a
/// rule that needs the whole case, a blow-up — is a result with its status, never the end of the
/// study. Parallel with OpenMP when the build has it.

#include <cstddef>
#include <functional>
#include <stdexcept>
#include <vector>

#include "flapline/case/model.hpp"
#include "flapline/simulation/run_summary.hpp"
#include "flapline/studies/design.hpp"

namespace flapline::studies {

/// Builds the Model of a case (throws InputError for a setting the case breaks). One per worker
/// thread: it need not be thread-safe.
using CaseBuilder = std::function<Model(const CaseSpec&)>;
/// Makes a CaseBuilder for a new worker thread (called once per thread, serialised).
using CaseBuilderFactory = std::function<CaseBuilder()>;

struct RunnerOptions {
  int threads = 0;            ///< worker threads; 0: the cores available to the process
  bool keep_history = false;  ///< keep each run's history (comparisons plot it)
  /// Checked before every case: true stops the study (cases not started are skipped).
  std::function<bool()> stop;
};

/// Called for every finished case, serialised, in completion order.
using CaseDone = std::function<void(std::size_t index, const RunSummary& summary)>;

/// Run `cases[i]` for every i in `indices`. A case whose Model cannot be built gets status
/// input_error with the message and key; run failures come from run_case. Exceptions other than
/// InputError and NumericalError (e.g. out of memory) stop the study and are rethrown.
void run_cases(const std::vector<CaseSpec>& cases, const std::vector<std::size_t>& indices,
               const CaseBuilderFactory& factory, const RunnerOptions& options,
               const CaseDone& done);

/// A study stopped by RunnerOptions::stop before all its cases ran (studies that need every
/// case — trim, derivatives — throw it; sweeps keep what finished).
class Interrupted : public std::runtime_error {
 public:
  Interrupted() : std::runtime_error("interrupted") {}
};

/// Worker threads a study uses by default: the cores available to this process.
int default_threads();

}  // namespace flapline::studies
