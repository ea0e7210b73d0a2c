// split_inner_loop(): the furcation roof's inner loop split into lesion and septum loops.
#include "multi_root_lesion_loops.h"

#include <algorithm>
#include <map>
#include <string>

#include "sharpey/error.h"

namespace sharpey::mesh::detail {
namespace {

MeshError lesion_error(const std::string& what) {
  return MeshError("meshing the furcation lesion: " + what +
                   "; change horizontal_mm a little, or use degree III");
}

// partner[m] for every point where the label changes: the lesion's boundary points ordered across
// its probing direction, paired first with second, third with fourth.
std::vector<int> pair_boundaries(const std::vector<Eigen::Vector2d>& loop,
                                 const std::vector<int>& label,
                                 const std::vector<Eigen::Vector2d>& direction) {
  const int M = static_cast<int>(loop.size());
  std::map<int, std::vector<int>> ends;  // by lesion label
  for (int m = 0; m < M; ++m) {
    const int in = label[m], out = label[(m + M - 1) % M];
    if (in == out) continue;
    if (in >= 0 && out >= 0) throw lesion_error("two lesions meet on the roots' inner faces");
    ends[std::max(in, out)].push_back(m);
  }
  std::vector<int> partner(M, -1);
  for (auto& [L, pts] : ends) {
    const Eigen::Vector2d across(-direction[L].y(), direction[L].x());
    std::sort(pts.begin(), pts.end(),
              [&](int a, int b) { return loop[a].dot(across) < loop[b].dot(across); });
    for (size_t k = 0; k + 1 < pts.size(); k += 2) {
      const int a = pts[k], b = pts[k + 1];
      if ((label[a] == L) == (label[b] == L))
        throw lesion_error("a cut across the roof would join two ends of the lesion's edges");
      partner[a] = b;
      partner[b] = a;
    }
  }
  return partner;
}

// The loop through the edges labelled `group` that contains point `start` (which begins one).
std::vector<int> walk(int start, int group, const std::vector<int>& label,
                      const std::vector<int>& partner, std::vector<char>* used,
                      std::vector<std::array<int, 2>>* cuts) {
  const int M = static_cast<int>(label.size());
  std::vector<int> out;
  int m = start;
  do {
    out.push_back(m);
    if (label[m] == group) {
      (*used)[m] = 1;
      m = (m + 1) % M;
    } else {
      if (cuts) cuts->push_back({m, partner[m]});
      m = partner[m];
    }
    if (m < 0 || static_cast<int>(out.size()) > 2 * M)
      throw lesion_error("its loop across the roof does not close");
  } while (m != start);
  return out;
}

double signed_area(const std::vector<Eigen::Vector2d>& loop, const std::vector<int>& idx) {
  double a = 0;
  for (size_t k = 0; k < idx.size(); ++k) {
    const Eigen::Vector2d &p = loop[idx[k]], &q = loop[idx[(k + 1) % idx.size()]];
    a += p.x() * q.y() - q.x() * p.y();
  }
  return 0.5 * a;
}

}  // namespace

namespace {

InnerLoopSplit split_once(const std::vector<Eigen::Vector2d>& loop,
                          const std::vector<int>& edge_label,
                          const std::vector<Eigen::Vector2d>& direction,
                          const std::vector<int>& entry) {
  const int M = static_cast<int>(loop.size());
  const int n_septum = static_cast<int>(std::count(edge_label.begin(), edge_label.end(), -1));
  if (n_septum == 0 || n_septum == M)
    throw lesion_error("its horizontal depth covers " + std::string(n_septum ? "none" : "all") +
                       " of the roots' inner faces on the mesh's rings");
  const std::vector<int> partner = pair_boundaries(loop, edge_label, direction);
  InnerLoopSplit s;
  std::vector<char> used(M, 0);
  for (int L = 0; L < static_cast<int>(direction.size()); ++L) {
    if (std::find(edge_label.begin(), edge_label.end(), L) == edge_label.end()) continue;
    int start = entry[L];
    while (true) {
      if (start < 0 || start >= M || edge_label[start] != L || used[start]) {
        start = -1;
        for (int m = 0; m < M && start < 0; ++m)
          if (edge_label[m] == L && !used[m]) start = m;
      }
      if (start < 0) break;
      s.cuts.emplace_back();
      s.lesion_loops.push_back(walk(start, L, edge_label, partner, &used, &s.cuts.back()));
      s.lesion_label.push_back(L);
      const double area = signed_area(loop, s.lesion_loops.back());
      s.lesion_side.push_back(area > 0 ? 1 : -1);
      s.lesion_area_mm2.push_back(std::abs(area));
    }
  }
  for (int m = 0; m < M; ++m)
    if (edge_label[m] == -1 && !used[m])
      s.septum_loops.push_back(walk(m, -1, edge_label, partner, &used, nullptr));
  return s;
}

}  // namespace

InnerLoopSplit split_inner_loop(const std::vector<Eigen::Vector2d>& loop,
                                std::vector<int> edge_label,
                                const std::vector<Eigen::Vector2d>& direction,
                                const std::vector<int>& entry) {
  // A loop of two points (one edge cut off by its own chord) encloses nothing: its edge goes to
  // the other side, and the split is made again.
  for (size_t pass = 0; pass <= loop.size(); ++pass) {
    const InnerLoopSplit s = split_once(loop, edge_label, direction, entry);
    bool changed = false;
    for (size_t l = 0; l < s.lesion_loops.size(); ++l)
      if (s.lesion_loops[l].size() < 3)
        for (int m : s.lesion_loops[l]) changed |= edge_label[m] >= 0, edge_label[m] = -1;
    for (const std::vector<int>& septum : s.septum_loops)
      if (septum.size() < 3) {
        const int m = septum[0], M = static_cast<int>(loop.size());
        const int other = edge_label[(m + M - 1) % M] >= 0 ? edge_label[(m + M - 1) % M]
                                                           : edge_label[(m + 1) % M];
        for (int k : septum)
          if (edge_label[k] == -1) edge_label[k] = other, changed = true;
      }
    if (!changed) return s;
  }
  throw lesion_error("its loops across the roof do not settle");
}

}  // namespace sharpey::mesh::detail
