/// \file
/// Part resolution (spec 4.3): XML part attribute, then project `assign` globs, then library
/// `match` rules.

#include "checker/model/part_resolution.h"

#include "checker/core/parallel.h"
#include "checker/core/text_util.h"

#include <algorithm>
#include <unordered_map>

namespace gateloop {

namespace {

std::string unknownPartMessage(const std::string &id, const PartLibrary &lib, std::string_view element = {}) {
  std::string msg = "unknown part \"" + id + "\"";
  if (!element.empty()) msg.append(" on ").append(element);
  std::vector<std::string> ids;
  for (const auto &p : lib.parts) ids.push_back(p.id);
  if (lib.parts.empty()) msg += " (no parts library is loaded)";
  else msg += didYouMean(id, ids);
  return msg;
}

/// Same key spelling as the JSON readers use (`assign.R1`, `assign["R*"]`).
std::string keyPath(const std::string &parent, const std::string &key) {
  bool simple = !key.empty() && std::all_of(key.begin(), key.end(), [](char c) {
    return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9') || c == '_' || c == '-';
  });
  if (simple) return parent + "." + key;
  std::string quoted = "\"";
  for (char c : key) {
    if (c == '"' || c == '\\') quoted += '\\';
    quoted += c;
  }
  return parent + "[" + quoted + "\"]";
}

std::string_view leafName(std::string_view name) {
  auto dot = name.rfind('.');
  return dot == std::string_view::npos ? name : name.substr(dot + 1);
}

/// Whether a part of \p part may describe an element of \p element. Subcircuits and untyped
/// elements can be anything; primitive elements only what they electrically are.
bool compatible(ElementKind element, PartKind part) {
  switch (element) {
  case ElementKind::Resistor: return part == PartKind::Resistor;
  case ElementKind::Capacitor: return part == PartKind::Capacitor;
  case ElementKind::Inductor:
  case ElementKind::Ferrite: return part == PartKind::Ferrite;
  case ElementKind::Diode:
  case ElementKind::Zener:
  case ElementKind::Tvs: return part == PartKind::Diode || part == PartKind::Zener || part == PartKind::Tvs;
  case ElementKind::Bjt: return part == PartKind::Igbt;
  case ElementKind::Mosfet:
  case ElementKind::Jfet:
  case ElementKind::Mesfet: return isSwitch(part);
  case ElementKind::Subcircuit:
  case ElementKind::Generic:
  case ElementKind::Switch: return true;
  // Simulation decks often stand a gate driver in by a pulse source (V), a controlled source
  // (E, F, G, H) or a behavioural source (B).
  case ElementKind::VoltageSource:
  case ElementKind::ControlledSource:
  case ElementKind::BehavioralSource: return part == PartKind::Driver;
  default: return false;
  }
}

} // namespace

bool globMatch(std::string_view pattern, std::string_view text) {
  // Iterative matcher with one backtrack point: linear in practice, never exponential.
  std::size_t p = 0, t = 0, starP = std::string_view::npos, starT = 0;
  while (t < text.size()) {
    if (p < pattern.size() && (pattern[p] == '?' || lowerAscii(pattern[p]) == lowerAscii(text[t]))) {
      ++p, ++t;
    } else if (p < pattern.size() && pattern[p] == '*') {
      starP = p++;
      starT = t;
    } else if (starP != std::string_view::npos) {
      p = starP + 1;
      t = ++starT;
    } else {
      return false;
    }
  }
  while (p < pattern.size() && pattern[p] == '*') ++p;
  return p == pattern.size();
}

void resolveParts(Circuit &circuit, const PartLibrary &lib,
                  const std::vector<std::pair<std::string, std::string>> &assign, SourceLocation assignWhere,
                  const std::string &assignFieldPath, InputDiagnostics &diags) {
  // assign entries resolved once; an unknown id is reported once, at its field.
  std::vector<int> assignPart(assign.size(), -1);
  for (std::size_t i = 0; i < assign.size(); ++i) {
    assignPart[i] = lib.find(assign[i].second);
    if (assignPart[i] < 0)
      diags.fieldError(assignWhere, keyPath(assignFieldPath, assign[i].first),
                       unknownPartMessage(assign[i].second, lib));
  }

  // match names, lower-cased; the first part in library order claims a name.
  std::unordered_map<std::string, std::uint32_t> bySubckt, byModel;
  for (std::size_t i = 0; i < lib.parts.size(); ++i) {
    const Part &p = lib.parts[i];
    auto claim = [&](std::unordered_map<std::string, std::uint32_t> &map, const std::string &name,
                     const char *what) {
      auto [it, inserted] = map.try_emplace(toLower(name), static_cast<std::uint32_t>(i));
      if (!inserted && it->second != i)
        diags.add({Severity::Warning, {p.file, 0, 0}, p.fieldPath + ".match",
                   std::string(what) + " \"" + name + "\" is also matched by part \"" +
                       lib.parts[it->second].id + "\", which is used"});
    };
    for (const auto &s : p.matchSubckt) claim(bySubckt, s, "subcircuit");
    for (const auto &m : p.matchModel) claim(byModel, m, "model");
  }

  // Per interned string (model, subcircuit and part-hint names: a handful, however big the deck),
  // the part it names; looked up once, before the components are shared out among threads.
  const std::size_t stringCount = circuit.stringCount();
  std::vector<std::int32_t> hintPart(stringCount, -1);
  std::vector<std::uint32_t> modelPart(stringCount, kNone), subcktPart(stringCount, kNone);
  for (StringId id = 1; id < stringCount; ++id) {
    std::string name(circuit.str(id));
    hintPart[id] = lib.find(name);
    std::string lower = toLower(name);
    if (auto it = byModel.find(lower); it != byModel.end()) modelPart[id] = it->second;
    if (auto it = bySubckt.find(lower); it != bySubckt.end()) subcktPart[id] = it->second;
  }
  // Patterns as written are mostly a literal prefix and one trailing '*' ("Rg*"): those, and
  // plain names, are compared directly instead of by the general matcher, for every element.
  struct Pattern {
    std::string_view text;
    bool hierarchical;
    enum class Form { Exact, Prefix, Glob } form;
  };
  std::vector<Pattern> patterns;
  for (const auto &[pattern, partId] : assign) {
    const std::string_view p = pattern;
    const auto wild = p.find_first_of("*?");
    Pattern::Form form = wild == std::string_view::npos                     ? Pattern::Form::Exact
                         : (wild == p.size() - 1 && p.back() == '*')        ? Pattern::Form::Prefix
                                                                            : Pattern::Form::Glob;
    patterns.push_back({form == Pattern::Form::Prefix ? p.substr(0, p.size() - 1) : p,
                        p.find('.') != std::string_view::npos, form});
  }
  auto matches = [](const Pattern &p, std::string_view name) {
    switch (p.form) {
    case Pattern::Form::Exact: return equalsIgnoreCase(p.text, name);
    case Pattern::Form::Prefix: return startsWithIgnoreCase(name, p.text);
    case Pattern::Form::Glob: break;
    }
    return globMatch(p.text, name);
  };

  // Each component on its own (glob patterns against millions of names), then the messages in
  // component order.
  auto &components = circuit.components();
  std::vector<std::uint8_t> viaMatch(components.size(), 0);
  parallelFor(
      components.size(),
      [&](std::size_t k) {
        Component &c = components[k];
        c.part = kNone;
        if (c.partHint != 0) {
          if (hintPart[c.partHint] >= 0) c.part = static_cast<std::uint32_t>(hintPart[c.partHint]);
          return; // the input's own part attribute wins: assign and match never override it
        }
        for (std::size_t i = 0; i < patterns.size(); ++i) {
          if (!matches(patterns[i], patterns[i].hierarchical ? c.name : leafName(c.name))) continue;
          if (assignPart[i] >= 0) c.part = static_cast<std::uint32_t>(assignPart[i]);
          return; // first matching pattern decides, even when its part id was unknown
        }
        if (c.model != 0) {
          c.part = c.kind == ElementKind::Subcircuit ? subcktPart[c.model] : modelPart[c.model];
          viaMatch[k] = c.part != kNone;
        }
      },
      /*grain=*/4096);
  for (std::size_t k = 0; k < components.size(); ++k) {
    const Component &c = components[k];
    if (c.partHint != 0 && c.part == kNone)
      diags.error(c.where, unknownPartMessage(std::string(circuit.str(c.partHint)), lib, c.name));
    if (c.part != kNone && !viaMatch[k] && !compatible(c.kind, lib.parts[c.part].kind))
      diags.warning(c.where, std::string("part \"") + lib.parts[c.part].id + "\" is a " +
                                 partKindName(lib.parts[c.part].kind) + " but " + std::string(c.name) + " is a " +
                                 elementKindName(c.kind) + " element");
  }

  // Hide everything flattened out of a subcircuit instance that a part models as a whole. Parents
  // may come before or after their children in the list, so the answer is memoised per element.
  enum : std::uint8_t { kUnknown, kVisible, kHidden };
  std::vector<std::uint8_t> state(components.size(), kUnknown);
  std::vector<ComponentId> chain;
  for (std::size_t i = 0; i < components.size(); ++i) {
    chain.clear();
    ComponentId p = components[i].parent;
    std::uint8_t result = kVisible;
    // Walk up until an answer is known; the bound guards against a malformed parent cycle.
    while (p != kNone && p < components.size() && chain.size() <= components.size()) {
      const Component &parent = components[p];
      if (parent.kind == ElementKind::Subcircuit && parent.part != kNone) {
        result = kHidden;
        break;
      }
      if (state[p] != kUnknown) {
        result = state[p];
        break;
      }
      chain.push_back(p);
      p = parent.parent;
    }
    // Every ancestor walked through (not itself a modelled subcircuit) sees the same ancestors above.
    for (ComponentId a : chain) state[a] = result;
    if (state[i] == kUnknown) state[i] = result;
    if (result == kHidden) components[i].hidden = true;
  }
}

} // namespace gateloop
