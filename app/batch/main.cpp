// sharpey-batch: headless runs of Sharpey case files (run, sweep, mesh, molar). Exit codes in
// exit_codes.h, documented in --help and docs/case-format.md.
#include <CLI/CLI.hpp>
#include <cstdio>
#include <cstdlib>
#include <exception>
#include <filesystem>
#include <iostream>
#include <memory>
#include <new>

#include "batch_commands.h"
#include "exit_codes.h"
#include "failure.h"
#include "interrupt.h"
#include "mpi_world.h"
#include "sharpey/analysis/study.h"
#include "sharpey/error.h"
#include "sharpey/output/report_output.h"
#include "sharpey/startup/blas_kernels.h"
#include "sharpey/startup/freed_memory.h"

namespace {

using namespace sharpey;
using namespace sharpey::batch;

constexpr const char* kFooter = R"(Examples:
  sharpey-batch run samples/maxillary_central_incisor_bone_loss.json --out out/incisor
  sharpey-batch run samples/mandibular_canine_angular_defect.json --out out/canine --mesh-preset coarse
  sharpey-batch sweep samples/maxillary_central_incisor_bone_loss.json --out out/sweep \
      --vary load.magnitude=50,100,150 --vary pdl.material.young_modulus_mpa=0.05,0.47,0.7
  sharpey-batch mesh samples/mandibular_second_premolar_intrusion.json --out out/premolar-mesh
  sharpey-batch sweep samples/invented_mandibular_first_molar_uprighting.json --out out/molar-sweep \
      --design samples/invented_study_design_molar_furcation.json

Exit codes:
  0  success
  1  internal error (an unexpected failure; please report it), or memory ran out
     outside meshing and solving
  2  bad input or usage: the case file or an option is malformed or out of range
     (the message names the key, the value and the fix)
  3  mesher failure: the tooth model could not be meshed, also when memory ran out
     while meshing (try --mesh-preset coarse) or the meshed model is faulty (the PDL
     does not cover the root, the tooth's rigid motion cannot be fitted)
  4  solver failure: the finite-element system could not be assembled, factorised or
     solved, also when memory ran out doing so (try --mesh-preset coarse)
  5  output failure: a result file could not be written, or --out is a folder of
     other files (an output folder is replaced as a whole)
  6  interrupted (Ctrl-C, SIGINT or SIGTERM); nothing partial is left in the output folder

Output folders are written all at once: files appear in --out only when complete.
The case-file format is described in docs/case-format.md.)";

int fail(int code, const std::string& kind, const std::string& message) {
  std::cerr << "sharpey-batch: " << kind << ": " << message << '\n';
  return code;
}

// Last resort for an exception that escapes where it cannot be caught (a worker thread, a
// destructor): a message and exit code 1 instead of std::abort's core dump. Output folders are
// staged, so nothing half-written appears in --out.
[[noreturn]] void on_terminate() {
  std::string what = "unknown failure";
  if (const std::exception_ptr e = std::current_exception()) {
    try {
      std::rethrow_exception(e);
    } catch (const std::bad_alloc&) {
      what = "out of memory; try a coarser mesh preset (--mesh-preset coarse)";
    } catch (const std::exception& x) {
      what = x.what();
    } catch (...) {
    }
  }
  std::fprintf(stderr, "sharpey-batch: internal error: %s (stopped)\n", what.c_str());
  std::fflush(nullptr);
  std::_Exit(kInternalError);
}

// The three commands and their options, filled into `options` and `sweep_options` on parsing.
struct Commands {
  CLI::App* run = nullptr;
  CLI::App* sweep = nullptr;
  CLI::App* mesh = nullptr;
  CLI::App* molar = nullptr;
};

Commands add_commands(CLI::App& app, CommonOptions& options, SweepOptions& sweep_options) {
  auto add_common = [&options](CLI::App* sub) {
    sub->add_option("case", options.case_path, "case file (JSON, see docs/case-format.md)")
        ->required()
        ->check(CLI::ExistingFile);
    sub->add_option("--out,-o", options.out_dir, "output folder (created if missing)")->required();
    sub->add_option("--mesh-preset", options.mesh_preset,
                    "override the case file's mesh preset (coarse, standard, fine)")
        ->check(CLI::IsMember({"coarse", "standard", "fine"}));
    sub->add_flag("--quiet,-q", options.quiet, "no progress lines on stderr");
  };
  Commands c;
  c.run = app.add_subcommand(
      "run",
      "mesh and solve every scenario; write results.json, summary.csv, summary.txt, "
      "allowance.csv, case.json and per scenario the model and PDL .vtu and the root-map CSV (a "
      "multi-rooted case: what molar writes)");
  add_common(c.run);
  c.run->add_flag("--band", options.band,
                  "also compute the force allowance's variability band (case key allowance.band; "
                  "costs allowance.samples solves per scenario, default 24, plus the sensitivity "
                  "runs)");
  c.sweep = app.add_subcommand(
      "sweep",
      "full-factorial sweep over case keys; write sweep.csv (one row per combination "
      "and scenario; a multi-rooted case also sweep.json, and an invalid combination is a "
      "failure record)");
  add_common(c.sweep);
  c.sweep->add_option("--vary", sweep_options.vary,
                      "KEY=V1,V2,... : a dotted case-file key and its values, e.g. "
                      "load.magnitude=50,100,150 (repeat for more keys)");
  c.sweep
      ->add_option("--design", sweep_options.design_path,
                   "study design (JSON): teeth x bone levels x movements x forces x materials, "
                   "see docs/sweeps.md")
      ->check(CLI::ExistingFile);
  c.sweep
      ->add_option("--threads", sweep_options.threads,
                   "threads per model solve (default 1: the same sweep.csv however the sweep is "
                   "started; use mpirun -n CORES to use every core)")
      ->check(CLI::Range(1, 1024));
  c.mesh = app.add_subcommand(
      "mesh", "mesh every scenario only; write the meshes (.vtu) and mesh_statistics.json");
  add_common(c.mesh);
  c.molar = app.add_subcommand(
      "molar",
      "multi-rooted tooth case (kind multi_root_estimate, docs/molars.md): thin-layer estimate of "
      "the CRes, per-root figures and allowance over bone-loss and furcation scenarios; write "
      "multi_root_results.json, multi_root_summary.txt and a root map per scenario");
  c.molar->add_option("case", options.case_path, "multi-rooted tooth case file (JSON)")
      ->required()
      ->check(CLI::ExistingFile);
  c.molar->add_option("--out,-o", options.out_dir, "output folder (created if missing)")
      ->required();
  return c;
}

// Says why a command failed and returns its exit code. Before the ranks part ways every rank
// meets the same error: rank 0 says it once. After, the failing rank says it and ends the whole
// job (its checkpoints stay for a rerun).
int report_failure(const MpiWorld& world, const CommonOptions& options, bool sweeping) {
  const Failure f = describe_failure(std::current_exception());
  const bool alone = world.independent() && world.size() > 1;
  if (world.root() || alone) {
    const std::string rank = alone ? " (rank " + std::to_string(world.rank()) + " of " +
                                         std::to_string(world.size()) + ")"
                                   : std::string();
    fail(f.exit_code, f.kind + rank, f.message);
    if (!f.hint.empty()) std::cerr << "sharpey-batch: what to do: " << f.hint << '\n';
    if (sweeping && world.independent())
      std::cerr << "sharpey-batch: the models finished so far are kept as checkpoints in "
                << options.out_dir
                << (f.exit_code == kInterrupted
                        ? "; run the same command again to resume\n"
                        : "; once the cause is fixed, the same command resumes from them\n");
  }
  if (alone && f.exit_code == kInterrupted) world.leave_interrupted(f.exit_code);
  if (alone) world.abort(f.exit_code);
  return f.exit_code;
}

}  // namespace

int main(int argc, char** argv) {
  sharpey::startup::use_fast_blas_kernels(argv);
  sharpey::startup::keep_freed_memory_for_reuse();  // after the possible re-execution
  CLI::App app{
      "sharpey-batch: headless finite-element runs of a Sharpey case (tooth, periodontal "
      "ligament, bone and force system) with reports in JSON, CSV, text and VTK .vtu.\n" +
      analysis::caution_text()};
  app.footer(kFooter);
  app.require_subcommand(1, 1);
  CommonOptions options;
  SweepOptions sweep_options;
  const Commands commands = add_commands(app, options, sweep_options);
  // CLI11 says only "A subcommand is required" for a misspelt command: name it.
  if (argc > 1 && argv[1][0] != '-') {
    const std::string command = argv[1];
    if (command != "run" && command != "sweep" && command != "mesh" && command != "molar")
      return launcher_rank() != 0
                 ? kBadInput
                 : fail(kBadInput, "usage",
                        "unknown command \"" + command +
                            "\"; use run, sweep, mesh or molar (see sharpey-batch --help)");
  }
  // Usage errors go through our exit code 2, not CLI11's own numbers.
  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    if (launcher_rank() != 0) return e.get_exit_code() == 0 ? kOk : kBadInput;  // rank 0 says it
    const int shown = app.exit(e);
    return shown == 0 ? kOk : kBadInput;
  }

  // Under mpirun or srun MPI is initialised (MPI_Init_thread) before the signal handlers, so
  // ours replace any the MPI library installs for SIGINT / SIGTERM; a plain start never touches
  // MPI.
  std::unique_ptr<MpiWorld> world;
  try {
    world = std::make_unique<MpiWorld>(started_by_mpi_launcher(), &argc, &argv);
  } catch (const std::exception& e) {
    return fail(kInternalError, "MPI", e.what());
  }
  install_interrupt_handlers();
  std::set_terminate(on_terminate);
  try {
    if (world->size() > 1 && !commands.sweep->parsed())
      throw InputError("mpirun", "only sweep runs over several MPI ranks; start " +
                                     std::string(commands.run->parsed()    ? "run"
                                                 : commands.mesh->parsed() ? "mesh"
                                                                           : "molar") +
                                     " without mpirun or srun (or with one rank)");
    if (commands.run->parsed()) run_command(options);
    if (commands.sweep->parsed()) sweep_command(options, sweep_options, *world);
    if (commands.mesh->parsed()) mesh_command(options);
    if (commands.molar->parsed()) molar_command(options);
    return kOk;
  } catch (const StoppedByRoot& stopped) {
    return stopped.exit_code;  // rank 0 has said why
  } catch (...) {
    return report_failure(*world, options, commands.sweep->parsed());
  }
}
