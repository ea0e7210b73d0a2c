#include "batch_commands.h"

#include <algorithm>
#include <chrono>
#include <cstdlib>
#include <filesystem>
#include <iostream>
#include <memory>
#include <new>
#include <sstream>
#include <thread>

#include "failure.h"
#include "interrupt.h"
#include "progress.h"
#include "sharpey/analysis/allowance_output.h"
#include "sharpey/analysis/case_spec.h"
#include "sharpey/analysis/report_output.h"
#include "sharpey/analysis/study.h"
#include "sharpey/error.h"
#include "sharpey/mesh/mesh_statistics.h"
#include "sharpey/mesh/vtu_writer.h"

namespace sharpey::batch {

namespace {

using analysis::CaseSpec;

void stop_if_interrupted() {
  if (interrupted()) throw Cancelled();
}

// Refuses an --out that cannot be right before any work: an empty path, or a folder holding the
// case file (the output folder is replaced as a whole, so the case would be lost).
void check_out_dir(const CommonOptions& options) {
  if (options.out_dir.empty())
    throw InputError("--out", "--out is empty; give the output folder, e.g. --out out/incisor");
  namespace fs = std::filesystem;
  std::error_code ec;
  const fs::path case_path = fs::weakly_canonical(options.case_path, ec);
  if (ec) return;  // reading the case reports it
  const fs::path out = fs::weakly_canonical(options.out_dir, ec);
  if (ec) return;
  const std::string out_text = out.string() + "/", case_string = case_path.string();
  if (case_string.compare(0, out_text.size(), out_text) == 0)
    throw InputError("--out", "--out \"" + options.out_dir + "\" holds the case file \"" +
                                  options.case_path +
                                  "\"; the output folder is replaced as a whole by each run, so "
                                  "give a folder that does not contain the case, e.g. --out " +
                                  (out / "results").string());
}

// The case file's text with the command-line overrides applied.
std::string case_text(const CommonOptions& options) {
  check_out_dir(options);
  std::string text = analysis::read_case_text(options.case_path);
  if (!options.mesh_preset.empty()) {
    analysis::parse_case(text, options.case_path);  // report the file's own errors first
    text = analysis::set_case_value(text, "mesh.preset", options.mesh_preset);
  }
  return text;
}

std::string plural(size_t n, const std::string& word) {
  return std::to_string(n) + " " + word + (n == 1 ? "" : "s");
}

// Testing aid: SHARPEY_BATCH_WRITE_DELAY_MS=<ms> pauses after each report file, so the tests can
// kill or interrupt a run while it is writing (tests/analysis/test_batch_kill.cpp).
void pause_after_write() {
  static const long delay_ms = [] {
    const char* value = std::getenv("SHARPEY_BATCH_WRITE_DELAY_MS");
    return value ? std::strtol(value, nullptr, 10) : 0L;
  }();
  if (delay_ms > 0) std::this_thread::sleep_for(std::chrono::milliseconds(delay_ms));
}

// Meshes scenario i for the mesh command; running out of memory is a mesher failure here too,
// as it is inside analysis::Study for run and sweep.
mesh::ToothModel build_model(const CaseSpec& spec, int i) {
  const mesh::ModelSpec model = analysis::scenario_model(spec, i);
  try {
    return mesh::build_tooth_model(model, interrupt_flag());
  } catch (const std::bad_alloc&) {
    throw MeshError("meshing scenario '" + spec.scenarios[static_cast<size_t>(i)].name +
                    "' ran out of memory (" + mesh::to_string(model.sizing.preset) +
                    " mesh preset); use a coarser mesh (--mesh-preset coarse, or larger "
                    "mesh.pdl_edge_mm and mesh.bone_edge_mm)");
  }
}

void announce(const std::string& folder, const std::vector<std::string>& files) {
  std::cout << "sharpey-batch: wrote " << plural(files.size(), "file") << " to " << folder << ":";
  for (const std::string& f : files) std::cout << ' ' << f;
  std::cout << '\n';
}

}  // namespace

void run_command(const CommonOptions& options) {
  Progress progress(options.quiet);
  CaseSpec spec = analysis::parse_case(case_text(options), options.case_path);
  if (options.band) spec.band.enabled = true;
  // The band's extreme geometries are checked before the long part, like the case itself.
  if (spec.band.enabled) analysis::validate_band(spec, analysis::band_options(spec));
  analysis::StagedFolder out(options.out_dir);  // checks the output path before the long part
  progress.note("case \"" + spec.label + "\": " + plural(spec.scenarios.size(), "scenario") + ", " +
                mesh::to_string(spec.model.sizing.preset) + " mesh");
  const analysis::Study study = in_model_stage([&] {
    return analysis::Study(
        spec, [&progress](const std::string& stage, double f) { progress.report(stage, f); },
        interrupt_flag());
  });
  stop_if_interrupted();
  progress.report("evaluating the force system", 0.0);
  const std::vector<analysis::ScenarioResult> results =
      in_model_stage([&] { return study.evaluate(spec.load); });
  progress.report("force allowances", 0.0);
  analysis::AllowanceReport allowance;
  allowance.nominal = in_model_stage([&] { return analysis::nominal_allowances(study); });
  std::unique_ptr<analysis::AllowanceBand> band;
  if (spec.band.enabled) {
    progress.note("allowance band: " + plural(static_cast<size_t>(spec.band.n_samples), "sample") +
                  " per scenario" + (spec.band.sensitivity ? " and the sensitivity runs" : ""));
    band = in_model_stage([&] {
      return std::make_unique<analysis::AllowanceBand>(analysis::allowance_band(
          study, analysis::band_options(spec),
          [&progress](const std::string& stage, double f) { progress.report(stage, f); },
          interrupt_flag()));
    });
    allowance.band = band.get();
  }
  stop_if_interrupted();
  progress.report("measuring the meshes", 0.0);
  std::vector<analysis::ScenarioFacts> facts =
      in_model_stage([&] { return analysis::scenario_facts(study, true); });
  stop_if_interrupted();

  std::vector<std::string> written;
  for (size_t i = 0; i < results.size(); ++i) {
    const std::string stem = analysis::scenario_file_stem(static_cast<int>(i), results[i].name);
    analysis::ScenarioFacts& f = facts[i];
    f.model_vtu = stem + "_model.vtu";
    f.pdl_vtu = stem + "_pdl.vtu";
    f.root_map_csv = stem + "_root_map.csv";
    progress.report("writing " + stem + " files", 0.0);
    in_output_stage([&] {
      analysis::write_scenario_vtu(*study.solutions()[i], results[i], out.path(f.model_vtu),
                                   out.path(f.pdl_vtu));
    });
    pause_after_write();
    analysis::write_file_atomic(out.path(f.root_map_csv), analysis::root_map_csv(spec, results[i]));
    written.insert(written.end(), {f.model_vtu, f.pdl_vtu, f.root_map_csv});
    pause_after_write();
    stop_if_interrupted();
  }
  progress.report("writing the summaries", 0.0);
  analysis::write_file_atomic(out.path("results.json"),
                              analysis::results_json(spec, results, facts, &allowance));
  analysis::write_file_atomic(out.path("summary.csv"), analysis::summary_csv(spec, results));
  analysis::write_file_atomic(out.path("summary.txt"),
                              analysis::summary_text(spec, results, &allowance));
  analysis::write_file_atomic(out.path("allowance.csv"), analysis::allowance_csv(spec, allowance));
  analysis::save_case(spec, out.path("case.json"));
  written.insert(written.begin(),
                 {"results.json", "summary.csv", "summary.txt", "allowance.csv", "case.json"});
  pause_after_write();
  stop_if_interrupted();
  out.commit();
  announce(options.out_dir, written);
}

void sweep_command(const CommonOptions& options, const std::vector<std::string>& vary) {
  Progress progress(options.quiet);
  const std::string base_text = case_text(options);
  const CaseSpec base = analysis::parse_case(base_text, options.case_path);

  std::vector<analysis::CaseVariation> variations;
  for (const std::string& v : vary) {
    analysis::CaseVariation parsed = analysis::parse_variation(v);
    for (const auto& earlier : variations)
      if (earlier.key == parsed.key)
        throw InputError("--vary", "--vary " + v + ": " + parsed.key +
                                       " is varied twice; give all its values in one --vary");
    variations.push_back(std::move(parsed));
  }
  if (variations.empty())
    throw InputError("--vary", "sweep needs at least one --vary KEY=V1,V2,...");
  // Keys that leave the model unchanged vary fastest, so consecutive combinations reuse one
  // solved Study (a new force system or threshold costs milliseconds, a new model a full solve).
  std::stable_partition(variations.begin(), variations.end(), [](const auto& v) {
    return v.key.rfind("load.", 0) != 0 && v.key.rfind("thresholds.", 0) != 0 && v.key != "label" &&
           v.key != "notes";
  });
  size_t n_combinations = 1;
  for (const auto& v : variations) {
    n_combinations *= v.values.size();
    if (n_combinations > 1000)
      throw InputError("--vary",
                       "the --vary options give more than 1000 combinations; vary fewer "
                       "keys or values, or split the sweep");
  }

  // Build and check every combination before any solve, so a bad value fails at once.
  struct Combination {
    std::vector<std::string> values;
    CaseSpec spec;
  };
  std::vector<Combination> combinations;
  std::vector<size_t> digit(variations.size(), 0);
  for (size_t c = 0; c < n_combinations; ++c) {
    Combination combo;
    std::string text = base_text;
    std::string description;
    for (size_t k = 0; k < variations.size(); ++k) {
      const std::string& value = variations[k].values[digit[k]];
      text = analysis::set_case_value(text, variations[k].key, value);
      combo.values.push_back(value);
      description += (description.empty() ? "" : ", ") + variations[k].key + "=" + value;
    }
    try {
      combo.spec = analysis::parse_case(text, options.case_path + " with " + description);
    } catch (const InputError& e) {
      throw InputError(e.key(), std::string(e.what()) + " (from --vary)");
    }
    combinations.push_back(std::move(combo));
    for (size_t k = variations.size(); k-- > 0;) {  // odometer, last key fastest
      if (++digit[k] < variations[k].values.size()) break;
      digit[k] = 0;
    }
  }

  analysis::StagedFolder out(options.out_dir);  // checks the output path before the long part
  std::vector<std::string> keys;
  for (const auto& v : variations) keys.push_back(v.key);
  analysis::SweepTable table(keys);
  std::unique_ptr<analysis::Study> study;
  CaseSpec study_model;  // spec of `study` without load and thresholds
  int n_solves = 0;
  for (size_t c = 0; c < combinations.size(); ++c) {
    const CaseSpec& spec = combinations[c].spec;
    CaseSpec model = spec;
    model.load = analysis::LoadSpec();
    model.thresholds = analysis::default_thresholds();
    model.label.clear();
    model.notes.clear();
    const std::string prefix =
        "combination " + std::to_string(c + 1) + " of " + std::to_string(combinations.size());
    if (!study || model != study_model) {
      study.reset();
      study = in_model_stage([&] {
        return std::make_unique<analysis::Study>(
            spec,
            [&progress, &prefix](const std::string& stage, double f) {
              progress.report(prefix + ": " + stage, f);
            },
            interrupt_flag());
      });
      study_model = model;
      ++n_solves;
    }
    stop_if_interrupted();
    const auto& solutions = study->solutions();
    const analysis::ScenarioSolution* healthy =
        solutions[static_cast<size_t>(study->healthy_index())].get();
    for (const auto& solution : solutions) {
      const analysis::ScenarioResult r = in_model_stage(
          [&] { return analysis::evaluate(*solution, spec.load, spec.thresholds, healthy); });
      table.add(static_cast<int>(c + 1), combinations[c].values, r);
    }
  }
  progress.note(plural(combinations.size(), "combination") + ", " +
                plural(static_cast<size_t>(n_solves), "model") + " solved");
  analysis::write_file_atomic(out.path("sweep.csv"), table.csv());
  analysis::save_case(base, out.path("sweep_case.json"));
  stop_if_interrupted();
  out.commit();
  announce(options.out_dir, {"sweep.csv", "sweep_case.json"});
}

void mesh_command(const CommonOptions& options) {
  Progress progress(options.quiet);
  const CaseSpec spec = analysis::parse_case(case_text(options), options.case_path);
  analysis::StagedFolder out(options.out_dir);
  std::vector<analysis::ScenarioFacts> facts;
  std::vector<std::string> written = {"mesh_statistics.json"};
  const size_t n = spec.scenarios.size();
  for (size_t i = 0; i < n; ++i) {
    const std::string& name = spec.scenarios[i].name;
    progress.report("meshing scenario " + std::to_string(i + 1) + " of " + std::to_string(n) +
                        " (" + name + ")",
                    static_cast<double>(i) / static_cast<double>(n));
    stop_if_interrupted();
    const mesh::ToothModel model =
        in_model_stage([&] { return build_model(spec, static_cast<int>(i)); });
    stop_if_interrupted();
    analysis::ScenarioFacts f;
    f.geometry = model.geometry;
    f.mesh = in_model_stage([&] { return mesh::measure(model.mesh); });
    const std::string stem = analysis::scenario_file_stem(static_cast<int>(i), name);
    f.model_vtu = stem + "_mesh.vtu";
    in_output_stage([&] {
      mesh::write_vtu(out.path(f.model_vtu), model.mesh);
      mesh::write_boundary_vtu(out.path(stem + "_boundary.vtu"), model.mesh);
    });
    written.insert(written.end(), {f.model_vtu, stem + "_boundary.vtu"});
    facts.push_back(std::move(f));
  }
  progress.report("meshing done", 1.0);
  analysis::write_file_atomic(out.path("mesh_statistics.json"),
                              analysis::mesh_statistics_json(spec, facts));
  stop_if_interrupted();
  out.commit();
  announce(options.out_dir, written);
}

}  // namespace sharpey::batch
