#include "core/surface_import.h"

#include <Eigen/Geometry>
#include <QFile>
#include <QFileInfo>
#include <QJsonArray>
#include <QJsonDocument>
#include <QJsonObject>
#include <algorithm>
#include <cmath>
#include <limits>

#include "sharpey/error.h"

namespace sharpey::app {

namespace {

// The proposal's CEJ rule (mesh::principal_axis_proposal): crowns are 35 to 45 % of a
// single-rooted tooth's length (common practice), so the CEJ is put 40 % below the crown end.
constexpr double kCrownFraction = 0.4;

// Farthest crossing of the ray origin + t dir (t > 0) with the triangles, or -1 (Moller-Trumbore).
double farthest_hit(const std::vector<Eigen::Vector3d>& v,
                    const std::vector<std::array<int, 3>>& triangles, const Eigen::Vector3d& origin,
                    const Eigen::Vector3d& dir) {
  double best = -1;
  for (const auto& t : triangles) {
    const Eigen::Vector3d e1 = v[t[1]] - v[t[0]], e2 = v[t[2]] - v[t[0]];
    const Eigen::Vector3d p = dir.cross(e2);
    const double det = e1.dot(p);
    if (std::abs(det) < 1e-14) continue;
    const Eigen::Vector3d s = origin - v[t[0]];
    const double a = s.dot(p) / det;
    if (a < 0 || a > 1) continue;
    const Eigen::Vector3d q = s.cross(e1);
    const double b = dir.dot(q) / det;
    if (b < 0 || a + b > 1) continue;
    const double dist = e2.dot(q) / det;
    if (dist > 0) best = std::max(best, dist);
  }
  return best;
}

std::optional<Eigen::Vector3d> json_point(const QJsonObject& o, const char* key) {
  const QJsonArray a = o.value(QLatin1String(key)).toArray();
  if (a.size() != 3) return std::nullopt;
  Eigen::Vector3d p;
  for (int i = 0; i < 3; ++i) {
    if (!a[i].isDouble()) return std::nullopt;
    p[i] = a[i].toDouble();
  }
  return p;
}

}  // namespace

analysis::CaseSpec default_new_case() {
  analysis::CaseSpec spec;
  spec.label = "Invented case: new";
  analysis::Scenario healthy;
  healthy.name = "healthy";
  analysis::Scenario reduced;
  reduced.name = "3.0 mm loss";
  reduced.loss.horizontal_mm = 3.0;
  spec.scenarios = {healthy, reduced};
  return spec;
}

bool SurfaceImport::read_surface(const QString& path) {
  const bool same_file = path == path_;
  surface_.reset();
  confirmed_ = false;
  if (!same_file) landmarks_.reset();
  path_ = path;
  try {
    surface_ = mesh::read_tooth_surface(path.toStdString(), "tooth.surface");
  } catch (const Error& e) {
    error_ = QString::fromStdString(e.what());
    return false;
  } catch (const std::exception& e) {  // e.g. out of memory on a huge file: still no crash
    error_ = QStringLiteral("%1 could not be read: %2").arg(path, QString::fromUtf8(e.what()));
    return false;
  }
  error_.clear();
  return true;
}

bool SurfaceImport::read_landmarks(const QString& case_path) {
  if (!surface_) {
    error_ =
        QStringLiteral("Choose the surface file first, then the case file with its landmarks.");
    return false;
  }
  QFile file(case_path);
  if (!file.open(QIODevice::ReadOnly)) {
    error_ = QStringLiteral("%1 cannot be read: %2").arg(case_path, file.errorString());
    return false;
  }
  QJsonParseError parse{};
  const QJsonDocument doc = QJsonDocument::fromJson(file.read(analysis::kMaxCaseFileBytes), &parse);
  if (parse.error != QJsonParseError::NoError) {
    error_ = QStringLiteral("%1 is not a JSON case file (%2 at character %3).")
                 .arg(case_path, parse.errorString())
                 .arg(parse.offset);
    return false;
  }
  const QJsonObject l = doc.object()
                            .value(QLatin1String("tooth"))
                            .toObject()
                            .value(QLatin1String("surface"))
                            .toObject()
                            .value(QLatin1String("landmarks"))
                            .toObject();
  mesh::ToothLandmarks m;
  const std::pair<const char*, Eigen::Vector3d*> keys[] = {{"apex", &m.apex},
                                                           {"crown_tip", &m.crown_tip},
                                                           {"cej_labial", &m.cej_labial},
                                                           {"cej_lingual", &m.cej_lingual},
                                                           {"cej_mesial", &m.cej_mesial},
                                                           {"cej_distal", &m.cej_distal}};
  for (const auto& [key, field] : keys) {
    const auto p = json_point(l, key);
    if (!p) {
      error_ = QStringLiteral(
                   "%1 has no tooth.surface.landmarks.%2 (three numbers, mm, in the surface file's "
                   "coordinates); the axis stays as proposed.")
                   .arg(case_path, QLatin1String(key));
      return false;
    }
    *field = *p;
  }
  try {
    mesh::placement_from_landmarks(m, "tooth.surface.landmarks");
  } catch (const Error& e) {
    error_ = QString::fromStdString(e.what());
    return false;
  }
  landmarks_ = m;
  confirmed_ = false;
  error_.clear();
  return true;
}

void SurfaceImport::clear_landmarks() {
  landmarks_.reset();
  confirmed_ = false;
}

AxisSource SurfaceImport::axis_source() const {
  if (!surface_) return AxisSource::kNone;
  return landmarks_ ? AxisSource::kLandmarks : AxisSource::kPrincipalAxes;
}

mesh::ToothPlacement SurfaceImport::base_placement() const {
  if (!surface_) return {};
  return landmarks_ ? mesh::placement_from_landmarks(*landmarks_, "tooth.surface.landmarks")
                    : mesh::principal_axis_proposal(*surface_);
}

mesh::ToothPlacement SurfaceImport::placement() const {
  mesh::ToothPlacement p = base_placement();
  if (!surface_) return p;
  auto turn = [&p](const Eigen::Vector3d& diagonal) {
    p.rotation = diagonal.asDiagonal() * p.rotation;
    p.translation = diagonal.asDiagonal() * p.translation;
  };
  if (swap_crown_apex_) {
    turn(Eigen::Vector3d(1, -1, -1));  // half a turn about the labial axis
    double z_min = std::numeric_limits<double>::max(), z_max = -z_min;
    for (const auto& v : surface_->vertices) {
      const double z = p.apply(v).z();
      z_min = std::min(z_min, z);
      z_max = std::max(z_max, z);
    }
    p.translation.z() -= z_max - kCrownFraction * (z_max - z_min);
  }
  if (swap_labial_lingual_) turn(Eigen::Vector3d(-1, -1, 1));  // half a turn about the long axis
  if (swap_mesial_distal_) {
    turn(Eigen::Vector3d(1, -1, 1));  // mirror: a tooth of the other side
    p.mirrored = !p.mirrored;
  }
  return p;
}

std::vector<Eigen::Vector3d> SurfaceImport::placed_vertices() const {
  std::vector<Eigen::Vector3d> out;
  if (!surface_) return out;
  const mesh::ToothPlacement p = placement();
  out.reserve(surface_->vertices.size());
  for (const auto& v : surface_->vertices) out.push_back(p.apply(v));
  return out;
}

double SurfaceImport::length_mm() const {
  const auto v = placed_vertices();
  if (v.empty()) return 0;
  double z_min = std::numeric_limits<double>::max(), z_max = -z_min;
  for (const auto& p : v) {
    z_min = std::min(z_min, p.z());
    z_max = std::max(z_max, p.z());
  }
  return z_max - z_min;
}

std::vector<ShownLandmark> SurfaceImport::shown_landmarks() const {
  std::vector<ShownLandmark> out;
  if (!surface_) return out;
  const mesh::ToothPlacement p = placement();
  if (landmarks_ && !turned()) {
    const mesh::ToothLandmarks& l = *landmarks_;
    return {{QStringLiteral("apex"), p.apply(l.apex)},
            {QStringLiteral("crown tip"), p.apply(l.crown_tip)},
            {QStringLiteral("labial CEJ"), p.apply(l.cej_labial)},
            {QStringLiteral("lingual CEJ"), p.apply(l.cej_lingual)},
            {QStringLiteral("mesial CEJ"), p.apply(l.cej_mesial)},
            {QStringLiteral("distal CEJ"), p.apply(l.cej_distal)}};
  }
  const std::vector<Eigen::Vector3d> v = placed_vertices();
  double z_min = std::numeric_limits<double>::max(), z_max = -z_min;
  for (const auto& q : v) {
    z_min = std::min(z_min, q.z());
    z_max = std::max(z_max, q.z());
  }
  out.push_back({QStringLiteral("apex"), Eigen::Vector3d(0, 0, z_min)});
  out.push_back({QStringLiteral("crown tip"), Eigen::Vector3d(0, 0, z_max)});
  const std::pair<QString, Eigen::Vector3d> sides[] = {
      {QStringLiteral("labial CEJ"), Eigen::Vector3d::UnitX()},
      {QStringLiteral("lingual CEJ"), -Eigen::Vector3d::UnitX()},
      {QStringLiteral("mesial CEJ"), Eigen::Vector3d::UnitY()},
      {QStringLiteral("distal CEJ"), -Eigen::Vector3d::UnitY()}};
  for (const auto& [name, dir] : sides) {
    double r = farthest_hit(v, surface_->triangles, Eigen::Vector3d::Zero(), dir);
    // The axis misses the surface at the CEJ plane: a point 1 mm out still fixes the side (the
    // library then says what is wrong with the axis when the case is built).
    if (r <= 0) r = 1.0;
    out.push_back({name, r * dir});
  }
  return out;
}

mesh::ToothLandmarks SurfaceImport::case_landmarks() const {
  if (landmarks_ && !turned()) return *landmarks_;
  const mesh::ToothPlacement p = placement();
  const Eigen::Matrix3d inverse = p.rotation.transpose();  // orthonormal (det +-1)
  auto back = [&](const Eigen::Vector3d& q) -> Eigen::Vector3d {
    return inverse * (q - p.translation);
  };
  const auto shown = shown_landmarks();
  mesh::ToothLandmarks l;
  if (shown.size() != 6) return l;
  l.apex = back(shown[0].point_mm);
  l.crown_tip = back(shown[1].point_mm);
  l.cej_labial = back(shown[2].point_mm);
  l.cej_lingual = back(shown[3].point_mm);
  l.cej_mesial = back(shown[4].point_mm);
  l.cej_distal = back(shown[5].point_mm);
  return l;
}

analysis::CaseSpec SurfaceImport::build_case() const {
  if (!surface_)
    throw InputError("tooth.surface",
                     "No surface is read yet: choose a surface file (STL, PLY or "
                     "OBJ) first.");
  if (!confirmed_)
    throw InputError("tooth.surface",
                     "The tooth axis is not confirmed yet: check that the crown points up, the "
                     "labial side faces the labial label and mesial the mesial one, then tick "
                     "the confirmation.");
  analysis::CaseSpec spec = default_new_case();
  const QFileInfo info(path_);
  spec.label =
      QStringLiteral("Imported surface %1 (%2)")
          .arg(info.fileName(), QString::fromStdString(mesh::to_string(type_)).replace('_', ' '))
          .toStdString();
  spec.notes =
      QStringLiteral(
          "Built by the import dialog from %1; tooth axis from %2, confirmed by the user.")
          .arg(info.fileName(),
               landmarks_ && !turned()
                   ? QStringLiteral("the landmarks of a case file")
                   : QStringLiteral("landmarks derived from the confirmed axis (the principal-axis "
                                    "proposal or the case file's landmarks, turned round)"))
          .toStdString();
  spec.model.tooth.type = type_;
  spec.surface.file = info.absoluteFilePath().toStdString();
  spec.surface.landmarks = case_landmarks();
  // Written and read back as a case file is, so the library checks and imports it the same way.
  return analysis::parse_case(analysis::case_to_json(spec), "imported surface", "");
}

}  // namespace sharpey::app
