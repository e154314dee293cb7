#include "checker/model/layout.h"
#include "checker/model/circuit.h"
#include "checker/model/parts.h"

namespace gateloop {

const char *partKindName(PartKind k) {
  switch (k) {
  case PartKind::Igbt: return "igbt";
  case PartKind::Mosfet: return "mosfet";
  case PartKind::Driver: return "driver";
  case PartKind::Resistor: return "resistor";
  case PartKind::Capacitor: return "capacitor";
  case PartKind::Diode: return "diode";
  case PartKind::Zener: return "zener";
  case PartKind::Tvs: return "tvs";
  case PartKind::Ferrite: return "ferrite";
  }
  return "resistor";
}

int PartLibrary::find(const std::string &id) const {
  for (std::size_t i = 0; i < parts.size(); ++i)
    if (parts[i].id == id) return static_cast<int>(i);
  return -1;
}

const StackupLayer *Layout::layer(const std::string &name) const {
  for (const auto &l : stackup)
    if (equalsIgnoreCase(l.name, name)) return &l;
  return nullptr;
}

const NetRouting *Layout::routing(const std::string &net) const {
  for (const auto &n : nets)
    if (equalsIgnoreCase(n.net, net)) return &n;
  return nullptr;
}

} // namespace gateloop
