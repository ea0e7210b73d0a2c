#include "detail/node_graph.h"

#include <algorithm>

namespace sharpey::fem::detail {

NodeGraph build_node_graph(const mesh::VolumeMesh& m) {
  const int n = m.n_nodes(), n_elements = m.n_elements(), k = m.nodes_per_element;
  NodeGraph g;
  // Elements of each node (counting sort keeps them ascending).
  g.element_ptr.assign(static_cast<size_t>(n) + 1, 0);
  for (int v : m.elements) ++g.element_ptr[static_cast<size_t>(v) + 1];
  for (int i = 0; i < n; ++i) g.element_ptr[i + 1] += g.element_ptr[i];
  g.node_elements.resize(m.elements.size());
  {
    std::vector<long long> next(g.element_ptr.begin(), g.element_ptr.end() - 1);
    for (int e = 0; e < n_elements; ++e) {
      const int* en = m.element(e);
      for (int a = 0; a < k; ++a) g.node_elements[static_cast<size_t>(next[en[a]]++)] = e;
    }
  }
  // Neighbours: two passes (count, then fill and sort), a per-thread stamp array avoids sets.
  g.ptr.assign(static_cast<size_t>(n) + 1, 0);
#pragma omp parallel
  {
    std::vector<int> stamp(static_cast<size_t>(n), -1);
#pragma omp for schedule(static)
    for (int i = 0; i < n; ++i) {
      long long count = 0;
      for (long long p = g.element_ptr[i]; p < g.element_ptr[i + 1]; ++p) {
        const int* en = m.element(g.node_elements[static_cast<size_t>(p)]);
        for (int a = 0; a < k; ++a) {
          if (stamp[static_cast<size_t>(en[a])] != i) {
            stamp[static_cast<size_t>(en[a])] = i;
            ++count;
          }
        }
      }
      g.ptr[static_cast<size_t>(i) + 1] = count;
    }
  }
  for (int i = 0; i < n; ++i) g.ptr[i + 1] += g.ptr[i];
  g.adjacent.resize(static_cast<size_t>(g.ptr[n]));
#pragma omp parallel
  {
    std::vector<int> stamp(static_cast<size_t>(n), -1);
#pragma omp for schedule(static)
    for (int i = 0; i < n; ++i) {
      long long out = g.ptr[i];
      for (long long p = g.element_ptr[i]; p < g.element_ptr[i + 1]; ++p) {
        const int* en = m.element(g.node_elements[static_cast<size_t>(p)]);
        for (int a = 0; a < k; ++a) {
          if (stamp[static_cast<size_t>(en[a])] != i) {
            stamp[static_cast<size_t>(en[a])] = i;
            g.adjacent[static_cast<size_t>(out++)] = en[a];
          }
        }
      }
      std::sort(g.adjacent.begin() + g.ptr[i], g.adjacent.begin() + g.ptr[i + 1]);
    }
  }
  return g;
}

}  // namespace sharpey::fem::detail
