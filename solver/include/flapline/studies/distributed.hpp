#pragma once
/// \file
/// Sweeps over MPI ranks (build option FLAPLINE_WITH_MPI; Open MPI). Rank 0 hands out cases one
/// batch at a time and collects the finished rows at full precision (the rows' own text); every
/// other rank runs its batches with its threads (studies/runner.hpp). The rows are those of a
/// single-process run, whatever the rank count or the order of completion.

#include <cstddef>
#include <functional>
#include <string>
#include <vector>

#include "flapline/studies/runner.hpp"

namespace flapline::studies::mpi {

/// True when this process was started by an MPI launcher (mpirun/mpiexec, or a scheduler's).
bool launched();

/// MPI_Init / MPI_Finalize around a scope.
class Session {
 public:
  Session(int* argc, char*** argv);
  ~Session();
  Session(const Session&) = delete;
  Session& operator=(const Session&) = delete;
  int rank() const noexcept { return rank_; }
  int size() const noexcept { return size_; }
  /// Ranks on this node (for the default thread count: cores ÷ ranks per node).
  int node_size() const noexcept { return node_size_; }
  /// End every rank of the job with `code` (after a failure on one of them).
  [[noreturn]] void abort(int code) const;

 private:
  int rank_ = 0, size_ = 1, node_size_ = 1;
};

/// Formats a finished case as one table row (with its newline; its first field is the index).
using RowFormatter = std::function<std::string(std::size_t index, const RunSummary& summary)>;

/// Run `indices` of `cases` over all ranks. On rank 0 `on_row` is called for every finished
/// row (in completion order); `on_progress` too, with rows done. Needs at least two ranks.
void distribute(const Session& session, const std::vector<CaseSpec>& cases,
                const std::vector<std::size_t>& indices, const CaseBuilderFactory& factory,
                const RunnerOptions& options, const RowFormatter& format,
                const std::function<void(std::size_t index, const std::string& row)>& on_row);

}  // namespace flapline::studies::mpi
