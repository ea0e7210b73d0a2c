// Constants shared by every Sharpey library, written once.
#pragma once

namespace sharpey::core {

inline constexpr double kPi = 3.14159265358979323846;
inline constexpr double kDegreesPerRadian = 180.0 / kPi;
inline constexpr double kRadiansPerDegree = kPi / 180.0;

// One gram-force in newtons: standard gravity 9.80665 m/s^2 (CGPM 1901, the conventional value;
// published) times 1 g.
inline constexpr double kNewtonsPerGramForce = 0.00980665;

}  // namespace sharpey::core
