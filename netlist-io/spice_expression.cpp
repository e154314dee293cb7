/// \file
/// Recursive-descent evaluator for SPICE expressions. Evaluates while parsing (expressions are
/// short and most are evaluated once per subcircuit instance), so there is no tree to allocate.
#include "netlist-io/spice_expression.h"

#include "checker/model/circuit.h"
#include "netlist-io/spice_value.h"

#include <cmath>
#include <numbers>

namespace gateloop {
namespace {

constexpr int kMaxNesting = 200;
constexpr int kMaxCallDepth = 64;

bool isDigit(char c) { return c >= '0' && c <= '9'; }
bool isIdentStart(char c) { return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || c == '_'; }
bool isIdentChar(char c) { return isIdentStart(c) || isDigit(c); }

/// Binds a user function's arguments, then defers to the calling scope.
class ArgumentScope : public SpiceExpressionScope {
public:
  ArgumentScope(const SpiceFunction &fn, const std::vector<double> &values,
                const SpiceExpressionScope &outer)
      : fn_(fn), values_(values), outer_(outer) {}
  SpiceLookup parameter(std::string_view name, double &value) const override {
    for (std::size_t i = 0; i < fn_.args.size(); ++i)
      if (equalsIgnoreCase(fn_.args[i], name)) {
        value = values_[i];
        return SpiceLookup::Found;
      }
    return outer_.parameter(name, value);
  }
  const SpiceFunction *function(std::string_view name) const override {
    return outer_.function(name);
  }

private:
  const SpiceFunction &fn_;
  const std::vector<double> &values_;
  const SpiceExpressionScope &outer_;
};

class Evaluator {
public:
  /// \p depth is the nesting already used by the callers (a user function's body continues the
  /// count of the expression that calls it), so the stack stays bounded across calls.
  Evaluator(std::string_view text, const SpiceExpressionScope &scope, int callDepth, int depth)
      : text_(text), scope_(scope), callDepth_(callDepth), depth_(depth) {}

  SpiceExpressionResult run() {
    skipSpace();
    if (pos_ >= text_.size()) {
      fail("empty expression", pos_);
      return finish(0.0);
    }
    double v = ternary();
    if (!failed_) {
      skipSpace();
      if (pos_ < text_.size()) fail("unexpected '" + std::string(1, text_[pos_]) + "' in expression", pos_);
    }
    if (!failed_ && !std::isfinite(v)) fail("expression does not give a finite number", 0);
    return finish(v);
  }

private:
  SpiceExpressionResult finish(double v) {
    SpiceExpressionResult r;
    r.ok = !failed_;
    r.value = failed_ ? 0.0 : v;
    r.error = error_;
    r.errorOffset = errorOffset_;
    r.alreadyReported = alreadyReported_;
    return r;
  }

  void fail(std::string message, std::size_t offset) {
    if (failed_) return;
    failed_ = true;
    error_ = std::move(message);
    errorOffset_ = offset;
  }

  void skipSpace() {
    while (pos_ < text_.size() && (text_[pos_] == ' ' || text_[pos_] == '\t' || text_[pos_] == '\r' ||
                                   text_[pos_] == '\n'))
      ++pos_;
  }
  bool peek(std::string_view s) {
    skipSpace();
    return text_.substr(pos_, s.size()) == s;
  }
  bool accept(std::string_view s) {
    if (!peek(s)) return false;
    pos_ += s.size();
    return true;
  }

  /// Guards every recursive descent step; deep nesting becomes an error, never a stack overflow.
  struct Nest {
    Evaluator &e;
    explicit Nest(Evaluator &ev) : e(ev) { ++e.depth_; }
    ~Nest() { --e.depth_; }
  };
  bool tooDeep() {
    if (depth_ <= kMaxNesting) return false;
    fail("expression nested too deeply", pos_);
    return true;
  }

  double ternary() {
    Nest n(*this);
    if (tooDeep()) return 0.0;
    double c = logicalOr();
    if (failed_ || !accept("?")) return c;
    double a = ternary();
    if (failed_) return 0.0;
    if (!accept(":")) {
      fail("expected ':' in conditional expression", pos_);
      return 0.0;
    }
    double b = ternary();
    return c != 0.0 ? a : b;
  }

  double logicalOr() {
    double a = logicalAnd();
    while (!failed_ && accept("||")) {
      double b = logicalAnd();
      a = (a != 0.0 || b != 0.0) ? 1.0 : 0.0;
    }
    return a;
  }

  double logicalAnd() {
    double a = comparison();
    while (!failed_ && accept("&&")) {
      double b = comparison();
      a = (a != 0.0 && b != 0.0) ? 1.0 : 0.0;
    }
    return a;
  }

  double comparison() {
    double a = additive();
    while (!failed_) {
      if (accept("==")) a = a == additive() ? 1.0 : 0.0;
      else if (accept("!=")) a = a != additive() ? 1.0 : 0.0;
      else if (accept("<=")) a = a <= additive() ? 1.0 : 0.0;
      else if (accept(">=")) a = a >= additive() ? 1.0 : 0.0;
      else if (accept("<")) a = a < additive() ? 1.0 : 0.0;
      else if (accept(">")) a = a > additive() ? 1.0 : 0.0;
      else break;
    }
    return a;
  }

  double additive() {
    double a = multiplicative();
    while (!failed_) {
      if (accept("+")) a += multiplicative();
      else if (accept("-")) a -= multiplicative();
      else break;
    }
    return a;
  }

  double multiplicative() {
    double a = unary();
    while (!failed_) {
      skipSpace();
      if (peek("**")) break; // power, handled below unary
      if (accept("*")) {
        a *= unary();
      } else if (peek("/")) {
        std::size_t at = pos_;
        accept("/");
        double b = unary();
        if (failed_) break;
        if (b == 0.0) {
          fail("division by zero", at);
          break;
        }
        a /= b;
      } else {
        break;
      }
    }
    return a;
  }

  double unary() {
    Nest n(*this);
    if (tooDeep()) return 0.0;
    if (accept("-")) return -unary();
    if (accept("+")) return unary();
    if (peek("!") && !peek("!=")) {
      accept("!");
      return unary() == 0.0 ? 1.0 : 0.0;
    }
    return power();
  }

  double power() {
    double base = primary();
    if (failed_) return 0.0;
    if (accept("^") || accept("**")) {
      double ex = unary(); // right-associative; allows 2^-1
      return std::pow(base, ex);
    }
    return base;
  }

  double primary() {
    Nest n(*this);
    if (tooDeep()) return 0.0;
    skipSpace();
    if (pos_ >= text_.size()) {
      fail("expression ends too early", pos_);
      return 0.0;
    }
    char c = text_[pos_];
    if (c == '(') {
      ++pos_;
      double v = ternary();
      if (failed_) return 0.0;
      if (!accept(")")) fail("expected ')'", pos_);
      return v;
    }
    if (isDigit(c) || (c == '.' && pos_ + 1 < text_.size() && isDigit(text_[pos_ + 1])))
      return number();
    if (isIdentStart(c)) return nameOrCall();
    fail("unexpected '" + std::string(1, c) + "' in expression", pos_);
    return 0.0;
  }

  double number() {
    std::size_t start = pos_;
    while (pos_ < text_.size()) {
      char c = text_[pos_];
      if (isIdentChar(c) || c == '.') {
        ++pos_;
      } else if ((c == '+' || c == '-') && (text_[pos_ - 1] == 'e' || text_[pos_ - 1] == 'E') &&
                 pos_ + 1 < text_.size() && isDigit(text_[pos_ + 1]) && looksLikeExponent(start)) {
        ++pos_;
      } else if (static_cast<unsigned char>(c) >= 0x80) {
        ++pos_; // micro sign, unit symbols
      } else {
        break;
      }
    }
    std::string_view tok = text_.substr(start, pos_ - start);
    auto v = parseSpiceValue(tok);
    if (!v) {
      fail("cannot read number '" + std::string(tok) + "'", start);
      return 0.0;
    }
    return v->value;
  }

  /// `1e-3`: the sign belongs to the number only when everything before the `e` is a plain
  /// decimal (so `2k-1` stays a subtraction).
  bool looksLikeExponent(std::size_t start) const {
    for (std::size_t i = start; i + 1 < pos_; ++i)
      if (!isDigit(text_[i]) && text_[i] != '.') return false;
    return true;
  }

  double nameOrCall() {
    std::size_t start = pos_;
    while (pos_ < text_.size() && isIdentChar(text_[pos_])) ++pos_;
    std::string_view name = text_.substr(start, pos_ - start);
    skipSpace();
    if (pos_ < text_.size() && text_[pos_] == '(') {
      ++pos_;
      std::vector<double> args;
      skipSpace();
      if (!accept(")")) {
        while (!failed_) {
          args.push_back(ternary());
          if (failed_) return 0.0;
          if (accept(",")) continue;
          if (accept(")")) break;
          fail("expected ',' or ')' in call of " + std::string(name), pos_);
          return 0.0;
        }
      }
      if (failed_) return 0.0;
      return call(name, args, start);
    }
    double v = 0.0;
    switch (scope_.parameter(name, v)) {
    case SpiceLookup::Found: return v;
    case SpiceLookup::Failed:
      alreadyReported_ = true;
      fail("parameter " + std::string(name) + " has no value", start);
      return 0.0;
    case SpiceLookup::Unknown: break;
    }
    if (equalsIgnoreCase(name, "pi")) return std::numbers::pi;
    fail("unknown parameter " + std::string(name), start);
    return 0.0;
  }

  bool arity(std::string_view name, const std::vector<double> &args, std::size_t n, std::size_t at) {
    if (args.size() == n) return true;
    fail("function " + std::string(name) + " takes " + std::to_string(n) + " argument" +
             (n == 1 ? "" : "s") + ", got " + std::to_string(args.size()),
         at);
    return false;
  }

  double call(std::string_view name, const std::vector<double> &a, std::size_t at) {
    if (const SpiceFunction *fn = scope_.function(name)) return callUser(name, *fn, a, at);
    std::string n = toLower(name);
    struct Unary {
      const char *name;
      double (*fn)(double);
    };
    static const Unary kUnary[] = {
        {"exp", [](double x) { return std::exp(x); }},
        {"sin", [](double x) { return std::sin(x); }},
        {"cos", [](double x) { return std::cos(x); }},
        {"tan", [](double x) { return std::tan(x); }},
        {"asin", [](double x) { return std::asin(x); }},
        {"acos", [](double x) { return std::acos(x); }},
        {"atan", [](double x) { return std::atan(x); }},
        {"sinh", [](double x) { return std::sinh(x); }},
        {"cosh", [](double x) { return std::cosh(x); }},
        {"tanh", [](double x) { return std::tanh(x); }},
        {"abs", [](double x) { return std::fabs(x); }},
        {"floor", [](double x) { return std::floor(x); }},
        {"ceil", [](double x) { return std::ceil(x); }},
        {"int", [](double x) { return std::trunc(x); }},
        {"round", [](double x) { return std::round(x); }},
        {"sgn", [](double x) { return x > 0 ? 1.0 : (x < 0 ? -1.0 : 0.0); }},
        {"sign", [](double x) { return x > 0 ? 1.0 : (x < 0 ? -1.0 : 0.0); }},
    };
    for (const auto &u : kUnary)
      if (n == u.name) return arity(name, a, 1, at) ? u.fn(a[0]) : 0.0;
    if (n == "sqrt") {
      if (!arity(name, a, 1, at)) return 0.0;
      if (a[0] < 0) {
        fail("sqrt of a negative number", at);
        return 0.0;
      }
      return std::sqrt(a[0]);
    }
    if (n == "log" || n == "ln" || n == "log10") {
      if (!arity(name, a, 1, at)) return 0.0;
      if (a[0] <= 0) {
        fail(n + " of a number that is not positive", at);
        return 0.0;
      }
      return n == "log10" ? std::log10(a[0]) : std::log(a[0]);
    }
    if (n == "min" || n == "max") {
      if (a.size() < 2) {
        fail("function " + std::string(name) + " takes at least 2 arguments, got " +
                 std::to_string(a.size()),
             at);
        return 0.0;
      }
      double r = a[0];
      for (double x : a) r = n == "min" ? std::fmin(r, x) : std::fmax(r, x);
      return r;
    }
    if (n == "pow") return arity(name, a, 2, at) ? std::pow(a[0], a[1]) : 0.0;
    if (n == "pwr")
      return arity(name, a, 2, at) ? std::copysign(std::pow(std::fabs(a[0]), a[1]), a[0]) : 0.0;
    if (n == "atan2") return arity(name, a, 2, at) ? std::atan2(a[0], a[1]) : 0.0;
    if (n == "limit") return arity(name, a, 3, at) ? std::fmin(std::fmax(a[0], a[1]), a[2]) : 0.0;
    if (n == "if") return arity(name, a, 3, at) ? (a[0] != 0.0 ? a[1] : a[2]) : 0.0;
    fail("unknown function " + std::string(name), at);
    return 0.0;
  }

  double callUser(std::string_view name, const SpiceFunction &fn, const std::vector<double> &a,
                  std::size_t at) {
    if (!arity(name, a, fn.args.size(), at)) return 0.0;
    if (callDepth_ >= kMaxCallDepth) {
      fail("function " + std::string(name) + " calls itself too deeply (recursive .func?)", at);
      return 0.0;
    }
    ArgumentScope inner(fn, a, scope_);
    Evaluator body(fn.body, inner, callDepth_ + 1, depth_);
    SpiceExpressionResult r = body.run();
    if (!r.ok) {
      alreadyReported_ = r.alreadyReported;
      fail("in function " + std::string(name) + ": " + r.error, at);
      return 0.0;
    }
    return r.value;
  }

  std::string_view text_;
  const SpiceExpressionScope &scope_;
  int callDepth_ = 0;
  std::size_t pos_ = 0;
  int depth_ = 0;
  bool failed_ = false;
  bool alreadyReported_ = false;
  std::string error_;
  std::size_t errorOffset_ = 0;
};

} // namespace

SpiceExpressionResult evaluateSpiceExpression(std::string_view text,
                                              const SpiceExpressionScope &scope) {
  return Evaluator(text, scope, 0, 0).run();
}

bool spiceExpressionBody(std::string_view token, std::string_view &body) {
  if (token.size() >= 2 && ((token.front() == '{' && token.back() == '}') ||
                            (token.front() == '\'' && token.back() == '\''))) {
    body = token.substr(1, token.size() - 2);
    return true;
  }
  body = {};
  return false;
}

} // namespace gateloop
