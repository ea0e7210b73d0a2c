// Plain-text helpers shared by the report writers (summary.txt and its allowance paragraph) and
// the verdict's words.
// Internal to the analysis and output libraries (a detail header, not their interface).
#pragma once

#include <cmath>
#include <cstdio>
#include <sstream>
#include <string>

namespace sharpey::analysis::detail {

// `v` with `decimals` decimals, "n/a" when it is not finite.
inline std::string fixed(double v, int decimals) {
  if (!std::isfinite(v)) return "n/a";
  char buffer[64];
  std::snprintf(buffer, sizeof buffer, "%.*f", decimals, v);
  return buffer;
}

// Wraps `text` at `width` columns: the first line starts with `first`, the others with `indent`.
inline std::string wrap(const std::string& text, size_t width, const std::string& first = "",
                        const std::string& indent = "") {
  std::istringstream words(text);
  std::string word, line = first, out;
  size_t start = first.size();
  while (words >> word) {
    if (line.size() > start && line.size() + 1 + word.size() > width) {
      out += line + "\n";
      line = indent;
      start = indent.size();
    }
    if (line.size() > start) line += ' ';
    line += word;
  }
  if (line.size() > start) out += line + "\n";
  return out;
}

}  // namespace sharpey::analysis::detail
