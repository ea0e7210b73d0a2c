// The 3D picture of a multi-rooted tooth's root surface (trunk, furcation roof and roots): the
// library's surface points (analysis::MultiRootScenarioResult::surface) drawn as small spheres,
// coloured by the thin-layer pressure where the ligament is attached and stone grey where the
// bone is lost, on the app's umber background, seen from the buccal side with the crown up. A
// legend (what the colours mean, the method) is painted over the view.
#pragma once

#include <vtkSmartPointer.h>

#include <QString>

#include "core/colour_map.h"
#include "sharpey/analysis/multi_root_case.h"

class vtkActor;

namespace sharpey::app {

class VtkView;

class MolarScene {
 public:
  explicit MolarScene(VtkView* view);
  // Shows `r`'s surface coloured with `scale`; `title` names the scenario in the legend.
  void show(const analysis::MultiRootScenarioResult& r, const ColourScale& scale,
            const QString& title);
  // Points drawn attached and lost at the last show() (for tests).
  int n_attached() const { return n_attached_; }
  int n_lost() const { return n_lost_; }

 private:
  void reset_camera(const analysis::MultiRootScenarioResult& r);

  VtkView* view_;
  vtkSmartPointer<vtkActor> actor_;
  int n_attached_ = 0, n_lost_ = 0;
  bool camera_set_ = false;
};

// Colour of the root surface where the bone is lost (no ligament).
Rgb lost_surface_colour();

}  // namespace sharpey::app
