// Prints the run time of the PDL width search and of measure() on large invented surfaces: two
// concentric geodesic spheres (radius 3 and 3.2 mm) with about 10^5 faces each, flat and curved.
#include <Eigen/Geometry>
#include <algorithm>
#include <array>
#include <cmath>
#include <cstdio>
#include <ctime>
#include <map>
#include <utility>
#include <vector>

#include "sharpey/core/constants.h"
#include "sharpey/mesh/mesh_statistics.h"
#include "sharpey/mesh/second_order.h"
#include "support/plc_shapes.h"

namespace {

using sharpey::mesh::VolumeMesh;

// Geodesic sphere (icosahedron subdivided `levels` times) appended to `m` as faces with `marker`.
void add_sphere(VolumeMesh& m, double radius, int levels, int marker) {
  const sharpey::mesh::test::TriSurface sphere =
      sharpey::mesh::test::icosphere(Eigen::Vector3d::Zero(), radius, levels);
  const int base = m.n_nodes();
  for (const auto& x : sphere.points) m.nodes.push_back(x);
  for (const auto& tri : sphere.triangles) {
    for (int v : tri) m.faces.push_back(base + v);
    m.face_marker.push_back(marker);
  }
}

// Processor time of this process (the machine may be shared, so wall time would mislead).
struct Timer {
  std::clock_t start = std::clock();
  double seconds() const { return static_cast<double>(std::clock() - start) / CLOCKS_PER_SEC; }
};

}  // namespace

int main() {
  using namespace sharpey::mesh;
  VolumeMesh m;
  m.nodes_per_element = 4;
  m.nodes_per_face = 3;
  add_sphere(m, 3.0, 6, kRootSurface);
  add_sphere(m, 3.2, 6, kSocketSurface);
  std::printf("flat surfaces: %d faces per sphere\n", m.n_faces() / 2);
  Timer timer;
  auto samples = pdl_width_samples(m);
  double t = timer.seconds();
  double lo = 1e9, hi = 0;
  for (const auto& s : samples) lo = std::min(lo, s.width_mm), hi = std::max(hi, s.width_mm);
  std::printf("  pdl_width_samples: %zu samples in %.3f s CPU, width %.6f to %.6f mm (exact 0.2)\n",
              samples.size(), t, lo, hi);

  const VolumeMesh q = make_second_order(m, [](const std::vector<int>& markers,
                                               const Eigen::Vector3d& a, const Eigen::Vector3d& b) {
    return Eigen::Vector3d((markers.front() == kRootSurface ? 3.0 : 3.2) * (a + b).normalized());
  });
  timer = Timer();
  samples = pdl_width_samples(q);
  t = timer.seconds();
  lo = 1e9, hi = 0;
  for (const auto& s : samples) lo = std::min(lo, s.width_mm), hi = std::max(hi, s.width_mm);
  std::printf("curved 6-node surfaces: %zu samples in %.3f s CPU, width %.6f to %.6f mm\n",
              samples.size(), t, lo, hi);
  timer = Timer();
  const MeshStatistics s = measure(q);
  std::printf("measure() on the curved faces: %.3f s CPU, root area %.4f mm^2 (exact %.4f)\n",
              timer.seconds(), s.area_per_marker_mm2.at(kRootSurface),
              4 * sharpey::core::kPi * 9.0);
  return 0;
}
