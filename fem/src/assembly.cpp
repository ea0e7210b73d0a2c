#include "sharpey/fem/assembly.h"

#include <omp.h>

#include <algorithm>
#include <chrono>
#include <climits>
#include <exception>
#include <functional>
#include <map>
#include <string>
#include <utility>

#include "detail/kinematics.h"
#include "detail/node_graph.h"
#include "sharpey/error.h"

namespace sharpey::fem {
namespace {

double seconds_since(std::chrono::steady_clock::time_point t0) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
}

// Splits the elements into `n_parts` slabs of equal element count along the longest extent of the
// mesh (by centroid). An element is an interface element when one of its nodes is shared with an
// element of another slab; the others of a slab touch only nodes no other slab touches, so slabs
// can be assembled concurrently without synchronisation.
void partition_elements(const mesh::VolumeMesh& m, int n_parts, std::vector<int>* slab,
                        std::vector<char>* interface) {
  const int n_elements = m.n_elements(), k = m.nodes_per_element;
  Eigen::Vector3d lo = Eigen::Vector3d::Constant(1e300), hi = Eigen::Vector3d::Constant(-1e300);
  for (const Eigen::Vector3d& x : m.nodes) {
    lo = lo.cwiseMin(x);
    hi = hi.cwiseMax(x);
  }
  int axis = 0;
  (hi - lo).maxCoeff(&axis);
  std::vector<std::pair<double, int>> key(static_cast<size_t>(n_elements));
  for (int e = 0; e < n_elements; ++e) {
    double c = 0;
    for (int a = 0; a < 4; ++a) c += m.nodes[static_cast<size_t>(m.element(e)[a])](axis);
    key[static_cast<size_t>(e)] = {c, e};
  }
  std::sort(key.begin(), key.end());
  slab->assign(static_cast<size_t>(n_elements), 0);
  for (size_t i = 0; i < key.size(); ++i) {
    (*slab)[static_cast<size_t>(key[i].second)] =
        static_cast<int>(i * static_cast<size_t>(n_parts) / key.size());
  }
  // Node owner: the slab of its elements, or -1 when elements of several slabs share it.
  std::vector<int> owner(static_cast<size_t>(m.n_nodes()), -2);
  for (int e = 0; e < n_elements; ++e) {
    const int s = (*slab)[static_cast<size_t>(e)];
    for (int a = 0; a < k; ++a) {
      int& o = owner[static_cast<size_t>(m.element(e)[a])];
      o = (o == -2 || o == s) ? s : -1;
    }
  }
  interface->assign(static_cast<size_t>(n_elements), 0);
  for (int e = 0; e < n_elements; ++e) {
    for (int a = 0; a < k; ++a) {
      if (owner[static_cast<size_t>(m.element(e)[a])] < 0) (*interface)[static_cast<size_t>(e)] = 1;
    }
  }
}

// Adds element matrices into the value array of the pattern built from `g`.
template <int K>
class Scatter {
 public:
  Scatter(const mesh::VolumeMesh& m, const detail::NodeGraph& g, double* values)
      : m_(m), g_(g), values_(values) {}

  void add(int e, const detail::ElementMatrix<K>& Ke) const {
    const int* en = m_.element(e);
    for (int b = 0; b < K; ++b) {
      const int nb = en[b];
      const long long begin = g_.ptr[nb], deg = g_.degree(nb);
      const int* adj = g_.adjacent.data() + begin;
      for (int a = 0; a < K; ++a) {
        const long long p = std::lower_bound(adj, adj + deg, en[a]) - adj;
        for (int c = 0; c < 3; ++c) {
          double* col = values_ + 9 * begin + 3 * c * deg + 3 * p;
          for (int r = 0; r < 3; ++r) col[r] += Ke(3 * a + r, 3 * b + c);
        }
      }
    }
  }

 private:
  const mesh::VolumeMesh& m_;
  const detail::NodeGraph& g_;
  double* values_;
};

// Records the first error raised inside a parallel region (exceptions must not leave it).
class ErrorSlot {
 public:
  void capture() {
#pragma omp critical(sharpey_fem_error_slot)
    if (!error_) error_ = std::current_exception();
  }
  bool failed() const { return static_cast<bool>(error_); }
  void rethrow() const {
    if (error_) std::rethrow_exception(error_);
  }

 private:
  std::exception_ptr error_;
};

// Computes the stiffness matrix of element e into *Ke; throws MeshError for an inverted element.
template <int K>
using ElementKernel = std::function<void(int e, detail::ElementMatrix<K>* Ke)>;

// Serial: every element in index order.
template <int K>
void assemble_serial(const Scatter<K>& scatter, int n_elements, const ElementKernel<K>& element) {
  detail::ElementMatrix<K> Ke;
  for (int e = 0; e < n_elements; ++e) {
    element(e, &Ke);
    scatter.add(e, Ke);
  }
}

// Partitioned (docs/fem-solver.md): each thread adds the elements of its slab whose nodes no other
// slab touches, without synchronisation; then the interface elements are added serially.
template <int K>
void assemble_partitioned(const mesh::VolumeMesh& m, const Scatter<K>& scatter, int n_threads,
                          const ElementKernel<K>& element, AssemblyStatistics* stats) {
  const int n_elements = m.n_elements();
  const auto t0 = std::chrono::steady_clock::now();
  std::vector<int> slab;
  std::vector<char> interface;
  partition_elements(m, n_threads, &slab, &interface);
  if (stats) {
    stats->colouring_s = seconds_since(t0);
    stats->n_interface_elements = std::count(interface.begin(), interface.end(), 1);
  }
  ErrorSlot error;
  // The team may be smaller than asked for (OMP_THREAD_LIMIT, a nested region, a thread that
  // could not be started): each thread takes every team-size-th slab, so every slab is added.
#pragma omp parallel num_threads(n_threads)
  {
    detail::ElementMatrix<K> Ke;
    const int team = omp_get_num_threads();
    for (int me = omp_get_thread_num(); me < n_threads; me += team) {
      for (int e = 0; e < n_elements; ++e) {
        if (slab[static_cast<size_t>(e)] != me || interface[static_cast<size_t>(e)]) continue;
        if (error.failed()) break;
        try {
          element(e, &Ke);
          scatter.add(e, Ke);
        } catch (...) {
          error.capture();
        }
      }
    }
  }
  error.rethrow();
  detail::ElementMatrix<K> Ke;
  for (int e = 0; e < n_elements; ++e) {
    if (!interface[static_cast<size_t>(e)]) continue;
    element(e, &Ke);
    scatter.add(e, Ke);
  }
}

template <int K>
void assemble_values(const mesh::VolumeMesh& m, const detail::NodeGraph& g,
                     const std::vector<const Matrix6d*>& D_of_element,
                     const AssemblyOptions& options, int n_threads, AssemblyStatistics* stats,
                     double* values) {
  const Scatter<K> scatter(m, g, values);
  const ElementKernel<K> element = [&](int e, detail::ElementMatrix<K>* Ke) {
    const Matrix6d& D = *D_of_element[static_cast<size_t>(e)];
    const detail::NodeCoords<K> X = detail::element_coordinates<K>(m, e);
    double lambda = 0, mu = 0;
    const double det = detail::isotropic_parameters(D, &lambda, &mu)
                           ? detail::element_stiffness_isotropic<K>(X, lambda, mu, Ke)
                           : detail::element_stiffness_fixed<K>(X, D, Ke);
    if (!(det > 0)) throw MeshError(detail::inverted_element_message(m, e, det));
  };
  if (options.strategy == AssemblyStrategy::kSerial || n_threads == 1) {
    assemble_serial(scatter, m.n_elements(), element);
  } else {
    assemble_partitioned(m, scatter, n_threads, element, stats);
  }
}

}  // namespace

Eigen::SparseMatrix<double> assemble_stiffness(const mesh::VolumeMesh& mesh,
                                               const MaterialTable& materials) {
  return assemble_stiffness(mesh, materials, AssemblyOptions{});
}

Eigen::SparseMatrix<double> assemble_stiffness(const mesh::VolumeMesh& mesh,
                                               const MaterialTable& materials,
                                               const AssemblyOptions& options,
                                               AssemblyStatistics* statistics) {
  detail::validate_mesh(mesh);
  AssemblyStatistics stats;
  // Elasticity matrix per region (validates the table: every region needs a valid material).
  std::map<int, Matrix6d> D_of_region;
  for (int r : mesh.element_region) {
    if (D_of_region.count(r) == 0) D_of_region[r] = elasticity_matrix(material_of(materials, r));
  }
  std::vector<const Matrix6d*> D_of_element(mesh.element_region.size());
  for (size_t e = 0; e < D_of_element.size(); ++e)
    D_of_element[e] = &D_of_region[mesh.element_region[e]];

  auto t0 = std::chrono::steady_clock::now();
  const detail::NodeGraph g = detail::build_node_graph(mesh);
  const int n = mesh.n_nodes();
  const long long nnz = 9 * g.ptr[static_cast<size_t>(n)];
  if (nnz > INT_MAX || 3LL * n > INT_MAX) {
    throw InputError("mesh", "the stiffness matrix would hold " + std::to_string(nnz) +
                                 " entries, more than the 32-bit index limit; use a coarser mesh");
  }
  const int n_dofs = 3 * n;
  Eigen::SparseMatrix<double> K(n_dofs, n_dofs);
  K.resizeNonZeros(static_cast<Eigen::Index>(nnz));
  int* outer = K.outerIndexPtr();
  int* inner = K.innerIndexPtr();
  double* values = K.valuePtr();
  // Column 3j+c holds rows 3i, 3i+1, 3i+2 for every neighbour i of j, ascending.
#pragma omp parallel for schedule(static)
  for (int j = 0; j < n; ++j) {
    const long long begin = g.ptr[j], deg = g.degree(j);
    for (int c = 0; c < 3; ++c) {
      const long long start = 9 * begin + 3 * c * deg;
      outer[3 * j + c] = static_cast<int>(start);
      for (long long p = 0; p < deg; ++p) {
        const int i = g.adjacent[static_cast<size_t>(begin + p)];
        for (int r = 0; r < 3; ++r) inner[start + 3 * p + r] = 3 * i + r;
      }
    }
  }
  outer[n_dofs] = static_cast<int>(nnz);
  std::fill(values, values + nnz, 0.0);
  stats.pattern_s = seconds_since(t0);
  stats.n_nonzeros = nnz;

  const int n_threads = options.strategy == AssemblyStrategy::kSerial
                            ? 1
                            : (options.n_threads > 0 ? options.n_threads : omp_get_max_threads());
  stats.n_threads = n_threads;
  t0 = std::chrono::steady_clock::now();
  if (mesh.nodes_per_element == 4) {
    assemble_values<4>(mesh, g, D_of_element, options, n_threads, &stats, values);
  } else {
    assemble_values<10>(mesh, g, D_of_element, options, n_threads, &stats, values);
  }
  stats.values_s = seconds_since(t0) - stats.colouring_s;
  if (statistics) *statistics = stats;
  return K;
}

std::vector<DofConstraint> fix_faces(const mesh::VolumeMesh& mesh, int marker) {
  std::vector<int> nodes;
  const int kf = mesh.nodes_per_face;
  for (int f = 0; f < mesh.n_faces(); ++f) {
    if (mesh.face_marker[static_cast<size_t>(f)] != marker) continue;
    nodes.insert(nodes.end(), mesh.face(f), mesh.face(f) + kf);
  }
  if (nodes.empty()) {
    throw InputError("marker", "no boundary face carries marker " + std::to_string(marker) +
                                   ", so nothing would be held fixed; check the face markers of "
                                   "the mesh");
  }
  std::sort(nodes.begin(), nodes.end());
  nodes.erase(std::unique(nodes.begin(), nodes.end()), nodes.end());
  std::vector<DofConstraint> out;
  out.reserve(3 * nodes.size());
  for (int v : nodes) {
    for (int c = 0; c < 3; ++c) out.push_back({v, c, 0.0});
  }
  return out;
}

}  // namespace sharpey::fem
