// The ten single-rooted permanent teeth and their handbook-average dimensions.
// Source of every number: check-values.md section 3 (Wheeler's Dental Anatomy, Physiology and
// Occlusion, Table 1-1); the status of each row ("pub (secondary copy)" or "from memory") is kept
// in handbook_status().
#include <sstream>

#include "sharpey/error.h"
#include "sharpey/mesh/tooth_model.h"

namespace sharpey::mesh {
namespace {

struct ToothRow {
  ToothType type;
  const char* name;
  ToothDimensions dims;  // crown, root, MD crown, MD cervix, LL crown, LL cervix, CEJ mesial, distal,
                        // root taper fullness (kFullness, not from the table)
  const char* status;
};

constexpr const char* kSecondary = "pub (secondary copy of Wheeler's Table 1-1)";
constexpr const char* kMemory = "from memory (Wheeler's Table 1-1)";
// Root taper exponent of every tooth (ToothDimensions::root_taper_fullness explains it).
constexpr double kFullness = 1.6;

const ToothRow kTeeth[] = {
    {ToothType::kMaxillaryCentralIncisor, "maxillary_central_incisor",
     {10.5, 13.0, 8.5, 7.0, 7.0, 6.0, 3.5, 2.5, kFullness}, kMemory},
    {ToothType::kMaxillaryLateralIncisor, "maxillary_lateral_incisor",
     {9.0, 13.0, 6.5, 5.0, 6.0, 5.0, 3.0, 2.0, kFullness}, kSecondary},
    {ToothType::kMaxillaryCanine, "maxillary_canine", {10.0, 17.0, 7.5, 5.5, 8.0, 7.0, 2.5, 1.5, kFullness},
     kMemory},
    {ToothType::kMaxillaryFirstPremolar, "maxillary_first_premolar",
     {8.5, 14.0, 7.0, 5.0, 9.0, 8.0, 1.0, 0.0, kFullness}, kSecondary},
    {ToothType::kMaxillarySecondPremolar, "maxillary_second_premolar",
     {8.5, 14.0, 7.0, 5.0, 9.0, 8.0, 1.0, 0.0, kFullness}, kMemory},
    {ToothType::kMandibularCentralIncisor, "mandibular_central_incisor",
     {9.0, 12.5, 5.0, 3.5, 6.0, 5.3, 3.0, 2.0, kFullness}, kSecondary},
    {ToothType::kMandibularLateralIncisor, "mandibular_lateral_incisor",
     {9.5, 14.0, 5.5, 4.0, 6.5, 5.8, 3.0, 2.0, kFullness}, kMemory},
    {ToothType::kMandibularCanine, "mandibular_canine", {11.0, 16.0, 7.0, 5.5, 7.5, 7.0, 2.5, 1.0, kFullness},
     kSecondary},
    {ToothType::kMandibularFirstPremolar, "mandibular_first_premolar",
     {8.5, 14.0, 7.0, 5.0, 7.5, 6.5, 1.0, 0.0, kFullness}, kSecondary},
    {ToothType::kMandibularSecondPremolar, "mandibular_second_premolar",
     {8.0, 14.5, 7.0, 5.0, 8.0, 7.0, 1.0, 0.0, kFullness}, kMemory},
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

}  // namespace sharpey::mesh
