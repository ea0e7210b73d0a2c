#include "view/model_scene.h"

#include <vtkActor.h>
#include <vtkArrowSource.h>
#include <vtkBillboardTextActor3D.h>
#include <vtkCamera.h>
#include <vtkCellArray.h>
#include <vtkCellPicker.h>
#include <vtkConeSource.h>
#include <vtkFloatArray.h>
#include <vtkLookupTable.h>
#include <vtkMatrix4x4.h>
#include <vtkPlane.h>
#include <vtkPointData.h>
#include <vtkPoints.h>
#include <vtkPolyData.h>
#include <vtkPolyDataMapper.h>
#include <vtkProperty.h>
#include <vtkRenderer.h>
#include <vtkSmartPointer.h>
#include <vtkSphereSource.h>
#include <vtkTextProperty.h>
#include <vtkTransform.h>
#include <vtkTransformPolyDataFilter.h>
#include <vtkTubeFilter.h>

#include <Eigen/Geometry>
#include <QElapsedTimer>
#include <algorithm>
#include <cmath>

#include "core/display_mesh.h"
#include "sharpey/core/constants.h"
#include "sharpey/output/report_output.h"

namespace sharpey::app {

QString label(BoneStyle style) {
  switch (style) {
    case BoneStyle::kTranslucent:
      return QStringLiteral("bone see-through");
    case BoneStyle::kOpaque:
      return QStringLiteral("bone solid");
    case BoneStyle::kHidden:
      return QStringLiteral("bone hidden");
  }
  return {};
}

QString label(SectionPlane plane) {
  switch (plane) {
    case SectionPlane::kNone:
      return QStringLiteral("no section");
    case SectionPlane::kLabiolingual:
      return QStringLiteral("labiolingual section");
    case SectionPlane::kMesiodistal:
      return QStringLiteral("mesiodistal section");
  }
  return {};
}

std::vector<ViewSide> all_view_sides() {
  return {ViewSide::kLabial, ViewSide::kLingual, ViewSide::kMesial, ViewSide::kDistal,
          ViewSide::kOcclusal};
}

QString label(ViewSide side) {
  switch (side) {
    case ViewSide::kLabial:
      return QStringLiteral("labial");
    case ViewSide::kLingual:
      return QStringLiteral("lingual");
    case ViewSide::kMesial:
      return QStringLiteral("mesial");
    case ViewSide::kDistal:
      return QStringLiteral("distal");
    case ViewSide::kOcclusal:
      return QStringLiteral("occlusal");
  }
  return {};
}

Eigen::Vector3d view_direction(ViewSide side) {
  switch (side) {
    case ViewSide::kLabial:
      return Eigen::Vector3d::UnitX();
    case ViewSide::kLingual:
      return -Eigen::Vector3d::UnitX();
    case ViewSide::kMesial:
      return Eigen::Vector3d::UnitY();
    case ViewSide::kDistal:
      return -Eigen::Vector3d::UnitY();
    case ViewSide::kOcclusal:
      return Eigen::Vector3d::UnitZ();
  }
  return Eigen::Vector3d::UnitX();
}

ViewSide loaded_side(const Eigen::Vector3d& force_n) {
  const double n = force_n.norm();
  if (!(n > 0)) return ViewSide::kLabial;
  const Eigen::Vector3d f = force_n / n;
  if (std::abs(f.z()) > std::max(std::abs(f.x()), std::abs(f.y()))) return ViewSide::kOcclusal;
  if (std::abs(f.x()) >= std::abs(f.y())) return f.x() > 0 ? ViewSide::kLabial : ViewSide::kLingual;
  return f.y() > 0 ? ViewSide::kMesial : ViewSide::kDistal;
}

namespace {

// Colours of the scene (the app's own choice).
constexpr double kToothColour[3] = {0.93, 0.90, 0.82};
constexpr double kCorticalColour[3] = {0.74, 0.70, 0.62};
constexpr double kCancellousColour[3] = {0.85, 0.79, 0.66};
const Rgb kForceColour = force_label_colour();
const Rgb kCresColour = cres_label_colour();
const Rgb kCrotColour = crot_label_colour();
constexpr double kBandLineColour[3] = {0.50, 0.27, 0.72};  // violet: apart from both maps' hues
constexpr double kBoneOpacity = 0.22;

// One actor with its polydata.
struct Part {
  vtkSmartPointer<vtkPolyData> data = vtkSmartPointer<vtkPolyData>::New();
  vtkSmartPointer<vtkPolyDataMapper> mapper = vtkSmartPointer<vtkPolyDataMapper>::New();
  vtkSmartPointer<vtkActor> actor = vtkSmartPointer<vtkActor>::New();
  vtkSmartPointer<vtkFloatArray> scalars;  // the colouring field, overwritten in place
  Part() {
    mapper->SetInputData(data);
    actor->SetMapper(mapper);
  }
  void solid(const double rgb[3]) {
    mapper->ScalarVisibilityOff();
    actor->GetProperty()->SetColor(rgb[0], rgb[1], rgb[2]);
  }
};

// Triangles with point normals (area-weighted average of the flat normals) for smooth shading.
void fill_triangles(vtkPolyData* data, const std::vector<Eigen::Vector3d>& points,
                    const std::vector<std::array<int, 3>>& triangles, bool normals) {
  vtkNew<vtkPoints> p;
  p->SetDataTypeToFloat();
  p->SetNumberOfPoints(static_cast<vtkIdType>(points.size()));
  for (size_t i = 0; i < points.size(); ++i)
    p->SetPoint(static_cast<vtkIdType>(i), points[i].x(), points[i].y(), points[i].z());
  vtkNew<vtkCellArray> polys;
  polys->AllocateExact(static_cast<vtkIdType>(triangles.size()),
                       static_cast<vtkIdType>(3 * triangles.size()));
  std::vector<Eigen::Vector3d> n(normals ? points.size() : 0, Eigen::Vector3d::Zero());
  for (const auto& t : triangles) {
    const vtkIdType ids[3] = {t[0], t[1], t[2]};
    polys->InsertNextCell(3, ids);
    if (normals) {
      const Eigen::Vector3d& a = points[static_cast<size_t>(t[0])];
      const Eigen::Vector3d w =
          (points[static_cast<size_t>(t[1])] - a).cross(points[static_cast<size_t>(t[2])] - a);
      for (int k = 0; k < 3; ++k) n[static_cast<size_t>(t[static_cast<size_t>(k)])] += w;
    }
  }
  data->Initialize();
  data->SetPoints(p);
  data->SetPolys(polys);
  if (normals) {
    vtkNew<vtkFloatArray> na;
    na->SetName("normals");
    na->SetNumberOfComponents(3);
    na->SetNumberOfTuples(static_cast<vtkIdType>(points.size()));
    for (size_t i = 0; i < n.size(); ++i) {
      const Eigen::Vector3d u =
          n[i].norm() > 0 ? Eigen::Vector3d(n[i].normalized()) : Eigen::Vector3d::UnitZ();
      na->SetTuple3(static_cast<vtkIdType>(i), u.x(), u.y(), u.z());
    }
    data->GetPointData()->SetNormals(na);
  }
  data->Modified();
}

void fill_segments(vtkPolyData* data, const std::vector<Segment3>& segments) {
  vtkNew<vtkPoints> p;
  p->SetDataTypeToFloat();
  p->SetNumberOfPoints(static_cast<vtkIdType>(2 * segments.size()));
  vtkNew<vtkCellArray> lines;
  lines->AllocateExact(static_cast<vtkIdType>(segments.size()),
                       static_cast<vtkIdType>(2 * segments.size()));
  for (size_t i = 0; i < segments.size(); ++i) {
    const auto& [a, b] = segments[i];
    const vtkIdType ia = static_cast<vtkIdType>(2 * i), ib = ia + 1;
    p->SetPoint(ia, a.x(), a.y(), a.z());
    p->SetPoint(ib, b.x(), b.y(), b.z());
    const vtkIdType ids[2] = {ia, ib};
    lines->InsertNextCell(2, ids);
  }
  data->Initialize();
  data->SetPoints(p);
  data->SetLines(lines);
  data->Modified();
}

// Matrix mapping the unit x axis to `direction` * length, placed at `origin`.
vtkSmartPointer<vtkTransform> frame_along(const Eigen::Vector3d& origin,
                                          const Eigen::Vector3d& direction, double length) {
  const Eigen::Vector3d x = direction.normalized();
  Eigen::Vector3d helper =
      std::abs(x.z()) < 0.9 ? Eigen::Vector3d::UnitZ() : Eigen::Vector3d::UnitX();
  const Eigen::Vector3d y = helper.cross(x).normalized();
  const Eigen::Vector3d z = x.cross(y);
  vtkNew<vtkMatrix4x4> m;
  for (int r = 0; r < 3; ++r) {
    m->SetElement(r, 0, x(r) * length);
    m->SetElement(r, 1, y(r) * length);
    m->SetElement(r, 2, z(r) * length);
    m->SetElement(r, 3, origin(r));
  }
  auto t = vtkSmartPointer<vtkTransform>::New();
  t->SetMatrix(m);
  return t;
}

void copy_output(vtkPolyData* target, vtkPolyDataAlgorithm* source) {
  source->Update();
  target->DeepCopy(source->GetOutput());
}

struct SectionParts {
  DisplaySection tooth, pdl, cortical, cancellous;
  std::vector<Eigen::Vector3d> pdl_points;
  Part tooth_part, pdl_part, cortical_part, cancellous_part;
};

}  // namespace

struct ModelScene::Impl {
  vtkRenderer* scene = nullptr;
  vtkRenderer* overlay = nullptr;
  bool has_model = false;
  mesh::ModelGeometry geometry;
  std::vector<int> pdl_index;  // global node -> PDL index, -1 outside the PDL
  DisplaySurface pdl_surface;
  std::vector<Eigen::Vector3d> pdl_points;
  Part tooth, pdl, bone;
  bool interacting = false;  // the user turns the view: the see-through bone is left out
  SectionParts sections[2];  // labiolingual, mesiodistal
  SectionPlane plane = SectionPlane::kNone;
  BoneStyle bone_style = BoneStyle::kTranslucent;
  vtkSmartPointer<vtkLookupTable> lut = vtkSmartPointer<vtkLookupTable>::New();
  vtkSmartPointer<vtkPlane> clip = vtkSmartPointer<vtkPlane>::New();
  std::vector<double> field;  // per PDL node
  Part iso_capillary, iso_limit, band_line;
  int n_band = 0;
  double iso_level[2] = {0, 0};
  bool iso_visible = false;
  int n_iso = 0;
  Part arrow, couple_arc, couple_head, cres, crot;
  vtkSmartPointer<vtkBillboardTextActor3D> arrow_label =
      vtkSmartPointer<vtkBillboardTextActor3D>::New();
  vtkSmartPointer<vtkBillboardTextActor3D> cres_label =
      vtkSmartPointer<vtkBillboardTextActor3D>::New();
  vtkSmartPointer<vtkBillboardTextActor3D> crot_label =
      vtkSmartPointer<vtkBillboardTextActor3D>::New();
  bool glyphs_visible = true;
  bool crot_shown = false, couple_shown = false;
  // What the glyph geometry was built from; a load change that keeps it (a new magnitude only)
  // just relabels the arrow.
  std::vector<double> glyph_key;
  int n_triangles = 0;
  SceneTimings timings;
  vtkSmartPointer<vtkCellPicker> picker = vtkSmartPointer<vtkCellPicker>::New();

  SectionParts* active_section() {
    if (plane == SectionPlane::kLabiolingual) return &sections[0];
    if (plane == SectionPlane::kMesiodistal) return &sections[1];
    return nullptr;
  }

  double field_at(int node) const {
    const int i = node >= 0 && node < static_cast<int>(pdl_index.size())
                      ? pdl_index[static_cast<size_t>(node)]
                      : -1;
    return i >= 0 && i < static_cast<int>(field.size()) ? field[static_cast<size_t>(i)] : NAN;
  }

  void colour_by_field(Part& part) {
    part.mapper->ScalarVisibilityOn();
    part.mapper->SetScalarModeToUsePointData();
    part.mapper->SetLookupTable(lut);
    part.mapper->UseLookupTableScalarRangeOn();
    part.mapper->InterpolateScalarsBeforeMappingOn();
    part.actor->GetProperty()->SetColor(1, 1, 1);
  }

  // Overwrites the part's scalar array in place (allocated once per model): the mapper sees the
  // array's new modification time and re-uploads the colours only, the geometry stays.
  void write_scalars(Part& part, const std::vector<double>& values) {
    const auto n = static_cast<vtkIdType>(values.size());
    if (!part.scalars || part.scalars->GetNumberOfTuples() != n ||
        part.data->GetPointData()->GetScalars() != part.scalars) {
      part.scalars = vtkSmartPointer<vtkFloatArray>::New();
      part.scalars->SetName("value");
      part.scalars->SetNumberOfTuples(n);
      part.data->GetPointData()->SetScalars(part.scalars);
    }
    float* out = part.scalars->GetPointer(0);
    for (size_t i = 0; i < values.size(); ++i) out[i] = static_cast<float>(values[i]);
    part.scalars->Modified();
  }

  // Colours the section on display (the hidden one is coloured when it is shown).
  void colour_active_section() {
    SectionParts* s = active_section();
    if (!s || !has_model || field.empty()) return;
    write_scalars(s->pdl_part, section_values(s->pdl));
  }

  std::vector<double> surface_values() const {
    std::vector<double> v(pdl_surface.nodes.size());
    for (size_t i = 0; i < v.size(); ++i) v[i] = field_at(pdl_surface.nodes[i]);
    return v;
  }

  std::vector<double> section_values(const DisplaySection& s) const {
    std::vector<double> v(s.points.size());
    for (size_t i = 0; i < v.size(); ++i)
      v[i] = interpolate(s.points[i], field_at(s.points[i].a), field_at(s.points[i].b));
    return v;
  }

  void update_iso_lines() {
    n_iso = 0;
    Part* lines[2] = {&iso_capillary, &iso_limit};
    for (int k = 0; k < 2; ++k) {
      std::vector<Segment3> segments;
      if (iso_visible && has_model && !field.empty()) {
        segments =
            triangle_iso_lines(pdl_points, pdl_surface.triangles, surface_values(), iso_level[k]);
        if (SectionParts* s = active_section()) {
          const auto more = triangle_iso_lines(s->pdl_points, s->pdl.triangles,
                                               section_values(s->pdl), iso_level[k]);
          segments.insert(segments.end(), more.begin(), more.end());
        }
      }
      n_iso += static_cast<int>(segments.size());
      fill_segments(lines[k]->data, segments);
      lines[k]->actor->SetVisibility(!segments.empty());
    }
  }

  // Sizes in pixels, for frames of `scale` frame pixels per screen pixel (VtkView::pixel_scale).
  void apply_pixel_scale(double scale) {
    iso_capillary.actor->GetProperty()->SetLineWidth(
        static_cast<float>(std::max(1.0, 2.0 * scale)));
    iso_limit.actor->GetProperty()->SetLineWidth(static_cast<float>(std::max(1.0, 3.5 * scale)));
    band_line.actor->GetProperty()->SetLineWidth(static_cast<float>(std::max(1.0, 2.5 * scale)));
    // Labels on opposite sides of their markers, which often sit close together.
    auto offset = [scale](vtkBillboardTextActor3D* t, int x, int y) {
      t->SetDisplayOffset(static_cast<int>(std::lround(x * scale)),
                          static_cast<int>(std::lround(y * scale)));
    };
    offset(cres_label, -62, 6);
    offset(crot_label, 18, -18);
  }

  void apply_visibility() {
    const bool cut = plane != SectionPlane::kNone;
    const bool see_through = bone_style == BoneStyle::kTranslucent && !cut;
    // Software OpenGL spends its time per pixel, not per triangle: the see-through bone, blended
    // over most of the view, costs about as much as the rest of the scene. It is left out while
    // the view turns and drawn again for the still frame.
    bone.actor->SetVisibility(has_model && bone_style != BoneStyle::kHidden &&
                              !(see_through && interacting));
    bone.actor->GetProperty()->SetOpacity(see_through ? kBoneOpacity : 1.0);
    tooth.actor->SetVisibility(has_model);
    pdl.actor->SetVisibility(has_model);
    for (int k = 0; k < 2; ++k) {
      SectionParts& s = sections[k];
      const bool on = has_model && active_section() == &s;
      s.tooth_part.actor->SetVisibility(on);
      s.pdl_part.actor->SetVisibility(on);
      s.cortical_part.actor->SetVisibility(on && bone_style != BoneStyle::kHidden);
      s.cancellous_part.actor->SetVisibility(on && bone_style != BoneStyle::kHidden);
    }
    band_line.actor->SetVisibility(has_model && n_band > 0);
    for (Part* p : {&tooth, &pdl, &bone, &iso_capillary, &iso_limit, &band_line}) {
      p->mapper->RemoveAllClippingPlanes();
      if (cut) p->mapper->AddClippingPlane(clip);
    }
    if (plane == SectionPlane::kLabiolingual) clip->SetNormal(0, -1, 0);  // keep the distal half
    if (plane == SectionPlane::kMesiodistal) clip->SetNormal(-1, 0, 0);   // keep the lingual half
    clip->SetOrigin(0, 0, 0);
    // Plain alpha blending for the see-through bone: one translucent shell needs no depth peeling,
    // which costs about half the frame rate with software OpenGL.
    scene->SetUseDepthPeeling(false);
    const bool g = has_model && glyphs_visible;
    for (Part* p : {&arrow, &cres}) p->actor->SetVisibility(g);
    couple_arc.actor->SetVisibility(g && couple_shown);
    couple_head.actor->SetVisibility(g && couple_shown);
    crot.actor->SetVisibility(g && crot_shown);
    arrow_label->SetVisibility(g);
    cres_label->SetVisibility(g);
    crot_label->SetVisibility(g && crot_shown);
  }
};

ModelScene::ModelScene(vtkRenderer* scene, vtkRenderer* overlay) : impl_(std::make_unique<Impl>()) {
  Impl& d = *impl_;
  d.scene = scene;
  d.overlay = overlay;
  // Lines lying on surfaces (iso-lines) win over the surfaces.
  vtkMapper::SetResolveCoincidentTopologyToPolygonOffset();
  // The app's own background (core/colour_map.h): warm umber, darker at the bottom.
  scene->GradientBackgroundOn();
  const Rgb bottom = view_background_bottom(), top = view_background_top();
  scene->SetBackground(bottom[0], bottom[1], bottom[2]);
  scene->SetBackground2(top[0], top[1], top[2]);
  scene->SetMaximumNumberOfPeels(6);
  scene->SetOcclusionRatio(0.05);

  d.tooth.solid(kToothColour);
  d.bone.solid(kCorticalColour);
  d.colour_by_field(d.pdl);
  for (SectionParts& s : d.sections) {
    s.tooth_part.solid(kToothColour);
    s.cortical_part.solid(kCorticalColour);
    s.cancellous_part.solid(kCancellousColour);
    d.colour_by_field(s.pdl_part);
    for (Part* p : {&s.tooth_part, &s.pdl_part, &s.cortical_part, &s.cancellous_part}) {
      p->actor->GetProperty()->SetAmbient(0.35);
      p->actor->GetProperty()->SetDiffuse(0.65);
      scene->AddActor(p->actor);
    }
  }
  for (Part* p : {&d.tooth, &d.pdl, &d.bone}) {
    p->actor->GetProperty()->SetSpecular(0.15);
    p->actor->GetProperty()->SetSpecularPower(20);
    scene->AddActor(p->actor);
  }

  const Rgb cap = capillary_line_colour(), lim = limit_line_colour();
  d.iso_capillary.solid(cap.data());
  d.iso_limit.solid(lim.data());
  d.band_line.solid(kBandLineColour);
  for (Part* p : {&d.iso_capillary, &d.iso_limit, &d.band_line}) {
    p->actor->GetProperty()->LightingOff();
    scene->AddActor(p->actor);
  }

  d.arrow.solid(kForceColour.data());
  d.couple_arc.solid(kForceColour.data());
  d.couple_head.solid(kForceColour.data());
  d.cres.solid(kCresColour.data());
  d.crot.solid(kCrotColour.data());
  for (Part* p : {&d.arrow, &d.couple_arc, &d.couple_head, &d.cres, &d.crot})
    overlay->AddActor(p->actor);
  auto style_label = [&](vtkBillboardTextActor3D* t, const Rgb& rgb) {
    const Rgb box = label_box_colour();
    t->GetTextProperty()->SetFontSize(15);
    t->GetTextProperty()->SetColor(rgb[0], rgb[1], rgb[2]);
    t->GetTextProperty()->SetBackgroundColor(box[0], box[1], box[2]);
    t->GetTextProperty()->SetBackgroundOpacity(label_box_opacity());
    t->GetTextProperty()->BoldOn();
    overlay->AddActor(t);
  };
  style_label(d.arrow_label, kForceColour);
  style_label(d.cres_label, kCresColour);
  style_label(d.crot_label, kCrotColour);
  d.cres_label->SetInput("CRes");
  d.crot_label->SetInput("CRot");
  d.apply_pixel_scale(1.0);
  d.apply_visibility();
}

void ModelScene::set_pixel_scale(double scale) { impl_->apply_pixel_scale(scale); }

ModelScene::~ModelScene() = default;

bool ModelScene::has_model() const { return impl_->has_model; }

void ModelScene::clear() {
  Impl& d = *impl_;
  d.has_model = false;
  d.field.clear();
  d.apply_visibility();
  d.iso_capillary.actor->SetVisibility(false);
  d.iso_limit.actor->SetVisibility(false);
}

void ModelScene::set_model(const mesh::VolumeMesh& mesh, const std::vector<int>& pdl_nodes,
                           const mesh::ModelGeometry& geometry) {
  Impl& d = *impl_;
  d.geometry = geometry;
  d.pdl_index.assign(static_cast<size_t>(mesh.n_nodes()), -1);
  for (size_t i = 0; i < pdl_nodes.size(); ++i)
    d.pdl_index[static_cast<size_t>(pdl_nodes[i])] = static_cast<int>(i);
  auto points_of = [&](const std::vector<int>& nodes) {
    std::vector<Eigen::Vector3d> p;
    p.reserve(nodes.size());
    for (int n : nodes) p.push_back(mesh.nodes[static_cast<size_t>(n)]);
    return p;
  };
  // Only what can be seen from outside: the root under the PDL, the PDL's root side and the bone's
  // socket wall lie behind the (opaque) PDL and are left out, which also keeps the see-through
  // bone from veiling the PDL colours with a coincident layer.
  const std::vector<int> bone_regions = {mesh::kCorticalBone, mesh::kCancellousBone};
  const DisplaySurface tooth = visible_boundary(mesh, {mesh::kTooth}, {mesh::kPdl});
  fill_triangles(d.tooth.data, points_of(tooth.nodes), tooth.triangles, true);
  d.pdl_surface = visible_boundary(mesh, {mesh::kPdl}, {mesh::kTooth});
  d.pdl_points = points_of(d.pdl_surface.nodes);
  fill_triangles(d.pdl.data, d.pdl_points, d.pdl_surface.triangles, true);
  const DisplaySurface bone = visible_boundary(mesh, bone_regions, {mesh::kPdl});
  fill_triangles(d.bone.data, points_of(bone.nodes), bone.triangles, true);
  for (Part* p : {&d.tooth, &d.pdl, &d.bone}) p->scalars = nullptr;
  d.n_triangles = static_cast<int>(tooth.triangles.size() + d.pdl_surface.triangles.size() +
                                   bone.triangles.size());

  const Eigen::Vector3d normals[2] = {Eigen::Vector3d::UnitY(), Eigen::Vector3d::UnitX()};
  for (int k = 0; k < 2; ++k) {
    SectionParts& s = d.sections[k];
    auto section_points = [&](const DisplaySection& sec) {
      std::vector<Eigen::Vector3d> p;
      p.reserve(sec.points.size());
      for (const EdgePoint& e : sec.points)
        p.push_back(interpolate(e, mesh.nodes[static_cast<size_t>(e.a)],
                                mesh.nodes[static_cast<size_t>(e.b)]));
      return p;
    };
    s.tooth = plane_section(mesh, {mesh::kTooth}, Eigen::Vector3d::Zero(), normals[k]);
    s.pdl = plane_section(mesh, {mesh::kPdl}, Eigen::Vector3d::Zero(), normals[k]);
    s.cortical = plane_section(mesh, {mesh::kCorticalBone}, Eigen::Vector3d::Zero(), normals[k]);
    s.cancellous =
        plane_section(mesh, {mesh::kCancellousBone}, Eigen::Vector3d::Zero(), normals[k]);
    s.pdl_points = section_points(s.pdl);
    fill_triangles(s.tooth_part.data, section_points(s.tooth), s.tooth.triangles, false);
    fill_triangles(s.pdl_part.data, s.pdl_points, s.pdl.triangles, false);
    fill_triangles(s.cortical_part.data, section_points(s.cortical), s.cortical.triangles, false);
    fill_triangles(s.cancellous_part.data, section_points(s.cancellous), s.cancellous.triangles,
                   false);
  }
  d.has_model = true;
  d.field.clear();
  d.glyph_key.clear();
  d.n_band = 0;
  d.apply_visibility();
}

void ModelScene::set_field(const std::vector<double>& pdl_values, const ColourScale& scale) {
  Impl& d = *impl_;
  d.field = pdl_values;
  const ValueRange r = scale.colour_range();
  const int n = 256;
  const auto table = scale.table(n);
  d.lut->SetNumberOfTableValues(n);
  for (int i = 0; i < n; ++i) {
    const Rgb& c = table[static_cast<size_t>(i)];
    d.lut->SetTableValue(i, c[0], c[1], c[2], 1.0);
  }
  d.lut->SetTableRange(r.min, r.max);
  const Rgb none = no_data_colour();
  d.lut->SetNanColor(none[0], none[1], none[2], 1.0);
  d.lut->Modified();
  if (!d.has_model) return;
  QElapsedTimer timer;
  timer.start();
  d.write_scalars(d.pdl, d.surface_values());
  d.colour_active_section();
  d.timings.scalars_ms = static_cast<double>(timer.nsecsElapsed()) * 1e-6;
  timer.restart();
  d.update_iso_lines();
  d.timings.iso_lines_ms = static_cast<double>(timer.nsecsElapsed()) * 1e-6;
}

void ModelScene::set_band(const std::vector<char>& band) {
  Impl& d = *impl_;
  std::vector<double> flag(d.pdl_surface.nodes.size(), 0.0);
  for (size_t i = 0; i < flag.size(); ++i) {
    const int node = d.pdl_surface.nodes[i];
    const int k = node >= 0 && node < static_cast<int>(d.pdl_index.size())
                      ? d.pdl_index[static_cast<size_t>(node)]
                      : -1;
    flag[i] =
        k >= 0 && k < static_cast<int>(band.size()) && band[static_cast<size_t>(k)] ? 1.0 : 0.0;
  }
  const std::vector<Segment3> segments =
      triangle_iso_lines(d.pdl_points, d.pdl_surface.triangles, flag, 0.5);
  d.n_band = static_cast<int>(segments.size());
  fill_segments(d.band_line.data, segments);
  d.apply_visibility();
}

int ModelScene::n_band_segments() const { return impl_->n_band; }

void ModelScene::set_iso_levels(double capillary, double limit, bool visible) {
  Impl& d = *impl_;
  // Called after set_field with the same levels on every load change: the lines are current.
  if (d.iso_level[0] == capillary && d.iso_level[1] == limit && d.iso_visible == visible) return;
  d.iso_level[0] = capillary;
  d.iso_level[1] = limit;
  d.iso_visible = visible;
  d.update_iso_lines();
}

namespace {

// What the glyph geometry is built from: the force's and the couple's directions, the point of
// application, the CRes and the centre of rotation (the magnitudes only label the arrow).
std::vector<double> glyph_key_of(const analysis::ScenarioResult& result) {
  const analysis::ResolvedLoad& load = result.load;
  const analysis::CentreOfResistance& cres_of = analysis::cres_for(result);
  std::vector<double> key;
  auto add = [&key](const Eigen::Vector3d& v) { key.insert(key.end(), {v.x(), v.y(), v.z()}); };
  const double f_norm = load.force_n.norm(), m_norm = load.couple_nmm.norm();
  add(f_norm > 0 ? Eigen::Vector3d(load.force_n / f_norm) : Eigen::Vector3d::Zero());
  add(load.application_point);
  add(m_norm > 1e-9 ? Eigen::Vector3d(load.couple_nmm / m_norm) : Eigen::Vector3d::Zero());
  add(cres_of.point);
  key.push_back(result.centre_of_rotation_defined ? 1.0 : 0.0);
  add(result.centre_of_rotation.allFinite() ? result.centre_of_rotation : Eigen::Vector3d::Zero());
  return key;
}

// The force as an arrow of fixed length at its point of application, labelled at its far end;
// empty for no force.
void build_force_arrow(Part& arrow_part, vtkBillboardTextActor3D* label,
                       const analysis::ResolvedLoad& load, const Eigen::Vector3d& bracket_normal,
                       const QString& force_text) {
  const double arrow_length = 7.0;  // mm, fixed; the label gives the magnitude
  const double f = load.force_n.norm();
  if (!(f > 0)) {
    arrow_part.data->Initialize();
    label->SetInput("");
    return;
  }
  const Eigen::Vector3d dir = load.force_n / f;
  const Eigen::Vector3d p = load.application_point;
  // Keep the arrow outside the crown: tip at the bracket when it pushes into the tooth.
  const bool pushes = dir.dot(bracket_normal) < 0;
  const Eigen::Vector3d base = pushes ? Eigen::Vector3d(p - arrow_length * dir) : p;
  vtkNew<vtkArrowSource> arrow;
  arrow->SetTipResolution(24);
  arrow->SetShaftResolution(24);
  arrow->SetTipLength(0.3);
  arrow->SetTipRadius(0.1);
  arrow->SetShaftRadius(0.035);
  vtkNew<vtkTransformPolyDataFilter> place;
  place->SetInputConnection(arrow->GetOutputPort());
  place->SetTransform(frame_along(base, dir, arrow_length));
  copy_output(arrow_part.data, place);
  // Label at the far end of the arrow, away from the crown.
  const Eigen::Vector3d tail = pushes ? base : Eigen::Vector3d(p + arrow_length * dir);
  label->SetPosition(tail.x(), tail.y(), tail.z() + 1.0);
  label->SetInput(force_text.toUtf8().constData());
}

// The couple alone, as an arc about its axis beside the bracket (right-hand rule) with a cone at
// its end. Precondition: a couple of non-zero norm.
void build_couple_arc(Part& arc_part, Part& head_part, const analysis::ResolvedLoad& load,
                      const Eigen::Vector3d& bracket_normal) {
  const Eigen::Vector3d axis = load.couple_nmm / load.couple_nmm.norm();
  Eigen::Vector3d helper =
      std::abs(axis.z()) < 0.9 ? Eigen::Vector3d::UnitZ() : Eigen::Vector3d::UnitX();
  const Eigen::Vector3d u = helper.cross(axis).normalized();
  const Eigen::Vector3d v = axis.cross(u);
  const Eigen::Vector3d centre = load.application_point + 2.5 * bracket_normal;
  const double radius = 3.0;
  const int n = 48;
  const double sweep = 1.5 * sharpey::core::kPi;
  std::vector<Segment3> segments;
  Eigen::Vector3d previous = centre + radius * u;
  for (int i = 1; i <= n; ++i) {
    const double a = sweep * i / n;
    const Eigen::Vector3d q = centre + radius * (std::cos(a) * u + std::sin(a) * v);
    segments.emplace_back(previous, q);
    previous = q;
  }
  vtkNew<vtkPolyData> arc;
  fill_segments(arc, segments);
  vtkNew<vtkTubeFilter> tube;
  tube->SetInputData(arc);
  tube->SetRadius(0.18);
  tube->SetNumberOfSides(12);
  copy_output(arc_part.data, tube);
  const Eigen::Vector3d tangent = -std::sin(sweep) * u + std::cos(sweep) * v;
  vtkNew<vtkConeSource> head;
  head->SetResolution(24);
  head->SetHeight(1.2);
  head->SetRadius(0.5);
  head->SetCenter(previous.x(), previous.y(), previous.z());
  head->SetDirection(tangent.x(), tangent.y(), tangent.z());
  copy_output(head_part.data, head);
}

// A ball of `radius_mm` at `c` with its label; `resolution` facets around and along.
void build_centre_marker(Part& part, vtkBillboardTextActor3D* label, const Eigen::Vector3d& c,
                         double radius_mm, int resolution) {
  vtkNew<vtkSphereSource> ball;
  ball->SetCenter(c.x(), c.y(), c.z());
  ball->SetRadius(radius_mm);
  ball->SetThetaResolution(resolution);
  ball->SetPhiResolution(resolution);
  copy_output(part.data, ball);
  label->SetPosition(c.x(), c.y(), c.z());
}

}  // namespace

void ModelScene::set_load_glyphs(const analysis::ScenarioResult& result,
                                 const QString& force_text) {
  Impl& d = *impl_;
  QElapsedTimer timer;
  timer.start();
  const analysis::ResolvedLoad& load = result.load;
  std::vector<double> key = glyph_key_of(result);
  if (key == d.glyph_key) {
    d.arrow_label->SetInput(load.force_n.norm() > 0 ? force_text.toUtf8().constData() : "");
    d.timings.glyphs_ms = static_cast<double>(timer.nsecsElapsed()) * 1e-6;
    return;
  }
  d.glyph_key = std::move(key);
  build_force_arrow(d.arrow, d.arrow_label, load, d.geometry.bracket_normal, force_text);
  d.couple_shown = load.couple_nmm.norm() > 1e-9;
  if (d.couple_shown)
    build_couple_arc(d.couple_arc, d.couple_head, load, d.geometry.bracket_normal);
  build_centre_marker(d.cres, d.cres_label, analysis::cres_for(result).point, 0.55, 24);
  d.crot_shown = result.centre_of_rotation_defined && result.centre_of_rotation.allFinite() &&
                 result.centre_of_rotation.norm() < 60.0;
  // A faceted marker, told apart from the CRes ball.
  if (d.crot_shown) build_centre_marker(d.crot, d.crot_label, result.centre_of_rotation, 0.45, 4);
  d.apply_visibility();
  d.timings.glyphs_ms = static_cast<double>(timer.nsecsElapsed()) * 1e-6;
}

void ModelScene::set_interacting(bool on) {
  if (impl_->interacting == on) return;
  impl_->interacting = on;
  impl_->apply_visibility();
}

bool ModelScene::interacting() const { return impl_->interacting; }

void ModelScene::set_glyphs_visible(bool visible) {
  impl_->glyphs_visible = visible;
  impl_->apply_visibility();
}

void ModelScene::set_bone_style(BoneStyle style) {
  impl_->bone_style = style;
  impl_->apply_visibility();
}

void ModelScene::set_section(SectionPlane plane) {
  impl_->plane = plane;
  impl_->colour_active_section();
  impl_->apply_visibility();
  impl_->update_iso_lines();
}

SectionPlane ModelScene::section() const { return impl_->plane; }

HoverReadout ModelScene::readout_at(double x, double y, Quantity quantity) {
  Impl& d = *impl_;
  if (!d.has_model || d.field.empty() || d.interacting) return {};
  vtkCellPicker* picker = d.picker;
  picker->SetTolerance(1e-4);
  picker->PickFromListOn();
  picker->InitializePickList();
  SectionParts* s = d.active_section();
  // What can hide the PDL: the tooth, and the bone when it is drawn solid.
  std::vector<Part*> parts = {&d.pdl, &d.tooth};
  if (s) parts.insert(parts.end(), {&s->pdl_part, &s->tooth_part});
  if (d.bone_style == BoneStyle::kOpaque || (s && d.bone_style != BoneStyle::kHidden)) {
    parts.push_back(&d.bone);
    if (s) parts.insert(parts.end(), {&s->cortical_part, &s->cancellous_part});
  }
  for (Part* p : parts) picker->AddPickList(p->actor);
  if (!picker->Pick(x, y, 0, d.scene)) return {};
  const vtkActor* hit = picker->GetActor();
  const double* q = picker->GetPickPosition();
  const Eigen::Vector3d p(q[0], q[1], q[2]);
  const int cell = static_cast<int>(picker->GetCellId());
  if (hit == d.pdl.actor)
    return surface_readout(d.pdl_points, d.pdl_surface.triangles, d.surface_values(), quantity,
                           cell, p);
  if (s && hit == s->pdl_part.actor)
    return surface_readout(s->pdl_points, s->pdl.triangles, d.section_values(s->pdl), quantity,
                           cell, p);
  return {};
}

void ModelScene::reset_camera() {
  Impl& d = *impl_;
  vtkCamera* camera = d.scene->GetActiveCamera();
  const double mid_z = 0.5 * (d.geometry.crown_tip.z() + d.geometry.apex.z());
  Eigen::Vector3d view(0.75, 1.0, 0.3);  // from mesio-labial and a little occlusal
  if (d.plane == SectionPlane::kLabiolingual) view = Eigen::Vector3d(0.15, 1.0, 0.1);
  if (d.plane == SectionPlane::kMesiodistal) view = Eigen::Vector3d(1.0, 0.15, 0.1);
  view.normalize();
  camera->SetFocalPoint(0, 0, mid_z);
  camera->SetPosition(view.x() * 100, view.y() * 100, mid_z + view.z() * 100);
  camera->SetViewUp(0, 0, 1);
  camera->SetViewAngle(30);
  // Frame the tooth (crown tip to apex) with some margin rather than the whole bone block.
  const double height = d.geometry.crown_tip.z() - d.geometry.apex.z();
  const double distance =
      (height > 0 ? 0.62 * height : 15.0) / std::tan(15.0 * sharpey::core::kRadiansPerDegree);
  camera->SetPosition(view.x() * distance, view.y() * distance, mid_z + view.z() * distance);
  d.scene->ResetCameraClippingRange();
}

void ModelScene::look_from(ViewSide side, bool oblique) {
  Impl& d = *impl_;
  vtkCamera* camera = d.scene->GetActiveCamera();
  const double mid_z = 0.5 * (d.geometry.crown_tip.z() + d.geometry.apex.z());
  const double height = d.geometry.crown_tip.z() - d.geometry.apex.z();
  const double distance =
      (height > 0 ? 0.62 * height : 15.0) / std::tan(15.0 * sharpey::core::kRadiansPerDegree);
  Eigen::Vector3d v = view_direction(side);
  if (oblique && side != ViewSide::kOcclusal) {
    // Turned a little aside (toward mesial; from a proximal side toward the other face), for depth.
    const Eigen::Vector3d aside =
        side == ViewSide::kMesial   ? Eigen::Vector3d(-Eigen::Vector3d::UnitX())
        : side == ViewSide::kDistal ? Eigen::Vector3d(Eigen::Vector3d::UnitX())
                                    : Eigen::Vector3d(Eigen::Vector3d::UnitY());
    v = (v + 0.45 * aside + 0.3 * Eigen::Vector3d::UnitZ()).normalized();
  }
  camera->SetFocalPoint(0, 0, mid_z);
  camera->SetPosition(v.x() * distance, v.y() * distance, mid_z + v.z() * distance);
  if (side == ViewSide::kOcclusal) {
    camera->SetViewUp(1, 0, 0);
  } else {
    camera->SetViewUp(0, 0, 1);
  }
  camera->SetViewAngle(30);
  d.scene->ResetCameraClippingRange();
}

void ModelScene::screen_axes(Eigen::Vector3d* right, Eigen::Vector3d* up) const {
  vtkCamera* camera = impl_->scene->GetActiveCamera();
  double d[3], u[3];
  camera->GetDirectionOfProjection(d);
  camera->GetViewUp(u);
  const Eigen::Vector3d dir(d[0], d[1], d[2]);
  Eigen::Vector3d view_up(u[0], u[1], u[2]);
  view_up = (view_up - view_up.dot(dir) * dir).normalized();
  *right = dir.cross(view_up).normalized();
  *up = view_up;
}

int ModelScene::n_coloured_points() const {
  return static_cast<int>(impl_->pdl_surface.nodes.size());
}

int ModelScene::n_iso_segments() const { return impl_->n_iso; }

int ModelScene::n_triangles() const { return impl_->n_triangles; }

const SceneTimings& ModelScene::last_timings() const { return impl_->timings; }

}  // namespace sharpey::app
