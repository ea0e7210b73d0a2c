// Bone-level scenario list of the app (no display needed).
#include <gtest/gtest.h>

#include "core/scenario_list.h"
#include "sharpey/error.h"

namespace sharpey::app {
namespace {

std::vector<analysis::Scenario> levels(std::initializer_list<double> losses) {
  std::vector<analysis::Scenario> out;
  for (double l : losses) {
    analysis::Scenario s;
    s.name = ScenarioList::default_name(l).toStdString();
    s.loss.horizontal_mm = l;
    out.push_back(s);
  }
  return out;
}

TEST(ScenarioList, ComparesTheFirstFourByDefault) {
  ScenarioList list(levels({0, 2, 4, 6, 8}));
  EXPECT_EQ(list.compared(), (std::vector<int>{0, 1, 2, 3}));
  EXPECT_EQ(list.current(), 0);
}

TEST(ScenarioList, AtMostFourCompared) {
  ScenarioList list(levels({0, 2, 4, 6, 8}));
  EXPECT_FALSE(list.set_compared(4, true));
  EXPECT_FALSE(list.is_compared(4));
  EXPECT_TRUE(list.set_compared(1, false));
  EXPECT_TRUE(list.set_compared(4, true));
  EXPECT_EQ(list.compared(), (std::vector<int>{0, 2, 3, 4}));
}

TEST(ScenarioList, AddNamesByLossAndRefusesDuplicates) {
  ScenarioList list(levels({0}));
  const int i = list.add(3.0);
  EXPECT_EQ(list.at(i).name, "3.0 mm loss");
  EXPECT_DOUBLE_EQ(list.at(i).loss.horizontal_mm, 3.0);
  EXPECT_TRUE(list.is_compared(i));
  EXPECT_THROW(list.add(3.0), InputError);
  EXPECT_THROW(list.add(-1.0), InputError);
  try {
    list.add(-1.0);
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("-1"), std::string::npos) << e.what();
  }
  EXPECT_THROW(list.rename(i, "healthy"), InputError);
  EXPECT_THROW(list.rename(i, "  "), InputError);
  list.rename(i, " moderate ");
  EXPECT_EQ(list.at(i).name, "moderate");
}

TEST(ScenarioList, RemoveKeepsIndicesConsistent) {
  ScenarioList list(levels({0, 2, 4, 6}));
  list.set_current(3);
  list.remove(1);
  EXPECT_EQ(list.size(), 3);
  EXPECT_EQ(list.current(), 2);  // still the 6 mm level
  EXPECT_DOUBLE_EQ(list.at(list.current()).loss.horizontal_mm, 6.0);
  EXPECT_EQ(list.compared(), (std::vector<int>{0, 1, 2}));
  list.remove(2);
  EXPECT_EQ(list.current(), 1);
  list.remove(0);
  EXPECT_EQ(list.current(), 0);
  EXPECT_THROW(list.remove(0), InputError);  // the last one stays
}

// Issue 12, point 4: a generated level name follows an edited loss, a chosen one stays.
TEST(ScenarioList, GeneratedNamesFollowTheLossChosenNamesStay) {
  analysis::Scenario healthy, six, own;
  healthy.name = "healthy";
  six.name = "6 mm loss";  // the samples' style
  six.loss.horizontal_mm = 6;
  own.name = "patient's worst site";
  own.loss.horizontal_mm = 4;
  ScenarioList list({healthy, six, own});
  mesh::BoneLoss five;
  five.horizontal_mm = 5;
  list.set_loss(1, five);
  EXPECT_EQ(list.at(1).name, "5 mm loss");
  list.set_loss(2, five);
  EXPECT_EQ(list.at(2).name, "patient's worst site");
  mesh::BoneLoss some;
  some.horizontal_mm = 1.5;
  list.set_loss(0, some);
  EXPECT_EQ(list.at(0).name, "1.5 mm loss");
  const int added = list.add(2.0);  // "2.0 mm loss", the app's own style
  mesh::BoneLoss three;
  three.horizontal_mm = 3;
  list.set_loss(added, three);
  EXPECT_EQ(list.at(added).name, "3.0 mm loss");
  // Never onto another level's name: "3.0 mm loss" is taken, so level 0 keeps its own.
  list.set_loss(0, three);
  EXPECT_EQ(list.at(0).name, "1.5 mm loss");
  EXPECT_DOUBLE_EQ(list.at(0).loss.horizontal_mm, 3.0);
}

TEST(ScenarioList, DefaultNames) {
  EXPECT_EQ(ScenarioList::default_name(0), "healthy");
  EXPECT_EQ(ScenarioList::default_name(2.5), "2.5 mm loss");
}

}  // namespace
}  // namespace sharpey::app
