#include "flapline/studies/runner.hpp"

#include <atomic>
#include <exception>
#include <mutex>

#ifdef FLAPLINE_WITH_OPENMP
#include <omp.h>
#endif

#include "flapline/common/errors.hpp"
#include "flapline/simulation/run.hpp"

namespace flapline::studies {

int default_threads() {
#ifdef FLAPLINE_WITH_OPENMP
  return omp_get_num_procs();
#else
  return 1;
#endif
}

void run_cases(const std::vector<CaseSpec>& cases, const std::vector<std::size_t>& indices,
               const CaseBuilderFactory& factory, const RunnerOptions& options,
               const CaseDone& done) {
  const int threads = options.threads > 0 ? options.threads : default_threads();
  std::mutex done_mutex, factory_mutex;
  std::exception_ptr failure;
  std::atomic<bool> stopping{false};
  RunControl control;
  control.keep_history = options.keep_history;
  const long count = static_cast<long>(indices.size());

  // The body of one worker: its own builder and run buffers (a CaseRunner resets them per case).
  auto work = [&](auto&& next_index) {
    CaseBuilder build;
    {
      std::lock_guard<std::mutex> lock(factory_mutex);
      build = factory();
    }
    CaseRunner runner;
    for (long j; (j = next_index()) >= 0;) {
      if (stopping.load() || (options.stop && options.stop())) {
        stopping = true;
        continue;
      }
      const std::size_t index = indices[static_cast<std::size_t>(j)];
      RunSummary summary;
      try {
        try {
          const Model model = build(cases[index]);
          summary = runner.run_case(model, control);
        } catch (const InputError& e) {
          summary.status = RunStatus::input_error;
          summary.message = e.what();
          summary.error_key = e.key();
        }
        std::lock_guard<std::mutex> lock(done_mutex);
        done(index, summary);
      } catch (...) {
        std::lock_guard<std::mutex> lock(done_mutex);
        if (!failure) failure = std::current_exception();
        stopping = true;
      }
    }
  };

#ifdef FLAPLINE_WITH_OPENMP
  std::atomic<long> next{0};
#pragma omp parallel num_threads(threads)
  work([&] {
    const long j = next++;
    return j < count ? j : -1L;
  });
#else
  (void)threads;
  long next = 0;
  work([&] { return next < count ? next++ : -1L; });
#endif
  if (failure) std::rethrow_exception(failure);
}

}  // namespace flapline::studies
