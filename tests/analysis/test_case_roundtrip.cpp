// Round trip of case files: parse_case(case_to_json(x)) == x for the samples and for random valid
// cases (arbitrary doubles, every optional form), and the comparison itself sees every field.
#include <gtest/gtest.h>

#include <functional>
#include <random>
#include <string>

#include "sharpey/analysis/case_spec.h"
#include "sharpey/error.h"
#include "support/batch_process.h"

namespace sharpey::analysis {
namespace {

const char* kSamples[] = {"maxillary_central_incisor_bone_loss.json",
                          "mandibular_canine_angular_defect.json",
                          "mandibular_second_premolar_intrusion.json"};

class SampleTest : public ::testing::TestWithParam<const char*> {};

TEST_P(SampleTest, ParsesIsInventedAndRoundTrips) {
  const CaseSpec spec = load_case(test::sample_path(GetParam()));
  EXPECT_EQ(spec.label.rfind("Invented case", 0), 0u)
      << "samples are marked as invented: " << spec.label;
  EXPECT_GE(spec.scenarios.size(), 2u);
  const std::string text = case_to_json(spec);
  const CaseSpec again = parse_case(text);
  EXPECT_TRUE(again == spec) << text;
  EXPECT_EQ(case_to_json(again), text);  // the writer is a fixed point
}

INSTANTIATE_TEST_SUITE_P(Samples, SampleTest, ::testing::ValuesIn(kSamples));

TEST(CaseRoundTrip, IncisorSampleHoldsTheDocumentedScenarios) {
  const CaseSpec spec = load_case(test::sample_path("maxillary_central_incisor_bone_loss.json"));
  ASSERT_EQ(spec.scenarios.size(), 4u);
  const double expected[] = {0, 2, 4, 6};
  for (size_t i = 0; i < 4; ++i) EXPECT_EQ(spec.scenarios[i].loss.horizontal_mm, expected[i]);
  EXPECT_EQ(spec.load.magnitude, 100);
  EXPECT_EQ(spec.load.unit, ForceUnit::kGram);
  EXPECT_EQ(spec.load.direction, -Eigen::Vector3d::UnitX());
  EXPECT_EQ(spec.model.sizing.preset, mesh::MeshPreset::kStandard);
}

// A random case inside the allowed ranges, exercising every optional form of the file.
CaseSpec random_case(std::mt19937& rng) {
  std::uniform_real_distribution<double> u01(0.0, 1.0);
  auto in = [&](double lo, double hi) { return lo + (hi - lo) * u01(rng); };
  auto pick = [&](int n) { return static_cast<int>(rng() % static_cast<unsigned>(n)); };
  CaseSpec s;
  s.label = "Invented random case " + std::to_string(rng());
  if (pick(2)) s.notes = "notes with \"quotes\", commas and a line\nbreak";
  const auto types = mesh::all_tooth_types();
  s.model.tooth.type = types[static_cast<size_t>(pick(static_cast<int>(types.size())))];
  s.model.tooth.dimensions = mesh::handbook_dimensions(s.model.tooth.type);
  if (pick(2)) s.model.tooth.dimensions.root_length_mm = in(12, 18);
  if (pick(2)) s.model.tooth.dimensions.crown_length_mm = in(8, 11);
  if (pick(2)) s.model.tooth.dimensions.root_taper_fullness = in(1.0, 2.5);
  if (pick(4) == 0) {
    s.model.tooth.ideal_root = static_cast<mesh::IdealRoot>(1 + pick(3));
    s.model.tooth.ideal_length_mm = in(10, 14);
    s.model.tooth.ideal_radius_mm = in(2, 3);
  }
  if (pick(2)) {
    s.model.pdl.crest_width_mm = s.model.pdl.mid_width_mm = s.model.pdl.apex_width_mm =
        in(0.1, 0.4);
  } else {
    s.model.pdl.crest_width_mm = in(0.15, 0.3);
    s.model.pdl.mid_width_mm = in(0.1, 0.2);
    s.model.pdl.apex_width_mm = in(0.15, 0.3);
  }
  s.pdl_material = {in(0.05, 0.7), in(0.3, 0.49)};
  s.tooth_material = {in(15000, 20000), in(0.25, 0.35)};
  s.cortical_material = {in(12000, 15000), in(0.26, 0.32)};
  s.cancellous_material = {in(350, 2500), 0.3};
  s.model.bone.crest_below_cej_mm = in(1, 2);
  s.model.bone.cortical_thickness_mm = in(0.4, 0.8);
  s.model.bone.labial_plate_mm = in(1.2, 2.0);
  if (pick(2)) s.model.bracket.height_mm = in(4, 5);
  s.model.sizing.preset = static_cast<mesh::MeshPreset>(pick(3));
  if (pick(2)) s.model.sizing.pdl_edge_mm = in(0.3, 0.6);
  if (pick(2)) s.model.sizing.pdl_layers = 1 + pick(2);
  s.model.sizing.second_order = pick(4) != 0;
  const int n = 1 + pick(4);
  for (int i = 0; i < n; ++i) {
    Scenario sc;
    sc.name = "scenario " + std::to_string(i) + (pick(2) ? ", with a comma" : "");
    if (pick(2)) {
      sc.horizontal_loss_percent = in(0, 20);
      sc.loss.horizontal_mm = sc.horizontal_loss_percent / 100.0 * root_length_mm(s.model.tooth);
    } else {
      sc.loss.horizontal_mm = in(0, 3);
    }
    if (pick(2)) {
      sc.loss.defect_depth_mm = in(0.5, 2);
      sc.loss.defect_surface = static_cast<mesh::ToothSurface>(pick(4));
      sc.loss.defect_width_deg = in(30, 120);
    }
    s.scenarios.push_back(sc);
  }
  LoadSpec& l = s.load;
  l.unit = static_cast<ForceUnit>(pick(3));
  l.magnitude = from_newton(in(0.1, 2.0), l.unit);
  switch (pick(3)) {
    case 0: {
      const auto names = named_directions();
      l.direction_name = names[static_cast<size_t>(pick(static_cast<int>(names.size())))];
      l.direction = named_direction(l.direction_name);
      break;
    }
    default: {
      const Eigen::Vector3d v(in(-1, 1), in(-1, 1), in(-1, 1) + 0.1);
      l.direction = v.normalized();
      l.direction_name.clear();
    }
  }
  if (pick(2)) l.bracket_height_mm = in(3, 6);
  switch (pick(3)) {
    case 0:
      l.preset = all_movement_presets()[static_cast<size_t>(pick(7))];
      break;
    case 1:
      l.couple = CoupleKind::kMoment;
      l.moment_nmm = Eigen::Vector3d(in(-10, 10), in(-10, 10), in(-10, 10));
      break;
    default:
      l.couple = CoupleKind::kRatio;
      l.moment_to_force_mm = in(-12, 12);
  }
  if (pick(2)) s.thresholds.capillary = {in(3, 6), "own choice " + std::to_string(pick(100))};
  if (pick(2)) s.thresholds.limit = {in(10, 20), "limit source"};
  return s;
}

TEST(CaseRoundTrip, RandomValidCasesSurviveWriteAndRead) {
  std::mt19937 rng(20260);
  int checked = 0;
  for (int trial = 0; trial < 200; ++trial) {
    const CaseSpec x = random_case(rng);
    SCOPED_TRACE("trial " + std::to_string(trial));
    try {
      validate_case(x);
    } catch (const InputError& e) {
      continue;  // an impossible combination of random values; the round trip needs valid cases
    }
    const std::string text = case_to_json(x);
    const CaseSpec y = parse_case(text, "random");
    ASSERT_TRUE(y == x) << text;
    ++checked;
  }
  EXPECT_GE(checked, 150) << "too few random cases were valid to mean much";
}

TEST(CaseRoundTrip, SaveAndLoadThroughAFile) {
  std::mt19937 rng(7);
  CaseSpec x = random_case(rng);
  while (true) {
    try {
      validate_case(x);
      break;
    } catch (const InputError&) {
      x = random_case(rng);
    }
  }
  test::TempFolder folder("case-save");
  const std::string path = folder / "case.json";
  save_case(x, path);
  EXPECT_TRUE(load_case(path) == x);
  save_case(x, path);  // overwriting works and leaves no temporary file behind
  EXPECT_EQ(test::list_folder(folder.path()), std::vector<std::string>{"case.json"});
}

TEST(CaseRoundTrip, ComparisonSeesEveryField) {
  std::mt19937 rng(11);
  const CaseSpec base = random_case(rng);
  const std::vector<std::pair<const char*, std::function<void(CaseSpec&)>>> changes = {
      {"label", [](CaseSpec& s) { s.label += "x"; }},
      {"notes", [](CaseSpec& s) { s.notes += "x"; }},
      {"tooth.type",
       [](CaseSpec& s) {
         s.model.tooth.type = s.model.tooth.type == mesh::ToothType::kMandibularCanine
                                  ? mesh::ToothType::kMaxillaryCanine
                                  : mesh::ToothType::kMandibularCanine;
       }},
      {"root length", [](CaseSpec& s) { s.model.tooth.dimensions.root_length_mm += 1e-9; }},
      {"cej curvature",
       [](CaseSpec& s) { s.model.tooth.dimensions.cej_curvature_distal_mm += 0.1; }},
      {"root taper", [](CaseSpec& s) { s.model.tooth.dimensions.root_taper_fullness += 0.1; }},
      {"ideal radius", [](CaseSpec& s) { s.model.tooth.ideal_radius_mm += 0.1; }},
      {"pdl mid", [](CaseSpec& s) { s.model.pdl.mid_width_mm += 0.01; }},
      {"bone depth", [](CaseSpec& s) { s.model.bone.depth_below_apex_mm += 0.1; }},
      {"bracket width", [](CaseSpec& s) { s.model.bracket.width_mm += 0.1; }},
      {"pdl layers", [](CaseSpec& s) { s.model.sizing.pdl_layers += 1; }},
      {"order", [](CaseSpec& s) { s.model.sizing.second_order = !s.model.sizing.second_order; }},
      {"pdl E", [](CaseSpec& s) { s.pdl_material.young_modulus_mpa *= 1.01; }},
      {"cancellous nu", [](CaseSpec& s) { s.cancellous_material.poisson_ratio += 0.01; }},
      {"scenario name", [](CaseSpec& s) { s.scenarios[0].name += "x"; }},
      {"defect width", [](CaseSpec& s) { s.scenarios[0].loss.defect_width_deg += 1; }},
      {"percent", [](CaseSpec& s) { s.scenarios[0].horizontal_loss_percent += 1; }},
      {"scenario count", [](CaseSpec& s) { s.scenarios.push_back(s.scenarios[0]); }},
      {"magnitude", [](CaseSpec& s) { s.load.magnitude += 1; }},
      {"direction", [](CaseSpec& s) { s.load.direction = -s.load.direction; }},
      {"height", [](CaseSpec& s) { s.load.bracket_height_mm += 1; }},
      {"moment", [](CaseSpec& s) { s.load.moment_nmm.x() += 1; }},
      {"ratio", [](CaseSpec& s) { s.load.moment_to_force_mm += 1; }},
      {"preset",
       [](CaseSpec& s) {
         s.load.preset = s.load.preset == MovementPreset::kRotation ? MovementPreset::kIntrusion
                                                                    : MovementPreset::kRotation;
       }},
      {"capillary source", [](CaseSpec& s) { s.thresholds.capillary.source += "x"; }},
      {"limit value", [](CaseSpec& s) { s.thresholds.limit.value_kpa += 1; }},
  };
  EXPECT_TRUE(base == base);
  for (const auto& [name, change] : changes) {
    CaseSpec changed = base;
    change(changed);
    EXPECT_FALSE(changed == base) << "a change of " << name << " went unnoticed";
  }
}

}  // namespace
}  // namespace sharpey::analysis
