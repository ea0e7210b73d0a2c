// The import of a scanned tooth surface, without any widget: what the import dialog shows and
// asks, and the case it builds.
//
// Steps: read and check the surface (mesh::read_tooth_surface; a bad file gives the library's
// message, naming the defect and where it is); take its landmarks from a case file
// (tooth.surface.landmarks) or else the principal-axis proposal (mesh::principal_axis_proposal);
// let the user turn the proposal round (crown and apex swapped, labial and lingual swapped, mesial
// and distal swapped for a tooth of the other side), choose the tooth type and confirm; then
// build a case whose tooth.surface names the file with landmarks that place the tooth exactly as
// confirmed. The case is checked and the surface imported by the analysis library
// (analysis::parse_case), the same way as a case file, so it solves as usual.
// QtCore only, so it is tested without a display.
#pragma once

#include <QString>
#include <array>
#include <optional>
#include <vector>

#include "sharpey/analysis/case_spec.h"
#include "sharpey/mesh/tooth_surface.h"

namespace sharpey::app {

// Where the tooth axis shown comes from.
enum class AxisSource { kNone, kLandmarks, kPrincipalAxes };

// A landmark as shown: its name ("apex", "labial CEJ", ...) and position in tooth coordinates, mm.
struct ShownLandmark {
  QString name;
  Eigen::Vector3d point_mm = Eigen::Vector3d::Zero();
};

class SurfaceImport {
 public:
  // Reads and checks the surface file. False on a bad file: error() has the library's message;
  // the surface read before (if any) is dropped so nothing stale is shown. Landmarks read from a
  // case file are kept only when they were read for this same file (see read_landmarks).
  bool read_surface(const QString& path);
  // Takes the landmarks of a case file's tooth.surface (apex, crown_tip and the four CEJ points,
  // in the surface file's coordinates). False when the case file cannot be read or has no such
  // landmarks (error() says which); the axis stays as it was then. Needs a surface read first.
  bool read_landmarks(const QString& case_path);
  // Back to the principal-axis proposal.
  void clear_landmarks();

  bool has_surface() const { return surface_.has_value(); }
  const QString& error() const { return error_; }
  const QString& surface_path() const { return path_; }
  const mesh::SurfaceMesh* surface() const { return surface_ ? &*surface_ : nullptr; }
  AxisSource axis_source() const;
  const std::optional<mesh::ToothLandmarks>& file_landmarks() const { return landmarks_; }

  // Turning the proposal round. Each toggles from the placement of the landmarks or the proposal.
  // Swapping crown and apex puts the CEJ 40 % of the length below the new crown end (the
  // proposal's rule, mesh::principal_axis_proposal).
  void set_swap_crown_apex(bool on) { swap_crown_apex_ = on; }
  void set_swap_labial_lingual(bool on) { swap_labial_lingual_ = on; }
  void set_swap_mesial_distal(bool on) { swap_mesial_distal_ = on; }
  bool swap_crown_apex() const { return swap_crown_apex_; }
  bool swap_labial_lingual() const { return swap_labial_lingual_; }
  bool swap_mesial_distal() const { return swap_mesial_distal_; }
  bool turned() const { return swap_crown_apex_ || swap_labial_lingual_ || swap_mesial_distal_; }

  void set_tooth_type(mesh::ToothType type) { type_ = type; }
  mesh::ToothType tooth_type() const { return type_; }
  // The user has looked at the axis and accepts it.
  void set_confirmed(bool on) { confirmed_ = on; }
  bool confirmed() const { return confirmed_; }

  // The placement shown (file -> tooth coordinates); identity without a surface.
  mesh::ToothPlacement placement() const;
  // The surface's vertices in tooth coordinates (for the view); triangles are surface()'s.
  std::vector<Eigen::Vector3d> placed_vertices() const;
  // The six landmarks the case will carry, in tooth coordinates: the file's own (unturned), or
  // points derived from the placement: apex and crown end on the axis at the surface's lowest and
  // highest level, and the CEJ points where the CEJ plane's rays toward labial, lingual, mesial
  // and distal leave the surface.
  std::vector<ShownLandmark> shown_landmarks() const;
  // The same six landmarks in the surface file's coordinates.
  mesh::ToothLandmarks case_landmarks() const;
  // Length of the surface along the axis and its largest width across it, mm.
  double length_mm() const;

  // The case: a new invented-case layout (healthy and 3 mm loss, 100 g lingual, standard mesh)
  // with tooth.type and tooth.surface {file (absolute path), landmarks}. Throws InputError: not
  // confirmed yet, no surface, or the analysis library's message when it refuses the case.
  analysis::CaseSpec build_case() const;

 private:
  mesh::ToothPlacement base_placement() const;

  QString path_;
  QString error_;
  std::optional<mesh::SurfaceMesh> surface_;
  std::optional<mesh::ToothLandmarks> landmarks_;
  bool swap_crown_apex_ = false;
  bool swap_labial_lingual_ = false;
  bool swap_mesial_distal_ = false;
  mesh::ToothType type_ = mesh::ToothType::kMaxillaryCentralIncisor;
  bool confirmed_ = false;
};

// The case a new document starts from (CaseSession::new_case uses it too): maxillary central
// incisor, healthy and 3 mm loss, 100 g lingual, the standard mesh.
analysis::CaseSpec default_new_case();

}  // namespace sharpey::app
