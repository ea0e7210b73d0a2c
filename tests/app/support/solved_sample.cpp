#include "support/solved_sample.h"

#include <QDir>
#include <QImage>
#include <map>

namespace sharpey::app::testing {

QString incisor_sample_path() {
  return QStringLiteral(SHARPEY_SOURCE_DIR "/samples/maxillary_central_incisor_bone_loss.json");
}

analysis::CaseSpec coarse_incisor(int max_scenarios) {
  analysis::CaseSpec spec = analysis::load_case(incisor_sample_path().toStdString());
  spec.model.sizing.preset = mesh::MeshPreset::kCoarse;
  if (static_cast<int>(spec.scenarios.size()) > max_scenarios)
    spec.scenarios.resize(static_cast<size_t>(max_scenarios));
  return spec;
}

std::shared_ptr<const analysis::Study> solved_incisor(int max_scenarios) {
  static std::map<int, std::shared_ptr<const analysis::Study>> cache;
  auto& slot = cache[max_scenarios];
  if (!slot) slot = std::make_shared<const analysis::Study>(coarse_incisor(max_scenarios));
  return slot;
}

void keep_image(const QImage& image, const QString& name) {
  const QByteArray dir = qgetenv("SHARPEY_SCREENSHOT_DIR");
  if (dir.isEmpty()) return;
  QDir().mkpath(QString::fromLocal8Bit(dir));
  image.save(QDir(QString::fromLocal8Bit(dir)).filePath(name + QStringLiteral(".png")));
}

}  // namespace sharpey::app::testing
