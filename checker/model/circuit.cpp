#include "checker/model/circuit.h"

#include <cassert>
#include <cstring>

#include "checker/core/huge_pages.h"

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

std::string_view NameStorage::store(std::string_view s) {
  if (s.empty()) return {};
  if (s.size() > left_) {
    std::size_t bytes = std::max(kBlockBytes, s.size());
    blocks_.push_back(std::make_unique_for_overwrite<char[]>(bytes));
    next_ = blocks_.back().get();
    left_ = bytes;
  }
  std::memcpy(next_, s.data(), s.size());
  std::string_view stored(next_, s.size());
  next_ += s.size();
  left_ -= s.size();
  return stored;
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

namespace {
bool namesGround(std::string_view name) { return name == "0" || equalsIgnoreCase(name, "gnd"); }
} // namespace

std::string_view Circuit::keepText(std::string text) {
  keptTexts_.push_back(std::make_unique<std::string>(std::move(text)));
  return *keptTexts_.back();
}

bool Circuit::inKeptText(std::string_view name) const {
  for (const auto &t : keptTexts_)
    if (viewsInto(*t, name)) return true;
  return false;
}

NetId Circuit::net(std::string_view name, std::uint64_t hash, SourceLocation where, NameIn nameIn) {
  auto nameOf = [this](NetId id) { return nets_[id].name; };
  if (namesGround(name)) {
    if (ground_ == kNone) {
      ground_ = static_cast<NetId>(nets_.size());
      nets_.push_back(Net{names_.store("0"), where, true, false});
    }
    return ground_;
  }
  NetId id = netIndex_.find(name, hash, nameOf);
  if (id != kNone) return id;
  id = static_cast<NetId>(nets_.size());
  assert(nameIn == NameIn::anywhere || inKeptText(name));
  nets_.push_back(Net{nameIn == NameIn::keptText ? name : names_.store(name), where, false, false});
  netIndex_.insert(id, hash, nameOf);
  return id;
}

NetId Circuit::findNet(std::string_view name) const {
  if (namesGround(name)) return ground_;
  return netIndex_.find(name, hashIgnoreCase(name), [this](NetId id) { return nets_[id].name; });
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

ComponentId Circuit::addComponent(Component c, std::span<const NetId> nets, std::uint32_t pinNamesId,
                                  NameIn nameIn) {
  assert(pinNameLists_[pinNamesId].size() == nets.size() && "pin names must match pin count");
  c.firstPin = static_cast<std::uint32_t>(pinNets_.size());
  c.pinCount = static_cast<std::uint16_t>(nets.size());
  c.pinNames = pinNamesId;
  assert(nameIn == NameIn::anywhere || inKeptText(c.name));
  if (nameIn == NameIn::anywhere) c.name = names_.store(c.name);
  pinNets_.insert(pinNets_.end(), nets.begin(), nets.end());
  components_.push_back(std::move(c));
  if (componentIndex_.size() != 0) componentIndex_.clear();
  return static_cast<ComponentId>(components_.size() - 1);
}

NetId Circuit::pinNet(const Component &c, std::string_view pinName) const {
  const auto &names = pinNames(c);
  for (std::size_t i = 0; i < names.size(); ++i)
    if (equalsIgnoreCase(names[i], pinName)) return pinNets_[c.firstPin + i];
  return kNone;
}

ComponentId Circuit::findComponent(std::string_view name) const {
  auto nameOf = [this](ComponentId id) { return components_[id].name; };
  if (componentIndex_.size() == 0 && !components_.empty()) {
    componentIndex_.reserve(components_.size(), nameOf);
    // The first of two equally named components wins, as a reader reports the second.
    for (std::size_t i = 0; i < components_.size(); ++i) {
      std::uint64_t h = hashIgnoreCase(components_[i].name);
      if (componentIndex_.find(components_[i].name, h, nameOf) == kNone)
        componentIndex_.insert(static_cast<ComponentId>(i), h, nameOf);
    }
  }
  return componentIndex_.find(name, hashIgnoreCase(name), nameOf);
}

void Circuit::reserve(std::size_t components, std::size_t nets) {
  components_.reserve(components);
  pinNets_.reserve(components * 3); // decks average about three pins per element
  nets_.reserve(nets);
  netIndex_.reserve(nets, [this](NetId id) { return nets_[id].name; });
  // Not for the pin and net arrays: their reserve is a guess, and a huge page past the last
  // element written would be resident for nothing.
  adviseHugePages(components_.data(), components_.capacity() * sizeof(Component));
}

} // namespace gateloop
