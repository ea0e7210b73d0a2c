#include "batch_commands.h"

#include <signal.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <iostream>
#include <map>
#include <memory>
#include <new>
#include <sstream>
#include <thread>

#include "failure.h"
#include "interrupt.h"
#include "mpi_world.h"
#include "multi_root_sweep.h"
#include "progress.h"
#include "sharpey/analysis/case_spec.h"
#include "sharpey/analysis/multi_root_case.h"
#include "sharpey/analysis/study.h"
#include "sharpey/analysis/study_design.h"
#include "sharpey/error.h"
#include "sharpey/mesh/mesh_statistics.h"
#include "sharpey/mesh/vtu_writer.h"
#include "sharpey/output/allowance_output.h"
#include "sharpey/output/report_output.h"
#include "solver_threads.h"
#include "sweep_checkpoint.h"

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

// A multi-rooted case has no mesh preset to override.
void refuse_mesh_preset_of_multi_root(const CommonOptions& options) {
  if (!options.mesh_preset.empty())
    throw InputError("--mesh-preset",
                     "--mesh-preset " + options.mesh_preset +
                         ": a multi-rooted case has no mesh preset (its finite-element model, "
                         "finite_elements: true, has sizes of its own; docs/molars.md); leave "
                         "--mesh-preset out");
}

// The folder a tooth.surface file is relative to: the case file's.
std::string case_folder(const CommonOptions& options) {
  return std::filesystem::path(options.case_path).parent_path().string();
}

// The case file's text with the command-line overrides applied.
std::string case_text(const CommonOptions& options) {
  check_out_dir(options);
  std::string text = analysis::read_case_text(options.case_path);
  if (!options.mesh_preset.empty()) {
    analysis::parse_case(text, options.case_path,
                         case_folder(options));  // report the file's own errors first
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

// `run` of a multi-rooted case: what `molar` does, after refusing the options that only a
// single-rooted case takes.
void run_multi_root(const CommonOptions& options) {
  if (options.band)
    throw InputError("--band",
                     "--band computes the allowance band of a single-rooted case; a multi-rooted "
                     "case reports its allowances per movement without a band (docs/molars.md): "
                     "leave --band out");
  refuse_mesh_preset_of_multi_root(options);
  check_out_dir(options);
  molar_command(options);
}

}  // namespace

void run_command(const CommonOptions& options) {
  if (analysis::is_multi_root_case_file(options.case_path)) return run_multi_root(options);
  Progress progress(options.quiet);
  CaseSpec spec = analysis::parse_case(case_text(options), options.case_path, case_folder(options));
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
  {
    // The copy of the case lives in another folder: a scanned surface is named by its absolute
    // path there, so that the copy runs as it stands.
    CaseSpec copy = spec;
    if (!copy.surface.file.empty())
      copy.surface.file = std::filesystem::absolute(copy.surface.resolved_path).string();
    analysis::save_case(copy, out.path("case.json"));
  }
  written.insert(written.begin(),
                 {"results.json", "summary.csv", "summary.txt", "allowance.csv", "case.json"});
  pause_after_write();
  stop_if_interrupted();
  out.commit();
  announce(options.out_dir, written);
}

namespace {

// The model a combination solves: its case without what only changes the evaluation.
CaseSpec model_of(const CaseSpec& spec) {
  CaseSpec model = spec;
  model.load = analysis::LoadSpec();
  model.thresholds = analysis::default_thresholds();
  model.label.clear();
  model.notes.clear();
  return model;
}

bool changes_model(const std::string& key) {
  return key.rfind("load.", 0) != 0 && key.rfind("thresholds.", 0) != 0 && key != "label" &&
         key != "notes";
}

// Testing aid: SHARPEY_TEST_KILL_AFTER_MODELS=<k> makes rank 0 signal its own process right after
// the k-th checkpoint of this run is saved, so the restart tests stop a sweep at a known point
// (tests/analysis/test_batch_sweep_mpi.cpp). The signal is SIGKILL (as a scheduler or the
// machine would send it), or SIGINT (as Ctrl-C would) when SHARPEY_TEST_KILL_SIGNAL=INT.
void kill_if_test_asks(int n_saved) {
  static const long kill_after = [] {
    const char* value = std::getenv("SHARPEY_TEST_KILL_AFTER_MODELS");
    return value ? std::strtol(value, nullptr, 10) : 0L;
  }();
  static const int signal = [] {
    const char* value = std::getenv("SHARPEY_TEST_KILL_SIGNAL");
    return value && std::string(value) == "INT" ? SIGINT : SIGKILL;
  }();
  if (kill_after > 0 && n_saved == kill_after) {
    std::fflush(nullptr);
    ::raise(signal);
  }
}

// "tooth.type 10 x load.movement 5 x load.magnitude 3".
std::string factor_text(const std::vector<analysis::CaseVariation>& variations) {
  std::string text;
  for (const auto& v : variations)
    text += (text.empty() ? "" : " x ") + v.key + " " + std::to_string(v.values.size());
  return text;
}

// One combination of a sweep: its values of the varied keys and its checked case (a multi-rooted
// sweep: its case text and the case, or its failure record).
struct Combination {
  std::vector<std::string> values;
  CaseSpec spec;
  std::string text;
  MultiRootCombination molar;
};

struct SweepPlan {
  bool multi_root = false;                // multi-rooted cases (multi_root_sweep.h)
  CaseSpec base;                          // the base case (with the design applied)
  std::string base_text;                  // the same as case-file text
  size_t n_invalid = 0;                   // multi-rooted: combinations with a failure record
  std::string first_invalid;              // ... the first one's record
  std::vector<std::string> keys;          // varied keys, model keys first
  std::vector<Combination> combinations;  // in table order
  // Model m is combinations [model_begin[m], model_begin[m + 1]); one more entry than models.
  std::vector<size_t> model_begin;
};

// The base case with the design applied, and the variations of the design and the --vary
// options, the keys that change the model first.
struct SweepInputs {
  bool multi_root = false;
  std::string base_text;
  CaseSpec base;
  std::vector<analysis::CaseVariation> variations;
};

// A multi-rooted base case's text, checked (its own errors first) with the options it refuses.
std::string multi_root_case_text(const CommonOptions& options) {
  check_out_dir(options);
  refuse_mesh_preset_of_multi_root(options);
  const std::string text = analysis::read_case_text(options.case_path);
  analysis::parse_multi_root_case(text, options.case_path);
  return text;
}

SweepInputs read_sweep_inputs(const CommonOptions& options, const SweepOptions& sweep) {
  SweepInputs in;
  in.multi_root = analysis::is_multi_root_case_file(options.case_path);
  in.base_text = in.multi_root ? multi_root_case_text(options) : case_text(options);
  if (!sweep.design_path.empty()) {
    const analysis::StudyDesign design = analysis::parse_study_design(
        analysis::read_case_text(sweep.design_path), sweep.design_path, in.multi_root);
    if (!in.multi_root)
      analysis::parse_case(in.base_text, options.case_path,
                           case_folder(options));  // report the case's own errors first
    in.base_text = analysis::apply_study_design(in.base_text, design);
    in.variations = design.variations;
  }
  if (!in.multi_root)  // a multi-rooted sweep checks each combination, and records the invalid
    in.base = analysis::parse_case(in.base_text,
                                   sweep.design_path.empty()
                                       ? options.case_path
                                       : options.case_path + " with " + sweep.design_path,
                                   case_folder(options));

  for (const std::string& v : sweep.vary) {
    analysis::CaseVariation parsed = analysis::parse_variation(v);
    for (const auto& earlier : in.variations)
      if (earlier.key == parsed.key)
        throw InputError("--vary", "--vary " + v + ": " + parsed.key +
                                       " is varied twice (by --vary or the design); give all its "
                                       "values in one place");
    in.variations.push_back(std::move(parsed));
  }
  if (in.variations.empty() && sweep.design_path.empty())
    throw InputError("--vary", "sweep needs at least one --vary KEY=V1,V2,... or a --design file");
  // Keys that leave the model unchanged vary fastest, so consecutive combinations reuse one
  // solved Study (a new force system or threshold costs milliseconds, a new model a full solve).
  std::stable_partition(in.variations.begin(), in.variations.end(),
                        [](const auto& v) { return changes_model(v.key); });
  return in;
}

// The number of combinations; refuses a sweep larger than one sweep takes, with its full size.
size_t count_combinations(const std::vector<analysis::CaseVariation>& variations,
                          const SweepOptions& sweep) {
  size_t n_combinations = 1;
  for (const auto& v : variations) {
    n_combinations *= v.values.size();
    if (n_combinations <= kMaxSweepCombinations) continue;
    size_t total = 1;  // the full size, for the message (saturating)
    for (const auto& w : variations)
      total = total > kMaxSweepCombinations * 1000 ? total : total * w.values.size();
    throw InputError(
        sweep.design_path.empty() ? "--vary" : "--design",
        "the sweep has " + std::to_string(total) + " combinations (" + factor_text(variations) +
            "), more than the " + std::to_string(kMaxSweepCombinations) +
            " one sweep takes; split it into several sweeps with their own --out folders, e.g. "
            "one design file per tooth (\"teeth\": [one tooth]) or per material");
  }
  return n_combinations;
}

// Reads and checks the case of combination `c` (0-based) into `combo`: a bad value fails the
// sweep at once; in a multi-rooted sweep it becomes the combination's failure record.
void check_combination(const SweepInputs& in, const std::string& text, const std::string& origin,
                       size_t c, const CommonOptions& options, const SweepOptions& sweep,
                       Combination& combo) {
  if (in.multi_root) {
    combo.text = text;
    combo.molar = check_multi_root_combination(text, static_cast<int>(c + 1));
    return;
  }
  try {
    combo.spec = analysis::parse_case(text, origin, case_folder(options));
  } catch (const InputError& e) {
    throw InputError(e.key(), std::string(e.what()) + (sweep.design_path.empty()
                                                           ? " (from --vary)"
                                                           : " (from the design or --vary)"));
  }
}

// Every combination, built and checked before any solve so that a bad value fails at once; the
// last key varies fastest.
std::vector<Combination> expand_combinations(const SweepInputs& in, const CommonOptions& options,
                                             const SweepOptions& sweep) {
  const std::vector<analysis::CaseVariation>& variations = in.variations;
  const size_t n_combinations = count_combinations(variations, sweep);
  std::vector<Combination> combinations;
  std::vector<size_t> digit(variations.size(), 0);
  for (size_t c = 0; c < n_combinations; ++c) {
    Combination combo;
    std::string text = in.base_text;
    std::string description;
    for (size_t k = 0; k < variations.size(); ++k) {
      const std::string& value = variations[k].values[digit[k]];
      text = analysis::set_case_value(text, variations[k].key, value);
      combo.values.push_back(value);
      description += (description.empty() ? "" : ", ") + variations[k].key + "=" + value;
    }
    check_combination(in, text, options.case_path + " with " + description, c, options, sweep,
                      combo);
    combinations.push_back(std::move(combo));
    for (size_t k = variations.size(); k-- > 0;) {  // odometer, last key fastest
      if (++digit[k] < variations[k].values.size()) break;
      digit[k] = 0;
    }
  }
  return combinations;
}

// Models: runs of consecutive combinations with the same model (the unit of work, solved once).
// Model m is combinations [begin[m], begin[m + 1]).
// A multi-rooted model is its combinations' model_key; each invalid combination is one of its own.
std::vector<size_t> group_into_models(const std::vector<Combination>& combinations,
                                      bool multi_root) {
  std::vector<size_t> model_begin;
  CaseSpec previous;
  for (size_t c = 0; c < combinations.size(); ++c) {
    if (multi_root) {
      if (c == 0 || combinations[c].molar.model_key != combinations[c - 1].molar.model_key)
        model_begin.push_back(c);
      continue;
    }
    CaseSpec model = model_of(combinations[c].spec);
    if (c == 0 || model != previous) model_begin.push_back(c);
    previous = std::move(model);
  }
  model_begin.push_back(combinations.size());
  return model_begin;
}

// Reads the case, the design and the --vary options and expands them into the checked
// combinations, grouped into models. The same on every rank.
SweepPlan plan_sweep(const CommonOptions& options, const SweepOptions& sweep) {
  SweepInputs in = read_sweep_inputs(options, sweep);
  SweepPlan plan;
  plan.multi_root = in.multi_root;
  plan.combinations = expand_combinations(in, options, sweep);
  plan.model_begin = group_into_models(plan.combinations, in.multi_root);
  for (const auto& v : in.variations) plan.keys.push_back(v.key);
  plan.base = std::move(in.base);
  plan.base_text = std::move(in.base_text);
  for (const Combination& c : plan.combinations) {
    if (c.molar.failure.empty()) continue;
    if (plan.n_invalid++ == 0) plan.first_invalid = c.molar.failure;
  }
  // A sweep with nothing valid to run is a mistake of the design or the case, not a result.
  if (plan.multi_root && plan.n_invalid == plan.combinations.size())
    throw InputError(
        plan.combinations.front().molar.failure_key,
        "every combination of the sweep is invalid; the first: " + plan.first_invalid +
            (sweep.design_path.empty() ? " (from --vary)" : " (from the design or --vary)"));
  return plan;
}

// What every rank knows once the sweep starts: the plan, and on rank 0 the output folder, the
// checkpoint store and the rows of models an earlier run of the same sweep saved.
struct SweepStart {
  SweepPlan plan;
  std::unique_ptr<analysis::StagedFolder> out;
  std::unique_ptr<SweepCheckpoint> checkpoint;
  std::map<int, std::string> rows_of_model;
};

// Rank 0's part of the start: checks the output folder and reads the checkpoints of this sweep.
void open_sweep_folder(const CommonOptions& options, const SweepOptions& sweep, SweepStart& s) {
  std::vector<std::vector<std::string>> values;
  std::vector<std::string> case_json;
  for (const Combination& c : s.plan.combinations) {
    values.push_back(c.values);
    case_json.push_back(s.plan.multi_root ? c.text : analysis::case_to_json(c.spec));
  }
  // The thread count changes the last digits (solver_threads.h): rows of another count are
  // another sweep's.
  std::vector<std::string> with_threads = s.plan.keys;
  with_threads.push_back("--threads=" + std::to_string(sweep.threads));
  SweepCheckpoint::remove_stale_temporaries(options.out_dir);
  s.out = std::make_unique<analysis::StagedFolder>(options.out_dir);  // checks the path
  std::error_code ec;
  std::filesystem::create_directories(options.out_dir, ec);
  if (ec)
    throw analysis::OutputError("cannot create the output folder \"" + options.out_dir +
                                "\" for the sweep's checkpoints: " + ec.message());
  s.checkpoint = std::make_unique<SweepCheckpoint>(
      options.out_dir, sweep_fingerprint(with_threads, values, case_json),
      static_cast<int>(s.plan.model_begin.size()) - 1);
  s.rows_of_model = s.checkpoint->load();
}

// Every rank plans the sweep itself; rank 0 also opens the output folder. Then all agree: a
// failure anywhere stops every rank, reported once (by rank 0 when it failed too, else by the
// rank that failed).
SweepStart start_sweep(const CommonOptions& options, const SweepOptions& sweep, MpiWorld& world) {
  SweepStart s;
  std::exception_ptr failure;
  try {
    s.plan = plan_sweep(options, sweep);
    if (world.root()) open_sweep_folder(options, sweep, s);
  } catch (...) {
    failure = std::current_exception();
  }
  const int my_code = failure ? describe_failure(failure).exit_code : 0;
  const int worst = world.max_over_ranks(my_code);
  const int root_code = world.broadcast(my_code);
  if (failure) {
    if (!world.root() && root_code == 0) world.begin_independent_work();  // say it, end the job
    if (world.root() || root_code == 0) std::rethrow_exception(failure);
  }
  if (worst != 0) throw StoppedByRoot{root_code != 0 ? root_code : worst};
  return s;
}

// The models no checkpoint holds, as rank 0 knows them, on every rank.
std::vector<int> models_left(const SweepStart& s, MpiWorld& world) {
  const int n_models = static_cast<int>(s.plan.model_begin.size()) - 1;
  std::string done(static_cast<size_t>(n_models), '0');
  for (const auto& [m, rows] : s.rows_of_model) done[static_cast<size_t>(m)] = '1';
  done = world.broadcast(done);
  std::vector<int> left;
  for (int m = 0; m < n_models; ++m)
    if (done[static_cast<size_t>(m)] == '0') left.push_back(m);
  return left;
}

// "model 3 of 10 (combination 9 of 30)": model m's progress prefix.
std::string model_label(const SweepPlan& plan, int m) {
  const size_t n_models = plan.model_begin.size() - 1;
  const size_t first = plan.model_begin[static_cast<size_t>(m)];
  return "model " + std::to_string(m + 1) + " of " + std::to_string(n_models) + " (combination " +
         std::to_string(first + 1) + " of " + std::to_string(plan.combinations.size()) + ")";
}

// A multi-rooted model's rows: each of its combinations evaluated as `molar` evaluates a case
// (the thin-layer estimate in milliseconds, finite elements on request), or its failure record.
std::string multi_root_model_rows(const SweepPlan& plan, int m, Progress& progress) {
  const size_t first = plan.model_begin[static_cast<size_t>(m)];
  const size_t last = plan.model_begin[static_cast<size_t>(m) + 1];
  const std::string prefix = model_label(plan, m);
  std::string rows;
  for (size_t c = first; c < last; ++c) {
    const Combination& combo = plan.combinations[c];
    progress.report(prefix + (!combo.molar.failure.empty()       ? ": invalid, recorded"
                              : combo.molar.spec.finite_elements ? ": estimate and finite elements"
                                                                 : ": thin-layer estimate"),
                    static_cast<double>(c - first) / static_cast<double>(last - first));
    rows += in_model_stage(
        [&] { return multi_root_sweep_rows(static_cast<int>(c + 1), combo.values, combo.molar); });
    stop_if_interrupted();
  }
  return rows;
}

// Solves model m and evaluates each of its combinations on each bone level: its table rows.
std::string solve_model_rows(const SweepPlan& plan, int m, Progress& progress) {
  if (plan.multi_root) return multi_root_model_rows(plan, m, progress);
  const size_t first = plan.model_begin[static_cast<size_t>(m)];
  const size_t last = plan.model_begin[static_cast<size_t>(m) + 1];
  const std::string prefix = model_label(plan, m);
  const analysis::Study study = in_model_stage([&] {
    return analysis::Study(
        plan.combinations[first].spec,
        [&progress, &prefix](const std::string& stage, double f) {
          progress.report(prefix + ": " + stage, f);
        },
        interrupt_flag());
  });
  stop_if_interrupted();
  const auto& solutions = study.solutions();
  const analysis::ScenarioSolution* healthy =
      solutions[static_cast<size_t>(study.healthy_index())].get();
  analysis::SweepTable piece(plan.keys);
  for (size_t c = first; c < last; ++c) {
    const CaseSpec& spec = plan.combinations[c].spec;
    for (const auto& solution : solutions) {
      const analysis::ScenarioResult r = in_model_stage(
          [&] { return analysis::evaluate(*solution, spec.load, spec.thresholds, healthy); });
      piece.add(static_cast<int>(c + 1), plan.combinations[c].values, r);
    }
  }
  return piece.rows_text();
}

// Writes the sweep's tables into `out` from every model's rows: sweep.csv and sweep_case.json, and
// for a multi-rooted sweep sweep.json. Returns the names written.
std::vector<std::string> write_sweep_tables(const SweepPlan& plan,
                                            const std::map<int, std::string>& rows_of_model,
                                            const analysis::StagedFolder& out) {
  std::string rows;
  for (const auto& [m, model_rows] : rows_of_model) rows += model_rows;  // in model order
  if (plan.multi_root) {
    analysis::write_file_atomic(out.path("sweep.csv"), multi_root_sweep_csv(plan.keys, rows));
    analysis::write_file_atomic(out.path("sweep.json"), multi_root_sweep_json(plan.keys, rows));
    analysis::write_file_atomic(out.path("sweep_case.json"), plan.base_text + "\n");
    return {"sweep.csv", "sweep.json", "sweep_case.json"};
  }
  analysis::SweepTable table(plan.keys);
  table.add_rows_text(rows);
  analysis::write_file_atomic(out.path("sweep.csv"), table.csv());
  analysis::save_case(plan.base, out.path("sweep_case.json"));
  return {"sweep.csv", "sweep_case.json"};
}

}  // namespace

void sweep_command(const CommonOptions& options, const SweepOptions& sweep, MpiWorld& world) {
  // Stage lines of a model being solved come from rank 0 only; the study line covers all ranks.
  Progress progress(options.quiet || !world.root());
  SweepStart start = start_sweep(options, sweep, world);
  const SweepPlan& plan = start.plan;
  std::map<int, std::string>& rows_of_model = start.rows_of_model;
  const int n_models = static_cast<int>(plan.model_begin.size()) - 1;
  const std::vector<int> left = models_left(start, world);
  const int n_resumed = n_models - static_cast<int>(left.size());
  if (n_resumed > 0)
    progress.note("resuming: " + plural(static_cast<size_t>(n_resumed), "model") + " of " +
                  std::to_string(n_models) + " already solved (checkpoints in " + options.out_dir +
                  ")");
  if (plan.n_invalid > 0)
    progress.note(
        plural(plan.n_invalid, "combination") + " of " + std::to_string(plan.combinations.size()) +
        " invalid, kept as failure records in sweep.csv (the first: " + plan.first_invalid + ")");
  if (world.root() && world.size() > 1)
    std::fprintf(stderr, "sharpey-batch: %s over %d ranks (%s)\n",
                 plural(left.size(), "model").c_str(), world.size(),
                 plural(plan.combinations.size(), "combination").c_str());
  world.begin_independent_work();
  set_solver_threads(sweep.threads);

  StudyProgress study_progress(options.quiet || !world.root(), n_models, n_resumed, world.size());
  int n_saved = 0;
  // Rank 0 saves each model's rows (its own and those other ranks send) as a checkpoint.
  const auto save = [&](int m, std::string rows) {
    start.checkpoint->save(m, rows);
    rows_of_model[m] = std::move(rows);
    study_progress.model_done();
    kill_if_test_asks(++n_saved);
  };
  const auto take_arrivals = [&] {
    for (auto& [m, rows] : world.receive_ready()) {
      if (m < 0 || m >= n_models || rows_of_model.count(static_cast<int>(m)))
        throw Error("a rank sent the rows of model " + std::to_string(m) +
                    ", which is not expected (internal error)");
      save(static_cast<int>(m), std::move(rows));
    }
  };

  // Static share: the models left, dealt round-robin (neighbouring models, e.g. of one tooth,
  // cost about the same, so each rank gets a similar mix).
  for (size_t i = static_cast<size_t>(world.rank()); i < left.size();
       i += static_cast<size_t>(world.size())) {
    const int m = left[i];
    std::string rows = solve_model_rows(plan, m, progress);
    if (world.root()) {
      save(m, std::move(rows));
      take_arrivals();
    } else {
      world.send_to_root(m, rows);
    }
  }
  if (!world.root()) {
    world.flush_sends();
    return;
  }
  while (static_cast<int>(rows_of_model.size()) < n_models) {
    take_arrivals();
    stop_if_interrupted();
    std::this_thread::sleep_for(std::chrono::milliseconds(20));
  }

  progress.note(
      plural(plan.combinations.size(), "combination") + ", " +
      plural(static_cast<size_t>(study_progress.n_solved()), "model") + " solved" +
      (n_resumed > 0 ? ", " + std::to_string(n_resumed) + " resumed from checkpoints"
                     : std::string()) +
      (world.size() > 1 ? " on " + std::to_string(world.size()) + " ranks" : std::string()));
  const std::vector<std::string> written = write_sweep_tables(plan, rows_of_model, *start.out);
  stop_if_interrupted();
  start.out->commit();
  announce(options.out_dir, written);
}

void mesh_command(const CommonOptions& options) {
  Progress progress(options.quiet);
  const CaseSpec spec =
      analysis::parse_case(case_text(options), options.case_path, case_folder(options));
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

void molar_command(const CommonOptions& options) {
  const analysis::MultiRootCase spec = analysis::load_multi_root_case(options.case_path);
  analysis::StagedFolder out(options.out_dir);
  std::vector<std::string> written = {"multi_root_results.json", "multi_root_summary.txt"};
  in_output_stage([&] { analysis::run_multi_root_case(spec, out.staging_folder()); });
  for (size_t i = 0; i < spec.scenarios.size(); ++i)
    written.push_back(std::to_string(i) + "_root_map.csv");
  out.commit();
  announce(options.out_dir, written);
}

}  // namespace sharpey::batch
