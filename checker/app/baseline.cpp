#include "checker/app/baseline.h"

#include <nlohmann/json.hpp>

#include <algorithm>
#include <fstream>
#include <set>
#include <sstream>

namespace gateloop {

bool readBaseline(const std::string &path, FileTable &files, std::vector<BaselineEntry> &out, InputDiagnostics &diags) {
  FileId file = files.add(path);
  std::ifstream in(path, std::ios::binary);
  if (!in) {
    diags.error({file, 0, 0}, "cannot open baseline file");
    return false;
  }
  std::stringstream ss;
  ss << in.rdbuf();
  std::string text = ss.str();
  nlohmann::json j;
  try {
    j = nlohmann::json::parse(text);
  } catch (const nlohmann::json::parse_error &e) {
    diags.add({Severity::Error, LineIndex(text).locate(file, e.byte > 0 ? e.byte - 1 : 0), {},
               "invalid JSON in baseline file"});
    return false;
  }
  if (!j.is_object() || j.value("schema", "") != "gateloop-baseline/1") {
    diags.fieldError({file, 0, 0}, "schema", "expected \"gateloop-baseline/1\"");
    return false;
  }
  if (!j.contains("findings") || !j["findings"].is_array()) {
    diags.fieldError({file, 0, 0}, "findings", "expected an array of accepted findings");
    return false;
  }
  bool ok = true;
  for (std::size_t i = 0; i < j["findings"].size(); ++i) {
    const auto &e = j["findings"][i];
    std::string at = "findings[" + std::to_string(i) + "]";
    if (!e.is_object() || !e.contains("fingerprint") || !e["fingerprint"].is_string()) {
      diags.fieldError({file, 0, 0}, at + ".fingerprint", "expected a fingerprint string");
      ok = false;
      continue;
    }
    BaselineEntry b;
    b.fingerprint = e["fingerprint"].get<std::string>();
    b.rule = e.value("rule", "");
    b.design = e.value("design", "");
    b.loop = e.value("loop", "");
    if (e.contains("refs") && e["refs"].is_array())
      for (const auto &r : e["refs"])
        if (r.is_string()) b.refs.push_back(r.get<std::string>());
    out.push_back(std::move(b));
  }
  return ok;
}

std::string baselineText(const std::vector<DesignReport> &designs) {
  std::vector<nlohmann::ordered_json> entries;
  std::set<std::string> seen;
  for (const auto &d : designs)
    for (const auto &f : d.findings) {
      if (f.waived || !seen.insert(f.fingerprint).second) continue;
      nlohmann::ordered_json e;
      e["fingerprint"] = f.fingerprint;
      e["rule"] = f.rule;
      e["design"] = f.design;
      e["loop"] = f.loop;
      e["refs"] = f.refs;
      e["message"] = f.message;
      entries.push_back(std::move(e));
    }
  std::sort(entries.begin(), entries.end(), [](const auto &a, const auto &b) {
    return std::tie(a["design"].template get_ref<const std::string &>(), a["loop"].template get_ref<const std::string &>(),
                    a["rule"].template get_ref<const std::string &>(), a["fingerprint"].template get_ref<const std::string &>()) <
           std::tie(b["design"].template get_ref<const std::string &>(), b["loop"].template get_ref<const std::string &>(),
                    b["rule"].template get_ref<const std::string &>(), b["fingerprint"].template get_ref<const std::string &>());
  });
  nlohmann::ordered_json root;
  root["schema"] = "gateloop-baseline/1";
  root["findings"] = entries;
  return root.dump(2) + "\n";
}

void applyBaseline(std::vector<DesignReport> &designs, const std::vector<BaselineEntry> &baseline) {
  std::set<std::string> accepted, found;
  for (const auto &b : baseline) accepted.insert(b.fingerprint);
  for (auto &d : designs)
    for (auto &f : d.findings) {
      found.insert(f.fingerprint);
      if (accepted.count(f.fingerprint)) f.baseline = true;
    }
  for (const auto &b : baseline) {
    if (found.count(b.fingerprint)) continue;
    auto it = std::find_if(designs.begin(), designs.end(), [&](const DesignReport &d) { return d.name == b.design; });
    if (it == designs.end()) continue;
    Finding f;
    f.rule = b.rule;
    f.design = b.design;
    f.loop = b.loop;
    f.refs = b.refs;
    f.fingerprint = b.fingerprint;
    it->fixed.push_back(std::move(f));
  }
}

} // namespace gateloop
