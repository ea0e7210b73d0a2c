// Autosave with recovery after a crash. Each running app owns one session in a folder: its
// autosave copy of the case (JSON) and a lock file held while the session lives. A copy whose
// lock is no longer held belongs to a session that ended without closing cleanly: it is offered
// for recovery at the next start. Plain logic (QtCore only).
#pragma once

#include <QDateTime>
#include <QString>
#include <memory>
#include <vector>

class QLockFile;

namespace sharpey::app {

struct RecoverableCase {
  QString case_path;      // the autosaved case JSON
  QString original_path;  // the file it was opened from or saved to; empty when untitled
  QDateTime saved_at;
  QString label;  // the case label, for the recovery prompt
};

class AutosaveStore {
 public:
  // `folder` is created when missing. Takes this session's lock at once.
  explicit AutosaveStore(const QString& folder);
  ~AutosaveStore();
  AutosaveStore(const AutosaveStore&) = delete;
  AutosaveStore& operator=(const AutosaveStore&) = delete;

  // Writes this session's copy atomically; returns false (with `error`) on I/O failure.
  bool write(const QString& case_json, const QString& original_path, const QString& label,
             QString* error = nullptr);
  // Removes this session's copy (after a save, or at a clean exit).
  void discard();
  bool has_copy() const;

  // Copies left by sessions that are no longer running (never this session's own).
  std::vector<RecoverableCase> recoverable() const;
  // Deletes a recoverable copy (after it was recovered or declined).
  static void remove(const RecoverableCase& entry);

  const QString& folder() const { return folder_; }
  const QString& session_id() const { return session_; }

 private:
  QString copy_path() const;
  QString meta_path() const;
  QString folder_;
  QString session_;
  std::unique_ptr<QLockFile> lock_;
};

}  // namespace sharpey::app
