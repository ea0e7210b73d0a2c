// main() of the GUI tests: a QApplication with the OpenGL format VTK needs. Without a display the
// tests exit with 77, which ctest reports as skipped (scripts/test.sh provides one via xvfb-run).
#include <gtest/gtest.h>

#include <QApplication>
#include <QTemporaryDir>
#include <cstdio>
#include <cstdlib>

#include "view/vtk_view.h"

int main(int argc, char** argv) {
  ::testing::InitGoogleTest(&argc, argv);
  if (::testing::GTEST_FLAG(list_tests)) return RUN_ALL_TESTS();
  const bool has_display =
      std::getenv("DISPLAY") || std::getenv("WAYLAND_DISPLAY") || std::getenv("QT_QPA_PLATFORM");
  if (!has_display) {
    std::fprintf(stderr,
                 "GUI test skipped: no display (run it through scripts/test.sh or "
                 "xvfb-run -a -s \"-screen 0 1600x1000x24\")\n");
    return 77;
  }
  sharpey::app::VtkView::set_default_surface_format();
  QApplication app(argc, argv);
  // Saved solutions go to a folder of this run's own (unless the caller chose one), so a test
  // neither reads levels an earlier run saved nor fills the user's cache folder.
  QTemporaryDir cache;
  if (qEnvironmentVariableIsEmpty("SHARPEY_CACHE_DIR"))
    qputenv("SHARPEY_CACHE_DIR", cache.path().toLocal8Bit());
  return RUN_ALL_TESTS();
}
