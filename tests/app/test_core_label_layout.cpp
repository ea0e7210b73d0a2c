// Threshold-name placement beside a colour bar (core/label_layout): labels never overlap, stay
// inside their span, keep their order and move as little as possible.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <numeric>
#include <random>

#include "core/label_layout.h"

namespace sharpey::app {
namespace {

// Checks the three hard rules for one placement.
void expect_valid(const std::vector<double>& anchors, const std::vector<double>& centres, double h,
                  double lo, double hi) {
  ASSERT_EQ(centres.size(), anchors.size());
  std::vector<size_t> order(anchors.size());
  std::iota(order.begin(), order.end(), size_t{0});
  std::stable_sort(order.begin(), order.end(),
                   [&](size_t a, size_t b) { return anchors[a] < anchors[b]; });
  for (size_t k = 0; k < order.size(); ++k) {
    const double c = centres[order[k]];
    EXPECT_GE(c - h / 2, lo - 1e-9);
    EXPECT_LE(c + h / 2, hi + 1e-9);
    if (k > 0) {
      EXPECT_GE(c - centres[order[k - 1]], h - 1e-9) << "labels overlap or swapped";
    }
  }
}

TEST(LabelLayout, LabelsFarApartStayAtTheirAnchors) {
  const std::vector<double> a = {40, 100, 300};
  const auto c = spread_labels(a, 14, 0, 400);
  for (size_t i = 0; i < a.size(); ++i) EXPECT_DOUBLE_EQ(c[i], a[i]);
}

TEST(LabelLayout, TwoCloseLabelsMoveApartSymmetrically) {
  // Capillary pressure and the limit a few pixels apart on a bar spanning +-380 kPa.
  const std::vector<double> a = {206.0, 201.0};  // the limit (second) is higher up the bar
  const double h = 15;
  const auto c = spread_labels(a, h, 0, 420);
  expect_valid(a, c, h, 0, 420);
  EXPECT_NEAR(c[0] - c[1], h, 1e-12);                            // just touching
  EXPECT_NEAR(0.5 * (c[0] + c[1]), 0.5 * (a[0] + a[1]), 1e-12);  // least move: equal and opposite
}

TEST(LabelLayout, LabelsNearAnEndArePushedInsideTheSpan) {
  const std::vector<double> a = {2, 5};
  const double h = 12;
  const auto c = spread_labels(a, h, 0, 100);
  expect_valid(a, c, h, 0, 100);
  EXPECT_DOUBLE_EQ(c[0], 6);  // the first sits on the span's start
  EXPECT_DOUBLE_EQ(c[1], 18);
  const std::vector<double> b = {99, 97, 98};
  const auto d = spread_labels(b, h, 0, 100);
  expect_valid(b, d, h, 0, 100);
  EXPECT_DOUBLE_EQ(*std::max_element(d.begin(), d.end()), 94);  // the last ends on the span's end
}

TEST(LabelLayout, TooManyToFitAreStackedFromTheStart) {
  const auto c = spread_labels({50, 50, 50}, 20, 0, 50);
  EXPECT_DOUBLE_EQ(c[0], 10);
  EXPECT_DOUBLE_EQ(c[1], 30);
  EXPECT_DOUBLE_EQ(c[2], 50);
  EXPECT_TRUE(spread_labels({}, 10, 0, 100).empty());
}

TEST(LabelLayout, RandomSetsAreValidAndMoveTheLeast) {
  std::mt19937 rng(7);
  std::uniform_real_distribution<double> pos(0, 200);
  std::uniform_int_distribution<int> count(1, 6);
  for (int trial = 0; trial < 300; ++trial) {
    std::vector<double> a(static_cast<size_t>(count(rng)));
    for (double& v : a) v = pos(rng);
    const double h = 14, lo = 0, hi = 200;
    const auto c = spread_labels(a, h, lo, hi);
    expect_valid(a, c, h, lo, hi);
    // Optimality (derived from the least-squares conditions): in every run of touching labels
    // that touches neither end of the span, the moves add up to zero.
    std::vector<size_t> order(a.size());
    std::iota(order.begin(), order.end(), size_t{0});
    std::stable_sort(order.begin(), order.end(), [&](size_t x, size_t y) { return a[x] < a[y]; });
    size_t start = 0;
    for (size_t k = 1; k <= order.size(); ++k) {
      const bool touching = k < order.size() && c[order[k]] - c[order[k - 1]] < h + 1e-9;
      if (touching) continue;
      const bool at_lo = c[order[start]] - h / 2 < lo + 1e-9;
      const bool at_hi = c[order[k - 1]] + h / 2 > hi - 1e-9;
      double moved = 0;
      for (size_t j = start; j < k; ++j) moved += c[order[j]] - a[order[j]];
      if (!at_lo && !at_hi) {
        EXPECT_NEAR(moved, 0, 1e-9) << "trial " << trial;
      }
      if (at_lo) {
        EXPECT_GE(moved, -1e-9) << "pushed inside from the start";
      }
      if (at_hi) {
        EXPECT_LE(moved, 1e-9) << "pushed inside from the end";
      }
      start = k;
    }
  }
}

}  // namespace
}  // namespace sharpey::app
