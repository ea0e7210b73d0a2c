// VALIDATION SIDE of the root calibration (docs/analyses.md "Root calibration"). The per-tooth root
// taper fullness was calibrated on Jepsen 1963 (from memory; test_root_calibration.cpp); here the
// calibrated roots meet published measurements that played no part in it:
//   - CBCT of the maxillary teeth, Limsiriwong et al. 2019, Chiang Mai Dent J 40(1):57, abstract:
//     means of Class I (the figures of check-values.md section 4) and of Class II patients;
//   - CBCT of single-rooted maxillary premolars with normal roots, BMC Oral Health 2022, doi
//     10.1186/s12903-022-02258-3, abstract: 236.88 +- 27.93 mm^2 (mean +- SD, first and second
//     premolars together);
//   - extracted mandibular canines and premolars, Mowry et al. 2002, J Periodontol 73:1095,
//     abstract.
// No published figure was found for the mandibular incisors: they are calibrated, not validated.
//
// Bound ("within the published spread"): the model's area within one standard deviation of each
// published mean. The only per-tooth SD found is the 2022 premolar one (27.93 mm^2, 11.8 % of its
// mean); for the other means it is applied as a relative SD (widened: one sample's spread carried
// over to the other teeth and studies, labelled so in the docs).
//
// Observed, not met: the mandibular first and second premolars lie 28 % and 24 % below Mowry's
// means, beyond one SD. Their calibration figures (Jepsen, from memory) are that far below Mowry's,
// and Mowry et al. report their areas as "greater than that in most previous studies" (abstract).
// The model follows its calibration set, so the test asserts where these two teeth fall (below the
// band) and the docs say so; if a new calibration moves them inside, this test fails and the docs
// must be updated with it.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <string>

#include "sharpey/mesh/tooth_model.h"

namespace sharpey::mesh {
namespace {

constexpr double kRelativeSd = 27.93 / 236.88;  // source: BMC Oral Health 2022 (abstract)

struct PublishedArea {
  ToothType type;
  const char* source;
  double mean_mm2;
  double sd_mm2;     // published SD; 0: kRelativeSd x mean (widened)
  bool inside_band;  // false: observed outside, explained above
};
class RootValidation : public ::testing::TestWithParam<PublishedArea> {};

TEST_P(RootValidation, CalibratedRootWithinThePublishedSpread) {
  const PublishedArea p = GetParam();
  ModelSpec s;
  s.tooth.type = p.type;
  s.tooth.dimensions = handbook_dimensions(p.type);
  const double area = model_geometry(s).root_area_mm2;
  const double sd = p.sd_mm2 > 0 ? p.sd_mm2 : kRelativeSd * p.mean_mm2;
  const double z = (area - p.mean_mm2) / sd;
  std::printf(
      "validation %s vs %s: model %.1f mm2, published %.2f +- %.2f mm2%s: %+.1f %% "
      "(%+.2f SD)\n",
      to_string(p.type).c_str(), p.source, area, p.mean_mm2, sd,
      p.sd_mm2 > 0 ? "" : " (SD widened)", 100 * (area / p.mean_mm2 - 1), z);
  if (p.inside_band) {
    EXPECT_LE(std::abs(z), 1.0);  // published mean; SD published or widened (see above)
  } else {
    EXPECT_LT(z, -1.0);  // observed: calibration and validation sets disagree (see above)
  }
}

constexpr const char* kClassI = "Limsiriwong 2019 Class I (pub)";
constexpr const char* kClassII = "Limsiriwong 2019 Class II (pub)";
constexpr const char* kBmc = "BMC Oral Health 2022 (pub)";
constexpr const char* kMowry = "Mowry 2002 (pub)";

INSTANTIATE_TEST_SUITE_P(
    PublishedMeasurements, RootValidation,
    ::testing::Values(PublishedArea{ToothType::kMaxillaryCentralIncisor, kClassI, 208.51, 0, true},
                      PublishedArea{ToothType::kMaxillaryCentralIncisor, kClassII, 203.55, 0, true},
                      PublishedArea{ToothType::kMaxillaryLateralIncisor, kClassI, 193.87, 0, true},
                      PublishedArea{ToothType::kMaxillaryLateralIncisor, kClassII, 191.16, 0, true},
                      PublishedArea{ToothType::kMaxillaryCanine, kClassI, 275.54, 0, true},
                      PublishedArea{ToothType::kMaxillaryCanine, kClassII, 262.44, 0, true},
                      PublishedArea{ToothType::kMaxillaryFirstPremolar, kClassI, 258.70, 0, true},
                      PublishedArea{ToothType::kMaxillaryFirstPremolar, kClassII, 236.47, 0, true},
                      PublishedArea{ToothType::kMaxillaryFirstPremolar, kBmc, 236.88, 27.93, true},
                      PublishedArea{ToothType::kMaxillarySecondPremolar, kClassI, 233.35, 0, true},
                      PublishedArea{ToothType::kMaxillarySecondPremolar, kClassII, 227.91, 0, true},
                      PublishedArea{ToothType::kMaxillarySecondPremolar, kBmc, 236.88, 27.93, true},
                      PublishedArea{ToothType::kMandibularCanine, kMowry, 275.88, 0, true},
                      PublishedArea{ToothType::kMandibularFirstPremolar, kMowry, 251.45, 0, false},
                      PublishedArea{ToothType::kMandibularSecondPremolar, kMowry, 271.81, 0,
                                    false}),
    [](const ::testing::TestParamInfo<PublishedArea>& p) {
      return to_string(p.param.type) + "_" + std::to_string(p.index);
    });

}  // namespace
}  // namespace sharpey::mesh
