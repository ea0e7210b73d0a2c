// The ten single-rooted permanent teeth and their handbook-average dimensions.
// Source of every number: check-values.md section 3 (Wheeler's Dental Anatomy, Physiology and
// Occlusion, Table 1-1); the status of each row ("pub (secondary copy)" or "from memory") is kept
// in handbook_status(). The root taper fullness is not in the table: it is calibrated per tooth
// (see kTeeth).
#include <sstream>

#include "sharpey/error.h"
#include "sharpey/mesh/tooth_model.h"

namespace sharpey::mesh {
namespace {

struct ToothRow {
  ToothType type;
  const char* name;
  ToothDimensions dims;  // crown, root, MD crown, MD cervix, LL crown, LL cervix, CEJ mesial,
                         // distal, root taper fullness (calibrated, not from the table)
  const char* status;
  double jepsen_root_area_mm2;  // calibration target of the fullness
};

constexpr const char* kSecondary = "pub (secondary copy of Wheeler's Table 1-1)";
constexpr const char* kMemory = "from memory (Wheeler's Table 1-1)";

// Root taper fullness per tooth (the last value of each dims row): root_taper_fullness_for_area()
// applied to the row's table dimensions and Jepsen's 1963 root area (from memory, check-values.md
// section 4: the only set covering all ten teeth), rounded to two decimals (area within 0.1 mm^2
// of the target). tests/mesh/test_root_calibration.cpp re-derives each value; docs/analyses.md
// "Root calibration" gives the table. Three teeth need more than 2.5, the limit before the
// calibration (maxillary lateral incisor 3.47, mandibular central incisor 3.75, mandibular canine
// 2.84): with the handbook's cervical widths their roots must stay nearly parallel-sided for most
// of their length to carry Jepsen's area. The two maxillary premolars share Wheeler's dimensions
// and differ by their areas (234 and 220 mm^2), hence by their fullness (2.08 and 1.56).
const ToothRow kTeeth[] = {
    {ToothType::kMaxillaryCentralIncisor,
     "maxillary_central_incisor",
     {10.5, 13.0, 8.5, 7.0, 7.0, 6.0, 3.5, 2.5, 1.60},
     kMemory,
     204},
    {ToothType::kMaxillaryLateralIncisor,
     "maxillary_lateral_incisor",
     {9.0, 13.0, 6.5, 5.0, 6.0, 5.0, 3.0, 2.0, 3.47},
     kSecondary,
     179},
    {ToothType::kMaxillaryCanine,
     "maxillary_canine",
     {10.0, 17.0, 7.5, 5.5, 8.0, 7.0, 2.5, 1.5, 2.25},
     kMemory,
     273},
    {ToothType::kMaxillaryFirstPremolar,
     "maxillary_first_premolar",
     {8.5, 14.0, 7.0, 5.0, 9.0, 8.0, 1.0, 0.0, 2.08},
     kSecondary,
     234},
    {ToothType::kMaxillarySecondPremolar,
     "maxillary_second_premolar",
     {8.5, 14.0, 7.0, 5.0, 9.0, 8.0, 1.0, 0.0, 1.56},
     kMemory,
     220},
    {ToothType::kMandibularCentralIncisor,
     "mandibular_central_incisor",
     {9.0, 12.5, 5.0, 3.5, 6.0, 5.3, 3.0, 2.0, 3.75},
     kSecondary,
     154},
    {ToothType::kMandibularLateralIncisor,
     "mandibular_lateral_incisor",
     {9.5, 14.0, 5.5, 4.0, 6.5, 5.8, 3.0, 2.0, 1.74},
     kMemory,
     168},
    {ToothType::kMandibularCanine,
     "mandibular_canine",
     {11.0, 16.0, 7.0, 5.5, 7.5, 7.0, 2.5, 1.0, 2.84},
     kSecondary,
     268},
    {ToothType::kMandibularFirstPremolar,
     "mandibular_first_premolar",
     {8.5, 14.0, 7.0, 5.0, 7.5, 6.5, 1.0, 0.0, 1.19},
     kSecondary,
     180},
    {ToothType::kMandibularSecondPremolar,
     "mandibular_second_premolar",
     {8.0, 14.5, 7.0, 5.0, 8.0, 7.0, 1.0, 0.0, 1.51},
     kMemory,
     207},
};

const ToothRow& row(ToothType type) {
  for (const ToothRow& r : kTeeth)
    if (r.type == type) return r;
  throw InputError("tooth.type", "unknown tooth type");
}

}  // namespace

std::string to_string(ToothType type) { return row(type).name; }

ToothType tooth_type_from_string(const std::string& name) {
  for (const ToothRow& r : kTeeth)
    if (name == r.name) return r.type;
  std::ostringstream s;
  s << "unknown tooth type \"" << name << "\"; use one of:";
  for (const ToothRow& r : kTeeth) s << ' ' << r.name;
  throw InputError("tooth.type", s.str());
}

std::vector<ToothType> all_tooth_types() {
  std::vector<ToothType> types;
  for (const ToothRow& r : kTeeth) types.push_back(r.type);
  return types;
}

ToothDimensions handbook_dimensions(ToothType type) { return row(type).dims; }

std::string handbook_status(ToothType type) { return row(type).status; }

double root_calibration_area_mm2(ToothType type) { return row(type).jepsen_root_area_mm2; }

}  // namespace sharpey::mesh
