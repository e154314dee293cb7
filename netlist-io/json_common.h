/// \file
/// Shared machinery of the three JSON readers (parts, layout, project): loading a file, turning
/// nlohmann's parse errors into `FILE:LINE:COLUMN` diagnostics, field paths such as
/// `parts.Q-SW1.c_ies`, and typed field reads that report every problem instead of throwing.
/// Internal to netlist-io.
#pragma once

#include "checker/core/diagnostics.h"
#include "checker/core/quantity_text.h"
#include "checker/core/text_util.h"

#include <nlohmann/json.hpp>

#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace gateloop::jsonio {

/// Objects keep their file order (the project's `assign` is "first match in file order").
using Json = nlohmann::ordered_json;

/// Reads a whole file; on failure returns false and sets \p why to the system's reason.
bool readTextFile(const std::string &path, std::string &out, std::string &why);

/// Registers \p path in \p files, reads and parses it. Reports a missing file
/// (`FILE: error: cannot open file (...)`), a syntax error (`FILE:LINE:COLUMN: error: invalid
/// JSON: ...`) and duplicate keys (by field path). nullopt when nothing usable was read.
std::optional<Json> loadJsonFile(const std::string &path, FileTable &files, FileId &fileId,
                                 InputDiagnostics &diags);

/// The same for text in memory, already registered as \p fileId.
std::optional<Json> parseJsonText(std::string_view text, FileId fileId, InputDiagnostics &diags);

/// `parent.key`, or `parent["key"]` when the key has characters other than letters, digits,
/// '_' and '-' (net names like "X1.GATE", globs like "R*").
std::string childPath(const std::string &parent, std::string_view key);
/// `parent[i]`.
std::string indexPath(const std::string &parent, std::size_t index);

/// "Did you mean" candidates use the project-wide matcher.
using gateloop::closestMatch;

/// A short JSON rendering of \p v for messages (long values are cut with "...").
std::string brief(const Json &v);

enum class Sign { Any, Positive, NonNegative };

/// Typed reads of fields of one file. Every problem is reported to the diagnostics with the
/// field path; the read then yields nullopt and the caller carries on with the next field.
class FieldReader {
public:
  FieldReader(FileId file, InputDiagnostics &diags) : file_(file), diags_(diags) {}

  FileId file() const { return file_; }
  /// Number of errors this reader reported.
  std::size_t errors() const { return errors_; }

  void error(const std::string &path, std::string message);
  void warning(const std::string &path, std::string message);

  /// Reports fields of \p obj not in \p allowed, with a "did you mean" when one is close.
  void checkKeys(const Json &obj, const std::string &path, const std::vector<std::string> &allowed);
  /// Checks `schema` equals \p expected; reports a missing or different one.
  bool checkSchema(const Json &root, std::string_view expected);

  bool expectObject(const Json &v, const std::string &path);
  bool expectArray(const Json &v, const std::string &path);

  /// The field or nullptr; \p required reports `missing required field "key"` at \p path.
  const Json *field(const Json &obj, const std::string &path, std::string_view key, bool required = false);

  std::optional<double> quantity(const Json &v, const std::string &path, Dimension dim, Sign sign = Sign::Any);
  std::optional<double> quantityField(const Json &obj, const std::string &path, std::string_view key,
                                      Dimension dim, Sign sign = Sign::Any, bool required = false);

  template <class Q>
  std::optional<Q> typed(const Json &obj, const std::string &path, std::string_view key, Dimension dim,
                         Sign sign = Sign::Any, bool required = false) {
    auto v = quantityField(obj, path, key, dim, sign, required);
    if (!v) return std::nullopt;
    return Q(*v);
  }

  /// A string value; \p nonEmpty reports an empty string.
  std::optional<std::string> string(const Json &v, const std::string &path, bool nonEmpty = true);
  std::optional<std::string> stringField(const Json &obj, const std::string &path, std::string_view key,
                                         bool required = false, bool nonEmpty = true);
  std::optional<bool> boolField(const Json &obj, const std::string &path, std::string_view key);
  /// A list of non-empty strings; a single string is accepted as a list of one.
  std::vector<std::string> stringList(const Json &v, const std::string &path);

private:
  FileId file_;
  InputDiagnostics &diags_;
  std::size_t errors_ = 0;
};

} // namespace gateloop::jsonio
