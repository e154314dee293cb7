/// \file
/// Consistency of the rule documentation pages (docs/rules/<id>.md) with the rule catalogue:
/// one page per built-in rule and no other page, the Summary equal to the RuleInfo title, the
/// required sections in order, every option key and the default severity documented, and the
/// pages compiled into the binary identical to the files on disk.
#include "checker/core/diagnostics.h"
#include "checker/report/rule_docs.h"
#include "rules/registry.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <set>
#include <sstream>
#include <string>
#include <string_view>
#include <vector>

using namespace gateloop;

namespace {

/// The section headings every page has, in this order.
const std::vector<std::string> kRequiredSections{"Summary",    "Why it matters", "What is measured", "Parameters",
                                                 "How to fix", "Example",        "References"};

struct Section {
  std::string heading; ///< text after "## "
  std::string body;    ///< everything up to the next "## " heading
};

/// Splits a page into its "## " sections (the "# " title and any text before the first section
/// are dropped). Lines inside ``` fences never start a section.
std::vector<Section> sections(std::string_view markdown) {
  std::vector<Section> out;
  std::istringstream in{std::string(markdown)};
  std::string line;
  bool fenced = false;
  while (std::getline(in, line)) {
    if (line.rfind("```", 0) == 0) fenced = !fenced;
    if (!fenced && line.rfind("## ", 0) == 0) {
      out.push_back({line.substr(3), {}});
      continue;
    }
    if (!out.empty()) out.back().body += line + '\n';
  }
  return out;
}

const Section *findSection(const std::vector<Section> &all, const std::string &heading) {
  for (const auto &s : all)
    if (s.heading == heading) return &s;
  return nullptr;
}

std::string readFile(const std::filesystem::path &p) {
  std::ifstream in(p, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

std::filesystem::path docsDir() { return std::filesystem::path(GATELOOP_SOURCE_DIR) / "docs" / "rules"; }

std::set<std::string> registeredIds() {
  std::set<std::string> ids;
  for (const auto &r : builtinRules()) ids.insert(r->info().id);
  return ids;
}

TEST(RuleDocs, CatalogueHasTheSpecRules) {
  // The spec (section 6) lists 15 rules; a smaller catalogue would make the checks below vacuous.
  EXPECT_EQ(builtinRules().size(), 15u);
}

TEST(RuleDocs, EveryRuleHasAnEmbeddedPage) {
  for (const auto &rule : builtinRules()) {
    const RuleInfo &info = rule->info();
    const RuleDoc *doc = findRuleDoc(info.id);
    ASSERT_NE(doc, nullptr) << "no docs/rules/" << info.id << ".md";
    EXPECT_EQ(doc->id, info.id);
  }
}

TEST(RuleDocs, NoOrphanEmbeddedPages) {
  auto ids = registeredIds();
  for (const auto &doc : embeddedRuleDocs())
    EXPECT_TRUE(ids.count(std::string(doc.id))) << "docs/rules/" << doc.id << ".md belongs to no registered rule";
  EXPECT_EQ(embeddedRuleDocs().size(), ids.size());
}

TEST(RuleDocs, PageStartsWithTheRuleIdAsTitle) {
  for (const auto &rule : builtinRules()) {
    const RuleDoc *doc = findRuleDoc(rule->info().id);
    ASSERT_NE(doc, nullptr);
    std::string_view md = doc->markdown;
    std::string_view first = md.substr(0, md.find('\n'));
    EXPECT_EQ(first, "# " + rule->info().id);
  }
}

TEST(RuleDocs, SummaryEqualsRuleTitle) {
  for (const auto &rule : builtinRules()) {
    const RuleInfo &info = rule->info();
    const RuleDoc *doc = findRuleDoc(info.id);
    ASSERT_NE(doc, nullptr) << info.id;
    EXPECT_EQ(ruleDocSummary(doc->markdown), info.title) << "docs/rules/" << info.id << ".md";
  }
}

TEST(RuleDocs, RequiredSectionsInOrder) {
  for (const auto &rule : builtinRules()) {
    const RuleInfo &info = rule->info();
    const RuleDoc *doc = findRuleDoc(info.id);
    ASSERT_NE(doc, nullptr) << info.id;
    std::vector<std::string> headings;
    for (const auto &s : sections(doc->markdown)) headings.push_back(s.heading);
    EXPECT_EQ(headings, kRequiredSections) << "docs/rules/" << info.id << ".md";
    for (const auto &s : sections(doc->markdown))
      EXPECT_NE(s.body.find_first_not_of(" \n"), std::string::npos)
          << "empty section '" << s.heading << "' in docs/rules/" << info.id << ".md";
  }
}

TEST(RuleDocs, ParametersListEveryOptionAndTheSeverityOverride) {
  for (const auto &rule : builtinRules()) {
    const RuleInfo &info = rule->info();
    const RuleDoc *doc = findRuleDoc(info.id);
    ASSERT_NE(doc, nullptr) << info.id;
    auto all = sections(doc->markdown);
    const Section *params = findSection(all, "Parameters");
    ASSERT_NE(params, nullptr) << info.id;
    for (const auto &opt : info.options) {
      EXPECT_NE(params->body.find("`" + opt.key + "`"), std::string::npos)
          << "option " << opt.key << " missing from docs/rules/" << info.id << ".md";
      // The table row of the key carries the default and the meaning the code declares.
      std::istringstream rows(params->body);
      std::string row, keyRow;
      while (std::getline(rows, row))
        if (row.rfind("| `" + opt.key + "`", 0) == 0) keyRow = row;
      EXPECT_NE(keyRow.find("| " + opt.defaultText + " |"), std::string::npos)
          << "row of " << opt.key << " in docs/rules/" << info.id << ".md lacks default '" << opt.defaultText << "'";
      EXPECT_NE(keyRow.find(opt.help), std::string::npos)
          << "row of " << opt.key << " in docs/rules/" << info.id << ".md lacks meaning '" << opt.help << "'";
    }
    EXPECT_NE(params->body.find("`severity`"), std::string::npos) << info.id;
    EXPECT_NE(params->body.find("--rule " + info.id + "="), std::string::npos) << info.id;
    if (info.options.empty()) {
      EXPECT_NE(params->body.find("none"), std::string::npos) << info.id;
    }
  }
}

TEST(RuleDocs, DefaultSeverityIsStated) {
  for (const auto &rule : builtinRules()) {
    const RuleInfo &info = rule->info();
    const RuleDoc *doc = findRuleDoc(info.id);
    ASSERT_NE(doc, nullptr) << info.id;
    auto all = sections(doc->markdown);
    const Section *measured = findSection(all, "What is measured");
    ASSERT_NE(measured, nullptr) << info.id;
    std::string expected = std::string("Default severity: ") + severityName(info.defaultSeverity);
    EXPECT_NE(measured->body.find(expected), std::string::npos)
        << "docs/rules/" << info.id << ".md should say '" << expected << "'";
  }
}

TEST(RuleDocs, ExampleIsMarkedIllustrativeAndTaggedWithTheRuleId) {
  for (const auto &rule : builtinRules()) {
    const RuleInfo &info = rule->info();
    const RuleDoc *doc = findRuleDoc(info.id);
    ASSERT_NE(doc, nullptr) << info.id;
    auto all = sections(doc->markdown);
    const Section *example = findSection(all, "Example");
    ASSERT_NE(example, nullptr) << info.id;
    EXPECT_NE(example->body.find("llustrative"), std::string::npos) << info.id;
    EXPECT_NE(example->body.find("[" + info.id + "]"), std::string::npos) << info.id;
  }
}

TEST(RuleDocs, DocsFolderHoldsExactlyOnePagePerRule) {
  ASSERT_TRUE(std::filesystem::is_directory(docsDir())) << docsDir();
  std::set<std::string> onDisk;
  for (const auto &entry : std::filesystem::directory_iterator(docsDir())) {
    std::string name = entry.path().filename().string();
    EXPECT_TRUE(entry.is_regular_file()) << name << " in docs/rules is not a file";
    EXPECT_EQ(entry.path().extension().string(), ".md") << name << " in docs/rules is not a rule page";
    onDisk.insert(entry.path().stem().string());
  }
  EXPECT_EQ(onDisk, registeredIds());
}

TEST(RuleDocs, EmbeddedPagesMatchTheFilesOnDisk) {
  for (const auto &doc : embeddedRuleDocs()) {
    auto path = docsDir() / (std::string(doc.id) + ".md");
    ASSERT_TRUE(std::filesystem::exists(path)) << path;
    EXPECT_EQ(readFile(path), doc.markdown) << path << " differs from the embedded copy (rebuild)";
  }
}

TEST(RuleDocs, PagesArePlainAsciiAndShort) {
  for (const auto &doc : embeddedRuleDocs()) {
    auto bad = std::find_if(doc.markdown.begin(), doc.markdown.end(),
                            [](char c) { return static_cast<unsigned char>(c) >= 0x80; });
    EXPECT_EQ(bad, doc.markdown.end()) << "non-ASCII byte at offset " << (bad - doc.markdown.begin())
                                       << " of docs/rules/" << doc.id << ".md";
    auto lines = std::count(doc.markdown.begin(), doc.markdown.end(), '\n');
    EXPECT_LE(lines, 100) << "docs/rules/" << doc.id << ".md is long (keep pages near 80 lines)";
  }
}

// ruleDocSummary itself: the first paragraph after "## Summary", lines joined with spaces.
TEST(RuleDocSummary, FirstParagraphJoined) {
  EXPECT_EQ(ruleDocSummary("# x\n\n## Summary\n\nthe first\nline\n\nmore text\n"), "the first line");
  EXPECT_EQ(ruleDocSummary("# x\n\n## Why it matters\n\ntext\n"), "");
}

} // namespace
