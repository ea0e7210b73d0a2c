// The bone-level scenarios of the open case as the app edits them, the one on display and the
// two to four chosen for side-by-side comparison. Plain logic, no widgets.
#pragma once

#include <QString>
#include <vector>

#include "sharpey/analysis/case_spec.h"

namespace sharpey::app {

class ScenarioList {
 public:
  static constexpr int kMaxCompared = 4;
  static constexpr int kMinCompared = 2;

  ScenarioList() = default;
  explicit ScenarioList(std::vector<analysis::Scenario> scenarios);

  const std::vector<analysis::Scenario>& scenarios() const { return scenarios_; }
  int size() const { return static_cast<int>(scenarios_.size()); }
  const analysis::Scenario& at(int i) const;

  // Adds a horizontal-loss scenario named after its loss ("3.0 mm loss"); returns its index.
  // Throws InputError for a negative loss or a name already used.
  int add(double horizontal_loss_mm, const QString& name = {});
  // Removes scenario i; the last scenario cannot be removed (InputError).
  void remove(int i);
  void rename(int i, const QString& name);  // InputError for an empty or duplicate name
  // Sets the loss of scenario i; a generated name ("6 mm loss") follows the new value, a name the
  // user chose stays.
  void set_loss(int i, const mesh::BoneLoss& loss);

  // Scenario on display in the 3D view and the root map.
  int current() const { return current_; }
  void set_current(int i);

  // Scenarios shown side by side (indices, ascending). At most kMaxCompared; toggling a fifth on
  // is refused (returns false). Fewer than kMinCompared leaves the comparison empty.
  const std::vector<int>& compared() const { return compared_; }
  bool set_compared(int i, bool on);
  bool is_compared(int i) const;

  // Default name for a loss, e.g. "healthy" for 0, "2.5 mm loss" otherwise.
  static QString default_name(double horizontal_loss_mm);

 private:
  void reset_compared();
  std::vector<analysis::Scenario> scenarios_;
  int current_ = 0;
  std::vector<int> compared_;
};

}  // namespace sharpey::app
