// CHOLMOD is included here only (its headers stay out of the public interface).
#include "sharpey/fem/solver.h"

#include <cholmod.h>
#include <dlfcn.h>
#include <omp.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <future>
#include <map>
#include <mutex>
#include <set>
#include <sstream>
#include <string>
#include <system_error>
#include <utility>

#include "detail/cholmod_handles.h"
#include "detail/kinematics.h"
#include "detail/node_graph.h"
#include "sharpey/core/check.h"
#include "sharpey/error.h"

namespace sharpey::fem {
namespace {

using Clock = std::chrono::steady_clock;
double seconds_since(Clock::time_point t0) {
  return std::chrono::duration<double>(Clock::now() - t0).count();
}

// How OpenBLAS runs its threads: openblas_get_parallel() is 2 for the OpenMP-threaded build (1
// pthreads, 0 serial). Looked up at run time, so any BLAS links; decided once per process.
bool blas_is_openmp_threaded() {
  static const bool openmp = [] {
    using GetParallel = int (*)();
    const auto fn = reinterpret_cast<GetParallel>(::dlsym(RTLD_DEFAULT, "openblas_get_parallel"));
    return fn != nullptr && fn() == 2;
  }();
  return openmp;
}

// The OpenMP settings of the calling thread while CHOLMOD factorises or solves, undone at the end
// of the scope (all three are per-task settings: other threads are not affected).
//
// CHOLMOD 3.0's supernodal factorisation and solves open OpenMP regions with a fixed team of
// CHOLMOD_OMP_NUM_THREADS = 4 (compiled into Debian's library) for the scatter of each update into
// its target supernode: thousands of short regions. With the pthreads or serial OpenBLAS they run
// on the calling thread alone (max-active-levels 0): measured on the standard incisor
// (docs/fem-solver.md, "Speed"), less CPU and system time and the same bits.
//
// With the OpenMP-threaded OpenBLAS that would hang: its threads are OpenMP threads too, and a
// threaded dsyrk whose region gets fewer threads than it split the work into waits forever for the
// missing part. So there the regions stay parallel (OMP_THREAD_LIMIT, set by the programs at
// start, caps CHOLMOD's teams at the cores), and the team OpenBLAS asks for (the calling thread's
// thread count) is made one it will get: no dynamic adjustment, no more than the thread limit.
// A calling thread with one OpenMP thread (the allowance band's workers, a sweep's solves) gets one
// BLAS thread from that build (OpenBLAS 0.3.21 runs on one thread when the caller's count or its
// own is 1, and then opens no team): there the regions are serialised as with the other builds.
class CholmodOpenMpSettings {
 public:
  CholmodOpenMpSettings()
      : levels_(omp_get_max_active_levels()),
        dynamic_(omp_get_dynamic()),
        n_threads_(omp_get_max_threads()) {
    if (!blas_is_openmp_threaded() || n_threads_ == 1) {
      omp_set_max_active_levels(0);
      return;
    }
    omp_set_dynamic(0);
    omp_set_num_threads(std::max(1, std::min(n_threads_, omp_get_thread_limit())));
  }
  ~CholmodOpenMpSettings() {
    omp_set_max_active_levels(levels_);
    omp_set_dynamic(dynamic_);
    omp_set_num_threads(n_threads_);
  }
  CholmodOpenMpSettings(const CholmodOpenMpSettings&) = delete;
  CholmodOpenMpSettings& operator=(const CholmodOpenMpSettings&) = delete;

 private:
  int levels_;
  int dynamic_;
  int n_threads_;
};

// CHOLMOD's OpenMP regions of the ordering and the symbolic analysis (no BLAS call among them)
// run by the calling thread alone: they may run on a second thread beside a factorisation. Safe on
// every BLAS build, unlike CholmodOpenMpSettings' case of a threaded dsyrk. Per-thread, undone at
// the end of the scope.
class SerialOpenMpRegions {
 public:
  SerialOpenMpRegions() : levels_(omp_get_max_active_levels()) { omp_set_max_active_levels(0); }
  ~SerialOpenMpRegions() { omp_set_max_active_levels(levels_); }
  SerialOpenMpRegions(const SerialOpenMpRegions&) = delete;
  SerialOpenMpRegions& operator=(const SerialOpenMpRegions&) = delete;

 private:
  int levels_;
};

const char* component_name(int c) { return c == 0 ? "x" : (c == 1 ? "y" : "z"); }

std::string cholmod_status_text(int status) {
  switch (status) {
    case CHOLMOD_OUT_OF_MEMORY:
      return "out of memory: the model is too large for this computer; use a coarser mesh preset";
    case CHOLMOD_TOO_LARGE:
      return "integer overflow: the model is too large; use a coarser mesh preset";
    case CHOLMOD_INVALID:
      return "invalid input to the factorisation (an internal error; please report it)";
    case CHOLMOD_NOT_INSTALLED:
      return "the requested ordering is not available in this CHOLMOD build; use another ordering";
    default:
      return "CHOLMOD status " + std::to_string(status);
  }
}

std::string ordering_name(int ordering) {
  switch (ordering) {
    case CHOLMOD_NATURAL:
      return "natural";
    case CHOLMOD_GIVEN:
      return "given";
    case CHOLMOD_AMD:
      return "amd";
    case CHOLMOD_METIS:
      return "metis";
    case CHOLMOD_NESDIS:
      return "nesdis";
    case CHOLMOD_COLAMD:
      return "colamd";
    case CHOLMOD_POSTORDERED:
      return "natural (postordered)";
    default:
      return "unknown (" + std::to_string(ordering) + ")";
  }
}

// Quiet, supernodal, with the requested fill-reducing ordering.
void configure(cholmod_common* common, Ordering ordering) {
  common->print = 0;  // the library never prints
  common->error_handler = nullptr;
  common->supernodal = CHOLMOD_SUPERNODAL;
  common->final_ll = 1;
  // METIS reports running out of memory by raising SIGABRT and jumping back from the handler;
  // on the thread that orders the next level ahead (or beside the assembly) that path crashed the
  // program (batch_test_batch_out_of_memory). CHOLMOD's guard allocates and frees twice METIS's
  // expected need first and reports CHOLMOD_OUT_OF_MEMORY itself when that fails.
  common->metis_memory = 2.0;
  switch (ordering) {
    case Ordering::kAuto:
      common->nmethods = 0;
      break;
    case Ordering::kMetisNodes:
      common->nmethods = 1;
      common->method[0].ordering = CHOLMOD_GIVEN;
      common->postorder = 1;
      break;
    case Ordering::kAmd:
    case Ordering::kMetis:
    case Ordering::kNesdis:
      common->nmethods = 1;
      common->method[0].ordering =
          ordering == Ordering::kAmd
              ? CHOLMOD_AMD
              : (ordering == Ordering::kMetis ? CHOLMOD_METIS : CHOLMOD_NESDIS);
      common->postorder = 1;
      break;
  }
}

// Upper triangle of the free-free block of K in CHOLMOD's long-index CSC; `diagonal` receives its
// diagonal (free order). Throws SolverError when CHOLMOD cannot allocate it.
cholmod_sparse* free_block_upper(const Eigen::SparseMatrix<double>& K,
                                 const std::vector<int>& free_dofs, const std::vector<int>& free_of,
                                 cholmod_common* common, std::vector<double>* diagonal,
                                 long* n_nonzeros) {
  const long nf = static_cast<long>(free_dofs.size());
  long nnz = 0;
  for (long j = 0; j < nf; ++j) {
    const int g = free_dofs[static_cast<size_t>(j)];
    for (Eigen::SparseMatrix<double>::InnerIterator it(K, g); it; ++it) {
      if (it.row() > g) break;
      if (free_of[static_cast<size_t>(it.row())] >= 0) ++nnz;
    }
  }
  cholmod_sparse* A =
      cholmod_l_allocate_sparse(static_cast<size_t>(nf), static_cast<size_t>(nf),
                                static_cast<size_t>(nnz), 1, 1, 1, CHOLMOD_REAL, common);
  if (!A) {
    throw SolverError("could not allocate the stiffness matrix: " +
                      cholmod_status_text(common->status));
  }
  diagonal->assign(static_cast<size_t>(nf), 0.0);
  long* Ap = static_cast<long*>(A->p);
  long* Ai = static_cast<long*>(A->i);
  double* Ax = static_cast<double*>(A->x);
  long q = 0;
  for (long j = 0; j < nf; ++j) {
    Ap[j] = q;
    const int g = free_dofs[static_cast<size_t>(j)];
    for (Eigen::SparseMatrix<double>::InnerIterator it(K, g); it; ++it) {
      if (it.row() > g) break;
      const int r = free_of[static_cast<size_t>(it.row())];
      if (r < 0) continue;
      Ai[q] = r;
      Ax[q] = it.value();
      if (r == j) (*diagonal)[static_cast<size_t>(j)] = it.value();
      ++q;
    }
  }
  Ap[nf] = q;
  *n_nonzeros = nnz;
  return A;
}

// METIS keeps its random number generator in global state (GKlib's, seeded at the start of each
// ordering), so two orderings at once in one process draw from the same sequence and may give
// different permutations, hence different round-off (solvers built side by side: the allowance
// band's workers, a study ordering the next scenario ahead). One ordering at a time in the
// process; the rest of a solve runs in parallel.
std::mutex& ordering_mutex() {
  static std::mutex m;
  return m;
}

// Node adjacency (each node's neighbours, itself included, ascending) read off the pattern of a
// stiffness matrix made of dense 3 x 3 node blocks: the rows of each node's first column.
detail::NodeGraph node_adjacency(const Eigen::SparseMatrix<double>& K) {
  const int n = static_cast<int>(K.cols() / 3);
  detail::NodeGraph g;
  g.ptr.assign(static_cast<size_t>(n) + 1, 0);
  for (int j = 0; j < n; ++j) {
    g.ptr[static_cast<size_t>(j) + 1] = g.ptr[static_cast<size_t>(j)];
    for (Eigen::SparseMatrix<double>::InnerIterator it(K, 3 * j); it; ++it) {
      if (it.row() % 3 != 0) continue;
      g.adjacent.push_back(static_cast<int>(it.row() / 3));
      ++g.ptr[static_cast<size_t>(j) + 1];
    }
  }
  return g;
}

// METIS nested dissection (through CHOLMOD) of the graph of the nodes flagged in `ordered` (the
// nodes with free dofs), two nodes adjacent when they share an element. Returns the flagged node
// ids in elimination order; empty when METIS fails (the caller reports CHOLMOD's status).
std::vector<int> metis_node_order(const detail::NodeGraph& g, const std::vector<char>& ordered,
                                  cholmod_common* common) {
  const int n = static_cast<int>(ordered.size());
  std::vector<long> compact(static_cast<size_t>(n), -1);
  std::vector<int> node_of;  // compact index -> node id
  long nnz = 0;
  for (int i = 0; i < n; ++i) {
    if (!ordered[static_cast<size_t>(i)]) continue;
    compact[static_cast<size_t>(i)] = static_cast<long>(node_of.size());
    node_of.push_back(i);
    for (long long q = g.ptr[static_cast<size_t>(i)]; q < g.ptr[static_cast<size_t>(i) + 1]; ++q) {
      const int a = g.adjacent[static_cast<size_t>(q)];
      if (a <= i && ordered[static_cast<size_t>(a)]) ++nnz;
    }
  }
  const long nn = static_cast<long>(node_of.size());
  // Upper triangle with the diagonal, columns ascending: the pattern of the free block by nodes.
  const detail::SparsePtr G(
      cholmod_l_allocate_sparse(static_cast<size_t>(nn), static_cast<size_t>(nn),
                                static_cast<size_t>(nnz), 1, 1, 1, CHOLMOD_PATTERN, common),
      {common});
  if (!G) return {};
  long* Gp = static_cast<long*>(G->p);
  long* Gi = static_cast<long*>(G->i);
  long q = 0;
  for (long j = 0; j < nn; ++j) {
    Gp[j] = q;
    const int i = node_of[static_cast<size_t>(j)];
    for (long long r = g.ptr[static_cast<size_t>(i)]; r < g.ptr[static_cast<size_t>(i) + 1]; ++r) {
      const long c = compact[static_cast<size_t>(g.adjacent[static_cast<size_t>(r)])];
      if (c >= 0 && c <= j) Gi[q++] = c;
    }
  }
  Gp[nn] = q;
  std::vector<SuiteSparse_long> perm(static_cast<size_t>(nn));
  {
    const std::lock_guard<std::mutex> lock(ordering_mutex());
    if (!cholmod_l_metis(G.get(), nullptr, 0, 0, perm.data(), common)) return {};
  }
  std::vector<int> order(static_cast<size_t>(nn));
  for (long k = 0; k < nn; ++k)
    order[static_cast<size_t>(k)] = node_of[static_cast<size_t>(perm[k])];
  return order;
}

// The nodes with at least one free dof (free_dofs: ascending global dofs), among n_nodes.
std::vector<char> nodes_of_dofs(const std::vector<int>& free_dofs, int n_nodes) {
  std::vector<char> flag(static_cast<size_t>(n_nodes), 0);
  for (int d : free_dofs) flag[static_cast<size_t>(d / 3)] = 1;
  return flag;
}

// A node ordering expanded to A's columns, each node's free dofs kept together in ascending
// order. Throws InputError unless `node_order` names every node with a free dof exactly once and
// no other node (a given ordering computed on another mesh or other constraints).
std::vector<SuiteSparse_long> dof_permutation(const std::vector<int>& node_order,
                                              const std::vector<int>& free_dofs, int n_nodes) {
  std::vector<long> first(static_cast<size_t>(n_nodes) + 1, -1);  // node -> its first column
  for (size_t j = free_dofs.size(); j-- > 0;)
    first[static_cast<size_t>(free_dofs[j] / 3)] = static_cast<long>(j);
  std::vector<SuiteSparse_long> perm;
  perm.reserve(free_dofs.size());
  const auto bad = [] {
    return InputError("node_order",
                      "the given node ordering does not match this model's mesh and constraints; "
                      "compute it with fem::order_nodes on the same mesh and constraints");
  };
  for (int node : node_order) {
    SHARPEY_CHECK(node >= 0 && node < n_nodes && first[static_cast<size_t>(node)] >= 0, bad());
    for (long j = first[static_cast<size_t>(node)];
         j < static_cast<long>(free_dofs.size()) && free_dofs[static_cast<size_t>(j)] / 3 == node;
         ++j) {
      perm.push_back(j);
    }
    first[static_cast<size_t>(node)] = -1;  // a node named twice is caught above
  }
  SHARPEY_CHECK(perm.size() == free_dofs.size(), bad());
  return perm;
}

// Ordering and symbolic analysis of A under the ordering `configure` set up. kMetisNodes takes
// `node_order` (the nodes in elimination order) and lets CHOLMOD postorder it; the other orderings
// are CHOLMOD's own.
cholmod_factor* analyse(cholmod_sparse* A, const std::vector<int>& free_dofs, Ordering ordering,
                        const std::vector<int>& node_order, int n_nodes, cholmod_common* common) {
  if (ordering != Ordering::kMetisNodes) {
    const std::lock_guard<std::mutex> lock(ordering_mutex());
    return cholmod_l_analyze(A, common);
  }
  std::vector<SuiteSparse_long> perm = dof_permutation(node_order, free_dofs, n_nodes);
  return cholmod_l_analyze_p(A, perm.data(), nullptr, 0, common);
}
}  // namespace

struct SymbolicFactorisation::Impl {
  std::vector<int> free_dofs;
  detail::CholmodCommon common;  // before L: destroyed after it
  detail::FactorPtr L;
  double gflop = 0, analyse_s = 0;
  long long factor_nonzeros = 0;
};

std::string to_string(Ordering ordering) {
  switch (ordering) {
    case Ordering::kAuto:
      return "auto";
    case Ordering::kAmd:
      return "amd";
    case Ordering::kMetis:
      return "metis";
    case Ordering::kNesdis:
      return "nesdis";
    case Ordering::kMetisNodes:
      return "metis-nodes";
  }
  return "unknown";
}

struct LinearElasticSolver::Impl {
  SolverOptions options;
  SolverStatistics stats;
  Eigen::SparseMatrix<double> K;  // full, 3n x 3n
  std::vector<DofConstraint> constraints;
  int n_nodes = 0;
  std::vector<int> free_dofs;    // free index -> global dof
  Eigen::VectorXd prescribed;    // 3n: constrained values, zero elsewhere
  MaterialTable materials;       // those K was assembled with
  detail::CholmodCommon common;  // before L: destroyed after it
  detail::FactorPtr L;
  bool factor_valid = false;  // false after a failed refactorisation: solve() refuses
  mutable std::mutex mutex;

  void set_constraints(const mesh::VolumeMesh& mesh);
  void assemble(const mesh::VolumeMesh& mesh);
  // The upper triangle of the free-free block of K (its diagonal into *diagonal).
  detail::SparsePtr free_block(std::vector<double>* diagonal);
  // kMetisNodes without a given node ordering: order_nodes() started on a second thread, so that
  // METIS runs beside the assembly (an empty future otherwise).
  std::future<std::vector<int>> start_ordering(const mesh::VolumeMesh& mesh) const;
  // Ordering (the node ordering given, or taken from `ordering`) and symbolic analysis (L), then
  // the numeric factorisation.
  void factorise(const mesh::VolumeMesh& mesh, std::future<std::vector<int>>* ordering);
  // L from a symbolic factorisation computed ahead (a copy: the given one stays unchanged).
  void take_symbolic(const SymbolicFactorisation& given);
  // Numeric factorisation of A into the analysed L, with the checks of the pivots.
  void factorise_numeric(const mesh::VolumeMesh& mesh, detail::SparsePtr A,
                         const std::vector<double>& diagonal);
  [[noreturn]] void throw_not_positive_definite(const mesh::VolumeMesh& mesh, long k_permuted,
                                                double pivot_ratio) const;
  Eigen::MatrixXd solve(const Eigen::MatrixXd& F);
  // ||(K u - f)_free|| / rhs_norm, the worst of the columns of U and F.
  double worst_relative_residual(const Eigen::MatrixXd& U, const Eigen::MatrixXd& F,
                                 const std::vector<double>& rhs_norm) const;
};

void LinearElasticSolver::Impl::set_constraints(const mesh::VolumeMesh& mesh) {
  const int n_dofs = 3 * n_nodes;
  prescribed = Eigen::VectorXd::Zero(n_dofs);
  std::vector<char> is_fixed(static_cast<size_t>(n_dofs), 0);
  for (size_t i = 0; i < constraints.size(); ++i) {
    const DofConstraint& c = constraints[i];
    const std::string key = "constraints[" + std::to_string(i) + "]";
    if (c.node < 0 || c.node >= n_nodes) {
      throw InputError(key + ".node", "constraint " + std::to_string(i) + " names node " +
                                          std::to_string(c.node) + ", outside 0.." +
                                          std::to_string(n_nodes - 1) + " of this mesh");
    }
    if (c.component < 0 || c.component > 2) {
      throw InputError(key + ".component", "constraint " + std::to_string(i) + " has component " +
                                               std::to_string(c.component) +
                                               "; use 0, 1 or 2 for x, y or z");
    }
    if (!std::isfinite(c.value_mm)) {
      throw InputError(key + ".value_mm",
                       "constraint " + std::to_string(i) + " prescribes a non-finite displacement");
    }
    const int dof = 3 * c.node + c.component;
    if (is_fixed[static_cast<size_t>(dof)] && prescribed(dof) != c.value_mm) {
      std::ostringstream s;
      s << "node " << c.node << " component " << component_name(c.component)
        << " is prescribed twice with different values (" << prescribed(dof) << " and "
        << c.value_mm << " mm); keep one";
      throw InputError(key + ".value_mm", s.str());
    }
    is_fixed[static_cast<size_t>(dof)] = 1;
    prescribed(dof) = c.value_mm;
  }
  // Nodes of no element carry no stiffness: hold them at zero, outside the system.
  std::vector<char> used(static_cast<size_t>(n_nodes), 0);
  for (int v : mesh.elements) used[static_cast<size_t>(v)] = 1;
  for (int i = 0; i < n_nodes; ++i) {
    if (used[static_cast<size_t>(i)]) continue;
    ++stats.n_unused_nodes;
    for (int c = 0; c < 3; ++c) is_fixed[static_cast<size_t>(3 * i + c)] = 1;
  }
  free_dofs.clear();
  for (int d = 0; d < n_dofs; ++d) {
    if (!is_fixed[static_cast<size_t>(d)]) free_dofs.push_back(d);
  }
  stats.n_dofs = static_cast<int>(free_dofs.size());
  stats.n_constrained_dofs = n_dofs - stats.n_dofs - 3 * stats.n_unused_nodes;
}

void LinearElasticSolver::Impl::throw_not_positive_definite(const mesh::VolumeMesh& mesh,
                                                            long k_permuted,
                                                            double pivot_ratio) const {
  const long* perm = static_cast<const long*>(L->Perm);
  const long k_free = perm ? perm[k_permuted] : k_permuted;
  const int dof = free_dofs[static_cast<size_t>(k_free)];
  const int node = dof / 3, component = dof % 3;
  std::set<int> regions;
  for (int e = 0; e < mesh.n_elements(); ++e) {
    const int* en = mesh.element(e);
    if (std::find(en, en + mesh.nodes_per_element, node) != en + mesh.nodes_per_element) {
      regions.insert(mesh.element_region[static_cast<size_t>(e)]);
    }
  }
  std::ostringstream s;
  s << "the stiffness matrix is singular or not positive definite at equation " << k_free
    << " (node " << node << " at (" << mesh.nodes[static_cast<size_t>(node)].transpose()
    << ") mm, component " << component_name(component) << ", region";
  for (int r : regions) s << ' ' << r;
  s << "): the model is not held against rigid-body motion, or a region has no material / a zero "
       "modulus";
  if (pivot_ratio >= 0) {
    s << " (pivot " << pivot_ratio << " of its diagonal, limit " << options.min_pivot_ratio << ")";
  }
  s << "; fix enough nodes (e.g. the bone faces) and check every region's material";
  throw SolverError(s.str());
}

void LinearElasticSolver::Impl::assemble(const mesh::VolumeMesh& mesh) {
  const auto t0 = Clock::now();
  AssemblyStatistics assembly;
  K = assemble_stiffness(mesh, materials, options.assembly, &assembly);
  stats.assembly_s = seconds_since(t0);
  stats.n_threads_assembly = assembly.n_threads;
}

detail::SparsePtr LinearElasticSolver::Impl::free_block(std::vector<double>* diagonal) {
  std::vector<int> free_of(static_cast<size_t>(3 * n_nodes), -1);
  for (size_t i = 0; i < free_dofs.size(); ++i)
    free_of[static_cast<size_t>(free_dofs[i])] = static_cast<int>(i);
  long nnz = 0;
  detail::SparsePtr A =
      detail::own(free_block_upper(K, free_dofs, free_of, common.get(), diagonal, &nnz), common);
  stats.n_nonzeros = nnz;
  return A;
}

std::future<std::vector<int>> LinearElasticSolver::Impl::start_ordering(
    const mesh::VolumeMesh& mesh) const {
  if (options.ordering != Ordering::kMetisNodes || !options.node_order.empty() ||
      options.symbolic || free_dofs.empty()) {
    return {};
  }
  const auto order = [&mesh, this] { return order_nodes(mesh, constraints); };
  try {
    return std::async(std::launch::async, order);
  } catch (const std::system_error&) {  // no second thread to be had: order when asked
    return std::async(std::launch::deferred, order);
  }
}

void LinearElasticSolver::Impl::factorise(const mesh::VolumeMesh& mesh,
                                          std::future<std::vector<int>>* ordering) {
  const long nf = static_cast<long>(free_dofs.size());
  if (nf == 0) return;  // everything prescribed: nothing to solve

  configure(common.get(), options.ordering);
  SHARPEY_CHECK(options.node_order.empty() || options.ordering == Ordering::kMetisNodes,
                InputError("node_order", "a given node ordering needs the ordering metis-nodes (" +
                                             to_string(options.ordering) +
                                             " was asked for); leave node_order empty"));

  std::vector<double> diagonal;
  detail::SparsePtr A = free_block(&diagonal);

  if (options.symbolic) {
    take_symbolic(*options.symbolic);
    factorise_numeric(mesh, std::move(A), diagonal);
    return;
  }
  auto t0 = Clock::now();  // the wait for the ordering thread included
  std::vector<int> node_order = options.node_order;
  if (options.ordering == Ordering::kMetisNodes && node_order.empty()) {
    node_order = ordering->valid() ? ordering->get() : order_nodes(mesh, constraints);
  }
  L = detail::own(analyse(A.get(), free_dofs, options.ordering, node_order, n_nodes, common.get()),
                  common);
  stats.analyse_s = seconds_since(t0);
  if (!L || common->status < CHOLMOD_OK) {
    throw SolverError("the analysis (fill-reducing ordering) of the stiffness matrix failed: " +
                      cholmod_status_text(common->status));
  }
  stats.ordering = options.ordering == Ordering::kMetisNodes ? std::string("metis-nodes")
                                                             : ordering_name(L->ordering);
  stats.factorisation_gflop = common->fl / 1e9;
  stats.factor_nonzeros = static_cast<long long>(common->lnz);
  factorise_numeric(mesh, std::move(A), diagonal);
}

void LinearElasticSolver::Impl::take_symbolic(const SymbolicFactorisation& given) {
  const SymbolicFactorisation::Impl& s = given.impl();
  SHARPEY_CHECK(s.free_dofs == free_dofs && s.L && options.ordering == Ordering::kMetisNodes &&
                    options.node_order.empty(),
                InputError("symbolic",
                           "the given symbolic factorisation does not match this "
                           "model's mesh and constraints, or another ordering was "
                           "asked for; compute it on the same mesh and constraints "
                           "with the ordering metis-nodes"));
  const auto t0 = Clock::now();
  L = detail::own(cholmod_l_copy_factor(s.L.get(), common.get()), common);
  if (!L) {
    throw SolverError("could not copy the symbolic factorisation: " +
                      cholmod_status_text(common->status));
  }
  stats.analyse_s = seconds_since(t0);
  stats.ordering = "metis-nodes";
  stats.factorisation_gflop = s.gflop;
  stats.factor_nonzeros = s.factor_nonzeros;
}

void LinearElasticSolver::Impl::factorise_numeric(const mesh::VolumeMesh& mesh, detail::SparsePtr A,
                                                  const std::vector<double>& diagonal) {
  const long nf = static_cast<long>(free_dofs.size());
  factor_valid = false;
  const auto t0 = Clock::now();
  int ok = 0;
  {
    const CholmodOpenMpSettings openmp_settings;
    ok = cholmod_l_factorize(A.get(), L.get(), common.get());
  }
  stats.factorise_s = seconds_since(t0);
  ++stats.n_numeric_factorisations;
  const int status = common->status;
  A.reset();  // the factor is all that is kept
  if (!ok || status < CHOLMOD_OK) {
    throw SolverError("the factorisation of the stiffness matrix failed: " +
                      cholmod_status_text(status));
  }
  if (status == CHOLMOD_NOT_POSDEF || L->minor < L->n) {
    throw_not_positive_definite(mesh, static_cast<long>(std::min<size_t>(L->minor, L->n - 1)), -1);
  }
  // A singular matrix can survive the factorisation with round-off pivots of either sign; flag a
  // pivot that is a vanishing fraction of its diagonal entry.
  const long* perm = static_cast<const long*>(L->Perm);
  const double* Lx = static_cast<const double*>(L->x);
  double min_ratio = 1e300;
  long min_k = 0;
  auto visit = [&](long k, double ljj) {
    const double a = diagonal[static_cast<size_t>(perm ? perm[k] : k)];
    const double ratio = a > 0 ? ljj * ljj / a : 0.0;
    if (ratio < min_ratio) {
      min_ratio = ratio;
      min_k = k;
    }
  };
  if (L->is_super) {
    const long* super = static_cast<const long*>(L->super);
    const long* pi = static_cast<const long*>(L->pi);
    const long* px = static_cast<const long*>(L->px);
    for (size_t s = 0; s < L->nsuper; ++s) {
      const long k1 = super[s], k2 = super[s + 1], nsrow = pi[s + 1] - pi[s];
      for (long jj = 0; jj < k2 - k1; ++jj) visit(k1 + jj, Lx[px[s] + jj * nsrow + jj]);
    }
    stats.factor_mb = static_cast<double>(L->xsize) * sizeof(double) / 1e6;
  } else {
    const long* Lp = static_cast<const long*>(L->p);
    for (long k = 0; k < nf; ++k) {
      const double d = Lx[Lp[k]];
      visit(k, L->is_ll ? d : std::sqrt(std::max(d, 0.0)));
    }
    stats.factor_mb = static_cast<double>(L->nzmax) * sizeof(double) / 1e6;
  }
  stats.min_pivot_ratio = min_ratio;
  if (!(min_ratio >= options.min_pivot_ratio)) throw_not_positive_definite(mesh, min_k, min_ratio);
  factor_valid = true;
}

double LinearElasticSolver::Impl::worst_relative_residual(
    const Eigen::MatrixXd& U, const Eigen::MatrixXd& F, const std::vector<double>& rhs_norm) const {
  const int n_dofs = 3 * n_nodes;
  const long m = F.cols();
  const long nf = static_cast<long>(free_dofs.size());
  // Relative residual over the free dofs, the worst of the columns. The columns' products are
  // independent (each is the one K * U gives, the same bits), so the cores share them.
  Eigen::MatrixXd R(n_dofs, m);
#pragma omp parallel for schedule(static) if (m > 1)
  for (long j = 0; j < m; ++j) R.col(j) = K * U.col(j) - F.col(j);
  double worst = 0;
  for (long j = 0; j < m; ++j) {
    double norm2 = 0;
    for (long i = 0; i < nf; ++i)
      norm2 += R(free_dofs[static_cast<size_t>(i)], j) * R(free_dofs[static_cast<size_t>(i)], j);
    const double bn = rhs_norm[static_cast<size_t>(j)];
    const double rel = bn > 0 ? std::sqrt(norm2) / bn : std::sqrt(norm2);
    worst = std::max(worst, rel);
  }
  return worst;
}

Eigen::MatrixXd LinearElasticSolver::Impl::solve(const Eigen::MatrixXd& F) {
  const int n_dofs = 3 * n_nodes;
  SHARPEY_ASSERT(F.rows() == n_dofs, "LinearElasticSolver::solve: the load has " +
                                         std::to_string(F.rows()) + " rows, the model " +
                                         std::to_string(n_dofs) + " degrees of freedom");
  const long m = F.cols();
  const long nf = static_cast<long>(free_dofs.size());
  const auto t0 = Clock::now();
  Eigen::MatrixXd U = prescribed.replicate(1, m);
  if (m == 0) return U;
  if (!F.allFinite()) throw InputError("f", "the load vector contains a non-finite value");
  ++stats.n_solves;
  // K u_c; skipped when every prescribed value is zero (a held bone: the usual case), which gives
  // the same zeros without a pass over K.
  const Eigen::VectorXd K_prescribed =
      prescribed.isZero(0.0) ? Eigen::VectorXd::Zero(n_dofs).eval() : (K * prescribed).eval();
  std::vector<double> rhs_norm(static_cast<size_t>(m), 0.0);
  if (nf > 0) {
    if (!factor_valid) {
      throw SolverError(
          "the last refactorisation of this solver failed; refactorise it with valid materials "
          "before solving");
    }
    detail::DensePtr B =
        detail::own(cholmod_l_allocate_dense(static_cast<size_t>(nf), static_cast<size_t>(m),
                                             static_cast<size_t>(nf), CHOLMOD_REAL, common.get()),
                    common);
    if (!B) {
      throw SolverError("could not allocate the right-hand sides: " +
                        cholmod_status_text(common->status));
    }
    double* Bx = static_cast<double*>(B->x);
    for (long j = 0; j < m; ++j) {
      double norm2 = 0;
      for (long i = 0; i < nf; ++i) {
        const int d = free_dofs[static_cast<size_t>(i)];
        const double b = F(d, j) - K_prescribed(d);
        Bx[i + j * nf] = b;
        norm2 += b * b;
      }
      rhs_norm[static_cast<size_t>(j)] = std::sqrt(norm2);
    }
    detail::DensePtr X;
    {
      const CholmodOpenMpSettings openmp_settings;
      X = detail::own(cholmod_l_solve(CHOLMOD_A, L.get(), B.get(), common.get()), common);
    }
    B.reset();
    if (!X || common->status < CHOLMOD_OK) {
      throw SolverError("the triangular solves failed: " + cholmod_status_text(common->status));
    }
    const double* Xx = static_cast<const double*>(X->x);
    for (long j = 0; j < m; ++j) {
      for (long i = 0; i < nf; ++i) U(free_dofs[static_cast<size_t>(i)], j) = Xx[i + j * nf];
    }
  }
  const double worst = worst_relative_residual(U, F, rhs_norm);
  stats.last_relative_residual = worst;
  stats.last_solve_s = seconds_since(t0);
  if (!(worst <= options.max_relative_residual)) {
    std::ostringstream s;
    s << "the solution's relative residual " << worst << " exceeds "
      << options.max_relative_residual
      << ": the stiffness matrix is too ill-conditioned (material moduli many orders of magnitude "
         "apart, or badly shaped elements); check the materials and the mesh quality";
    throw SolverError(s.str());
  }
  return U;
}

LinearElasticSolver::LinearElasticSolver(const mesh::VolumeMesh& mesh,
                                         const MaterialTable& materials,
                                         std::vector<DofConstraint> constraints)
    : LinearElasticSolver(mesh, materials, std::move(constraints), SolverOptions{}) {}

LinearElasticSolver::LinearElasticSolver(const mesh::VolumeMesh& mesh,
                                         const MaterialTable& materials,
                                         std::vector<DofConstraint> constraints,
                                         const SolverOptions& options)
    : impl_(new Impl) {
  try {
    impl_->options = options;
    impl_->constraints = std::move(constraints);
    impl_->n_nodes = mesh.n_nodes();
    impl_->stats.requested_ordering = to_string(options.ordering);
    impl_->materials = materials;
    impl_->set_constraints(mesh);
    // A pending ordering's future waits for its thread when an exception leaves this scope.
    std::future<std::vector<int>> ordering = impl_->start_ordering(mesh);
    impl_->assemble(mesh);
    impl_->factorise(mesh, &ordering);
  } catch (...) {
    delete impl_;
    throw;
  }
}

LinearElasticSolver::~LinearElasticSolver() { delete impl_; }

void LinearElasticSolver::refactorise(const mesh::VolumeMesh& mesh,
                                      const MaterialTable& materials) {
  std::lock_guard<std::mutex> lock(impl_->mutex);
  SHARPEY_ASSERT(mesh.n_nodes() == impl_->n_nodes,
                 "LinearElasticSolver::refactorise: the mesh has " +
                     std::to_string(mesh.n_nodes()) + " nodes, the analysed one " +
                     std::to_string(impl_->n_nodes) + "; construct a new solver for a new mesh");
  Impl& s = *impl_;
  s.factor_valid = false;
  s.materials = materials;
  s.assemble(mesh);  // the same connectivity gives the same pattern
  if (s.free_dofs.empty()) {
    s.factor_valid = true;
    return;
  }
  std::vector<double> diagonal;
  detail::SparsePtr A = s.free_block(&diagonal);
  SHARPEY_ASSERT(static_cast<size_t>(A->ncol) == s.L->n,
                 "LinearElasticSolver::refactorise: the free block changed size");
  s.factorise_numeric(mesh, std::move(A), diagonal);
}

const MaterialTable& LinearElasticSolver::materials() const { return impl_->materials; }

Eigen::VectorXd LinearElasticSolver::solve(const Eigen::VectorXd& f) const {
  const Eigen::MatrixXd F = f;
  std::lock_guard<std::mutex> lock(impl_->mutex);
  return impl_->solve(F).col(0);
}

Eigen::MatrixXd LinearElasticSolver::solve(const Eigen::MatrixXd& F) const {
  std::lock_guard<std::mutex> lock(impl_->mutex);
  return impl_->solve(F);
}

Eigen::VectorXd LinearElasticSolver::reactions(const Eigen::VectorXd& u,
                                               const Eigen::VectorXd& f) const {
  SHARPEY_ASSERT(u.size() == impl_->K.rows() && f.size() == impl_->K.rows(),
                 "LinearElasticSolver::reactions: u and f need 3n entries");
  return impl_->K * u - f;
}

namespace {

// The free dofs (ascending) of a mesh under its constraints, as the solver takes them: every dof
// of a node used by an element and not named by a constraint. InputError for a constraint outside
// the mesh.
std::vector<int> free_dofs_of(const mesh::VolumeMesh& mesh,
                              const std::vector<DofConstraint>& constraints) {
  const int n = mesh.n_nodes();
  std::vector<char> fixed(3 * static_cast<size_t>(n), 1);
  for (int v : mesh.elements) {
    for (int c = 0; c < 3; ++c) fixed[3 * static_cast<size_t>(v) + static_cast<size_t>(c)] = 0;
  }
  for (size_t i = 0; i < constraints.size(); ++i) {
    const DofConstraint& c = constraints[i];
    SHARPEY_CHECK(
        c.node >= 0 && c.node < n && c.component >= 0 && c.component <= 2,
        InputError("constraints[" + std::to_string(i) + "]",
                   "constraint " + std::to_string(i) + " names node " + std::to_string(c.node) +
                       " component " + std::to_string(c.component) + ", outside this mesh of " +
                       std::to_string(n) +
                       " nodes; use a node of the mesh and 0, 1 or 2 for x, "
                       "y or z"));
    fixed[3 * static_cast<size_t>(c.node) + static_cast<size_t>(c.component)] = 1;
  }
  std::vector<int> free_dofs;
  for (size_t d = 0; d < fixed.size(); ++d) {
    if (!fixed[d]) free_dofs.push_back(static_cast<int>(d));
  }
  return free_dofs;
}

// The node ordering of the mesh's graph `g` restricted to the nodes of `free_dofs`, on the calling
// thread alone (it may run beside a factorisation). SolverError when METIS fails.
std::vector<int> node_order_of(const detail::NodeGraph& g, const std::vector<int>& free_dofs,
                               int n_nodes, cholmod_common* common) {
  std::vector<int> order = metis_node_order(g, nodes_of_dofs(free_dofs, n_nodes), common);
  if (order.empty() && !free_dofs.empty()) {
    throw SolverError("the fill-reducing ordering of the mesh's nodes failed: " +
                      cholmod_status_text(common->status));
  }
  return order;
}

// The pattern of the free-free block's upper triangle from the node graph: node a's dof c' couples
// with node b's dof c when a and b share an element. The same rows, in the same order, as
// free_block_upper gives from the assembled K.
cholmod_sparse* free_block_pattern(const detail::NodeGraph& g, const std::vector<int>& free_dofs,
                                   int n_nodes, cholmod_common* common) {
  std::vector<long> free_of(3 * static_cast<size_t>(n_nodes), -1);
  for (size_t j = 0; j < free_dofs.size(); ++j)
    free_of[static_cast<size_t>(free_dofs[j])] = static_cast<long>(j);
  const auto rows = [&](int dof, const auto& visit) {
    const int node = dof / 3;
    for (long long q = g.ptr[static_cast<size_t>(node)]; q < g.ptr[static_cast<size_t>(node) + 1];
         ++q) {
      const int a = g.adjacent[static_cast<size_t>(q)];
      if (a > node) break;
      for (int c = 0; c < 3 && 3 * a + c <= dof; ++c) {
        const long r = free_of[3 * static_cast<size_t>(a) + static_cast<size_t>(c)];
        if (r >= 0) visit(r);
      }
    }
  };
  size_t nnz = 0;
  for (int dof : free_dofs) rows(dof, [&nnz](long) { ++nnz; });
  const size_t nf = free_dofs.size();
  cholmod_sparse* A = cholmod_l_allocate_sparse(nf, nf, nnz, 1, 1, 1, CHOLMOD_PATTERN, common);
  if (!A) return nullptr;
  long* Ap = static_cast<long*>(A->p);
  long* Ai = static_cast<long*>(A->i);
  long q = 0;
  for (size_t j = 0; j < nf; ++j) {
    Ap[j] = q;
    rows(free_dofs[j], [&](long r) { Ai[q++] = r; });
  }
  Ap[nf] = q;
  return A;
}

}  // namespace

std::vector<int> order_nodes(const mesh::VolumeMesh& mesh,
                             const std::vector<DofConstraint>& constraints) {
  const std::vector<int> free_dofs = free_dofs_of(mesh, constraints);
  detail::CholmodCommon common;
  configure(common.get(), Ordering::kMetisNodes);
  const SerialOpenMpRegions serial;  // on this thread alone: it may run beside a factorisation
  return node_order_of(detail::build_node_graph(mesh), free_dofs, mesh.n_nodes(), common.get());
}

SymbolicFactorisation::SymbolicFactorisation(const mesh::VolumeMesh& mesh,
                                             const std::vector<DofConstraint>& constraints)
    : impl_(std::make_unique<Impl>()) {
  const auto t0 = Clock::now();
  Impl& s = *impl_;
  s.free_dofs = free_dofs_of(mesh, constraints);
  if (s.free_dofs.empty()) return;
  cholmod_common* common = s.common.get();
  configure(common, Ordering::kMetisNodes);
  const SerialOpenMpRegions serial;  // on this thread alone: it may run beside a factorisation
  const detail::NodeGraph g = detail::build_node_graph(mesh);
  const std::vector<int> order = node_order_of(g, s.free_dofs, mesh.n_nodes(), common);
  const detail::SparsePtr A =
      detail::own(free_block_pattern(g, s.free_dofs, mesh.n_nodes(), common), s.common);
  if (A) {
    s.L = detail::own(
        analyse(A.get(), s.free_dofs, Ordering::kMetisNodes, order, mesh.n_nodes(), common),
        s.common);
  }
  if (!s.L || common->status < CHOLMOD_OK) {
    throw SolverError("the analysis (fill-reducing ordering) of the stiffness matrix failed: " +
                      cholmod_status_text(common->status));
  }
  s.gflop = common->fl / 1e9;
  s.factor_nonzeros = static_cast<long long>(common->lnz);
  s.analyse_s = seconds_since(t0);
}

SymbolicFactorisation::~SymbolicFactorisation() = default;
double SymbolicFactorisation::factorisation_gflop() const { return impl_->gflop; }
long long SymbolicFactorisation::factor_nonzeros() const { return impl_->factor_nonzeros; }
double SymbolicFactorisation::analyse_s() const { return impl_->analyse_s; }

OrderingEstimate estimate_ordering(const Eigen::SparseMatrix<double>& K,
                                   const std::vector<DofConstraint>& constraints,
                                   Ordering ordering) {
  const int n_dofs = static_cast<int>(K.rows());
  std::vector<int> free_of(static_cast<size_t>(n_dofs), 0);
  for (const DofConstraint& c : constraints) {
    const int dof = 3 * c.node + c.component;
    if (c.component < 0 || c.component > 2 || dof < 0 || dof >= n_dofs) {
      throw InputError("constraints", "a constraint names node " + std::to_string(c.node) +
                                          " component " + std::to_string(c.component) +
                                          ", outside the matrix");
    }
    free_of[static_cast<size_t>(dof)] = -1;
  }
  std::vector<int> free_dofs;
  for (int d = 0; d < n_dofs; ++d) {
    if (free_of[static_cast<size_t>(d)] < 0) continue;
    free_of[static_cast<size_t>(d)] = static_cast<int>(free_dofs.size());
    free_dofs.push_back(d);
  }
  detail::CholmodCommon common;
  configure(common.get(), ordering);
  OrderingEstimate out;
  std::vector<double> diagonal;
  long nnz = 0;
  const detail::SparsePtr A =
      detail::own(free_block_upper(K, free_dofs, free_of, common.get(), &diagonal, &nnz), common);
  const auto t0 = Clock::now();
  std::vector<int> node_order;
  if (ordering == Ordering::kMetisNodes) {
    node_order =
        metis_node_order(node_adjacency(K), nodes_of_dofs(free_dofs, n_dofs / 3), common.get());
  }
  const detail::FactorPtr L =
      detail::own(ordering == Ordering::kMetisNodes && node_order.empty()
                      ? nullptr
                      : analyse(A.get(), free_dofs, ordering, node_order, n_dofs / 3, common.get()),
                  common);
  out.analyse_s = seconds_since(t0);
  const int status = common->status;
  if (L) {
    out.ordering =
        ordering == Ordering::kMetisNodes ? std::string("metis-nodes") : ordering_name(L->ordering);
    out.factorisation_gflop = common->fl / 1e9;
    out.factor_nonzeros = static_cast<long long>(common->lnz);
  }
  if (out.ordering.empty() || status < CHOLMOD_OK) {
    throw SolverError("the analysis (fill-reducing ordering) failed: " +
                      cholmod_status_text(status));
  }
  return out;
}

const SolverStatistics& LinearElasticSolver::statistics() const { return impl_->stats; }
const Eigen::SparseMatrix<double>& LinearElasticSolver::stiffness() const { return impl_->K; }
const std::vector<DofConstraint>& LinearElasticSolver::constraints() const {
  return impl_->constraints;
}
int LinearElasticSolver::n_nodes() const { return impl_->n_nodes; }

}  // namespace sharpey::fem
