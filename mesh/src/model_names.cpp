// Stable snake_case identifiers of the model enums, used in case files and messages.
#include <array>
#include <string>
#include <utility>

#include "sharpey/error.h"
#include "sharpey/mesh/tooth_model.h"

namespace sharpey::mesh {
namespace {

constexpr std::array<std::pair<ToothSurface, const char*>, 4> kSurfaces = {{
    {ToothSurface::kMesial, "mesial"},
    {ToothSurface::kDistal, "distal"},
    {ToothSurface::kLabial, "labial"},
    {ToothSurface::kLingual, "lingual"},
}};

constexpr std::array<std::pair<MeshPreset, const char*>, 3> kPresets = {{
    {MeshPreset::kCoarse, "coarse"},
    {MeshPreset::kStandard, "standard"},
    {MeshPreset::kFine, "fine"},
}};

template <class Table>
std::string accepted(const Table& table) {
  std::string s;
  for (const auto& entry : table) s += std::string(s.empty() ? "" : ", ") + entry.second;
  return s;
}

}  // namespace

std::string to_string(ToothSurface s) {
  for (const auto& entry : kSurfaces)
    if (entry.first == s) return entry.second;
  throw InputError("loss.defect_surface", "unknown tooth surface value " +
                                              std::to_string(static_cast<int>(s)) +
                                              "; use one of: " + accepted(kSurfaces));
}

ToothSurface tooth_surface_from_string(const std::string& name) {
  for (const auto& entry : kSurfaces)
    if (name == entry.second) return entry.first;
  throw InputError("loss.defect_surface",
                   "unknown tooth surface \"" + name + "\"; use one of: " + accepted(kSurfaces));
}

std::string to_string(MeshPreset p) {
  for (const auto& entry : kPresets)
    if (entry.first == p) return entry.second;
  throw InputError("sizing.preset", "unknown mesh preset value " +
                                        std::to_string(static_cast<int>(p)) +
                                        "; use one of: " + accepted(kPresets));
}

MeshPreset mesh_preset_from_string(const std::string& name) {
  for (const auto& entry : kPresets)
    if (name == entry.second) return entry.first;
  throw InputError("sizing.preset",
                   "unknown mesh preset \"" + name + "\"; use one of: " + accepted(kPresets));
}

}  // namespace sharpey::mesh
