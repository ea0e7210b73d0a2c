// Reading a case file: JSON text -> CaseSpec. Every object is read through Fields, which knows
// the keys the schema allows at that place, so a misspelt key is reported with the closest known
// one. Range checks follow in validate_case (case_spec_validate.cpp).
#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <algorithm>
#include <cerrno>
#include <cmath>
#include <cstring>
#include <nlohmann/json.hpp>
#include <set>
#include <sstream>
#include <string>
#include <vector>

#include "case_spec_keys.h"
#include "sharpey/analysis/case_spec.h"
#include "sharpey/core/constants.h"
#include "sharpey/error.h"
#include "sharpey/mesh/tooth_surface.h"

namespace sharpey::analysis {

namespace {

using Json = nlohmann::ordered_json;

std::string shown(const Json& v) {
  std::string s = v.dump();
  if (s.size() > 60) s = s.substr(0, 57) + "...";
  return s;
}

[[noreturn]] void type_error(const std::string& path, const std::string& expected, const Json& v) {
  throw InputError(path, path + " = " + shown(v) + " is " + std::string(v.type_name()) +
                             ", expected " + expected + "; fix the value's type");
}

size_t edit_distance(const std::string& a, const std::string& b) {
  std::vector<size_t> row(b.size() + 1);
  for (size_t j = 0; j <= b.size(); ++j) row[j] = j;
  for (size_t i = 1; i <= a.size(); ++i) {
    size_t diagonal = row[0];
    row[0] = i;
    for (size_t j = 1; j <= b.size(); ++j) {
      const size_t up = row[j];
      const size_t cost = a[i - 1] == b[j - 1] ? 0 : 1;
      row[j] = std::min({row[j] + 1, row[j - 1] + 1, diagonal + cost});
      diagonal = up;
    }
  }
  return row[b.size()];
}

// Reads one JSON object at `path`; remembers every key the schema asks for.
class Fields {
 public:
  Fields(const Json& object, std::string path) : object_(object), path_(std::move(path)) {
    if (!object_.is_object())
      type_error(path_.empty() ? "(top level)" : path_, "an object", object_);
  }

  std::string path_of(const std::string& key) const {
    return path_.empty() ? key : path_ + "." + key;
  }
  const std::string& path() const { return path_; }

  // Registers `key` as known; null when absent.
  const Json* find(const std::string& key) {
    known_.push_back(key);
    const auto it = object_.find(key);
    return it == object_.end() ? nullptr : &*it;
  }
  bool has(const std::string& key) const { return object_.contains(key); }

  double number(const std::string& key, double fallback) {
    const Json* v = find(key);
    if (!v) return fallback;
    if (!v->is_number()) type_error(path_of(key), "a number", *v);
    return v->get<double>();
  }
  double required_number(const std::string& key, const std::string& example) {
    if (!has(key)) missing(key, example);
    return number(key, 0);
  }
  int integer(const std::string& key, int fallback) {
    const Json* v = find(key);
    if (!v) return fallback;
    if (!v->is_number_integer()) type_error(path_of(key), "a whole number", *v);
    const auto value = v->get<long long>();
    if (value < -1000000 || value > 1000000) type_error(path_of(key), "a small whole number", *v);
    return static_cast<int>(value);
  }
  std::string string(const std::string& key, const std::string& fallback) {
    const Json* v = find(key);
    if (!v) return fallback;
    if (!v->is_string()) type_error(path_of(key), "a string", *v);
    return v->get<std::string>();
  }
  bool boolean(const std::string& key, bool fallback) {
    const Json* v = find(key);
    if (!v) return fallback;
    if (!v->is_boolean()) type_error(path_of(key), "true or false", *v);
    return v->get<bool>();
  }
  // The object at `key`, or an empty one when absent.
  Fields object(const std::string& key) {
    static const Json kEmpty = Json::object();
    const Json* v = find(key);
    return Fields(v ? *v : kEmpty, path_of(key));
  }

  [[noreturn]] void missing(const std::string& key, const std::string& example) const {
    throw InputError(path_of(key),
                     path_of(key) + " is missing; add it, e.g. \"" + key + "\": " + example);
  }

  // Throws for the first key the schema does not know here, suggesting the closest known key.
  void finish() const {
    for (auto it = object_.begin(); it != object_.end(); ++it) {
      const std::string& key = it.key();
      if (std::find(known_.begin(), known_.end(), key) != known_.end()) continue;
      std::string best;
      size_t best_distance = std::string::npos;
      for (const std::string& k : known_) {
        const size_t d = edit_distance(key, k);
        if (d < best_distance) best_distance = d, best = k;
      }
      std::ostringstream s;
      s << "unknown key " << path_of(key);
      if (!best.empty() && best_distance <= std::max<size_t>(3, best.size() / 3)) {
        s << "; did you mean \"" << best << "\"?";
      } else {
        std::vector<std::string> sorted(known_.begin(), known_.end());
        std::sort(sorted.begin(), sorted.end());
        sorted.erase(std::unique(sorted.begin(), sorted.end()), sorted.end());
        s << "; keys known " << (path_.empty() ? "at the top level" : "in " + path_) << ":";
        for (const std::string& k : sorted) s << ' ' << k;
      }
      s << " (see docs/case-format.md)";
      throw InputError(path_of(key), s.str());
    }
  }

 private:
  const Json& object_;
  std::string path_;
  std::vector<std::string> known_;
};

// Line and column (1-based) of byte offset `byte` (1-based, as nlohmann reports it).
std::pair<int, int> line_column(const std::string& text, size_t byte) {
  int line = 1, column = 1;
  const size_t end = std::min(text.size(), byte > 0 ? byte - 1 : 0);
  for (size_t i = 0; i < end; ++i) {
    if (text[i] == '\n') {
      ++line;
      column = 1;
    } else {
      ++column;
    }
  }
  return {line, column};
}

// Refuses text nested deeper than kMaxCaseNestingDepth before nlohmann sees it: the schema needs
// four levels, and printing a value nested 100 000 deep for a message overflows the stack.
void check_nesting(const std::string& text) {
  int depth = 0;
  bool in_string = false, escaped = false;
  for (size_t i = 0; i < text.size(); ++i) {
    const char c = text[i];
    if (in_string) {
      if (escaped)
        escaped = false;
      else if (c == '\\')
        escaped = true;
      else if (c == '"')
        in_string = false;
      continue;
    }
    if (c == '"') {
      in_string = true;
    } else if (c == '{' || c == '[') {
      if (++depth > kMaxCaseNestingDepth) {
        const auto [line, column] = line_column(text, i + 1);
        const std::string where =
            "line " + std::to_string(line) + ", column " + std::to_string(column);
        throw InputError(where, "brackets nested deeper than " +
                                    std::to_string(kMaxCaseNestingDepth) + " levels at " + where +
                                    "; a case file needs at most 5 levels of { } and [ ]; check "
                                    "for brackets that are opened but never closed");
      }
    } else if (c == '}' || c == ']') {
      --depth;
    }
  }
}

// The key path the parser is at ("load.magnitude", "scenarios[1].name"), followed through the
// parser's callback events so a value nlohmann rejects itself can be named.
class ParsePath {
 public:
  void on_event(Json::parse_event_t event, const Json& parsed) {
    switch (event) {
      case Json::parse_event_t::object_start:
        levels_.push_back({false, "", 0});
        break;
      case Json::parse_event_t::array_start:
        levels_.push_back({true, "", 0});
        break;
      case Json::parse_event_t::key:
        if (!levels_.empty()) levels_.back().key = parsed.get<std::string>();
        break;
      case Json::parse_event_t::object_end:
      case Json::parse_event_t::array_end:
        if (!levels_.empty()) levels_.pop_back();
        next_element();
        break;
      case Json::parse_event_t::value:
        next_element();
        break;
    }
  }
  std::string text() const {
    std::string path;
    for (const Level& l : levels_) {
      if (l.array)
        path += "[" + std::to_string(l.index) + "]";
      else if (!l.key.empty())
        path += (path.empty() ? "" : ".") + l.key;
    }
    return path.empty() ? "(top level)" : path;
  }

 private:
  struct Level {
    bool array;
    std::string key;
    size_t index;
  };
  void next_element() {
    if (!levels_.empty() && levels_.back().array) ++levels_.back().index;
  }
  std::vector<Level> levels_;
};

Json parse_json(const std::string& text) {
  check_nesting(text);
  // Duplicate keys: nlohmann keeps the last one silently; a case file with two values for the
  // same key is ambiguous, so reject it.
  std::vector<std::set<std::string>> open_objects;
  std::string duplicate;
  ParsePath at;
  const Json::parser_callback_t callback = [&](int /*depth*/, Json::parse_event_t event,
                                               Json& parsed) {
    at.on_event(event, parsed);
    switch (event) {
      case Json::parse_event_t::object_start:
        open_objects.emplace_back();
        break;
      case Json::parse_event_t::object_end:
        if (!open_objects.empty()) open_objects.pop_back();
        break;
      case Json::parse_event_t::key:
        if (!open_objects.empty() &&
            !open_objects.back().insert(parsed.get<std::string>()).second && duplicate.empty())
          duplicate = parsed.get<std::string>();
        break;
      default:
        break;
    }
    return true;
  };
  try {
    Json root = Json::parse(text, callback);
    if (!duplicate.empty())
      throw InputError(duplicate, "key \"" + duplicate +
                                      "\" appears twice in the same object; keep one of them");
    return root;
  } catch (const nlohmann::json::out_of_range& e) {
    // nlohmann's only out_of_range while parsing: a number beyond the double range (1e400).
    const std::string what = e.what();
    const size_t open = what.find('\''), close = what.rfind('\'');
    const std::string number =
        open != std::string::npos && close > open ? what.substr(open + 1, close - open - 1) : "";
    const std::string key = at.text();
    throw InputError(key, key + " = " + number +
                              " is too large for a number (the limit is about 1.8e308); give "
                              "the value in the range docs/case-format.md lists for " +
                              key);
  } catch (const nlohmann::json::parse_error& e) {
    const auto [line, column] = line_column(text, e.byte);
    std::string what = e.what();
    // Drop nlohmann's own "[json.exception.parse_error.101] parse error at line 1, column 2: ".
    const size_t colon = what.find(": ");
    if (colon != std::string::npos) what = what.substr(colon + 2);
    std::ostringstream s;
    s << "JSON syntax error at line " << line << ", column " << column << ": " << what
      << "; check for a missing comma, quote or bracket near that place";
    throw InputError("line " + std::to_string(line) + ", column " + std::to_string(column),
                     s.str());
  }
}

fem::Material read_material(Fields f, const fem::Material& fallback) {
  fem::Material m;
  m.young_modulus_mpa = f.number("young_modulus_mpa", fallback.young_modulus_mpa);
  m.poisson_ratio = f.number("poisson_ratio", fallback.poisson_ratio);
  f.finish();
  return m;
}

Eigen::Vector3d read_vector(const Json& v, const std::string& path) {
  if (!v.is_array() || v.size() != 3) type_error(path, "an array of three numbers [x, y, z]", v);
  Eigen::Vector3d out;
  for (int i = 0; i < 3; ++i) {
    const Json& c = v[static_cast<size_t>(i)];
    if (!c.is_number()) type_error(path + "[" + std::to_string(i) + "]", "a number", c);
    out(i) = c.get<double>();
  }
  return out;
}

void read_tooth(Fields t, CaseSpec& spec) {
  mesh::ToothSpec& tooth = spec.model.tooth;
  const Json* ideal = t.find("idealised_root");
  const Json* type = t.find("type");
  if (type) {
    if (!type->is_string()) type_error(t.path_of("type"), "a string", *type);
    try {
      tooth.type = mesh::tooth_type_from_string(type->get<std::string>());
    } catch (const InputError& e) {
      throw InputError(t.path_of("type"), t.path_of("type") + ": " + e.what());
    }
  } else if (!ideal) {
    t.missing("type", "\"maxillary_central_incisor\"");
  }
  tooth.dimensions = mesh::handbook_dimensions(tooth.type);
  Fields d = t.object("dimensions");
  for (const auto& k : case_keys::kDimensionKeys)
    tooth.dimensions.*k.field = d.number(k.key, tooth.dimensions.*k.field);
  d.finish();

  if (ideal) {
    Fields r(*ideal, t.path_of("idealised_root"));
    const std::string shape = r.string("shape", "");
    if (shape == "cylinder") {
      tooth.ideal_root = mesh::IdealRoot::kCylinder;
    } else if (shape == "cone") {
      tooth.ideal_root = mesh::IdealRoot::kCone;
    } else if (shape == "paraboloid") {
      tooth.ideal_root = mesh::IdealRoot::kParaboloid;
    } else {
      throw InputError(
          r.path_of("shape"),
          r.path_of("shape") + " = \"" + shape +
              "\" is not an idealised root; use \"cylinder\", \"cone\" or "
              "\"paraboloid\" (or remove tooth.idealised_root for an anatomical root)");
    }
    tooth.ideal_radius_mm = r.number("radius_at_crest_mm", tooth.ideal_radius_mm);
    tooth.ideal_length_mm = r.number("root_length_mm", tooth.ideal_length_mm);
    r.finish();
  }
  if (const Json* surface = t.find("surface")) {
    Fields f(*surface, t.path_of("surface"));
    if (!f.has("file")) f.missing("file", "\"my_tooth.stl\"");
    spec.surface.file = f.string("file", "");
    if (spec.surface.file.empty())
      throw InputError(f.path_of("file"),
                       f.path_of("file") + " is empty; name the surface file (STL, PLY or OBJ)");
    spec.surface.accept_principal_axes = f.boolean("accept_principal_axes", false);
    if (f.has("landmarks")) {
      Fields l = f.object("landmarks");
      mesh::ToothLandmarks m;
      const std::pair<const char*, Eigen::Vector3d*> points[] = {{"apex", &m.apex},
                                                                 {"crown_tip", &m.crown_tip},
                                                                 {"cej_labial", &m.cej_labial},
                                                                 {"cej_lingual", &m.cej_lingual},
                                                                 {"cej_mesial", &m.cej_mesial},
                                                                 {"cej_distal", &m.cej_distal}};
      for (const auto& [key, target] : points) {
        const Json* v = l.find(key);
        if (!v) l.missing(key, "[x, y, z]");
        *target = read_vector(*v, l.path_of(key));
      }
      l.finish();
      spec.surface.landmarks = m;
    }
    f.finish();
    if (ideal)
      throw InputError(t.path_of("surface"),
                       "tooth.surface and tooth.idealised_root exclude each other; remove one");
    if (t.has("dimensions"))
      throw InputError(t.path_of("dimensions"),
                       "tooth.dimensions are measured on the scanned surface (tooth.surface); "
                       "remove tooth.dimensions");
  }
  spec.tooth_material = read_material(t.object("material"), spec.tooth_material);
  t.finish();
}

std::string vector_text(const Eigen::Vector3d& v) {
  std::ostringstream s;
  s.precision(3);
  s << std::fixed << "[" << v.x() << ", " << v.y() << ", " << v.z() << "]";
  return s.str();
}

// Imports the scanned surface named by tooth.surface into spec.model.tooth.
void import_surface(CaseSpec& spec, const std::string& base_folder) {
  ToothSurfaceSource& src = spec.surface;
  src.resolved_path =
      (src.file[0] == '/' || base_folder.empty()) ? src.file : base_folder + "/" + src.file;
  const std::string key = "tooth.surface";
  if (!src.landmarks && !src.accept_principal_axes) {
    const mesh::SurfaceMesh surface = mesh::read_tooth_surface(src.resolved_path, key);
    const mesh::ToothPlacement p = mesh::principal_axis_proposal(surface);
    const Eigen::Matrix3d back = p.rotation.transpose();  // tooth -> file directions
    const Eigen::Vector3d origin = -(back * p.translation);
    throw InputError(key + ".landmarks",
                     "tooth.surface has no landmarks. Principal-axis proposal in the file's "
                     "coordinates: long axis toward the crown " +
                         vector_text(back.col(2)) + ", CEJ level on it at " + vector_text(origin) +
                         ", labial toward " + vector_text(back.col(0)) +
                         " (or the opposite side: check it). Give tooth.surface.landmarks (apex, "
                         "crown_tip, cej_labial, cej_lingual, cej_mesial, cej_distal), or accept "
                         "the proposal with \"accept_principal_axes\": true");
  }
  spec.model.tooth.scan = mesh::import_tooth_surface(src.resolved_path, src.landmarks, key);
  spec.model.tooth.dimensions = mesh::scanned_dimensions(*spec.model.tooth.scan);
}

void read_pdl(Fields p, CaseSpec& spec) {
  mesh::PdlSpec& pdl = spec.model.pdl;
  if (p.has("width_mm") && p.has("width_profile_mm"))
    throw InputError(p.path_of("width_profile_mm"),
                     "give either pdl.width_mm (uniform) or pdl.width_profile_mm (crest, mid_root, "
                     "apex), not both");
  if (const Json* w = p.find("width_mm")) {
    if (!w->is_number()) type_error(p.path_of("width_mm"), "a number", *w);
    pdl.crest_width_mm = pdl.mid_width_mm = pdl.apex_width_mm = w->get<double>();
  }
  if (p.has("width_profile_mm")) {
    Fields w = p.object("width_profile_mm");
    pdl.crest_width_mm = w.required_number("crest", "0.20");
    pdl.mid_width_mm = w.required_number("mid_root", "0.14");
    pdl.apex_width_mm = w.required_number("apex", "0.19");
    w.finish();
  } else {
    p.find("width_profile_mm");  // known key
  }
  spec.pdl_material = read_material(p.object("material"), spec.pdl_material);
  p.finish();
}

void read_bone(Fields b, CaseSpec& spec) {
  for (const auto& k : case_keys::kBoneKeys)
    spec.model.bone.*k.field = b.number(k.key, spec.model.bone.*k.field);
  spec.cortical_material = read_material(b.object("cortical_material"), spec.cortical_material);
  spec.cancellous_material =
      read_material(b.object("cancellous_material"), spec.cancellous_material);
  b.finish();
}

void read_bracket(Fields b, CaseSpec& spec) {
  mesh::BracketSpec& bracket = spec.model.bracket;
  if (const Json* h = b.find("height_mm")) {
    if (!h->is_number()) type_error(b.path_of("height_mm"), "a number", *h);
    bracket.height_mm = h->get<double>();
    if (!(bracket.height_mm >= 0))
      throw InputError(b.path_of("height_mm"),
                       b.path_of("height_mm") + " = " + shown(*h) +
                           " mm is negative; give the bracket centre's height above the CEJ "
                           "(>= 0 mm) or leave the key out for the crown's mid-height");
  }
  bracket.width_mm = b.number("width_mm", bracket.width_mm);
  bracket.length_mm = b.number("length_mm", bracket.length_mm);
  b.finish();
}

void read_mesh(Fields m, CaseSpec& spec) {
  mesh::MeshSizing& sizing = spec.model.sizing;
  const std::string preset = m.string("preset", mesh::to_string(sizing.preset));
  try {
    sizing.preset = mesh::mesh_preset_from_string(preset);
  } catch (const InputError& e) {
    throw InputError(m.path_of("preset"), m.path_of("preset") + ": " + e.what());
  }
  sizing.pdl_edge_mm = m.number("pdl_edge_mm", sizing.pdl_edge_mm);
  sizing.bone_edge_mm = m.number("bone_edge_mm", sizing.bone_edge_mm);
  sizing.pdl_layers = m.integer("pdl_layers", sizing.pdl_layers);
  sizing.second_order = m.boolean("quadratic", sizing.second_order);
  m.finish();
}

std::string format_number(double v) {
  std::ostringstream s;
  s << v;
  return s.str();
}

std::string default_scenario_name(const Scenario& s) {
  std::string name;
  if (s.horizontal_loss_percent > 0)
    name = format_number(s.horizontal_loss_percent) + " % loss";
  else if (s.loss.horizontal_mm > 0)
    name = format_number(s.loss.horizontal_mm) + " mm loss";
  if (s.loss.defect_depth_mm > 0) {
    if (!name.empty()) name += " + ";
    name += format_number(s.loss.defect_depth_mm) + " mm " +
            mesh::to_string(s.loss.defect_surface) + " defect";
  }
  return name.empty() ? "healthy" : name;
}

Scenario read_scenario(Fields f, const CaseSpec& spec) {
  Scenario s;
  if (f.has("horizontal_loss_mm") && f.has("horizontal_loss_percent"))
    throw InputError(f.path_of("horizontal_loss_percent"),
                     "give either " + f.path_of("horizontal_loss_mm") + " or " +
                         f.path_of("horizontal_loss_percent") + ", not both");
  s.loss.horizontal_mm = f.number("horizontal_loss_mm", 0);
  if (f.has("horizontal_loss_percent")) {
    const double percent = f.number("horizontal_loss_percent", 0);
    if (!(percent >= 0 && percent < 100))
      throw InputError(f.path_of("horizontal_loss_percent"),
                       f.path_of("horizontal_loss_percent") + " = " + format_number(percent) +
                           " % is outside [0, 100); give the loss as a percentage of the root "
                           "length, e.g. 30");
    s.horizontal_loss_percent = percent;
    s.loss.horizontal_mm = percent / 100.0 * root_length_mm(spec.model.tooth);
  } else {
    f.find("horizontal_loss_percent");  // known key
  }
  if (f.has("angular_defect")) {
    Fields d = f.object("angular_defect");
    const std::string surface = d.string("surface", mesh::to_string(s.loss.defect_surface));
    try {
      s.loss.defect_surface = mesh::tooth_surface_from_string(surface);
    } catch (const InputError& e) {
      throw InputError(d.path_of("surface"), d.path_of("surface") + ": " + e.what());
    }
    s.loss.defect_depth_mm = d.required_number("depth_mm", "2.0");
    s.loss.defect_width_deg = d.number("width_deg", s.loss.defect_width_deg);
    d.finish();
  } else {
    f.find("angular_defect");  // known key
  }
  s.name = f.string("name", "");
  if (s.name.empty() && !f.has("name")) s.name = default_scenario_name(s);
  f.finish();
  return s;
}

void read_scenarios(Fields& top, CaseSpec& spec) {
  const Json* list = top.find("scenarios");
  if (!list) {
    spec.scenarios = {Scenario{"healthy", {}, -1}};
    return;
  }
  if (!list->is_array()) type_error("scenarios", "an array of scenario objects", *list);
  if (list->empty())
    throw InputError("scenarios",
                     "scenarios is empty; give at least one, e.g. [{\"horizontal_loss_mm\": 0}]");
  for (size_t i = 0; i < list->size(); ++i)
    spec.scenarios.push_back(
        read_scenario(Fields((*list)[i], "scenarios[" + std::to_string(i) + "]"), spec));
}

// load.direction: a name, a vector [x, y, z] or angles {azimuth_deg, elevation_deg}.
void read_direction(const Json& d_value, const std::string& path, LoadSpec& load) {
  const Json* d = &d_value;
  if (d->is_string()) {
    try {
      load.direction = named_direction(d->get<std::string>());
    } catch (const InputError& e) {
      throw InputError(path, path + ": " + e.what());
    }
    load.direction_name = d->get<std::string>();
  } else if (d->is_array()) {
    const Eigen::Vector3d v = read_vector(*d, path);
    const double norm = v.norm();
    if (!std::isfinite(norm) || norm < 1e-9)
      throw InputError(path, path + " = " + shown(*d) +
                                 " has no length; give a non-zero vector [x, y, z] (x labial, "
                                 "y mesial, z toward the crown) or a name such as \"lingual\"");
    // Keep a vector that is already unit length bit for bit, so files round-trip exactly.
    load.direction = std::abs(norm - 1.0) < 1e-14 ? v : Eigen::Vector3d(v / norm);
    load.direction_name.clear();
  } else if (d->is_object()) {
    Fields a(*d, path);
    const double azimuth = a.required_number("azimuth_deg", "180");
    const double elevation = a.number("elevation_deg", 0);
    a.finish();
    if (!(elevation >= -90 && elevation <= 90))
      throw InputError(a.path_of("elevation_deg"),
                       a.path_of("elevation_deg") + " = " + format_number(elevation) +
                           " deg is outside [-90, 90]; it is the angle above the occlusal "
                           "(x-y) plane, +90 extrusive, -90 intrusive");
    if (!std::isfinite(azimuth))
      throw InputError(a.path_of("azimuth_deg"), a.path_of("azimuth_deg") + " is not finite");
    const double deg = sharpey::core::kRadiansPerDegree;
    load.direction = Eigen::Vector3d(std::cos(elevation * deg) * std::cos(azimuth * deg),
                                     std::cos(elevation * deg) * std::sin(azimuth * deg),
                                     std::sin(elevation * deg));
    load.direction_name.clear();
  } else {
    type_error(path,
               "a name (\"lingual\", ...), a vector [x, y, z] or angles {\"azimuth_deg\", "
               "\"elevation_deg\"}",
               *d);
  }
}

// load.application_height_mm: the height above the CEJ where the force acts (>= 0).
void read_application_height(Fields& l, LoadSpec& load) {
  if (const Json* h = l.find("application_height_mm")) {
    if (!h->is_number()) type_error(l.path_of("application_height_mm"), "a number", *h);
    load.bracket_height_mm = h->get<double>();
    if (!(load.bracket_height_mm >= 0))
      throw InputError(l.path_of("application_height_mm"),
                       l.path_of("application_height_mm") + " = " + shown(*h) +
                           " mm is negative; give the height above the CEJ where the force acts "
                           "(>= 0 mm) or leave the key out to use the bracket centre");
  }
}

// load.couple: a moment vector with its unit, or a moment-to-force ratio.
void read_couple(Fields& l, LoadSpec& load) {
  if (l.has("couple")) {
    Fields c = l.object("couple");
    const bool has_moment = c.has("moment"), has_ratio = c.has("moment_to_force_mm");
    if (has_moment == has_ratio)
      throw InputError(c.path(), c.path() +
                                     " needs exactly one of \"moment\" ([x, y, z] with "
                                     "\"unit\") or \"moment_to_force_mm\"");
    if (has_moment) {
      const Eigen::Vector3d m = read_vector(*c.find("moment"), c.path_of("moment"));
      const std::string unit_name = c.string("unit", "N.mm");
      double factor = 0;
      for (const auto& u : case_keys::kMomentUnits)
        if (unit_name == u.name) factor = u.nmm_per_unit;
      if (factor == 0)
        throw InputError(c.path_of("unit"), c.path_of("unit") + " = \"" + unit_name +
                                                "\" is not a moment unit; use \"N.mm\", "
                                                "\"cN.mm\" or \"g.mm\"");
      load.couple = CoupleKind::kMoment;
      load.moment_nmm = m * factor;
    } else {
      c.find("moment");
      c.find("unit");
      load.couple = CoupleKind::kRatio;
      load.moment_to_force_mm = c.number("moment_to_force_mm", 0);
    }
    c.finish();
  } else {
    l.find("couple");  // known key
  }
}

void read_load(Fields l, CaseSpec& spec) {
  LoadSpec& load = spec.load;
  load.magnitude = l.number("magnitude", load.magnitude);
  const std::string unit = l.string("unit", to_string(load.unit));
  try {
    load.unit = force_unit_from_string(unit);
  } catch (const InputError& e) {
    throw InputError(l.path_of("unit"), l.path_of("unit") + ": " + e.what());
  }

  if (const Json* d = l.find("direction")) read_direction(*d, l.path_of("direction"), load);
  read_application_height(l, load);
  read_couple(l, load);
  const std::string movement = l.string("movement", to_string(load.preset));
  try {
    load.preset = movement_preset_from_string(movement);
  } catch (const InputError& e) {
    throw InputError(l.path_of("movement"), l.path_of("movement") + ": " + e.what());
  }
  l.finish();
}

Threshold read_threshold(Fields f, const Threshold& fallback) {
  Threshold t;
  t.value_kpa = f.number("value_kpa", fallback.value_kpa);
  const std::string default_source = t.value_kpa == fallback.value_kpa
                                         ? fallback.source
                                         : "set in the case file (no source given)";
  t.source = f.string("source", default_source);
  f.finish();
  return t;
}

void read_band(Fields a, CaseSpec& spec) {
  BandSpec& b = spec.band;
  b.enabled = a.boolean("band", b.enabled);
  b.n_samples = a.integer("samples", b.n_samples);
  b.seed = a.integer("seed", b.seed);
  b.sensitivity = a.boolean("sensitivity", b.sensitivity);
  b.bone_level_error_mm = a.number("bone_level_error_mm", b.bone_level_error_mm);
  b.root_length_error_mm = a.number("root_length_error_mm", b.root_length_error_mm);
  a.finish();
}

CaseSpec read_case(const Json& root) {
  CaseSpec spec;
  Fields top(root, "");
  spec.schema_version = top.integer("schema_version", kCaseSchemaVersion);
  if (spec.schema_version != kCaseSchemaVersion)
    throw InputError("schema_version",
                     "schema_version = " + std::to_string(spec.schema_version) +
                         " is not supported; this program reads schema version " +
                         std::to_string(kCaseSchemaVersion) +
                         (spec.schema_version > kCaseSchemaVersion
                              ? " (the file was written by a newer program; update Sharpey)"
                              : ""));
  if (root.is_object() && root.contains("kind") && root.at("kind") == "multi_root_estimate")
    throw InputError("kind",
                     "this is a multi-rooted tooth case (\"kind\": \"multi_root_estimate\"), "
                     "evaluated by the thin-layer estimate of docs/molars.md: run it with "
                     "sharpey-batch molar (or run) CASE --out FOLDER, sweep it with sharpey-batch "
                     "sweep, or open it in the app (a window of its own); the mesh command and "
                     "the single-rooted study take single-rooted teeth only");
  spec.label = top.string("label", "");
  spec.notes = top.string("notes", "");
  read_tooth(top.object("tooth"), spec);
  read_pdl(top.object("pdl"), spec);
  read_bone(top.object("bone"), spec);
  read_bracket(top.object("bracket"), spec);
  read_mesh(top.object("mesh"), spec);
  read_scenarios(top, spec);
  read_load(top.object("load"), spec);
  Fields th = top.object("thresholds");
  const Thresholds defaults = default_thresholds();
  spec.thresholds.capillary = read_threshold(th.object("capillary"), defaults.capillary);
  spec.thresholds.limit = read_threshold(th.object("limit"), defaults.limit);
  th.finish();
  read_band(top.object("allowance"), spec);
  top.finish();
  return spec;
}

}  // namespace

CaseSpec parse_case(const std::string& json_text, const std::string& origin,
                    const std::string& base_folder) {
  try {
    const Json root = parse_json(json_text);
    CaseSpec spec = read_case(root);
    if (!spec.surface.file.empty()) import_surface(spec, base_folder);
    validate_case(spec);
    return spec;
  } catch (const InputError& e) {
    throw InputError(e.key(), origin + ": " + e.what());
  }
}

std::string read_case_text(const std::string& path) {
  // O_NONBLOCK: opening a FIFO without a writer must not block before it is refused below.
  const int fd = ::open(path.c_str(), O_RDONLY | O_NONBLOCK | O_CLOEXEC);
  if (fd < 0)
    throw InputError("file", "cannot open the case file \"" + path + "\" (" + std::strerror(errno) +
                                 "); check the path and that the file is readable");
  struct FdCloser {
    int fd;
    ~FdCloser() { ::close(fd); }
  } closer{fd};
  struct stat info {};
  if (::fstat(fd, &info) != 0)
    throw InputError("file", "cannot examine the case file \"" + path + "\" (" +
                                 std::strerror(errno) + "); check the file");
  if (!S_ISREG(info.st_mode))
    throw InputError("file", "the case file \"" + path + "\" is not a regular file (" +
                                 (S_ISDIR(info.st_mode)    ? "a folder"
                                  : S_ISFIFO(info.st_mode) ? "a pipe"
                                  : S_ISCHR(info.st_mode)  ? "a character device"
                                                           : "a special file") +
                                 "); give the path of a .json case file");
  const auto too_large = [&path](long long n_bytes) {
    return InputError("file", "the case file \"" + path + "\" holds " + std::to_string(n_bytes) +
                                  " bytes, more than the limit of " +
                                  std::to_string(kMaxCaseFileBytes) +
                                  " bytes; a case file is a few kilobytes of JSON: check that "
                                  "this is the right file");
  };
  if (info.st_size > static_cast<off_t>(kMaxCaseFileBytes)) throw too_large(info.st_size);
  std::string text;
  char buffer[65536];
  for (;;) {
    const ssize_t n = ::read(fd, buffer, sizeof buffer);
    if (n < 0) {
      if (errno == EINTR) continue;
      throw InputError("file", "cannot read the case file \"" + path + "\" (" +
                                   std::strerror(errno) + "); check the file");
    }
    if (n == 0) break;
    text.append(buffer, static_cast<size_t>(n));
    // The file may grow while it is read: stop at the limit all the same.
    if (text.size() > kMaxCaseFileBytes) throw too_large(static_cast<long long>(text.size()));
  }
  return text;
}

CaseSpec load_case(const std::string& path) {
  const size_t slash = path.find_last_of('/');
  return parse_case(read_case_text(path), path,
                    slash == std::string::npos ? "" : path.substr(0, slash));
}

}  // namespace sharpey::analysis
