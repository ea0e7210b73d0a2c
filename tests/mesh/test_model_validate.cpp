// validate(): every bad input gets an InputError naming the parameter, the offending value, the
// allowed range or limit and the fix. Table-driven; each case carries its own name for the trace.
#include <gtest/gtest.h>

#include <cmath>
#include <functional>
#include <limits>
#include <string>
#include <vector>

#include "sharpey/error.h"
#include "sharpey/mesh/tooth_model.h"

namespace sharpey::mesh {
namespace {

struct BadInput {
  std::string name;
  std::function<void(ModelSpec&)> edit;
  std::string key;
  std::vector<std::string> fragments;  // all must appear in the message
};

std::ostream& operator<<(std::ostream& os, const BadInput& c) { return os << c.name; }

const double kNaN = std::numeric_limits<double>::quiet_NaN();

std::vector<BadInput> cases() {
  return {
      {"loss_beyond_root",
       [](ModelSpec& s) { s.loss.horizontal_mm = 14; },
       "loss.horizontal_mm",
       {"bone loss 14.0 mm leaves no embedded root", "13.0 mm long", "1.5 mm below the CEJ",
        "use at most 10.0 mm"}},
      {"loss_just_too_much",
       [](ModelSpec& s) { s.loss.horizontal_mm = 10.05; },
       "loss.horizontal_mm",
       {"10.05 mm", "use at most 10.0 mm"}},
      {"loss_negative",
       [](ModelSpec& s) { s.loss.horizontal_mm = -1; },
       "loss.horizontal_mm",
       {"-1.0 mm", "negative", "use 0"}},
      {"pdl_zero_width",
       [](ModelSpec& s) { s.pdl.crest_width_mm = 0; },
       "pdl.crest_width_mm",
       {"PDL width at the crest 0.0 mm", "above 0.0 up to 1.0 mm", "positive width"}},
      {"pdl_too_wide",
       [](ModelSpec& s) { s.pdl.mid_width_mm = 1.2; },
       "pdl.mid_width_mm",
       {"1.2 mm", "up to 1.0 mm", "0.1 to 0.4 mm"}},
      {"pdl_not_a_number",
       [](ModelSpec& s) { s.pdl.apex_width_mm = kNaN; },
       "pdl.apex_width_mm",
       {"NaN"}},
      {"cortical_as_thick_as_plate",
       [](ModelSpec& s) {
         s.bone.cortical_thickness_mm = 1.5;
         s.bone.labial_plate_mm = 1.5;
       },
       "bone.cortical_thickness_mm",
       {"cortical thickness 1.5 mm is not less than the labial plate thickness 1.5 mm",
        "below 1.5 mm"}},
      {"cortical_negative",
       [](ModelSpec& s) { s.bone.cortical_thickness_mm = -0.1; },
       "bone.cortical_thickness_mm",
       {"-0.1 mm", "positive thickness"}},
      {"cortical_fills_short_root",
       [](ModelSpec& s) {
         s.bone.labial_plate_mm = s.bone.lingual_plate_mm = 4;
         s.bone.cortical_thickness_mm = 2.5;
         s.loss.horizontal_mm = 9;
       },
       "bone.cortical_thickness_mm",
       {"2.5 mm", "embedded root is 2.5 mm", "at most 2.0 mm"}},
      {"labial_plate_negative",
       [](ModelSpec& s) { s.bone.labial_plate_mm = -1; },
       "bone.labial_plate_mm",
       {"-1.0 mm", "0.3 to 10.0 mm"}},
      {"lingual_plate_huge",
       [](ModelSpec& s) { s.bone.lingual_plate_mm = 30; },
       "bone.lingual_plate_mm",
       {"30.0 mm", "0.3 to 10.0 mm"}},
      {"no_interproximal_bone",
       [](ModelSpec& s) { s.bone.interproximal_margin_mm = 0; },
       "bone.interproximal_margin_mm",
       {"0.0 mm", "0.5 to 10.0 mm"}},
      {"no_bone_below_apex",
       [](ModelSpec& s) { s.bone.depth_below_apex_mm = 0; },
       "bone.depth_below_apex_mm",
       {"0.0 mm", "0.5 to 20.0 mm"}},
      {"crest_at_cej",
       [](ModelSpec& s) { s.bone.crest_below_cej_mm = 0; },
       "bone.crest_below_cej_mm",
       {"0.0 mm", "0.25 to 5.0 mm", "1 to 2 mm below the CEJ"}},
      {"defect_deeper_than_root",
       [](ModelSpec& s) { s.loss.defect_depth_mm = 12; },
       "loss.defect_depth_mm",
       {"angular defect depth 12.0 mm is deeper than the remaining root",
        "embedded root is 11.5 mm", "use at most 10.0 mm"}},
      {"defect_after_loss",
       [](ModelSpec& s) {
         s.loss.horizontal_mm = 6;
         s.loss.defect_depth_mm = 5;
       },
       "loss.defect_depth_mm",
       {"after 6.0 mm horizontal loss", "5.5 mm long", "at most 4.0 mm"}},
      {"defect_negative",
       [](ModelSpec& s) { s.loss.defect_depth_mm = -2; },
       "loss.defect_depth_mm",
       {"-2.0 mm", "negative"}},
      {"defect_too_narrow",
       [](ModelSpec& s) {
         s.loss.defect_depth_mm = 2;
         s.loss.defect_width_deg = 10;
       },
       "loss.defect_width_deg",
       {"10.0 deg", "20.0 to 180.0 deg"}},
      {"defect_unknown_surface",
       [](ModelSpec& s) {
         s.loss.defect_depth_mm = 2;
         s.loss.defect_surface = static_cast<ToothSurface>(9);
       },
       "loss.defect_surface",
       {"unknown defect surface", "mesial, distal, labial or lingual"}},
      {"bracket_above_crown",
       [](ModelSpec& s) { s.bracket.height_mm = 10; },
       "bracket.height_mm",
       {"centred 10.0 mm above the CEJ is off the crown", "crown length 10.5 mm",
        "use a height between 2.0 and"}},
      {"bracket_at_cej",
       [](ModelSpec& s) { s.bracket.height_mm = 0.5; },
       "bracket.height_mm",
       {"off the crown", "0.5 mm above the CEJ"}},
      {"bracket_too_wide",
       [](ModelSpec& s) { s.bracket.width_mm = 9; },
       "bracket.width_mm",
       {"bracket pad width 9.0 mm", "fit on the labial face"}},
      {"bracket_without_length",
       [](ModelSpec& s) { s.bracket.length_mm = 0; },
       "bracket.length_mm",
       {"bracket pad length 0.0 mm", "0.5 to"}},
      {"root_too_long",
       [](ModelSpec& s) { s.tooth.dimensions.root_length_mm = 40; },
       "tooth.dimensions.root_length_mm",
       {"root length 40.0 mm", "5.0 to 25.0 mm"}},
      {"crown_missing",
       [](ModelSpec& s) { s.tooth.dimensions.crown_length_mm = 0; },
       "tooth.dimensions.crown_length_mm",
       {"crown length 0.0 mm", "3.0 to 16.0 mm"}},
      {"cervix_not_a_number",
       [](ModelSpec& s) { s.tooth.dimensions.cervix_mesiodistal_mm = kNaN; },
       "tooth.dimensions.cervix_mesiodistal_mm",
       {"NaN"}},
      {"ideal_radius_too_large",
       [](ModelSpec& s) {
         s.tooth.ideal_root = IdealRoot::kCylinder;
         s.tooth.ideal_radius_mm = 5;
       },
       "tooth.ideal_radius_mm",
       {"idealised root radius 5.0 mm", "0.5 to 4.0 mm", "a third"}},
      {"ideal_root_too_short",
       [](ModelSpec& s) {
         s.tooth.ideal_root = IdealRoot::kCone;
         s.tooth.ideal_length_mm = 2;
       },
       "tooth.ideal_length_mm",
       {"idealised root length 2.0 mm", "4.0 to 30.0 mm"}},
      {"pdl_edge_too_coarse",
       [](ModelSpec& s) { s.sizing.pdl_edge_mm = 5; },
       "sizing.pdl_edge_mm",
       {"PDL edge length 5.0 mm", "0.1 to 2.0 mm", "0 keeps the preset"}},
      {"pdl_layers_too_many",
       [](ModelSpec& s) { s.sizing.pdl_layers = 7; },
       "sizing.pdl_layers",
       {"PDL layers 7", "1 to 4"}},
      {"pdl_layers_negative",
       [](ModelSpec& s) { s.sizing.pdl_layers = -1; },
       "sizing.pdl_layers",
       {"PDL layers -1"}},
      {"bone_edge_too_fine",
       [](ModelSpec& s) { s.sizing.bone_edge_mm = 0.2; },
       "sizing.bone_edge_mm",
       {"bone edge length 0.2 mm", "0.3 to 10.0 mm"}},
      {"bone_finer_than_pdl",
       [](ModelSpec& s) {
         s.sizing.preset = MeshPreset::kCoarse;
         s.sizing.bone_edge_mm = 0.5;
       },
       "sizing.bone_edge_mm",
       {"0.5 mm is below the PDL edge length 0.9 mm", "raise it to 0.9 mm"}},
      {"unknown_preset",
       [](ModelSpec& s) { s.sizing.preset = static_cast<MeshPreset>(5); },
       "sizing.preset",
       {"unknown mesh preset", "coarse, standard or fine"}},
  };
}

class ValidateBadInput : public ::testing::TestWithParam<BadInput> {};

TEST_P(ValidateBadInput, NamesValueRangeAndFix) {
  const BadInput& c = GetParam();
  ModelSpec spec;
  c.edit(spec);
  try {
    validate(spec);
    FAIL() << "no error for " << c.name;
  } catch (const InputError& e) {
    SCOPED_TRACE(std::string("message: ") + e.what());
    EXPECT_EQ(e.key(), c.key);
    for (const std::string& f : c.fragments)
      EXPECT_NE(std::string(e.what()).find(f), std::string::npos) << f;
  }
}

INSTANTIATE_TEST_SUITE_P(Table, ValidateBadInput, ::testing::ValuesIn(cases()),
                         [](const ::testing::TestParamInfo<BadInput>& p) { return p.param.name; });

TEST(Validate, AcceptsEveryToothPresetAndIdealRoot) {
  for (ToothType t : all_tooth_types()) {
    for (MeshPreset p : {MeshPreset::kCoarse, MeshPreset::kStandard, MeshPreset::kFine}) {
      SCOPED_TRACE(to_string(t) + " " + to_string(p));
      ModelSpec s;
      s.tooth.type = t;
      s.tooth.dimensions = handbook_dimensions(t);
      s.sizing.preset = p;
      EXPECT_NO_THROW(validate(s));
      s.loss.horizontal_mm = 4;
      s.loss.defect_depth_mm = 2;
      EXPECT_NO_THROW(validate(s));
    }
  }
  for (IdealRoot r : {IdealRoot::kCylinder, IdealRoot::kCone, IdealRoot::kParaboloid}) {
    ModelSpec s;
    s.tooth.ideal_root = r;
    EXPECT_NO_THROW(validate(s));
  }
}

TEST(Validate, BuildRejectsBadInputBeforeMeshing) {
  ModelSpec s;
  s.loss.horizontal_mm = 14;
  EXPECT_THROW(build_tooth_model(s), InputError);
  EXPECT_THROW(model_geometry(s), InputError);
}

TEST(Validate, NamesRoundTrip) {
  for (ToothSurface f : {ToothSurface::kMesial, ToothSurface::kDistal, ToothSurface::kLabial,
                         ToothSurface::kLingual})
    EXPECT_EQ(tooth_surface_from_string(to_string(f)), f);
  for (MeshPreset p : {MeshPreset::kCoarse, MeshPreset::kStandard, MeshPreset::kFine})
    EXPECT_EQ(mesh_preset_from_string(to_string(p)), p);
  try {
    mesh_preset_from_string("medium");
    FAIL();
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("coarse, standard, fine"), std::string::npos);
  }
  EXPECT_THROW(tooth_surface_from_string("buccal"), InputError);
}

}  // namespace
}  // namespace sharpey::mesh
