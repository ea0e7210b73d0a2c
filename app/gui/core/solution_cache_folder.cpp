#include "core/solution_cache_folder.h"

#include <QDir>
#include <QStandardPaths>

namespace sharpey::app {

QString solution_cache_folder() {
  const QString chosen = qEnvironmentVariable("SHARPEY_CACHE_DIR");
  if (!chosen.isEmpty()) return chosen;
  return QDir(QStandardPaths::writableLocation(QStandardPaths::CacheLocation))
      .filePath(QStringLiteral("solutions"));
}

std::uint64_t solution_cache_max_bytes() {
  bool ok = false;
  const qulonglong mb = qEnvironmentVariable("SHARPEY_CACHE_MAX_MB").toULongLong(&ok);
  return (ok ? mb : kDefaultSolutionCacheMb) * 1024ull * 1024ull;
}

std::shared_ptr<const analysis::SolutionCache> make_solution_cache(const QString& folder) {
  const std::uint64_t max_bytes = solution_cache_max_bytes();
  if (max_bytes == 0) return nullptr;
  const QString where = folder.isEmpty() ? solution_cache_folder() : folder;
  return std::make_shared<analysis::SolutionCache>(where.toStdString(), max_bytes);
}

}  // namespace sharpey::app
