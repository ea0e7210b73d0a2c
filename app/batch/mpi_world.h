// The ranks of a distributed sweep: the one place sharpey-batch talks MPI (Open MPI), so the
// numerical libraries never see it. A plain start (no mpirun, srun or other MPI launcher in the
// environment) never initialises MPI and is a world of one rank, so it behaves as it always did.
//
// Threads: MPI is initialised with MPI_THREAD_FUNNELED. Only the main thread calls MPI; the
// solver's OpenMP and OpenBLAS threads and the Study's meshing thread never do.
#pragma once

#include <memory>
#include <string>
#include <vector>

namespace sharpey::batch {

// True when the environment says an MPI launcher started this process (variables set by Open
// MPI's mpirun, PMIx or PMI, as srun sets them).
bool started_by_mpi_launcher();
// This process's rank as the launcher's environment gives it (0 when not started by one), for
// messages printed before MPI is initialised (command-line errors: said once, by rank 0).
int launcher_rank();

// Thrown on ranks other than 0 when rank 0 stopped before the distributed work began (bad output
// folder, unreadable checkpoint): rank 0 reports it; the others end quietly with its exit code.
struct StoppedByRoot {
  int exit_code;
};

class MpiWorld {
 public:
  // Initialises MPI when `distributed`, else a world of one rank without MPI. Throws Error when
  // MPI cannot be initialised or gives less than MPI_THREAD_FUNNELED.
  MpiWorld(bool distributed, int* argc, char*** argv);
  ~MpiWorld();  // MPI_Finalize (after waiting for the sends still in flight)
  MpiWorld(const MpiWorld&) = delete;
  MpiWorld& operator=(const MpiWorld&) = delete;

  int rank() const { return rank_; }
  int size() const { return size_; }
  bool root() const { return rank_ == 0; }

  // Rank 0's value of `value` on every rank (a no-op on one rank).
  int broadcast(int value) const;
  std::string broadcast(const std::string& text) const;
  // The largest `value` of all ranks, on every rank (collective).
  int max_over_ranks(int value) const;

  // A finished piece of work: `index` and its text, sent by a rank other than 0 to rank 0 without
  // waiting (the send completes in the background; the text is kept until then).
  void send_to_root(long long index, const std::string& text);
  // On rank 0: the pieces that have arrived so far, without waiting. Each is (index, text).
  std::vector<std::pair<long long, std::string>> receive_ready();
  // On ranks other than 0: waits until every piece sent has been delivered.
  void flush_sends();

  // Marks the start of the part where ranks work on their own: a failure from then on ends the
  // whole job (abort) instead of being reported once by rank 0.
  void begin_independent_work() { independent_ = true; }
  bool independent() const { return independent_; }

  // Ends every rank of the job with `exit_code` (after a failure on one rank, so that the others
  // do not wait for it forever). Never returns. On one rank: std::exit.
  [[noreturn]] void abort(int exit_code) const;
  // Ends this rank with `exit_code` after an interruption, without MPI_Abort or MPI_Finalize:
  // the launcher signalled every rank (mpirun and srun pass Ctrl-C and SIGTERM on), so each says
  // it once and leaves, and a rank that ends unfinalised makes the launcher end the others (a
  // signal to one rank alone thus still stops the job). Never returns.
  [[noreturn]] void leave_interrupted(int exit_code) const;

 private:
  struct Pending;
  bool initialised_ = false, independent_ = false;
  int rank_ = 0, size_ = 1;
  std::vector<std::unique_ptr<Pending>> sends_, receives_;
};

}  // namespace sharpey::batch
