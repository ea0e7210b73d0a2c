#include "core/scenario_list.h"

#include <algorithm>
#include <cassert>

#include "sharpey/error.h"

namespace sharpey::app {

ScenarioList::ScenarioList(std::vector<analysis::Scenario> scenarios)
    : scenarios_(std::move(scenarios)) {
  reset_compared();
}

const analysis::Scenario& ScenarioList::at(int i) const {
  assert(i >= 0 && i < size() && "scenario index out of range");
  return scenarios_[static_cast<size_t>(i)];
}

QString ScenarioList::default_name(double horizontal_loss_mm) {
  if (horizontal_loss_mm <= 0) return QStringLiteral("healthy");
  return QStringLiteral("%1 mm loss").arg(horizontal_loss_mm, 0, 'f', 1);
}

int ScenarioList::add(double horizontal_loss_mm, const QString& name) {
  if (!(horizontal_loss_mm >= 0)) {
    throw InputError("scenarios.horizontal_loss_mm",
                     "horizontal bone loss " + std::to_string(horizontal_loss_mm) +
                         " mm is negative; enter 0 (healthy crest) or more");
  }
  const QString chosen = name.isEmpty() ? default_name(horizontal_loss_mm) : name.trimmed();
  for (const auto& s : scenarios_) {
    if (QString::fromStdString(s.name) == chosen) {
      throw InputError("scenarios.name", "a bone level named \"" + chosen.toStdString() +
                                             "\" already exists; choose another name");
    }
  }
  analysis::Scenario s;
  s.name = chosen.toStdString();
  s.loss.horizontal_mm = horizontal_loss_mm;
  scenarios_.push_back(s);
  const int index = size() - 1;
  if (static_cast<int>(compared_.size()) < kMaxCompared) compared_.push_back(index);
  return index;
}

void ScenarioList::remove(int i) {
  assert(i >= 0 && i < size() && "scenario index out of range");
  if (size() <= 1) {
    throw InputError("scenarios", "a case needs at least one bone level; add another one first");
  }
  scenarios_.erase(scenarios_.begin() + i);
  std::vector<int> kept;
  for (int c : compared_) {
    if (c == i) continue;
    kept.push_back(c > i ? c - 1 : c);
  }
  compared_ = kept;
  if (current_ == i)
    current_ = std::min(i, size() - 1);
  else if (current_ > i)
    --current_;
}

void ScenarioList::rename(int i, const QString& name) {
  assert(i >= 0 && i < size() && "scenario index out of range");
  const QString trimmed = name.trimmed();
  if (trimmed.isEmpty()) throw InputError("scenarios.name", "a bone level needs a name");
  for (int j = 0; j < size(); ++j) {
    if (j != i && QString::fromStdString(scenarios_[static_cast<size_t>(j)].name) == trimmed) {
      throw InputError("scenarios.name", "a bone level named \"" + trimmed.toStdString() +
                                             "\" already exists; choose another name");
    }
  }
  scenarios_[static_cast<size_t>(i)].name = trimmed.toStdString();
}

void ScenarioList::set_loss(int i, const mesh::BoneLoss& loss) {
  assert(i >= 0 && i < size() && "scenario index out of range");
  analysis::Scenario& s = scenarios_[static_cast<size_t>(i)];
  // A name generated from the loss ("healthy", "6 mm loss" or "6.0 mm loss") follows the new
  // value in the same style; a name the user chose stays. No rename onto another level's name.
  const double was = s.loss.horizontal_mm;
  const QString name = QString::fromStdString(s.name);
  auto compact = [](double mm) {
    return mm <= 0 ? QStringLiteral("healthy")
                   : QStringLiteral("%1 mm loss").arg(QString::number(mm, 'g', 6));
  };
  QString renamed;
  if (name == default_name(was))
    renamed = default_name(loss.horizontal_mm);
  else if (name == compact(was))
    renamed = compact(loss.horizontal_mm);
  s.loss = loss;
  if (renamed.isEmpty() || renamed == name) return;
  for (const analysis::Scenario& other : scenarios_)
    if (&other != &s && QString::fromStdString(other.name) == renamed) return;
  s.name = renamed.toStdString();
}

void ScenarioList::set_current(int i) {
  assert(i >= 0 && i < size() && "scenario index out of range");
  current_ = i;
}

bool ScenarioList::set_compared(int i, bool on) {
  assert(i >= 0 && i < size() && "scenario index out of range");
  const auto it = std::find(compared_.begin(), compared_.end(), i);
  if (!on) {
    if (it != compared_.end()) compared_.erase(it);
    return true;
  }
  if (it != compared_.end()) return true;
  if (static_cast<int>(compared_.size()) >= kMaxCompared) return false;
  compared_.push_back(i);
  std::sort(compared_.begin(), compared_.end());
  return true;
}

bool ScenarioList::is_compared(int i) const {
  return std::find(compared_.begin(), compared_.end(), i) != compared_.end();
}

void ScenarioList::reset_compared() {
  compared_.clear();
  for (int i = 0; i < std::min(size(), kMaxCompared); ++i) compared_.push_back(i);
  current_ = 0;
}

}  // namespace sharpey::app
