// Small queries on a model specification: resolved mesh sizes, root cross-sections, requested
// PDL width and attachment level.
#include <cmath>
#include <string>

#include "detail/model_frame.h"
#include "sharpey/core/constants.h"
#include "sharpey/error.h"
#include "sharpey/mesh/tooth_model.h"

namespace sharpey::mesh {

MeshSizes resolve_sizing(const MeshSizing& sizing) {
  MeshSizes s;
  switch (sizing.preset) {
    case MeshPreset::kCoarse:
      s = {0.9, 3.0, 3.0, 1};
      break;
    case MeshPreset::kStandard:
      s = {0.65, 2.0, 2.0, 2, 2.5};
      break;
    case MeshPreset::kFine:
      s = {0.38, 1.5, 1.5, 2};
      break;
  }
  if (sizing.pdl_edge_mm > 0) s.pdl_edge_mm = sizing.pdl_edge_mm;
  if (sizing.bone_edge_mm > 0) s.bone_edge_mm = s.tooth_edge_mm = sizing.bone_edge_mm;
  if (sizing.pdl_layers > 0) s.pdl_layers = sizing.pdl_layers;
  return s;
}

RootSection root_section(const ModelSpec& spec, double z_mm) {
  const detail::ToothShape shape(spec.tooth, spec.bone.crest_below_cej_mm);
  if (!(z_mm >= -shape.root_length() && z_mm <= 0)) {
    throw InputError("z_mm", "height " + std::to_string(z_mm) +
                                 " mm is not on the root, which spans " +
                                 std::to_string(-shape.root_length()) + " to 0 mm");
  }
  const detail::Section<double> q = shape.section(shape.s_of_z(z_mm));
  return {q.a, q.b};
}

double cone_virtual_tip_below_apex_mm(const ModelSpec& spec) {
  if (spec.tooth.ideal_root != IdealRoot::kCone) return 0.0;
  return detail::ToothShape(spec.tooth, spec.bone.crest_below_cej_mm).cone_delta();
}

double requested_pdl_width_mm(const ModelSpec& spec, double z_mm) {
  return detail::pdl_width_profile(spec.pdl, detail::crest_height(spec), detail::apex_height(spec),
                                   z_mm);
}

double attachment_level_z_mm(const ModelSpec& spec, double angle_rad) {
  return detail::crest_height(spec) -
         spec.loss.defect_depth_mm * detail::defect_weight(spec.loss, angle_rad);
}

}  // namespace sharpey::mesh

namespace sharpey::mesh {

SurfaceMesh tooth_surface_triangles(const ModelSpec& spec, int n_columns, int n_rings,
                                    double phase_rad) {
  const detail::ToothShape shape(spec.tooth, spec.bone.crest_below_cej_mm);
  SurfaceMesh m;
  m.vertices.push_back(shape.point(0, -1.0));  // apex pole
  for (int r = 1; r <= n_rings; ++r) {
    const double s = shape.s_of_arc(shape.total_arc() * r / (n_rings + 1));
    for (int c = 0; c < n_columns; ++c)
      m.vertices.push_back(shape.point(phase_rad + 2 * core::kPi * c / n_columns, s));
  }
  m.vertices.push_back(shape.point(0, 1.0));  // crown-tip pole
  const int top = static_cast<int>(m.vertices.size()) - 1;
  auto at = [&](int r, int c) { return 1 + (r - 1) * n_columns + (c % n_columns); };
  // Columns run counter-clockwise seen from the crown, rings upward: (ring r, c), (r, c + 1),
  // (r + 1, c + 1) is counter-clockwise seen from outside.
  for (int c = 0; c < n_columns; ++c) m.triangles.push_back({0, at(1, c + 1), at(1, c)});
  for (int r = 1; r < n_rings; ++r)
    for (int c = 0; c < n_columns; ++c) {
      m.triangles.push_back({at(r, c), at(r, c + 1), at(r + 1, c + 1)});
      m.triangles.push_back({at(r, c), at(r + 1, c + 1), at(r + 1, c)});
    }
  for (int c = 0; c < n_columns; ++c)
    m.triangles.push_back({top, at(n_rings, c), at(n_rings, c + 1)});
  return m;
}

}  // namespace sharpey::mesh
