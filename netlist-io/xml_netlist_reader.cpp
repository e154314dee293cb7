/// \file
/// Reader for the neutral XML netlist (spec 4.2).

#include "netlist-io/xml_netlist_reader.h"

#include "netlist-io/spice_value.h"

#include <pugixml.hpp>

#include <cerrno>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <unordered_map>

namespace gateloop {

namespace {

struct TypeName {
  const char *name;
  ElementKind kind;
};
constexpr TypeName kTypes[] = {{"R", ElementKind::Resistor}, {"C", ElementKind::Capacitor},
                               {"L", ElementKind::Inductor}, {"D", ElementKind::Diode},
                               {"Z", ElementKind::Zener},    {"TVS", ElementKind::Tvs},
                               {"FB", ElementKind::Ferrite}};

/// Our own words for pugixml's statuses: its descriptions ("Error parsing start element tag")
/// repeat "error" after our "error:" prefix.
const char *statusText(pugi::xml_parse_status s) {
  switch (s) {
  case pugi::status_unrecognized_tag: return "unrecognized tag";
  case pugi::status_bad_pi: return "malformed declaration or processing instruction";
  case pugi::status_bad_comment: return "malformed comment";
  case pugi::status_bad_cdata: return "malformed CDATA section";
  case pugi::status_bad_doctype: return "malformed document type declaration";
  case pugi::status_bad_pcdata: return "malformed text";
  case pugi::status_bad_start_element: return "malformed start tag";
  case pugi::status_bad_attribute: return "malformed attribute";
  case pugi::status_bad_end_element: return "malformed end tag";
  case pugi::status_end_element_mismatch: return "end tag does not match the open element, or an element is not closed";
  case pugi::status_no_document_element: return "no element in the document";
  case pugi::status_out_of_memory: return "out of memory";
  default: return "cannot be parsed";
  }
}

class XmlNetlistReader {
public:
  XmlNetlistReader(std::string_view text, FileId file, Circuit &out, InputDiagnostics &diags)
      : text_(text), index_(text), file_(file), out_(out), diags_(diags) {}

  void read() {
    pugi::xml_document doc;
    // Parsed as UTF-8 so byte offsets from offset_debug() are offsets into our text.
    pugi::xml_parse_result res =
        doc.load_buffer(text_.data(), text_.size(), pugi::parse_default, pugi::encoding_utf8);
    if (!res) {
      std::size_t offset = res.offset < 0 ? 0 : static_cast<std::size_t>(res.offset);
      if (offset >= text_.size() && !text_.empty()) offset = text_.size() - 1;
      diags_.error(index_.locate(file_, offset), std::string("XML syntax error: ") + statusText(res.status));
      return;
    }
    pugi::xml_node root = doc.document_element();
    for (pugi::xml_node n = root.next_sibling(); n; n = n.next_sibling())
      if (n.type() == pugi::node_element) error(n, "more than one root element");
    if (std::strcmp(root.name(), "netlist") != 0) {
      error(root, std::string("expected root element <netlist>, got <") + root.name() + ">");
      return;
    }
    checkAttributes(root, {"name", "version"});
    if (pugi::xml_attribute v = root.attribute("version"); v && std::strcmp(v.value(), "1") != 0) {
      error(root, std::string("unsupported netlist version \"") + v.value() + "\" (this reader knows version 1)");
      return;
    }
    out_.title = root.attribute("name").value();
    for (pugi::xml_node n = root.first_child(); n; n = n.next_sibling()) {
      if (n.type() != pugi::node_element) continue;
      if (std::strcmp(n.name(), "component") == 0) readComponent(n);
      else warning(n, std::string("element <") + n.name() + "> is not part of the netlist format and is ignored");
    }
  }

private:
  /// Location of an element: its '<', since pugixml points at the name after it.
  SourceLocation where(const pugi::xml_node &n) const {
    ptrdiff_t off = n.offset_debug();
    if (off < 0) return {file_, 0, 0};
    auto offset = static_cast<std::size_t>(off);
    if (offset > 0 && offset <= text_.size() && text_[offset - 1] == '<') --offset;
    return index_.locate(file_, offset);
  }

  void error(const pugi::xml_node &n, std::string msg) { diags_.error(where(n), std::move(msg)); }
  void warning(const pugi::xml_node &n, std::string msg) { diags_.warning(where(n), std::move(msg)); }

  void checkAttributes(const pugi::xml_node &n, std::initializer_list<const char *> known) {
    for (pugi::xml_attribute a = n.first_attribute(); a; a = a.next_attribute()) {
      bool ok = false;
      for (const char *k : known) ok = ok || std::strcmp(a.name(), k) == 0;
      if (!ok)
        warning(n, std::string("attribute \"") + a.name() + "\" on <" + n.name() + "> is not part of the format and is ignored");
    }
  }

  void readComponent(const pugi::xml_node &n) {
    checkAttributes(n, {"ref", "part", "type", "value"});
    const SourceLocation loc = where(n);
    std::string ref = n.attribute("ref").value();
    if (ref.empty()) {
      error(n, "component without a \"ref\" attribute");
      return;
    }
    std::string key = toLower(ref);
    if (auto [it, inserted] = firstSeen_.try_emplace(key, loc); !inserted) {
      error(n, "duplicate ref \"" + ref + "\" (first defined at line " + std::to_string(it->second.line) + ")");
      return;
    }

    Component c;
    c.name = ref;
    c.where = loc;
    if (pugi::xml_attribute t = n.attribute("type")) {
      std::string type = t.value();
      bool found = false;
      for (const auto &tn : kTypes)
        if (equalsIgnoreCase(type, tn.name)) {
          c.kind = tn.kind;
          found = true;
        }
      if (!found)
        error(n, "unknown type \"" + type + "\" on " + ref + " (expected R, C, L, D, Z, TVS or FB, or no type)");
    }
    if (pugi::xml_attribute v = n.attribute("value")) {
      if (auto sv = parseSpiceValue(v.value())) c.value = sv->value;
      else error(n, std::string("bad value \"") + v.value() + "\" on " + ref + " (expected a SPICE value such as 4.7, 10k or 2.2n)");
    }
    if (pugi::xml_attribute p = n.attribute("part")) {
      if (*p.value() == '\0') error(n, "empty \"part\" attribute on " + ref);
      else c.partHint = out_.intern(p.value());
    }

    std::vector<std::string> pinNames;
    std::vector<NetId> nets;
    for (pugi::xml_node pin = n.first_child(); pin; pin = pin.next_sibling()) {
      if (pin.type() != pugi::node_element) continue;
      if (std::strcmp(pin.name(), "pin") != 0) {
        warning(pin, std::string("element <") + pin.name() + "> inside <component> is not part of the format and is ignored");
        continue;
      }
      checkAttributes(pin, {"name", "net"});
      std::string name = pin.attribute("name").value();
      std::string net = pin.attribute("net").value();
      if (name.empty()) {
        error(pin, "pin of " + ref + " without a \"name\" attribute");
        continue;
      }
      if (net.empty()) {
        error(pin, "pin " + name + " of " + ref + " without a \"net\" attribute");
        continue;
      }
      bool duplicate = false;
      for (const auto &seen : pinNames) duplicate = duplicate || equalsIgnoreCase(seen, name);
      if (duplicate) {
        error(pin, "pin " + name + " appears twice on " + ref);
        continue;
      }
      if (pinNames.size() == 0xFFFF) {
        error(pin, ref + " has more pins than this reader supports (65535)");
        break;
      }
      pinNames.push_back(name);
      nets.push_back(out_.net(net, where(pin)));
    }
    out_.addComponent(std::move(c), nets, out_.internPinNames(pinNames));
  }

  std::string_view text_;
  LineIndex index_;
  FileId file_;
  Circuit &out_;
  InputDiagnostics &diags_;
  std::unordered_map<std::string, SourceLocation> firstSeen_;
};

} // namespace

bool readXmlNetlistText(std::string_view text, const std::string &displayName, FileTable &files, Circuit &out,
                        InputDiagnostics &diags) {
  const std::size_t errorsBefore = diags.errorCount();
  FileId file = files.add(displayName);
  XmlNetlistReader(text, file, out, diags).read();
  return diags.errorCount() == errorsBefore;
}

bool readXmlNetlist(const std::string &path, FileTable &files, Circuit &out, InputDiagnostics &diags) {
  std::error_code ec;
  const bool folder = std::filesystem::is_directory(path, ec);
  std::ifstream in;
  if (!folder) in.open(path, std::ios::binary);
  const int openErrno = errno;
  if (folder || !in) {
    const char *why = folder ? "it is a folder" : std::strerror(openErrno);
    diags.error({files.add(path), 0, 0}, std::string("cannot open file (") + why + ")");
    return false;
  }
  std::ostringstream ss;
  ss << in.rdbuf();
  return readXmlNetlistText(ss.str(), path, files, out, diags);
}

} // namespace gateloop
