// A tooth from a triangulated surface scan: reading and checking the file, placing the tooth in
// the tooth coordinate system, and the radial resampling the model builder meshes.
//
// Plain data only: CGAL (which reads and checks the file) stays inside
// mesh/src/tooth_surface_read.cpp.
#pragma once

#include <Eigen/Core>
#include <array>
#include <memory>
#include <optional>
#include <string>
#include <vector>

namespace sharpey::mesh {

// A closed triangulated surface: vertex coordinates (file units, mm after checking) and
// triangles as vertex indices, counter-clockwise seen from outside.
struct SurfaceMesh {
  std::vector<Eigen::Vector3d> vertices;
  std::vector<std::array<int, 3>> triangles;
};

// Reads a tooth surface (STL binary or ASCII, PLY, OBJ; chosen by the file extension) with CGAL
// and checks it. Throws InputError with key `key` and a message naming the defect and where it is
// (coordinates of the first offending edge, vertex or triangle): unreadable, empty, truncated
// binary STL, polygons that are not triangles, degenerate triangles, not closed (boundary
// edges), non-manifold edges or vertices, inconsistent orientation, self-intersections,
// inverted (inward) orientation, fewer than kMinScanTriangles triangles, a size that looks like
// metres or micrometres (refused with the factor to apply), or an otherwise implausible size.
// Never repairs silently.
constexpr int kMinScanTriangles = 200;
// A plausible single-rooted tooth: longest bounding-box extent, mm (common practice: 17 to 33 mm
// for permanent single-rooted teeth; the range is generous).
constexpr double kMinToothExtentMm = 10.0;
constexpr double kMaxToothExtentMm = 45.0;
SurfaceMesh read_tooth_surface(const std::string& path, const std::string& key = "tooth.surface");

// Writes a surface as binary or ASCII STL (used by tests, the sample generator and round trips);
// `title` goes into the binary header (at most 79 characters, must not start with "solid") or
// the ASCII solid's name. Throws InputError (key "file") when the file cannot be written.
void write_stl(const SurfaceMesh& surface, const std::string& path, bool binary,
               const std::string& title = "sharpey surface");

// Points on the surface, in the file's coordinates, that place the tooth: the root apex, the
// incisal edge / cusp tip, and CEJ points on the four sides.
struct ToothLandmarks {
  Eigen::Vector3d apex = Eigen::Vector3d::Zero();
  Eigen::Vector3d crown_tip = Eigen::Vector3d::Zero();
  Eigen::Vector3d cej_labial = Eigen::Vector3d::Zero();
  Eigen::Vector3d cej_lingual = Eigen::Vector3d::Zero();
  Eigen::Vector3d cej_mesial = Eigen::Vector3d::Zero();
  Eigen::Vector3d cej_distal = Eigen::Vector3d::Zero();
};

// Rigid placement p_tooth = rotation * p_file + translation, with rotation orthonormal; when
// `mirrored` is true the rotation has determinant -1 (the mesial landmark lay on the other side
// of the labial-axis plane: a tooth of the other side of the mouth, mirrored so that y is mesial).
struct ToothPlacement {
  Eigen::Matrix3d rotation = Eigen::Matrix3d::Identity();
  Eigen::Vector3d translation = Eigen::Vector3d::Zero();
  bool mirrored = false;
  Eigen::Vector3d apply(const Eigen::Vector3d& p) const { return rotation * p + translation; }
};

// Placement from landmarks: z along apex -> crown tip, origin on that axis at the mean height of
// the four CEJ points, x toward the labial CEJ point from the lingual one (perpendicular to z),
// y = z x x (mirrored when the mesial point is on the -y side). Throws InputError (key `key`)
// when the landmarks are inconsistent (apex and tip closer than 5 mm, labial and lingual CEJ
// points not separated across the axis, mesial and distal points on the same side, CEJ points
// outside the apex-tip span).
ToothPlacement placement_from_landmarks(const ToothLandmarks& landmarks, const std::string& key);

// Proposal without landmarks: the long axis is the principal axis of largest extent of the
// surface (area-weighted), pointing toward the wider end (the crown); x is the principal axis of
// the cross-section's larger extent (its sign is not known: the user must check which side is
// labial, and mesial may come out mirrored); the CEJ level is put 40 % of the length below the
// crown tip (common practice: crowns are 35 to 45 % of a single-rooted tooth's length). A
// proposal only: the case must accept it explicitly (tooth.surface.accept_principal_axes).
ToothPlacement principal_axis_proposal(const SurfaceMesh& surface);

// The tooth surface resampled as a radius table about the long axis in the tooth coordinate
// system: r(theta, z) at n_theta angles (theta = 2 pi j / n_theta, 0 labial, pi/2 mesial) and
// n_z rows (n_z odd) at s_i = -1 + 2 i / (n_z - 1), z = apex_z (1 - (s + 1)^2) on the root
// (s <= 0) and tip_z (1 - (1 - s)^2) on the crown, so row (n_z - 1) / 2 is the CEJ plane z = 0
// and rows crowd toward the poles; r is the farthest crossing of the horizontal ray from the
// axis, 0 at the two poles, smoothed (resample_radial). Requires cross-sections that are
// star-shaped about the axis (single-rooted teeth).
struct RadialToothSurface {
  int n_theta = 0, n_z = 0;
  double apex_z_mm = 0, tip_z_mm = 0;  // where the axis leaves the surface (apex < 0 < tip)
  std::vector<double> radius_mm;       // [i_z * n_theta + j_theta]
  std::string source_file;             // the file it came from, for outputs
  std::string source_sha256;           // checksum of that file
  double radius(int i_z, int j_theta) const {
    return radius_mm[static_cast<size_t>(i_z) * n_theta + j_theta];
  }
};

// Resamples `surface` (already in tooth coordinates) into a radial table. Throws InputError (key
// `key`) when the axis does not pass through the surface, when a section is not star-shaped
// about the axis (a ray crosses the surface at radii more than 10 % + 0.25 mm apart; closer
// crossings are scan noise at grazing incidence and the outermost one counts), when the surface
// reaches more than 0.5 mm beyond the axis' crossings at either end (a landmark off the tooth's
// end), or when the CEJ plane z = 0 does not cut the tooth. The table is smoothed by two passes
// of a [1 2 1] / 4 filter in each direction (scan noise at the grid spacing).
RadialToothSurface resample_radial(const SurfaceMesh& surface, const std::string& key,
                                   int n_theta = 128, int n_z = 241);

// The whole import: read and check, place (landmarks, or the principal-axis proposal when
// `landmarks` is empty), resample. `placement_out` (may be null) receives the placement used.
std::shared_ptr<const RadialToothSurface> import_tooth_surface(
    const std::string& path, const std::optional<ToothLandmarks>& landmarks, const std::string& key,
    ToothPlacement* placement_out = nullptr);

// SHA-256 of a file's bytes, lower-case hex. Throws InputError (key "file") when unreadable.
std::string file_sha256(const std::string& path);

}  // namespace sharpey::mesh
