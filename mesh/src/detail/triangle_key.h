// The sorted vertex triple of a triangle: the key that finds a face from any element (or surface
// triangle) that holds the same three vertices, whatever their order, with its hash.
#pragma once

#include <algorithm>
#include <array>
#include <cstddef>
#include <cstdint>

namespace sharpey::mesh::detail {

struct TriangleKey {
  std::array<int, 3> v;
  TriangleKey(int a, int b, int c) : v{a, b, c} { std::sort(v.begin(), v.end()); }
  bool operator==(const TriangleKey& o) const { return v == o.v; }
};

struct TriangleKeyHash {
  size_t operator()(const TriangleKey& k) const {
    std::uint64_t h = 1469598103934665603ull;  // FNV-1a over the three indices
    for (int x : k.v) h = (h ^ static_cast<std::uint32_t>(x)) * 1099511628211ull;
    return static_cast<size_t>(h);
  }
};

}  // namespace sharpey::mesh::detail
