// File state, recent files and autosave recovery (no display needed).
#include <gtest/gtest.h>

#include <QDir>
#include <QFile>
#include <QTemporaryDir>

#include "core/autosave_store.h"
#include "core/document_state.h"

namespace sharpey::app {
namespace {

TEST(DocumentState, TitleAndPromptFollowTheEdits) {
  DocumentState d;
  d.reset_untitled();
  EXPECT_TRUE(d.untitled());
  EXPECT_TRUE(d.save_needs_path());
  EXPECT_FALSE(d.needs_save_prompt());
  EXPECT_TRUE(d.window_title().startsWith("Untitled case"));
  d.mark_modified();
  EXPECT_TRUE(d.needs_save_prompt());
  EXPECT_TRUE(d.window_title().startsWith("Untitled case*"));
  d.saved("/tmp/some/where/incisor.json");
  EXPECT_FALSE(d.needs_save_prompt());
  EXPECT_FALSE(d.save_needs_path());
  EXPECT_EQ(d.display_name(), "incisor.json");
  EXPECT_TRUE(d.window_title().startsWith("incisor.json "));
  d.mark_modified();
  EXPECT_TRUE(d.window_title().startsWith("incisor.json*"));
  d.opened("/tmp/other.json");
  EXPECT_FALSE(d.modified());
  d.recovered("/tmp/other.json");
  EXPECT_TRUE(d.modified());
  EXPECT_EQ(d.path(), "/tmp/other.json");
}

TEST(RecentFiles, NewestFirstWithoutDuplicatesAndBounded) {
  RecentFiles r(3);
  r.add("/a/one.json");
  r.add("/a/two.json");
  r.add("/a/../a/one.json");  // same file, other spelling: moves to the front
  EXPECT_EQ(r.paths(), QStringList({"/a/one.json", "/a/two.json"}));
  r.add("/a/three.json");
  r.add("/a/four.json");
  EXPECT_EQ(r.paths(), QStringList({"/a/four.json", "/a/three.json", "/a/one.json"}));
  r.remove("/a/three.json");
  EXPECT_EQ(r.paths(), QStringList({"/a/four.json", "/a/one.json"}));
  RecentFiles copy(3);
  copy.set_paths(r.paths());
  EXPECT_EQ(copy.paths(), r.paths());
}

TEST(RecentFiles, MissingFilesAreDropped) {
  QTemporaryDir dir;
  ASSERT_TRUE(dir.isValid());
  const QString kept = dir.filePath("kept.json");
  QFile f(kept);
  ASSERT_TRUE(f.open(QIODevice::WriteOnly));
  f.close();
  RecentFiles r;
  r.add(dir.filePath("gone.json"));
  r.add(kept);
  r.remove_missing();
  EXPECT_EQ(r.paths(), QStringList({QDir::cleanPath(kept)}));
}

TEST(Autosave, LiveSessionsAreNotOfferedForRecovery) {
  QTemporaryDir dir;
  ASSERT_TRUE(dir.isValid());
  AutosaveStore first(dir.path());
  ASSERT_TRUE(first.write("{\"label\": \"x\"}", "/cases/x.json", "x"));
  EXPECT_TRUE(first.has_copy());
  AutosaveStore second(dir.path());
  EXPECT_TRUE(second.recoverable().empty());  // `first` still runs and holds its lock
  EXPECT_TRUE(first.recoverable().empty());   // never one's own copy
}

TEST(Autosave, ACopyLeftBehindIsRecoverableWithItsOrigin) {
  QTemporaryDir dir;
  ASSERT_TRUE(dir.isValid());
  const QString json = QStringLiteral("{\"label\": \"invented case\"}");
  {
    AutosaveStore crashed(dir.path());
    ASSERT_TRUE(crashed.write(json, "/cases/incisor.json", "invented case"));
    // Leaves without discard(): what a crash looks like once its lock is gone.
  }
  AutosaveStore next(dir.path());
  const auto found = next.recoverable();
  ASSERT_EQ(found.size(), 1u);
  EXPECT_EQ(found[0].original_path, "/cases/incisor.json");
  EXPECT_EQ(found[0].label, "invented case");
  EXPECT_TRUE(found[0].saved_at.isValid());
  QFile f(found[0].case_path);
  ASSERT_TRUE(f.open(QIODevice::ReadOnly));
  EXPECT_EQ(QString::fromUtf8(f.readAll()), json);
  AutosaveStore::remove(found[0]);
  EXPECT_TRUE(next.recoverable().empty());
}

TEST(Autosave, StaleLockOfADeadProcessDoesNotBlockRecovery) {
  QTemporaryDir dir;
  ASSERT_TRUE(dir.isValid());
  QString session;
  {
    AutosaveStore crashed(dir.path());
    ASSERT_TRUE(crashed.write("{}", "", "untitled"));
    session = crashed.session_id();
  }
  // A crash leaves the lock file of a process that no longer runs (QLockFile's format:
  // pid, application name, host name).
  QFile lock(QDir(dir.path()).filePath(session + ".lock"));
  ASSERT_TRUE(lock.open(QIODevice::WriteOnly));
  lock.write("2147483000\nsharpey\n\n");
  lock.close();
  AutosaveStore next(dir.path());
  EXPECT_EQ(next.recoverable().size(), 1u);
}

TEST(Autosave, DiscardLeavesNothingToRecover) {
  QTemporaryDir dir;
  ASSERT_TRUE(dir.isValid());
  {
    AutosaveStore clean(dir.path());
    ASSERT_TRUE(clean.write("{}", "", ""));
    clean.discard();
    EXPECT_FALSE(clean.has_copy());
  }
  AutosaveStore next(dir.path());
  EXPECT_TRUE(next.recoverable().empty());
}

TEST(Autosave, WriteFailureIsReportedNotThrown) {
  QTemporaryDir dir;
  ASSERT_TRUE(dir.isValid());
  AutosaveStore store(dir.path());
  QDir(dir.path()).removeRecursively();  // the folder vanished under the running app
  QString error;
  EXPECT_FALSE(store.write("{}", "", "", &error));
  EXPECT_FALSE(error.isEmpty());
}

}  // namespace
}  // namespace sharpey::app
