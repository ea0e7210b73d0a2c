// The incisor sample case with the coarse mesh preset (test override for speed), solved once per
// test program and shared by its tests.
#pragma once

#include <QImage>
#include <QString>
#include <memory>

#include "sharpey/analysis/study.h"

namespace sharpey::app::testing {

// Path of samples/maxillary_central_incisor_bone_loss.json in the source tree.
QString incisor_sample_path();
// The sample with the coarse preset and at most `max_scenarios` bone levels.
analysis::CaseSpec coarse_incisor(int max_scenarios);
// Solved once per process for a given max_scenarios (the first call pays).
std::shared_ptr<const analysis::Study> solved_incisor(int max_scenarios);
// Writes `image` to $SHARPEY_SCREENSHOT_DIR/<name>.png when that variable is set.
void keep_image(const QImage& image, const QString& name);

}  // namespace sharpey::app::testing
