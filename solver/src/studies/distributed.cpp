#include "flapline/studies/distributed.hpp"

#include <mpi.h>

#include <charconv>
#include <cstdlib>
#include <stdexcept>

namespace flapline::studies::mpi {
namespace {

constexpr int kTagRequest = 1;  // worker → rank 0: finished rows (text), asks for more
constexpr int kTagWork = 2;     // rank 0 → worker: case indices (empty: no more work)

std::string receive_text(int source, int tag, MPI_Status& status) {
  MPI_Probe(source, tag, MPI_COMM_WORLD, &status);
  int bytes = 0;
  MPI_Get_count(&status, MPI_CHAR, &bytes);
  std::string text(static_cast<std::size_t>(bytes), '\0');
  MPI_Recv(text.data(), bytes, MPI_CHAR, status.MPI_SOURCE, tag, MPI_COMM_WORLD, MPI_STATUS_IGNORE);
  return text;
}

}  // namespace

bool launched() {
  for (const char* v : {"OMPI_COMM_WORLD_SIZE", "PMI_SIZE", "PMIX_RANK", "MPI_LOCALNRANKS"})
    if (std::getenv(v)) return true;
  return false;
}

Session::Session(int* argc, char*** argv) {
  // Only the main thread calls MPI; the workers' OpenMP threads never do.
  int provided = 0;
  MPI_Init_thread(argc, argv, MPI_THREAD_FUNNELED, &provided);
  MPI_Comm_rank(MPI_COMM_WORLD, &rank_);
  MPI_Comm_size(MPI_COMM_WORLD, &size_);
  MPI_Comm node;
  MPI_Comm_split_type(MPI_COMM_WORLD, MPI_COMM_TYPE_SHARED, rank_, MPI_INFO_NULL, &node);
  MPI_Comm_size(node, &node_size_);
  MPI_Comm_free(&node);
}

Session::~Session() {
  MPI_Finalize();
}

void Session::abort(int code) const {
  MPI_Abort(MPI_COMM_WORLD, code);
  std::abort();  // not reached
}

void distribute(const Session& session, const std::vector<CaseSpec>& cases,
                const std::vector<std::size_t>& indices, const CaseBuilderFactory& factory,
                const RunnerOptions& options, const RowFormatter& format,
                const std::function<void(std::size_t, const std::string&)>& on_row) {
  if (session.size() < 2) throw std::logic_error("distribute needs at least two MPI ranks");
  const int threads = options.threads > 0 ? options.threads : 1;
  if (session.rank() == 0) {
    std::size_t next = 0;
    int active = session.size() - 1;
    while (active > 0) {
      MPI_Status status;
      const std::string rows = receive_text(MPI_ANY_SOURCE, kTagRequest, status);
      // The payload: the worker's thread count, a newline, then its finished rows.
      std::size_t pos = rows.find('\n');
      int worker_threads = 1;
      std::from_chars(rows.data(), rows.data() + pos, worker_threads);
      for (std::size_t start = pos + 1; start < rows.size();) {
        const std::size_t end = rows.find('\n', start);
        const std::string row = rows.substr(start, end - start + 1);
        std::size_t index = 0;
        std::from_chars(row.data(), row.data() + row.size(), index);
        on_row(index, row);
        start = end + 1;
      }
      // Hand out a batch: two cases per worker thread keeps every thread busy.
      std::vector<unsigned long long> batch;
      for (int k = 0; k < 2 * worker_threads && next < indices.size(); ++k)
        batch.push_back(indices[next++]);
      MPI_Send(batch.data(), static_cast<int>(batch.size()), MPI_UNSIGNED_LONG_LONG,
               status.MPI_SOURCE, kTagWork, MPI_COMM_WORLD);
      if (batch.empty()) --active;
    }
    return;
  }
  std::string done = std::to_string(threads) + "\n";
  for (;;) {
    MPI_Send(done.data(), static_cast<int>(done.size()), MPI_CHAR, 0, kTagRequest, MPI_COMM_WORLD);
    MPI_Status status;
    MPI_Probe(0, kTagWork, MPI_COMM_WORLD, &status);
    int count = 0;
    MPI_Get_count(&status, MPI_UNSIGNED_LONG_LONG, &count);
    std::vector<unsigned long long> batch(static_cast<std::size_t>(count));
    MPI_Recv(batch.data(), count, MPI_UNSIGNED_LONG_LONG, 0, kTagWork, MPI_COMM_WORLD,
             MPI_STATUS_IGNORE);
    if (batch.empty()) return;
    std::vector<std::size_t> mine(batch.begin(), batch.end());
    done = std::to_string(threads) + "\n";
    run_cases(cases, mine, factory, options,
              [&](std::size_t index, const RunSummary& s) { done += format(index, s); });
  }
}

}  // namespace flapline::studies::mpi
