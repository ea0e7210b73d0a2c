// Placing a scanned tooth in the tooth coordinate system and resampling it as a radius table
// (mesh/tooth_surface.h). No CGAL here: reading and checking is tooth_surface_read.cpp.
#include "sharpey/mesh/tooth_surface.h"

#include <Eigen/Eigenvalues>
#include <Eigen/Geometry>
#include <algorithm>
#include <array>
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <fstream>
#include <iterator>
#include <limits>
#include <sstream>

#include "sharpey/core/constants.h"
#include "sharpey/error.h"
#include "sharpey/mesh/tooth_model.h"

namespace sharpey::mesh {
namespace {

using sharpey::core::kPi;

std::string fmt(double v) {
  std::ostringstream s;
  s.precision(4);
  s << v;
  return s.str();
}

double cross2(const Eigen::Vector2d& a, const Eigen::Vector2d& b) {
  return a.x() * b.y() - a.y() * b.x();
}

// Heights where the vertical line x = y = 0 crosses the surface.
std::vector<double> axis_crossings(const SurfaceMesh& surface) {
  std::vector<double> z;
  for (const auto& t : surface.triangles) {
    const Eigen::Vector3d &a = surface.vertices[t[0]], &b = surface.vertices[t[1]],
                          &c = surface.vertices[t[2]];
    const Eigen::Vector2d A = a.head<2>(), B = b.head<2>(), C = c.head<2>();
    const double area = cross2(B - A, C - A);
    if (std::abs(area) < 1e-14) continue;
    const double wa = cross2(B, C) / area, wb = cross2(C, A) / area, wc = cross2(A, B) / area;
    if (wa < 0 || wb < 0 || wc < 0) continue;
    z.push_back(wa * a.z() + wb * b.z() + wc * c.z());
  }
  std::sort(z.begin(), z.end());
  return z;
}

// A ray from the axis may cross the surface at several radii this close (relative + absolute, mm)
// without the section being refused as not star-shaped.
constexpr double kStarTolerance = 0.10;
constexpr double kStarToleranceMm = 0.25;
// How far the surface may reach beyond the axis' crossings at the apex and the crown tip, mm.
constexpr double kPoleToleranceMm = 0.5;

}  // namespace

void write_stl(const SurfaceMesh& surface, const std::string& path, bool binary,
               const std::string& title) {
  std::ofstream out(path, binary ? std::ios::binary : std::ios::out);
  if (!out)
    throw InputError("file",
                     "cannot write " + path + "; check that the folder exists and is writable");
  auto normal = [&](const std::array<int, 3>& t) {
    const Eigen::Vector3d& a = surface.vertices[t[0]];
    const Eigen::Vector3d n = (surface.vertices[t[1]] - a).cross(surface.vertices[t[2]] - a);
    return n.norm() > 0 ? Eigen::Vector3d(n.normalized()) : Eigen::Vector3d::Zero();
  };
  if (binary) {
    char header[80] = {};
    std::snprintf(header, sizeof header, "%s", title.c_str());
    out.write(header, 80);
    const uint32_t n = static_cast<uint32_t>(surface.triangles.size());
    out.write(reinterpret_cast<const char*>(&n), 4);
    for (const auto& t : surface.triangles) {
      float data[12];
      const Eigen::Vector3d nn = normal(t);
      for (int k = 0; k < 3; ++k) data[k] = static_cast<float>(nn[k]);
      for (int v = 0; v < 3; ++v)
        for (int k = 0; k < 3; ++k)
          data[3 + 3 * v + k] = static_cast<float>(surface.vertices[t[v]][k]);
      out.write(reinterpret_cast<const char*>(data), sizeof data);
      const uint16_t attribute = 0;
      out.write(reinterpret_cast<const char*>(&attribute), 2);
    }
  } else {
    out.precision(9);
    out << "solid " << title << "\n";
    for (const auto& t : surface.triangles) {
      const Eigen::Vector3d nn = normal(t);
      out << " facet normal " << nn.x() << ' ' << nn.y() << ' ' << nn.z() << "\n  outer loop\n";
      for (int v = 0; v < 3; ++v) {
        const Eigen::Vector3d& p = surface.vertices[t[v]];
        out << "   vertex " << p.x() << ' ' << p.y() << ' ' << p.z() << '\n';
      }
      out << "  endloop\n endfacet\n";
    }
    out << "endsolid " << title << "\n";
  }
  if (!out) throw InputError("file", "writing " + path + " failed (disk full?)");
}

ToothPlacement placement_from_landmarks(const ToothLandmarks& l, const std::string& key) {
  const Eigen::Vector3d axis = l.crown_tip - l.apex;
  if (!(axis.norm() >= 5.0)) {
    throw InputError(key + ".landmarks",
                     "the apex and crown-tip landmarks are " + fmt(axis.norm()) +
                         " mm apart; a tooth is 15 to 35 mm long: check that both "
                         "points are on the tooth's ends, in the file's units (mm)");
  }
  const Eigen::Vector3d z = axis.normalized();
  Eigen::Vector3d x = (l.cej_labial - l.cej_lingual);
  x -= x.dot(z) * z;
  if (!(x.norm() >= 1.0)) {
    throw InputError(key + ".landmarks",
                     "the labial and lingual CEJ landmarks are " + fmt(x.norm()) +
                         " mm apart across the long axis; they must lie on opposite "
                         "sides of the root at the CEJ");
  }
  x.normalize();
  Eigen::Vector3d y = z.cross(x);
  const double mesial = (l.cej_mesial - l.apex).dot(y), distal = (l.cej_distal - l.apex).dot(y);
  if (!(mesial * distal < 0)) {
    throw InputError(key + ".landmarks",
                     "the mesial and distal CEJ landmarks lie on the same side of "
                     "the labial-lingual plane; check that they are on opposite "
                     "sides of the root");
  }
  ToothPlacement p;
  if (mesial < 0) {
    y = -y;
    p.mirrored = true;
  }
  p.rotation.row(0) = x.transpose();
  p.rotation.row(1) = y.transpose();
  p.rotation.row(2) = z.transpose();
  const double length = axis.norm();
  double cej = 0;
  for (const Eigen::Vector3d* c : {&l.cej_labial, &l.cej_lingual, &l.cej_mesial, &l.cej_distal}) {
    const double h = (*c - l.apex).dot(z);
    if (!(h > 0.1 * length && h < 0.9 * length)) {
      throw InputError(key + ".landmarks",
                       "a CEJ landmark lies " + fmt(h) +
                           " mm above the apex along the axis of length " + fmt(length) +
                           " mm; CEJ points must lie between the apex and the crown tip");
    }
    cej += 0.25 * h;
  }
  const Eigen::Vector3d origin = l.apex + cej * z;
  p.translation = -(p.rotation * origin);
  return p;
}

ToothPlacement principal_axis_proposal(const SurfaceMesh& s) {
  // Area-weighted centroid and second moments of the surface.
  double area = 0;
  Eigen::Vector3d c = Eigen::Vector3d::Zero();
  Eigen::Matrix3d m = Eigen::Matrix3d::Zero();
  for (const auto& t : s.triangles) {
    const Eigen::Vector3d &a = s.vertices[t[0]], &b = s.vertices[t[1]], &d = s.vertices[t[2]];
    const double w = 0.5 * (b - a).cross(d - a).norm();
    const Eigen::Vector3d g = (a + b + d) / 3.0;
    area += w;
    c += w * g;
    m += w * g * g.transpose();
  }
  c /= area;
  m = m / area - c * c.transpose();
  const Eigen::SelfAdjointEigenSolver<Eigen::Matrix3d> eig(m);
  Eigen::Vector3d z = eig.eigenvectors().col(2);
  Eigen::Vector3d x = eig.eigenvectors().col(1);
  // The crown is the wider end: compare the mean distance from the axis at both ends.
  double lo = 1e300, hi = -1e300;
  for (const auto& v : s.vertices) {
    lo = std::min(lo, (v - c).dot(z));
    hi = std::max(hi, (v - c).dot(z));
  }
  double wide_hi = 0, wide_lo = 0;
  int n_hi = 0, n_lo = 0;
  for (const auto& v : s.vertices) {
    const double h = (v - c).dot(z);
    const double r = ((v - c) - h * z).norm();
    if (h > hi - 0.3 * (hi - lo)) {
      wide_hi += r;
      ++n_hi;
    } else if (h < lo + 0.3 * (hi - lo)) {
      wide_lo += r;
      ++n_lo;
    }
  }
  if (n_hi && n_lo && wide_lo / n_lo > wide_hi / n_hi) {
    z = -z;
    std::swap(lo, hi);
    lo = -lo;
    hi = -hi;
  }
  ToothPlacement p;
  p.rotation.row(0) = x.transpose();
  p.rotation.row(1) = z.cross(x).transpose();
  p.rotation.row(2) = z.transpose();
  // CEJ level 40 % of the length below the crown tip (common practice: crowns are 35 to 45 % of
  // a single-rooted tooth's length).
  const Eigen::Vector3d origin = c + (hi - 0.40 * (hi - lo)) * z;
  p.translation = -(p.rotation * origin);
  return p;
}

namespace {

// Heights where the long axis crosses the surface; throws when the axis does not run through the
// tooth from below the CEJ to above it, or when the surface reaches beyond its two crossings.
std::vector<double> check_axis(const SurfaceMesh& surface, const std::string& key) {
  const std::vector<double> crossings = axis_crossings(surface);
  if (crossings.size() < 2 || !(crossings.front() < 0 && crossings.back() > 0)) {
    throw InputError(key,
                     "the tooth's long axis does not pass through the surface from below the "
                     "CEJ to above it; place the apex and crown-tip landmarks on the tooth's ends");
  }
  // The radius table covers the surface between the axis' two crossings only: a surface reaching
  // beyond them (the axis misses the apex or the crown tip) would lose that part silently.
  double z_lo = 1e300, z_hi = -1e300;
  for (const auto& v : surface.vertices) {
    z_lo = std::min(z_lo, v.z());
    z_hi = std::max(z_hi, v.z());
  }
  if (z_lo < crossings.front() - kPoleToleranceMm || z_hi > crossings.back() + kPoleToleranceMm) {
    const bool root = z_lo < crossings.front() - kPoleToleranceMm;
    throw InputError(key, "the tooth's long axis leaves the surface " +
                              fmt(root ? crossings.front() - z_lo : z_hi - crossings.back()) +
                              " mm short of the " + (root ? "root's apical end" : "crown's tip") +
                              ", so that part of the tooth would be lost; place the " +
                              (root ? "apex" : "crown-tip") + " landmark at the tooth's end");
  }
  return crossings;
}

// Where the rays of row i (height z) cross the segment q0-q1 (the triangle's cut by the row's
// plane): the largest radius per ray into r.radius_mm, the smallest into r_min.
void cut_segment(const Eigen::Vector2d& q0, const Eigen::Vector2d& q1, int i, RadialToothSurface* r,
                 std::vector<double>* r_min) {
  const int n_theta = r->n_theta;
  const Eigen::Vector2d e = q1 - q0;
  double a0 = std::atan2(q0.y(), q0.x());
  double span = std::atan2(q1.y(), q1.x()) - a0;
  if (span > kPi) span -= 2 * kPi;
  if (span < -kPi) span += 2 * kPi;
  if (span < 0) {
    a0 += span;
    span = -span;
  }
  const int j0 = static_cast<int>(std::ceil(a0 / (2 * kPi) * n_theta - 1e-12));
  const int j1 = static_cast<int>(std::floor((a0 + span) / (2 * kPi) * n_theta + 1e-12));
  for (int jj = j0; jj <= j1; ++jj) {
    const int j = ((jj % n_theta) + n_theta) % n_theta;
    const double theta = 2 * kPi * j / n_theta;
    const Eigen::Vector2d d(std::cos(theta), std::sin(theta));
    const double den = cross2(d, e);
    if (std::abs(den) < 1e-15) continue;
    const double rr = cross2(q0, e) / den;
    if (rr < 0) continue;
    const size_t idx = static_cast<size_t>(i) * n_theta + j;
    r->radius_mm[idx] = std::max(r->radius_mm[idx], rr);
    (*r_min)[idx] = std::min((*r_min)[idx], rr);
  }
}

// Cuts every triangle by the planes of the rows (heights row_z) that it spans.
void cut_triangles(const SurfaceMesh& surface, const std::vector<double>& row_z,
                   RadialToothSurface* r, std::vector<double>* r_min) {
  for (const auto& t : surface.triangles) {
    const Eigen::Vector3d* p[3] = {&surface.vertices[t[0]], &surface.vertices[t[1]],
                                   &surface.vertices[t[2]]};
    const double zlo = std::min({p[0]->z(), p[1]->z(), p[2]->z()});
    const double zhi = std::max({p[0]->z(), p[1]->z(), p[2]->z()});
    const auto first = std::lower_bound(row_z.begin() + 1, row_z.end() - 1, zlo);
    for (auto it = first; it != row_z.end() - 1 && *it <= zhi; ++it) {
      const int i = static_cast<int>(it - row_z.begin());
      const double z = *it;
      // The segment where the plane cuts the triangle.
      Eigen::Vector2d q[2];
      int n_q = 0;
      for (int k = 0; k < 3 && n_q < 2; ++k) {
        const Eigen::Vector3d &a = *p[k], &b = *p[(k + 1) % 3];
        if ((a.z() - z) * (b.z() - z) > 0 || a.z() == b.z()) continue;
        const double f = (z - a.z()) / (b.z() - a.z());
        const Eigen::Vector2d x = (a + f * (b - a)).head<2>();
        if (n_q == 1 && (x - q[0]).squaredNorm() < 1e-24) continue;
        q[n_q++] = x;
      }
      if (n_q == 2) cut_segment(q[0], q[1], i, r, r_min);
    }
  }
}

// Every ray of every inner row must have met the surface, and at radii close together.
void check_radius_table(const RadialToothSurface& r, const std::vector<double>& r_min,
                        const std::vector<double>& row_z, const std::string& key) {
  const int n_theta = r.n_theta;
  for (int i = 1; i + 1 < r.n_z; ++i) {
    for (int j = 0; j < n_theta; ++j) {
      const size_t idx = static_cast<size_t>(i) * n_theta + j;
      const double theta_deg = 360.0 * j / n_theta;
      if (!(r.radius_mm[idx] > 0)) {
        throw InputError(key, "the tooth's long axis leaves the tooth's cross-section at z = " +
                                  fmt(row_z[i]) + " mm (no surface at " + fmt(theta_deg) +
                                  " deg around it); place the apex and crown-tip landmarks on the "
                                  "tooth's ends so the axis runs inside the tooth");
      }
      // Scan noise alone makes a ray that grazes the surface (the thin incisal edge) cross it a
      // few times within a fraction of a millimetre: only crossings further apart mean a section
      // the axis does not see whole.
      if (r.radius_mm[idx] - r_min[idx] > kStarTolerance * r.radius_mm[idx] + kStarToleranceMm) {
        throw InputError(key, "the cross-section at z = " + fmt(row_z[i]) +
                                  " mm is not star-shaped about the long axis (at " +
                                  fmt(theta_deg) + " deg the surface is crossed at " +
                                  fmt(r_min[idx]) + " and " + fmt(r.radius_mm[idx]) +
                                  " mm): Sharpey models single-rooted teeth whose cross-sections "
                                  "the axis sees whole; check the landmarks or the root's shape");
      }
    }
  }
}

// Two passes of a [1 2 1] / 4 filter in each direction: removes scan noise at the grid spacing
// (a few tenths of a mm) so that the normals the PDL offset follows are smooth. The poles stay 0.
void smooth_radius_table(RadialToothSurface* r) {
  const int n_theta = r->n_theta, n_z = r->n_z;
  for (int pass = 0; pass < 2; ++pass) {
    std::vector<double> f = r->radius_mm;
    for (int i = 1; i + 1 < n_z; ++i)
      for (int j = 0; j < n_theta; ++j)
        f[static_cast<size_t>(i) * n_theta + j] =
            0.25 * (r->radius(i, (j + n_theta - 1) % n_theta) + 2 * r->radius(i, j) +
                    r->radius(i, (j + 1) % n_theta));
    std::vector<double> g = f;
    for (int i = 2; i + 2 < n_z; ++i)
      for (int j = 0; j < n_theta; ++j) {
        const size_t idx = static_cast<size_t>(i) * n_theta + j;
        g[idx] = 0.25 * (f[idx - n_theta] + 2 * f[idx] + f[idx + n_theta]);
      }
    r->radius_mm = g;
  }
}

}  // namespace

RadialToothSurface resample_radial(const SurfaceMesh& surface, const std::string& key, int n_theta,
                                   int n_z) {
  const std::vector<double> crossings = check_axis(surface, key);
  RadialToothSurface r;
  r.n_theta = n_theta;
  r.n_z = n_z;
  r.apex_z_mm = crossings.front();
  r.tip_z_mm = crossings.back();
  r.radius_mm.assign(static_cast<size_t>(n_theta) * n_z, 0.0);
  std::vector<double> r_min(r.radius_mm.size(), std::numeric_limits<double>::infinity());
  const int mid = (n_z - 1) / 2;
  auto z_of_row = [&](int i) {
    const double s = -1.0 + 2.0 * i / (n_z - 1);
    return s < 0 ? r.apex_z_mm * (1 - (s + 1) * (s + 1)) : r.tip_z_mm * (1 - (1 - s) * (1 - s));
  };
  std::vector<double> row_z(n_z);
  for (int i = 0; i < n_z; ++i) row_z[i] = z_of_row(i);
  row_z[mid] = 0.0;
  cut_triangles(surface, row_z, &r, &r_min);
  check_radius_table(r, r_min, row_z, key);
  smooth_radius_table(&r);
  return r;
}

std::shared_ptr<const RadialToothSurface> import_tooth_surface(
    const std::string& path, const std::optional<ToothLandmarks>& landmarks, const std::string& key,
    ToothPlacement* placement_out) {
  SurfaceMesh s = read_tooth_surface(path, key);
  const ToothPlacement p =
      landmarks ? placement_from_landmarks(*landmarks, key) : principal_axis_proposal(s);
  for (auto& v : s.vertices) v = p.apply(v);
  if (p.mirrored) {
    for (auto& t : s.triangles) std::swap(t[1], t[2]);
  }
  auto r = std::make_shared<RadialToothSurface>(resample_radial(s, key));
  r->source_file = path;
  r->source_sha256 = file_sha256(path);
  if (placement_out) *placement_out = p;
  return r;
}

ToothDimensions scanned_dimensions(const RadialToothSurface& scan) {
  ToothDimensions d;
  d.root_length_mm = -scan.apex_z_mm;
  d.crown_length_mm = scan.tip_z_mm;
  const int mid = (scan.n_z - 1) / 2, m = scan.n_theta;
  // Widths across the axis along x (labiolingual) and y (mesiodistal) of row i.
  auto width = [&](int i, int j) { return scan.radius(i, j) + scan.radius(i, (j + m / 2) % m); };
  d.cervix_labiolingual_mm = width(mid, 0);
  d.cervix_mesiodistal_mm = width(mid, m / 4);
  for (int i = mid; i < scan.n_z; ++i) {
    d.crown_labiolingual_mm = std::max(d.crown_labiolingual_mm, width(i, 0));
    d.crown_mesiodistal_mm = std::max(d.crown_mesiodistal_mm, width(i, m / 4));
  }
  return d;
}

// SHA-256 (FIPS 180-4).
std::string file_sha256(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError("file", "cannot read " + path);
  std::string msg((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
  static const uint32_t k[64] = {
      0x428a2f98, 0x71374491, 0xb5c0fbcf, 0xe9b5dba5, 0x3956c25b, 0x59f111f1, 0x923f82a4,
      0xab1c5ed5, 0xd807aa98, 0x12835b01, 0x243185be, 0x550c7dc3, 0x72be5d74, 0x80deb1fe,
      0x9bdc06a7, 0xc19bf174, 0xe49b69c1, 0xefbe4786, 0x0fc19dc6, 0x240ca1cc, 0x2de92c6f,
      0x4a7484aa, 0x5cb0a9dc, 0x76f988da, 0x983e5152, 0xa831c66d, 0xb00327c8, 0xbf597fc7,
      0xc6e00bf3, 0xd5a79147, 0x06ca6351, 0x14292967, 0x27b70a85, 0x2e1b2138, 0x4d2c6dfc,
      0x53380d13, 0x650a7354, 0x766a0abb, 0x81c2c92e, 0x92722c85, 0xa2bfe8a1, 0xa81a664b,
      0xc24b8b70, 0xc76c51a3, 0xd192e819, 0xd6990624, 0xf40e3585, 0x106aa070, 0x19a4c116,
      0x1e376c08, 0x2748774c, 0x34b0bcb5, 0x391c0cb3, 0x4ed8aa4a, 0x5b9cca4f, 0x682e6ff3,
      0x748f82ee, 0x78a5636f, 0x84c87814, 0x8cc70208, 0x90befffa, 0xa4506ceb, 0xbef9a3f7,
      0xc67178f2};
  uint32_t h[8] = {0x6a09e667, 0xbb67ae85, 0x3c6ef372, 0xa54ff53a,
                   0x510e527f, 0x9b05688c, 0x1f83d9ab, 0x5be0cd19};
  const uint64_t bit_length = static_cast<uint64_t>(msg.size()) * 8;
  msg.push_back(static_cast<char>(0x80));
  while (msg.size() % 64 != 56) msg.push_back(0);
  for (int i = 7; i >= 0; --i) msg.push_back(static_cast<char>((bit_length >> (8 * i)) & 0xff));
  auto rotr = [](uint32_t x, int n) { return (x >> n) | (x << (32 - n)); };
  for (size_t chunk = 0; chunk < msg.size(); chunk += 64) {
    uint32_t w[64];
    for (int i = 0; i < 16; ++i) {
      w[i] = 0;
      for (int b = 0; b < 4; ++b)
        w[i] = (w[i] << 8) | static_cast<unsigned char>(msg[chunk + 4 * i + b]);
    }
    for (int i = 16; i < 64; ++i) {
      const uint32_t s0 = rotr(w[i - 15], 7) ^ rotr(w[i - 15], 18) ^ (w[i - 15] >> 3);
      const uint32_t s1 = rotr(w[i - 2], 17) ^ rotr(w[i - 2], 19) ^ (w[i - 2] >> 10);
      w[i] = w[i - 16] + s0 + w[i - 7] + s1;
    }
    uint32_t a = h[0], b = h[1], c = h[2], d = h[3], e = h[4], f = h[5], g = h[6], hh = h[7];
    for (int i = 0; i < 64; ++i) {
      const uint32_t S1 = rotr(e, 6) ^ rotr(e, 11) ^ rotr(e, 25);
      const uint32_t ch = (e & f) ^ (~e & g);
      const uint32_t t1 = hh + S1 + ch + k[i] + w[i];
      const uint32_t S0 = rotr(a, 2) ^ rotr(a, 13) ^ rotr(a, 22);
      const uint32_t maj = (a & b) ^ (a & c) ^ (b & c);
      const uint32_t t2 = S0 + maj;
      hh = g;
      g = f;
      f = e;
      e = d + t1;
      d = c;
      c = b;
      b = a;
      a = t1 + t2;
    }
    h[0] += a;
    h[1] += b;
    h[2] += c;
    h[3] += d;
    h[4] += e;
    h[5] += f;
    h[6] += g;
    h[7] += hh;
  }
  char out[65];
  for (int i = 0; i < 8; ++i) std::snprintf(out + 8 * i, 9, "%08x", h[i]);
  return std::string(out, 64);
}

}  // namespace sharpey::mesh
