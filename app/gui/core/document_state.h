// File state of the open case: its path, unsaved changes, the window title, recent files.
// Plain logic (QtCore only); the main window asks it what to show and whether to prompt.
#pragma once

#include <QString>
#include <QStringList>

namespace sharpey::app {

class DocumentState {
 public:
  // A new, untitled case without changes.
  void reset_untitled();
  // The case was read from `path` (no unsaved changes).
  void opened(const QString& path);
  // The case was written to `path` (save or save as).
  void saved(const QString& path);
  // A recovered autosave: unsaved changes that belong to `original_path` (may be empty).
  void recovered(const QString& original_path);
  void mark_modified();

  bool modified() const { return modified_; }
  bool untitled() const { return path_.isEmpty(); }
  const QString& path() const { return path_; }
  // File name without folder, or "Untitled case".
  QString display_name() const;
  // "name.json* - Sharpey" style title; the star marks unsaved changes.
  QString window_title() const;
  // True when closing or replacing the case should ask about unsaved changes.
  bool needs_save_prompt() const { return modified_; }
  // Save needs a file name first (untitled): the app runs Save As instead.
  bool save_needs_path() const { return path_.isEmpty(); }

 private:
  QString path_;
  bool modified_ = false;
};

// Most-recently-used file list: newest first, no duplicates (compared by absolute, cleaned path),
// at most `capacity` entries.
class RecentFiles {
 public:
  explicit RecentFiles(int capacity = 8) : capacity_(capacity) {}
  void add(const QString& path);
  void remove(const QString& path);
  // Drops entries whose file no longer exists.
  void remove_missing();
  const QStringList& paths() const { return paths_; }
  void set_paths(const QStringList& paths);  // e.g. from QSettings; normalised and trimmed

 private:
  static QString normalise(const QString& path);
  int capacity_;
  QStringList paths_;
};

}  // namespace sharpey::app
