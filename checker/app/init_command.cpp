/// \file
/// `gateloop init NETLIST`: writes a starter project file and a layout-sidecar template listing
/// the nets of every gate loop found, so a user goes from a bare netlist to a first `check` by
/// filling in numbers instead of learning two file formats.

#include "checker/app/commands.h"
#include "checker/app/run_inputs.h"

#include "checker/app/output_file.h"
#include "checker/loops/gate_loop.h"
#include "checker/model/part_resolution.h"
#include "netlist-io/json_inputs.h"
#include "netlist-io/spice_reader.h"
#include "netlist-io/xml_netlist_reader.h"

#include <fmt/format.h>
#include <fmt/ranges.h>
#include <nlohmann/json.hpp>

#include <cctype>
#include <filesystem>
#include <iostream>
#include <set>

namespace fs = std::filesystem;

namespace gateloop {

namespace {

constexpr int kExitInputError = 2;
constexpr const char *kProjectFileName = "gateloop.json";

using OrderedJson = nlohmann::ordered_json;


/// \p path as written in a file that lives in the current directory: relative where possible,
/// with forward slashes so the project file reads the same on every system.
std::string relativeToCurrentDir(const std::string &path) {
  std::error_code ec;
  fs::path abs = fs::absolute(path, ec);
  if (ec) return fs::path(path).generic_string();
  fs::path rel = fs::proximate(abs, fs::current_path(ec), ec);
  if (ec || rel.empty()) return abs.lexically_normal().generic_string();
  return rel.generic_string();
}

/// Nets in first-seen order without repeats: the template lists each net once, loop by loop.
class NetList {
public:
  void add(NetId id) {
    if (id != kNone && seen_.insert(id).second) order_.push_back(id);
  }
  const std::vector<NetId> &ids() const { return order_; }

private:
  std::set<NetId> seen_;
  std::vector<NetId> order_;
};

/// The nets of one extracted gate loop: every path from the driver output to the gate, the
/// reference net and the driver's own reference.
void addLoopNets(const GateLoop &loop, NetList &nets) {
  for (const GatePath &path : loop.paths)
    for (NetId n : path.nets) nets.add(n);
  nets.add(loop.gateNet);
  nets.add(loop.refNet);
  nets.add(loop.driverRefNet);
}

bool isSeriesKind(ElementKind k) {
  return k == ElementKind::Resistor || k == ElementKind::Inductor || k == ElementKind::Ferrite ||
         k == ElementKind::Diode;
}

/// Without switch parts nothing says which pin is the gate, so fall back on the SPICE pin order
/// (M: drain gate source bulk; Q: collector base emitter) and list the gate, the source/emitter
/// and every net one series R, L or diode away from the gate, where the gate resistor sits.
std::size_t guessTopologyNets(const Circuit &circuit, NetList &nets, std::vector<std::string> &switchNames) {
  const auto &comps = circuit.components();
  for (const Component &c : comps) {
    if (c.hidden || (c.kind != ElementKind::Mosfet && c.kind != ElementKind::Bjt)) continue;
    auto pins = circuit.pins(c);
    if (pins.size() < 3) continue;
    NetId gate = pins[1], source = pins[2];
    switchNames.emplace_back(c.name);
    nets.add(gate);
    for (const Component &s : comps) {
      if (s.hidden || !isSeriesKind(s.kind)) continue;
      auto sp = circuit.pins(s);
      if (sp.size() != 2 || sp[0] == sp[1]) continue;
      NetId other = sp[0] == gate ? sp[1] : sp[1] == gate ? sp[0] : kNone;
      // A resistor from the gate to ground or to the source is a pull-down, not a series path.
      if (other == kNone || other == source || circuit.netAt(other).ground) continue;
      nets.add(other);
    }
    nets.add(source);
  }
  return switchNames.size();
}

std::string netName(const Circuit &circuit, NetId id) { return id == kNone ? "-" : std::string(circuit.netAt(id).name); }

std::string describeLoop(const Circuit &circuit, const GateLoop &loop) {
  std::string text = fmt::format("  {}: gate {}, reference {}", loop.id, netName(circuit, loop.gateNet),
                                 netName(circuit, loop.refNet));
  if (loop.driver != kNone) text += ", driver " + std::string(circuit.component(loop.driver).name);
  else text += ", no driver found";
  text += fmt::format(", {} path{}", loop.paths.size(), loop.paths.size() == 1 ? "" : "s");
  return text;
}

OrderedJson projectJson(const std::string &designName, const std::string &netlistRel,
                        const std::string &layoutName, const std::vector<std::string> &partsRel) {
  OrderedJson design = OrderedJson::object();
  design["name"] = designName;
  design["description"] =
      "Fill in 'operating' (v_bus, i_load, f_sw, t_ambient, l_power_loop; drive.v_on/v_off to override the "
      "driver's rails) and, for elements the parts libraries' match rules miss, 'assign' globs such as "
      "{\"R*\": \"<resistor part id>\"}. See docs/commands.md.";
  design["netlist"] = netlistRel;
  design["layout"] = layoutName;
  design["assign"] = OrderedJson::object();
  design["operating"] = OrderedJson::object();

  OrderedJson project = OrderedJson::object();
  project["schema"] = "gateloop/1";
  project["description"] = "Starter project written by gateloop init; paths are relative to this file.";
  project["parts"] = partsRel;
  project["designs"] = OrderedJson::array({design});
  return project;
}

OrderedJson layoutJson(const Circuit &circuit, const NetList &nets) {
  OrderedJson layout = OrderedJson::object();
  layout["schema"] = "gateloop-layout/1";
  layout["description"] =
      "Template written by gateloop init. Give every net its routed 'length' (\"38 mm\"); for a better "
      "inductance also 'width', 'layer' and 'return' ({\"plane\": \"bottom\"} or {\"pair\": \"<net>\"}). "
      "Edit the stackup to match the board. gateloop check names every net still without a length.";
  layout["stackup"] = {{"top", {{"z", "0 mm"}, {"copper", "35 um"}}},
                       {"bottom", {{"z", "1.6 mm"}, {"copper", "35 um"}}}};
  OrderedJson netsObj = OrderedJson::object();
  for (NetId id : nets.ids()) netsObj[circuit.netAt(id).name] = OrderedJson::object();
  layout["nets"] = std::move(netsObj);
  return layout;
}

} // namespace

int runInitCommand(const std::string &netlist, const std::vector<std::string> &parts, bool force) {
  std::string stem = fs::path(netlist).stem().string();
  if (stem.empty()) stem = "design";
  const std::string layoutName = stem + ".layout.json";
  const std::vector<std::string> targets{kProjectFileName, layoutName};

  // Refuse before reading anything: a half-written pair (new layout, old project) would be
  // worse than none.
  bool blocked = false;
  std::vector<bool> existed;
  for (const auto &t : targets) {
    std::error_code ec;
    bool exists = fs::exists(t, ec);
    existed.push_back(exists);
    if (exists && !force) {
      std::cerr << t << ": error: exists; use --force to overwrite\n";
      blocked = true;
    }
  }
  if (blocked) return kExitInputError;

  FileTable files;
  InputDiagnostics diags;
  Circuit circuit;
  readNetlist(netlist, absoluteFolderOf(netlist), InputSelection{}, files, circuit, diags);
  PartLibrary lib;
  for (const auto &p : parts) readPartsLibrary(p, files, lib, diags);
  // Without libraries every XML `part` attribute would be an unknown id; resolving is only
  // meaningful once there is something to resolve against.
  if (!parts.empty() && !diags.hasErrors()) resolveParts(circuit, lib, {}, {}, "assign", diags);
  if (diags.hasErrors()) {
    printDiagnostics(diags, files, true);
    std::cerr << fmt::format("gateloop: {} input error{}; nothing was written\n", diags.errorCount(),
                             diags.errorCount() == 1 ? "" : "s");
    return kExitInputError;
  }

  std::vector<GateLoop> loops = extractGateLoops(circuit, lib);
  NetList nets;
  for (const auto &loop : loops) addLoopNets(loop, nets);
  std::vector<std::string> guessedSwitches;
  if (loops.empty()) guessTopologyNets(circuit, nets, guessedSwitches);

  std::vector<std::string> partsRel;
  for (const auto &p : parts) partsRel.push_back(relativeToCurrentDir(p));
  std::string projectText =
      projectJson(stem, relativeToCurrentDir(netlist), layoutName, partsRel).dump(2) + "\n";
  std::string layoutText = layoutJson(circuit, nets).dump(2) + "\n";

  if (auto err = writeOutputAtomically(layoutName, layoutText); !err.empty()) {
    std::cerr << err << '\n';
    return kExitInputError;
  }
  if (auto err = writeOutputAtomically(kProjectFileName, projectText); !err.empty()) {
    std::cerr << err << '\n';
    // Leave things as they were: a layout template without its project is only confusing.
    std::error_code ec;
    if (!existed[1]) fs::remove(layoutName, ec);
    return kExitInputError;
  }

  std::cout << fmt::format("wrote {}: design \"{}\", netlist {}, {} parts librar{}\n", kProjectFileName, stem,
                           relativeToCurrentDir(netlist), parts.size(), parts.size() == 1 ? "y" : "ies");
  if (!loops.empty()) {
    std::cout << fmt::format("wrote {}: {} net{} of {} gate loop{}:\n", layoutName, nets.ids().size(),
                             nets.ids().size() == 1 ? "" : "s", loops.size(), loops.size() == 1 ? "" : "s");
    for (const auto &loop : loops) std::cout << describeLoop(circuit, loop) << '\n';
  } else {
    std::cout << (parts.empty()
                      ? "no gate loops found: without --parts no element is known to be a switch\n"
                      : "no gate loops found: no element maps to a switch part of the given libraries\n");
    if (guessedSwitches.empty()) {
      std::cout << fmt::format("wrote {}: no M or Q elements either, so the template lists no nets\n", layoutName);
    } else {
      std::cout << fmt::format("wrote {}: {} net{} guessed from the pin order of {} M/Q element{} "
                               "(gate, source/emitter, nets one series R, L or diode from the gate): {}\n",
                               layoutName, nets.ids().size(), nets.ids().size() == 1 ? "" : "s",
                               guessedSwitches.size(), guessedSwitches.size() == 1 ? "" : "s",
                               fmt::join(guessedSwitches, ", "));
    }
    std::cout << "  map switches and drivers to parts (\"match\" in the parts library, or \"assign\" in "
              << kProjectFileName << ") to get the real gate loops\n";
  }
  std::cout << fmt::format("next: fill in the length of each net in {} (width, layer and return give a better "
                           "inductance), the operating point in {}, then run: gateloop check\n",
                           layoutName, kProjectFileName);
  return 0;
}

} // namespace gateloop
