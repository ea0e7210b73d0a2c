// Constrained Delaunay triangulation of a planar domain with holes (detail/planar_triangulation.h).
// Domains are marked by nesting level from the infinite face: odd levels lie inside.
#include "../detail/planar_triangulation.h"

#include <CGAL/Constrained_Delaunay_triangulation_2.h>
#include <CGAL/Exact_predicates_inexact_constructions_kernel.h>
#include <CGAL/Triangulation_face_base_with_info_2.h>
#include <CGAL/Triangulation_vertex_base_with_info_2.h>

#include <cmath>
#include <list>
#include <string>

#include "sharpey/error.h"

namespace sharpey::mesh::detail {
namespace {

using K = CGAL::Exact_predicates_inexact_constructions_kernel;
struct FaceInfo {
  int nesting_level = -1;
};
using Vb = CGAL::Triangulation_vertex_base_with_info_2<int, K>;
using Fbb = CGAL::Triangulation_face_base_with_info_2<FaceInfo, K>;
using Fb = CGAL::Constrained_triangulation_face_base_2<K, Fbb>;
using Tds = CGAL::Triangulation_data_structure_2<Vb, Fb>;
using Cdt = CGAL::Constrained_Delaunay_triangulation_2<K, Tds, CGAL::Exact_predicates_tag>;

void mark(Cdt& cdt, Cdt::Face_handle start, int level, std::list<Cdt::Edge>* border) {
  if (start->info().nesting_level != -1) return;
  std::list<Cdt::Face_handle> queue{start};
  while (!queue.empty()) {
    Cdt::Face_handle f = queue.front();
    queue.pop_front();
    if (f->info().nesting_level != -1) continue;
    f->info().nesting_level = level;
    for (int i = 0; i < 3; ++i) {
      const Cdt::Edge e(f, i);
      const Cdt::Face_handle n = f->neighbor(i);
      if (n->info().nesting_level != -1) continue;
      if (cdt.is_constrained(e)) {
        border->push_back(e);
      } else {
        queue.push_back(n);
      }
    }
  }
}

}  // namespace

std::vector<std::array<int, 3>> triangulate_planar(
    const std::vector<std::vector<Eigen::Vector2d>>& loops, double spacing_mm,
    std::vector<Eigen::Vector2d>* points) {
  points->clear();
  Cdt cdt;
  Eigen::Vector2d lo(1e300, 1e300), hi(-1e300, -1e300);
  for (const auto& loop : loops) {
    std::vector<Cdt::Vertex_handle> v;
    for (const Eigen::Vector2d& p : loop) {
      Cdt::Vertex_handle h = cdt.insert(K::Point_2(p.x(), p.y()));
      h->info() = static_cast<int>(points->size());
      points->push_back(p);
      v.push_back(h);
      lo = lo.cwiseMin(p);
      hi = hi.cwiseMax(p);
    }
    for (size_t i = 0; i < v.size(); ++i) cdt.insert_constraint(v[i], v[(i + 1) % v.size()]);
  }
  const size_t n_boundary = points->size();
  // Interior grid points, away from the boundary points.
  const double keep = 0.6 * spacing_mm;
  for (double x = lo.x() + 0.5 * spacing_mm; x < hi.x(); x += spacing_mm) {
    for (double y = lo.y() + 0.5 * spacing_mm; y < hi.y(); y += spacing_mm) {
      const Eigen::Vector2d p(x, y);
      bool near = false;
      for (size_t i = 0; i < n_boundary && !near; ++i) near = ((*points)[i] - p).norm() < keep;
      if (near) continue;
      Cdt::Vertex_handle h = cdt.insert(K::Point_2(x, y));
      if (h->info() < 0 || h->info() >= static_cast<int>(points->size()) ||
          (*points)[h->info()] != p) {
        h->info() = static_cast<int>(points->size());
        points->push_back(p);
      }
    }
  }
  std::list<Cdt::Edge> border;
  mark(cdt, cdt.infinite_face(), 0, &border);
  while (!border.empty()) {
    const Cdt::Edge e = border.front();
    border.pop_front();
    const Cdt::Face_handle n = e.first->neighbor(e.second);
    if (n->info().nesting_level == -1) mark(cdt, n, e.first->info().nesting_level + 1, &border);
  }
  if (cdt.number_of_vertices() != points->size())
    throw MeshError("triangulating a planar face: " + std::to_string(points->size()) +
                    " points became " + std::to_string(cdt.number_of_vertices()) +
                    " (crossing or touching boundary loops)");
  std::vector<std::array<int, 3>> triangles;
  std::vector<int> used(points->size(), 0);
  for (auto f = cdt.finite_faces_begin(); f != cdt.finite_faces_end(); ++f) {
    if (f->info().nesting_level % 2 != 1) continue;
    std::array<int, 3> t{f->vertex(0)->info(), f->vertex(1)->info(), f->vertex(2)->info()};
    triangles.push_back(t);
    for (int k : t) used[k] = 1;
  }
  // Interior points outside the domain (in a hole or outside the outer loop) are unused: drop
  // them and renumber.
  std::vector<int> renumber(points->size(), -1);
  std::vector<Eigen::Vector2d> kept;
  for (size_t i = 0; i < points->size(); ++i) {
    if (i < n_boundary || used[i]) {
      renumber[i] = static_cast<int>(kept.size());
      kept.push_back((*points)[i]);
    }
  }
  for (auto& t : triangles)
    for (int& k : t) k = renumber[k];
  *points = kept;
  return triangles;
}

}  // namespace sharpey::mesh::detail
