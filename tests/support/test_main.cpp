// main() of the fem and analysis test programs: GoogleTest's, after switching OpenBLAS to the
// processor's fast kernels when it fell back to slow ones (sharpey/startup/blas_kernels.h).
#include <gtest/gtest.h>

#include "sharpey/startup/blas_kernels.h"

int main(int argc, char** argv) {
  sharpey::startup::use_fast_blas_kernels(argv);
  ::testing::InitGoogleTest(&argc, argv);
  return RUN_ALL_TESTS();
}
