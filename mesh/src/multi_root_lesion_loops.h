// Degree I and II furcation lesions in the multi-rooted mesh (multi_root_mesh.cpp): the furcation
// roof's inner loop (the roots' inner arcs on the furcation plane joined along the roots' hull),
// its edges labelled septum or lesion, split into the lesions' and the septum's loops by straight
// cuts across the roof.
#pragma once

#include <Eigen/Core>
#include <array>
#include <vector>

namespace sharpey::mesh::detail {

struct InnerLoopSplit {
  // Each loop as positions in the inner loop, in the inner loop's direction of travel.
  std::vector<std::vector<int>> lesion_loops;
  std::vector<int> lesion_label;  // the label of each lesion loop (ascending)
  std::vector<std::vector<int>> septum_loops;
  // Per lesion loop, its cuts in walking order: {a, b}, the walk leaves the loop's edges at a and
  // resumes at b; the lesion lies on lesion_side (+1 left, -1 right) of a -> b.
  std::vector<std::vector<std::array<int, 2>>> cuts;
  std::vector<int> lesion_side;
  std::vector<double> lesion_area_mm2;  // enclosed by each lesion loop
};

// loop: the inner loop's points (mm, in the plane; closed, counter-clockwise or not);
// edge_label[m]: the edge from point m to point m + 1, -1 for the septum (attached roof) or the
// lesion's label L >= 0, whose probing direction is direction[L] (unit) and whose walk starts at
// point entry[L] when that point begins one of its edges. Where a lesion's edges stop, its loop is
// closed by a straight cut to where they resume: the boundary points of each lesion, ordered
// across its probing direction, pair up as a straight line through the region would cross it
// (first with second, third with fourth). Throws MeshError when two lesions meet, when a label
// holds no edge or every edge, or when the cuts do not pair a lesion's end with a lesion's start.
// A loop of two points (a single edge cut off by its own chord) goes to the other side.
InnerLoopSplit split_inner_loop(const std::vector<Eigen::Vector2d>& loop,
                                std::vector<int> edge_label,
                                const std::vector<Eigen::Vector2d>& direction,
                                const std::vector<int>& entry);

}  // namespace sharpey::mesh::detail
