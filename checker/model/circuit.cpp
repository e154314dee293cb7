#include "checker/model/circuit.h"

#include <cassert>

namespace gateloop {

const char *elementKindName(ElementKind k) {
  switch (k) {
  case ElementKind::Resistor: return "resistor";
  case ElementKind::Capacitor: return "capacitor";
  case ElementKind::Inductor: return "inductor";
  case ElementKind::Coupling: return "coupling";
  case ElementKind::Diode: return "diode";
  case ElementKind::Zener: return "zener";
  case ElementKind::Tvs: return "tvs";
  case ElementKind::Ferrite: return "ferrite";
  case ElementKind::Bjt: return "bjt";
  case ElementKind::Mosfet: return "mosfet";
  case ElementKind::Jfet: return "jfet";
  case ElementKind::Mesfet: return "mesfet";
  case ElementKind::Switch: return "switch";
  case ElementKind::TransmissionLine: return "transmission-line";
  case ElementKind::VoltageSource: return "voltage-source";
  case ElementKind::CurrentSource: return "current-source";
  case ElementKind::ControlledSource: return "controlled-source";
  case ElementKind::BehavioralSource: return "behavioral-source";
  case ElementKind::Subcircuit: return "subcircuit";
  case ElementKind::Generic: return "generic";
  }
  return "generic";
}

std::string toLower(std::string_view s) {
  std::string out(s);
  for (char &ch : out)
    if (ch >= 'A' && ch <= 'Z') ch = static_cast<char>(ch - 'A' + 'a');
  return out;
}

bool equalsIgnoreCase(std::string_view a, std::string_view b) {
  if (a.size() != b.size()) return false;
  for (std::size_t i = 0; i < a.size(); ++i) {
    char x = a[i], y = b[i];
    if (x >= 'A' && x <= 'Z') x = static_cast<char>(x - 'A' + 'a');
    if (y >= 'A' && y <= 'Z') y = static_cast<char>(y - 'A' + 'a');
    if (x != y) return false;
  }
  return true;
}

std::vector<std::string> standardPinNames(ElementKind kind, std::size_t count) {
  std::vector<std::string> names;
  switch (kind) {
  case ElementKind::Diode:
  case ElementKind::Zener:
  case ElementKind::Tvs: names = {"a", "k"}; break;
  case ElementKind::Mosfet: names = {"d", "g", "s", "b"}; break;
  case ElementKind::Bjt: names = {"c", "b", "e", "s"}; break;
  case ElementKind::Jfet:
  case ElementKind::Mesfet: names = {"d", "g", "s"}; break;
  default: break;
  }
  names.resize(std::max(count, std::size_t{0}));
  for (std::size_t i = 0; i < count; ++i)
    if (names[i].empty()) names[i] = std::to_string(i + 1);
  names.resize(count);
  return names;
}

Circuit::Circuit() {
  strings_.emplace_back();
  stringIndex_.emplace(std::string(), 0);
  pinNameLists_.emplace_back();
  pinNameListIndex_.emplace(std::string(), 0);
}

NetId Circuit::net(std::string_view name, SourceLocation where) {
  std::string key = toLower(name);
  bool ground = key == "0" || key == "gnd";
  if (ground) key = "0";
  auto [it, inserted] = netIndex_.try_emplace(std::move(key), static_cast<NetId>(nets_.size()));
  if (inserted) nets_.push_back(Net{ground ? std::string("0") : std::string(name), ground, false, where});
  return it->second;
}

NetId Circuit::findNet(std::string_view name) const {
  std::string key = toLower(name);
  if (key == "gnd") key = "0";
  auto it = netIndex_.find(key);
  return it == netIndex_.end() ? kNone : it->second;
}

StringId Circuit::intern(std::string_view s) {
  auto [it, inserted] = stringIndex_.try_emplace(std::string(s), static_cast<StringId>(strings_.size()));
  if (inserted) strings_.emplace_back(s);
  return it->second;
}

std::uint32_t Circuit::internPinNames(const std::vector<std::string> &names) {
  std::string key;
  for (const auto &n : names) {
    key += n;
    key += '\0';
  }
  auto [it, inserted] =
      pinNameListIndex_.try_emplace(std::move(key), static_cast<std::uint32_t>(pinNameLists_.size()));
  if (inserted) pinNameLists_.push_back(names);
  return it->second;
}

ComponentId Circuit::addComponent(Component c, std::span<const NetId> nets, std::uint32_t pinNamesId) {
  assert(pinNameLists_[pinNamesId].size() == nets.size() && "pin names must match pin count");
  c.firstPin = static_cast<std::uint32_t>(pinNets_.size());
  c.pinCount = static_cast<std::uint16_t>(nets.size());
  c.pinNames = pinNamesId;
  pinNets_.insert(pinNets_.end(), nets.begin(), nets.end());
  components_.push_back(std::move(c));
  // clear() walks every bucket even when empty; readers add millions of components.
  if (!componentIndex_.empty()) componentIndex_.clear();
  return static_cast<ComponentId>(components_.size() - 1);
}

NetId Circuit::pinNet(const Component &c, std::string_view pinName) const {
  const auto &names = pinNames(c);
  for (std::size_t i = 0; i < names.size(); ++i)
    if (equalsIgnoreCase(names[i], pinName)) return pinNets_[c.firstPin + i];
  return kNone;
}

ComponentId Circuit::findComponent(std::string_view name) const {
  if (componentIndex_.empty() && !components_.empty()) {
    componentIndex_.reserve(components_.size());
    for (std::size_t i = 0; i < components_.size(); ++i)
      componentIndex_.try_emplace(toLower(components_[i].name), static_cast<ComponentId>(i));
  }
  auto it = componentIndex_.find(toLower(name));
  return it == componentIndex_.end() ? kNone : it->second;
}

void Circuit::reserve(std::size_t components, std::size_t nets) {
  components_.reserve(components);
  pinNets_.reserve(components * 3); // decks average about three pins per element
  nets_.reserve(nets);
  netIndex_.reserve(nets);
}

} // namespace gateloop
