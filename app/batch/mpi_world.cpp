#include "mpi_world.h"

#include <mpi.h>

#include <algorithm>
#include <cstdio>
#include <cstdlib>
#include <cstring>

#include "sharpey/error.h"

namespace sharpey::batch {

namespace {

constexpr int kPieceTag = 16;

bool is_set(const char* name) {
  const char* value = std::getenv(name);
  return value != nullptr && value[0] != '\0';
}

}  // namespace

struct MpiWorld::Pending {
  std::vector<char> buffer;  // 8-byte index, then the text
  MPI_Request request = MPI_REQUEST_NULL;
};

bool started_by_mpi_launcher() {
  // mpirun / mpiexec (Open MPI), PMIx (srun --mpi=pmix, Open MPI 4's own runtime), PMI-1/2
  // (srun --mpi=pmi2).
  return is_set("OMPI_COMM_WORLD_SIZE") || is_set("PMIX_RANK") || is_set("PMI_RANK") ||
         is_set("PMI_SIZE");
}

int launcher_rank() {
  for (const char* name : {"OMPI_COMM_WORLD_RANK", "PMIX_RANK", "PMI_RANK"})
    if (is_set(name)) return std::atoi(std::getenv(name));
  return 0;
}

MpiWorld::MpiWorld(bool distributed, int* argc, char*** argv) {
  if (!distributed) return;
  int provided = 0;
  if (MPI_Init_thread(argc, argv, MPI_THREAD_FUNNELED, &provided) != MPI_SUCCESS)
    throw Error(
        "MPI could not be initialised; start sharpey-batch without mpirun/srun to run on "
        "one machine, or check the MPI installation (ompi_info)");
  initialised_ = true;
  if (provided < MPI_THREAD_FUNNELED) {
    MPI_Finalize();
    initialised_ = false;
    throw Error(
        "the MPI library gives no thread support (MPI_THREAD_FUNNELED needed: the solver "
        "runs OpenMP and BLAS threads); use an MPI built with thread support");
  }
  MPI_Comm_rank(MPI_COMM_WORLD, &rank_);
  MPI_Comm_size(MPI_COMM_WORLD, &size_);
}

MpiWorld::~MpiWorld() {
  if (!initialised_) return;
  flush_sends();
  for (auto& r : receives_)
    if (r->request != MPI_REQUEST_NULL) MPI_Cancel(&r->request);
  MPI_Finalize();
}

int MpiWorld::broadcast(int value) const {
  if (size_ > 1) MPI_Bcast(&value, 1, MPI_INT, 0, MPI_COMM_WORLD);
  return value;
}

int MpiWorld::max_over_ranks(int value) const {
  int result = value;
  if (size_ > 1) MPI_Allreduce(&value, &result, 1, MPI_INT, MPI_MAX, MPI_COMM_WORLD);
  return result;
}

std::string MpiWorld::broadcast(const std::string& text) const {
  if (size_ == 1) return text;
  long long n = static_cast<long long>(text.size());
  MPI_Bcast(&n, 1, MPI_LONG_LONG, 0, MPI_COMM_WORLD);
  std::string out = root() ? text : std::string(static_cast<size_t>(n), '\0');
  // MPI counts are int: send in slices below 1 GB.
  constexpr long long kSlice = 1 << 30;
  for (long long offset = 0; offset < n; offset += kSlice) {
    const int count = static_cast<int>(std::min(kSlice, n - offset));
    MPI_Bcast(out.data() + offset, count, MPI_CHAR, 0, MPI_COMM_WORLD);
  }
  return out;
}

void MpiWorld::send_to_root(long long index, const std::string& text) {
  if (text.size() + sizeof index > static_cast<size_t>(1) << 30)
    throw Error("one model's sweep rows exceed 1 GB; vary fewer load or threshold keys per model");
  auto piece = std::make_unique<Pending>();
  piece->buffer.resize(sizeof index + text.size());
  std::memcpy(piece->buffer.data(), &index, sizeof index);
  std::memcpy(piece->buffer.data() + sizeof index, text.data(), text.size());
  MPI_Isend(piece->buffer.data(), static_cast<int>(piece->buffer.size()), MPI_CHAR, 0, kPieceTag,
            MPI_COMM_WORLD, &piece->request);
  sends_.push_back(std::move(piece));
  // Let earlier sends progress and forget the finished ones.
  for (auto it = sends_.begin(); it != sends_.end();) {
    int done = 0;
    MPI_Test(&(*it)->request, &done, MPI_STATUS_IGNORE);
    it = done ? sends_.erase(it) : it + 1;
  }
}

void MpiWorld::flush_sends() {
  for (auto& s : sends_) MPI_Wait(&s->request, MPI_STATUS_IGNORE);
  sends_.clear();
}

std::vector<std::pair<long long, std::string>> MpiWorld::receive_ready() {
  std::vector<std::pair<long long, std::string>> out;
  if (size_ == 1) return out;
  // Start a receive for every message that has arrived (matched probe: no other receive can take
  // it), then collect the receives that have completed, in the order they were started.
  for (;;) {
    int found = 0;
    MPI_Message message;
    MPI_Status status;
    MPI_Improbe(MPI_ANY_SOURCE, kPieceTag, MPI_COMM_WORLD, &found, &message, &status);
    if (!found) break;
    int count = 0;
    MPI_Get_count(&status, MPI_CHAR, &count);
    auto piece = std::make_unique<Pending>();
    piece->buffer.resize(static_cast<size_t>(count));
    MPI_Imrecv(piece->buffer.data(), count, MPI_CHAR, &message, &piece->request);
    receives_.push_back(std::move(piece));
  }
  for (auto it = receives_.begin(); it != receives_.end();) {
    int done = 0;
    MPI_Test(&(*it)->request, &done, MPI_STATUS_IGNORE);
    if (!done) {
      ++it;
      continue;
    }
    const std::vector<char>& b = (*it)->buffer;
    long long index = -1;
    if (b.size() < sizeof index)
      throw Error("a rank sent a malformed sweep piece (internal error)");
    std::memcpy(&index, b.data(), sizeof index);
    out.emplace_back(index, std::string(b.begin() + sizeof index, b.end()));
    it = receives_.erase(it);
  }
  return out;
}

void MpiWorld::abort(int exit_code) const {
  if (initialised_ && size_ > 1) MPI_Abort(MPI_COMM_WORLD, exit_code);
  std::exit(exit_code);
}

void MpiWorld::leave_interrupted(int exit_code) const {
  std::fflush(nullptr);
  std::_Exit(exit_code);
}

}  // namespace sharpey::batch
