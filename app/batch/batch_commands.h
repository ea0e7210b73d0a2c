// The three sub-commands of sharpey-batch. Each throws the library's typed errors (mapped to exit
// codes in main.cpp) and writes its output folder through analysis::StagedFolder.
#pragma once

#include <string>
#include <vector>

namespace sharpey::batch {

struct CommonOptions {
  std::string case_path;
  std::string out_dir;
  std::string mesh_preset;  // empty: the case file's preset
  bool quiet = false;
  bool band = false;  // run: compute the allowance band even when the case does not ask for it
};

// Meshes and solves every scenario; writes results.json, summary.csv, summary.txt, case.json,
// allowance.csv and per scenario <stem>_model.vtu, <stem>_pdl.vtu, <stem>_root_map.csv. The nominal
// force allowances are always reported; the variability band when the case's allowance.band is
// true or options.band is set (checked before any solve).
void run_command(const CommonOptions& options);

// Full factorial over the --vary options; writes sweep.csv (one row per combination and scenario)
// and sweep_case.json (the base case).
void sweep_command(const CommonOptions& options, const std::vector<std::string>& vary);

// Meshes every scenario; writes <stem>_mesh.vtu, <stem>_boundary.vtu and mesh_statistics.json.
void mesh_command(const CommonOptions& options);

}  // namespace sharpey::batch
