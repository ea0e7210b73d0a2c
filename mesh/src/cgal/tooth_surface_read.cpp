// Reading and checking a tooth surface file with CGAL. The only file of Sharpey that includes
// CGAL (header-only and slow to compile): keep it that way.
#include <CGAL/Exact_predicates_inexact_constructions_kernel.h>
#include <CGAL/IO/polygon_soup_io.h>
#include <CGAL/Polygon_mesh_processing/orientation.h>
#include <CGAL/Polygon_mesh_processing/polygon_soup_to_polygon_mesh.h>
#include <CGAL/Polygon_mesh_processing/repair_polygon_soup.h>
#include <CGAL/Polygon_mesh_processing/self_intersections.h>
#include <CGAL/Surface_mesh.h>
#include <CGAL/boost/graph/helpers.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <map>
#include <sstream>
#include <utility>

#include "sharpey/error.h"
#include "sharpey/mesh/tooth_surface.h"

namespace sharpey::mesh {
namespace {

using Kernel = CGAL::Exact_predicates_inexact_constructions_kernel;
using Point = Kernel::Point_3;
using Mesh = CGAL::Surface_mesh<Point>;
namespace PMP = CGAL::Polygon_mesh_processing;

std::string fmt(double v) {
  std::ostringstream s;
  s.precision(4);
  s << v;
  return s.str();
}

std::string at(const Point& p) {
  return "(" + fmt(p.x()) + ", " + fmt(p.y()) + ", " + fmt(p.z()) + ")";
}

std::string lower_extension(const std::string& path) {
  const size_t dot = path.find_last_of('.');
  if (dot == std::string::npos || path.find('/', dot) != std::string::npos) return "";
  std::string ext = path.substr(dot + 1);
  std::transform(ext.begin(), ext.end(), ext.begin(),
                 [](unsigned char c) { return static_cast<char>(std::tolower(c)); });
  return ext;
}

// A binary STL announces its triangle count in its 84-byte header; CGAL reads what is there, so
// a file cut short in transfer is caught here, before it could pass as a smaller surface.
void check_binary_stl_length(const std::string& path, const std::string& bytes,
                             const std::string& key) {
  if (bytes.size() < 84) return;
  const bool ascii =
      bytes.compare(0, 5, "solid") == 0 && bytes.find("facet", 5) != std::string::npos;
  if (ascii) return;
  uint32_t n = 0;
  for (int i = 0; i < 4; ++i)
    n |= static_cast<uint32_t>(static_cast<unsigned char>(bytes[80 + i])) << (8 * i);
  const uint64_t expected = 84 + 50ULL * n;
  if (bytes.size() < expected) {
    // Cut short, or not an STL at all: the records that are there hold plausible coordinates
    // only in a real STL.
    const size_t n_present = std::min<size_t>((bytes.size() - 84) / 50, 100);
    bool plausible = n_present > 0;
    for (size_t r = 0; r < n_present && plausible; ++r) {
      for (int k = 0; k < 12; ++k) {
        float v = 0;
        std::memcpy(&v, bytes.data() + 84 + 50 * r + 4 * k, 4);
        if (!std::isfinite(v) || std::abs(v) > 1e6f) plausible = false;
      }
    }
    if (!plausible) {
      throw InputError(key, "tooth surface " + path +
                                ": not a readable stl surface (neither ASCII STL nor a binary STL "
                                "with plausible coordinates: garbage or another format); export "
                                "the surface as STL, PLY or OBJ");
    }
    throw InputError(key, "tooth surface " + path +
                              ": truncated binary STL: its header announces " + std::to_string(n) +
                              " triangles (" + std::to_string(expected) +
                              " bytes) but the file has " + std::to_string(bytes.size()) +
                              " bytes; the file was cut short, copy or export it again");
  }
}

// 10 million binary STL triangles; scans of one tooth need far fewer.
constexpr std::uintmax_t kMaxSurfaceFileBytes = 500u * 1000 * 1000;

using Polygons = std::vector<std::vector<std::size_t>>;

// The file before CGAL reads it: only a regular file of sensible size, not empty, and (for a
// binary STL) as long as its header says.
void check_surface_file(const std::string& path, const std::string& ext, const std::string& key) {
  {
    // Only a regular file of sensible size: a device or pipe named by a case file must not hang
    // or exhaust memory.
    std::error_code ec;
    const auto status = std::filesystem::status(path, ec);
    if (!ec && std::filesystem::exists(status) && !std::filesystem::is_regular_file(status)) {
      throw InputError(
          key, "tooth surface " + path + ": not a regular file; name an STL, PLY or OBJ file");
    }
    const auto size = std::filesystem::file_size(path, ec);
    if (!ec && size > kMaxSurfaceFileBytes) {
      throw InputError(key, "tooth surface " + path + ": the file has " + std::to_string(size) +
                                " bytes, more than the " + std::to_string(kMaxSurfaceFileBytes) +
                                " a tooth surface needs; decimate it (about 200 000 triangles "
                                "is plenty) and export again");
    }
  }
  std::string bytes;
  {
    std::ifstream in(path, std::ios::binary);
    if (!in)
      throw InputError(key,
                       "tooth surface " + path +
                           ": cannot be opened; check the path (it is relative to the case file)");
    bytes.assign(std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>());
  }
  if (bytes.empty()) {
    throw InputError(
        key, "tooth surface " + path + ": the file is empty (0 bytes); export the surface again");
  }
  if (ext == "stl") check_binary_stl_length(path, bytes, key);
}

// CGAL's polygon soup of the file: finite coordinates, valid indices, triangles only, equal
// positions merged.
void read_triangle_soup(const std::string& path, const std::string& ext, const std::string& key,
                        std::vector<Point>* points_out, Polygons* polygons_out) {
  std::vector<Point>& points = *points_out;
  Polygons& polygons = *polygons_out;
  bool ok = false;
  try {
    ok = CGAL::IO::read_polygon_soup(path, points, polygons, CGAL::parameters::verbose(false));
  } catch (const std::exception&) {
    ok = false;
  }
  if (!ok || polygons.empty()) {
    throw InputError(
        key, "tooth surface " + path + ": not a readable " + ext + " surface (" +
                 (ok ? "no triangles in it" : "the reader stopped on malformed content") +
                 "); check that the file is a triangulated surface exported as STL, PLY or OBJ");
  }
  for (const auto& p : points) {
    if (!std::isfinite(p.x()) || !std::isfinite(p.y()) || !std::isfinite(p.z())) {
      throw InputError(
          key, "tooth surface " + path +
                   ": a vertex coordinate is not a finite number; export the surface again");
    }
  }
  for (size_t f = 0; f < polygons.size(); ++f) {
    for (size_t v : polygons[f]) {
      if (v >= points.size()) {
        throw InputError(key, "tooth surface " + path + ": polygon " + std::to_string(f) +
                                  " refers to vertex " + std::to_string(v) + " but the file has " +
                                  std::to_string(points.size()) + " vertices");
      }
    }
    if (polygons[f].size() != 3) {
      throw InputError(key, "tooth surface " + path + ": polygon " + std::to_string(f) + " has " +
                                std::to_string(polygons[f].size()) +
                                " corners; export the surface as triangles");
    }
  }
  // STL repeats each vertex in every triangle: merge equal positions (exactly equal only).
  PMP::merge_duplicate_points_in_polygon_soup(points, polygons);
}

// Size and units, before the topology: a file in metres has every triangle nearly degenerate
// at the tolerances of the later checks.
void check_size_and_units(const std::vector<Point>& points, const std::string& path,
                          const std::string& key) {
  Eigen::Vector3d lo = Eigen::Vector3d::Constant(1e300), hi = -lo;
  for (const auto& p : points) {
    const Eigen::Vector3d q(p.x(), p.y(), p.z());
    lo = lo.cwiseMin(q);
    hi = hi.cwiseMax(q);
  }
  const double extent = (hi - lo).maxCoeff();
  if (extent >= kMinToothExtentMm / 1000 && extent <= kMaxToothExtentMm / 1000) {
    throw InputError(key, "tooth surface " + path + ": implausible size: the longest extent is " +
                              fmt(extent) +
                              " units; this looks like metres. Sharpey reads mm: "
                              "scale the surface by 1000 (or export it in millimetres)");
  }
  if (extent >= kMinToothExtentMm * 1000 && extent <= kMaxToothExtentMm * 1000) {
    throw InputError(key, "tooth surface " + path + ": implausible size: the longest extent is " +
                              fmt(extent) +
                              " units; this looks like micrometres. Sharpey reads mm: "
                              "scale the surface by 0.001 (or export it in millimetres)");
  }
  if (extent < kMinToothExtentMm || extent > kMaxToothExtentMm) {
    throw InputError(key, "tooth surface " + path + ": implausible size: the longest extent is " +
                              fmt(extent) + " mm, outside " + fmt(kMinToothExtentMm) + " to " +
                              fmt(kMaxToothExtentMm) +
                              " mm for a whole single-rooted tooth; check the units and that the "
                              "file holds one whole tooth");
  }
}

// Degenerate triangles: a repeated corner or (near) zero area relative to the longest edge.
void check_degenerate_triangles(const std::vector<Point>& points, const Polygons& polygons,
                                const std::string& path, const std::string& key) {
  for (size_t f = 0; f < polygons.size(); ++f) {
    const auto& t = polygons[f];
    const Point &a = points[t[0]], &b = points[t[1]], &c = points[t[2]];
    const Kernel::Vector_3 n = CGAL::cross_product(b - a, c - a);
    const double longest =
        std::max({(b - a).squared_length(), (c - b).squared_length(), (a - c).squared_length()});
    if (t[0] == t[1] || t[1] == t[2] || t[0] == t[2] || CGAL::collinear(a, b, c) ||
        n.squared_length() <= 1e-16 * longest * longest) {
      throw InputError(key, "tooth surface " + path + ": degenerate triangle " + std::to_string(f) +
                                " (zero area) at " + at(a) +
                                "; remove it or repair the surface (most mesh editors can "
                                "remove degenerate faces) and export again");
    }
  }
}

// Edges: boundary (one triangle), non-manifold (more than two), inconsistent orientation
// (two triangles running the edge the same way).
void check_edges(const std::vector<Point>& points, const Polygons& polygons,
                 const std::string& path, const std::string& key) {
  std::map<std::pair<size_t, size_t>, std::pair<int, int>>
      edges;  // (lo, hi) -> (forward, backward)
  for (const auto& t : polygons) {
    for (int k = 0; k < 3; ++k) {
      const size_t u = t[k], v = t[(k + 1) % 3];
      auto& e = edges[{std::min(u, v), std::max(u, v)}];
      (u < v ? e.first : e.second)++;
    }
  }
  size_t n_boundary = 0, n_nonmanifold = 0, n_flipped = 0;
  const Point *first_boundary = nullptr, *first_nonmanifold = nullptr, *first_flipped = nullptr;
  for (const auto& [uv, count] : edges) {
    const int total = count.first + count.second;
    const Point* p = &points[uv.first];
    if (total == 1) {
      if (!n_boundary++) first_boundary = p;
    } else if (total > 2) {
      if (!n_nonmanifold++) first_nonmanifold = p;
    } else if (count.first != 1) {
      if (!n_flipped++) first_flipped = p;
    }
  }
  if (n_nonmanifold) {
    throw InputError(key, "tooth surface " + path +
                              ": not manifold: " + std::to_string(n_nonmanifold) +
                              " edge(s) shared by more than two triangles, the first at " +
                              at(*first_nonmanifold) +
                              "; the file holds touching or duplicated parts: keep one closed "
                              "surface of the tooth");
  }
  if (n_boundary) {
    throw InputError(key, "tooth surface " + path + ": not closed: " + std::to_string(n_boundary) +
                              " boundary edge(s) (holes), the first at " + at(*first_boundary) +
                              "; fill the holes (a segmented root must be capped at the crown) "
                              "and export again");
  }
  if (n_flipped) {
    throw InputError(
        key, "tooth surface " + path + ": inconsistent orientation: " + std::to_string(n_flipped) +
                 " edge(s) where neighbouring triangles face opposite ways, the first at " +
                 at(*first_flipped) + "; re-orient the faces consistently and export again");
  }
}

// CGAL's checks: one closed, valid surface that does not pass through itself and faces outward.
void check_closed_surface(const std::vector<Point>& points, const Polygons& polygons,
                          const std::string& path, const std::string& key) {
  if (!PMP::is_polygon_soup_a_polygon_mesh(polygons)) {
    throw InputError(key,
                     "tooth surface " + path +
                         ": not manifold: a vertex joins separate fans of triangles (two parts "
                         "touching at a point); keep one closed surface of the tooth");
  }
  Mesh mesh;
  PMP::polygon_soup_to_polygon_mesh(points, polygons, mesh);
  if (!CGAL::is_valid_polygon_mesh(mesh) || !CGAL::is_closed(mesh)) {
    throw InputError(
        key, "tooth surface " + path +
                 ": not a valid closed triangle surface after reading; repair it and export again");
  }
  std::vector<std::pair<Mesh::Face_index, Mesh::Face_index>> crossing;
  try {
    PMP::self_intersections(mesh, std::back_inserter(crossing),
                            CGAL::parameters::maximum_number(1));
  } catch (...) {
    // maximum_number stops the search by an exception inside CGAL in some versions.
  }
  if (!crossing.empty() || PMP::does_self_intersect(mesh)) {
    std::string where = "";
    if (!crossing.empty()) {
      const auto h = mesh.halfedge(crossing.front().first);
      where = ", near " + at(mesh.point(mesh.target(h)));
    }
    throw InputError(
        key, "tooth surface " + path + ": self-intersections: the surface passes through itself" +
                 where + "; repair it (remove the intersecting faces and refill) and export again");
  }
  if (!PMP::is_outward_oriented(mesh)) {
    throw InputError(key, "tooth surface " + path +
                              ": inverted orientation: the triangles face inward (their normals "
                              "point into the tooth); flip all face normals and export again");
  }
}

}  // namespace

SurfaceMesh read_tooth_surface(const std::string& path, const std::string& key) {
  const std::string ext = lower_extension(path);
  if (ext != "stl" && ext != "ply" && ext != "obj") {
    throw InputError(key, "tooth surface " + path + ": unknown file type '." + ext +
                              "'; use an STL (binary or ASCII), PLY or OBJ file");
  }
  check_surface_file(path, ext, key);
  std::vector<Point> points;
  Polygons polygons;
  read_triangle_soup(path, ext, key, &points, &polygons);
  const size_t n_tri = polygons.size();
  if (n_tri < static_cast<size_t>(kMinScanTriangles)) {
    throw InputError(key, "tooth surface " + path + ": too few triangles (" +
                              std::to_string(n_tri) + "); a scanned tooth needs at least " +
                              std::to_string(kMinScanTriangles) +
                              " to carry its shape; export at a finer resolution");
  }
  check_size_and_units(points, path, key);
  check_degenerate_triangles(points, polygons, path, key);
  check_edges(points, polygons, path, key);
  check_closed_surface(points, polygons, path, key);
  SurfaceMesh out;
  out.vertices.reserve(points.size());
  for (const auto& p : points) out.vertices.emplace_back(p.x(), p.y(), p.z());
  out.triangles.reserve(n_tri);
  for (const auto& t : polygons) {
    out.triangles.push_back(
        {static_cast<int>(t[0]), static_cast<int>(t[1]), static_cast<int>(t[2])});
  }
  return out;
}

}  // namespace sharpey::mesh
