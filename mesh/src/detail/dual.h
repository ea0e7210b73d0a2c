// Forward-mode automatic differentiation with two partial derivatives, used to get exact
// tangents and normals of the parametric tooth surface from one templated definition.
#pragma once

#include <cmath>

namespace sharpey::mesh::detail {

// v + d[0] e0 + d[1] e1 with e0^2 = e1^2 = e0 e1 = 0.
struct Dual2 {
  double v = 0;
  double d[2] = {0, 0};
  Dual2() = default;
  Dual2(double value) : v(value) {}  // NOLINT: constants convert implicitly
  Dual2(double value, double d0, double d1) : v(value), d{d0, d1} {}
};

inline Dual2 chain(const Dual2& x, double f, double df) { return {f, df * x.d[0], df * x.d[1]}; }

inline Dual2 operator+(const Dual2& a, const Dual2& b) {
  return {a.v + b.v, a.d[0] + b.d[0], a.d[1] + b.d[1]};
}
inline Dual2 operator-(const Dual2& a, const Dual2& b) {
  return {a.v - b.v, a.d[0] - b.d[0], a.d[1] - b.d[1]};
}
inline Dual2 operator-(const Dual2& a) { return {-a.v, -a.d[0], -a.d[1]}; }
inline Dual2 operator*(const Dual2& a, const Dual2& b) {
  return {a.v * b.v, a.d[0] * b.v + a.v * b.d[0], a.d[1] * b.v + a.v * b.d[1]};
}
inline Dual2 operator/(const Dual2& a, const Dual2& b) {
  const double inv = 1.0 / b.v;
  return {a.v * inv, (a.d[0] - a.v * inv * b.d[0]) * inv, (a.d[1] - a.v * inv * b.d[1]) * inv};
}
inline Dual2 operator+(const Dual2& a, double b) { return {a.v + b, a.d[0], a.d[1]}; }
inline Dual2 operator+(double a, const Dual2& b) { return b + a; }
inline Dual2 operator-(const Dual2& a, double b) { return {a.v - b, a.d[0], a.d[1]}; }
inline Dual2 operator-(double a, const Dual2& b) { return {a - b.v, -b.d[0], -b.d[1]}; }
inline Dual2 operator*(const Dual2& a, double b) { return {a.v * b, a.d[0] * b, a.d[1] * b}; }
inline Dual2 operator*(double a, const Dual2& b) { return b * a; }
inline Dual2 operator/(const Dual2& a, double b) { return a * (1.0 / b); }
inline Dual2 operator/(double a, const Dual2& b) { return Dual2(a) / b; }

inline Dual2 sqrt(const Dual2& x) {
  const double r = std::sqrt(x.v);
  return chain(x, r, 0.5 / r);
}
inline Dual2 sin(const Dual2& x) { return chain(x, std::sin(x.v), std::cos(x.v)); }
inline Dual2 cos(const Dual2& x) { return chain(x, std::cos(x.v), -std::sin(x.v)); }
inline Dual2 expm1(const Dual2& x) { return chain(x, std::expm1(x.v), std::exp(x.v)); }
inline Dual2 log1p(const Dual2& x) { return chain(x, std::log1p(x.v), 1.0 / (1.0 + x.v)); }

inline double value(double x) { return x; }
inline double value(const Dual2& x) { return x.v; }

}  // namespace sharpey::mesh::detail
