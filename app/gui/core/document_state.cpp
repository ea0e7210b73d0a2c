#include "core/document_state.h"

#include <QDir>
#include <QFileInfo>

namespace sharpey::app {

void DocumentState::reset_untitled() {
  path_.clear();
  modified_ = false;
}

void DocumentState::opened(const QString& path) {
  path_ = path;
  modified_ = false;
}

void DocumentState::saved(const QString& path) {
  path_ = path;
  modified_ = false;
}

void DocumentState::recovered(const QString& original_path) {
  path_ = original_path;
  modified_ = true;
}

void DocumentState::mark_modified() { modified_ = true; }

QString DocumentState::display_name() const {
  if (path_.isEmpty()) return QStringLiteral("Untitled case");
  return QFileInfo(path_).fileName();
}

QString DocumentState::window_title() const {
  return display_name() + (modified_ ? QStringLiteral("*") : QString()) +
         QStringLiteral(" \u2013 Sharpey");
}

QString RecentFiles::normalise(const QString& path) {
  return QDir::cleanPath(QFileInfo(path).absoluteFilePath());
}

void RecentFiles::add(const QString& path) {
  if (path.isEmpty()) return;
  const QString p = normalise(path);
  paths_.removeAll(p);
  paths_.prepend(p);
  while (paths_.size() > capacity_) paths_.removeLast();
}

void RecentFiles::remove(const QString& path) { paths_.removeAll(normalise(path)); }

void RecentFiles::remove_missing() {
  QStringList kept;
  for (const QString& p : paths_)
    if (QFileInfo::exists(p)) kept.append(p);
  paths_ = kept;
}

void RecentFiles::set_paths(const QStringList& paths) {
  paths_.clear();
  // Oldest first so that add() leaves the original order.
  for (auto it = paths.crbegin(); it != paths.crend(); ++it) add(*it);
}

}  // namespace sharpey::app
