// Plain-data tetrahedral mesh shared by the mesher, the solver and the analyses.
#pragma once

#include <Eigen/Core>
#include <vector>

namespace sharpey::mesh {

// Region ids carried per element (also the `region` cell array of every .vtu file).
enum Region : int {
  kTooth = 1,
  kPdl = 2,
  kCorticalBone = 3,
  kCancellousBone = 4,
  // 5 and up: further regions (enamel, pulp) if a model has them.
};

// Markers of boundary and interface triangles.
enum FaceMarker : int {
  kRootSurface = 1,    // tooth/PDL interface (PDL inner surface)
  kSocketSurface = 2,  // PDL/bone interface (PDL outer surface)
  kCrownSurface = 3,   // free crown surface outside the bracket pad
  kBracketPad = 4,     // patch on the labial crown surface where the force system acts
  kFixedBone = 5,      // bone faces held fixed (block sides away from the tooth and the base)
  kExposedRoot = 6,    // root surface above the alveolar crest (no PDL)
  kFreeBone = 7,       // free bone surface (crest top, defect walls)
  kPdlCrest = 8,       // free top of the PDL at the alveolar crest
  kOther = 9,          // any other boundary face (verification geometries use their own numbers)
};

// Tetrahedral mesh of 4-node or 10-node elements in VTK node order:
// vertices 0-3, then midside nodes on edges (0,1) (1,2) (0,2) (0,3) (1,3) (2,3).
// Boundary/interface triangles have 3 or 6 nodes in VTK order: vertices 0-2, then (0,1) (1,2)
// (0,2). Coordinates in mm, in the tooth coordinate system for tooth models (origin on the long
// axis at the CEJ level, z toward the crown, x labial/buccal, y mesial).
struct VolumeMesh {
  std::vector<Eigen::Vector3d> nodes;  // mm
  int nodes_per_element = 10;          // 4 or 10
  std::vector<int> elements;           // n_elements() * nodes_per_element node indices
  std::vector<int> element_region;     // Region id per element
  int nodes_per_face = 6;              // 3 or 6
  std::vector<int> faces;              // n_faces() * nodes_per_face node indices
  std::vector<int> face_marker;        // FaceMarker (or a test's own number) per face

  int n_nodes() const { return static_cast<int>(nodes.size()); }
  int n_elements() const { return static_cast<int>(element_region.size()); }
  int n_faces() const { return static_cast<int>(face_marker.size()); }
  const int* element(int e) const {
    return elements.data() + static_cast<size_t>(e) * nodes_per_element;
  }
  const int* face(int f) const { return faces.data() + static_cast<size_t>(f) * nodes_per_face; }
};

}  // namespace sharpey::mesh
