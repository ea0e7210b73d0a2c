// .vtu writer: round trip through VTK's own XML reader (when the test is linked against VTK),
// region extraction, atomic writing and error reporting.
#include <gtest/gtest.h>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <set>
#include <sstream>

#include "sharpey/error.h"
#include "sharpey/mesh/tetrahedralize.h"
#include "sharpey/mesh/vtu_writer.h"
#include "support/plc_shapes.h"

#ifdef SHARPEY_TEST_WITH_VTK
#include <vtkCellData.h>
#include <vtkDataArray.h>
#include <vtkNew.h>
#include <vtkPointData.h>
#include <vtkPoints.h>
#include <vtkUnstructuredGrid.h>
#include <vtkXMLUnstructuredGridReader.h>
#endif

namespace sharpey::mesh {
namespace {

namespace fs = std::filesystem;

// A fresh folder per test under the build tree.
fs::path test_folder(const std::string& name) {
  const fs::path dir = fs::path(SHARPEY_BINARY_DIR) / "test_output" / "vtu_writer" / name;
  fs::remove_all(dir);
  fs::create_directories(dir);
  return dir;
}

// Cube with an inner box as a second region; 10-node or 4-node.
VolumeMesh two_region_mesh(bool quadratic) {
  Plc plc;
  test::add_box(plc, Eigen::Vector3d::Zero(), Eigen::Vector3d(1, 2, 1), 1);
  test::add_box(plc, Eigen::Vector3d::Constant(0.3), Eigen::Vector3d(0.6, 1.5, 0.6), 0, 20);
  plc.regions.push_back({Eigen::Vector3d(0.1, 0.1, 0.1), kCorticalBone, 0.01});
  plc.regions.push_back({Eigen::Vector3d(0.5, 1.0, 0.5), kPdl, 0.002});
  TetgenOptions o;
  o.second_order = quadratic;
  return tetrahedralize(plc, o);
}

VtuArrays sample_arrays(const VolumeMesh& m) {
  VtuArrays a;
  VtuArrays::PointArray disp{"displacement_mm", 3, {}};
  VtuArrays::PointArray temp{"pressure & <kPa>", 1, {}};
  for (const auto& x : m.nodes) {
    disp.values.insert(disp.values.end(), {x.y() * 1e-3, -x.x() * 1e-3, 0.5 * x.z()});
    temp.values.push_back(x.sum());
  }
  VtuArrays::CellArray id{"element_id", {}};
  for (int e = 0; e < m.n_elements(); ++e) id.values.push_back(e + 0.25);
  a.point_arrays = {disp, temp};
  a.cell_arrays = {id};
  return a;
}

#ifdef SHARPEY_TEST_WITH_VTK
vtkSmartPointer<vtkUnstructuredGrid> read_back(const fs::path& file) {
  vtkNew<vtkXMLUnstructuredGridReader> reader;
  reader->SetFileName(file.c_str());
  reader->Update();
  EXPECT_EQ(reader->GetErrorCode(), 0u);
  vtkSmartPointer<vtkUnstructuredGrid> grid = reader->GetOutput();
  return grid;
}

class VtuRoundTrip : public testing::TestWithParam<bool> {};

TEST_P(VtuRoundTrip, VolumeMeshReadsBackIdentically) {
  const VolumeMesh m = two_region_mesh(GetParam());
  const VtuArrays arrays = sample_arrays(m);
  const fs::path file = test_folder(GetParam() ? "quadratic" : "linear") / "model.vtu";
  write_vtu(file.string(), m, arrays);
  const auto grid = read_back(file);
  ASSERT_EQ(grid->GetNumberOfPoints(), m.n_nodes());
  ASSERT_EQ(grid->GetNumberOfCells(), m.n_elements());
  for (int v = 0; v < m.n_nodes(); ++v) {
    double x[3];
    grid->GetPoint(v, x);
    EXPECT_EQ(Eigen::Vector3d(x[0], x[1], x[2]), m.nodes[static_cast<size_t>(v)]);
  }
  const int k = m.nodes_per_element;
  vtkDataArray* region = grid->GetCellData()->GetArray("region");
  vtkDataArray* id = grid->GetCellData()->GetArray("element_id");
  ASSERT_NE(region, nullptr);
  ASSERT_NE(id, nullptr);
  for (int e = 0; e < m.n_elements(); ++e) {
    EXPECT_EQ(grid->GetCellType(e), k == 10 ? 24 : 10);  // VTK_QUADRATIC_TETRA / VTK_TETRA
    vtkIdType n = 0;
    const vtkIdType* pts = nullptr;
    grid->GetCellPoints(e, n, pts);
    ASSERT_EQ(n, k);
    for (int i = 0; i < k; ++i) EXPECT_EQ(pts[i], m.element(e)[i]);
    EXPECT_EQ(region->GetTuple1(e), m.element_region[static_cast<size_t>(e)]);
    EXPECT_EQ(id->GetTuple1(e), e + 0.25);
  }
  vtkDataArray* disp = grid->GetPointData()->GetArray("displacement_mm");
  vtkDataArray* escaped = grid->GetPointData()->GetArray("pressure & <kPa>");
  ASSERT_NE(disp, nullptr);
  ASSERT_NE(escaped, nullptr);
  ASSERT_EQ(disp->GetNumberOfComponents(), 3);
  for (int v = 0; v < m.n_nodes(); ++v) {
    for (int c = 0; c < 3; ++c)
      EXPECT_EQ(disp->GetComponent(v, c),
                arrays.point_arrays[0].values[static_cast<size_t>(3 * v + c)]);
    EXPECT_EQ(escaped->GetTuple1(v), arrays.point_arrays[1].values[static_cast<size_t>(v)]);
  }
}

TEST_P(VtuRoundTrip, BoundaryReadsBackWithMarkersAndReducedPoints) {
  const VolumeMesh m = two_region_mesh(GetParam());
  const VtuArrays arrays = sample_arrays(m);
  VtuArrays boundary_arrays;
  boundary_arrays.point_arrays = arrays.point_arrays;
  boundary_arrays.cell_arrays.push_back({"face_id", {}});
  for (int f = 0; f < m.n_faces(); ++f) boundary_arrays.cell_arrays[0].values.push_back(f);
  const fs::path file =
      test_folder(GetParam() ? "boundary_quadratic" : "boundary_linear") / "b.vtu";
  write_boundary_vtu(file.string(), m, boundary_arrays);
  const auto grid = read_back(file);
  ASSERT_EQ(grid->GetNumberOfCells(), m.n_faces());
  vtkDataArray* marker = grid->GetCellData()->GetArray("marker");
  vtkDataArray* disp = grid->GetPointData()->GetArray("displacement_mm");
  ASSERT_NE(marker, nullptr);
  ASSERT_NE(disp, nullptr);
  const int k = m.nodes_per_face;
  for (int f = 0; f < m.n_faces(); ++f) {
    EXPECT_EQ(grid->GetCellType(f), k == 6 ? 22 : 5);  // VTK_QUADRATIC_TRIANGLE / VTK_TRIANGLE
    EXPECT_EQ(marker->GetTuple1(f), m.face_marker[static_cast<size_t>(f)]);
    vtkIdType n = 0;
    const vtkIdType* pts = nullptr;
    grid->GetCellPoints(f, n, pts);
    ASSERT_EQ(n, k);
    for (int i = 0; i < k; ++i) {
      // The written point carries the same coordinates and point data as the mesh node.
      const int node = m.face(f)[i];
      double x[3];
      grid->GetPoint(pts[i], x);
      EXPECT_EQ(Eigen::Vector3d(x[0], x[1], x[2]), m.nodes[static_cast<size_t>(node)]);
      EXPECT_EQ(disp->GetComponent(pts[i], 2),
                arrays.point_arrays[0].values[static_cast<size_t>(3 * node + 2)]);
    }
  }
  std::set<int> used(m.faces.begin(), m.faces.end());
  EXPECT_EQ(grid->GetNumberOfPoints(), static_cast<vtkIdType>(used.size()));
}

INSTANTIATE_TEST_SUITE_P(Order, VtuRoundTrip, testing::Values(false, true),
                         [](const testing::TestParamInfo<bool>& i) {
                           return i.param ? std::string("quadratic") : std::string("linear");
                         });
#endif  // SHARPEY_TEST_WITH_VTK

TEST(VtuWriter, HeaderDeclaresTheGrid) {
  const VolumeMesh m = two_region_mesh(true);
  const fs::path file = test_folder("header") / "model.vtu";
  write_vtu(file.string(), m);
  std::ifstream in(file, std::ios::binary);
  std::string text((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
  std::ostringstream piece;
  piece << "<Piece NumberOfPoints=\"" << m.n_nodes() << "\" NumberOfCells=\"" << m.n_elements()
        << "\">";
  EXPECT_NE(text.find("<VTKFile type=\"UnstructuredGrid\""), std::string::npos);
  EXPECT_NE(text.find(piece.str()), std::string::npos);
  EXPECT_NE(text.find("Name=\"region\""), std::string::npos);
  EXPECT_EQ(text.substr(text.size() - 11), "</VTKFile>\n");
}

TEST(VtuWriter, ReplacesAtomicallyAndLeavesNoTemporaryFiles) {
  const fs::path dir = test_folder("atomic");
  const fs::path file = dir / "model.vtu";
  { std::ofstream(file) << "old contents"; }
  write_vtu(file.string(), two_region_mesh(false));
  std::ifstream in(file);
  std::string first_line;
  std::getline(in, first_line);
  EXPECT_EQ(first_line, "<?xml version=\"1.0\"?>");
  int n_files = 0;
  for (const auto& entry : fs::directory_iterator(dir)) {
    ++n_files;
    EXPECT_EQ(entry.path().filename(), "model.vtu");
  }
  EXPECT_EQ(n_files, 1);
}

TEST(VtuWriter, UnwritablePathThrowsErrorNamingIt) {
  const fs::path file = test_folder("missing") / "no_such_folder" / "model.vtu";
  try {
    write_vtu(file.string(), two_region_mesh(false));
    FAIL() << "expected Error";
  } catch (const Error& e) {
    EXPECT_NE(std::string(e.what()).find(file.string()), std::string::npos) << e.what();
  }
  EXPECT_FALSE(fs::exists(file.parent_path()));
}

TEST(VtuWriter, BadArraysThrowInputErrorNamingTheArray) {
  const VolumeMesh m = two_region_mesh(false);
  const fs::path file = test_folder("bad_arrays") / "model.vtu";
  VtuArrays short_points;
  short_points.point_arrays.push_back({"displacement_mm", 3, std::vector<double>(5, 0.0)});
  try {
    write_vtu(file.string(), m, short_points);
    FAIL() << "expected InputError";
  } catch (const InputError& e) {
    EXPECT_EQ(e.key(), "displacement_mm");
  }
  VtuArrays clash;
  clash.cell_arrays.push_back(
      {"region", std::vector<double>(static_cast<size_t>(m.n_elements()), 0.0)});
  EXPECT_THROW(write_vtu(file.string(), m, clash), InputError);
  VtuArrays short_cells;
  short_cells.cell_arrays.push_back({"von_mises_mpa", {1.0}});
  EXPECT_THROW(write_vtu(file.string(), m, short_cells), InputError);
  EXPECT_FALSE(fs::exists(file));
}

TEST(ExtractRegion, KeepsElementsNodesAndFacesOfOneRegion) {
  const VolumeMesh m = two_region_mesh(true);
  std::vector<int> node_map;
  const VolumeMesh sub = extract_region(m, kPdl, &node_map);
  int expected_elements = 0;
  for (int r : m.element_region) expected_elements += r == kPdl;
  ASSERT_EQ(sub.n_elements(), expected_elements);
  ASSERT_EQ(static_cast<int>(node_map.size()), sub.n_nodes());
  EXPECT_TRUE(std::is_sorted(node_map.begin(), node_map.end()));
  for (int v = 0; v < sub.n_nodes(); ++v)
    EXPECT_EQ(sub.nodes[static_cast<size_t>(v)],
              m.nodes[static_cast<size_t>(node_map[static_cast<size_t>(v)])]);
  int e_sub = 0;
  for (int e = 0; e < m.n_elements(); ++e) {
    if (m.element_region[static_cast<size_t>(e)] != kPdl) continue;
    for (int i = 0; i < 10; ++i)
      EXPECT_EQ(node_map[static_cast<size_t>(sub.element(e_sub)[i])], m.element(e)[i]);
    ++e_sub;
  }
  // The inner box surface (marker 20) is all in the region, the outer cube sides are not.
  int n20 = 0;
  for (int marker : m.face_marker) n20 += marker == 20;
  EXPECT_EQ(sub.n_faces(), n20);
  for (int marker : sub.face_marker) EXPECT_EQ(marker, 20);
  EXPECT_EQ(extract_region(m, 77, nullptr).n_elements(), 0);
}

}  // namespace
}  // namespace sharpey::mesh
