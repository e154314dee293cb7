/// \file
/// SPICE deck reader. Two passes:
///  1. Read every file once into memory (includes, .lib sections), split it into cards and run the
///     dot cards (.subckt nesting, .param, .model, .global, .func). Element cards are only
///     remembered (top-level ones as runs of consecutive cards: file, offset, line, count), so
///     that models and subcircuits defined further down are known before any element is
///     interpreted (a Q card's fourth word is a substrate node or a model, depending on the
///     .model cards).
///  2. Parse every subcircuit body once into records, count each definition's flattened size
///     bottom-up (so a subcircuit "bomb" is refused without being expanded), then walk the
///     top-level cards in deck order and emit components, expanding X instances depth-first.
/// See docs/spice-reader.md for the rules and decisions.
#include "netlist-io/spice_reader.h"

#include "checker/core/text_util.h"
#include "netlist-io/spice_card.h"
#include "netlist-io/spice_expression.h"
#include "netlist-io/spice_value.h"

#include <algorithm>
#include <cerrno>
#include <charconv>
#include <cmath>
#include <cstdio>
#include <cstring>
#include <deque>
#include <filesystem>
#include <limits>
#include <memory>
#include <optional>
#include <set>
#include <tuple>
#include <unordered_map>
#include <unordered_set>

namespace gateloop {
namespace {

namespace fs = std::filesystem;

constexpr std::size_t kMaxErrors = 100;
constexpr std::size_t kMaxNotes = 500;
constexpr unsigned kMaxSubcircuitNesting = 1000;
constexpr int kMaxParameterChain = 200;
constexpr std::uint64_t kCountCap = std::uint64_t{1} << 62;
constexpr std::size_t kMaxFileSize = std::numeric_limits<std::uint32_t>::max() - 1;
const double kNaN = std::numeric_limits<double>::quiet_NaN();

bool isDigit(char c) { return c >= '0' && c <= '9'; }
bool isIdentStart(char c) { return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || c == '_'; }
bool isIdentChar(char c) { return isIdentStart(c) || isDigit(c); }

bool isIdentifier(std::string_view s) {
  if (s.empty() || !isIdentStart(s[0])) return false;
  for (char c : s)
    if (!isIdentChar(c)) return false;
  return true;
}

struct CiHash {
  std::size_t operator()(std::string_view s) const noexcept {
    return static_cast<std::size_t>(hashIgnoreCase(s));
  }
};
struct CiEq {
  bool operator()(std::string_view a, std::string_view b) const { return equalsIgnoreCase(a, b); }
};
template <class V> using CiMap = std::unordered_map<std::string_view, V, CiHash, CiEq>;
using CiSet = std::unordered_set<std::string_view, CiHash, CiEq>;

/// Shortest round-trip text of a number, exponent without `+` and leading zeros (`1e6`).
std::string formatNumber(double v) {
  char buf[64];
  auto r = std::to_chars(buf, buf + sizeof buf, v);
  std::string s(buf, r.ptr);
  auto e = s.find('e');
  if (e == std::string::npos) return s;
  std::string mant = s.substr(0, e), ex = s.substr(e + 1);
  bool neg = !ex.empty() && ex[0] == '-';
  if (!ex.empty() && (ex[0] == '+' || ex[0] == '-')) ex.erase(0, 1);
  while (ex.size() > 1 && ex[0] == '0') ex.erase(0, 1);
  return mant + "e" + (neg ? "-" : "") + ex;
}

std::string_view stripQuotes(std::string_view s) {
  if (s.size() >= 2 && (s.front() == '"' || s.front() == '\'') && s.back() == s.front())
    return s.substr(1, s.size() - 2);
  return s;
}

const char *kindWord(ElementKind k) {
  switch (k) {
  case ElementKind::Resistor: return "resistor";
  case ElementKind::Capacitor: return "capacitor";
  case ElementKind::Inductor: return "inductor";
  case ElementKind::Coupling: return "coupling";
  case ElementKind::Diode: return "diode";
  case ElementKind::Bjt: return "bipolar transistor";
  case ElementKind::Mosfet: return "MOSFET";
  case ElementKind::Jfet: return "JFET";
  case ElementKind::Mesfet: return "MESFET";
  case ElementKind::Switch: return "switch";
  case ElementKind::TransmissionLine: return "transmission line";
  case ElementKind::VoltageSource: return "voltage source";
  case ElementKind::CurrentSource: return "current source";
  case ElementKind::ControlledSource: return "controlled source";
  case ElementKind::BehavioralSource: return "behavioral source";
  case ElementKind::Subcircuit: return "subcircuit instance";
  default: return "element";
  }
}

/// Dot cards that describe analyses, output or simulator options: read and ignored.
bool isIgnoredDotCard(std::string_view kw) {
  static const char *const kIgnored[] = {
      "tran",   "ac",       "dc",      "op",       "noise",   "four",     "fourier", "options",
      "option", "opt",      "opts",    "temp",     "ic",      "nodeset",  "save",    "print",
      "plot",   "probe",    "meas",    "measure",  "step",    "width",    "backanno", "tf",
      "sens",   "disto",    "pz",      "sp",       "pss",     "hb",       "csparam", "lin",
      "wave",   "net",      "savebias", "loadbias", "protect", "unprotect", "ferret", "endc",
      "endl",   "alter",    "mc",      "worst",    "stimulus", "vector",  "graph",   "psd",
      "savecurrents",
  };
  for (const char *k : kIgnored)
    if (equalsIgnoreCase(kw, k)) return true;
  return false;
}

/// Dot cards that open a block of lines that are not SPICE cards, with the card that closes it.
const char *blockEnd(std::string_view kw) {
  if (equalsIgnoreCase(kw, "control")) return ".endc";
  if (equalsIgnoreCase(kw, "data")) return ".enddata";
  if (equalsIgnoreCase(kw, "machine")) return ".endmachine";
  return nullptr;
}

ElementKind kindOfLetter(char letter) {
  switch (letter) {
  case 'r': return ElementKind::Resistor;
  case 'c': return ElementKind::Capacitor;
  case 'l': return ElementKind::Inductor;
  case 'k': return ElementKind::Coupling;
  case 'd': return ElementKind::Diode;
  case 'q': return ElementKind::Bjt;
  case 'm': return ElementKind::Mosfet;
  case 'j': return ElementKind::Jfet;
  case 'z': return ElementKind::Mesfet;
  case 's':
  case 'w': return ElementKind::Switch;
  case 't': return ElementKind::TransmissionLine;
  case 'v': return ElementKind::VoltageSource;
  case 'i': return ElementKind::CurrentSource;
  case 'e':
  case 'f':
  case 'g':
  case 'h': return ElementKind::ControlledSource;
  case 'b': return ElementKind::BehavioralSource;
  case 'x': return ElementKind::Subcircuit;
  default: return ElementKind::Generic;
  }
}

// --- Data of pass 1 and 2 ---------------------------------------------------------------------

struct SourceFile {
  std::string_view text;  ///< kept by the circuit (Circuit::keepText)
  FileId id = 0;
  fs::path dir;           ///< folder that relative includes start from
  std::string canonical;  ///< canonical path; empty for text given in memory
  std::size_t bodyStart = 0;
  bool endlScanned = false;
  std::size_t lastEndl = 0; ///< offset of the last line starting with .endl (+1), 0 = none
};

/// An element card remembered in pass 1.
struct CardRef {
  std::uint32_t file, begin, end, line;
};

/// Consecutive top-level element cards of one file, remembered by where the scanner stood before
/// the first: pass 2 scans them again instead of keeping one record per card (a flat deck of a
/// million cards is one run).
struct CardRun {
  std::uint32_t file, offset, line, count;
};

struct ParamDef {
  std::string_view name, expr;
  SourceLocation where;     ///< of the name
  SourceLocation exprWhere; ///< of the first character of the value
};

struct PortDecl {
  std::string_view name;
  SourceLocation where;
};

enum class NodeClass : std::uint8_t { Ground, Global, Port, Local };

struct NodeRef {
  std::string_view name;
  SourceLocation where;
  NodeClass cls = NodeClass::Local;
  std::uint32_t port = 0;
};

struct ParamPair {
  std::string_view name, value;
  SourceLocation where;
};

struct Def;

/// One parsed element card.
struct Rec {
  ElementKind kind = ElementKind::Generic;
  char letter = 0;
  std::string_view name;
  SourceLocation where;
  std::uint32_t nodeFirst = 0, nodeCount = 0, pairFirst = 0, pairCount = 0;
  bool hasNumber = false;
  double value = kNaN;
  std::string_view valueText; ///< to evaluate per instance (expression or parameter name)
  SourceLocation valueWhere;
  std::string_view model;
  Def *target = nullptr;   ///< X: the subcircuit definition
  bool blackBox = false;   ///< X: subcircuit not defined anywhere
  bool noExpand = false;   ///< X: do not expand (error already reported)
};

struct Def {
  std::string_view name;
  SourceLocation where;
  Def *parent = nullptr;
  std::vector<PortDecl> ports;
  std::vector<ParamDef> defaults; ///< `params:` on the .subckt card
  std::vector<ParamDef> params;   ///< .param cards in the body
  std::vector<CardRef> cards;
  CiMap<Def *> children;
  // Pass 2.
  std::vector<Rec> recs;
  std::vector<NodeRef> nodes;
  std::vector<ParamPair> pairs;
  std::uint64_t count = 0;
  std::uint8_t state = 0; ///< 0 = not counted, 1 = counting, 2 = done
  std::uint32_t depth = 0; ///< levels of instances one instance of this definition makes
  bool tooDeep = false;
  bool parsed = false;
  std::uint32_t pinNamesId = 0;
  StringId nameId = 0;
};

struct ModelInfo {
  std::string_view name, type;
  SourceLocation where;
  StringId id = 0;
  bool interned = false;
};

struct IncludeFrame {
  std::string canonical;
  std::string section; ///< lower case; empty for a whole file
  FileId display = 0;
};

class SpiceDeckReader;

/// Parameters visible in one scope: a subcircuit instance, or the deck itself (parent nullptr).
/// Values are evaluated on first use, so .param cards may refer to later ones; a definition that
/// refers to itself is reported instead of looping.
class ParamEnv final : public SpiceExpressionScope {
public:
  enum class State : std::uint8_t { Pending, Evaluating, Done, Failed };
  struct Slot {
    std::string_view name, expr;
    SourceLocation where, exprWhere;
    double value = 0.0;
    State state = State::Pending;
  };

  ParamEnv(const ParamEnv *parent, SpiceDeckReader &reader) : parent_(parent), reader_(reader) {}

  SpiceLookup parameter(std::string_view name, double &value) const override;
  const SpiceFunction *function(std::string_view name) const override;

  Slot *find(std::string_view name) const {
    for (auto &s : slots_)
      if (equalsIgnoreCase(s.name, name)) return &s;
    return nullptr;
  }
  void addOrReplace(const ParamDef &d) {
    if (Slot *s = find(d.name)) {
      *s = Slot{d.name, d.expr, d.where, d.exprWhere};
      return;
    }
    slots_.push_back(Slot{d.name, d.expr, d.where, d.exprWhere});
  }
  void addIfAbsent(const ParamDef &d) {
    if (!find(d.name)) slots_.push_back(Slot{d.name, d.expr, d.where, d.exprWhere});
  }
  void addValue(std::string_view name, SourceLocation where, double v, bool ok) {
    Slot s{name, {}, where, where};
    s.value = v;
    s.state = ok ? State::Done : State::Failed;
    if (Slot *old = find(name)) *old = s;
    else slots_.push_back(s);
  }

private:
  const ParamEnv *parent_;
  SpiceDeckReader &reader_;
  mutable std::vector<Slot> slots_;
};

/// Where flattened elements go: the instance path, its port nets, parameters and component id.
struct Instance {
  std::string prefix; ///< "X1.XH"; empty at top level
  std::vector<NetId> portNets;
  const ParamEnv *env = nullptr;
  ComponentId component = kNone;
};

/// Small direct-mapped cache of recently used top-level nets. Consecutive cards mostly name nets
/// that the previous few cards created, so most lookups end here instead of in the circuit's
/// big net index (a cache miss each).
class RecentNets {
public:
  NetId find(std::string_view name, std::size_t hash) const {
    const Entry &e = entries_[hash & (kSize - 1)];
    if (e.hash == hash && e.id != kNone && equalsIgnoreCase(e.name, name)) return e.id;
    return kNone;
  }
  void put(std::string_view name, std::size_t hash, NetId id) {
    entries_[hash & (kSize - 1)] = Entry{name, hash, id};
  }

private:
  static constexpr std::size_t kSize = 1024;
  struct Entry {
    std::string_view name;
    std::size_t hash = 0;
    NetId id = kNone;
  };
  Entry entries_[kSize];
};

// --- The reader ---------------------------------------------------------------------------------

class SpiceDeckReader {
public:
  SpiceDeckReader(const SpiceReadOptions &options, FileTable &files, Circuit &out,
                  InputDiagnostics &diags)
      : options_(options), files_(files), circuit_(out), diags_(diags), globalEnv_(nullptr, *this) {}

  bool readPath(const std::string &path);
  bool readText(std::string_view text, const std::string &displayName);

  // Used by ParamEnv.
  void reportOnce(SourceLocation where, std::string message);
  /// Note on a value read as an IEC 60062 RKM code, once per place, when SPICE reads it otherwise.
  void noteRkm(SourceLocation where, std::string_view text, double value, std::string_view subject);
  const SpiceFunction *function(std::string_view name) const {
    auto it = functions_.find(name);
    return it == functions_.end() ? nullptr : &it->second;
  }

private:
  // Diagnostics.
  void error(SourceLocation where, std::string message);
  void note(SourceLocation where, std::string message);
  SourceLocation loc(const SourceFile &f, std::uint32_t line, std::uint32_t column) const {
    return {f.id, line, column};
  }
  SourceLocation loc(const SourceFile &f, const SpiceToken &t) const { return {f.id, t.line, t.column}; }
  std::string locText(SourceLocation w) const {
    return files_.name(w.file) + ":" + std::to_string(w.line) + ":" + std::to_string(w.column);
  }

  // Roots and files.
  void setRoot(const fs::path &fallback);
  std::string displayName(const fs::path &canonical) const;
  bool insideRoot(const fs::path &canonical) const;
  /// Reads a file once (cached by canonical path). Problems are reported at \p requestedAt, or,
  /// for the deck itself (\p requestedAt null), against the file name alone.
  std::optional<std::uint32_t> loadFile(const fs::path &canonical, const std::string &shown,
                                        const SourceLocation *requestedAt);
  bool checkEncoding(SourceFile &f);
  std::size_t lastEndl(SourceFile &f);

  // Pass 1.
  void beginTopFile(std::uint32_t fi);
  void processFile(std::uint32_t fi, std::size_t offset, std::uint32_t line,
                   std::string_view section, bool *sectionFound);
  bool tokenize(const SourceFile &f, const SpiceCard &card);
  void dotCard(std::uint32_t fi, SpiceCardScanner &scanner, std::size_t defDepthAtStart,
               bool &stopFile);
  void includeFile(std::uint32_t fi, const SpiceToken &pathToken, std::string_view section,
                   const SpiceToken *sectionToken);
  void subcktCard(std::uint32_t fi);
  void paramCard(std::uint32_t fi, std::vector<ParamDef> &out);
  void funcCard(std::uint32_t fi, std::size_t firstToken);
  void modelCard(std::uint32_t fi);
  std::string_view tokenSpan(std::size_t first, std::size_t end);
  void elementCard(std::uint32_t fi, const SpiceCard &card, std::size_t offsetBefore,
                   std::uint32_t lineBefore);

  // Pass 2.
  void build();
  void parseDef(Def &d);
  bool parseElement(const SourceFile &f, Def *scope, Rec &rec, std::vector<NodeRef> &nodes,
                    std::vector<ParamPair> &pairs);
  bool parseValueWord(const SourceFile &f, const SpiceWord &w, Rec &rec);
  void classifyNodes(const Def *scope, std::vector<NodeRef> &nodes, std::size_t first);
  Def *findDef(std::string_view name, const Def *scope) const;
  void resolveInstance(Rec &rec, std::uint32_t nodeCount, const Def *scope);
  void countDef(Def &d, unsigned depth);
  void reportDuplicateNames(ComponentId first);
  bool isModel(std::string_view name) const { return models_.count(name) != 0; }
  StringId modelId(std::string_view name);
  std::uint32_t standardPins(ElementKind k, std::size_t n);
  NetId resolveNet(const NodeRef &n, const Instance &inst);
  void emit(const Rec &rec, const NodeRef *nodes, const ParamPair *pairs, const Instance &inst);
  void expand(const Rec &rec, const ParamPair *pairs, const Instance &inst, ComponentId xId,
              std::vector<NetId> &&portNets);
  bool evaluate(std::string_view text, SourceLocation where, const ParamEnv &env,
                const std::string &what, bool once, double &out);

  friend class ParamEnv;

  const SpiceReadOptions &options_;
  FileTable &files_;
  Circuit &circuit_;
  InputDiagnostics &diags_;

  fs::path root_;
  std::vector<std::unique_ptr<SourceFile>> sources_;
  std::unordered_map<std::string, std::uint32_t> sourceByPath_;
  std::vector<IncludeFrame> includeStack_;
  std::deque<std::string> arena_;

  std::vector<SpiceToken> tokens_;
  std::vector<SpiceWord> words_;
  SpiceTokenError tokenError_;

  std::vector<CardRun> topRuns_;
  bool runOpen_ = false;           ///< the last card read was a top-level element card
  std::uint64_t topCardCount_ = 0;
  std::vector<CardRef> topXCards_; ///< top-level X cards, for the size estimate
  std::vector<ParamDef> globalParams_;
  std::deque<Def> defs_;
  CiMap<Def *> topDefs_;
  std::vector<Def *> defStack_;
  CiMap<ModelInfo> models_;
  CiMap<SpiceFunction> functions_;
  CiSet globals_;
  std::set<std::string, std::less<>> unknownDotCards_;
  std::set<char> unknownLetters_;
  std::set<std::tuple<FileId, std::uint32_t, std::uint32_t>> reported_;
  std::set<std::tuple<FileId, std::uint32_t, std::uint32_t>> noted_;
  std::vector<Def *> counting_;

  ParamEnv globalEnv_;
  RecentNets recentNets_;
  NetId groundNet_ = kNone;
  std::size_t topComponents_ = 0;
  std::uint32_t pinCache_[32][9] = {};
  std::vector<NetId> netScratch_;
  std::string nameScratch_;
  /// First half of the duplicate-name check, done while the names are at hand: one bit per
  /// hash bucket of top-level names seen, one per bucket seen twice (reportDuplicateNames).
  std::vector<std::uint64_t> namesSeen_, namesShared_;
  std::size_t nameBucketMask_ = 0;
  void markTopName(std::string_view name) {
    if (namesSeen_.empty()) return;
    // The bit sets are bigger than the core's cache: each bucket's word is fetched a few names
    // ahead of its use, so the wait for memory overlaps the work on the next cards.
    const std::size_t b = hashIgnoreCase(name) & nameBucketMask_;
    __builtin_prefetch(&namesSeen_[b >> 6], 1);
    const std::size_t slot = pendingNames_++ % kNameLookahead;
    if (pendingNames_ > kNameLookahead) markBucket(pendingBuckets_[slot]);
    pendingBuckets_[slot] = b;
  }
  void flushTopNames() {
    const std::size_t n = std::min(pendingNames_, kNameLookahead);
    for (std::size_t k = 0; k < n; ++k) markBucket(pendingBuckets_[(pendingNames_ - n + k) % kNameLookahead]);
    pendingNames_ = 0;
  }
  void markBucket(std::size_t b) {
    const std::uint64_t bit = std::uint64_t{1} << (b & 63);
    if (namesSeen_[b >> 6] & bit) namesShared_[b >> 6] |= bit;
    else namesSeen_[b >> 6] |= bit;
  }
  static constexpr std::size_t kNameLookahead = 8;
  std::size_t pendingBuckets_[kNameLookahead] = {};
  std::size_t pendingNames_ = 0;

  /// Text of the file whose top-level cards are being built: the circuit keeps it, so names
  /// read verbatim from it are handed on without a copy.
  std::string_view scanning_;
  Circuit::NameIn whereIs(std::string_view name) const {
    return viewsInto(scanning_, name) ? Circuit::NameIn::keptText : Circuit::NameIn::anywhere;
  }
  std::uint64_t emitted_ = 0;
  bool capReported_ = false;

  int paramDepth_ = 0; ///< parameters being evaluated inside one another
  std::size_t errors_ = 0;
  std::size_t notes_ = 0;
  bool stop_ = false;
};

SpiceLookup ParamEnv::parameter(std::string_view name, double &value) const {
  if (Slot *s = find(name)) {
    switch (s->state) {
    case State::Done: value = s->value; return SpiceLookup::Found;
    case State::Failed: return SpiceLookup::Failed;
    case State::Evaluating:
      reader_.reportOnce(s->where, "parameter " + std::string(s->name) + " depends on itself");
      return SpiceLookup::Failed;
    case State::Pending: break;
    }
    // Parameters defined through long chains (a={b}, b={c}, ...) evaluate recursively; bound
    // the chain so that the stack is too.
    if (reader_.paramDepth_ >= kMaxParameterChain) {
      reader_.reportOnce(s->where, "parameter " + std::string(s->name) +
                                       " is defined through more than " +
                                       std::to_string(kMaxParameterChain) + " other parameters");
      s->state = State::Failed;
      return SpiceLookup::Failed;
    }
    s->state = State::Evaluating;
    double v = 0.0;
    ++reader_.paramDepth_;
    bool ok = reader_.evaluate(s->expr, s->exprWhere, *this,
                               ".param " + std::string(s->name), true, v);
    --reader_.paramDepth_;
    // The slot may have moved if evaluation added slots; look it up again.
    Slot *again = find(name);
    again->state = ok ? State::Done : State::Failed;
    again->value = v;
    if (!ok) return SpiceLookup::Failed;
    value = v;
    return SpiceLookup::Found;
  }
  if (parent_) return parent_->parameter(name, value);
  return SpiceLookup::Unknown;
}

const SpiceFunction *ParamEnv::function(std::string_view name) const {
  return reader_.function(name);
}

// --- Diagnostics ----------------------------------------------------------------------------------

void SpiceDeckReader::error(SourceLocation where, std::string message) {
  if (stop_) return;
  if (errors_ >= kMaxErrors) {
    diags_.error(where, "too many errors (" + std::to_string(kMaxErrors) + "); reading stopped");
    stop_ = true;
    return;
  }
  ++errors_;
  diags_.error(where, std::move(message));
}

void SpiceDeckReader::note(SourceLocation where, std::string message) {
  if (notes_ > kMaxNotes) return;
  if (notes_++ == kMaxNotes) {
    diags_.note(where, "more notes about this deck are not shown");
    return;
  }
  diags_.note(where, std::move(message));
}

void SpiceDeckReader::noteRkm(SourceLocation where, std::string_view text, double value,
                              std::string_view subject) {
  if (!noted_.emplace(where.file, where.line, where.column).second) return;
  auto spice3 = parseSpice3Value(text);
  if (spice3 && *spice3 == value) return; // same number either way (`10k0`)
  note(where, std::string(subject) + ": value '" + std::string(text) + "' read as " +
                  formatNumber(value) + " (IEC 60062 RKM code); SPICE simulators " +
                  (spice3 ? "read it as " + formatNumber(*spice3) : std::string("reject it")));
}

void SpiceDeckReader::reportOnce(SourceLocation where, std::string message) {
  if (!reported_.emplace(where.file, where.line, where.column).second) return;
  error(where, std::move(message));
}

// --- Files ------------------------------------------------------------------------------------------

void SpiceDeckReader::setRoot(const fs::path &fallback) {
  std::error_code ec;
  fs::path r = options_.projectRoot.empty() ? fallback : fs::path(options_.projectRoot);
  if (r.empty()) r = fs::current_path(ec);
  fs::path canon = fs::weakly_canonical(r, ec);
  root_ = ec ? r.lexically_normal() : canon;
}

bool SpiceDeckReader::insideRoot(const fs::path &canonical) const {
  fs::path rel = canonical.lexically_relative(root_);
  if (rel.empty()) return false;
  auto first = rel.begin();
  return first == rel.end() || *first != "..";
}

std::string SpiceDeckReader::displayName(const fs::path &canonical) const {
  if (insideRoot(canonical)) return canonical.lexically_relative(root_).generic_string();
  return canonical.generic_string();
}

/// Finds the first NUL byte or malformed UTF-8 sequence; text files only.
bool SpiceDeckReader::checkEncoding(SourceFile &f) {
  std::string_view t = f.text;
  std::size_t bad = std::string_view::npos;
  const char *why = nullptr;
  std::string message;
  if (const void *z = std::memchr(t.data(), 0, t.size())) {
    bad = static_cast<std::size_t>(static_cast<const char *>(z) - t.data());
    why = "file contains a NUL byte (a binary file, not a SPICE deck)";
  }
  std::size_t limit = bad == std::string_view::npos ? t.size() : bad;
  std::size_t i = 0;
  while (i < limit) {
    if (i + 8 <= limit) {
      std::uint64_t w;
      std::memcpy(&w, t.data() + i, 8);
      if ((w & 0x8080808080808080ull) == 0) {
        i += 8;
        continue;
      }
    }
    auto c = static_cast<unsigned char>(t[i]);
    if (c < 0x80) {
      ++i;
      continue;
    }
    std::size_t len = c >= 0xF0 && c <= 0xF4 ? 4 : c >= 0xE0 ? 3 : c >= 0xC2 && c <= 0xDF ? 2 : 0;
    if (c >= 0xF5) len = 0;
    bool ok = len != 0 && i + len <= t.size();
    for (std::size_t k = 1; ok && k < len; ++k)
      ok = (static_cast<unsigned char>(t[i + k]) & 0xC0) == 0x80;
    if (ok && len == 3) {
      auto c1 = static_cast<unsigned char>(t[i + 1]);
      if ((c == 0xE0 && c1 < 0xA0) || (c == 0xED && c1 >= 0xA0)) ok = false;
    }
    if (ok && len == 4) {
      auto c1 = static_cast<unsigned char>(t[i + 1]);
      if ((c == 0xF0 && c1 < 0x90) || (c == 0xF4 && c1 >= 0x90)) ok = false;
    }
    if (!ok) {
      bad = i;
      char hex[8];
      std::snprintf(hex, sizeof hex, "0x%02X", c);
      message = std::string("file is not UTF-8 text (byte ") + hex + ")";
      why = message.c_str();
      break;
    }
    i += len;
  }
  if (!why) return true;
  std::uint32_t line = 1;
  std::size_t lineStart = 0;
  for (std::size_t k = 0; k < bad; ++k)
    if (t[k] == '\n') ++line, lineStart = k + 1;
  error({f.id, line, static_cast<std::uint32_t>(bad - lineStart + 1)}, why);
  return false;
}

std::optional<std::uint32_t> SpiceDeckReader::loadFile(const fs::path &canonical,
                                                        const std::string &shown,
                                                        const SourceLocation *requestedAtPtr) {
  std::string key = canonical.string();
  if (auto it = sourceByPath_.find(key); it != sourceByPath_.end()) return it->second;
  SourceLocation requestedAt = requestedAtPtr ? *requestedAtPtr : SourceLocation{};
  if (!requestedAtPtr) requestedAt.file = files_.add(shown);
  std::error_code ec;
  auto st = fs::status(canonical, ec);
  if (ec || !fs::exists(st)) {
    error(requestedAt, "cannot open '" + shown + "': no such file");
    return std::nullopt;
  }
  if (!fs::is_regular_file(st)) {
    error(requestedAt, "cannot read '" + shown + "': not a regular file");
    return std::nullopt;
  }
  auto src = std::make_unique<SourceFile>();
  std::FILE *fp = std::fopen(key.c_str(), "rb");
  if (!fp) {
    error(requestedAt, "cannot open '" + shown + "': " + std::strerror(errno));
    return std::nullopt;
  }
  auto size = fs::file_size(canonical, ec);
  if (!ec && size > kMaxFileSize) {
    std::fclose(fp);
    error(requestedAt, "cannot read '" + shown + "': larger than 4 GiB");
    return std::nullopt;
  }
  std::string text;
  if (!ec) text.reserve(static_cast<std::size_t>(size));
  char buf[1 << 16];
  bool readError = false;
  for (;;) {
    std::size_t n = std::fread(buf, 1, sizeof buf, fp);
    text.append(buf, n);
    if (text.size() > kMaxFileSize) break;
    if (n < sizeof buf) {
      readError = std::ferror(fp) != 0;
      break;
    }
  }
  std::fclose(fp);
  if (readError || text.size() > kMaxFileSize) {
    error(requestedAt, "cannot read '" + shown + "'" + (readError ? "" : ": larger than 4 GiB"));
    return std::nullopt;
  }
  src->text = circuit_.keepText(std::move(text));
  src->canonical = key;
  src->dir = canonical.parent_path();
  src->id = requestedAtPtr ? files_.add(displayName(canonical)) : requestedAt.file;
  if (src->text.size() >= 3 && std::memcmp(src->text.data(), "\xEF\xBB\xBF", 3) == 0) src->bodyStart = 3;
  auto idx = static_cast<std::uint32_t>(sources_.size());
  bool good = checkEncoding(*src);
  sources_.push_back(std::move(src));
  sourceByPath_.emplace(key, idx);
  if (!good) return std::nullopt;
  return idx;
}

std::size_t SpiceDeckReader::lastEndl(SourceFile &f) {
  if (f.endlScanned) return f.lastEndl;
  f.endlScanned = true;
  std::string_view t = f.text;
  for (std::size_t i = 0; i + 5 <= t.size(); ++i) {
    if (t[i] != '.' || !equalsIgnoreCase(t.substr(i, 5), ".endl")) continue;
    std::size_t b = i;
    while (b > 0 && (t[b - 1] == ' ' || t[b - 1] == '\t')) --b;
    if (b == 0 || t[b - 1] == '\n') f.lastEndl = i + 1;
  }
  return f.lastEndl;
}

// --- Pass 1 -------------------------------------------------------------------------------------------

bool SpiceDeckReader::tokenize(const SourceFile &f, const SpiceCard &card) {
  // A card of separators and a `$ ` comment only has no tokens: nothing to read.
  if (tokenizeSpiceCard(f.text, card, tokens_, arena_, tokenError_)) return !tokens_.empty();
  error({f.id, tokenError_.line, tokenError_.column}, tokenError_.message);
  return false;
}

void SpiceDeckReader::beginTopFile(std::uint32_t fi) {
  SourceFile &f = *sources_[fi];
  std::string_view t = f.text.substr(f.bodyStart);
  std::size_t nl = t.find('\n');
  std::string_view title = t.substr(0, nl);
  while (!title.empty() && (title.back() == '\r' || title.back() == ' ' || title.back() == '\t'))
    title.remove_suffix(1);
  while (!title.empty() && (title.front() == ' ' || title.front() == '\t')) title.remove_prefix(1);
  circuit_.title = std::string(title);
  if (!title.empty() && title.front() == '.' && title.size() > 1 && isIdentStart(title[1]))
    note({f.id, 1, 1}, "the first line of a deck is its title, so '" +
                           std::string(title.substr(0, std::min<std::size_t>(title.size(), 40))) +
                           "' is not read as a card");
  includeStack_.push_back({f.canonical, {}, f.id});
  std::size_t bodyOffset = nl == std::string_view::npos ? f.text.size() : f.bodyStart + nl + 1;
  processFile(fi, bodyOffset, 2, {}, nullptr);
  includeStack_.pop_back();
}

void SpiceDeckReader::processFile(std::uint32_t fi, std::size_t offset, std::uint32_t line,
                                  std::string_view section, bool *sectionFound) {
  SourceFile &f = *sources_[fi];
  SpiceCardScanner scanner(f.text, offset, line);
  const std::size_t defDepthAtStart = defStack_.size();
  const bool sectionMode = !section.empty();
  bool inSection = !sectionMode;
  SpiceCard card;
  runOpen_ = false;
  for (;;) {
    std::size_t offsetBefore = scanner.offset();
    std::uint32_t lineBefore = scanner.line();
    if (stop_ || !scanner.next(card)) break;
    if (card.orphanContinuation) {
      runOpen_ = false;
      if (inSection)
        error(loc(f, card.line, card.column), "continuation line '+' with no card before it");
      continue;
    }
    if (f.text[card.begin] != '.') {
      if (inSection) elementCard(fi, card, offsetBefore, lineBefore);
      else runOpen_ = false;
      continue;
    }
    runOpen_ = false;
    if (!tokenize(f, card)) continue;
    std::string_view kw = tokens_[0].text.substr(1);
    if (equalsIgnoreCase(kw, "lib")) {
      // `.lib NAME` with an `.endl` further down opens a section; `.lib FILE SECTION` reads one.
      // Inside a section being read, a one-word .lib can only be a whole-file include.
      bool opensSection = tokens_.size() == 2 && !(sectionMode && inSection) &&
                          lastEndl(f) > scanner.offset();
      if (opensSection) {
        if (sectionMode && !inSection && equalsIgnoreCase(stripQuotes(tokens_[1].text), section)) {
          inSection = true;
          if (sectionFound) *sectionFound = true;
        } else {
          scanner.skipPastLineStartingWith(".endl");
        }
        continue;
      }
      if (!inSection) continue;
      if (tokens_.size() < 2) {
        error(loc(f, tokens_[0]), "missing file name after .lib");
        continue;
      }
      SpiceToken pathTok = tokens_[1];
      if (tokens_.size() >= 3) {
        SpiceToken sectionTok = tokens_[2];
        includeFile(fi, pathTok, stripQuotes(sectionTok.text), &sectionTok);
      } else {
        includeFile(fi, pathTok, {}, nullptr); // a whole library file, as LTspice writes it
      }
      continue;
    }
    if (equalsIgnoreCase(kw, "endl")) {
      if (sectionMode && inSection) break;
      continue;
    }
    if (!inSection) continue;
    bool stopFile = false;
    dotCard(fi, scanner, defDepthAtStart, stopFile);
    if (stopFile) break;
  }
  while (defStack_.size() > defDepthAtStart) {
    Def *d = defStack_.back();
    error(d->where, "subcircuit " + std::string(d->name) + " has no .ends");
    defStack_.pop_back();
  }
  runOpen_ = false;
}

void SpiceDeckReader::elementCard(std::uint32_t fi, const SpiceCard &card, std::size_t offsetBefore,
                                  std::uint32_t lineBefore) {
  if (!defStack_.empty()) {
    runOpen_ = false;
    defStack_.back()->cards.push_back({fi, card.begin, card.end, card.line});
    return;
  }
  ++topCardCount_;
  if (lowerAscii(sources_[fi]->text[card.begin]) == 'x')
    topXCards_.push_back({fi, card.begin, card.end, card.line});
  if (runOpen_ && !topRuns_.empty() && topRuns_.back().file == fi) {
    ++topRuns_.back().count;
    return;
  }
  topRuns_.push_back({fi, static_cast<std::uint32_t>(offsetBefore), lineBefore, 1});
  runOpen_ = true;
}

void SpiceDeckReader::dotCard(std::uint32_t fi, SpiceCardScanner &scanner,
                              std::size_t defDepthAtStart, bool &stopFile) {
  SourceFile &f = *sources_[fi];
  std::string_view kw = tokens_[0].text.substr(1);
  SourceLocation at = loc(f, tokens_[0]);
  if (equalsIgnoreCase(kw, "end")) {
    stopFile = true;
    return;
  }
  if (equalsIgnoreCase(kw, "subckt") || equalsIgnoreCase(kw, "subcircuit") ||
      equalsIgnoreCase(kw, "macro")) {
    subcktCard(fi);
    return;
  }
  if (equalsIgnoreCase(kw, "ends") || equalsIgnoreCase(kw, "eom")) {
    if (defStack_.size() <= defDepthAtStart) {
      error(at, ".ends without .subckt");
      return;
    }
    Def *d = defStack_.back();
    if (tokens_.size() >= 2 && !equalsIgnoreCase(tokens_[1].text, d->name))
      note(loc(f, tokens_[1]), ".ends " + std::string(tokens_[1].text) +
                                   " closes subcircuit " + std::string(d->name));
    defStack_.pop_back();
    return;
  }
  if (equalsIgnoreCase(kw, "param") || equalsIgnoreCase(kw, "params")) {
    paramCard(fi, defStack_.empty() ? globalParams_ : defStack_.back()->params);
    return;
  }
  if (equalsIgnoreCase(kw, "func")) {
    funcCard(fi, 1);
    return;
  }
  if (equalsIgnoreCase(kw, "model")) {
    modelCard(fi);
    return;
  }
  if (equalsIgnoreCase(kw, "global")) {
    for (std::size_t i = 1; i < tokens_.size(); ++i) globals_.insert(tokens_[i].text);
    return;
  }
  if (equalsIgnoreCase(kw, "include") || equalsIgnoreCase(kw, "inc") ||
      equalsIgnoreCase(kw, "incl")) {
    if (tokens_.size() < 2) {
      error(at, "missing file name after ." + std::string(kw));
      return;
    }
    SpiceToken pathTok = tokens_[1];
    includeFile(fi, pathTok, {}, nullptr);
    return;
  }
  if (equalsIgnoreCase(kw, "title")) {
    if (includeStack_.size() == 1 && tokens_.size() >= 2)
      circuit_.title = std::string(tokenSpan(1, tokens_.size()));
    return;
  }
  if (const char *endWord = blockEnd(kw)) {
    if (!scanner.skipPastLineStartingWith(endWord))
      note(at, "." + std::string(kw) + " block has no " + endWord + "; the rest of the file is skipped");
    return;
  }
  if (isIgnoredDotCard(kw)) return;
  std::string key = toLower(kw);
  if (unknownDotCards_.insert(key).second)
    note(at, "unknown dot card ." + std::string(kw) + " skipped (later ones without a note)");
}

/// Text from token \p first to the end of token \p end-1: a view when they share a line, else a
/// blank-joined copy.
std::string_view SpiceDeckReader::tokenSpan(std::size_t first, std::size_t end) {
  if (first >= end) return {};
  const SpiceToken &a = tokens_[first], &b = tokens_[end - 1];
  if (a.line == b.line && a.text.data() <= b.text.data())
    return std::string_view(a.text.data(),
                            static_cast<std::size_t>(b.text.data() + b.text.size() - a.text.data()));
  std::string &s = arena_.emplace_back();
  for (std::size_t i = first; i < end; ++i) {
    if (i > first) s.push_back(' ');
    s.append(tokens_[i].text);
  }
  return s;
}

void SpiceDeckReader::includeFile(std::uint32_t fi, const SpiceToken &pathToken,
                                  std::string_view section, const SpiceToken *sectionToken) {
  SourceFile &f = *sources_[fi];
  SourceLocation at = loc(f, pathToken);
  std::string raw(stripQuotes(pathToken.text));
  if (raw.empty()) {
    error(at, "empty file name");
    return;
  }
  std::replace(raw.begin(), raw.end(), '\\', '/');
  fs::path p(raw);
  if (p.is_relative()) p = f.dir / p;
  std::error_code ec;
  fs::path canon = fs::weakly_canonical(p, ec);
  if (ec) canon = p.lexically_normal();
  if (!options_.allowOutsideRoot && !insideRoot(canon)) {
    error(at, "'" + raw + "' is outside the project root " + root_.generic_string() +
                  " (allow with --allow-outside-root)");
    return;
  }
  std::string sectionKey = toLower(section);
  std::string key = canon.string();
  for (std::size_t i = 0; i < includeStack_.size(); ++i) {
    if (includeStack_[i].canonical != key || includeStack_[i].section != sectionKey) continue;
    std::string chain;
    for (std::size_t k = i; k < includeStack_.size(); ++k) {
      chain += files_.name(includeStack_[k].display);
      if (!includeStack_[k].section.empty()) chain += " (" + includeStack_[k].section + ")";
      chain += " -> ";
    }
    chain += files_.name(includeStack_[i].display);
    if (!sectionKey.empty()) chain += " (" + sectionKey + ")";
    error(at, "include cycle: " + chain);
    return;
  }
  if (includeStack_.size() > options_.maxIncludeDepth) {
    error(at, "includes nested more than " + std::to_string(options_.maxIncludeDepth) +
                  " levels deep");
    return;
  }
  auto idx = loadFile(canon, raw, &at);
  if (!idx) return;
  SourceFile &inc = *sources_[*idx];
  includeStack_.push_back({key, sectionKey, inc.id});
  bool found = false;
  processFile(*idx, inc.bodyStart, 1, section, section.empty() ? nullptr : &found);
  includeStack_.pop_back();
  if (!section.empty() && !found && !stop_)
    error(sectionToken ? loc(f, *sectionToken) : at,
          "section " + std::string(section) + " not found in " + files_.name(inc.id));
}

void SpiceDeckReader::subcktCard(std::uint32_t fi) {
  SourceFile &f = *sources_[fi];
  if (tokens_.size() < 2) {
    error(loc(f, tokens_[0]), "missing subcircuit name after .subckt");
    // Still open a scope so that the matching .ends does not become a second error.
  }
  Def &d = defs_.emplace_back();
  d.name = tokens_.size() >= 2 ? tokens_[1].text : std::string_view("?");
  d.where = loc(f, tokens_.size() >= 2 ? tokens_[1] : tokens_[0]);
  d.parent = defStack_.empty() ? nullptr : defStack_.back();
  defStack_.push_back(&d);
  if (tokens_.size() < 2) return;
  if (!groupSpiceWords(tokens_, 2, words_, tokenError_)) {
    error({f.id, tokenError_.line, tokenError_.column}, tokenError_.message);
  } else {
    for (const SpiceWord &w : words_) {
      if (w.pair) {
        d.defaults.push_back({w.key.text, w.value.text, loc(f, w.key), loc(f, w.value)});
        continue;
      }
      if (equalsIgnoreCase(w.key.text, "optional:")) continue;
      for (const PortDecl &p : d.ports)
        if (equalsIgnoreCase(p.name, w.key.text)) {
          error(loc(f, w.key), "port " + std::string(w.key.text) + " appears twice in subcircuit " +
                                   std::string(d.name));
          break;
        }
      d.ports.push_back({w.key.text, loc(f, w.key)});
    }
  }
  CiMap<Def *> &scope = d.parent ? d.parent->children : topDefs_;
  auto [it, inserted] = scope.emplace(d.name, &d);
  if (!inserted) {
    Def *first = it->second;
    if (first->where.file == d.where.file && first->where.line == d.where.line) {
      // The same file read twice (two .include cards): keep the first, quietly.
      d.name = {};
      return;
    }
    error(d.where, "subcircuit " + std::string(d.name) + " is defined twice (first at " +
                       locText(first->where) + ")");
  }
}

void SpiceDeckReader::paramCard(std::uint32_t fi, std::vector<ParamDef> &out) {
  SourceFile &f = *sources_[fi];
  std::size_t n = tokens_.size();
  std::size_t i = 1;
  if (n < 2) {
    error(loc(f, tokens_[0]), "missing name=value after .param");
    return;
  }
  while (i < n) {
    const SpiceToken &name = tokens_[i];
    if (name.text.find('(') != std::string_view::npos) {
      funcCard(fi, i); // `.param f(x) = ...` defines a function
      return;
    }
    if (i + 1 >= n || tokens_[i + 1].text != "=") {
      error(loc(f, name), "expected name=value in .param, got '" + std::string(name.text) + "'");
      return;
    }
    if (!isIdentifier(name.text)) {
      error(loc(f, name), "'" + std::string(name.text) + "' is not a parameter name");
      return;
    }
    std::size_t j = i + 2, k = j;
    while (k < n && !(k + 1 < n && tokens_[k + 1].text == "=")) ++k;
    if (k == j) {
      error(loc(f, tokens_[i + 1]), "missing value after '" + std::string(name.text) + "='");
      return;
    }
    out.push_back({name.text, tokenSpan(j, k), loc(f, name), loc(f, tokens_[j])});
    i = k;
  }
}

void SpiceDeckReader::funcCard(std::uint32_t fi, std::size_t firstToken) {
  SourceFile &f = *sources_[fi];
  SourceLocation at = loc(f, tokens_[std::min(firstToken, tokens_.size() - 1)]);
  std::string_view text = tokenSpan(firstToken, tokens_.size());
  auto bad = [&](const char *why) {
    error(at, std::string("malformed function definition (") + why +
                  "); expected name(arg, ...) = {expression}");
  };
  std::size_t i = 0;
  while (i < text.size() && isIdentChar(text[i])) ++i;
  std::string_view name = text.substr(0, i);
  if (!isIdentifier(name)) return bad("no name");
  while (i < text.size() && (text[i] == ' ' || text[i] == '\t')) ++i;
  if (i >= text.size() || text[i] != '(') return bad("no argument list");
  std::size_t close = text.find(')', i);
  if (close == std::string_view::npos) return bad("no ')'");
  SpiceFunction fn;
  std::string_view args = text.substr(i + 1, close - i - 1);
  std::size_t a = 0;
  while (a < args.size()) {
    while (a < args.size() && (args[a] == ' ' || args[a] == ',' || args[a] == '\t')) ++a;
    std::size_t b = a;
    while (b < args.size() && isIdentChar(args[b])) ++b;
    if (b == a) {
      if (a < args.size()) return bad("bad argument name");
      break;
    }
    fn.args.push_back(args.substr(a, b - a));
    a = b;
  }
  std::string_view body = text.substr(close + 1);
  while (!body.empty() && (body.front() == ' ' || body.front() == '\t' || body.front() == '='))
    body.remove_prefix(1);
  while (!body.empty() && (body.back() == ' ' || body.back() == '\t')) body.remove_suffix(1);
  std::string_view inner;
  if (spiceExpressionBody(body, inner)) body = inner;
  if (body.empty()) return bad("no body");
  fn.body = body;
  functions_[name] = std::move(fn);
}

void SpiceDeckReader::modelCard(std::uint32_t fi) {
  SourceFile &f = *sources_[fi];
  if (tokens_.size() < 2) {
    error(loc(f, tokens_[0]), "missing model name after .model");
    return;
  }
  std::string_view name = tokens_[1].text;
  std::string_view type;
  if (std::size_t p = name.find('('); p != std::string_view::npos) name = name.substr(0, p);
  if (tokens_.size() >= 3) {
    type = tokens_[2].text;
    if (std::size_t p = type.find('('); p != std::string_view::npos) type = type.substr(0, p);
  }
  if (name.empty()) {
    error(loc(f, tokens_[1]), "missing model name after .model");
    return;
  }
  if (type.empty()) {
    error(loc(f, tokens_[1]), "missing model type after .model " + std::string(name));
    return;
  }
  models_.try_emplace(name, ModelInfo{name, type, loc(f, tokens_[1])});
}

// --- Pass 2: parsing element cards --------------------------------------------------------------

/// Rebuilds the card remembered as \p cr (column and continuation flag are recomputed).
SpiceCard cardOf(const SourceFile &f, const CardRef &cr) {
  SpiceCard card{cr.begin, cr.end, cr.line, 1, false, false};
  std::size_t ls = cr.begin;
  while (ls > 0 && f.text[ls - 1] != '\n') --ls;
  card.column = cr.begin - static_cast<std::uint32_t>(ls) + 1;
  card.continued = std::memchr(f.text.data() + cr.begin, '\n', cr.end - cr.begin) != nullptr;
  return card;
}

Def *SpiceDeckReader::findDef(std::string_view name, const Def *scope) const {
  for (const Def *s = scope; s; s = s->parent)
    if (auto it = s->children.find(name); it != s->children.end()) return it->second;
  auto it = topDefs_.find(name);
  return it == topDefs_.end() ? nullptr : it->second;
}

void SpiceDeckReader::classifyNodes(const Def *scope, std::vector<NodeRef> &nodes,
                                    std::size_t first) {
  for (std::size_t i = first; i < nodes.size(); ++i) {
    NodeRef &n = nodes[i];
    if (n.name == "0" || equalsIgnoreCase(n.name, "gnd")) {
      n.cls = NodeClass::Ground;
      continue;
    }
    if (!globals_.empty() && globals_.count(n.name)) {
      n.cls = NodeClass::Global;
      continue;
    }
    n.cls = NodeClass::Local;
    if (!scope) continue;
    for (std::size_t p = 0; p < scope->ports.size(); ++p)
      if (equalsIgnoreCase(scope->ports[p].name, n.name)) {
        n.cls = NodeClass::Port;
        n.port = static_cast<std::uint32_t>(p);
        break;
      }
  }
}

/// Reads the value word of an R, C, L or K card into \p rec; false when it is not a value.
bool SpiceDeckReader::parseValueWord(const SourceFile &f, const SpiceWord &w, Rec &rec) {
  std::string_view text = w.pair ? w.value.text : w.key.text;
  const SpiceToken &tok = w.pair ? w.value : w.key;
  rec.valueWhere = loc(f, tok);
  std::string_view body;
  if (spiceExpressionBody(text, body)) {
    rec.valueText = text;
    return true;
  }
  if (auto v = parseSpiceValue(text)) {
    rec.hasNumber = true;
    rec.value = v->value;
    if (v->rkm) noteRkm(rec.valueWhere, text, v->value, rec.name);
    return true;
  }
  if (isIdentifier(text)) {
    rec.valueText = text; // a parameter name without braces (HSPICE style)
    return true;
  }
  return false;
}

bool SpiceDeckReader::parseElement(const SourceFile &f, Def *scope, Rec &rec,
                                   std::vector<NodeRef> &nodes, std::vector<ParamPair> &pairs) {
  const SpiceToken &nameTok = tokens_[0];
  rec = Rec{};
  rec.name = nameTok.text;
  rec.where = loc(f, nameTok);
  char first = nameTok.text[0];
  if (!isIdentStart(first) || first == '_') {
    error(rec.where, "'" + std::string(nameTok.text.substr(0, 40)) +
                         "' is not a SPICE card (element names start with a letter)");
    return false;
  }
  rec.letter = lowerAscii(first);
  rec.kind = kindOfLetter(rec.letter);
  if (!groupSpiceWords(tokens_, 1, words_, tokenError_)) {
    error({f.id, tokenError_.line, tokenError_.column}, tokenError_.message);
    return false;
  }
  // Positional words (not name=value), in order.
  std::size_t pos[16];
  std::size_t posCount = 0;
  std::size_t totalPos = 0;
  for (std::size_t i = 0; i < words_.size(); ++i)
    if (!words_[i].pair) {
      if (posCount < 16) pos[posCount++] = i;
      ++totalPos;
    }
  auto P = [&](std::size_t k) -> const SpiceWord & { return words_[pos[k]]; };
  auto tooFew = [&](std::size_t want, const char *what) {
    error(rec.where, "too few nodes for " + std::string(kindWord(rec.kind)) + " " +
                         std::string(rec.name) + ": expected " + what + ", got " +
                         std::to_string(totalPos < want ? totalPos : want - 1));
    return false;
  };
  rec.nodeFirst = static_cast<std::uint32_t>(nodes.size());
  auto addNode = [&](const SpiceWord &w) { nodes.push_back({w.key.text, loc(f, w.key)}); };
  auto addNodes = [&](std::size_t count) {
    for (std::size_t k = 0; k < count; ++k) addNode(P(k));
  };
  auto findPair = [&](std::initializer_list<const char *> keys) -> const SpiceWord * {
    for (const SpiceWord &w : words_)
      if (w.pair)
        for (const char *k : keys)
          if (equalsIgnoreCase(w.key.text, k)) return &w;
    return nullptr;
  };
  auto modelAt = [&](std::size_t k) {
    rec.model = P(k).key.text;
  };
  auto looksNumeric = [](std::string_view t) {
    return !t.empty() && (isDigit(t[0]) || t[0] == '.' || t[0] == '-' || t[0] == '+');
  };

  switch (rec.letter) {
  case 'r':
  case 'c':
  case 'l': {
    if (posCount < 2) return tooFew(2, "2");
    addNodes(2);
    bool gotValue = false;
    if (posCount >= 3) {
      const SpiceWord &w = P(2);
      bool modelFirst = posCount >= 4 && !looksNumeric(w.key.text) && isIdentifier(w.key.text) &&
                        (isModel(w.key.text) || parseSpiceValue(P(3).key.text));
      if (modelFirst) {
        rec.model = w.key.text; // PSpice order: R1 a b RMOD 10k
        gotValue = parseValueWord(f, P(3), rec);
      } else if (isModel(w.key.text)) {
        rec.model = w.key.text; // semiconductor R/C: value may come from the model
        gotValue = true;
      } else {
        gotValue = parseValueWord(f, w, rec);
        if (!gotValue) {
          error(loc(f, w.key), "cannot read value '" + std::string(w.key.text) + "' of " +
                                   kindWord(rec.kind) + " " + std::string(rec.name));
          return false;
        }
        if (posCount >= 4 && looksNumeric(P(3).key.text) && parseSpiceValue(P(3).key.text)) {
          error(loc(f, P(3).key), "unexpected second value '" + std::string(P(3).key.text) +
                                      "' for " + std::string(rec.name) +
                                      " (a decimal comma? SPICE separates fields with commas)");
          return false;
        }
        if (posCount >= 4) rec.model = P(3).key.text;
      }
    }
    if (!gotValue) {
      const SpiceWord *w = rec.letter == 'r'   ? findPair({"r", "resistance", "value"})
                           : rec.letter == 'c' ? findPair({"c", "capacitance", "value"})
                                               : findPair({"l", "inductance", "value"});
      if (w) {
        gotValue = parseValueWord(f, *w, rec);
        if (!gotValue) {
          error(loc(f, w->value), "cannot read value '" + std::string(w->value.text) + "' of " +
                                      kindWord(rec.kind) + " " + std::string(rec.name));
          return false;
        }
      }
    }
    if (!gotValue) {
      error(rec.where, "missing value for " + std::string(kindWord(rec.kind)) + " " +
                           std::string(rec.name));
      return false;
    }
    break;
  }
  case 'k': {
    if (posCount < 3) {
      error(rec.where, "coupling " + std::string(rec.name) +
                           " needs two inductor names and a coupling factor");
      return false;
    }
    for (std::size_t k = 0; k + 1 < posCount; ++k) {
      const SpiceWord &w = P(k);
      if (lowerAscii(w.key.text[0]) != 'l') {
        error(loc(f, w.key), "coupling " + std::string(rec.name) + " names " +
                                 std::string(w.key.text) + ", which is not an inductor");
        return false;
      }
      addNode(w);
    }
    if (!parseValueWord(f, P(posCount - 1), rec)) {
      error(loc(f, P(posCount - 1).key), "cannot read coupling factor '" +
                                             std::string(P(posCount - 1).key.text) + "' of " +
                                             std::string(rec.name));
      return false;
    }
    break;
  }
  case 'd':
    if (posCount < 2) return tooFew(2, "2");
    if (posCount < 3) {
      error(rec.where, "missing model name for diode " + std::string(rec.name));
      return false;
    }
    addNodes(2);
    modelAt(2);
    break;
  case 'q': {
    // Q c b e [s] model: the fourth word is the model when a .model of that name exists or when
    // nothing follows it; otherwise it is the substrate node.
    if (posCount < 4) return tooFew(4, "3 or 4 plus a model name");
    bool threeNodes = isModel(P(3).key.text) || posCount == 4 || looksNumeric(P(4).key.text);
    addNodes(threeNodes ? 3 : 4);
    modelAt(threeNodes ? 3 : 4);
    break;
  }
  case 'm': {
    // M d g s b model; also d g s model (three-terminal power MOSFET models) when the fourth word
    // names a .model, and up to 7 nodes (SOI models) when a later word does.
    if (posCount < 4) return tooFew(5, "4 plus a model name");
    std::size_t modelPos = 0;
    for (std::size_t k = 3; k < posCount && k <= 7; ++k)
      if (isModel(P(k).key.text)) {
        modelPos = k;
        break;
      }
    if (modelPos == 0) {
      if (posCount < 5) return tooFew(5, "4 plus a model name");
      modelPos = 4;
    }
    addNodes(modelPos);
    modelAt(modelPos);
    break;
  }
  case 'j':
  case 'z':
    if (posCount < 4) return tooFew(4, "3 plus a model name");
    addNodes(3);
    modelAt(3);
    break;
  case 's':
    if (posCount < 5) return tooFew(5, "4 plus a model name");
    addNodes(4);
    modelAt(4);
    break;
  case 'w':
    if (posCount < 4) return tooFew(4, "2, a controlling source and a model name");
    addNodes(2);
    modelAt(3);
    break;
  case 't':
    if (posCount < 4) return tooFew(4, "4");
    addNodes(4);
    break;
  case 'v':
  case 'i': {
    if (posCount < 2) return tooFew(2, "2");
    addNodes(2);
    std::size_t k = 2;
    if (posCount > 3 && equalsIgnoreCase(P(2).key.text, "dc")) k = 3;
    if (posCount > k)
      if (auto v = parseSpiceValue(P(k).key.text)) {
        rec.hasNumber = true;
        rec.value = v->value; // DC value, kept for reference
      }
    break;
  }
  case 'e':
  case 'g':
  case 'f':
  case 'h': {
    if (posCount < 2) return tooFew(2, "2");
    bool poly = posCount >= 3 && startsWithIgnoreCase(P(2).key.text, "poly");
    if (poly) {
      if (rec.letter == 'f' || rec.letter == 'h') {
        addNodes(2);
        break;
      }
      // POLY(n): n pairs of controlling nodes follow.
      std::string_view spec = P(2).key.text.substr(4);
      std::size_t next = 3;
      if (spec.empty() && posCount >= 4) spec = P(3).key.text, next = 4;
      unsigned dims = 0;
      for (char c : spec)
        if (isDigit(c)) dims = dims * 10 + static_cast<unsigned>(c - '0');
      if (dims == 0 || dims > 6) {
        error(loc(f, P(2).key), "cannot read POLY dimension of " + std::string(rec.name));
        return false;
      }
      if (posCount < next + 2 * dims)
        return tooFew(next + 2 * dims, (std::to_string(2 + 2 * dims) + " for POLY(" +
                                        std::to_string(dims) + ")").c_str());
      addNodes(2);
      for (std::size_t k = 0; k < 2 * dims; ++k) addNode(P(next + k));
      break;
    }
    if (rec.letter == 'f' || rec.letter == 'h') {
      if (posCount < 3) return tooFew(3, "2 and a controlling source");
      addNodes(2);
      if (posCount >= 4)
        if (auto v = parseSpiceValue(P(3).key.text)) rec.hasNumber = true, rec.value = v->value;
      break;
    }
    // E/G: behavioural forms have only the two output nodes.
    bool behavioural = false;
    if (posCount >= 3) {
      static const char *const kForms[] = {"value", "table", "laplace", "freq", "chebyshev",
                                           "vol", "cur", "and", "or", "nand", "nor"};
      for (const char *k : kForms)
        if (startsWithIgnoreCase(P(2).key.text, k) &&
            (P(2).key.text.size() == std::strlen(k) || P(2).key.text[std::strlen(k)] == '{' ||
             P(2).key.text[std::strlen(k)] == '('))
          behavioural = true;
      std::string_view b;
      if (spiceExpressionBody(P(2).key.text, b)) behavioural = true;
    } else {
      behavioural = true; // only name=value forms (VALUE={...}, vol='...') after the nodes
      if (words_.size() == 2) return tooFew(4, "4");
    }
    if (behavioural) {
      addNodes(2);
      break;
    }
    if (posCount < 4) return tooFew(4, "4");
    addNodes(4);
    if (posCount >= 5)
      if (auto v = parseSpiceValue(P(4).key.text)) rec.hasNumber = true, rec.value = v->value;
    break;
  }
  case 'b':
    if (posCount < 2) return tooFew(2, "2");
    addNodes(2);
    break;
  case 'x': {
    if (totalPos < 1) {
      error(rec.where, "missing subcircuit name for " + std::string(rec.name));
      return false;
    }
    // All positional words but the last are nodes; the last is the subcircuit name; name=value
    // words are instance parameters.
    rec.pairFirst = static_cast<std::uint32_t>(pairs.size());
    std::size_t count = 0;
    for (const SpiceWord &w : words_) {
      if (w.pair) {
        pairs.push_back({w.key.text, w.value.text, loc(f, w.key)});
        ++rec.pairCount;
      } else if (++count == totalPos) {
        rec.model = w.key.text;
      } else {
        addNode(w);
      }
    }
    break;
  }
  default: {
    // Simulator-specific element: nodes are the positional words except the last (its model).
    rec.kind = ElementKind::Generic;
    if (unknownLetters_.insert(rec.letter).second)
      note(rec.where, "element " + std::string(rec.name) + ": letter '" +
                          std::string(1, static_cast<char>(rec.letter - 'a' + 'A')) +
                          "' is not a SPICE 3 element; such elements are kept as generic elements "
                          "with their node words as pins (later ones without a note)");
    std::size_t seen = 0;
    for (const SpiceWord &w : words_) {
      if (w.pair) continue;
      if (++seen == totalPos && totalPos > 1) {
        rec.model = w.key.text;
        break;
      }
      std::string_view t = w.key.text;
      while (!t.empty() && (t.front() == '[' || t.front() == '~' || t.front() == '(')) t.remove_prefix(1);
      if (!t.empty() && t.front() == '%') {
        std::size_t p = t.find('(');
        t = p == std::string_view::npos ? std::string_view() : t.substr(p + 1);
      }
      while (!t.empty() && (t.back() == ']' || t.back() == ')')) t.remove_suffix(1);
      if (t.empty() || equalsIgnoreCase(t, "null")) continue;
      SourceLocation wl = loc(f, w.key);
      wl.column += static_cast<std::uint32_t>(t.data() - w.key.text.data());
      nodes.push_back({t, wl});
    }
    break;
  }
  }
  rec.nodeCount = static_cast<std::uint32_t>(nodes.size() - rec.nodeFirst);
  if (rec.nodeCount > 60000) {
    error(rec.where, std::string(rec.name) + " has more than 60000 nodes");
    return false;
  }
  classifyNodes(scope, nodes, rec.nodeFirst);
  return true;
}

void SpiceDeckReader::resolveInstance(Rec &rec, std::uint32_t nodeCount, const Def *scope) {
  rec.target = findDef(rec.model, scope);
  if (!rec.target || rec.target->name.empty()) {
    rec.target = nullptr;
    rec.blackBox = true;
    note(rec.where, "subcircuit " + std::string(rec.model) + " is not defined; " +
                        std::string(rec.name) + " kept as a black box");
    return;
  }
  if (rec.target->ports.size() != nodeCount) {
    error(rec.where, std::string(rec.name) + " connects " + std::to_string(nodeCount) +
                         " node" + (nodeCount == 1 ? "" : "s") + " but subcircuit " +
                         std::string(rec.target->name) + " has " +
                         std::to_string(rec.target->ports.size()) + " port" +
                         (rec.target->ports.size() == 1 ? "" : "s") + " (defined at " +
                         locText(rec.target->where) + ")");
    rec.noExpand = true;
    rec.target = nullptr;
  }
}

void SpiceDeckReader::parseDef(Def &d) {
  if (d.parsed) return;
  d.parsed = true;
  std::vector<std::string> portNames;
  portNames.reserve(d.ports.size());
  for (const PortDecl &p : d.ports) portNames.emplace_back(p.name);
  d.pinNamesId = circuit_.internPinNames(portNames);
  d.nameId = circuit_.intern(d.name);
  CiMap<SourceLocation> local;
  for (const CardRef &cr : d.cards) {
    if (stop_) return;
    const SourceFile &f = *sources_[cr.file];
    SpiceCard card = cardOf(f, cr);
    if (!tokenize(f, card)) continue;
    Rec rec;
    std::size_t nodesBefore = d.nodes.size(), pairsBefore = d.pairs.size();
    if (!parseElement(f, &d, rec, d.nodes, d.pairs)) {
      d.nodes.resize(nodesBefore);
      d.pairs.resize(pairsBefore);
      continue;
    }
    auto [it, inserted] = local.try_emplace(rec.name, rec.where);
    if (!inserted) {
      error(rec.where, "duplicate element name " + std::string(rec.name) + " in subcircuit " +
                           std::string(d.name) + " (first at " + locText(it->second) + ")");
      d.nodes.resize(nodesBefore);
      d.pairs.resize(pairsBefore);
      continue;
    }
    if (rec.kind == ElementKind::Subcircuit) resolveInstance(rec, rec.nodeCount, &d);
    d.recs.push_back(rec);
  }
}

/// Counts the elements one instance of \p d flattens into and how deeply it nests instances,
/// from the definitions alone. Too deep a nesting would make the depth-first expansion run out
/// of stack, so such definitions are refused (and everything that instantiates them is not
/// expanded either).
void SpiceDeckReader::countDef(Def &d, unsigned depth) {
  if (d.state == 2) return;
  auto tooDeep = [&] {
    error(d.where, "subcircuit " + std::string(d.name) + " nests subcircuits more than " +
                       std::to_string(kMaxSubcircuitNesting) + " levels deep");
    d.tooDeep = true;
  };
  if (depth > kMaxSubcircuitNesting) {
    tooDeep();
    d.state = 2;
    return;
  }
  d.state = 1;
  counting_.push_back(&d);
  std::uint64_t total = 0;
  for (Rec &r : d.recs) {
    total += 1;
    if (r.kind != ElementKind::Subcircuit || !r.target || r.noExpand) continue;
    Def &t = *r.target;
    if (t.state == 1) {
      std::string chain;
      auto start = std::find(counting_.begin(), counting_.end(), &t);
      for (auto it = start; it != counting_.end(); ++it) chain += std::string((*it)->name) + " -> ";
      chain += std::string(t.name);
      error(r.where, "subcircuit recursion: " + chain + " (" + std::string(r.name) +
                         " instantiates " + std::string(t.name) + ")");
      r.noExpand = true;
      continue;
    }
    countDef(t, depth + 1);
    if (stop_) break;
    if (t.tooDeep) {
      d.tooDeep = true; // reported where the limit was crossed
      r.noExpand = true;
      continue;
    }
    d.depth = std::max(d.depth, t.depth);
    total = std::min(kCountCap, total + t.count);
  }
  d.count = total;
  d.depth += 1;
  if (d.depth > kMaxSubcircuitNesting && !d.tooDeep) tooDeep();
  d.state = 2;
  counting_.pop_back();
}

// --- Pass 2: emitting components --------------------------------------------------------------

StringId SpiceDeckReader::modelId(std::string_view name) {
  if (name.empty()) return 0;
  auto it = models_.find(name);
  if (it == models_.end()) return circuit_.intern(name);
  if (!it->second.interned) {
    it->second.id = circuit_.intern(it->second.name);
    it->second.interned = true;
  }
  return it->second.id;
}

std::uint32_t SpiceDeckReader::standardPins(ElementKind k, std::size_t n) {
  auto ki = static_cast<std::size_t>(k);
  if (ki < 32 && n < 9) {
    std::uint32_t &slot = pinCache_[ki][n];
    if (slot == 0 && n != 0) slot = circuit_.internPinNames(standardPinNames(k, n));
    return slot;
  }
  return circuit_.internPinNames(standardPinNames(k, n));
}

NetId SpiceDeckReader::resolveNet(const NodeRef &n, const Instance &inst) {
  switch (n.cls) {
  case NodeClass::Ground:
    if (groundNet_ == kNone) groundNet_ = circuit_.net("0", n.where);
    return groundNet_;
  case NodeClass::Global: {
    NetId id = circuit_.net(n.name, n.where);
    circuit_.markGlobal(id);
    return id;
  }
  case NodeClass::Port:
    if (n.port < inst.portNets.size()) return inst.portNets[n.port];
    break;
  case NodeClass::Local: break;
  }
  if (inst.prefix.empty()) {
    std::uint64_t h = hashIgnoreCase(n.name);
    NetId id = recentNets_.find(n.name, h);
    if (id == kNone) {
      id = circuit_.net(n.name, h, n.where, whereIs(n.name));
      recentNets_.put(n.name, h, id);
    }
    return id;
  }
  std::string full;
  full.reserve(inst.prefix.size() + 1 + n.name.size());
  full.append(inst.prefix).push_back('.');
  full.append(n.name);
  return circuit_.net(full, n.where);
}

bool SpiceDeckReader::evaluate(std::string_view text, SourceLocation where, const ParamEnv &env,
                               const std::string &what, bool once, double &out) {
  std::string_view body;
  bool delimited = spiceExpressionBody(text, body);
  if (!delimited) {
    if (auto v = parseSpiceValue(text)) {
      if (v->rkm) noteRkm(where, text, v->value, what);
      out = v->value;
      return true;
    }
    body = text;
  }
  SpiceExpressionResult r = evaluateSpiceExpression(body, env);
  if (r.ok) {
    out = r.value;
    return true;
  }
  if (r.alreadyReported) return false;
  SourceLocation at = where;
  at.column += static_cast<std::uint32_t>((delimited ? 1 : 0) + r.errorOffset);
  std::string shown(text.substr(0, 60));
  std::string message = r.error + " in " + what + " = " + shown;
  if (once) reportOnce(at, std::move(message));
  else error(at, std::move(message));
  return false;
}

void SpiceDeckReader::emit(const Rec &rec, const NodeRef *nodes, const ParamPair *pairs,
                           const Instance &inst) {
  if (stop_) return;
  const bool top = inst.prefix.empty();
  std::uint64_t need = 1;
  const bool expands =
      rec.kind == ElementKind::Subcircuit && rec.target && !rec.noExpand && !rec.target->tooDeep;
  if (expands) need += rec.target->count;
  if (emitted_ + need > options_.maxElements) {
    // Counts are exact, so this triggers at top level before anything of an instance is built.
    if (need > 1) {
      error(rec.where, std::string(rec.name) + " would add " + std::to_string(need) +
                           " elements (subcircuit " + std::string(rec.target->name) +
                           " flattened), over the limit of " +
                           std::to_string(options_.maxElements) + " elements");
    } else if (!capReported_) {
      capReported_ = true;
      error(rec.where, "the deck has more than " + std::to_string(options_.maxElements) +
                           " elements (the limit); the rest is not read");
    }
    return;
  }
  Component c;
  Circuit::NameIn nameIn = Circuit::NameIn::anywhere;
  if (top) {
    c.name = rec.name;
    nameIn = whereIs(rec.name);
    markTopName(rec.name);
  } else {
    nameScratch_.assign(inst.prefix).push_back('.');
    nameScratch_.append(rec.name);
    c.name = nameScratch_; // addComponent copies it
  }

  c.kind = rec.kind;
  c.where = rec.where;
  c.parent = inst.component;
  if (rec.hasNumber) {
    c.value = rec.value;
  } else if (!rec.valueText.empty()) {
    double v = 0.0;
    if (evaluate(rec.valueText, rec.valueWhere, *inst.env, "value of " + std::string(rec.name),
                 !top, v))
      c.value = v;
  }
  std::uint32_t pinNamesId = 0;
  netScratch_.clear();
  if (rec.kind == ElementKind::Coupling) {
    std::string names;
    for (std::uint32_t k = 0; k < rec.nodeCount; ++k) {
      if (k) names.push_back(' ');
      if (!top) names.append(inst.prefix).push_back('.');
      names.append(nodes[rec.nodeFirst + k].name);
    }
    c.model = circuit_.intern(names);
  } else {
    for (std::uint32_t k = 0; k < rec.nodeCount; ++k)
      netScratch_.push_back(resolveNet(nodes[rec.nodeFirst + k], inst));
    if (rec.kind == ElementKind::Subcircuit) {
      pinNamesId = rec.target ? rec.target->pinNamesId : standardPins(ElementKind::Generic, rec.nodeCount);
      c.model = rec.target ? rec.target->nameId : circuit_.intern(rec.model);
    } else {
      pinNamesId = standardPins(rec.kind, rec.nodeCount);
      c.model = modelId(rec.model);
    }
  }
  ComponentId id = circuit_.addComponent(std::move(c), netScratch_, pinNamesId, nameIn);
  ++emitted_;
  if (top) ++topComponents_;
  if (expands)
    expand(rec, pairs, inst, id, std::vector<NetId>(netScratch_.begin(), netScratch_.end()));
}

void SpiceDeckReader::expand(const Rec &rec, const ParamPair *pairs, const Instance &inst,
                             ComponentId xId, std::vector<NetId> &&portNets) {
  const Def &d = *rec.target;
  ParamEnv env(inst.env, *this);
  const bool top = inst.prefix.empty();
  for (std::uint32_t k = 0; k < rec.pairCount; ++k) {
    const ParamPair &p = pairs[rec.pairFirst + k];
    double v = 0.0;
    bool ok = evaluate(p.value, p.where, *inst.env,
                       "parameter " + std::string(p.name) + " of " + std::string(rec.name), !top, v);
    env.addValue(p.name, p.where, v, ok);
    bool declared = false;
    for (const ParamDef &dd : d.defaults) declared = declared || equalsIgnoreCase(dd.name, p.name);
    for (const ParamDef &dd : d.params) declared = declared || equalsIgnoreCase(dd.name, p.name);
    if (!declared && reported_.emplace(p.where.file, p.where.line, p.where.column).second)
      note(p.where, std::string(rec.name) + " sets parameter " + std::string(p.name) +
                        ", which subcircuit " + std::string(d.name) + " does not declare");
  }
  // Reverse order: of two body .param cards with one name, the later one counts.
  for (auto it = d.params.rbegin(); it != d.params.rend(); ++it) env.addIfAbsent(*it);
  for (const ParamDef &pd : d.defaults) env.addIfAbsent(pd);
  Instance child;
  child.prefix.reserve(inst.prefix.size() + 1 + rec.name.size());
  if (!top) child.prefix.append(inst.prefix).push_back('.');
  child.prefix.append(rec.name);
  child.portNets = std::move(portNets);
  child.env = &env;
  child.component = xId;
  for (const Rec &r : d.recs) {
    if (stop_) return;
    emit(r, d.nodes.data(), d.pairs.data(), child);
  }
}

void SpiceDeckReader::build() {
  if (stop_) return;
  const auto firstTopComponent = static_cast<ComponentId>(circuit_.components().size());
  for (const ParamDef &p : globalParams_) globalEnv_.addOrReplace(p);
  for (Def &d : defs_) {
    if (stop_) return;
    if (!d.name.empty()) parseDef(d);
  }
  for (Def &d : defs_) {
    if (stop_) return;
    if (!d.name.empty()) countDef(d, 0);
  }
  // Size estimate for reserve(): top-level cards plus the contents of top-level instances.
  std::uint64_t estimate = topCardCount_;
  for (const CardRef &cr : topXCards_) {
    const SourceFile &f = *sources_[cr.file];
    SpiceCard card = cardOf(f, cr);
    std::vector<SpiceToken> toks;
    SpiceTokenError err;
    if (!tokenizeSpiceCard(f.text, card, toks, arena_, err)) continue;
    std::vector<SpiceWord> words;
    if (!groupSpiceWords(toks, 1, words, err)) continue;
    std::string_view sub;
    for (const SpiceWord &w : words)
      if (!w.pair) sub = w.key.text;
    if (Def *t = findDef(sub, nullptr)) estimate = std::min(kCountCap, estimate + t->count);
  }
  std::size_t reserveCount = static_cast<std::size_t>(
      std::min<std::uint64_t>(estimate, options_.maxElements) + circuit_.components().size());
  circuit_.reserve(reserveCount, reserveCount * 3 / 5 + 16);
  {
    std::size_t bits = std::size_t{1} << 16;
    while (bits < 8 * topCardCount_) bits *= 2;
    nameBucketMask_ = bits - 1;
    namesSeen_.assign(bits / 64, 0);
    namesShared_.assign(bits / 64, 0);
  }

  Instance top;
  top.env = &globalEnv_;
  std::vector<NodeRef> nodes;
  std::vector<ParamPair> pairs;
  Rec rec;
  SpiceCard card;
  for (const CardRun &run : topRuns_) {
    const SourceFile &f = *sources_[run.file];
    scanning_ = f.text;
    SpiceCardScanner scanner(f.text, run.offset, run.line);
    for (std::uint32_t k = 0; k < run.count && !stop_; ++k) {
      if (!scanner.next(card)) break; // cannot happen: the same scan found these cards
      if (!tokenize(f, card)) continue;
      nodes.clear();
      pairs.clear();
      if (!parseElement(f, nullptr, rec, nodes, pairs)) continue;
      if (rec.kind == ElementKind::Subcircuit) resolveInstance(rec, rec.nodeCount, nullptr);
      emit(rec, nodes.data(), pairs.data(), top);
    }
  }
  scanning_ = {};
  flushTopNames();
  if (!stop_) reportDuplicateNames(firstTopComponent);
}

/// Duplicate top-level names. A hash table probed once per element would cost a million random
/// probes into memory bigger than the cache, and a sort of all names as much memory again as the
/// names' components: instead, two bit sets (eight bits per element, in cache; filled by
/// markTopName as elements are built) find the few elements whose hash bucket is shared, and only
/// those are sorted and compared by name.
void SpiceDeckReader::reportDuplicateNames(ComponentId first) {
  const auto &comps = circuit_.components();
  const std::size_t mask = nameBucketMask_;
  const std::vector<std::uint64_t> shared = std::move(namesShared_);
  namesSeen_ = {};
  std::vector<std::uint64_t> keys; // (upper 32 bits of the hash, component id)
  for (std::size_t i = first; i < comps.size(); ++i) {
    if (comps[i].parent != kNone) continue;
    const std::uint64_t h = hashIgnoreCase(comps[i].name);
    const std::size_t b = h & mask;
    if (shared[b >> 6] & (std::uint64_t{1} << (b & 63))) keys.push_back((h >> 32 << 32) | i);
  }
  std::sort(keys.begin(), keys.end());
  std::vector<std::pair<ComponentId, ComponentId>> duplicates; // (later, nearest earlier)
  for (std::size_t i = 0; i < keys.size(); ++i) {
    const std::uint64_t h = keys[i] >> 32;
    for (std::size_t j = i; j-- > 0 && (keys[j] >> 32) == h;) {
      const auto a = static_cast<ComponentId>(keys[j] & 0xffffffffu);
      const auto b = static_cast<ComponentId>(keys[i] & 0xffffffffu);
      if (!equalsIgnoreCase(comps[a].name, comps[b].name)) continue;
      duplicates.emplace_back(b, a);
      break;
    }
  }
  std::sort(duplicates.begin(), duplicates.end());
  for (auto [later, earlier] : duplicates) {
    const Component &a = comps[earlier], &b = comps[later];
    error(b.where, "duplicate element name " + std::string(b.name) + " (first at " + locText(a.where) + ")");
    if (stop_) return;
  }
}

// --- Entry points -------------------------------------------------------------------------------

bool SpiceDeckReader::readPath(const std::string &path) {
  std::error_code ec;
  fs::path p(path);
  fs::path canon = fs::weakly_canonical(p, ec);
  if (ec) canon = fs::absolute(p, ec).lexically_normal();
  setRoot(canon.parent_path());
  auto idx = loadFile(canon, displayName(canon), nullptr);
  if (!idx) return false;
  beginTopFile(*idx);
  build();
  return errors_ == 0 && !stop_;
}

bool SpiceDeckReader::readText(std::string_view text, const std::string &displayName) {
  std::error_code ec;
  setRoot(fs::current_path(ec));
  auto src = std::make_unique<SourceFile>();
  src->id = files_.add(displayName);
  src->dir = root_;
  if (text.size() > kMaxFileSize) {
    error({src->id, 0, 0}, "deck is larger than 4 GiB");
    return false;
  }
  src->text = circuit_.keepText(std::string(text));
  if (text.size() >= 3 && std::memcmp(text.data(), "\xEF\xBB\xBF", 3) == 0) src->bodyStart = 3;
  bool good = checkEncoding(*src);
  sources_.push_back(std::move(src));
  if (!good) return false;
  beginTopFile(0);
  build();
  return errors_ == 0 && !stop_;
}

} // namespace

bool readSpiceDeck(const std::string &path, const SpiceReadOptions &options, FileTable &files,
                   Circuit &out, InputDiagnostics &diags) {
  SpiceDeckReader reader(options, files, out, diags);
  return reader.readPath(path);
}

bool readSpiceText(std::string_view text, const std::string &displayName,
                   const SpiceReadOptions &options, FileTable &files, Circuit &out,
                   InputDiagnostics &diags) {
  SpiceDeckReader reader(options, files, out, diags);
  return reader.readText(text, displayName);
}

} // namespace gateloop
