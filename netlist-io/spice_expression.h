/// \file
/// Arithmetic expressions in SPICE decks: `{expr}` and `'expr'` values, `.param` right-hand
/// sides and `.func` bodies. Internal to netlist-io (the SPICE reader), public for its tests.
///
/// Grammar, loosest binding first: `c ? a : b`; `||`; `&&`; `== != < <= > >=`; `+ -`; `* /`;
/// unary `- + !`; `^` and `**` (right-associative, so `-2^2` = -4 and `2^3^2` = 512); numbers in
/// SPICE value syntax (`4.7k`, `1e-9`, `4k7`), names, calls and parentheses.
/// Built-in functions (case-insensitive): sqrt exp log (natural) ln log10 abs min max pow pwr
/// sin cos tan asin acos atan atan2 sinh cosh tanh floor ceil int round sgn sign limit if;
/// constant `pi`. Parameters and user functions come from a SpiceExpressionScope.
#pragma once

#include <cstddef>
#include <string>
#include <string_view>
#include <vector>

namespace gateloop {

/// A user function from `.func name(a, b) = {body}` (or `.param name(a) = body`).
struct SpiceFunction {
  std::vector<std::string_view> args;
  std::string_view body; ///< without `{}` or quotes
};

/// Outcome of looking up a parameter name.
enum class SpiceLookup {
  Found,   ///< value set
  Unknown, ///< no such parameter in scope
  Failed,  ///< known, but its own definition could not be evaluated (already reported)
};

/// What an expression can see: parameters (scoped by the caller) and user functions.
class SpiceExpressionScope {
public:
  virtual ~SpiceExpressionScope() = default;
  /// Looks up parameter \p name (case-insensitive).
  virtual SpiceLookup parameter(std::string_view name, double &value) const = 0;
  /// The user function called \p name (case-insensitive), or nullptr.
  virtual const SpiceFunction *function(std::string_view name) const {
    (void)name;
    return nullptr;
  }
};

/// Result of evaluating one expression.
struct SpiceExpressionResult {
  double value = 0.0;
  bool ok = false;
  /// The failure comes from a parameter whose own definition failed and was reported there;
  /// callers should not report it again.
  bool alreadyReported = false;
  std::string error;        ///< lowercase message, e.g. "division by zero"
  std::size_t errorOffset = 0; ///< byte offset into the evaluated text
};

/// Evaluates \p text (without delimiters). Never throws; nesting deeper than a few hundred levels
/// and user-function recursion are reported as errors instead of exhausting the stack. A result
/// that is not finite (overflow, sqrt of a negative number) is an error too.
SpiceExpressionResult evaluateSpiceExpression(std::string_view text,
                                              const SpiceExpressionScope &scope);

/// When \p token is a delimited expression (`{...}` or `'...'`), its body; otherwise empty and
/// false.
bool spiceExpressionBody(std::string_view token, std::string_view &body);

} // namespace gateloop
