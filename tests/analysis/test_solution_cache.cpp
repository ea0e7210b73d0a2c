// Saved solutions (solution_cache.h) on a coarse incisor solved once: a solution read back gives
// the same results as the fresh solve bit for bit; the key follows what determines a solution and
// nothing else; damaged, truncated and foreign entries are misses that never crash; a temporary
// file left by a killed writer is ignored; the folder stays within its size bound, oldest first.
#include <gtest/gtest.h>
#include <unistd.h>

#include <chrono>
#include <cstdio>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <memory>
#include <string>
#include <vector>

#include "sharpey/analysis/solution_cache.h"
#include "sharpey/error.h"
#include "test_study_cases.h"

namespace sharpey::analysis {
namespace {

namespace fs = std::filesystem;

CaseSpec two_levels() { return testing::incisor_case(mesh::MeshPreset::kCoarse, {0.0, 3.0}); }

// A fresh folder per test under the system's temporary folder.
class TempFolder {
 public:
  TempFolder() {
    const auto* info = ::testing::UnitTest::GetInstance()->current_test_info();
    path_ = fs::temp_directory_path() /
            ("sharpey-solution-cache-" + std::to_string(::getpid()) + "-" + info->name());
    fs::remove_all(path_);
    fs::create_directories(path_);
  }
  ~TempFolder() {
    std::error_code ec;
    fs::remove_all(path_, ec);
  }
  std::string str() const { return path_.string(); }
  const fs::path& path() const { return path_; }

 private:
  fs::path path_;
};

std::string read_bytes(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  return std::string(std::istreambuf_iterator<char>(in), {});
}

void write_bytes(const std::string& path, const std::string& bytes) {
  std::ofstream out(path, std::ios::binary | std::ios::trunc);
  out.write(bytes.data(), static_cast<std::streamsize>(bytes.size()));
}

// Exact equality, NaN equal to NaN (root-map cells above the crest).
bool same_bits(const std::vector<double>& a, const std::vector<double>& b) {
  return a.size() == b.size() && std::memcmp(a.data(), b.data(), a.size() * sizeof(double)) == 0;
}

class SolutionCacheTest : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    spec_ = new CaseSpec(two_levels());
    fresh_ = new std::vector<std::unique_ptr<ScenarioSolution>>();
    for (int k = 0; k < 2; ++k)
      fresh_->push_back(std::make_unique<ScenarioSolution>(*spec_, k, ProgressCallback{}, nullptr));
  }
  static void TearDownTestSuite() {
    delete fresh_;
    delete spec_;
  }
  static const CaseSpec& spec() { return *spec_; }
  static const ScenarioSolution& fresh(int k) { return *(*fresh_)[static_cast<size_t>(k)]; }

 private:
  static CaseSpec* spec_;
  static std::vector<std::unique_ptr<ScenarioSolution>>* fresh_;
};
CaseSpec* SolutionCacheTest::spec_ = nullptr;
std::vector<std::unique_ptr<ScenarioSolution>>* SolutionCacheTest::fresh_ = nullptr;

TEST_F(SolutionCacheTest, ReadBackEqualsTheFreshSolveBitForBit) {
  for (int k = 0; k < 2; ++k) {
    SCOPED_TRACE("scenario " + std::to_string(k));
    const ScenarioSolution& a = fresh(k);
    const std::string bytes = write_solution(a, solution_cache_key(spec(), k));
    const auto b = read_solution(bytes, spec(), k);
    ASSERT_NE(b, nullptr);
    EXPECT_FALSE(b->has_solver());
    // The saved parts.
    EXPECT_EQ(a.model().mesh.nodes, b->model().mesh.nodes);
    EXPECT_EQ(a.model().mesh.elements, b->model().mesh.elements);
    EXPECT_EQ(a.model().mesh.faces, b->model().mesh.faces);
    EXPECT_EQ(a.model().mesh.face_marker, b->model().mesh.face_marker);
    EXPECT_TRUE(a.basis().unit_displacements() == b->basis().unit_displacements());
    for (int j = 0; j < 6; ++j) {
      EXPECT_TRUE(a.basis().unit_fields()[j].stress_mpa == b->basis().unit_fields()[j].stress_mpa);
      EXPECT_TRUE(a.basis().unit_fields()[j].strain == b->basis().unit_fields()[j].strain);
    }
    EXPECT_EQ(a.solver_statistics().n_dofs, b->solver_statistics().n_dofs);
    EXPECT_EQ(a.solver_statistics().ordering, b->solver_statistics().ordering);
    // The derived parts.
    EXPECT_EQ(a.pdl_nodes(), b->pdl_nodes());
    EXPECT_EQ(a.embedded_root_nodes(), b->embedded_root_nodes());
    EXPECT_EQ(a.pdl_edge_band(), b->pdl_edge_band());
    EXPECT_EQ(a.attachment_area_mm2(), b->attachment_area_mm2());
    EXPECT_EQ(a.cres_labiolingual().from_cej_mm, b->cres_labiolingual().from_cej_mm);
    EXPECT_EQ(a.cres_mesiodistal().from_cej_mm, b->cres_mesiodistal().from_cej_mm);
    // Results under two force systems, with the healthy level as reference.
    const ScenarioSolution& healthy_a = fresh(0);
    const auto healthy_b =
        read_solution(write_solution(healthy_a, solution_cache_key(spec(), 0)), spec(), 0);
    for (MovementPreset preset : {MovementPreset::kNone, MovementPreset::kTranslation}) {
      const LoadSpec load = testing::lingual_g(80, preset);
      const ScenarioResult ra = evaluate(a, load, spec().thresholds, &healthy_a);
      const ScenarioResult rb = evaluate(*b, load, spec().thresholds, healthy_b.get());
      EXPECT_TRUE(same_bits(ra.pressure_kpa, rb.pressure_kpa));
      EXPECT_TRUE(same_bits(ra.max_principal_strain_field, rb.max_principal_strain_field));
      EXPECT_TRUE(same_bits(ra.equivalent_strain_field, rb.equivalent_strain_field));
      EXPECT_TRUE(same_bits(ra.von_mises_kpa, rb.von_mises_kpa));
      EXPECT_TRUE(same_bits(ra.root_map.pressure_kpa, rb.root_map.pressure_kpa));
      EXPECT_TRUE(ra.displacement_mm == rb.displacement_mm);
      EXPECT_EQ(ra.pressure_max_compression_kpa, rb.pressure_max_compression_kpa);
      EXPECT_EQ(ra.pressure_p95_compression_kpa, rb.pressure_p95_compression_kpa);
      EXPECT_EQ(ra.area_above_capillary_mm2, rb.area_above_capillary_mm2);
      EXPECT_EQ(ra.mf_translation_mm, rb.mf_translation_mm);
      EXPECT_EQ(ra.equivalent_force_peak_g, rb.equivalent_force_peak_g);
      EXPECT_EQ(ra.load.moment_to_force_mm, rb.load.moment_to_force_mm);
      EXPECT_TRUE(ra.crown_tip_displacement_um == rb.crown_tip_displacement_um);
    }
  }
}

TEST_F(SolutionCacheTest, KeyFollowsWhatDeterminesTheSolutionOnly) {
  const std::string key = solution_cache_key(spec(), 1);
  EXPECT_NE(key, solution_cache_key(spec(), 0));  // another bone loss
  CaseSpec other = spec();
  other.label = "another label";
  other.scenarios[1].name = "renamed";
  other.load = testing::lingual_g(30, MovementPreset::kTranslation);
  other.thresholds.capillary.value_kpa *= 2;
  EXPECT_EQ(key, solution_cache_key(other, 1));  // none of these changes a solution
  const auto changed = [&](auto edit) {
    CaseSpec c = spec();
    edit(c);
    return solution_cache_key(c, 1) != key;
  };
  EXPECT_TRUE(changed([](CaseSpec& c) { c.pdl_material.young_modulus_mpa *= 1.0000001; }));
  EXPECT_TRUE(changed([](CaseSpec& c) { c.cancellous_material.poisson_ratio = 0.29; }));
  EXPECT_TRUE(changed([](CaseSpec& c) { c.model.sizing.preset = mesh::MeshPreset::kStandard; }));
  EXPECT_TRUE(changed([](CaseSpec& c) { c.model.pdl.apex_width_mm = 0.25; }));
  EXPECT_TRUE(changed([](CaseSpec& c) { c.scenarios[1].loss.defect_depth_mm = 1; }));
  EXPECT_TRUE(changed([](CaseSpec& c) { c.model.tooth.dimensions.root_length_mm += 1e-9; }));
  EXPECT_TRUE(changed([](CaseSpec& c) { c.model.bracket.height_mm = 5; }));
  EXPECT_NE(key, solution_cache_key(spec(), 1, ScenarioOptions{{36, 30}, false, nullptr}));
  EXPECT_THROW(solution_cache_key(spec(), 2), InputError);
}

TEST_F(SolutionCacheTest, DamagedEntriesAreRefusedWithAReason) {
  const std::string key = solution_cache_key(spec(), 0);
  const std::string bytes = write_solution(fresh(0), key);
  const auto refused = [&](const std::string& b, const std::string& words) {
    try {
      read_solution(b, spec(), 0);
      ADD_FAILURE() << "accepted a damaged entry expected to say: " << words;
    } catch (const Error& e) {
      EXPECT_NE(std::string(e.what()).find(words), std::string::npos) << e.what();
    }
  };
  refused("", "not a saved Sharpey solution");
  refused(std::string(100, 'x'), "not a saved Sharpey solution");
  refused(bytes.substr(0, bytes.size() / 2), "checksum");
  for (size_t at : {size_t{40}, bytes.size() / 3, bytes.size() - 9}) {
    std::string flipped = bytes;
    flipped[at] = static_cast<char>(flipped[at] ^ 0x10);
    refused(flipped, "checksum");
  }
  std::string other_version = bytes;
  other_version[16] = 9;
  refused(other_version, "file version 9");
  // Another scenario's entry under this scenario's name: the key inside tells.
  refused(write_solution(fresh(1), solution_cache_key(spec(), 1)), "another model");
}

TEST_F(SolutionCacheTest, CacheStoresLoadsAndDropsDamagedEntries) {
  TempFolder folder;
  SolutionCache cache(folder.str() + "/nested", 1ull << 30);  // created on the first store
  std::string why;
  EXPECT_EQ(cache.load(spec(), 0, &why), nullptr);
  EXPECT_EQ(why, "not saved yet");
  ASSERT_TRUE(cache.store(spec(), 0, fresh(0), &why)) << why;
  auto back = cache.load(spec(), 0, &why);
  ASSERT_NE(back, nullptr) << why;
  EXPECT_TRUE(back->basis().unit_displacements() == fresh(0).basis().unit_displacements());
  // A renamed level with the same model is the same entry.
  CaseSpec renamed = spec();
  renamed.scenarios[0].name = "no loss";
  back = cache.load(renamed, 0, &why);
  ASSERT_NE(back, nullptr) << why;
  EXPECT_EQ(back->scenario().name, "no loss");
  // Damage the entry on disk: a miss with the reason, and the file is gone.
  const std::string path = cache.entry_path(solution_cache_key(spec(), 0));
  std::string bytes = read_bytes(path);
  bytes[bytes.size() / 2] = static_cast<char>(bytes[bytes.size() / 2] ^ 1);
  write_bytes(path, bytes);
  EXPECT_EQ(cache.load(spec(), 0, &why), nullptr);
  EXPECT_NE(why.find("checksum"), std::string::npos) << why;
  EXPECT_FALSE(fs::exists(path));
  EXPECT_EQ(cache.load(spec(), 0, &why), nullptr);
  EXPECT_EQ(why, "not saved yet");
}

TEST_F(SolutionCacheTest, TemporaryFileOfAKilledWriterIsIgnored) {
  TempFolder folder;
  SolutionCache cache(folder.str(), 1ull << 30);
  const std::string key = solution_cache_key(spec(), 1);
  const std::string path = cache.entry_path(key);
  // What write_file_atomic leaves when its process is killed before the rename: half an entry
  // under a hidden temporary name.
  const std::string bytes = write_solution(fresh(1), key);
  const fs::path temp =
      fs::path(path).parent_path() / ("." + fs::path(path).filename().string() + ".tmp-99999-0");
  write_bytes(temp.string(), bytes.substr(0, bytes.size() / 2));
  std::string why;
  EXPECT_EQ(cache.load(spec(), 1, &why), nullptr);
  EXPECT_EQ(why, "not saved yet");
  EXPECT_EQ(cache.entry_count(), 0);
  // A fresh temporary file may belong to a writer still at work: kept; a day old: removed.
  cache.trim();
  EXPECT_TRUE(fs::exists(temp));
  fs::last_write_time(temp, fs::file_time_type::clock::now() - std::chrono::hours(25));
  ASSERT_TRUE(cache.store(spec(), 1, fresh(1), &why)) << why;
  EXPECT_FALSE(fs::exists(temp));
  EXPECT_NE(cache.load(spec(), 1, &why), nullptr) << why;
}

TEST_F(SolutionCacheTest, SizeBoundEvictsTheEntriesUsedLongestAgo) {
  TempFolder folder;
  const std::uint64_t entry_bytes = write_solution(fresh(0), solution_cache_key(spec(), 0)).size();
  // Room for two entries of this size (the 3 mm level's is a little smaller), not three.
  SolutionCache cache(folder.str(), entry_bytes * 5 / 2);
  CaseSpec other = spec();
  other.pdl_material.young_modulus_mpa = 0.6;  // a third distinct entry
  std::string why;
  ASSERT_TRUE(cache.store(spec(), 0, fresh(0), &why)) << why;
  ASSERT_TRUE(cache.store(spec(), 1, fresh(1), &why)) << why;
  EXPECT_EQ(cache.entry_count(), 2);
  // Make the order of use unambiguous (file times can be coarse): level 0 used long ago, then
  // level 1 used by a load, which renews its time.
  const auto old = fs::file_time_type::clock::now() - std::chrono::hours(2);
  fs::last_write_time(cache.entry_path(solution_cache_key(spec(), 0)), old);
  fs::last_write_time(cache.entry_path(solution_cache_key(spec(), 1)), old + std::chrono::hours(1));
  ASSERT_NE(cache.load(spec(), 1, &why), nullptr) << why;
  // Stored under another key (the content does not matter for the bound).
  ASSERT_TRUE(cache.store(other, 0, fresh(0), &why)) << why;
  EXPECT_EQ(cache.entry_count(), 2);
  EXPECT_LE(cache.total_bytes(), cache.max_bytes());
  EXPECT_FALSE(fs::exists(cache.entry_path(solution_cache_key(spec(), 0))));
  EXPECT_TRUE(fs::exists(cache.entry_path(solution_cache_key(spec(), 1))));
  EXPECT_TRUE(fs::exists(cache.entry_path(solution_cache_key(other, 0))));
}

TEST(SolutionCacheFolder, UnwritableFolderIsAMissNotACrash) {
  SolutionCache cache("/proc/self/no-such-folder", 1ull << 20);
  std::string why;
  EXPECT_EQ(cache.load(testing::incisor_case(mesh::MeshPreset::kCoarse, {0.0}), 0, &why), nullptr);
  EXPECT_EQ(why, "not saved yet");
  EXPECT_EQ(cache.entry_count(), 0);
  EXPECT_EQ(cache.total_bytes(), 0u);
  cache.trim();  // nothing to do, nothing thrown
}

}  // namespace
}  // namespace sharpey::analysis
