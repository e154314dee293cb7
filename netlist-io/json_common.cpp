/// \file
/// Shared machinery of the JSON readers.

#include "netlist-io/json_common.h"

#include "checker/core/source_location.h"

#include <algorithm>
#include <cerrno>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <set>
#include <sstream>

namespace gateloop::jsonio {

namespace {

constexpr int kMaxDepth = 100;
struct TooDeep {};

/// Tracks the path of the value being parsed so duplicate keys can be reported by field path
/// (nlohmann would otherwise keep one of the two values without a word).
class DuplicateKeyFinder {
public:
  DuplicateKeyFinder(FileId file, InputDiagnostics &diags) : file_(file), diags_(diags) {}

  bool operator()(int depth, Json::parse_event_t event, Json &parsed) {
    // Printing and converting values recurses; refuse nesting no real input file has.
    if (depth > kMaxDepth) throw TooDeep{};
    switch (event) {
    case Json::parse_event_t::object_start:
    case Json::parse_event_t::array_start: {
      Frame f;
      f.array = event == Json::parse_event_t::array_start;
      f.path = elementPath();
      stack_.push_back(std::move(f));
      break;
    }
    case Json::parse_event_t::key: {
      Frame &top = stack_.back();
      top.lastKey = parsed.get<std::string>();
      if (!top.keys.insert(top.lastKey).second)
        diags_.fieldError({file_, 0, 0}, childPath(top.path, top.lastKey),
                          "duplicate key \"" + top.lastKey + "\" (only one value can be used)");
      break;
    }
    case Json::parse_event_t::value:
      if (!stack_.empty() && stack_.back().array) ++stack_.back().index;
      break;
    case Json::parse_event_t::object_end:
    case Json::parse_event_t::array_end:
      stack_.pop_back();
      if (!stack_.empty() && stack_.back().array) ++stack_.back().index;
      break;
    }
    return true;
  }

private:
  struct Frame {
    bool array = false;
    std::size_t index = 0;
    std::string path;
    std::string lastKey;
    std::set<std::string> keys;
  };

  std::string elementPath() const {
    if (stack_.empty()) return {};
    const Frame &top = stack_.back();
    return top.array ? indexPath(top.path, top.index) : childPath(top.path, top.lastKey);
  }

  FileId file_;
  InputDiagnostics &diags_;
  std::vector<Frame> stack_;
};

/// nlohmann's what() is "[json.exception.parse_error.101] parse error at line 1, column 7:
/// syntax error while parsing value - ..."; the location is ours to add, so keep only the
/// explanation.
std::string parseErrorDetail(const std::string &what) {
  auto col = what.find("column ");
  if (col != std::string::npos) {
    auto colon = what.find(": ", col);
    if (colon != std::string::npos) return what.substr(colon + 2);
  }
  auto bracket = what.find("] ");
  return bracket == std::string::npos ? what : what.substr(bracket + 2);
}

} // namespace

bool readTextFile(const std::string &path, std::string &out, std::string &why) {
  std::error_code ec;
  if (std::filesystem::is_directory(path, ec)) {
    why = "it is a folder";
    return false;
  }
  std::ifstream in(path, std::ios::binary);
  if (!in) {
    why = std::strerror(errno);
    return false;
  }
  std::ostringstream ss;
  ss << in.rdbuf();
  if (in.bad()) {
    why = "read error";
    return false;
  }
  out = std::move(ss).str();
  return true;
}

std::optional<Json> loadJsonFile(const std::string &path, FileTable &files, FileId &fileId,
                                 InputDiagnostics &diags) {
  fileId = files.add(path);
  std::string text, why;
  if (!readTextFile(path, text, why)) {
    diags.error({fileId, 0, 0}, "cannot open file (" + why + ")");
    return std::nullopt;
  }
  return parseJsonText(text, fileId, diags);
}

std::optional<Json> parseJsonText(std::string_view text, FileId fileId, InputDiagnostics &diags) {
  DuplicateKeyFinder dup(fileId, diags);
  try {
    // Comments are allowed: engineers annotate why a value was chosen, and strict JSON has no way.
    return Json::parse(text.begin(), text.end(), std::ref(dup), /*allow_exceptions=*/true,
                       /*ignore_comments=*/true);
  } catch (const Json::parse_error &e) {
    // e.byte is 1-based and points one past the character that failed; clamp the end-of-input
    // case onto the last character so the column is one an editor can show.
    std::size_t offset = e.byte == 0 ? 0 : e.byte - 1;
    if (offset >= text.size()) offset = text.empty() ? 0 : text.size() - 1;
    LineIndex index(text);
    diags.error(index.locate(fileId, offset), "invalid JSON: " + parseErrorDetail(e.what()));
  } catch (const TooDeep &) {
    diags.error({fileId, 0, 0}, "invalid JSON: nested deeper than " + std::to_string(kMaxDepth) + " levels");
  } catch (const Json::exception &e) {
    diags.error({fileId, 0, 0}, std::string("invalid JSON: ") + e.what());
  }
  return std::nullopt;
}

std::string childPath(const std::string &parent, std::string_view key) {
  bool simple = !key.empty() && std::all_of(key.begin(), key.end(), [](char c) {
    return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9') || c == '_' ||
           c == '-';
  });
  if (simple) return parent.empty() ? std::string(key) : parent + "." + std::string(key);
  return parent + "[" + Json(std::string(key)).dump(-1, ' ', false, Json::error_handler_t::replace) + "]";
}

std::string indexPath(const std::string &parent, std::size_t index) {
  return parent + "[" + std::to_string(index) + "]";
}


std::string brief(const Json &v) {
  std::string s = v.dump(-1, ' ', false, Json::error_handler_t::replace);
  constexpr std::size_t kMax = 60;
  if (s.size() > kMax) s = s.substr(0, kMax - 3) + "...";
  return s;
}

void FieldReader::error(const std::string &path, std::string message) {
  ++errors_;
  diags_.fieldError({file_, 0, 0}, path, std::move(message));
}

void FieldReader::warning(const std::string &path, std::string message) {
  diags_.add({Severity::Warning, {file_, 0, 0}, path, std::move(message)});
}

void FieldReader::checkKeys(const Json &obj, const std::string &path, const std::vector<std::string> &allowed) {
  if (!obj.is_object()) return;
  for (auto it = obj.begin(); it != obj.end(); ++it) {
    if (std::find(allowed.begin(), allowed.end(), it.key()) != allowed.end()) continue;
    std::string msg = "unknown field";
    if (auto near = closestMatch(it.key(), allowed)) msg += "; did you mean \"" + *near + "\"?";
    error(childPath(path, it.key()), std::move(msg));
  }
}

bool FieldReader::checkSchema(const Json &root, std::string_view expected) {
  const Json *s = field(root, "", "schema", true);
  if (!s) return false;
  if (s->is_string() && s->get_ref<const std::string &>() == expected) return true;
  error("schema", "expected \"" + std::string(expected) + "\", got " + brief(*s));
  return false;
}

bool FieldReader::expectObject(const Json &v, const std::string &path) {
  if (v.is_object()) return true;
  error(path, "expected an object, got " + brief(v));
  return false;
}

bool FieldReader::expectArray(const Json &v, const std::string &path) {
  if (v.is_array()) return true;
  error(path, "expected a list, got " + brief(v));
  return false;
}

const Json *FieldReader::field(const Json &obj, const std::string &path, std::string_view key, bool required) {
  if (obj.is_object()) {
    auto it = obj.find(std::string(key));
    if (it != obj.end()) return &*it;
  }
  if (required) error(path, "missing required field \"" + std::string(key) + "\"");
  return nullptr;
}

std::optional<double> FieldReader::quantity(const Json &v, const std::string &path, Dimension dim, Sign sign) {
  std::string why;
  // parseQuantityJson takes the library's default json type; the scalar copy is cheap.
  auto value = parseQuantityJson(nlohmann::json(v), dim, &why);
  if (!value) {
    error(path, std::move(why));
    return std::nullopt;
  }
  if (sign == Sign::Positive && !(*value > 0)) {
    error(path, "must be greater than zero, got " + brief(v));
    return std::nullopt;
  }
  if (sign == Sign::NonNegative && *value < 0) {
    error(path, "must not be negative, got " + brief(v));
    return std::nullopt;
  }
  return value;
}

std::optional<double> FieldReader::quantityField(const Json &obj, const std::string &path, std::string_view key,
                                                 Dimension dim, Sign sign, bool required) {
  const Json *v = field(obj, path, key, required);
  if (!v) return std::nullopt;
  return quantity(*v, childPath(path, key), dim, sign);
}

std::optional<std::string> FieldReader::string(const Json &v, const std::string &path, bool nonEmpty) {
  if (!v.is_string()) {
    error(path, "expected a string, got " + brief(v));
    return std::nullopt;
  }
  const auto &s = v.get_ref<const std::string &>();
  if (nonEmpty && s.find_first_not_of(" \t\r\n") == std::string::npos) {
    error(path, "must not be empty");
    return std::nullopt;
  }
  return s;
}

std::optional<std::string> FieldReader::stringField(const Json &obj, const std::string &path, std::string_view key,
                                                    bool required, bool nonEmpty) {
  const Json *v = field(obj, path, key, required);
  if (!v) return std::nullopt;
  return string(*v, childPath(path, key), nonEmpty);
}

std::optional<bool> FieldReader::boolField(const Json &obj, const std::string &path, std::string_view key) {
  const Json *v = field(obj, path, key);
  if (!v) return std::nullopt;
  if (!v->is_boolean()) {
    error(childPath(path, key), "expected true or false, got " + brief(*v));
    return std::nullopt;
  }
  return v->get<bool>();
}

std::vector<std::string> FieldReader::stringList(const Json &v, const std::string &path) {
  std::vector<std::string> out;
  if (v.is_string()) {
    if (auto s = string(v, path)) out.push_back(*s);
    return out;
  }
  if (!v.is_array()) {
    error(path, "expected a list of strings, got " + brief(v));
    return out;
  }
  for (std::size_t i = 0; i < v.size(); ++i)
    if (auto s = string(v[i], indexPath(path, i))) out.push_back(*s);
  return out;
}

} // namespace gateloop::jsonio
