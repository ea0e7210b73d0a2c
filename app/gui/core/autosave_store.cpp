#include "core/autosave_store.h"

#include <QDir>
#include <QFile>
#include <QJsonDocument>
#include <QJsonObject>
#include <QLockFile>
#include <QSaveFile>
#include <QUuid>

namespace sharpey::app {

namespace {
// File names: <session>.case.json, <session>.meta.json, <session>.lock
const QString kCaseSuffix = QStringLiteral(".case.json");
const QString kMetaSuffix = QStringLiteral(".meta.json");
const QString kLockSuffix = QStringLiteral(".lock");

bool write_atomically(const QString& path, const QByteArray& bytes, QString* error) {
  QSaveFile file(path);
  if (!file.open(QIODevice::WriteOnly) || file.write(bytes) != bytes.size() || !file.commit()) {
    if (error) *error = QStringLiteral("cannot write %1: %2").arg(path, file.errorString());
    return false;
  }
  return true;
}
}  // namespace

AutosaveStore::AutosaveStore(const QString& folder)
    : folder_(folder), session_(QUuid::createUuid().toString(QUuid::WithoutBraces)) {
  QDir().mkpath(folder_);
  lock_ = std::make_unique<QLockFile>(QDir(folder_).filePath(session_ + kLockSuffix));
  lock_->setStaleLockTime(0);
  lock_->tryLock(0);
}

AutosaveStore::~AutosaveStore() {
  // The copy stays unless discard() ran (a clean exit discards it); only the lock goes.
  lock_->unlock();
}

QString AutosaveStore::copy_path() const { return QDir(folder_).filePath(session_ + kCaseSuffix); }
QString AutosaveStore::meta_path() const { return QDir(folder_).filePath(session_ + kMetaSuffix); }

bool AutosaveStore::write(const QString& case_json, const QString& original_path,
                          const QString& label, QString* error) {
  QJsonObject meta;
  meta.insert(QStringLiteral("original_path"), original_path);
  meta.insert(QStringLiteral("saved_at"),
              QDateTime::currentDateTimeUtc().toString(Qt::ISODateWithMs));
  meta.insert(QStringLiteral("label"), label);
  // Case first, then its description: a meta file always points at a complete case.
  return write_atomically(copy_path(), case_json.toUtf8(), error) &&
         write_atomically(meta_path(), QJsonDocument(meta).toJson(), error);
}

void AutosaveStore::discard() {
  QFile::remove(meta_path());
  QFile::remove(copy_path());
}

bool AutosaveStore::has_copy() const { return QFile::exists(copy_path()); }

std::vector<RecoverableCase> AutosaveStore::recoverable() const {
  std::vector<RecoverableCase> found;
  const QDir dir(folder_);
  const QStringList metas = dir.entryList({QStringLiteral("*") + kMetaSuffix}, QDir::Files);
  for (const QString& meta_name : metas) {
    const QString session = meta_name.left(meta_name.size() - kMetaSuffix.size());
    if (session == session_) continue;
    // A live session holds its lock: not ours to recover.
    QLockFile other(dir.filePath(session + kLockSuffix));
    other.setStaleLockTime(0);
    if (!other.tryLock(0)) continue;
    other.unlock();
    QFile meta_file(dir.filePath(meta_name));
    const QString case_path = dir.filePath(session + kCaseSuffix);
    if (!QFile::exists(case_path) || !meta_file.open(QIODevice::ReadOnly)) continue;
    const QJsonObject meta = QJsonDocument::fromJson(meta_file.readAll()).object();
    RecoverableCase entry;
    entry.case_path = case_path;
    entry.original_path = meta.value(QStringLiteral("original_path")).toString();
    entry.saved_at =
        QDateTime::fromString(meta.value(QStringLiteral("saved_at")).toString(), Qt::ISODateWithMs);
    entry.label = meta.value(QStringLiteral("label")).toString();
    found.push_back(entry);
  }
  return found;
}

void AutosaveStore::remove(const RecoverableCase& entry) {
  const QString base = entry.case_path.left(entry.case_path.size() - kCaseSuffix.size());
  QFile::remove(base + kMetaSuffix);
  QFile::remove(entry.case_path);
  QFile::remove(base + kLockSuffix);
}

}  // namespace sharpey::app
