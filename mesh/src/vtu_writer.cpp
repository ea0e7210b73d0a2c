// .vtu writer: VTK XML UnstructuredGrid with one raw appended data block, written atomically.
#include "sharpey/mesh/vtu_writer.h"

#include <algorithm>
#include <atomic>
#include <cerrno>
#include <cstdint>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <random>
#include <sstream>
#include <string>
#include <utility>
#include <vector>

#include "sharpey/error.h"

namespace sharpey::mesh {
namespace {

// One DataArray of the file: its XML attributes and its bytes in the appended block.
struct DataArray {
  std::string type;  // VTK type name: Float64, Int64, Int32, UInt8
  std::string name;  // empty for the Points array
  int n_components = 1;
  std::vector<char> bytes;
};

template <typename T, typename S>
std::vector<char> to_bytes(const std::vector<S>& values) {
  std::vector<char> b(values.size() * sizeof(T));
  for (size_t i = 0; i < values.size(); ++i) {
    const T v = static_cast<T>(values[i]);
    std::memcpy(b.data() + i * sizeof(T), &v, sizeof(T));
  }
  return b;
}

std::string xml_escape(const std::string& s) {
  std::string out;
  for (char c : s) {
    switch (c) {
      case '&':
        out += "&amp;";
        break;
      case '<':
        out += "&lt;";
        break;
      case '>':
        out += "&gt;";
        break;
      case '"':
        out += "&quot;";
        break;
      default:
        out += c;
    }
  }
  return out;
}

bool little_endian() {
  const std::uint16_t probe = 1;
  unsigned char first = 0;
  std::memcpy(&first, &probe, 1);
  return first == 1;
}

// Writes `contents` to a temporary file next to `path`, then renames it over `path`.
template <typename WriteFn>
void write_atomically(const std::string& path, WriteFn&& write_contents) {
  namespace fs = std::filesystem;
  static std::atomic<unsigned> counter{0};
  std::random_device rd;
  const fs::path target(path);
  fs::path tmp = target;
  tmp += ".tmp" + std::to_string(rd() % 1000000u) + "-" + std::to_string(counter++);
  {
    std::ofstream out(tmp, std::ios::binary | std::ios::trunc);
    if (!out) {
      throw Error("cannot write \"" + path + "\": creating \"" + tmp.string() + "\" failed (" +
                  std::strerror(errno) + "); check that the folder exists and is writable");
    }
    try {
      write_contents(out);
      out.flush();
    } catch (...) {
      out.close();
      std::error_code ignored;
      fs::remove(tmp, ignored);
      throw;
    }
    out.close();
    if (!out) {
      std::error_code ignored;
      fs::remove(tmp, ignored);
      throw Error("cannot write \"" + path +
                  "\": writing failed (disk full or the folder is not "
                  "writable)");
    }
  }
  std::error_code ec;
  fs::rename(tmp, target, ec);
  if (ec) {
    std::error_code ignored;
    fs::remove(tmp, ignored);
    throw Error("cannot write \"" + path + "\": renaming the temporary file failed (" +
                ec.message() + ")");
  }
}

std::string data_array_xml(const DataArray& a, std::uint64_t offset) {
  std::ostringstream s;
  s << "<DataArray type=\"" << a.type << "\"";
  if (!a.name.empty()) s << " Name=\"" << xml_escape(a.name) << "\"";
  if (a.n_components != 1) s << " NumberOfComponents=\"" << a.n_components << "\"";
  s << " format=\"appended\" offset=\"" << offset << "\"/>\n";
  return s.str();
}

// Sections of a piece, in the order VTK writes them.
struct Piece {
  std::int64_t n_points = 0, n_cells = 0;
  std::vector<DataArray> point_data, cell_data;
  DataArray points, connectivity, offsets, types;
};

void write_piece(const std::string& path, const Piece& p) {
  write_atomically(path, [&p](std::ofstream& out) {
    std::uint64_t offset = 0;
    std::ostringstream xml;
    auto put = [&](const DataArray& a, const char* indent) {
      xml << indent << data_array_xml(a, offset);
      offset += sizeof(std::uint64_t) + a.bytes.size();
    };
    xml << "<?xml version=\"1.0\"?>\n"
        << "<VTKFile type=\"UnstructuredGrid\" version=\"1.0\" byte_order=\""
        << (little_endian() ? "LittleEndian" : "BigEndian") << "\" header_type=\"UInt64\">\n"
        << "  <UnstructuredGrid>\n"
        << "    <Piece NumberOfPoints=\"" << p.n_points << "\" NumberOfCells=\"" << p.n_cells
        << "\">\n";
    xml << "      <PointData>\n";
    for (const auto& a : p.point_data) put(a, "        ");
    xml << "      </PointData>\n      <CellData>\n";
    for (const auto& a : p.cell_data) put(a, "        ");
    xml << "      </CellData>\n      <Points>\n";
    put(p.points, "        ");
    xml << "      </Points>\n      <Cells>\n";
    put(p.connectivity, "        ");
    put(p.offsets, "        ");
    put(p.types, "        ");
    xml << "      </Cells>\n    </Piece>\n  </UnstructuredGrid>\n  <AppendedData "
           "encoding=\"raw\">\n   _";
    out << xml.str();
    auto block = [&out](const DataArray& a) {
      const std::uint64_t n = a.bytes.size();
      out.write(reinterpret_cast<const char*>(&n), sizeof(n));
      out.write(a.bytes.data(), static_cast<std::streamsize>(a.bytes.size()));
    };
    for (const auto& a : p.point_data) block(a);
    for (const auto& a : p.cell_data) block(a);
    block(p.points);
    block(p.connectivity);
    block(p.offsets);
    block(p.types);
    out << "\n  </AppendedData>\n</VTKFile>\n";
  });
}

void check_name(const std::string& name, const std::vector<std::string>& taken) {
  if (name.empty()) throw InputError("(unnamed array)", "a .vtu data array needs a non-empty name");
  for (const auto& t : taken) {
    if (t == name) {
      throw InputError(name, "the .vtu data array name \"" + name +
                                 "\" is used twice; give each "
                                 "array its own name");
    }
  }
}

// Adds the extra arrays: point arrays reduced through `point_of` (new point -> mesh node),
// cell arrays checked against n_cells.
void add_extra(Piece& piece, const VtuArrays& extra, const std::vector<int>* point_of,
               int n_mesh_nodes, const std::string& reserved_cell_name) {
  std::vector<std::string> taken;
  for (const auto& a : extra.point_arrays) {
    check_name(a.name, taken);
    taken.push_back(a.name);
    if (a.n_components < 1 || a.values.size() != static_cast<size_t>(n_mesh_nodes) *
                                                     static_cast<size_t>(a.n_components)) {
      throw InputError(a.name, "point array \"" + a.name + "\" has " +
                                   std::to_string(a.values.size()) + " values with " +
                                   std::to_string(a.n_components) + " components; the mesh has " +
                                   std::to_string(n_mesh_nodes) +
                                   " nodes, so n_nodes * n_components values are needed");
    }
    DataArray d{"Float64", a.name, a.n_components, {}};
    if (point_of == nullptr) {
      d.bytes = to_bytes<double>(a.values);
    } else {
      std::vector<double> reduced;
      reduced.reserve(point_of->size() * static_cast<size_t>(a.n_components));
      for (int v : *point_of) {
        for (int c = 0; c < a.n_components; ++c) {
          reduced.push_back(a.values[static_cast<size_t>(v) * static_cast<size_t>(a.n_components) +
                                     static_cast<size_t>(c)]);
        }
      }
      d.bytes = to_bytes<double>(reduced);
    }
    piece.point_data.push_back(std::move(d));
  }
  taken = {reserved_cell_name};
  for (const auto& a : extra.cell_arrays) {
    check_name(a.name, taken);
    taken.push_back(a.name);
    if (a.values.size() != static_cast<size_t>(piece.n_cells)) {
      throw InputError(a.name, "cell array \"" + a.name + "\" has " +
                                   std::to_string(a.values.size()) + " values; one per cell (" +
                                   std::to_string(piece.n_cells) + ") is needed");
    }
    piece.cell_data.push_back({"Float64", a.name, 1, to_bytes<double>(a.values)});
  }
}

std::vector<char> point_bytes(const std::vector<Eigen::Vector3d>& nodes,
                              const std::vector<int>* subset) {
  std::vector<double> xyz;
  const size_t n = subset ? subset->size() : nodes.size();
  xyz.reserve(3 * n);
  for (size_t i = 0; i < n; ++i) {
    const Eigen::Vector3d& x = nodes[subset ? static_cast<size_t>((*subset)[i]) : i];
    xyz.insert(xyz.end(), {x.x(), x.y(), x.z()});
  }
  return to_bytes<double>(xyz);
}

void check_connectivity(const VolumeMesh& m, const std::string& path) {
  const bool elements_ok =
      (m.nodes_per_element == 4 || m.nodes_per_element == 10) &&
      m.elements.size() == m.element_region.size() * static_cast<size_t>(m.nodes_per_element);
  const bool faces_ok =
      (m.nodes_per_face == 3 || m.nodes_per_face == 6) &&
      m.faces.size() == m.face_marker.size() * static_cast<size_t>(m.nodes_per_face);
  const int n = m.n_nodes();
  auto bad = [n](int v) { return v < 0 || v >= n; };
  if (!elements_ok || !faces_ok || std::any_of(m.elements.begin(), m.elements.end(), bad) ||
      std::any_of(m.faces.begin(), m.faces.end(), bad)) {
    throw MeshError("writing \"" + path +
                    "\": the mesh connectivity is malformed (node counts per "
                    "cell, array lengths or node indices)");
  }
}

}  // namespace

void write_vtu(const std::string& path, const VolumeMesh& mesh, const VtuArrays& extra) {
  check_connectivity(mesh, path);
  Piece p;
  p.n_points = mesh.n_nodes();
  p.n_cells = mesh.n_elements();
  const int k = mesh.nodes_per_element;
  p.cell_data.push_back({"Int32", "region", 1, to_bytes<std::int32_t>(mesh.element_region)});
  add_extra(p, extra, nullptr, mesh.n_nodes(), "region");
  p.points = {"Float64", "Points", 3, point_bytes(mesh.nodes, nullptr)};
  p.connectivity = {"Int64", "connectivity", 1, to_bytes<std::int64_t>(mesh.elements)};
  std::vector<std::int64_t> offsets(static_cast<size_t>(p.n_cells));
  for (size_t e = 0; e < offsets.size(); ++e)
    offsets[e] = static_cast<std::int64_t>((e + 1) * static_cast<size_t>(k));
  p.offsets = {"Int64", "offsets", 1, to_bytes<std::int64_t>(offsets)};
  p.types = {
      "UInt8", "types", 1,
      std::vector<char>(static_cast<size_t>(p.n_cells), static_cast<char>(k == 10 ? 24 : 10))};
  write_piece(path, p);
}

void write_boundary_vtu(const std::string& path, const VolumeMesh& mesh, const VtuArrays& extra) {
  check_connectivity(mesh, path);
  std::vector<int> new_index(static_cast<size_t>(mesh.n_nodes()), -1);
  for (int v : mesh.faces) new_index[static_cast<size_t>(v)] = 0;
  std::vector<int> point_of;
  for (int v = 0; v < mesh.n_nodes(); ++v) {
    if (new_index[static_cast<size_t>(v)] < 0) continue;
    new_index[static_cast<size_t>(v)] = static_cast<int>(point_of.size());
    point_of.push_back(v);
  }
  const int k = mesh.nodes_per_face;
  Piece p;
  p.n_points = static_cast<std::int64_t>(point_of.size());
  p.n_cells = mesh.n_faces();
  p.cell_data.push_back({"Int32", "marker", 1, to_bytes<std::int32_t>(mesh.face_marker)});
  add_extra(p, extra, &point_of, mesh.n_nodes(), "marker");
  p.points = {"Float64", "Points", 3, point_bytes(mesh.nodes, &point_of)};
  std::vector<std::int64_t> connectivity;
  connectivity.reserve(mesh.faces.size());
  for (int v : mesh.faces) connectivity.push_back(new_index[static_cast<size_t>(v)]);
  p.connectivity = {"Int64", "connectivity", 1, to_bytes<std::int64_t>(connectivity)};
  std::vector<std::int64_t> offsets(static_cast<size_t>(p.n_cells));
  for (size_t f = 0; f < offsets.size(); ++f)
    offsets[f] = static_cast<std::int64_t>((f + 1) * static_cast<size_t>(k));
  p.offsets = {"Int64", "offsets", 1, to_bytes<std::int64_t>(offsets)};
  p.types = {"UInt8", "types", 1,
             std::vector<char>(static_cast<size_t>(p.n_cells), static_cast<char>(k == 6 ? 22 : 5))};
  write_piece(path, p);
}

VolumeMesh extract_region(const VolumeMesh& mesh, int region, std::vector<int>* node_map) {
  check_connectivity(mesh, "(region extraction)");
  const int k = mesh.nodes_per_element;
  std::vector<int> new_index(static_cast<size_t>(mesh.n_nodes()), -1);
  for (int e = 0; e < mesh.n_elements(); ++e) {
    if (mesh.element_region[static_cast<size_t>(e)] != region) continue;
    for (int i = 0; i < k; ++i) new_index[static_cast<size_t>(mesh.element(e)[i])] = 0;
  }
  VolumeMesh sub;
  sub.nodes_per_element = k;
  sub.nodes_per_face = mesh.nodes_per_face;
  std::vector<int> map;
  for (int v = 0; v < mesh.n_nodes(); ++v) {
    if (new_index[static_cast<size_t>(v)] < 0) continue;
    new_index[static_cast<size_t>(v)] = static_cast<int>(map.size());
    map.push_back(v);
    sub.nodes.push_back(mesh.nodes[static_cast<size_t>(v)]);
  }
  for (int e = 0; e < mesh.n_elements(); ++e) {
    if (mesh.element_region[static_cast<size_t>(e)] != region) continue;
    for (int i = 0; i < k; ++i)
      sub.elements.push_back(new_index[static_cast<size_t>(mesh.element(e)[i])]);
    sub.element_region.push_back(region);
  }
  const int kf = mesh.nodes_per_face;
  for (int f = 0; f < mesh.n_faces(); ++f) {
    const int* fa = mesh.face(f);
    bool inside = true;
    for (int i = 0; i < kf && inside; ++i) inside = new_index[static_cast<size_t>(fa[i])] >= 0;
    if (!inside) continue;
    for (int i = 0; i < kf; ++i) sub.faces.push_back(new_index[static_cast<size_t>(fa[i])]);
    sub.face_marker.push_back(mesh.face_marker[static_cast<size_t>(f)]);
  }
  if (node_map) *node_map = std::move(map);
  return sub;
}

}  // namespace sharpey::mesh
