// The 3D scene of one bone-level scenario: tooth, PDL and bone surfaces, the PDL coloured by a
// quantity, threshold iso-lines, an optional section along the long axis, and the force system
// (force arrow at the bracket, couple, centre of resistance, centre of rotation).
//
// Geometry is built once per scenario (set_model), surfaces only and only what can be seen from
// outside; a load change overwrites the PDL's scalar array in place, the lookup table and the
// iso-lines, and rebuilds the glyphs only when they move (set_field, set_load_glyphs), so it
// costs milliseconds. All display geometry comes from core/display_mesh.h.
#pragma once

#include <Eigen/Core>
#include <QString>
#include <memory>
#include <vector>

#include "core/colour_map.h"
#include "core/hover_readout.h"
#include "sharpey/analysis/study.h"
#include "sharpey/mesh/tooth_model.h"

class vtkRenderer;

namespace sharpey::app {

enum class BoneStyle { kTranslucent, kOpaque, kHidden };
enum class SectionPlane {
  kNone,
  kLabiolingual,  // the x-z plane through the long axis; the mesial half is cut away
  kMesiodistal,   // the y-z plane through the long axis; the labial half is cut away
};
QString label(BoneStyle style);
QString label(SectionPlane plane);

// Preset views: the side of the tooth the camera looks at.
enum class ViewSide { kLabial, kLingual, kMesial, kDistal, kOcclusal };
std::vector<ViewSide> all_view_sides();
QString label(ViewSide side);  // "labial", ...
// Unit vector from the tooth toward the camera for `side` (tooth coordinates: x labial, y mesial,
// z crown).
Eigen::Vector3d view_direction(ViewSide side);
// The side a force system loads most: the side the force points to, so that the compressed
// ligament at the crest faces the reader (lingual for a lingual force); occlusal for an intrusive
// or extrusive force along the long axis.
ViewSide loaded_side(const Eigen::Vector3d& force_n);

// Where the last load change spent its time in the scene (CPU side, before the render), ms.
struct SceneTimings {
  double scalars_ms = 0;    // colour field written into the PDL (and the section on display)
  double iso_lines_ms = 0;  // threshold iso-lines traced
  double glyphs_ms = 0;     // force arrow, couple, CRes and CRot (rebuilt only when they move)
};

class ModelScene {
 public:
  // `scene` shows the model; `overlay` (drawn on top, same camera) shows the markers.
  ModelScene(vtkRenderer* scene, vtkRenderer* overlay);
  ~ModelScene();
  ModelScene(const ModelScene&) = delete;
  ModelScene& operator=(const ModelScene&) = delete;

  // Builds the surfaces of a solved scenario. `pdl_nodes`: the PDL's global node ids, the order
  // of every per-node field.
  void set_model(const mesh::VolumeMesh& mesh, const std::vector<int>& pdl_nodes,
                 const mesh::ModelGeometry& geometry);
  void clear();
  bool has_model() const;

  // Colours the PDL: one value per PDL node (pdl_nodes order) in the scale's unit.
  void set_field(const std::vector<double>& pdl_values, const ColourScale& scale);
  // Marks the crest edge band (analysis::pdl_crest_edge_band: one flag per PDL node, pdl_nodes
  // order) by a line on the PDL surface along its lower edge. Call after set_model.
  void set_band(const std::vector<char>& band);
  int n_band_segments() const;
  // Iso-lines at the two thresholds (values in the field's unit); hidden when !visible.
  void set_iso_levels(double capillary, double limit, bool visible);
  // Force arrow, couple, CRes and CRot of a result; `force_text` labels the arrow.
  void set_load_glyphs(const analysis::ScenarioResult& result, const QString& force_text);
  void set_glyphs_visible(bool visible);
  // While the user turns or zooms the view (or drags a load slider): leave the see-through bone
  // out (with software OpenGL it costs as much as the rest of the scene); drawn again when off.
  void set_interacting(bool on);
  bool interacting() const;
  // Frame pixels per screen pixel (VtkView::pixel_scale): line widths and label offsets, given in
  // pixels, are scaled by it so that a half-resolution frame looks like the full one.
  void set_pixel_scale(double scale);
  void set_bone_style(BoneStyle style);
  void set_section(SectionPlane plane);
  SectionPlane section() const;
  // The value of the shown field (in `quantity`'s unit) and the position under display point
  // (x, y) (VTK display coordinates: pixels from the bottom left) on the PDL surface or on the PDL
  // in the section. The tooth (and the bone when drawn solid) hide the PDL behind them; the
  // see-through bone does not. No position when no PDL is under the point.
  HoverReadout readout_at(double x, double y, Quantity quantity);

  // Frames the model, looking from labial and a little mesial and occlusal (or at the cut face).
  void reset_camera();
  // Frames the model as seen from `side` (straight on, crown up; occlusal: labial up). `oblique`:
  // turned a little aside (toward mesial; from a proximal side, toward lingual or labial) and
  // toward occlusal, for depth.
  void look_from(ViewSide side, bool oblique = false);
  // Camera basis in tooth coordinates: screen right and screen up (unit vectors).
  void screen_axes(Eigen::Vector3d* right, Eigen::Vector3d* up) const;

  // For tests and benchmarks.
  int n_coloured_points() const;
  int n_iso_segments() const;
  int n_triangles() const;  // tooth, PDL and bone surfaces (sections excluded)
  const SceneTimings& last_timings() const;

 private:
  struct Impl;
  std::unique_ptr<Impl> impl_;
};

}  // namespace sharpey::app
