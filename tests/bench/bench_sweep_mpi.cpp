// Benchmark (prints, not a test): a study design of teeth x 9 bone levels (0 to 8 mm) x 5
// movements x 3 forces on the coarse preset, run by sharpey-batch sweep as one process and as
// 2 MPI ranks (mpirun -n 2). Prints the wall time of each, models per minute (a model = one bone
// level of one tooth meshed and solved), and whether both wrote the same sweep.csv.
//
//   bench_sweep_mpi [--teeth N] [--ranks R]   (N of the 10 single-rooted teeth, default 10;
//                                             R ranks for the second run, default 2)
//
// As root, Open MPI needs OMPI_ALLOW_RUN_AS_ROOT=1 OMPI_ALLOW_RUN_AS_ROOT_CONFIRM=1 in the
// environment. Meaningful only on an otherwise idle machine (the load average is printed).
#include <fcntl.h>
#include <spawn.h>
#include <sys/wait.h>
#include <unistd.h>

#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

extern char** environ;  // POSIX

namespace {

namespace fs = std::filesystem;
using Clock = std::chrono::steady_clock;

const char* const kTeeth[] = {"maxillary_central_incisor",  "maxillary_lateral_incisor",
                              "maxillary_canine",           "maxillary_first_premolar",
                              "maxillary_second_premolar",  "mandibular_central_incisor",
                              "mandibular_lateral_incisor", "mandibular_canine",
                              "mandibular_first_premolar",  "mandibular_second_premolar"};

// Runs `args` (args[0] a path) with output to `log`; returns the exit status.
int run(const std::vector<std::string>& args, const std::string& log) {
  std::vector<char*> argv;
  for (const std::string& a : args) argv.push_back(const_cast<char*>(a.c_str()));
  argv.push_back(nullptr);
  posix_spawn_file_actions_t actions;
  posix_spawn_file_actions_init(&actions);
  posix_spawn_file_actions_addopen(&actions, 1, log.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0644);
  posix_spawn_file_actions_adddup2(&actions, 1, 2);
  pid_t pid = -1;
  const int rc = posix_spawn(&pid, argv[0], &actions, nullptr, argv.data(), environ);
  posix_spawn_file_actions_destroy(&actions);
  if (rc != 0) {
    std::fprintf(stderr, "cannot start %s: %s\n", argv[0], std::strerror(rc));
    return -1;
  }
  int status = 0;
  waitpid(pid, &status, 0);
  return WIFEXITED(status) ? WEXITSTATUS(status) : -1;
}

std::string read(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

double load_average() {
  double l = -1;
  if (FILE* f = std::fopen("/proc/loadavg", "r")) {
    if (std::fscanf(f, "%lf", &l) != 1) l = -1;
    std::fclose(f);
  }
  return l;
}

}  // namespace

int main(int argc, char** argv) {
  int n_teeth = 10, n_ranks = 2;
  for (int i = 1; i + 1 < argc; i += 2) {
    if (std::strcmp(argv[i], "--teeth") == 0) n_teeth = std::atoi(argv[i + 1]);
    if (std::strcmp(argv[i], "--ranks") == 0) n_ranks = std::atoi(argv[i + 1]);
  }
  if (n_teeth < 1 || n_teeth > 10 || n_ranks < 1) {
    std::fprintf(stderr, "usage: bench_sweep_mpi [--teeth 1..10] [--ranks R]\n");
    return 2;
  }
  const fs::path dir =
      fs::temp_directory_path() / ("sharpey-bench-sweep-" + std::to_string(getpid()));
  fs::create_directories(dir);
  const std::string case_path = (dir / "case.json").string();
  const std::string design_path = (dir / "design.json").string();
  std::ofstream(case_path) << R"({"label": "Invented benchmark case", "tooth": {"type":
    "maxillary_central_incisor"}, "load": {"magnitude": 100, "unit": "g", "direction": "lingual"},
    "mesh": {"preset": "coarse"}})";
  std::string teeth;
  for (int t = 0; t < n_teeth; ++t) teeth += std::string(t ? ", " : "") + "\"" + kTeeth[t] + "\"";
  std::ofstream(design_path) << R"({"label": "Invented benchmark design", "teeth": [)" << teeth
                             << R"(], "bone_levels_mm": [0, 1, 2, 3, 4, 5, 6, 7, 8],
    "movements": ["uncontrolled_tipping", "controlled_tipping", "translation", "intrusion",
                  "rotation"], "forces": [50, 100, 150], "force_unit": "g"})";
  const int n_models = n_teeth * 9, n_rows = n_models * 15;
  const std::string batch = SHARPEY_BINARY_DIR "/app/batch/sharpey-batch";
  // A "model" here is one bone level of one tooth meshed and solved; the sweep's own lines count
  // its units of work, one tooth with all its bone levels (n_teeth of them).
  std::printf(
      "design: %d teeth x 9 bone levels x 5 movements x 3 forces, coarse preset: %d "
      "models (bone levels meshed and solved; the sweep deals them out as %d units of 9), "
      "%d rows; load average %.1f\n",
      n_teeth, n_models, n_teeth, n_rows, load_average());

  double wall[2] = {0, 0};
  for (int pass = 0; pass < 2; ++pass) {
    const std::string out = (dir / (pass == 0 ? "one" : "ranks")).string();
    std::vector<std::string> args;
    if (pass == 1) args = {SHARPEY_MPIEXEC, "-n", std::to_string(n_ranks), "--oversubscribe"};
    for (const std::string& a : {batch, std::string("sweep"), case_path, std::string("--design"),
                                 design_path, std::string("--out"), out})
      args.push_back(a);
    const auto t0 = Clock::now();
    const int rc = run(args, out + ".log");
    wall[pass] = std::chrono::duration<double>(Clock::now() - t0).count();
    const int ranks = pass == 0 ? 1 : n_ranks;
    if (rc != 0) {
      std::printf("%d rank(s): failed with exit code %d, see %s.log\n", ranks, rc, out.c_str());
      return 1;
    }
    std::printf("%d rank%s: wall %.1f s, %.1f models/min\n", ranks, ranks == 1 ? " " : "s",
                wall[pass], 60.0 * n_models / wall[pass]);
    std::fflush(stdout);
  }
  const bool same =
      read((dir / "one" / "sweep.csv").string()) == read((dir / "ranks" / "sweep.csv").string());
  std::printf("speed-up %.2f; sweep.csv of both runs %s; load average %.1f\n", wall[0] / wall[1],
              same ? "identical" : "DIFFERENT", load_average());
  std::error_code ignored;
  fs::remove_all(dir, ignored);
  return same ? 0 : 1;
}
