#include "thin_layer.h"

#include <Eigen/Dense>
#include <cmath>
#include <vector>

#include "sharpey/core/constants.h"

namespace sharpey::test {

CresFractions thin_layer_fractions(const mesh::ModelSpec& model, const fem::Material& pdl,
                                   double crest_z, double apex_z) {
  using sharpey::core::kPi;
  const double E = pdl.young_modulus_mpa, nu = pdl.poisson_ratio;
  const double mu = E / (2 * (1 + nu)), lambda = E * nu / ((1 + nu) * (1 - 2 * nu));
  const double k_n = lambda + 2 * mu, k_s = mu;  // per unit area times the (uniform) width
  // Heights crowd near the apex, where the half-widths change fast (a ~ sqrt(z - apex_z)).
  const int n = 3000, n_theta = 96;
  std::vector<double> z(n + 1), a(n + 1), b(n + 1);
  for (int i = 0; i <= n; ++i) {
    const double t = static_cast<double>(i) / n;
    z[i] = apex_z + (crest_z - apex_z) * t * t;
    if (i == 0) continue;  // a = b = 0 at the apex
    const mesh::RootSection s = mesh::root_section(model, z[i]);
    a[i] = s.labiolingual_half_mm;
    b[i] = s.mesiodistal_half_mm;
  }
  Eigen::Matrix<double, 6, 6> K = Eigen::Matrix<double, 6, 6>::Zero();
  for (int i = 0; i < n; ++i) {
    const double dz = z[i + 1] - z[i];
    const double zm = 0.5 * (z[i] + z[i + 1]), am = 0.5 * (a[i] + a[i + 1]),
                 bm = 0.5 * (b[i] + b[i + 1]);
    const double da = (a[i + 1] - a[i]) / dz, db = (b[i + 1] - b[i]) / dz;
    for (int j = 0; j < n_theta; ++j) {
      const double th = (j + 0.5) * 2 * kPi / n_theta, c = std::cos(th), s = std::sin(th);
      // X_theta x X_z, outward; its length is the area per unit theta and z.
      const Eigen::Vector3d cross(bm * c, am * s, -(am * db * s * s + da * bm * c * c));
      const double area = cross.norm() * (2 * kPi / n_theta) * dz;
      const Eigen::Vector3d N = cross.normalized();
      const Eigen::Vector3d p(am * c, bm * s, zm);
      const Eigen::Matrix3d k = area * (k_n * N * N.transpose() +
                                        k_s * (Eigen::Matrix3d::Identity() - N * N.transpose()));
      Eigen::Matrix3d P;  // u(p) = t + w x p = t - [p]x w
      P << 0, -p.z(), p.y(), p.z(), 0, -p.x(), -p.y(), p.x(), 0;
      Eigen::Matrix<double, 3, 6> B;
      B << Eigen::Matrix3d::Identity(), -P;
      K += B.transpose() * k * B;
    }
  }
  const Eigen::Matrix<double, 6, 6> C = K.inverse();
  // Force along x through (0, 0, h): rotation about y is C(4,0) + h C(4,4) (moment h F about y).
  // Force along y through (0, 0, h): rotation about x is C(3,1) - h C(3,3).
  const double zx = -C(4, 0) / C(4, 4), zy = C(3, 1) / C(3, 3);
  const double L = crest_z - apex_z;
  return {(crest_z - zx) / L, (crest_z - zy) / L};
}

}  // namespace sharpey::test
