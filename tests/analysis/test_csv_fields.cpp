// CSV outputs read back by an RFC 4180 reader written here (independent of csv_field): every
// field, including names with commas, quotes, a leading '#' and line breaks, comes back unchanged,
// and comment lines stay comment lines.
#include <gtest/gtest.h>

#include <string>
#include <vector>

#include "sharpey/output/report_output.h"

namespace sharpey::analysis {
namespace {

using Record = std::vector<std::string>;

// RFC 4180 (source: RFC 4180, "Common Format and MIME Type for CSV Files", section 2): records end
// with a line break, fields are separated by commas, a quoted field may hold commas, line breaks
// and doubled quotes. Lines starting with '#' outside a quoted field are comments (our files'
// convention, common practice) and are returned in `comments`.
std::vector<Record> read_csv(const std::string& text, std::vector<std::string>* comments) {
  std::vector<Record> records;
  size_t i = 0;
  while (i < text.size()) {
    if (text[i] == '#') {
      const size_t end = text.find('\n', i);
      comments->push_back(text.substr(i, end - i));
      i = end == std::string::npos ? text.size() : end + 1;
      continue;
    }
    Record record;
    std::string field;
    bool done = false;
    while (!done) {
      if (i < text.size() && text[i] == '"') {
        ++i;
        for (;;) {
          if (i >= text.size()) {
            ADD_FAILURE() << "unterminated quoted field";
            return records;
          }
          if (text[i] == '"') {
            if (i + 1 < text.size() && text[i + 1] == '"') {
              field += '"';
              i += 2;
              continue;
            }
            ++i;
            break;
          }
          field += text[i++];
        }
      }
      while (i < text.size() && text[i] != ',' && text[i] != '\n') {
        EXPECT_NE(text[i], '"') << "a quote inside an unquoted field";
        field += text[i++];
      }
      record.push_back(field);
      field.clear();
      if (i >= text.size() || text[i] == '\n') done = true;
      ++i;
    }
    records.push_back(record);
  }
  return records;
}

const std::vector<std::string> kAwkwardNames = {
    "plain", "a,b", "say \"hi\"", "# not a comment", "two\nlines", "carriage\r\nreturn",
    "\"",    ",",   "",           "trailing,",       "#"};

TEST(CsvFields, EveryFieldReadsBackUnchanged) {
  std::string text;
  for (const std::string& name : kAwkwardNames)
    text += csv_field(name) + "," + csv_field(name) + "\n";
  std::vector<std::string> comments;
  const std::vector<Record> records = read_csv(text, &comments);
  EXPECT_TRUE(comments.empty());
  ASSERT_EQ(records.size(), kAwkwardNames.size());
  for (size_t i = 0; i < records.size(); ++i) {
    SCOPED_TRACE(kAwkwardNames[i]);
    EXPECT_EQ(records[i], (Record{kAwkwardNames[i], kAwkwardNames[i]}));
  }
  // Fields that need nothing stay unquoted (RFC 4180 section 2, rule 5: quoting is optional).
  EXPECT_EQ(csv_field("plain"), "plain");
  EXPECT_EQ(csv_field("a b"), "a b");
}

TEST(CsvFields, SummaryRowsKeepAwkwardScenarioNames) {
  CaseSpec spec;
  spec.label = "Invented test label, with a comma";
  std::vector<ScenarioResult> results;
  for (const char* name : {"a,b", "say \"hi\"", "# loss"}) {
    ScenarioResult r;
    r.name = name;
    results.push_back(r);
  }
  std::vector<std::string> comments;
  const std::vector<Record> records = read_csv(summary_csv(spec, results), &comments);
  ASSERT_EQ(records.size(), 1 + results.size());  // header and one row per scenario
  EXPECT_EQ(records[0][0], "scenario");
  for (size_t i = 0; i < results.size(); ++i) {
    EXPECT_EQ(records[i + 1].size(), records[0].size()) << results[i].name;
    EXPECT_EQ(records[i + 1][0], results[i].name);
  }
  ASSERT_FALSE(comments.empty());
  EXPECT_NE(comments[0].find("Caution"), std::string::npos) << comments[0];
}

}  // namespace
}  // namespace sharpey::analysis
