// Placement of short text labels along one axis (the threshold names beside a colour bar): each
// label wants to be centred at its anchor; labels that would overlap are pushed apart as little as
// possible, in their anchors' order, and all are kept inside the allowed span. QtCore-free logic,
// tested without a display.
#pragma once

#include <vector>

namespace sharpey::app {

// Centres (same order as `anchors`) for labels `height` tall: no two closer than `height`, every
// label wholly inside [lo, hi] when they fit (n * height <= hi - lo), order of the anchors kept,
// and the sum of squared moves the least such placement has. When they do not fit they are
// stacked from `lo`, `height` apart. Non-finite anchors are treated as `lo`.
std::vector<double> spread_labels(const std::vector<double>& anchors, double height, double lo,
                                  double hi);

}  // namespace sharpey::app
