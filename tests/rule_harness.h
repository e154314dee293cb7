/// \file
/// Test harness: runs the whole pipeline (readers, part resolution, loop extraction, physics,
/// rules) on a deck, parts library, layout and operating point written to a temporary folder.
#pragma once

#include "checker/app/analyze.h"
#include "checker/app/run_inputs.h"
#include "checker/report/report.h"

#include <filesystem>
#include <fstream>
#include <map>
#include <memory>
#include <string>
#include <unistd.h>

namespace gateloop::testing {

struct DesignFiles {
  std::string deck;          ///< SPICE deck text (or XML when xml is true)
  std::string parts;         ///< parts library JSON, empty for none
  std::string layout;        ///< layout sidecar JSON, empty for none
  std::string operating;     ///< operating-point JSON object, empty for none
  bool xml = false;
  std::map<std::string, std::string> assign; ///< glob -> part id
};

/// The result of one run; keeps the inputs alive for the report's pointers.
struct HarnessRun {
  RunInputs inputs;
  std::vector<DesignReport> designs;
  bool inputOk = false;

  const DesignReport &design() const { return designs.at(0); }
  std::vector<Finding> findings(const std::string &rule) const {
    std::vector<Finding> out;
    for (const auto &f : design().findings)
      if (f.rule == rule) out.push_back(f);
    return out;
  }
  std::string diagnostics() const {
    std::string s;
    for (const auto &d : inputs.diags.items()) s += formatDiagnostic(d, inputs.files) + "\n";
    return s;
  }
};

inline std::string writeTemp(const std::filesystem::path &dir, const std::string &name, const std::string &text) {
  std::filesystem::create_directories(dir);
  std::ofstream(dir / name) << text;
  return (dir / name).string();
}

/// Runs the pipeline through a project file (so `assign` and rule parameters are exercised too)
/// with rule parameters \p ruleParams (the project file's `rules` object).
inline std::unique_ptr<HarnessRun> runPipeline(const DesignFiles &files,
                                               const std::map<std::string, nlohmann::json> &ruleParams = {}) {
  static int counter = 0;
  auto dir = std::filesystem::temp_directory_path() /
             ("gateloop-harness-" + std::to_string(::getpid()) + "-" + std::to_string(counter++));
  nlohmann::json design;
  design["name"] = "test";
  design["netlist"] = files.xml ? "design.xml" : "design.cir";
  writeTemp(dir, design["netlist"].get<std::string>(), files.deck);
  if (!files.layout.empty()) {
    writeTemp(dir, "design.layout.json", files.layout);
    design["layout"] = "design.layout.json";
  }
  if (!files.operating.empty()) design["operating"] = nlohmann::json::parse(files.operating);
  if (!files.assign.empty()) design["assign"] = files.assign;
  nlohmann::json project;
  project["schema"] = "gateloop/1";
  project["parts"] = nlohmann::json::array();
  if (!files.parts.empty()) {
    writeTemp(dir, "parts.json", files.parts);
    project["parts"].push_back("parts.json");
  }
  project["designs"] = nlohmann::json::array({design});
  if (!ruleParams.empty()) project["rules"] = ruleParams;
  InputSelection sel;
  sel.projectPath = writeTemp(dir, "gateloop.json", project.dump(2));

  auto run = std::make_unique<HarnessRun>();
  run->inputOk = loadRunInputs(sel, run->inputs);
  if (run->inputOk)
    for (const auto &d : run->inputs.designs)
      run->designs.push_back(analyzeDesign(*d, run->inputs.project, {}, "2026-01-01"));
  std::filesystem::remove_all(dir);
  return run;
}

} // namespace gateloop::testing
