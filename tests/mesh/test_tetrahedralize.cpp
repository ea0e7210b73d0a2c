// TetGen adapter: volumes, orientation, region ids, face markers, volume bounds and failures.
// All expected values are derived (volumes of boxes, counts from the input).
#include <gtest/gtest.h>

#include <algorithm>
#include <map>
#include <set>

#include "sharpey/core/reference_tetrahedron.h"
#include "sharpey/error.h"
#include "sharpey/mesh/tetrahedralize.h"
#include "support/plc_shapes.h"

namespace sharpey::mesh {
namespace {

using test::add_box;
using test::tet_volume;

Plc unit_cube(double max_volume = 0) {
  Plc plc;
  add_box(plc, Eigen::Vector3d::Zero(), Eigen::Vector3d::Ones(), 11);
  plc.regions.push_back({Eigen::Vector3d(0.5, 0.5, 0.5), 7, max_volume});
  return plc;
}

TetgenOptions linear_options() {
  TetgenOptions o;
  o.second_order = false;
  return o;
}

std::map<int, double> volume_per_region(const VolumeMesh& m) {
  std::map<int, double> v;
  for (int e = 0; e < m.n_elements(); ++e)
    v[m.element_region[static_cast<size_t>(e)]] += tet_volume(m.nodes, m.element(e));
  return v;
}

// Faces of the elements that belong to exactly one element, as sorted triples.
std::set<std::array<int, 3>> boundary_faces(const VolumeMesh& m) {
  std::map<std::array<int, 3>, int> count;
  for (int e = 0; e < m.n_elements(); ++e) {
    for (const auto& lf : core::kTetFaces) {
      std::array<int, 3> f = {m.element(e)[lf[0]], m.element(e)[lf[1]], m.element(e)[lf[2]]};
      std::sort(f.begin(), f.end());
      ++count[f];
    }
  }
  std::set<std::array<int, 3>> b;
  for (const auto& [f, n] : count) {
    EXPECT_LE(n, 2) << "a face shared by more than two elements";
    if (n == 1) b.insert(f);
  }
  return b;
}

std::array<int, 3> sorted_face(const VolumeMesh& m, int f) {
  std::array<int, 3> t = {m.face(f)[0], m.face(f)[1], m.face(f)[2]};
  std::sort(t.begin(), t.end());
  return t;
}

TEST(Tetrahedralize, UnitCubeVolumeOrientationAndMarkers) {
  const VolumeMesh m = tetrahedralize(unit_cube(), linear_options());
  ASSERT_EQ(m.nodes_per_element, 4);
  ASSERT_EQ(m.nodes_per_face, 3);
  ASSERT_GT(m.n_elements(), 0);
  double total = 0;
  for (int e = 0; e < m.n_elements(); ++e) {
    const double v = tet_volume(m.nodes, m.element(e));
    EXPECT_GT(v, 0) << "element " << e;
    total += v;
    EXPECT_EQ(m.element_region[static_cast<size_t>(e)], 7);
  }
  EXPECT_NEAR(total, 1.0, 1e-12);  // derived: unit cube

  // Every boundary face of the element set is an output face and vice versa; each lies on the
  // side its marker names and its normal points outward.
  const auto boundary = boundary_faces(m);
  ASSERT_EQ(static_cast<size_t>(m.n_faces()), boundary.size());
  for (int f = 0; f < m.n_faces(); ++f) {
    EXPECT_TRUE(boundary.count(sorted_face(m, f))) << "face " << f;
    const int side = m.face_marker[static_cast<size_t>(f)] - 11;
    ASSERT_GE(side, 0);
    ASSERT_LT(side, 6);
    const int axis = side / 2;
    const double value = side % 2;
    const Eigen::Vector3d& a = m.nodes[static_cast<size_t>(m.face(f)[0])];
    const Eigen::Vector3d& b = m.nodes[static_cast<size_t>(m.face(f)[1])];
    const Eigen::Vector3d& c = m.nodes[static_cast<size_t>(m.face(f)[2])];
    for (const auto* p : {&a, &b, &c}) EXPECT_NEAR((*p)[axis], value, 1e-14) << "face " << f;
    const double outward = (b - a).cross(c - a)[axis] * (side % 2 ? 1.0 : -1.0);
    EXPECT_GT(outward, 0) << "face " << f << " points inward";
  }
  // Every node is used.
  std::vector<bool> used(static_cast<size_t>(m.n_nodes()), false);
  for (int v : m.elements) used[static_cast<size_t>(v)] = true;
  EXPECT_TRUE(std::all_of(used.begin(), used.end(), [](bool u) { return u; }));
}

TEST(Tetrahedralize, InputPointsAreFoundThroughPointNodeAndNothingIsPrinted) {
  Plc plc = unit_cube(0.01);
  plc.points.push_back(plc.points[3]);  // an unreferenced duplicate: in no element
  std::vector<int> point_node;
  testing::internal::CaptureStdout();
  const VolumeMesh m = tetrahedralize(plc, linear_options(), &point_node);
  EXPECT_EQ(testing::internal::GetCapturedStdout(), "");
  ASSERT_EQ(point_node.size(), plc.points.size());
  for (size_t i = 0; i + 1 < plc.points.size(); ++i) {
    ASSERT_GE(point_node[i], 0) << "point " << i;
    EXPECT_EQ(m.nodes[static_cast<size_t>(point_node[i])], plc.points[i]);
  }
  const int dup = point_node.back();
  EXPECT_TRUE(dup == -1 || dup == point_node[3]) << dup;
  EXPECT_GT(m.n_nodes(), 8);  // Steiner points from the volume bound
}

TEST(Tetrahedralize, RegionVolumeBoundIsHonoured) {
  const double bound = 0.002;
  const VolumeMesh m = tetrahedralize(unit_cube(bound), linear_options());
  double max_v = 0;
  for (int e = 0; e < m.n_elements(); ++e)
    max_v = std::max(max_v, tet_volume(m.nodes, m.element(e)));
  EXPECT_LE(max_v, bound * (1 + 1e-9));
  EXPECT_GE(m.n_elements(), static_cast<int>(1.0 / bound));  // derived: volume / bound
  EXPECT_NEAR(volume_per_region(m)[7], 1.0, 1e-12);
}

TEST(Tetrahedralize, GlobalVolumeBoundIsHonoured) {
  TetgenOptions o = linear_options();
  o.max_volume_mm3 = 0.005;
  const VolumeMesh m = tetrahedralize(unit_cube(), o);
  for (int e = 0; e < m.n_elements(); ++e)
    EXPECT_LE(tet_volume(m.nodes, m.element(e)), 0.005 * (1 + 1e-9));
}

TEST(Tetrahedralize, CubeWithCavity) {
  Plc plc = unit_cube();
  add_box(plc, Eigen::Vector3d(0.25, 0.25, 0.25), Eigen::Vector3d(0.75, 0.75, 0.75), 0, 30);
  plc.holes.emplace_back(0.5, 0.5, 0.5);
  plc.regions[0].point = Eigen::Vector3d(0.1, 0.1, 0.1);
  const VolumeMesh m = tetrahedralize(plc, linear_options());
  const auto v = volume_per_region(m);
  ASSERT_EQ(v.size(), 1u);
  EXPECT_NEAR(v.at(7), 1.0 - 0.125, 1e-12);  // derived: 1 - 0.5^3
  // Cavity faces are marked and point out of the solid, i.e. toward the cavity centre.
  int n_cavity = 0;
  for (int f = 0; f < m.n_faces(); ++f) {
    if (m.face_marker[static_cast<size_t>(f)] != 30) continue;
    ++n_cavity;
    const Eigen::Vector3d& a = m.nodes[static_cast<size_t>(m.face(f)[0])];
    const Eigen::Vector3d& b = m.nodes[static_cast<size_t>(m.face(f)[1])];
    const Eigen::Vector3d& c = m.nodes[static_cast<size_t>(m.face(f)[2])];
    const Eigen::Vector3d centroid = (a + b + c) / 3.0;
    EXPECT_GT((b - a).cross(c - a).dot(Eigen::Vector3d(0.5, 0.5, 0.5) - centroid), 0.0)
        << "cavity face " << f << " should point away from the solid into the cavity";
  }
  EXPECT_GE(n_cavity, 12);
  EXPECT_EQ(static_cast<size_t>(m.n_faces()), boundary_faces(m).size());
}

TEST(Tetrahedralize, TwoRegionsWithInterface) {
  Plc plc = unit_cube();
  add_box(plc, Eigen::Vector3d(0.25, 0.25, 0.25), Eigen::Vector3d(0.75, 0.75, 0.75), 0, 30);
  plc.regions[0].point = Eigen::Vector3d(0.1, 0.1, 0.1);
  plc.regions[0].region = 9;
  plc.regions[0].max_volume_mm3 = 0.01;
  plc.regions.push_back({Eigen::Vector3d(0.5, 0.5, 0.5), 3, 0.0005});
  const VolumeMesh m = tetrahedralize(plc, linear_options());
  const auto v = volume_per_region(m);
  ASSERT_EQ(v.size(), 2u);
  EXPECT_NEAR(v.at(3), 0.125, 1e-12);        // derived: 0.5^3
  EXPECT_NEAR(v.at(9), 1.0 - 0.125, 1e-12);  // derived
  for (int e = 0; e < m.n_elements(); ++e) {
    const double bound = m.element_region[static_cast<size_t>(e)] == 3 ? 0.0005 : 0.01;
    EXPECT_LE(tet_volume(m.nodes, m.element(e)), bound * (1 + 1e-9)) << "element " << e;
  }
  // Interface faces: listed once, marked 30, normal out of region 3 (the smaller id).
  const auto boundary = boundary_faces(m);
  double interface_area = 0;
  for (int f = 0; f < m.n_faces(); ++f) {
    if (m.face_marker[static_cast<size_t>(f)] != 30) {
      EXPECT_TRUE(boundary.count(sorted_face(m, f)));
      continue;
    }
    EXPECT_FALSE(boundary.count(sorted_face(m, f)));
    const Eigen::Vector3d& a = m.nodes[static_cast<size_t>(m.face(f)[0])];
    const Eigen::Vector3d& b = m.nodes[static_cast<size_t>(m.face(f)[1])];
    const Eigen::Vector3d& c = m.nodes[static_cast<size_t>(m.face(f)[2])];
    const Eigen::Vector3d n = (b - a).cross(c - a);
    interface_area += 0.5 * n.norm();
    EXPECT_GT(n.dot((a + b + c) / 3.0 - Eigen::Vector3d(0.5, 0.5, 0.5)), 0.0) << "face " << f;
  }
  EXPECT_NEAR(interface_area, 6 * 0.25, 1e-12);  // derived: six 0.5 x 0.5 squares
}

TEST(Tetrahedralize, SecondOrderOutputHasStraightMidsideNodes) {
  const VolumeMesh m = tetrahedralize(unit_cube(0.05), TetgenOptions{});
  ASSERT_EQ(m.nodes_per_element, 10);
  ASSERT_EQ(m.nodes_per_face, 6);
  for (int e = 0; e < m.n_elements(); ++e) {
    const int* t = m.element(e);
    for (int k = 0; k < 6; ++k) {
      const Eigen::Vector3d mid = 0.5 * (m.nodes[static_cast<size_t>(t[core::kTetEdges[k][0]])] +
                                         m.nodes[static_cast<size_t>(t[core::kTetEdges[k][1]])]);
      EXPECT_LT((m.nodes[static_cast<size_t>(t[4 + k])] - mid).norm(), 1e-15);
    }
  }
}

TEST(Tetrahedralize, SelfIntersectingPlcThrowsMeshErrorWithoutPrinting) {
  // Two overlapping boxes whose surfaces cross each other without shared edges.
  Plc plc = unit_cube();
  add_box(plc, Eigen::Vector3d(0.5, 0.5, 0.5), Eigen::Vector3d(1.5, 1.3, 1.4), 20);
  plc.regions.push_back({Eigen::Vector3d(1.2, 1.1, 1.2), 8, 0});
  testing::internal::CaptureStdout();
  testing::internal::CaptureStderr();
  bool threw = false;
  std::string message;
  TetgenOptions options = linear_options();
  options.stage = "tetrahedralising the overlapping boxes";
  try {
    tetrahedralize(plc, options);
  } catch (const MeshError& e) {
    threw = true;
    message = e.what();
  }
  const std::string out = testing::internal::GetCapturedStdout();
  const std::string err = testing::internal::GetCapturedStderr();
  EXPECT_TRUE(threw);
  EXPECT_EQ(message.rfind("tetrahedralising the overlapping boxes: ", 0), 0u) << message;
  EXPECT_NE(message.find("intersect"), std::string::npos) << message;
  EXPECT_NE(message.find("24 triangles"), std::string::npos) << message;
  EXPECT_EQ(out, "");
  EXPECT_EQ(err, "");
}

TEST(Tetrahedralize, UnseededClosedRegionIsReported) {
  Plc plc = unit_cube();
  add_box(plc, Eigen::Vector3d(0.25, 0.25, 0.25), Eigen::Vector3d(0.75, 0.75, 0.75), 0, 30);
  plc.regions[0].point = Eigen::Vector3d(0.1, 0.1, 0.1);
  try {
    tetrahedralize(plc, linear_options());
    FAIL() << "expected MeshError";
  } catch (const MeshError& e) {
    EXPECT_NE(std::string(e.what()).find("no seeded region"), std::string::npos) << e.what();
  }
}

TEST(Tetrahedralize, MalformedInputIsRejectedBeforeTetgen) {
  Plc bad_index = unit_cube();
  bad_index.triangles[3][1] = 8;
  EXPECT_THROW(tetrahedralize(bad_index, linear_options()), MeshError);

  Plc degenerate = unit_cube();
  degenerate.points.emplace_back(2, 0, 0);
  degenerate.triangles.push_back({0, 1, 8});  // collinear points
  degenerate.triangle_marker.push_back(1);
  EXPECT_THROW(tetrahedralize(degenerate, linear_options()), MeshError);

  Plc markers = unit_cube();
  markers.triangle_marker.pop_back();
  EXPECT_THROW(tetrahedralize(markers, linear_options()), MeshError);

  Plc no_seed = unit_cube();
  no_seed.regions.clear();
  EXPECT_THROW(tetrahedralize(no_seed, linear_options()), MeshError);

  Plc zero_id = unit_cube();
  zero_id.regions[0].region = 0;
  EXPECT_THROW(tetrahedralize(zero_id, linear_options()), MeshError);

  TetgenOptions ratio = linear_options();
  ratio.radius_edge_ratio = 0.9;
  try {
    tetrahedralize(unit_cube(), ratio);
    FAIL() << "expected InputError";
  } catch (const InputError& e) {
    EXPECT_EQ(e.key(), "radius_edge_ratio");
  }
  TetgenOptions angle = linear_options();
  angle.min_dihedral_deg = 40;
  EXPECT_THROW(tetrahedralize(unit_cube(), angle), InputError);
}

}  // namespace
}  // namespace sharpey::mesh
