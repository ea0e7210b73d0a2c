#include "sharpey/analysis/multi_root_fe.h"

#include <Eigen/Dense>
#include <Eigen/Geometry>
#include <algorithm>
#include <array>
#include <climits>
#include <cmath>
#include <map>
#include <set>

#include "sharpey/core/check.h"
#include "sharpey/fem/assembly.h"
#include "sharpey/fem/recovery.h"
#include "sharpey/fem/solver.h"
#include "sharpey/mesh/surface_distance.h"

namespace sharpey::analysis {
namespace {

MultiRootCres cres_from_compliance(const Eigen::Matrix<double, 6, 6>& C, const Eigen::Vector3d& d,
                                   double trunk_length_mm) {
  const Eigen::Vector3d m =
      -C.bottomRightCorner<3, 3>().ldlt().solve(C.bottomLeftCorner<3, 3>() * d);
  MultiRootCres c;
  c.point_mm = d.cross(m);
  c.below_cej_mm = -c.point_mm.z();
  c.below_furcation_mm = c.below_cej_mm - trunk_length_mm;
  Eigen::Matrix<double, 6, 1> w;
  w.head<3>() = d;
  w.tail<3>() = c.point_mm.cross(d);
  c.residual_rad_per_n = (C * w).tail<3>().norm();
  return c;
}

}  // namespace

MultiRootFeCres multi_root_fe_cres(const mesh::MultiRootMesh& m, const fem::Material& tooth,
                                   const fem::Material& pdl, const fem::Material& bone,
                                   double trunk_length_mm) {
  const mesh::VolumeMesh& mesh = m.mesh;
  fem::MaterialTable materials{
      {mesh::kTooth, tooth}, {mesh::kPdl, pdl}, {mesh::kCancellousBone, bone}};
  const fem::LinearElasticSolver solver(mesh, materials, fem::fix_faces(mesh, mesh::kFixedBone));
  const int n = mesh.n_nodes();
  std::set<int> tooth_nodes, crown;
  for (int e = 0; e < mesh.n_elements(); ++e) {
    if (mesh.element_region[e] != mesh::kTooth) continue;
    for (int k = 0; k < mesh.nodes_per_element; ++k) {
      const int v = mesh.element(e)[k];
      tooth_nodes.insert(v);
      if (mesh.nodes[v].z() > 0) crown.insert(v);
    }
  }
  Eigen::Vector3d c = Eigen::Vector3d::Zero();
  for (int v : crown) c += mesh.nodes[v];
  c /= static_cast<double>(crown.size());
  // Load cases: unit forces along x, y, z spread evenly over the crown nodes (through c), and
  // unit couples about x, y, z as nodal forces M (e x r) / sum |e x r|^2 (no net force).
  Eigen::MatrixXd F = Eigen::MatrixXd::Zero(3 * n, 6);
  Eigen::Matrix<double, 6, 6> W = Eigen::Matrix<double, 6, 6>::Zero();
  for (int k = 0; k < 3; ++k) {
    const Eigen::Vector3d e = Eigen::Vector3d::Unit(k);
    for (int v : crown) F.block<3, 1>(3 * v, k) = e / static_cast<double>(crown.size());
    W.block<3, 1>(0, k) = e;
    W.block<3, 1>(3, k) = c.cross(e);
    double sum = 0;
    for (int v : crown) sum += e.cross(mesh.nodes[v] - c).squaredNorm();
    for (int v : crown) F.block<3, 1>(3 * v, 3 + k) = e.cross(mesh.nodes[v] - c) / sum;
    W.block<3, 1>(3, 3 + k) = e;
  }
  const Eigen::MatrixXd U = solver.solve(F);
  // Rigid motion of the tooth per case: least squares over its nodes, u = t + w x x.
  Eigen::MatrixXd A(3 * tooth_nodes.size(), 6);
  int row = 0;
  for (int v : tooth_nodes) {
    const Eigen::Vector3d x = mesh.nodes[v];
    A.block<3, 3>(row, 0).setIdentity();
    A.block<3, 3>(row, 3) << 0, x.z(), -x.y(), -x.z(), 0, x.x(), x.y(), -x.x(), 0;
    row += 3;
  }
  const auto qr = A.colPivHouseholderQr();
  MultiRootFeCres out;
  Eigen::Matrix<double, 6, 6> motion;
  for (int k = 0; k < 6; ++k) {
    Eigen::VectorXd b(3 * tooth_nodes.size());
    int r = 0;
    for (int v : tooth_nodes) b.segment<3>(r) = U.block<3, 1>(3 * v, k), r += 3;
    motion.col(k) = qr.solve(b);
    const double rms = std::sqrt((A * motion.col(k) - b).squaredNorm() / tooth_nodes.size());
    out.max_rigid_fit_rms_um = std::max(out.max_rigid_fit_rms_um, 1000 * rms);
    const Eigen::VectorXd react = solver.reactions(U.col(k), F.col(k));
    Eigen::Vector3d total = Eigen::Vector3d::Zero();
    for (int v = 0; v < n; ++v) total += react.segment<3>(3 * v) + F.block<3, 1>(3 * v, k);
    out.max_equilibrium_error_n = std::max(out.max_equilibrium_error_n, total.norm());
  }
  out.compliance = motion * W.inverse();
  out.buccolingual =
      cres_from_compliance(out.compliance, Eigen::Vector3d::UnitX(), trunk_length_mm);
  out.mesiodistal = cres_from_compliance(out.compliance, Eigen::Vector3d::UnitY(), trunk_length_mm);
  out.n_dofs = 3 * n;
  return out;
}

namespace {

// PDL nodes left out of the peaks: within one crest width below the crest and, with a furcation
// lesion, the septum at the roof under a lower crest or an angular defect
// (mesh/multi_root_mesh.cpp), within one crest width of the PDL's free faces (kPdlCrest: the
// lowered crest, the lesion's and the septum's edges), the free edge's band as in the single-rooted
// results.
std::vector<char> free_edge_band(const mesh::MultiRootMesh& m, const mesh::MultiRootTooth& tooth,
                                 const mesh::MultiRootBone& bone,
                                 const std::vector<int>& pdl_nodes) {
  const double band_top = mesh::outer_crest_z_mm(bone) - bone.pdl.crest_width_mm;
  std::vector<char> band(pdl_nodes.size(), 0);
  for (size_t i = 0; i < band.size(); ++i) band[i] = m.mesh.nodes[pdl_nodes[i]].z() > band_top;
  const bool below = mesh::outer_crest_z_mm(bone) < -tooth.trunk_length_mm;
  if ((bone.septum_to_roof && (bone.furcation.degree > 0 || below)) ||
      bone.loss.defect_depth_mm > 0) {
    const std::vector<double> d = mesh::distance_to_faces(m.mesh, pdl_nodes, mesh::kPdlCrest);
    for (size_t i = 0; i < band.size(); ++i) band[i] |= d[i] < bone.pdl.crest_width_mm;
  }
  return band;
}

// The root-side faces' lumped node shares (multi_root_fe.h): each face's part from the PDL element
// behind it; `index` maps a mesh node to its column in the recovered field.
std::vector<MultiRootFeSurfaceShare> root_side_shares(const mesh::MultiRootMesh& m,
                                                      const fem::RegionField& field,
                                                      const std::vector<char>& band) {
  const mesh::VolumeMesh& mesh = m.mesh;
  std::vector<int> index(mesh.n_nodes(), -1);
  for (size_t i = 0; i < field.nodes.size(); ++i) index[field.nodes[i]] = static_cast<int>(i);
  std::map<std::array<int, 3>, int> face_part;
  const int corner_faces[4][3] = {{0, 1, 2}, {0, 1, 3}, {0, 2, 3}, {1, 2, 3}};
  for (int e = 0; e < mesh.n_elements(); ++e) {
    if (mesh.element_region[e] != mesh::kPdl) continue;
    for (const auto& f : corner_faces) {
      std::array<int, 3> key{mesh.element(e)[f[0]], mesh.element(e)[f[1]], mesh.element(e)[f[2]]};
      std::sort(key.begin(), key.end());
      face_part[key] = m.element_part[e];
    }
  }
  std::vector<MultiRootFeSurfaceShare> out;
  for (int f = 0; f < mesh.n_faces(); ++f) {
    if (mesh.face_marker[f] != mesh::kRootSurface) continue;
    const int* v = mesh.face(f);
    std::array<int, 3> key{v[0], v[1], v[2]};
    std::sort(key.begin(), key.end());
    const auto it = face_part.find(key);
    SHARPEY_ASSERT(it != face_part.end(), "a root-side face has no PDL element behind it");
    const double area =
        0.5 *
        (mesh.nodes[v[1]] - mesh.nodes[v[0]]).cross(mesh.nodes[v[2]] - mesh.nodes[v[0]]).norm();
    for (int k = 0; k < mesh.nodes_per_face; ++k) {
      const int i = index[v[k]];
      SHARPEY_ASSERT(i >= 0, "a root-side node is not a PDL node");
      const double share = mesh.nodes_per_face == 3 ? area / 3 : (k < 3 ? area / 12 : area / 4);
      out.push_back({it->second, share, fem::hydrostatic_pressure_kpa(field.stress_mpa.col(i)),
                     band[i] != 0});
    }
  }
  return out;
}

// Attachment and threshold areas of `fig` (part as in multi_root_fe_area_above_mm2).
void fill_areas(const MultiRootFePressure& fe, int part, const Thresholds& thresholds,
                RootFigures* fig) {
  for (const MultiRootFeSurfaceShare& s : fe.surface)
    if (part == kWholeTooth || s.part == part) fig->attachment_area_mm2 += s.area_mm2;
  fig->area_above_capillary_mm2 =
      multi_root_fe_area_above_mm2(fe, part, thresholds.capillary.value_kpa);
  fig->area_above_limit_mm2 = multi_root_fe_area_above_mm2(fe, part, thresholds.limit.value_kpa);
}

}  // namespace

double multi_root_fe_area_above_mm2(const MultiRootFePressure& fe, int part, double threshold_kpa) {
  double area = 0;
  for (const MultiRootFeSurfaceShare& s : fe.surface)
    if ((part == kWholeTooth || s.part == part) && !s.in_band && s.pressure_kpa > threshold_kpa)
      area += s.area_mm2;
  return area;
}

MultiRootFePressure multi_root_fe_pressure(
    const mesh::MultiRootMesh& m, const mesh::MultiRootTooth& tooth,
    const mesh::MultiRootBone& bone, const fem::Material& tooth_material, const fem::Material& pdl,
    const fem::Material& bone_material, const MultiRootLoad& load, const Thresholds& thresholds) {
  const mesh::VolumeMesh& mesh = m.mesh;
  fem::MaterialTable materials{
      {mesh::kTooth, tooth_material}, {mesh::kPdl, pdl}, {mesh::kCancellousBone, bone_material}};
  const fem::LinearElasticSolver solver(mesh, materials, fem::fix_faces(mesh, mesh::kFixedBone));
  const int n = mesh.n_nodes();
  std::set<int> crown;
  for (int e = 0; e < mesh.n_elements(); ++e) {
    if (mesh.element_region[e] != mesh::kTooth) continue;
    for (int k = 0; k < mesh.nodes_per_element; ++k)
      if (mesh.nodes[mesh.element(e)[k]].z() > 0) crown.insert(mesh.element(e)[k]);
  }
  Eigen::Vector3d c = Eigen::Vector3d::Zero();
  for (int v : crown) c += mesh.nodes[v];
  c /= static_cast<double>(crown.size());
  // The force through c plus the couple that moves it to load.point_mm, plus load's couple.
  const Eigen::Vector3d couple = load.couple_nmm + (load.point_mm - c).cross(load.force_n);
  Eigen::VectorXd f = Eigen::VectorXd::Zero(3 * n);
  for (int k = 0; k < 3; ++k) {
    const Eigen::Vector3d e = Eigen::Vector3d::Unit(k);
    double sum = 0;
    for (int v : crown) sum += e.cross(mesh.nodes[v] - c).squaredNorm();
    for (int v : crown) f.segment<3>(3 * v) += couple(k) * e.cross(mesh.nodes[v] - c) / sum;
  }
  for (int v : crown) f.segment<3>(3 * v) += load.force_n / static_cast<double>(crown.size());
  const Eigen::VectorXd u = solver.solve(f);
  const fem::RegionField field = fem::recover_region(mesh, materials, u, mesh::kPdl);
  // Part of each PDL node: from the elements over that part.
  std::vector<int> part(n, INT_MIN);
  for (int e = 0; e < mesh.n_elements(); ++e)
    if (mesh.element_region[e] == mesh::kPdl)
      for (int k = 0; k < mesh.nodes_per_element; ++k) part[mesh.element(e)[k]] = m.element_part[e];
  MultiRootFePressure out;
  out.tooth.name = "tooth";
  for (const mesh::RootSpec& r : tooth.roots) {
    RootFigures fig;
    fig.name = r.name;
    out.roots.push_back(fig);
  }
  const std::vector<char> band = free_edge_band(m, tooth, bone, field.nodes);
  for (size_t i = 0; i < field.nodes.size(); ++i) {
    const int v = field.nodes[i];
    if (band[i]) continue;
    const double p = fem::hydrostatic_pressure_kpa(field.stress_mpa.col(i));
    for (RootFigures* fig : {&out.tooth, part[v] >= 0 ? &out.roots[part[v]] : nullptr}) {
      if (!fig) continue;
      fig->peak_compression_kpa = std::max(fig->peak_compression_kpa, p);
      fig->peak_tension_kpa = std::max(fig->peak_tension_kpa, -p);
    }
  }
  out.surface = root_side_shares(m, field, band);
  fill_areas(out, kWholeTooth, thresholds, &out.tooth);
  for (size_t r = 0; r < out.roots.size(); ++r)
    fill_areas(out, static_cast<int>(r), thresholds, &out.roots[r]);
  return out;
}

}  // namespace sharpey::analysis
