#include <algorithm>
#include <cmath>
#include <limits>

#include "sharpey/analysis/detail/equivalent_force.h"
#include "sharpey/analysis/detail/evaluation.h"
#include "sharpey/analysis/detail/load_resolution.h"
#include "sharpey/analysis/detail/pdl_regions.h"
#include "sharpey/analysis/detail/rigid_motion.h"
#include "sharpey/analysis/detail/root_map.h"
#include "sharpey/analysis/detail/root_surface.h"
#include "sharpey/analysis/study.h"
#include "sharpey/core/constants.h"

namespace sharpey::analysis {
namespace {

constexpr double kRadToDeg = sharpey::core::kDegreesPerRadian;
constexpr double kP95AreaShare = 0.05;  // the 95th percentile: level exceeded on 5 % of the area

// Hydrostatic pressure (kPa, compression positive) per PDL node under a resolved load.
Eigen::VectorXd pdl_pressure_kpa(const fem::RegionField& field) {
  Eigen::VectorXd p(field.stress_mpa.cols());
  for (Eigen::Index i = 0; i < p.size(); ++i) {
    p(i) = fem::hydrostatic_pressure_kpa(field.stress_mpa.col(i));
  }
  return p;
}

using detail::PressureMeasures;

double at(const Eigen::VectorXd& v, size_t i) { return v(static_cast<Eigen::Index>(i)); }
double at(const std::vector<double>& v, size_t i) { return v[i]; }

// Largest value of `v` over the nodes outside the edge band (over all nodes when the band holds
// every node); `band_peak` receives the largest value inside the band (or -inf).
template <typename Values>
double max_outside_band(const Values& v, const std::vector<char>& band,
                        double* band_peak = nullptr) {
  double outside = -std::numeric_limits<double>::infinity();
  double inside = -std::numeric_limits<double>::infinity();
  for (size_t i = 0; i < band.size(); ++i) {
    const double x = at(v, i);
    if (band[i]) {
      inside = std::max(inside, x);
    } else {
      outside = std::max(outside, x);
    }
  }
  if (band_peak) *band_peak = inside;
  return std::isfinite(outside) ? outside : inside;
}

// p: nodal pressure of the PDL; sampled: the same on the root-surface sub-triangles; band: the
// solution's pdl_crest_edge_band() (computed once per evaluation by the caller).
PressureMeasures pressure_measures(const ScenarioSolution& solution, const Eigen::VectorXd& p,
                                   const Eigen::VectorXd& sampled, const std::vector<char>& band) {
  PressureMeasures m;
  m.peak_kpa = p.size() > 0 ? std::max(0.0, max_outside_band(p, band)) : 0.0;
  m.p95_kpa = std::max(0.0, solution.root_surface().level_exceeded_on(sampled, kP95AreaShare));
  return m;
}

PressureMeasures pressure_measures(const ScenarioSolution& solution, const LoadSpec& load) {
  const ResolvedLoad r = resolve_load(load, solution);
  const Eigen::VectorXd p =
      pdl_pressure_kpa(solution.basis().region_field(r.force_n, r.moment_nmm));
  return pressure_measures(solution, p, solution.root_surface().sample(p),
                           pdl_crest_edge_band(solution));
}

// Cells of the root map inside the edge band: the nodal band indicator interpolated like the
// pressure, at least one half.
std::vector<char> root_map_edge_band(const ScenarioSolution& solution,
                                     const std::vector<char>& band) {
  Eigen::VectorXd indicator(static_cast<Eigen::Index>(band.size()));
  for (size_t i = 0; i < band.size(); ++i) indicator(static_cast<Eigen::Index>(i)) = band[i];
  const RootMap map = solution.root_map_sampler().sample(indicator);
  std::vector<char> cells(map.pressure_kpa.size(), 0);
  for (size_t i = 0; i < cells.size(); ++i) cells[i] = map.pressure_kpa[i] >= 0.5 ? 1 : 0;
  return cells;
}

// Bounds on the principal values of the tensor strain of an engineering-shear strain vector e
// (e(3..5) = gamma_yz, gamma_xz, gamma_xy): the largest principal value lies in
// [max diagonal, max Gershgorin row bound], the largest magnitude in
// [max(max |diagonal|, |T|_F / sqrt 3), min(max absolute row sum, |T|_F)].
struct PrincipalBounds {
  double max_low, max_high, abs_low, abs_high;
};
PrincipalBounds principal_bounds(const Eigen::Ref<const Eigen::Matrix<double, 6, 1>>& e) {
  const double a = e(0), b = e(1), c = e(2);
  const double yz = 0.5 * std::abs(e(3)), xz = 0.5 * std::abs(e(4)), xy = 0.5 * std::abs(e(5));
  const double r0 = xy + xz, r1 = xy + yz, r2 = xz + yz;
  const double frobenius = std::sqrt(a * a + b * b + c * c + 2.0 * (xy * xy + xz * xz + yz * yz));
  PrincipalBounds pb;
  pb.max_low = std::max({a, b, c});
  pb.max_high = std::max({a + r0, b + r1, c + r2});
  pb.abs_low = std::max({std::abs(a), std::abs(b), std::abs(c), frobenius / std::sqrt(3.0)});
  pb.abs_high =
      std::min(std::max({std::abs(a) + r0, std::abs(b) + r1, std::abs(c) + r2}), frobenius);
  return pb;
}

// The strain maxima and the linear-range figures of `r` from the strain columns, without the
// per-node fields (FieldChoice::strain_maxima): the same values as the full loop gives.
void strain_maxima_only(const ScenarioSolution& solution,
                        const Eigen::Matrix<double, 6, Eigen::Dynamic>& strain,
                        const std::vector<char>& band, ScenarioResult& r) {
  const Eigen::Index n = strain.cols();
  // Over the nodes outside the band, or over every node when the band holds them all (as
  // max_outside_band does).
  bool any_outside = false;
  for (Eigen::Index i = 0; i < n; ++i) any_outside |= band[static_cast<size_t>(i)] == 0;
  auto counts = [&](Eigen::Index i) { return !any_outside || band[static_cast<size_t>(i)] == 0; };
  std::vector<PrincipalBounds> bounds(static_cast<size_t>(n));
  double max_low = -std::numeric_limits<double>::infinity(), abs_low = max_low;
  double equivalent = -std::numeric_limits<double>::infinity();
  for (Eigen::Index i = 0; i < n; ++i) {
    const PrincipalBounds& pb = bounds[static_cast<size_t>(i)] = principal_bounds(strain.col(i));
    if (!counts(i)) continue;
    max_low = std::max(max_low, pb.max_low);
    abs_low = std::max(abs_low, pb.abs_low);
    equivalent = std::max(equivalent, fem::equivalent_strain(strain.col(i)));
  }
  // A node is skipped only when both its bounds lie clearly below what another node reaches
  // (a margin far above the rounding of the closed-form principal values).
  const double margin = 1e-9 * std::max(0.0, abs_low);
  double max_principal = -std::numeric_limits<double>::infinity(), max_abs = max_principal;
  for (Eigen::Index i = 0; i < n; ++i) {
    const PrincipalBounds& pb = bounds[static_cast<size_t>(i)];
    if (!counts(i) || (pb.max_high < max_low - margin && pb.abs_high < abs_low - margin)) continue;
    const Eigen::Vector3d principal = fem::principal_strains(strain.col(i));
    max_principal = std::max(max_principal, principal(0));
    max_abs = std::max(max_abs, std::max(std::abs(principal(0)), std::abs(principal(2))));
  }
  r.max_principal_strain = max_principal;
  r.max_equivalent_strain = equivalent;
  r.max_abs_principal_strain = max_abs;
  r.beyond_linear_range = max_abs > kLinearRangeStrainLimit;
  // The volume beyond the linear range: each node's upper bound stands in for its magnitude,
  // except at the nodes of the elements whose mean bound reaches the limit, which get their
  // exact magnitude. An element decided on bounds has an exact mean no larger (a margin for the
  // rounding of the means), so it is left out in both; the others are decided on exact values,
  // in the same order: the same percentage as from every node's magnitude.
  const detail::PdlElementTable& elements = solution.pdl_elements();
  std::vector<double> magnitude(static_cast<size_t>(n));
  std::vector<char> exact(static_cast<size_t>(n), 0);
  for (Eigen::Index i = 0; i < n; ++i)
    magnitude[static_cast<size_t>(i)] = bounds[static_cast<size_t>(i)].abs_high;
  const int npe = elements.nodes_per_element;
  for (int e = 0; e < elements.n_elements(); ++e) {
    const int* local = elements.local_nodes.data() + static_cast<size_t>(e) * npe;
    double mean_bound = 0;
    for (int k = 0; k < npe; ++k) mean_bound += bounds[static_cast<size_t>(local[k])].abs_high;
    if (mean_bound / npe < kLinearRangeStrainLimit * (1 - 1e-9)) continue;
    for (int k = 0; k < npe; ++k) {
      const auto i = static_cast<size_t>(local[k]);
      if (exact[i]) continue;
      const Eigen::Vector3d principal =
          fem::principal_strains(strain.col(static_cast<Eigen::Index>(i)));
      magnitude[i] = std::max(std::abs(principal(0)), std::abs(principal(2)));
      exact[i] = 1;
    }
  }
  r.volume_beyond_linear_range_percent =
      elements.volume_percent_above(magnitude, kLinearRangeStrainLimit, band);
}

}  // namespace

// The band next to the PDL's free surface (the top of the ligament at the crest and along an
// angular defect's walls). Where that free surface meets the root and the socket wall, the
// linear-elastic stresses are singular (a bonded corner of a nearly incompressible layer), so
// nodal maxima there grow without bound as the mesh is refined (docs/analyses.md, "Peaks and the
// crest edge"). The reported maxima leave the band out; the band's own peak is reported apart.
// Measured in 3D rather than straight down from the crest, so that a defect's steep walls get a
// band of the same width as the crest (issue found on an angular defect: a vertical measure left
// a band of a few hundredths of a millimetre along the walls and the peaks did not converge).
const std::vector<char>& pdl_crest_edge_band(const ScenarioSolution& solution) {
  return solution.pdl_edge_band();
}

namespace {

constexpr double kNan = std::numeric_limits<double>::quiet_NaN();

// Rigid motion of the tooth: exact superposition of the unit cases' fitted motions; the centre
// of rotation and the crown-tip and apex displacements.
void evaluate_rigid_motion(const ScenarioSolution& solution, ScenarioResult& r) {
  const mesh::ModelGeometry& g = solution.model().geometry;
  const detail::LoadContext& context = solution.load_context();
  const detail::RigidMotion motion = context.response.motion(r.load.force_n, r.load.moment_nmm);
  r.centre_of_rotation_defined = detail::centre_of_rotation(motion, &r.centre_of_rotation);
  if (!r.centre_of_rotation_defined) {
    r.centre_of_rotation.setConstant(std::numeric_limits<double>::quiet_NaN());
  }
  r.crown_tip_displacement_um = 1000.0 * motion.displacement_at(g.crown_tip);
  r.apex_displacement_um = 1000.0 * motion.displacement_at(g.apex);
  r.rotation_deg = kRadToDeg * motion.rotation_rad;
}

// The displacement field and the rms residual of the rigid fit to the embedded root.
void evaluate_displacement(const ScenarioSolution& solution, const FieldChoice& fields,
                           ScenarioResult& r) {
  if (fields.displacement) {
    const Eigen::VectorXd u = solution.basis().displacement(r.load.force_n, r.load.moment_nmm);
    r.displacement_mm = Eigen::Map<const Eigen::Matrix3Xd>(u.data(), 3, u.size() / 3);
    r.rigid_fit_rms_um = 1000.0 * detail::fit_rigid_motion(solution.model().mesh.nodes, u,
                                                           solution.embedded_root_nodes())
                                      .rms_residual_mm;
  } else {
    r.rigid_fit_rms_um = kNan;
  }
}

// Principal and equivalent strains per PDL node; returns the larger principal magnitude per node
// (empty when strains are not asked for).
std::vector<double> evaluate_strain_fields(const fem::RegionField& field, Eigen::Index n,
                                           const FieldChoice& fields, ScenarioResult& r) {
  std::vector<double> strain_magnitude;
  if (fields.strains) {
    r.max_principal_strain_field.resize(static_cast<size_t>(n));
    r.equivalent_strain_field.resize(static_cast<size_t>(n));
    strain_magnitude.resize(static_cast<size_t>(n));
    for (Eigen::Index i = 0; i < n; ++i) {
      const auto k = static_cast<size_t>(i);
      const Eigen::Vector3d principal = fem::principal_strains(field.strain.col(i));
      r.max_principal_strain_field[k] = principal(0);
      strain_magnitude[k] = std::max(std::abs(principal(0)), std::abs(principal(2)));
      r.equivalent_strain_field[k] = fem::equivalent_strain(field.strain.col(i));
    }
  }
  if (fields.von_mises) {
    r.von_mises_kpa.resize(static_cast<size_t>(n));
    for (Eigen::Index i = 0; i < n; ++i)
      r.von_mises_kpa[static_cast<size_t>(i)] =
          1000.0 * fem::von_mises_mpa(field.stress_mpa.col(i));
  }
  return strain_magnitude;
}

// Peaks outside the crest edge band: tension, strains, the linear-range flag, von Mises.
void evaluate_peaks(const ScenarioSolution& solution, const Eigen::VectorXd& p,
                    const std::vector<double>& strain_magnitude, const std::vector<char>& band,
                    const fem::RegionField& field, const FieldChoice& fields, ScenarioResult& r) {
  const Eigen::Index n = p.size();
  if (n > 0) {
    double edge_peak = 0;
    max_outside_band(p, band, &edge_peak);
    r.pressure_max_compression_crest_edge_kpa = std::max(0.0, edge_peak);
    r.pressure_max_tension_kpa = std::max(0.0, max_outside_band(Eigen::VectorXd(-p), band));
    if (fields.strains) {
      r.max_principal_strain = max_outside_band(r.max_principal_strain_field, band);
      r.max_equivalent_strain = max_outside_band(r.equivalent_strain_field, band);
      r.max_abs_principal_strain = max_outside_band(strain_magnitude, band);
      r.beyond_linear_range = r.max_abs_principal_strain > kLinearRangeStrainLimit;
      r.volume_beyond_linear_range_percent = solution.pdl_elements().volume_percent_above(
          strain_magnitude, kLinearRangeStrainLimit, band);
    }
    if (fields.von_mises) r.max_von_mises_kpa = max_outside_band(r.von_mises_kpa, band);
  }
  if (!fields.strains && fields.strain_maxima && n > 0) {
    strain_maxima_only(solution, field.strain, band, r);
  } else if (!fields.strains) {
    r.max_principal_strain = r.max_equivalent_strain = r.max_abs_principal_strain = kNan;
    r.volume_beyond_linear_range_percent = kNan;
  }
  if (!fields.von_mises) r.max_von_mises_kpa = kNan;
}

// Areas over thresholds, from the root-surface sampling of the pressure.
void evaluate_areas(const detail::RootSurfaceSampler& surface, const Eigen::VectorXd& sampled,
                    const Thresholds& thresholds, ScenarioResult& r) {
  r.area_above_capillary_mm2 = surface.area_above(sampled, thresholds.capillary.value_kpa);
  r.area_above_limit_mm2 = surface.area_above(sampled, thresholds.limit.value_kpa);
  if (r.attachment_area_mm2 > 0) {
    r.area_above_capillary_percent = 100.0 * r.area_above_capillary_mm2 / r.attachment_area_mm2;
    r.area_above_limit_percent = 100.0 * r.area_above_limit_mm2 / r.attachment_area_mm2;
  }
}

// Equivalent force: linear scaling against the healthy scenario under the same load spec
// (resolved there on its own centre of resistance).
void evaluate_equivalent_forces(const ScenarioSolution& solution, const LoadSpec& load,
                                const ScenarioSolution* healthy,
                                const PressureMeasures* known_reference,
                                const PressureMeasures& measures, ScenarioResult& r) {
  if (healthy != nullptr) {
    const double force_g = from_newton(load.force_n(), ForceUnit::kGram);
    const PressureMeasures reference = known_reference != nullptr ? *known_reference
                                       : healthy == &solution     ? measures
                                                              : pressure_measures(*healthy, load);
    r.equivalent_force_peak_g =
        detail::equivalent_force_by_pressure(force_g, reference.peak_kpa, measures.peak_kpa);
    r.equivalent_force_p95_g =
        detail::equivalent_force_by_pressure(force_g, reference.p95_kpa, measures.p95_kpa);
    r.equivalent_force_area_rule_g = detail::equivalent_force_by_area(
        force_g, r.attachment_area_mm2, healthy->attachment_area_mm2());
  }
}

}  // namespace

namespace detail {

ScenarioResult evaluate(const ScenarioSolution& solution, const LoadSpec& load,
                        const Thresholds& thresholds, const ScenarioSolution* healthy,
                        const PressureMeasures* known_reference, const FieldChoice& fields) {
  const detail::LoadContext& context = solution.load_context();
  ScenarioResult r;
  r.name = solution.scenario().name;
  r.bone_loss_mm = solution.scenario().loss.horizontal_mm;
  r.attachment_area_mm2 = solution.attachment_area_mm2();
  r.cres_labiolingual = solution.cres_labiolingual();
  r.cres_mesiodistal = solution.cres_mesiodistal();
  r.load = detail::resolve_load(load, context);
  r.mf_translation_mm = detail::translation_moment_to_force(load, context);

  evaluate_rigid_motion(solution, r);
  evaluate_displacement(solution, fields, r);

  // PDL fields per node.
  const fem::RegionField field = solution.basis().region_field(r.load.force_n, r.load.moment_nmm);
  const Eigen::VectorXd p = pdl_pressure_kpa(field);
  const Eigen::Index n = p.size();
  r.pressure_kpa.assign(p.data(), p.data() + n);
  const std::vector<double> strain_magnitude = evaluate_strain_fields(field, n, fields, r);
  const std::vector<char>& band = pdl_crest_edge_band(solution);
  evaluate_peaks(solution, p, strain_magnitude, band, field, fields, r);
  const detail::RootSurfaceSampler& surface = solution.root_surface();
  const Eigen::VectorXd sampled = surface.sample(p);
  const PressureMeasures measures = pressure_measures(solution, p, sampled, band);
  r.pressure_max_compression_kpa = measures.peak_kpa;
  r.pressure_p95_compression_kpa = measures.p95_kpa;
  evaluate_areas(surface, sampled, thresholds, r);
  evaluate_equivalent_forces(solution, load, healthy, known_reference, measures, r);
  r.root_map = solution.root_map_sampler().sample(p);
  r.root_map.edge_band = root_map_edge_band(solution, band);
  return r;
}

}  // namespace detail

ScenarioResult evaluate(const ScenarioSolution& solution, const LoadSpec& load,
                        const Thresholds& thresholds, const ScenarioSolution* healthy) {
  return detail::evaluate(solution, load, thresholds, healthy, nullptr);
}

ScenarioResult evaluate(const ScenarioSolution& solution, const LoadSpec& load,
                        const Thresholds& thresholds, const ScenarioSolution* healthy,
                        const FieldChoice& fields) {
  return detail::evaluate(solution, load, thresholds, healthy, nullptr, fields);
}

}  // namespace sharpey::analysis
