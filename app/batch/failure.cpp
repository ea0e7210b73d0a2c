#include "failure.h"

#include <filesystem>
#include <new>

#include "exit_codes.h"

namespace sharpey::batch {

namespace {

// What to try after a mesher or solver failure (the library's message says what failed).
constexpr const char* kMeshHint =
    "if memory ran out, mesh coarser (--mesh-preset coarse, or larger mesh.pdl_edge_mm / "
    "mesh.bone_edge_mm in the case file); otherwise change the geometry values the message names "
    "(tooth dimensions, PDL width, bone loss) or the mesh sizes slightly";
constexpr const char* kSolverHint =
    "if memory ran out, mesh coarser (--mesh-preset coarse) or run fewer scenarios at a time; if "
    "the system is singular or not positive definite, check the materials and the bone geometry "
    "of the case";

}  // namespace

Failure describe_failure(const std::exception_ptr& e) {
  try {
    std::rethrow_exception(e);
  } catch (const Cancelled&) {
    return {kInterrupted, "interrupted", "stopped before finishing; no output was written", ""};
  } catch (const InputError& x) {
    return {kBadInput, "bad input (key " + x.key() + ")", x.what(), ""};
  } catch (const MeshError& x) {
    return {kMeshFailure, "mesher failure", x.what(), kMeshHint};
  } catch (const SolverError& x) {
    return {kSolverFailure, "solver failure", x.what(), kSolverHint};
  } catch (const analysis::OutputError& x) {
    return {kOutputFailure, "output failure", x.what(), ""};
  } catch (const std::filesystem::filesystem_error& x) {
    return {kOutputFailure, "output failure", x.what(), ""};
  } catch (const Error& x) {
    // Every library error has a type or is typed by its stage (failure.h): this one is a fault of
    // the program.
    return {kInternalError, "internal error",
            std::string(x.what()) + " (an unexpected library error; please report it)", ""};
  } catch (const std::bad_alloc&) {
    // Meshing and solving report running out of memory as mesher (3) or solver (4) failures;
    // this is an allocation elsewhere (reading, evaluating, writing).
    return {kInternalError, "internal error",
            "out of memory outside meshing and solving; try a coarser mesh preset "
            "(--mesh-preset coarse) or fewer scenarios",
            ""};
  } catch (const std::exception& x) {
    return {kInternalError, "internal error", x.what(), ""};
  } catch (...) {
    return {kInternalError, "internal error", "unknown failure", ""};
  }
}

}  // namespace sharpey::batch
