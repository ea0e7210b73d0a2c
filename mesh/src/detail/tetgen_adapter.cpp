// The only translation unit that includes tetgen.h: Plc -> tetgenio -> VolumeMesh.
//
// TetGen 1.5 built with TETLIBRARY reports failures by throwing an int from terminatetetgen()
// (1 out of memory, 2 internal error, 3 self-intersection, 4 tiny feature, 5 close facets,
// 10 input error); they are mapped to MeshError here. TetGen's own assertions and crashes cannot
// be caught, so the PLC is checked for the mistakes that would reach them (indices, degenerate
// triangles, non-finite coordinates) before TetGen sees it, and TetGen runs in the separate mesher
// executable (child_process.h, mesher_protocol.h): if it crashes all the same, the caller gets a
// MeshError, not a dead program, and a cancel request kills it at once.
#include <tetgen.h>
#include <unistd.h>

#include <Eigen/Geometry>
#include <algorithm>
#include <array>
#include <cerrno>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <exception>
#include <iomanip>
#include <limits>
#include <new>
#include <sstream>
#include <string>
#include <unordered_map>
#include <vector>

#include "mesher_protocol.h"
#include "sharpey/core/reference_tetrahedron.h"
#include "sharpey/error.h"
#include "sharpey/mesh/child_process.h"
#include "sharpey/mesh/second_order.h"
#include "sharpey/mesh/tetrahedralize.h"
#include "tetgen_terminate.h"
#include "triangle_key.h"

namespace sharpey::mesh {
namespace {

using detail::TriangleKey;
using detail::TriangleKeyHash;

// What is being meshed, for the messages: the caller's stage name and the PLC.
struct Context {
  const Plc& plc;
  const std::string& stage;
};

std::string size_text(const Plc& plc) {
  std::ostringstream s;
  s << plc.points.size() << " points, " << plc.triangles.size() << " triangles, "
    << plc.regions.size() << " region seeds, " << plc.holes.size() << " holes";
  return s.str();
}

std::string tetgen_reason(int code) {
  switch (code) {
    case 1:
      return "out of memory (the size bounds ask for too many elements; use coarser sizing)";
    case 2:
      return "TetGen internal error (often caused by nearly coincident or nearly intersecting "
             "surfaces; change the geometry slightly or the sizing)";
    case 3:
      return "the input surfaces intersect each other (self-intersecting facets); the geometry "
             "parameters produce overlapping surfaces";
    case 4:
      return "an input feature is too small relative to the model size (points or edges almost "
             "coincide)";
    case 5:
      return "two input facets are too close to each other (nearly touching surfaces)";
    case 10:
      return "TetGen rejected the input (invalid switches or data)";
    default:
      return "TetGen stopped with unknown code " + std::to_string(code);
  }
}

std::string failure_text(const Context& ctx, const std::string& what) {
  return ctx.stage + ": " + what + " (input: " + size_text(ctx.plc) + ")";
}

[[noreturn]] void fail(const Context& ctx, const std::string& what) {
  throw MeshError(failure_text(ctx, what));
}

void check_options(const TetgenOptions& o) {
  if (!std::isfinite(o.radius_edge_ratio) ||
      (o.radius_edge_ratio > 0 && o.radius_edge_ratio < 1.0)) {
    throw InputError("radius_edge_ratio",
                     "radius-edge ratio bound " + std::to_string(o.radius_edge_ratio) +
                         " is below 1.0, which TetGen cannot reach; use 1.2 to 2.0 (or <= 0 to "
                         "switch quality refinement off)");
  }
  if (!std::isfinite(o.min_dihedral_deg) || o.min_dihedral_deg < 0 || o.min_dihedral_deg > 18) {
    throw InputError("min_dihedral_deg",
                     "minimum dihedral angle bound " + std::to_string(o.min_dihedral_deg) +
                         " deg is outside 0 to 18 deg, where TetGen terminates; use 5 to 15");
  }
  if (!std::isfinite(o.max_volume_mm3)) {
    throw InputError("max_volume_mm3", "global volume bound is not a finite number");
  }
}

void check_plc(const Context& ctx) {
  const Plc& plc = ctx.plc;
  const int n_points = static_cast<int>(plc.points.size());
  if (n_points < 4 || plc.triangles.size() < 4) fail(ctx, "fewer than 4 points or 4 triangles");
  if (plc.triangle_marker.size() != plc.triangles.size()) {
    fail(ctx, "triangle_marker has " + std::to_string(plc.triangle_marker.size()) +
                  " entries, one per triangle is required");
  }
  for (int i = 0; i < n_points; ++i) {
    if (!plc.points[i].allFinite()) fail(ctx, "point " + std::to_string(i) + " is not finite");
  }
  for (size_t t = 0; t < plc.triangles.size(); ++t) {
    const auto& tri = plc.triangles[t];
    for (int v : tri) {
      if (v < 0 || v >= n_points) {
        fail(ctx, "triangle " + std::to_string(t) + " refers to point " + std::to_string(v) +
                      ", valid indices are 0 to " + std::to_string(n_points - 1));
      }
    }
    const Eigen::Vector3d& a = plc.points[tri[0]];
    const Eigen::Vector3d n = (plc.points[tri[1]] - a).cross(plc.points[tri[2]] - a);
    if (tri[0] == tri[1] || tri[1] == tri[2] || tri[0] == tri[2] || n.norm() == 0.0) {
      fail(ctx, "triangle " + std::to_string(t) + " is degenerate (zero area)");
    }
  }
  if (plc.regions.empty()) fail(ctx, "no region seed given; every region needs one");
  for (size_t r = 0; r < plc.regions.size(); ++r) {
    const auto& seed = plc.regions[r];
    if (seed.region < 1) {
      fail(ctx, "region seed " + std::to_string(r) + " has region id " +
                    std::to_string(seed.region) + "; ids must be >= 1");
    }
    if (!seed.point.allFinite() || !std::isfinite(seed.max_volume_mm3)) {
      fail(ctx, "region seed " + std::to_string(r) + " has a non-finite point or volume bound");
    }
  }
  for (size_t h = 0; h < plc.holes.size(); ++h) {
    if (!plc.holes[h].allFinite()) fail(ctx, "hole point " + std::to_string(h) + " is not finite");
  }
}

std::string switches(const Plc& plc, const TetgenOptions& o) {
  std::ostringstream s;
  s << std::setprecision(12);
  s << "pzQA";  // PLC, zero-based indices, quiet, region attributes
  if (o.radius_edge_ratio > 0) s << "q" << o.radius_edge_ratio << "/" << o.min_dihedral_deg;
  const bool region_bounds =
      std::any_of(plc.regions.begin(), plc.regions.end(),
                  [](const Plc::RegionSeed& r) { return r.max_volume_mm3 > 0; });
  if (region_bounds) s << "a";
  if (o.max_volume_mm3 > 0) s << "a" << o.max_volume_mm3;
  if (o.preserve_surface) s << "Y";
  return s.str();
}

void fill_input(const Plc& plc, tetgenio& in) {
  in.firstnumber = 0;
  in.numberofpoints = static_cast<int>(plc.points.size());
  in.pointlist = new REAL[plc.points.size() * 3];
  for (size_t i = 0; i < plc.points.size(); ++i) {
    for (int k = 0; k < 3; ++k) in.pointlist[3 * i + k] = plc.points[i][k];
  }
  in.numberoffacets = static_cast<int>(plc.triangles.size());
  in.facetlist = new tetgenio::facet[plc.triangles.size()];
  in.facetmarkerlist = new int[plc.triangles.size()];
  for (size_t t = 0; t < plc.triangles.size(); ++t) {
    tetgenio::facet& f = in.facetlist[t];
    tetgenio::init(&f);
    f.polygonlist = new tetgenio::polygon[1];
    f.numberofpolygons = 1;
    tetgenio::polygon& p = f.polygonlist[0];
    tetgenio::init(&p);
    p.vertexlist = new int[3];
    p.numberofvertices = 3;
    for (int k = 0; k < 3; ++k) p.vertexlist[k] = plc.triangles[t][k];
    in.facetmarkerlist[t] = plc.triangle_marker[t];
  }
  in.numberofregions = static_cast<int>(plc.regions.size());
  in.regionlist = new REAL[plc.regions.size() * 5];
  for (size_t r = 0; r < plc.regions.size(); ++r) {
    const auto& seed = plc.regions[r];
    REAL* row = in.regionlist + 5 * r;
    for (int k = 0; k < 3; ++k) row[k] = seed.point[k];
    row[3] = seed.region;
    row[4] = seed.max_volume_mm3 > 0 ? seed.max_volume_mm3 : -1.0;  // negative: no bound
  }
  if (!plc.holes.empty()) {
    in.numberofholes = static_cast<int>(plc.holes.size());
    in.holelist = new REAL[plc.holes.size() * 3];
    for (size_t h = 0; h < plc.holes.size(); ++h) {
      for (int k = 0; k < 3; ++k) in.holelist[3 * h + k] = plc.holes[h][k];
    }
  }
}

double signed_volume(const std::vector<Eigen::Vector3d>& x, const int* t) {
  return (x[t[1]] - x[t[0]]).dot((x[t[2]] - x[t[0]]).cross(x[t[3]] - x[t[0]])) / 6.0;
}

// Keeps only the nodes used by elements, in TetGen's order; returns TetGen's point index -> node
// (-1 for a point no element uses).
std::vector<int> copy_used_nodes(const Context& ctx, const tetgenio& out, VolumeMesh* mesh) {
  const int n_tets = out.numberoftetrahedra;
  const int n_in_nodes = out.numberofpoints;
  std::vector<int> new_index(static_cast<size_t>(n_in_nodes), -1);
  for (int i = 0; i < 4 * n_tets; ++i) {
    const int v = out.tetrahedronlist[i];
    if (v < 0 || v >= n_in_nodes) fail(ctx, "TetGen returned an element node out of range");
    new_index[static_cast<size_t>(v)] = 0;
  }
  for (int v = 0; v < n_in_nodes; ++v) {
    if (new_index[static_cast<size_t>(v)] < 0) continue;
    new_index[static_cast<size_t>(v)] = mesh->n_nodes();
    const REAL* p = out.pointlist + 3 * static_cast<size_t>(v);
    mesh->nodes.emplace_back(p[0], p[1], p[2]);
  }
  return new_index;
}

// The node of each input point (-1 when it is not a mesh node).
void map_input_points(const Plc& plc, const tetgenio& out, const std::vector<int>& new_index,
                      std::vector<int>* point_node) {
  // TetGen lists the input points first, in input order; check the coordinates all the same.
  point_node->assign(plc.points.size(), -1);
  for (size_t i = 0; i < plc.points.size() && i < static_cast<size_t>(out.numberofpoints); ++i) {
    const REAL* p = out.pointlist + 3 * i;
    if (Eigen::Vector3d(p[0], p[1], p[2]) == plc.points[i]) (*point_node)[i] = new_index[i];
  }
}

// Elements with positive volume and their region ids; every element must lie in a seeded region.
void copy_elements(const Context& ctx, const tetgenio& out, const std::vector<int>& new_index,
                   VolumeMesh* mesh) {
  std::vector<int> seeded;
  for (const auto& seed : ctx.plc.regions) seeded.push_back(seed.region);
  std::sort(seeded.begin(), seeded.end());
  const int n_tets = out.numberoftetrahedra;
  mesh->elements.resize(static_cast<size_t>(n_tets) * 4);
  mesh->element_region.resize(static_cast<size_t>(n_tets));
  int n_unseeded = 0;
  for (int e = 0; e < n_tets; ++e) {
    int* t = mesh->elements.data() + 4 * static_cast<size_t>(e);
    for (int k = 0; k < 4; ++k)
      t[k] = new_index[static_cast<size_t>(out.tetrahedronlist[4 * e + k])];
    if (signed_volume(mesh->nodes, t) < 0) std::swap(t[1], t[2]);
    const double attr =
        out.tetrahedronattributelist[static_cast<size_t>(e) * out.numberoftetrahedronattributes];
    const int region = static_cast<int>(std::lround(attr));
    if (!std::binary_search(seeded.begin(), seeded.end(), region)) ++n_unseeded;
    mesh->element_region[static_cast<size_t>(e)] = region;
  }
  if (n_unseeded > 0) {
    fail(ctx, std::to_string(n_unseeded) + " of " + std::to_string(n_tets) +
                  " elements lie in no seeded region (a closed sub-volume has no region seed or "
                  "hole point, or a seed lies outside its region)");
  }
}

using FaceIndex = std::unordered_map<TriangleKey, int, TriangleKeyHash>;

// Faces: TetGen's subfaces (pieces of the input triangles) with their facet markers; returns the
// face of each sorted node triple.
FaceIndex copy_faces(const Context& ctx, const tetgenio& out, const std::vector<int>& new_index,
                     VolumeMesh* mesh) {
  const int n_faces = out.numberoftrifaces;
  const int n_in_nodes = out.numberofpoints;
  if (n_faces <= 0 || out.trifacelist == nullptr || out.trifacemarkerlist == nullptr) {
    fail(ctx, "TetGen returned no boundary faces");
  }
  FaceIndex face_of_key;
  face_of_key.reserve(static_cast<size_t>(n_faces) * 2);
  mesh->faces.resize(static_cast<size_t>(n_faces) * 3);
  mesh->face_marker.resize(static_cast<size_t>(n_faces));
  for (int f = 0; f < n_faces; ++f) {
    int* tri = mesh->faces.data() + 3 * static_cast<size_t>(f);
    for (int k = 0; k < 3; ++k) {
      const int v = out.trifacelist[3 * f + k];
      if (v < 0 || v >= n_in_nodes || new_index[static_cast<size_t>(v)] < 0) {
        fail(ctx, "TetGen returned a face whose node belongs to no element");
      }
      tri[k] = new_index[static_cast<size_t>(v)];
    }
    mesh->face_marker[static_cast<size_t>(f)] = out.trifacemarkerlist[f];
    face_of_key.emplace(TriangleKey(tri[0], tri[1], tri[2]), f);
  }
  return face_of_key;
}

// Orients each face outward from the adjacent element with the smallest region id; every face
// must belong to an element.
void orient_faces(const Context& ctx, const FaceIndex& face_of_key, VolumeMesh* mesh) {
  const size_t n_faces = mesh->face_marker.size();
  std::vector<int> owner_region(n_faces, std::numeric_limits<int>::max());
  std::vector<int> n_adjacent(n_faces, 0);
  for (int e = 0; e < mesh->n_elements(); ++e) {
    const int* t = mesh->element(e);
    const int region = mesh->element_region[static_cast<size_t>(e)];
    for (const auto& lf : core::kTetFaces) {  // outward for positive volume
      const auto it = face_of_key.find(TriangleKey(t[lf[0]], t[lf[1]], t[lf[2]]));
      if (it == face_of_key.end()) continue;
      const auto f = static_cast<size_t>(it->second);
      ++n_adjacent[f];
      if (region >= owner_region[f]) continue;
      owner_region[f] = region;
      int* tri = mesh->faces.data() + 3 * f;
      tri[0] = t[lf[0]];
      tri[1] = t[lf[1]];
      tri[2] = t[lf[2]];
    }
  }
  for (size_t f = 0; f < n_faces; ++f) {
    if (n_adjacent[f] == 0) fail(ctx, "TetGen returned a face that belongs to no element");
  }
}

// Converts TetGen's output to a linear VolumeMesh: compact nodes, positive volumes, region ids,
// face markers and face orientation.
VolumeMesh convert_output(const Context& ctx, const tetgenio& out, std::vector<int>* point_node) {
  if (out.numberoftetrahedra <= 0)
    fail(ctx, "TetGen produced no elements (is the surface closed?)");
  if (out.numberofcorners != 4) fail(ctx, "TetGen returned elements that are not 4-node");
  if (out.numberoftetrahedronattributes < 1 || out.tetrahedronattributelist == nullptr) {
    fail(ctx, "TetGen returned no region attributes");
  }
  VolumeMesh mesh;
  mesh.nodes_per_element = 4;
  mesh.nodes_per_face = 3;
  const std::vector<int> new_index = copy_used_nodes(ctx, out, &mesh);
  if (point_node != nullptr) map_input_points(ctx.plc, out, new_index, point_node);
  copy_elements(ctx, out, new_index, &mesh);
  const FaceIndex face_of_key = copy_faces(ctx, out, new_index, &mesh);
  orient_faces(ctx, face_of_key, &mesh);
  return mesh;
}

// Runs TetGen on the checked input and converts its output (MeshError on failure).
VolumeMesh run_tetgen(const Context& ctx, const TetgenOptions& options,
                      std::vector<int>* point_node) {
  tetgenio in;
  tetgenio out;
  try {
    fill_input(ctx.plc, in);
  } catch (const std::bad_alloc&) {
    fail(ctx, "out of memory while copying the input");
  }
  const std::string sw = switches(ctx.plc, options);
  std::vector<char> sw_buffer(sw.begin(), sw.end());
  sw_buffer.push_back('\0');
  if (!detail::tetgen_termination_fix_linked()) fail(ctx, "TetGen error handler missing");
  try {
    ::tetrahedralize(sw_buffer.data(), &in, &out);
  } catch (int code) {
    fail(ctx, tetgen_reason(code) + " [TetGen code " + std::to_string(code) + ", switches \"" + sw +
                  "\"]");
  } catch (const std::bad_alloc&) {
    fail(ctx, tetgen_reason(1));
  }
  return convert_output(ctx, out, point_node);
}

// The mesher's report on its standard output: 'E' and the MeshError message, or 'M', the counts
// and the linear mesh's arrays (4-node elements, 3-node faces) and point_node, as raw bytes (the
// mesher is built from the same sources in the same build, so the layout matches).
constexpr char kMeshReport = 'M', kErrorReport = 'E';

template <class T>
bool write_vector(int fd, const std::vector<T>& v) {
  const std::uint64_t n = v.size();
  return write_all(fd, &n, sizeof n) && write_all(fd, v.data(), n * sizeof(T));
}

int report_mesh(int fd, const Context& ctx, const TetgenOptions& options, bool want_point_node) {
  std::vector<int> point_node;
  try {
    const VolumeMesh mesh = run_tetgen(ctx, options, want_point_node ? &point_node : nullptr);
    const bool ok = write_all(fd, &kMeshReport, 1) && write_vector(fd, mesh.nodes) &&
                    write_vector(fd, mesh.elements) && write_vector(fd, mesh.element_region) &&
                    write_vector(fd, mesh.faces) && write_vector(fd, mesh.face_marker) &&
                    write_vector(fd, point_node);
    return ok ? 0 : 1;
  } catch (const std::exception& e) {
    // MeshError as it is; out of memory outside TetGen's own checks (converting its output) as
    // TetGen's out-of-memory failure.
    const bool memory = dynamic_cast<const std::bad_alloc*>(&e) != nullptr;
    const std::string what = memory ? failure_text(ctx, tetgen_reason(1)) : std::string(e.what());
    return write_all(fd, &kErrorReport, 1) && write_all(fd, what.data(), what.size()) ? 0 : 1;
  }
}

// Reads one vector written by write_vector at `pos`; false if the text is too short.
template <class T>
bool read_vector(const std::string& report, size_t* pos, std::vector<T>* v) {
  std::uint64_t n = 0;
  if (report.size() - *pos < sizeof n) return false;
  std::memcpy(&n, report.data() + *pos, sizeof n);
  *pos += sizeof n;
  if (n > (report.size() - *pos) / sizeof(T)) return false;
  v->resize(static_cast<size_t>(n));
  if (n > 0) {  // an empty vector's data() may be null, which memcpy must not get
    std::memcpy(static_cast<void*>(v->data()), report.data() + *pos,
                static_cast<size_t>(n) * sizeof(T));
  }
  *pos += static_cast<size_t>(n) * sizeof(T);
  return true;
}

template <class T>
void append_value(std::string* out, const T& value) {
  out->append(reinterpret_cast<const char*>(&value), sizeof value);
}
template <class T>
void append_vector(std::string* out, const std::vector<T>& v) {
  append_value(out, static_cast<std::uint64_t>(v.size()));
  out->append(reinterpret_cast<const char*>(v.data()), v.size() * sizeof(T));
}
template <class T>
bool read_value(const std::string& in, size_t* pos, T* value) {
  if (in.size() - *pos < sizeof(T)) return false;
  std::memcpy(static_cast<void*>(value), in.data() + *pos, sizeof(T));
  *pos += sizeof(T);
  return true;
}

// The mesher's input on its standard input: a tag, the PLC and the options as plain data (region
// seeds field by field, so no padding bytes are sent).
constexpr std::uint64_t kInputTag = 0x31687365'4d796870ull;  // "phyMesh1", any fixed value

std::string serialise_input(const Plc& plc, const TetgenOptions& options, bool want_point_node) {
  std::string out;
  append_value(&out, kInputTag);
  append_vector(&out, plc.points);
  append_vector(&out, plc.triangles);
  append_vector(&out, plc.triangle_marker);
  std::vector<Eigen::Vector3d> seed_points;
  std::vector<int> seed_regions;
  std::vector<double> seed_volumes;
  for (const Plc::RegionSeed& r : plc.regions) {
    seed_points.push_back(r.point);
    seed_regions.push_back(r.region);
    seed_volumes.push_back(r.max_volume_mm3);
  }
  append_vector(&out, seed_points);
  append_vector(&out, seed_regions);
  append_vector(&out, seed_volumes);
  append_vector(&out, plc.holes);
  append_value(&out, options.radius_edge_ratio);
  append_value(&out, options.min_dihedral_deg);
  append_value(&out, options.max_volume_mm3);
  append_value(&out, static_cast<std::uint8_t>(options.preserve_surface));
  append_value(&out, static_cast<std::uint8_t>(want_point_node));
  append_vector(&out, std::vector<char>(options.stage.begin(), options.stage.end()));
  return out;
}

bool parse_input(const std::string& in, Plc* plc, TetgenOptions* options, bool* want_point_node) {
  size_t pos = 0;
  std::uint64_t tag = 0;
  std::vector<Eigen::Vector3d> seed_points;
  std::vector<int> seed_regions;
  std::vector<double> seed_volumes;
  std::uint8_t preserve = 0, want = 0;
  std::vector<char> stage;
  const bool ok =
      read_value(in, &pos, &tag) && tag == kInputTag && read_vector(in, &pos, &plc->points) &&
      read_vector(in, &pos, &plc->triangles) && read_vector(in, &pos, &plc->triangle_marker) &&
      read_vector(in, &pos, &seed_points) && read_vector(in, &pos, &seed_regions) &&
      read_vector(in, &pos, &seed_volumes) && read_vector(in, &pos, &plc->holes) &&
      read_value(in, &pos, &options->radius_edge_ratio) &&
      read_value(in, &pos, &options->min_dihedral_deg) &&
      read_value(in, &pos, &options->max_volume_mm3) && read_value(in, &pos, &preserve) &&
      read_value(in, &pos, &want) && read_vector(in, &pos, &stage) && pos == in.size() &&
      seed_points.size() == seed_regions.size() && seed_points.size() == seed_volumes.size();
  if (!ok) return false;
  for (size_t i = 0; i < seed_points.size(); ++i)
    plc->regions.push_back({seed_points[i], seed_regions[i], seed_volumes[i]});
  options->preserve_surface = preserve != 0;
  options->second_order = false;  // the caller converts
  options->stage.assign(stage.begin(), stage.end());
  *want_point_node = want != 0;
  return true;
}

// TetGen in the mesher process (child_process.h): a crash inside it (TetGen 1.5 can end in a
// segmentation fault when memory runs out part-way, and its internal assertions abort) becomes a
// MeshError instead of ending the program; options.cancel kills it. No in-process fallback: a
// mesher that cannot be started is a MeshError saying where it was looked for.
VolumeMesh run_tetgen_isolated(const Context& ctx, const TetgenOptions& options,
                               std::vector<int>* point_node) {
  const std::string program = mesher_executable();
  const ChildOutcome child =
      run_program(program, {std::to_string(::getpid())},
                  serialise_input(ctx.plc, options, point_node != nullptr), options.cancel);
  if (child.cancelled) throw Cancelled();
  if (!child.started) {
    fail(ctx, "the mesher program could not be started (" + child.error +
                  "); it is built as sharpey-mesher beside the libraries; set SHARPEY_MESHER to "
                  "its path");
  }
  if (child.signal != 0) {
    fail(ctx, "TetGen crashed (" + signal_name(child.signal) +
                  "); TetGen does this when it runs out of memory part-way or on nearly "
                  "degenerate geometry; close other programs, use a coarser mesh preset, or "
                  "change the geometry slightly");
  }
  const std::string& report = child.output;
  if (child.exit_code == 0 && !report.empty() && report[0] == kErrorReport) {
    throw MeshError(report.substr(1));
  }
  VolumeMesh mesh;
  mesh.nodes_per_element = 4;
  mesh.nodes_per_face = 3;
  std::vector<int> nodes_of_points;
  size_t pos = 1;
  const bool ok =
      child.exit_code == 0 && !report.empty() && report[0] == kMeshReport &&
      read_vector(report, &pos, &mesh.nodes) && read_vector(report, &pos, &mesh.elements) &&
      read_vector(report, &pos, &mesh.element_region) && read_vector(report, &pos, &mesh.faces) &&
      read_vector(report, &pos, &mesh.face_marker) && read_vector(report, &pos, &nodes_of_points) &&
      pos == report.size() && mesh.elements.size() == 4 * mesh.element_region.size() &&
      mesh.faces.size() == 3 * mesh.face_marker.size();
  if (!ok) {
    fail(ctx, "the mesher process " + program + " ended without a complete result (exit code " +
                  std::to_string(child.exit_code) + ", " + std::to_string(report.size()) +
                  " bytes)");
  }
  if (point_node) *point_node = std::move(nodes_of_points);
  return mesh;
}

}  // namespace

namespace detail {

int run_mesher(int in_fd, int out_fd) {
  std::string input;
  char buffer[1 << 16];
  for (;;) {
    const ssize_t n = ::read(in_fd, buffer, sizeof buffer);
    if (n > 0) {
      input.append(buffer, static_cast<size_t>(n));
    } else if (n == 0) {
      break;
    } else if (errno != EINTR) {
      return 2;
    }
  }
  Plc plc;
  TetgenOptions options;
  bool want_point_node = false;
  if (!parse_input(input, &plc, &options, &want_point_node)) return 2;
  const Context ctx{plc, options.stage};
  return report_mesh(out_fd, ctx, options, want_point_node);
}

}  // namespace detail

VolumeMesh tetrahedralize(const Plc& plc, const TetgenOptions& options,
                          std::vector<int>* point_node) {
  check_options(options);
  const Context ctx{plc, options.stage};
  check_plc(ctx);
  VolumeMesh linear = run_tetgen_isolated(ctx, options, point_node);
  if (!options.second_order) return linear;
  return make_second_order(linear);
}

}  // namespace sharpey::mesh
