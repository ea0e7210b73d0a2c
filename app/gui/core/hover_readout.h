// The hover read-out: the value of the shown quantity under the mouse (with its unit) and where
// that is on the root (depth below the CEJ, side around the long axis). Plain logic, no widgets:
// the 3D view hands in a picked triangle of the PDL surface and the point on it, the root map a
// position in its angle-by-depth grid.
#pragma once

#include <Eigen/Core>
#include <QString>
#include <array>
#include <vector>

#include "core/quantity.h"
#include "sharpey/analysis/study.h"

namespace sharpey::app {

struct HoverReadout {
  bool has_position = false;  // something of the root is under the mouse
  bool has_value = false;     // and the quantity has a value there (false: no ligament)
  double value = 0;           // in the quantity's display unit
  Quantity quantity = Quantity::kPressure;
  double depth_mm = 0;   // below the CEJ (positive toward the apex)
  double angle_deg = 0;  // around the long axis: 0 labial, 90 mesial, 180 lingual, -90 distal
};

// Polar angle around the long axis of a point in the tooth frame (x labial, y mesial), degrees in
// (-180, 180]; 0 on the axis itself.
double angle_around_axis_deg(const Eigen::Vector3d& p);

// Side of the root at an angle (degrees, any turn): one of eight 45-degree sectors, "labial",
// "mesiolabial", "mesial", "mesiolingual", "lingual", "distolingual", "distal", "distolabial".
QString side_name(double angle_deg);

// Linear interpolation of per-point `values` on triangle `triangle` of a surface at `p` (a point
// on or near that triangle; it is projected onto the triangle's plane and clamped to it).
// NaN when the index is out of range, the triangle is degenerate or a corner value is not finite.
double value_on_triangle(const std::vector<Eigen::Vector3d>& points,
                         const std::vector<std::array<int, 3>>& triangles,
                         const std::vector<double>& values, int triangle, const Eigen::Vector3d& p);

// Read-out at a point `p` (tooth frame, mm) picked on triangle `triangle` of the PDL display
// surface; `values` one per surface point in the quantity's unit.
HoverReadout surface_readout(const std::vector<Eigen::Vector3d>& points,
                             const std::vector<std::array<int, 3>>& triangles,
                             const std::vector<double>& values, Quantity quantity, int triangle,
                             const Eigen::Vector3d& p);

// The root map's pressure at fractional cell coordinates (column x, row y; cell centres at
// integers), as the map is drawn: bilinear between the four nearest cell centres, periodic in
// angle, rows clamped; where one of the four has no ligament, the nearest cell's value (so the
// crest edge stays sharp). NaN where there is no ligament.
double root_map_sample(const analysis::RootMap& map, double x, double y);

// Read-out of the root map's pressure at an angle (degrees, any turn) and a depth below the CEJ
// (mm), as the map shows it (root_map_sample). No position outside the map's depth range; no
// value where there is no ligament (above the crest).
HoverReadout root_map_readout(const analysis::RootMap& map, double angle_deg, double depth_mm);

// "hydrostatic pressure 12.3 kPa | 5.2 mm below the CEJ, mesiolabial (52°)"; without a value the
// position with "no ligament"; an empty string without a position.
QString describe(const HoverReadout& r);

}  // namespace sharpey::app
