// Owners of CHOLMOD's C objects, so that every path out of a function, a throw included, frees
// what CHOLMOD allocated. Internal to the fem library (includes cholmod.h).
#pragma once

#include <cholmod.h>

#include <memory>

namespace sharpey::fem::detail {

// cholmod_common started on construction and finished on destruction. Declare it before the
// objects allocated through it: members are destroyed in reverse order.
class CholmodCommon {
 public:
  CholmodCommon() { cholmod_l_start(&common_); }
  ~CholmodCommon() { cholmod_l_finish(&common_); }
  CholmodCommon(const CholmodCommon&) = delete;
  CholmodCommon& operator=(const CholmodCommon&) = delete;
  cholmod_common* get() { return &common_; }
  cholmod_common* operator->() { return &common_; }

 private:
  cholmod_common common_{};
};

// Deleters that free through the cholmod_common the object was allocated with.
struct SparseDeleter {
  cholmod_common* common = nullptr;
  void operator()(cholmod_sparse* A) const { cholmod_l_free_sparse(&A, common); }
};
struct DenseDeleter {
  cholmod_common* common = nullptr;
  void operator()(cholmod_dense* X) const { cholmod_l_free_dense(&X, common); }
};
struct FactorDeleter {
  cholmod_common* common = nullptr;
  void operator()(cholmod_factor* L) const { cholmod_l_free_factor(&L, common); }
};
using SparsePtr = std::unique_ptr<cholmod_sparse, SparseDeleter>;
using DensePtr = std::unique_ptr<cholmod_dense, DenseDeleter>;
using FactorPtr = std::unique_ptr<cholmod_factor, FactorDeleter>;

inline SparsePtr own(cholmod_sparse* A, CholmodCommon& c) { return SparsePtr(A, {c.get()}); }
inline DensePtr own(cholmod_dense* X, CholmodCommon& c) { return DensePtr(X, {c.get()}); }
inline FactorPtr own(cholmod_factor* L, CholmodCommon& c) { return FactorPtr(L, {c.get()}); }

}  // namespace sharpey::fem::detail
