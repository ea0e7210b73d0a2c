#include "sharpey/analysis/solution_cache.h"

#include <algorithm>
#include <chrono>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <iomanip>
#include <limits>
#include <sstream>
#include <system_error>
#include <type_traits>
#include <vector>

#include "sharpey/analysis/write_file_atomic.h"
#include "sharpey/error.h"

#ifndef SHARPEY_VERSION
#define SHARPEY_VERSION "unknown"
#endif

namespace sharpey::analysis {

namespace fs = std::filesystem;

namespace {

constexpr char kMagic[] = "SHARPEY-SOLVED\r\n";
constexpr size_t kMagicBytes = 16;
static_assert(sizeof(kMagic) == kMagicBytes + 1, "16 magic bytes and the terminating zero");
constexpr std::uint32_t kByteOrder = 0x01020304u;
constexpr const char* kEntrySuffix = ".solved";

// 64-bit hash over 8-byte words (the tail zero-padded), for the entry checksum and file names.
// Each step (xor, then multiplication by an odd constant) is a bijection of the state, so any
// change to a single word changes the result; the final mix spreads it over every bit.
std::uint64_t hash64(const char* data, size_t n) {
  std::uint64_t h = 0x6a09e667f3bcc909ull ^ (n * 0x9e3779b97f4a7c15ull);
  size_t i = 0;
  for (; i + 8 <= n; i += 8) {
    std::uint64_t w;
    std::memcpy(&w, data + i, 8);
    h = (h ^ w) * 0x100000001b3ull;
    h ^= h >> 29;
  }
  if (i < n) {
    std::uint64_t w = 0;
    std::memcpy(&w, data + i, n - i);
    h = (h ^ w) * 0x100000001b3ull;
  }
  h ^= h >> 33;
  h *= 0xff51afd7ed558ccdull;
  h ^= h >> 33;
  h *= 0xc4ceb9fe1a85ec53ull;
  h ^= h >> 33;
  return h;
}

// ---- writing ----------------------------------------------------------------------------------

class Writer {
 public:
  template <class T>
  void pod(const T& v) {
    static_assert(std::is_trivially_copyable_v<T>);
    out_.append(reinterpret_cast<const char*>(&v), sizeof(T));
  }
  void u64(std::uint64_t v) { pod(v); }
  void i32(std::int32_t v) { pod(v); }
  void f64(double v) { pod(v); }
  void vec3(const Eigen::Vector3d& v) {
    for (int i = 0; i < 3; ++i) f64(v(i));
  }
  void text(const std::string& s) {
    u64(s.size());
    out_.append(s);
  }
  void doubles(const double* p, size_t n) {
    u64(n);
    out_.append(reinterpret_cast<const char*>(p), n * sizeof(double));
  }
  void ints(const std::vector<int>& v) {
    u64(v.size());
    for (int x : v) i32(x);
  }
  std::string& bytes() { return out_; }

 private:
  std::string out_;
};

// ---- reading ----------------------------------------------------------------------------------

[[noreturn]] void bad(const std::string& what) {
  throw Error("the saved solution cannot be used: " + what +
              "; it is ignored and the bone level is solved again");
}

class Reader {
 public:
  explicit Reader(std::string_view bytes) : p_(bytes.data()), end_(bytes.data() + bytes.size()) {}
  template <class T>
  T pod() {
    static_assert(std::is_trivially_copyable_v<T>);
    need(sizeof(T));
    T v;
    std::memcpy(&v, p_, sizeof(T));
    p_ += sizeof(T);
    return v;
  }
  std::uint64_t u64() { return pod<std::uint64_t>(); }
  std::int32_t i32() { return pod<std::int32_t>(); }
  double f64() { return pod<double>(); }
  Eigen::Vector3d vec3() {
    Eigen::Vector3d v;
    for (int i = 0; i < 3; ++i) v(i) = f64();
    return v;
  }
  // A count of items of `item_bytes` each that must fit in what is left.
  size_t count(size_t item_bytes) {
    const std::uint64_t n = u64();
    if (item_bytes > 0 && n > remaining() / item_bytes) bad("it is truncated (a count too large)");
    return static_cast<size_t>(n);
  }
  std::string text() {
    const size_t n = count(1);
    std::string s(p_, n);
    p_ += n;
    return s;
  }
  void doubles(double* out, size_t expected) {
    const size_t n = count(sizeof(double));
    if (n != expected)
      bad("a table has " + std::to_string(n) + " values, not " + std::to_string(expected));
    copy(out, n * sizeof(double));
  }
  std::vector<int> ints() {
    std::vector<int> v(count(sizeof(std::int32_t)));
    copy(v.data(), v.size() * sizeof(std::int32_t));
    return v;
  }
  void copy(void* out, size_t n) {
    need(n);
    std::memcpy(out, p_, n);
    p_ += n;
  }
  size_t remaining() const { return static_cast<size_t>(end_ - p_); }
  const char* position() const { return p_; }

 private:
  void need(size_t n) const {
    if (remaining() < n) bad("it is truncated");
  }
  const char* p_;
  const char* end_;
};

// ---- the parts of a solution ------------------------------------------------------------------

// Every field of ModelGeometry, in declaration order.
template <class Visit>
void geometry_fields(mesh::ModelGeometry& g, Visit&& visit) {
  for (double* d : {&g.cej_z_mm, &g.crest_z_mm, &g.defect_bottom_z_mm, &g.apex_z_mm,
                    &g.root_length_mm, &g.embedded_length_mm})
    visit(*d);
  for (Eigen::Vector3d* v : {&g.crown_tip, &g.apex, &g.bracket_center, &g.bracket_normal})
    for (int i = 0; i < 3; ++i) visit((*v)(i));
  for (double* d :
       {&g.root_area_mm2, &g.attachment_area_mm2, &g.exposed_root_area_mm2, &g.tooth_volume_mm3,
        &g.pdl_volume_mm3, &g.bone_volume_mm3, &g.cortical_volume_mm3, &g.cancellous_volume_mm3})
    visit(*d);
  for (Eigen::Vector3d* v : {&g.bone_min, &g.bone_max})
    for (int i = 0; i < 3; ++i) visit((*v)(i));
}

void write_statistics(Writer& w, const fem::SolverStatistics& s) {
  w.i32(s.n_dofs);
  w.pod(s.n_nonzeros);
  for (double d : {s.assembly_s, s.analyse_s, s.factorise_s, s.factorisation_gflop, s.last_solve_s,
                   s.last_relative_residual})
    w.f64(d);
  w.text(s.ordering);
  w.i32(s.n_constrained_dofs);
  w.i32(s.n_unused_nodes);
  w.pod(s.factor_nonzeros);
  w.f64(s.factor_mb);
  w.f64(s.min_pivot_ratio);
  w.text(s.requested_ordering);
  w.i32(s.n_threads_assembly);
  w.i32(s.n_solves);
}

fem::SolverStatistics read_statistics(Reader& r) {
  fem::SolverStatistics s;
  s.n_dofs = r.i32();
  s.n_nonzeros = r.pod<long long>();
  for (double* d : {&s.assembly_s, &s.analyse_s, &s.factorise_s, &s.factorisation_gflop,
                    &s.last_solve_s, &s.last_relative_residual})
    *d = r.f64();
  s.ordering = r.text();
  s.n_constrained_dofs = r.i32();
  s.n_unused_nodes = r.i32();
  s.factor_nonzeros = r.pod<long long>();
  s.factor_mb = r.f64();
  s.min_pivot_ratio = r.f64();
  s.requested_ordering = r.text();
  s.n_threads_assembly = r.i32();
  s.n_solves = r.i32();
  return s;
}

void write_mesh(Writer& w, const mesh::VolumeMesh& m) {
  std::vector<double> xyz;
  xyz.reserve(3 * m.nodes.size());
  for (const Eigen::Vector3d& x : m.nodes) xyz.insert(xyz.end(), {x.x(), x.y(), x.z()});
  w.doubles(xyz.data(), xyz.size());
  w.i32(m.nodes_per_element);
  w.ints(m.elements);
  w.ints(m.element_region);
  w.i32(m.nodes_per_face);
  w.ints(m.faces);
  w.ints(m.face_marker);
}

bool all_below(const std::vector<int>& ids, int n) {
  return std::all_of(ids.begin(), ids.end(), [n](int i) { return i >= 0 && i < n; });
}

mesh::VolumeMesh read_mesh(Reader& r) {
  mesh::VolumeMesh m;
  const size_t n_xyz = r.count(sizeof(double));
  if (n_xyz % 3 != 0) bad("the node table is damaged");
  std::vector<double> xyz(n_xyz);
  r.copy(xyz.data(), n_xyz * sizeof(double));
  m.nodes.resize(n_xyz / 3);
  for (size_t i = 0; i < m.nodes.size(); ++i)
    m.nodes[i] = Eigen::Vector3d(xyz[3 * i], xyz[3 * i + 1], xyz[3 * i + 2]);
  m.nodes_per_element = r.i32();
  m.elements = r.ints();
  m.element_region = r.ints();
  m.nodes_per_face = r.i32();
  m.faces = r.ints();
  m.face_marker = r.ints();
  if ((m.nodes_per_element != 4 && m.nodes_per_element != 10) ||
      (m.nodes_per_face != 3 && m.nodes_per_face != 6) ||
      m.elements.size() != m.element_region.size() * static_cast<size_t>(m.nodes_per_element) ||
      m.faces.size() != m.face_marker.size() * static_cast<size_t>(m.nodes_per_face) ||
      !all_below(m.elements, m.n_nodes()) || !all_below(m.faces, m.n_nodes())) {
    bad("its mesh is inconsistent");
  }
  return m;
}

void write_field(Writer& w, const fem::RegionField& f) {
  w.i32(f.region);
  w.ints(f.nodes);
  w.doubles(f.stress_mpa.data(), static_cast<size_t>(f.stress_mpa.size()));
  w.doubles(f.strain.data(), static_cast<size_t>(f.strain.size()));
}

fem::RegionField read_field(Reader& r, int n_nodes) {
  fem::RegionField f;
  f.region = r.i32();
  f.nodes = r.ints();
  if (!all_below(f.nodes, n_nodes)) bad("a PDL field names nodes the mesh does not have");
  const auto n = static_cast<Eigen::Index>(f.nodes.size());
  f.stress_mpa.resize(6, n);
  r.doubles(f.stress_mpa.data(), static_cast<size_t>(f.stress_mpa.size()));
  f.strain.resize(6, n);
  r.doubles(f.strain.data(), static_cast<size_t>(f.strain.size()));
  return f;
}

void key_number(std::ostringstream& s, const char* name, double v) {
  s << name << '=' << std::hexfloat << v << std::defaultfloat << '\n';
}

}  // namespace

std::string solution_cache_key(const CaseSpec& spec, int scenario_index,
                               const ScenarioOptions& options) {
  if (scenario_index < 0 || scenario_index >= static_cast<int>(spec.scenarios.size())) {
    throw InputError("scenarios", "scenario index " + std::to_string(scenario_index) +
                                      " is out of range: the case has " +
                                      std::to_string(spec.scenarios.size()) + " scenario(s)");
  }
  const mesh::ModelSpec& m = spec.model;
  const mesh::BoneLoss& loss = spec.scenarios[static_cast<size_t>(scenario_index)].loss;
  std::ostringstream s;
  s << "sharpey solved scenario\n"
    << "program=" << SHARPEY_VERSION << '\n'
    << "numerics=" << kSolutionNumericsRevision << '\n'
    << "file=" << kSolutionFileVersion << '\n'
    << "tooth=" << mesh::to_string(m.tooth.type) << '\n'
    << "ideal_root=" << static_cast<int>(m.tooth.ideal_root) << '\n';
  const mesh::ToothDimensions& d = m.tooth.dimensions;
  key_number(s, "crown_length", d.crown_length_mm);
  key_number(s, "root_length", d.root_length_mm);
  key_number(s, "crown_md", d.crown_mesiodistal_mm);
  key_number(s, "cervix_md", d.cervix_mesiodistal_mm);
  key_number(s, "crown_ll", d.crown_labiolingual_mm);
  key_number(s, "cervix_ll", d.cervix_labiolingual_mm);
  key_number(s, "cej_curvature_mesial", d.cej_curvature_mesial_mm);
  key_number(s, "cej_curvature_distal", d.cej_curvature_distal_mm);
  key_number(s, "root_taper_fullness", d.root_taper_fullness);
  key_number(s, "ideal_radius", m.tooth.ideal_radius_mm);
  key_number(s, "ideal_length", m.tooth.ideal_length_mm);
  key_number(s, "pdl_crest", m.pdl.crest_width_mm);
  key_number(s, "pdl_mid", m.pdl.mid_width_mm);
  key_number(s, "pdl_apex", m.pdl.apex_width_mm);
  key_number(s, "crest_below_cej", m.bone.crest_below_cej_mm);
  key_number(s, "cortical_thickness", m.bone.cortical_thickness_mm);
  key_number(s, "labial_plate", m.bone.labial_plate_mm);
  key_number(s, "lingual_plate", m.bone.lingual_plate_mm);
  key_number(s, "interproximal_margin", m.bone.interproximal_margin_mm);
  key_number(s, "depth_below_apex", m.bone.depth_below_apex_mm);
  key_number(s, "loss_horizontal", loss.horizontal_mm);
  key_number(s, "defect_depth", loss.defect_depth_mm);
  s << "defect_surface=" << mesh::to_string(loss.defect_surface) << '\n';
  key_number(s, "defect_width", loss.defect_width_deg);
  key_number(s, "bracket_height", m.bracket.height_mm);
  key_number(s, "bracket_width", m.bracket.width_mm);
  key_number(s, "bracket_length", m.bracket.length_mm);
  s << "mesh_preset=" << mesh::to_string(m.sizing.preset) << '\n';
  key_number(s, "pdl_edge", m.sizing.pdl_edge_mm);
  key_number(s, "bone_edge", m.sizing.bone_edge_mm);
  s << "pdl_layers=" << m.sizing.pdl_layers << '\n'
    << "second_order=" << (m.sizing.second_order ? 1 : 0) << '\n';
  const std::pair<const char*, const fem::Material*> materials[] = {
      {"tooth", &spec.tooth_material},
      {"pdl", &spec.pdl_material},
      {"cortical", &spec.cortical_material},
      {"cancellous", &spec.cancellous_material}};
  for (const auto& [name, mat] : materials) {
    s << name << "_E=" << std::hexfloat << mat->young_modulus_mpa << " nu=" << mat->poisson_ratio
      << std::defaultfloat << '\n';
  }
  s << "root_map=" << options.root_map.n_angle << 'x' << options.root_map.n_depth << '\n';
  return s.str();
}

std::string write_solution(const ScenarioSolution& solution, const std::string& key) {
  Writer payload;
  mesh::ModelGeometry g = solution.model().geometry;
  geometry_fields(g, [&payload](double& v) { payload.f64(v); });
  write_mesh(payload, solution.model().mesh);
  write_statistics(payload, solution.solver_statistics());
  const fem::UnitLoadBasis& basis = solution.basis();
  payload.vec3(basis.reference_point());
  const Eigen::MatrixXd& u = basis.unit_displacements();
  payload.u64(static_cast<std::uint64_t>(u.rows()));
  payload.u64(static_cast<std::uint64_t>(u.cols()));
  payload.doubles(u.data(), static_cast<size_t>(u.size()));
  payload.u64(basis.unit_fields().size());
  for (const fem::RegionField& f : basis.unit_fields()) write_field(payload, f);

  Writer w;
  w.bytes().append(kMagic, kMagicBytes);
  w.pod(kSolutionFileVersion);
  w.pod(kByteOrder);
  w.text(key);
  w.text(payload.bytes());
  w.u64(hash64(w.bytes().data(), w.bytes().size()));
  return std::move(w.bytes());
}

std::unique_ptr<ScenarioSolution> read_solution(std::string_view bytes, const CaseSpec& spec,
                                                int scenario_index,
                                                const ScenarioOptions& options) {
  if (bytes.size() < kMagicBytes + 8 + 8 + 8 + 8 ||
      std::memcmp(bytes.data(), kMagic, kMagicBytes) != 0) {
    bad("it is not a saved Sharpey solution (no file header)");
  }
  std::uint64_t stored_sum;
  std::memcpy(&stored_sum, bytes.data() + bytes.size() - 8, 8);
  Reader r(bytes.substr(0, bytes.size() - 8));
  for (size_t i = 0; i < kMagicBytes; ++i) r.pod<char>();
  const auto version = r.pod<std::uint32_t>();
  const auto order = r.pod<std::uint32_t>();
  if (order != kByteOrder) bad("it was written on a computer of another byte order");
  if (version != kSolutionFileVersion) {
    bad("it has file version " + std::to_string(version) + ", this program reads version " +
        std::to_string(kSolutionFileVersion));
  }
  if (hash64(bytes.data(), bytes.size() - 8) != stored_sum)
    bad("its checksum does not match (the file is damaged or incomplete)");
  if (r.text() != solution_cache_key(spec, scenario_index, options))
    bad("it was solved for another model, mesh or program version");
  const size_t payload_bytes = r.count(1);
  if (payload_bytes != r.remaining()) bad("its length does not match its header");
  Reader p(std::string_view(r.position(), payload_bytes));

  mesh::ToothModel model;
  model.spec = spec.model;
  model.spec.loss = spec.scenarios[static_cast<size_t>(scenario_index)].loss;
  geometry_fields(model.geometry, [&p](double& v) { v = p.f64(); });
  model.mesh = read_mesh(p);
  fem::SolverStatistics statistics = read_statistics(p);
  const Eigen::Vector3d reference = p.vec3();
  const std::uint64_t rows = p.u64(), cols = p.u64();
  if (rows != 3 * static_cast<std::uint64_t>(model.mesh.n_nodes()) || cols != 6)
    bad("its unit displacements do not fit the mesh");
  Eigen::MatrixXd u(static_cast<Eigen::Index>(rows), static_cast<Eigen::Index>(cols));
  p.doubles(u.data(), static_cast<size_t>(u.size()));
  const size_t n_fields = p.count(1);
  if (n_fields != 6) bad("it has " + std::to_string(n_fields) + " unit load fields, not six");
  std::vector<fem::RegionField> fields;
  for (size_t i = 0; i < n_fields; ++i) fields.push_back(read_field(p, model.mesh.n_nodes()));
  if (p.remaining() != 0) bad("it has unexpected bytes after the solution");

  std::unique_ptr<fem::UnitLoadBasis> basis;
  try {
    basis = std::make_unique<fem::UnitLoadBasis>(reference, std::move(u), std::move(fields));
  } catch (const InputError& e) {
    bad(e.what());
  }
  return std::make_unique<ScenarioSolution>(spec, scenario_index, std::move(model),
                                            std::move(basis), std::move(statistics), options);
}

// ---- the folder -------------------------------------------------------------------------------

SolutionCache::SolutionCache(std::string folder, std::uint64_t max_bytes)
    : folder_(std::move(folder)), max_bytes_(max_bytes) {}

std::string SolutionCache::entry_path(const std::string& key) const {
  std::ostringstream name;
  name << std::hex << std::setw(16) << std::setfill('0') << hash64(key.data(), key.size())
       << kEntrySuffix;
  return (fs::path(folder_) / name.str()).string();
}

std::unique_ptr<ScenarioSolution> SolutionCache::load(const CaseSpec& spec, int scenario_index,
                                                      std::string* why,
                                                      const ScenarioOptions& options) const {
  const auto say = [why](const std::string& text) {
    if (why) *why = text;
  };
  std::string key;
  try {
    key = solution_cache_key(spec, scenario_index, options);
  } catch (const Error& e) {
    say(e.what());
    return nullptr;
  }
  const std::string path = entry_path(key);
  std::string bytes;
  {
    std::ifstream in(path, std::ios::binary);
    if (!in) {
      say(kSolutionNotSaved);
      return nullptr;
    }
    std::error_code ec;
    const auto size = fs::file_size(path, ec);
    if (ec) {
      say("cannot read its size: " + ec.message());
      return nullptr;
    }
    try {
      bytes.resize(static_cast<size_t>(size));
    } catch (const std::bad_alloc&) {
      say("not enough memory to read it");
      return nullptr;
    }
    in.read(bytes.data(), static_cast<std::streamsize>(bytes.size()));
    if (in.gcount() != static_cast<std::streamsize>(bytes.size())) {
      say("it could not be read whole");
      return nullptr;
    }
  }
  try {
    auto solution = read_solution(bytes, spec, scenario_index, options);
    std::error_code ec;  // renew its age: it was used now
    fs::last_write_time(path, fs::file_time_type::clock::now(), ec);
    say({});
    return solution;
  } catch (const std::bad_alloc&) {
    say("not enough memory to read it");
  } catch (const std::exception& e) {
    say(e.what());
    std::error_code ec;  // damaged or foreign: never read again
    fs::remove(path, ec);
  }
  return nullptr;
}

bool SolutionCache::store(const CaseSpec& spec, int scenario_index,
                          const ScenarioSolution& solution, std::string* why,
                          const ScenarioOptions& options) const {
  try {
    const std::string key = solution_cache_key(spec, scenario_index, options);
    return store_entry(key, write_solution(solution, key), why);
  } catch (const std::bad_alloc&) {
    if (why) *why = "not enough memory to save the solution";
  } catch (const std::exception& e) {
    if (why) *why = e.what();
  }
  return false;
}

bool SolutionCache::store_entry(const std::string& key, const std::string& bytes,
                                std::string* why) const {
  try {
    std::error_code ec;
    fs::create_directories(folder_, ec);
    write_file_atomic(entry_path(key), bytes);
  } catch (const std::exception& e) {
    if (why) *why = e.what();
    return false;
  }
  trim();
  return true;
}

namespace {

struct EntryFile {
  fs::path path;
  std::uint64_t bytes = 0;
  fs::file_time_type used;
};

bool is_entry(const fs::path& p) {
  const std::string name = p.filename().string();
  return name.size() > std::strlen(kEntrySuffix) && name[0] != '.' && p.extension() == kEntrySuffix;
}

bool is_temporary(const fs::path& p) {
  const std::string name = p.filename().string();
  return name[0] == '.' && name.find(std::string(kEntrySuffix) + ".tmp-") != std::string::npos;
}

std::vector<EntryFile> list_entries(const std::string& folder) {
  std::vector<EntryFile> out;
  std::error_code ec;
  for (fs::directory_iterator it(folder, ec), end; !ec && it != end; it.increment(ec)) {
    std::error_code e2;
    if (!is_entry(it->path()) || !it->is_regular_file(e2)) continue;
    EntryFile f;
    f.path = it->path();
    f.bytes = it->file_size(e2);
    if (e2) continue;  // removed by another program meanwhile
    f.used = it->last_write_time(e2);
    if (e2) continue;
    out.push_back(std::move(f));
  }
  return out;
}

}  // namespace

void SolutionCache::trim() const {
  std::error_code ec;
  // Temporary files of programs killed while writing: a write takes seconds, a day is safe.
  const auto day_ago = fs::file_time_type::clock::now() - std::chrono::hours(24);
  for (fs::directory_iterator it(folder_, ec), end; !ec && it != end; it.increment(ec)) {
    std::error_code e2;
    if (is_temporary(it->path()) && it->last_write_time(e2) < day_ago && !e2)
      fs::remove(it->path(), e2);
  }
  std::vector<EntryFile> entries = list_entries(folder_);
  std::uint64_t total = 0;
  for (const EntryFile& f : entries) total += f.bytes;
  if (total <= max_bytes_) return;
  std::sort(entries.begin(), entries.end(),
            [](const EntryFile& a, const EntryFile& b) { return a.used < b.used; });
  for (const EntryFile& f : entries) {
    if (total <= max_bytes_) break;
    std::error_code e2;
    if (fs::remove(f.path, e2) || !e2) total -= std::min(total, f.bytes);
  }
}

std::uint64_t SolutionCache::total_bytes() const {
  std::uint64_t total = 0;
  for (const EntryFile& f : list_entries(folder_)) total += f.bytes;
  return total;
}

int SolutionCache::entry_count() const { return static_cast<int>(list_entries(folder_).size()); }

}  // namespace sharpey::analysis
