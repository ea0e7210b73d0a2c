// sharpey-batch end to end on a small coarse case: `run` writes every report with its fixed keys
// and the caution, the .vtu files open and agree with results.json, and `mesh` meshes the same
// models.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <nlohmann/json.hpp>
#include <sstream>
#include <string>
#include <utility>

#include "sharpey/analysis/case_spec.h"
#include "sharpey/analysis/study.h"
#include "support/batch_process.h"
#include "support/results_keys.h"

#ifdef SHARPEY_TEST_WITH_VTK
#include <vtkCellData.h>
#include <vtkDataArray.h>
#include <vtkPointData.h>
#include <vtkSmartPointer.h>
#include <vtkUnstructuredGrid.h>
#include <vtkXMLUnstructuredGridReader.h>
#endif

namespace sharpey::test {
namespace {

using Json = nlohmann::json;

std::string first_line(const std::string& text) { return text.substr(0, text.find('\n')); }

// One batch run shared by all checks (ctest runs each TEST in its own process, so one TEST keeps
// the suite to a single solve). Each check is a function with its own trace.
struct RunOutput {
  TempFolder* folder;
  std::string case_path, out;
  ProcessResult result;
  Json results() const { return Json::parse(read_file(out + "/results.json")); }
};

void check_files(const RunOutput& run) {
  EXPECT_NE(run.result.err.find("sharpey-batch: ["), std::string::npos)
      << "progress lines on stderr";
  const std::vector<std::string> expected = {"allowance.csv",
                                             "case.json",
                                             "results.json",
                                             "s1_healthy_model.vtu",
                                             "s1_healthy_pdl.vtu",
                                             "s1_healthy_root_map.csv",
                                             "s2_3_mm_loss_model.vtu",
                                             "s2_3_mm_loss_pdl.vtu",
                                             "s2_3_mm_loss_root_map.csv",
                                             "summary.csv",
                                             "summary.txt"};
  EXPECT_EQ(list_folder(run.out), expected);
  // Nothing else beside the output folder: the staging folder is gone.
  EXPECT_EQ(list_folder(run.folder->path()), (std::vector<std::string>{"case.json", "out"}));
}

void check_results_json(const RunOutput& run) {
  const Json j = run.results();
  for (const char* key : kFixedTopLevelKeys) EXPECT_TRUE(j.contains(key)) << key;
  EXPECT_EQ(j["caution"], analysis::caution_text());
  EXPECT_TRUE(j["units"].is_object());
  ASSERT_TRUE(j["sources"].is_array());
  ASSERT_EQ(j["scenarios"].size(), 2u);
  for (const Json& s : j["scenarios"]) {
    SCOPED_TRACE(s["name"].get<std::string>());
    for (const char* key : kFixedScenarioKeys) {
      ASSERT_TRUE(s.contains(key)) << key;
      if (std::string(key) != "pdl_pressure_kpa") {
        EXPECT_TRUE(s[key].is_number()) << key;
      }
    }
    for (const char* key : kFixedPressureKeys) {
      EXPECT_TRUE(s["pdl_pressure_kpa"][key].is_number()) << key;
      EXPECT_GT(s["pdl_pressure_kpa"][key].get<double>(), 0) << key;
    }
    EXPECT_GT(s["mesh"]["n_nodes"].get<int>(), 0);
    EXPECT_GT(s["solver"]["n_dofs"].get<int>(), 0);
  }
  EXPECT_EQ(j["scenarios"][0]["bone_loss_mm"], 0);
  EXPECT_EQ(j["scenarios"][1]["bone_loss_mm"], 3);
  // Sanity of the figures through the whole chain (the analyses' own tests check them closely):
  // less attachment and higher peak pressure with loss; the healthy reference needs the applied
  // force, the reduced one less.
  const Json& h = j["scenarios"][0];
  const Json& l = j["scenarios"][1];
  EXPECT_LT(l["attachment_area_mm2"].get<double>(), h["attachment_area_mm2"].get<double>());
  EXPECT_GT(l["pdl_pressure_kpa"]["max_compression"].get<double>(),
            h["pdl_pressure_kpa"]["max_compression"].get<double>());
  EXPECT_NEAR(h["equivalent_force_g"].get<double>(), 100.0, 1e-9);
  EXPECT_LT(l["equivalent_force_g"].get<double>(), 100.0);
}

void check_caution_and_csv(const RunOutput& run) {
  for (const char* csv : {"summary.csv", "s1_healthy_root_map.csv", "s2_3_mm_loss_root_map.csv"})
    EXPECT_EQ(first_line(read_file(run.out + "/" + csv)), "# " + analysis::caution_text()) << csv;
  const std::string summary = read_file(run.out + "/summary.txt");
  EXPECT_NE(summary.find("Caution: these figures are a model estimate"), std::string::npos);
  EXPECT_NE(summary.find("3 mm loss"), std::string::npos);
  // summary.csv: one row per scenario, numbers matching results.json.
  std::istringstream rows(read_file(run.out + "/summary.csv"));
  std::vector<std::string> lines;
  for (std::string line; std::getline(rows, line);) lines.push_back(line);
  ASSERT_EQ(lines.size(), 5u);
  EXPECT_EQ(lines[3].rfind("healthy,0,", 0), 0u);
  EXPECT_EQ(lines[4].rfind("3 mm loss,3,", 0), 0u);
}

void check_case_echo(const RunOutput& run) {
  const analysis::CaseSpec input = analysis::load_case(run.case_path);
  EXPECT_TRUE(analysis::load_case(run.out + "/case.json") == input);
  EXPECT_TRUE(analysis::parse_case(run.results()["case"].dump()) == input);
}

void check_vtu(const RunOutput& run) {
  const Json j = run.results();
  for (const Json& s : j["scenarios"]) {
    const std::string model = run.out + "/" + s["files"]["model_vtu"].get<std::string>();
    const std::string pdl = run.out + "/" + s["files"]["pdl_vtu"].get<std::string>();
    SCOPED_TRACE(model);
    for (const std::string& path : {model, pdl}) {
      const std::string text = read_file(path);
      EXPECT_EQ(text.rfind("<?xml", 0) == 0 || text.rfind("<VTKFile", 0) == 0, true);
      EXPECT_NE(text.find("</VTKFile>"), std::string::npos) << "file is complete";
    }
#ifdef SHARPEY_TEST_WITH_VTK
    auto read = [](const std::string& path) {
      auto reader = vtkSmartPointer<vtkXMLUnstructuredGridReader>::New();
      reader->SetFileName(path.c_str());
      reader->Update();
      vtkSmartPointer<vtkUnstructuredGrid> grid = reader->GetOutput();
      return grid;
    };
    const auto full = read(model);
    ASSERT_NE(full, nullptr);
    EXPECT_EQ(full->GetNumberOfPoints(), s["mesh"]["n_nodes"].get<vtkIdType>());
    EXPECT_EQ(full->GetNumberOfCells(), s["mesh"]["n_elements"].get<vtkIdType>());
    ASSERT_NE(full->GetCellData()->GetArray("region"), nullptr);
    vtkDataArray* displacement = full->GetPointData()->GetArray("displacement_mm");
    ASSERT_NE(displacement, nullptr);
    EXPECT_EQ(displacement->GetNumberOfComponents(), 3);

    const auto ligament = read(pdl);
    EXPECT_EQ(ligament->GetNumberOfCells(), s["mesh"]["elements_per_region"]["2"].get<vtkIdType>());
    for (const char* name :
         {"hydrostatic_pressure_kpa", "max_principal_strain", "displacement_mm", "crest_edge_band"})
      ASSERT_NE(ligament->GetPointData()->GetArray(name), nullptr) << name;
    // Two routes to the same number: the extremes of the written nodal fields outside the band
    // next to the PDL's free edge (array crest_edge_band = 1) and results.json.
    vtkDataArray* band = ligament->GetPointData()->GetArray("crest_edge_band");
    double band_peak = 0;
    auto extremes = [&](const char* name) {
      vtkDataArray* a = ligament->GetPointData()->GetArray(name);
      double lo = 1e300, hi = -1e300;
      vtkIdType n_band = 0;
      band_peak = 0;
      for (vtkIdType i = 0; i < a->GetNumberOfTuples(); ++i) {
        if (band->GetTuple1(i) != 0) {
          ++n_band;
          band_peak = std::max(band_peak, a->GetTuple1(i));
          continue;
        }
        lo = std::min(lo, a->GetTuple1(i));
        hi = std::max(hi, a->GetTuple1(i));
      }
      EXPECT_GT(n_band, 0) << "the band next to the free edge holds PDL nodes";
      EXPECT_LT(n_band, a->GetNumberOfTuples() / 4) << "the band is a thin strip";
      return std::make_pair(lo, hi);
    };
    const auto [p_lo, p_hi] = extremes("hydrostatic_pressure_kpa");
    const double peak = s["pdl_pressure_kpa"]["max_compression"].get<double>();
    EXPECT_NEAR(p_hi, peak, 1e-9 * peak);
    const double tension = s["pdl_pressure_kpa"]["max_tension"].get<double>();
    EXPECT_NEAR(-p_lo, tension, 1e-9 * tension);
    const double edge = s["pdl_pressure_kpa"]["max_compression_crest_edge"].get<double>();
    EXPECT_NEAR(band_peak, edge, 1e-9 * std::max(1.0, edge));
    const auto strain = extremes("max_principal_strain");
    EXPECT_NEAR(strain.second, s["max_principal_strain"].get<double>(),
                1e-9 * s["max_principal_strain"].get<double>());
#else
    std::cout << "[ note ] VTK not found at configure time: checked the XML envelope only\n";
#endif
  }
}

void check_mesh_command(const RunOutput& run) {
  const std::string mesh_out = *run.folder / "mesh-out";
  const ProcessResult r = run_batch({"mesh", run.case_path, "--out", mesh_out, "--quiet"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_TRUE(r.err.empty()) << "--quiet prints no progress: " << r.err;
  const std::vector<std::string> expected = {"mesh_statistics.json", "s1_healthy_boundary.vtu",
                                             "s1_healthy_mesh.vtu", "s2_3_mm_loss_boundary.vtu",
                                             "s2_3_mm_loss_mesh.vtu"};
  EXPECT_EQ(list_folder(mesh_out), expected);
  const Json stats = Json::parse(read_file(mesh_out + "/mesh_statistics.json"));
  EXPECT_EQ(stats["caution"], analysis::caution_text());
  const Json solved = run.results();
  ASSERT_EQ(stats["scenarios"].size(), 2u);
  for (size_t i = 0; i < 2; ++i) {
    // The mesher is deterministic: same counts and volumes as the meshes `run` solved on.
    EXPECT_EQ(stats["scenarios"][i]["mesh"]["n_nodes"], solved["scenarios"][i]["mesh"]["n_nodes"]);
    EXPECT_EQ(stats["scenarios"][i]["mesh"]["n_elements"],
              solved["scenarios"][i]["mesh"]["n_elements"]);
    EXPECT_NEAR(stats["scenarios"][i]["mesh"]["volume_per_region_mm3"]["2"].get<double>(),
                solved["scenarios"][i]["mesh"]["volume_per_region_mm3"]["2"].get<double>(), 1e-9);
  }
}

TEST(BatchRun, EndToEndOnACoarseTwoScenarioCase) {
  TempFolder folder("batch-run");
  RunOutput run{&folder, folder / "case.json", folder / "out", {}};
  write_file(run.case_path, coarse_case_json(2));
  run.result = run_batch({"run", run.case_path, "--out", run.out});
  ASSERT_EQ(run.result.exit_code, 0) << run.result.err;
  {
    SCOPED_TRACE("files");
    check_files(run);
  }
  {
    SCOPED_TRACE("results.json");
    check_results_json(run);
  }
  {
    SCOPED_TRACE("caution and CSV");
    check_caution_and_csv(run);
  }
  {
    SCOPED_TRACE("case echo");
    check_case_echo(run);
  }
  {
    SCOPED_TRACE(".vtu files");
    check_vtu(run);
  }
  {
    SCOPED_TRACE("mesh command");
    check_mesh_command(run);
  }
}

}  // namespace
}  // namespace sharpey::test
