// Multi-rooted tooth case files: parsing with key-naming messages, evaluation and the report.
#include "sharpey/analysis/multi_root_case.h"

#include <cmath>
#include <fstream>
#include <iomanip>
#include <limits>
#include <map>
#include <nlohmann/json.hpp>
#include <set>
#include <sstream>

#include "sharpey/analysis/detail/output_text.h"
#include "sharpey/analysis/multi_root_fe.h"
#include "sharpey/analysis/study.h"
#include "sharpey/core/check.h"
#include "sharpey/core/constants.h"
#include "sharpey/error.h"

namespace sharpey::analysis {
namespace {

using Json = nlohmann::ordered_json;
using sharpey::core::kPi;

// Reads the members of one JSON object; refuses unknown keys (a misspelt key must not be
// silently ignored).
class Object {
 public:
  Object(const Json& j, std::string path) : j_(j), path_(std::move(path)) {
    if (!j_.is_object()) throw InputError(path_, path_ + " must be a JSON object");
  }
  std::string key(const std::string& k) const { return path_.empty() ? k : path_ + "." + k; }
  const Json* find(const std::string& k) {
    used_.insert(k);
    const auto it = j_.find(k);
    return it == j_.end() ? nullptr : &*it;
  }
  double number(const std::string& k, double fallback) {
    const Json* v = find(k);
    if (!v) return fallback;
    if (!v->is_number() || !std::isfinite(v->get<double>()))
      throw InputError(key(k), key(k) + " must be a number, not " + v->dump());
    return v->get<double>();
  }
  std::string text(const std::string& k, const std::string& fallback) {
    const Json* v = find(k);
    if (!v) return fallback;
    if (!v->is_string()) throw InputError(key(k), key(k) + " must be a string, not " + v->dump());
    return v->get<std::string>();
  }
  void finish() const {
    for (auto it = j_.begin(); it != j_.end(); ++it) {
      if (!used_.count(it.key()))
        throw InputError(key(it.key()), "unknown key " + key(it.key()) +
                                            " in a multi-rooted tooth case; see docs/molars.md "
                                            "for the accepted keys");
    }
  }

 private:
  const Json& j_;
  std::string path_;
  std::set<std::string> used_;
};

mesh::MultiRootBone parse_scenario(const Json& j, const std::string& path, double crest,
                                   const mesh::PdlSpec& pdl, std::string* name) {
  Object o(j, path);
  mesh::MultiRootBone b;
  b.crest_below_cej_mm = crest;
  b.pdl = pdl;
  *name = o.text("name", "");
  if (name->empty()) throw InputError(o.key("name"), o.key("name") + " must name the scenario");
  b.loss.horizontal_mm = o.number("horizontal_loss_mm", 0);
  if (const Json* d = o.find("angular_defect")) {
    Object a(*d, o.key("angular_defect"));
    b.loss.defect_depth_mm = a.number("depth_mm", 0);
    b.loss.defect_width_deg = a.number("width_deg", 60);
    b.loss.defect_surface =
        mesh::tooth_surface_from_string(a.text("surface", mesh::to_string(b.loss.defect_surface)));
    a.finish();
  }
  if (const Json* f = o.find("furcation")) {
    Object fo(*f, o.key("furcation"));
    const double degree = fo.number("degree", 0);
    if (degree != std::floor(degree))
      throw InputError(fo.key("degree"), fo.key("degree") + " must be 0, 1, 2 or 3");
    b.furcation.degree = static_cast<int>(degree);
    b.furcation.horizontal_mm = fo.number("horizontal_mm", 0);
    b.furcation.vertical_mm = fo.number("vertical_mm", b.furcation.vertical_mm);
    if (const Json* e = fo.find("entrances")) {
      if (!e->is_array() || e->empty())
        throw InputError(fo.key("entrances"),
                         fo.key("entrances") + " must be a list such as [\"buccal\"]");
      b.furcation.entrances.clear();
      for (const Json& name_j : *e) {
        if (!name_j.is_string())
          throw InputError(fo.key("entrances"),
                           fo.key("entrances") + " holds names, not " + name_j.dump());
        b.furcation.entrances.push_back(
            mesh::furcation_entrance_from_string(name_j.get<std::string>()));
      }
    }
    fo.finish();
  }
  o.finish();
  return b;
}

std::string fixed(double v, int digits) {
  std::ostringstream s;
  s << std::fixed << std::setprecision(digits) << v;
  return s.str();
}

// The load's magnitude in N (N mm for couples) from the case's unit.
double magnitude_in_base_unit(const MultiRootCase& c) {
  const bool couple = c.movement == MolarMovement::kUprighting;
  const double gram_force_n = 0.00980665;
  if (couple) {
    if (c.unit == "N mm") return c.magnitude;
    if (c.unit == "g mm") return c.magnitude * gram_force_n;
    throw InputError("load.unit",
                     "uprighting is a couple: give load.unit \"N mm\" or \"g mm\", "
                     "not \"" +
                         c.unit + "\"");
  }
  if (c.unit == "N") return c.magnitude;
  if (c.unit == "cN") return 0.01 * c.magnitude;
  if (c.unit == "g") return c.magnitude * gram_force_n;
  throw InputError("load.unit", to_string(c.movement) +
                                    " is a force: give load.unit \"N\", "
                                    "\"cN\" or \"g\", not \"" +
                                    c.unit + "\"");
}

// schema_version, kind, label, notes and tooth.type.
void parse_header(Object& root, MultiRootCase* c) {
  if (root.number("schema_version", 1) != 1)
    throw InputError("schema_version", "schema_version must be 1");
  if (root.text("kind", "") != "multi_root_estimate")
    throw InputError("kind",
                     "a multi-rooted tooth case says \"kind\": "
                     "\"multi_root_estimate\"");
  c->label = root.text("label", "");
  c->notes = root.text("notes", "");
  const Json* tooth = root.find("tooth");
  if (!tooth) throw InputError("tooth", "the case needs tooth.type, e.g. mandibular_first_molar");
  Object t(*tooth, "tooth");
  c->type = mesh::multi_root_type_from_string(t.text("type", ""));
  t.finish();
}

// pdl: the material into the case, the width profile into `pdl`.
void parse_pdl(Object& root, MultiRootCase* c, mesh::PdlSpec* pdl) {
  const Json* p = root.find("pdl");
  if (!p) return;
  Object po(*p, "pdl");
  c->pdl.young_modulus_mpa = po.number("young_modulus_mpa", c->pdl.young_modulus_mpa);
  c->pdl.poisson_ratio = po.number("poisson_ratio", c->pdl.poisson_ratio);
  if (const Json* w = po.find("width_profile_mm")) {
    Object wo(*w, "pdl.width_profile_mm");
    pdl->crest_width_mm = wo.number("crest", pdl->crest_width_mm);
    pdl->mid_width_mm = wo.number("mid_root", pdl->mid_width_mm);
    pdl->apex_width_mm = wo.number("apex", pdl->apex_width_mm);
    wo.finish();
    for (double w_mm : {pdl->crest_width_mm, pdl->mid_width_mm, pdl->apex_width_mm})
      if (!(w_mm >= 0.05 && w_mm <= 0.6))
        throw InputError("pdl.width_profile_mm",
                         "PDL width " + fixed(w_mm, 3) +
                             " mm is outside 0.05 to 0.6 mm (published widths 0.1 to 0.4 "
                             "mm); use a value there");
  }
  po.finish();
}

// scenarios: each parsed and validated against the tooth.
void parse_scenarios(Object& root, double crest, const mesh::PdlSpec& pdl, MultiRootCase* c) {
  const Json* scenarios = root.find("scenarios");
  if (!scenarios || !scenarios->is_array() || scenarios->empty())
    throw InputError("scenarios", "the case needs a non-empty scenarios list");
  for (size_t i = 0; i < scenarios->size(); ++i) {
    MultiRootScenario s;
    const std::string path = "scenarios[" + std::to_string(i) + "]";
    s.bone = parse_scenario((*scenarios)[i], path, crest, pdl, &s.name);
    try {
      mesh::validate(mesh::multi_root_handbook(c->type), s.bone);
    } catch (const InputError& e) {
      throw InputError(path + "." + e.key(), path + " (" + s.name + "): " + e.what());
    }
    c->scenarios.push_back(s);
  }
}

void parse_load(Object& root, MultiRootCase* c) {
  const Json* load = root.find("load");
  if (!load) throw InputError("load", "the case needs load.movement and load.magnitude");
  Object lo(*load, "load");
  c->movement = molar_movement_from_string(lo.text("movement", ""));
  c->magnitude = lo.number("magnitude", 0);
  c->unit = lo.text("unit", c->movement == MolarMovement::kUprighting ? "N mm" : "N");
  if (!(c->magnitude > 0))
    throw InputError("load.magnitude",
                     "load.magnitude must be positive, not " + fixed(c->magnitude, 3));
  lo.finish();
  magnitude_in_base_unit(*c);  // checks the unit
}

void parse_thresholds(Object& root, MultiRootCase* c) {
  const Json* t = root.find("thresholds");
  if (!t) return;
  Object to(*t, "thresholds");
  c->thresholds.capillary.value_kpa = to.number("capillary_kpa", 4.7);
  c->thresholds.limit.value_kpa = to.number("limit_kpa", 16.0);
  to.finish();
  if (!(c->thresholds.capillary.value_kpa > 0 &&
        c->thresholds.limit.value_kpa > c->thresholds.capillary.value_kpa))
    throw InputError("thresholds", "thresholds must satisfy 0 < capillary_kpa < limit_kpa");
}

// What the parsed values must satisfy together: every scenario meshable when finite elements are
// asked for, and a PDL material the estimate accepts.
void check_model(const MultiRootCase& c) {
  if (c.finite_elements) {
    for (size_t i = 0; i < c.scenarios.size(); ++i) {
      try {
        mesh::validate_multi_root_mesh(mesh::multi_root_handbook(c.type), c.scenarios[i].bone);
      } catch (const InputError& e) {
        const std::string path = "scenarios[" + std::to_string(i) + "]";
        throw InputError(path + "." + e.key(),
                         path + " (" + c.scenarios[i].name + "), finite_elements: " + e.what());
      }
    }
  }
  // The PDL material is checked by the estimate itself.
  try {
    MultiRootThinLayer(mesh::multi_root_handbook(c.type), c.scenarios.front().bone, c.pdl);
  } catch (const InputError& e) {
    if (e.key() != "materials.pdl") throw;
    throw InputError("pdl", e.what());
  }
}

// ---- evaluation ----

// The case's movement to `threshold_kpa`, from the tooth's peak per unit of the load; negative
// when the movement compresses nothing.
double case_allowance(double peak_compression_kpa, double magnitude, double threshold_kpa) {
  const double per_unit_peak = peak_compression_kpa / magnitude;
  return per_unit_peak > 0 ? threshold_kpa / per_unit_peak : -1.0;
}

// Root map: per part, 30-degree sectors around its own centre by 1 mm of depth below the CEJ; the
// largest compression in each cell (no cell where nothing is attached), ordered by part, depth
// and sector.
std::vector<MultiRootMapCell> root_map_cells(const MultiRootThinLayer& model,
                                             const std::vector<double>& p) {
  std::map<std::tuple<int, int, int>, double> cells;
  for (size_t k = 0; k < p.size(); ++k) {
    const mesh::RootSurfacePoint& q = model.attached_points()[k];
    if (q.part == mesh::kRoofPart) continue;
    const int sector = static_cast<int>(std::floor(q.angle_rad / (kPi / 6))) % 12;
    const int depth = static_cast<int>(std::floor(-q.x.z()));
    const auto key = std::make_tuple(q.part, depth, sector);
    const auto it = cells.find(key);
    if (it == cells.end() || it->second < p[k]) cells[key] = p[k];
  }
  std::vector<MultiRootMapCell> out;
  for (const auto& [key, value] : cells)
    out.push_back({std::get<0>(key), std::get<1>(key), std::get<2>(key), value});
  return out;
}

// The whole root surface with its attachment, and the pressure at the attached points (the
// model's points are the attached ones of the same quadrature, in the same order).
void fill_surface(const MultiRootThinLayer& model, const mesh::MultiRootBone& bone,
                  const std::vector<double>& p, MultiRootScenarioResult* r) {
  r->surface = mesh::root_surface_points(model.tooth());
  mesh::attach(model.tooth(), bone, &r->surface);
  r->surface_pressure_kpa.assign(r->surface.size(), std::numeric_limits<double>::quiet_NaN());
  size_t k = 0;
  for (size_t i = 0; i < r->surface.size() && k < p.size(); ++i)
    if (r->surface[i].attached) r->surface_pressure_kpa[i] = p[k++];
  SHARPEY_ASSERT(k == p.size(), "the attached points differ from the model's");
}

MultiRootFeFigures fe_figures(const MultiRootCase& spec, const mesh::MultiRootTooth& tooth,
                              const MultiRootScenario& s, const MultiRootLoad& load,
                              double magnitude) {
  const fem::Material& pdl = spec.pdl;
  const mesh::MultiRootMesh m = mesh::build_multi_root_mesh(tooth, s.bone);
  const fem::Material dentin{18600, 0.31}, cancellous{1370, 0.3};
  const MultiRootFeCres fc = multi_root_fe_cres(m, dentin, pdl, cancellous, tooth.trunk_length_mm);
  const MultiRootFePressure fp =
      multi_root_fe_pressure(m, tooth, s.bone, dentin, pdl, cancellous, load, spec.thresholds);
  MultiRootFeFigures out{fc.n_dofs, fc.buccolingual, fc.mesiodistal, fp.tooth, fp.roots};
  const double peak = fp.tooth.peak_compression_kpa;
  out.allowance_capillary = case_allowance(peak, magnitude, spec.thresholds.capillary.value_kpa);
  out.allowance_limit = case_allowance(peak, magnitude, spec.thresholds.limit.value_kpa);
  return out;
}

MultiRootScenarioResult evaluate_scenario(const MultiRootCase& spec,
                                          const mesh::MultiRootTooth& tooth, double magnitude,
                                          const MultiRootScenario& s) {
  const MultiRootThinLayer model(tooth, s.bone, spec.pdl);
  const MultiRootLoad load = model.preset(spec.movement, magnitude);
  MultiRootScenarioResult r;
  r.name = s.name;
  r.areas = model.areas();
  r.result = model.evaluate(load, spec.thresholds);
  r.cres_buccolingual = model.cres(Eigen::Vector3d::UnitX());
  r.cres_mesiodistal = model.cres(Eigen::Vector3d::UnitY());
  const double peak = r.result.tooth.peak_compression_kpa;
  r.allowance_capillary = case_allowance(peak, magnitude, spec.thresholds.capillary.value_kpa);
  r.allowance_limit = case_allowance(peak, magnitude, spec.thresholds.limit.value_kpa);
  for (MolarMovement m :
       {MolarMovement::kUprighting, MolarMovement::kIntrusion, MolarMovement::kTranslation})
    r.allowances.push_back({m, model.allowance(m, spec.thresholds.capillary.value_kpa),
                            model.allowance(m, spec.thresholds.limit.value_kpa)});
  const std::vector<double> p = model.pressure_kpa(load);
  r.root_map = root_map_cells(model, p);
  fill_surface(model, s.bone, p, &r);
  if (spec.finite_elements) {
    r.has_finite_elements = true;
    r.finite_elements = fe_figures(spec, tooth, s, load, magnitude);
  }
  return r;
}

// ---- outputs ----

std::string root_map_name(size_t i) { return std::to_string(i) + "_root_map.csv"; }

void write_root_map(const mesh::MultiRootTooth& tooth, const std::vector<MultiRootMapCell>& cells,
                    const std::string& folder, const std::string& map_name) {
  std::ofstream csv(folder + "/" + map_name);
  csv << "# " << caution_text() << "\n"
      << "# thin-layer estimate, not finite elements (docs/molars.md); pressure_kpa: the "
         "largest hydrostatic pressure in the cell (compression > 0; negative: the whole cell "
         "is in tension)\n"
      << "part,depth_below_cej_mm_from,depth_below_cej_mm_to,sector_deg_from,sector_deg_to,"
         "pressure_kpa\n";
  for (const MultiRootMapCell& c : cells)
    csv << multi_root_part_name(tooth, c.part) << "," << c.depth_mm << "," << c.depth_mm + 1 << ","
        << 30 * c.sector << "," << 30 * c.sector + 30 << "," << fixed(c.pressure_kpa, 3) << "\n";
  if (!csv) throw OutputError("cannot write " + folder + "/" + map_name);
}

Json allowance_json(double a) { return a < 0 ? Json(nullptr) : Json(a); }
std::string allowance_text(double a) { return a < 0 ? std::string("none") : fixed(a, 2); }

Json figures_json(const RootFigures& f) {
  Json o;
  o["name"] = f.name;
  o["attachment_area_mm2"] = f.attachment_area_mm2;
  o["peak_compression_kpa"] = f.peak_compression_kpa;
  o["peak_tension_kpa"] = f.peak_tension_kpa;
  o["area_above_capillary_mm2"] = f.area_above_capillary_mm2;
  o["area_above_limit_mm2"] = f.area_above_limit_mm2;
  o["reaction_n"] = {f.reaction_n.x(), f.reaction_n.y(), f.reaction_n.z()};
  return o;
}

// The finite-element areas and allowances (added beside the older keys, which stay as they were).
void fe_area_json(const MultiRootCase& spec, const MultiRootFeFigures& fe, Json* fj) {
  const std::string unit = spec.movement == MolarMovement::kUprighting ? "nmm" : "n";
  Json& j = *fj;
  j["areas_method"] =
      "finite elements: the PDL's root-side surface (tooth/PDL interface faces); area above a "
      "threshold lumped at the faces' nodes (pressure recovered at each node), nodes in the free "
      "edge's band left out; not the thin-layer areas of the scenario's \"roots\"";
  j["tooth_attachment_area_mm2"] = fe.tooth.attachment_area_mm2;
  j["tooth_area_above_capillary_mm2"] = fe.tooth.area_above_capillary_mm2;
  j["tooth_area_above_limit_mm2"] = fe.tooth.area_above_limit_mm2;
  j["allowance_capillary_" + unit] = allowance_json(fe.allowance_capillary);
  j["allowance_limit_" + unit] = allowance_json(fe.allowance_limit);
}

Json fe_json(const MultiRootCase& spec, const MultiRootFeFigures& fe) {
  Json fj;
  fj["method"] =
      "finite elements: faceted multi-rooted mesh (coarse sizes), 10-node tetrahedra, dentin "
      "18.6 GPa, cancellous bone 1.37 GPa; pressure peaks over the PDL nodes more than one "
      "crest width below the crest";
  fj["dofs"] = fe.n_dofs;
  fj["cres_buccolingual_below_cej_mm"] = fe.buccolingual.below_cej_mm;
  fj["cres_mesiodistal_below_cej_mm"] = fe.mesiodistal.below_cej_mm;
  fj["tooth_peak_compression_kpa"] = fe.tooth.peak_compression_kpa;
  for (const RootFigures& f : fe.roots) {
    Json o;
    o["name"] = f.name;
    o["peak_compression_kpa"] = f.peak_compression_kpa;
    o["peak_tension_kpa"] = f.peak_tension_kpa;
    o["attachment_area_mm2"] = f.attachment_area_mm2;
    o["area_above_capillary_mm2"] = f.area_above_capillary_mm2;
    o["area_above_limit_mm2"] = f.area_above_limit_mm2;
    fj["roots"].push_back(o);
  }
  fe_area_json(spec, fe, &fj);
  return fj;
}

Json scenario_json(const MultiRootCase& spec, const MultiRootScenario& s,
                   const MultiRootScenarioResult& r, size_t i) {
  const bool couple = spec.movement == MolarMovement::kUprighting;
  Json js;
  js["name"] = s.name;
  js["horizontal_loss_mm"] = s.bone.loss.horizontal_mm;
  js["angular_defect_mm"] = s.bone.loss.defect_depth_mm;
  js["furcation_degree"] = s.bone.furcation.degree;
  js["attachment_area_mm2"] = r.areas.attached_total_mm2;
  js["root_area_mm2"] = r.areas.total_mm2;
  js["cres_buccolingual_below_cej_mm"] = r.cres_buccolingual.below_cej_mm;
  js["cres_mesiodistal_below_cej_mm"] = r.cres_mesiodistal.below_cej_mm;
  js["cres_mesiodistal_below_furcation_mm"] = r.cres_mesiodistal.below_furcation_mm;
  js["allowance_capillary_" + std::string(couple ? "nmm" : "n")] =
      allowance_json(r.allowance_capillary);
  js["allowance_limit_" + std::string(couple ? "nmm" : "n")] = allowance_json(r.allowance_limit);
  js["tooth"] = figures_json(r.result.tooth);
  for (const RootFigures& f : r.result.roots) js["roots"].push_back(figures_json(f));
  if (r.has_finite_elements) js["finite_elements"] = fe_json(spec, r.finite_elements);
  js["root_map"] = root_map_name(i);
  return js;
}

Json results_json(const MultiRootCase& spec, const MultiRootCaseResult& r) {
  Json results;
  results["caution"] = caution_text();
  results["caution_method"] =
      "here the model is not finite-element: it is the thin-layer estimate of \"method\"";
  results["method"] =
      "thin-layer (Winkler) estimate: rigid tooth and bone, the ligament as springs over the "
      "attached root surface; not a finite-element solution (docs/molars.md)";
  results["label"] = spec.label;
  results["tooth"] = mesh::to_string(spec.type);
  results["dimensions_status"] = mesh::multi_root_handbook_status(spec.type);
  results["movement"] = to_string(spec.movement);
  results["magnitude"] = spec.magnitude;
  results["unit"] = spec.unit;
  for (size_t i = 0; i < r.scenarios.size(); ++i)
    results["scenarios"].push_back(scenario_json(spec, spec.scenarios[i], r.scenarios[i], i));
  return results;
}

std::string summary_header(const MultiRootCase& spec) {
  std::ostringstream txt;
  txt << detail::wrap(caution_text(), 96)
      << detail::wrap(
             "Here the model is not finite-element: it is the thin-layer estimate "
             "described under Method.",
             96)
      << "\n"
      << detail::wrap(spec.label, 96) << "\n"
      << "Tooth: " << mesh::to_string(spec.type) << "; " << to_string(spec.movement) << " "
      << spec.magnitude << " " << spec.unit << ".\n"
      << detail::wrap(
             "Method: thin-layer estimate (rigid tooth and bone, the ligament as springs "
             "over the attached root surface); its pressures compare scenarios and roots, "
             "they are not finite-element peaks (docs/molars.md).",
             96)
      << (spec.finite_elements
              ? detail::wrap("The lines marked \"finite elements\" come from a finite-element "
                             "model of the same tooth (faceted multi-rooted mesh, coarse sizes, "
                             "dentin 18.6 GPa, cancellous bone 1.37 GPa; docs/molars.md).",
                             96)
              : std::string())
      << "\n";
  return txt.str();
}

// The finite-element areas and allowances, on lines of their own after the older one.
std::string fe_area_summary(const MultiRootCase& spec, const std::string& base_unit,
                            const MultiRootFeFigures& fe) {
  const double capillary = spec.thresholds.capillary.value_kpa;
  const double limit = spec.thresholds.limit.value_kpa;
  std::ostringstream ft;
  ft << "  finite elements: allowance to " << limit
     << " kPa: " << allowance_text(fe.allowance_limit) << " " << base_unit << " (to " << capillary
     << " kPa: " << allowance_text(fe.allowance_capillary) << " " << base_unit
     << "); root-side PDL area " << fixed(fe.tooth.attachment_area_mm2, 0) << " mm^2, above "
     << capillary << " kPa " << fixed(fe.tooth.area_above_capillary_mm2, 1) << " mm^2, above "
     << limit << " kPa " << fixed(fe.tooth.area_above_limit_mm2, 1) << " mm^2\n";
  for (const RootFigures& f : fe.roots)
    ft << "  finite elements, " << f.name << ": root-side PDL area "
       << fixed(f.attachment_area_mm2, 0) << " mm^2, above " << capillary << " kPa "
       << fixed(f.area_above_capillary_mm2, 1) << " mm^2, above " << limit << " kPa "
       << fixed(f.area_above_limit_mm2, 1) << " mm^2\n";
  return ft.str();
}

std::string fe_summary(const MultiRootCase& spec, const std::string& base_unit,
                       const MultiRootFeFigures& fe) {
  std::ostringstream ft;
  ft << "  finite elements (" << fe.n_dofs << " dofs): CRes "
     << fixed(fe.mesiodistal.below_cej_mm, 1) << " mm (mesiodistal), "
     << fixed(fe.buccolingual.below_cej_mm, 1)
     << " mm (buccolingual) below the CEJ; peak compression";
  for (const RootFigures& f : fe.roots)
    ft << " " << f.name << " " << fixed(f.peak_compression_kpa, 1) << " kPa";
  ft << "\n";
  ft << fe_area_summary(spec, base_unit, fe);
  return ft.str();
}

std::string scenario_summary(const MultiRootCase& spec, const std::string& base_unit,
                             const MultiRootScenarioResult& r, size_t i) {
  const double capillary = spec.thresholds.capillary.value_kpa;
  const double limit = spec.thresholds.limit.value_kpa;
  std::ostringstream txt;
  txt << "\nScenario " << i << ": " << r.name << "\n"
      << "  attachment " << fixed(r.areas.attached_total_mm2, 0) << " of "
      << fixed(r.areas.total_mm2, 0) << " mm^2; CRes " << fixed(r.cres_mesiodistal.below_cej_mm, 1)
      << " mm below the CEJ for mesiodistal forces ("
      << fixed(r.cres_mesiodistal.below_furcation_mm, 1) << " mm below the furcation), "
      << fixed(r.cres_buccolingual.below_cej_mm, 1) << " mm for buccolingual forces\n"
      << "  allowance to " << limit << " kPa: " << allowance_text(r.allowance_limit) << " "
      << base_unit << " (to " << capillary << " kPa: " << allowance_text(r.allowance_capillary)
      << " " << base_unit << ")\n";
  if (r.has_finite_elements)
    txt << fe_summary(spec, base_unit, r.finite_elements) << "  thin-layer estimate, per root:\n";
  for (const RootFigures& f : r.result.roots) {
    txt << "  " << std::left << std::setw(12) << f.name << " attached "
        << fixed(f.attachment_area_mm2, 0) << " mm^2, peak " << fixed(f.peak_compression_kpa, 1)
        << " kPa, above " << capillary << " kPa " << fixed(f.area_above_capillary_mm2, 1)
        << " mm^2, above " << limit << " kPa " << fixed(f.area_above_limit_mm2, 1)
        << " mm^2, load carried " << fixed(f.reaction_n.norm(), 2) << " N\n";
  }
  return txt.str();
}

std::string summary_text(const MultiRootCase& spec, const MultiRootCaseResult& r) {
  std::string txt = summary_header(spec);
  for (size_t i = 0; i < r.scenarios.size(); ++i)
    txt += scenario_summary(spec, r.base_unit, r.scenarios[i], i);
  return txt;
}

}  // namespace

MultiRootCase parse_multi_root_case(const std::string& json_text, const std::string& origin) {
  try {
    Json j;
    try {
      j = Json::parse(json_text);
    } catch (const nlohmann::json::parse_error& e) {
      throw InputError("file", std::string("not valid JSON: ") + e.what());
    }
    Object root(j, "");
    MultiRootCase c;
    parse_header(root, &c);
    mesh::PdlSpec pdl;
    parse_pdl(root, &c, &pdl);
    double crest = 1.5;
    if (const Json* b = root.find("bone")) {
      Object bo(*b, "bone");
      crest = bo.number("crest_below_cej_mm", crest);
      bo.finish();
    }
    parse_scenarios(root, crest, pdl, &c);
    parse_load(root, &c);
    if (const Json* fe = root.find("finite_elements")) {
      if (!fe->is_boolean())
        throw InputError("finite_elements",
                         "finite_elements must be true or false, not " + fe->dump());
      c.finite_elements = fe->get<bool>();
    }
    parse_thresholds(root, &c);
    root.finish();
    check_model(c);
    return c;
  } catch (const InputError& e) {
    throw InputError(e.key(), origin + ": " + e.what());
  }
}

MultiRootCase load_multi_root_case(const std::string& path) {
  std::ifstream in(path);
  if (!in) throw InputError("file", "cannot read the case file " + path);
  std::stringstream s;
  s << in.rdbuf();
  return parse_multi_root_case(s.str(), path);
}

bool is_multi_root_case_file(const std::string& path) {
  // Through the case reader's bounded read: a pipe, a device or an oversized file is not a case
  // (the caller's own reader then refuses it) and must neither block nor fill memory here.
  std::string text;
  try {
    text = read_case_text(path);
  } catch (const InputError&) {
    return false;
  }
  const Json j = Json::parse(text, nullptr, false);
  if (j.is_discarded() || !j.is_object()) return false;
  const auto kind = j.find("kind");
  return kind != j.end() && kind->is_string() && kind->get<std::string>() == "multi_root_estimate";
}

std::string multi_root_part_name(const mesh::MultiRootTooth& tooth, int part) {
  if (part == mesh::kTrunkPart) return "trunk";
  if (part == mesh::kRoofPart) return "furcation roof";
  return tooth.roots.at(static_cast<size_t>(part)).name;
}

MultiRootCaseResult evaluate_multi_root_case(const MultiRootCase& spec) {
  MultiRootCaseResult out;
  out.tooth = mesh::multi_root_handbook(spec.type);
  out.magnitude = magnitude_in_base_unit(spec);
  out.base_unit = spec.movement == MolarMovement::kUprighting ? "N mm" : "N";
  for (const MultiRootScenario& s : spec.scenarios)
    out.scenarios.push_back(evaluate_scenario(spec, out.tooth, out.magnitude, s));
  return out;
}

void run_multi_root_case(const MultiRootCase& spec, const std::string& folder) {
  const MultiRootCaseResult r = evaluate_multi_root_case(spec);
  for (size_t i = 0; i < r.scenarios.size(); ++i)
    write_root_map(r.tooth, r.scenarios[i].root_map, folder, root_map_name(i));
  std::ofstream json_out(folder + "/multi_root_results.json");
  json_out << results_json(spec, r).dump(2) << "\n";
  std::ofstream txt_out(folder + "/multi_root_summary.txt");
  txt_out << summary_text(spec, r);
  if (!json_out || !txt_out) throw OutputError("cannot write the report into " + folder);
}

}  // namespace sharpey::analysis
