// Case variations for parameter sweeps: "KEY=V1,V2" options and setting one case-file value by
// its dotted path on the JSON text (so every variation goes through the same reader and checks as
// a hand-written case file).
#include <cctype>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "sharpey/analysis/case_spec.h"
#include "sharpey/error.h"

namespace sharpey::analysis {

namespace {

using Json = nlohmann::ordered_json;

std::string trim(const std::string& s) {
  size_t a = 0, b = s.size();
  while (a < b && std::isspace(static_cast<unsigned char>(s[a]))) ++a;
  while (b > a && std::isspace(static_cast<unsigned char>(s[b - 1]))) --b;
  return s.substr(a, b - a);
}

[[noreturn]] void bad_vary(const std::string& option, const std::string& problem) {
  throw InputError("--vary", "--vary " + option + ": " + problem +
                                 "; write --vary KEY=V1,V2,... with KEY a case-file path such as "
                                 "load.magnitude or scenarios[1].horizontal_loss_mm");
}

struct PathStep {
  std::string name;           // object key
  std::vector<size_t> index;  // array indices after the key
};

std::vector<PathStep> parse_path(const std::string& key, const std::string& option) {
  std::vector<PathStep> steps;
  size_t i = 0;
  while (i < key.size()) {
    PathStep step;
    while (i < key.size() && (std::isalnum(static_cast<unsigned char>(key[i])) || key[i] == '_'))
      step.name += key[i++];
    if (step.name.empty()) bad_vary(option, "\"" + key + "\" is not a dotted key path");
    while (i < key.size() && key[i] == '[') {
      ++i;
      std::string digits;
      while (i < key.size() && std::isdigit(static_cast<unsigned char>(key[i]))) digits += key[i++];
      if (digits.empty() || i >= key.size() || key[i] != ']' || digits.size() > 6)
        bad_vary(option, "\"" + key + "\" has a malformed array index (use e.g. scenarios[0])");
      ++i;
      step.index.push_back(std::stoul(digits));
    }
    steps.push_back(step);
    if (i < key.size()) {
      if (key[i] != '.' || i + 1 == key.size())
        bad_vary(option, "\"" + key + "\" is not a dotted key path");
      ++i;
    }
  }
  if (steps.empty()) bad_vary(option, "the key is empty");
  return steps;
}

// Splits on commas outside brackets and quotes.
std::vector<std::string> split_values(const std::string& list) {
  std::vector<std::string> out;
  std::string current;
  int depth = 0;
  bool quoted = false;
  for (char c : list) {
    if (c == '"') quoted = !quoted;
    if (!quoted && (c == '[' || c == '{')) ++depth;
    if (!quoted && (c == ']' || c == '}')) --depth;
    if (c == ',' && depth == 0 && !quoted) {
      out.push_back(trim(current));
      current.clear();
    } else {
      current += c;
    }
  }
  out.push_back(trim(current));
  return out;
}

Json value_json(const std::string& value) {
  Json parsed = Json::parse(value, nullptr, /*allow_exceptions=*/false);
  if (parsed.is_discarded()) return Json(value);  // a bare word: a string
  return parsed;
}

}  // namespace

CaseVariation parse_variation(const std::string& option) {
  const size_t eq = option.find('=');
  if (eq == std::string::npos) bad_vary(option, "there is no '='");
  CaseVariation v;
  v.key = trim(option.substr(0, eq));
  parse_path(v.key, option);  // checks the form
  const std::string list = option.substr(eq + 1);
  if (trim(list).empty()) bad_vary(option, "no values after '='");
  v.values = split_values(list);
  for (const std::string& value : v.values)
    if (value.empty()) bad_vary(option, "an empty value in the list");
  return v;
}

std::string set_case_value(const std::string& json_text, const std::string& key,
                           const std::string& value) {
  const std::string option = key + "=" + value;
  const std::vector<PathStep> steps = parse_path(key, option);
  Json root = Json::parse(json_text, nullptr, /*allow_exceptions=*/false);
  if (!root.is_object()) bad_vary(option, "the case file is not a JSON object");
  Json* node = &root;
  std::string walked;
  for (size_t s = 0; s < steps.size(); ++s) {
    const PathStep& step = steps[s];
    const bool last = s + 1 == steps.size();
    // A non-object on the way (e.g. a named direction replaced by angles) becomes an object.
    if (!node->is_object()) *node = Json::object();
    walked += (walked.empty() ? "" : ".") + step.name;
    if (step.index.empty()) {
      node = &(*node)[step.name];
    } else {
      Json* array = &(*node)[step.name];
      for (size_t idx : step.index) {
        if (!array->is_array() || idx >= array->size())
          bad_vary(
              option,
              walked + " has no element [" + std::to_string(idx) + "] in the case file" +
                  (array->is_array() ? " (it has " + std::to_string(array->size()) + ")" : ""));
        walked += "[" + std::to_string(idx) + "]";
        array = &(*array)[idx];
      }
      node = array;
    }
    if (last) *node = value_json(value);
  }
  return root.dump(2);
}

}  // namespace sharpey::analysis
