/// \file
/// SPICE value tokens. Decimal scaling is folded into the exponent before conversion, so `2.2u`
/// gives exactly the double nearest to 2.2e-6 (what a literal in a test would give), not
/// 2.2 * 1e-6 with its extra rounding.
#include "netlist-io/spice_value.h"

#include "checker/core/text_util.h"

#include <charconv>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <system_error>

namespace gateloop {
namespace {

bool isDigit(char c) { return c >= '0' && c <= '9'; }

/// Letters may follow a value (`Ohm`, `F`, `V`); non-ASCII bytes count as letters so that unit
/// symbols such as the ohm sign are skipped like ASCII ones.
bool onlyLetters(std::string_view s) {
  for (char c : s) {
    auto u = static_cast<unsigned char>(c);
    if (u >= 0x80) continue;
    if (!((c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z'))) return false;
  }
  return true;
}

/// End of `[sign] digits [. digits] [e [sign] digits]` at the start of \p t, or 0 when there is
/// no digit. An `e` without digits after it is not an exponent (it is a trailing letter).
std::size_t scanNumber(std::string_view t) {
  std::size_t i = 0, n = t.size(), digits = 0;
  if (i < n && (t[i] == '+' || t[i] == '-')) ++i;
  while (i < n && isDigit(t[i])) ++i, ++digits;
  if (i < n && t[i] == '.') {
    ++i;
    while (i < n && isDigit(t[i])) ++i, ++digits;
  }
  if (digits == 0) return 0;
  if (i < n && (t[i] == 'e' || t[i] == 'E')) {
    std::size_t j = i + 1;
    if (j < n && (t[j] == '+' || t[j] == '-')) ++j;
    if (j < n && isDigit(t[j])) {
      while (j < n && isDigit(t[j])) ++j;
      i = j;
    }
  }
  return i;
}

/// Clinger's fast path: a mantissa of at most 15 significant digits is exact in a double, and so
/// is 10^k for k <= 22, so one multiplication or division gives the correctly rounded result,
/// the same double from_chars gives. Empty when the value needs the general conversion.
std::optional<double> composeExactly(std::string_view mantissa, long exp10) {
  static constexpr double kPow10[] = {1e0,  1e1,  1e2,  1e3,  1e4,  1e5,  1e6,  1e7,  1e8,  1e9,  1e10, 1e11,
                                      1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22};
  std::size_t i = 0;
  bool negative = false;
  if (i < mantissa.size() && (mantissa[i] == '+' || mantissa[i] == '-')) negative = mantissa[i++] == '-';
  std::uint64_t digits = 0;
  int significant = 0, fraction = 0;
  bool point = false, anyDigit = false;
  for (; i < mantissa.size(); ++i) {
    const char c = mantissa[i];
    if (c == '.') {
      if (point) return std::nullopt;
      point = true;
      continue;
    }
    if (!isDigit(c)) return std::nullopt;
    anyDigit = true;
    if (point) ++fraction;
    if (digits == 0 && c == '0') continue; // leading zeros are not significant
    if (++significant > 15) return std::nullopt;
    digits = digits * 10 + static_cast<std::uint64_t>(c - '0');
  }
  if (!anyDigit) return std::nullopt;
  const long e = exp10 - fraction;
  if (e < -22 || e > 22) return std::nullopt;
  double v = static_cast<double>(digits);
  v = e >= 0 ? v * kPow10[e] : v / kPow10[-e];
  return negative ? -v : v;
}

/// Converts `mantissa` (sign, digits, optional point) times 10^exp10, correctly rounded.
std::optional<double> compose(std::string_view mantissa, long exp10) {
  if (auto exact = composeExactly(mantissa, exp10)) return exact;
  constexpr std::size_t kMaxBuffer = 512;
  char buf[kMaxBuffer + 32];
  std::size_t len = 0;
  std::size_t start = (!mantissa.empty() && mantissa[0] == '+') ? 1 : 0;
  double v = 0.0;
  if (mantissa.size() - start > kMaxBuffer) {
    // Absurdly long digit strings: convert as written, then scale (one extra rounding is fine).
    auto r = std::from_chars(mantissa.data() + start, mantissa.data() + mantissa.size(), v);
    if (r.ec != std::errc()) return std::nullopt;
    v *= std::pow(10.0, static_cast<double>(exp10));
    if (!std::isfinite(v)) return std::nullopt;
    return v;
  }
  for (std::size_t i = start; i < mantissa.size(); ++i) buf[len++] = mantissa[i];
  buf[len++] = 'e';
  auto tc = std::to_chars(buf + len, buf + sizeof buf, exp10);
  len = static_cast<std::size_t>(tc.ptr - buf);
  auto r = std::from_chars(buf, buf + len, v);
  if (r.ec != std::errc() || r.ptr != buf + len) return std::nullopt;
  return v;
}

/// Splits a scanned number into mantissa and exponent and adds \p scaleExp.
std::optional<double> numberTimesPow10(std::string_view number, long scaleExp) {
  std::size_t e = number.find_first_of("eE");
  long exp10 = scaleExp;
  std::string_view mantissa = number;
  if (e != std::string_view::npos) {
    mantissa = number.substr(0, e);
    std::string_view ex = number.substr(e + 1);
    bool neg = false;
    if (!ex.empty() && (ex[0] == '+' || ex[0] == '-')) {
      neg = ex[0] == '-';
      ex.remove_prefix(1);
    }
    long x = 0;
    for (char c : ex) {
      x = x * 10 + (c - '0');
      if (x > 100000) break; // far beyond double range either way; from_chars reports it
    }
    exp10 += neg ? -x : x;
  }
  return compose(mantissa, exp10);
}

struct Scale {
  long exp10 = 0;
  bool mil = false;
  std::size_t length = 0;
};

/// The scale factor starting at \p i, if any. MEG and MIL are tested before M (SPICE 3 order).
std::optional<Scale> scaleAt(std::string_view t, std::size_t i, bool allowMicroSign) {
  if (i >= t.size()) return std::nullopt;
  auto at = [&](std::size_t k) { return k < t.size() ? lowerAscii(t[k]) : '\0'; };
  switch (at(i)) {
  case 't': return Scale{12, false, 1};
  case 'g': return Scale{9, false, 1};
  case 'k': return Scale{3, false, 1};
  case 'u': return Scale{-6, false, 1};
  case 'n': return Scale{-9, false, 1};
  case 'p': return Scale{-12, false, 1};
  case 'f': return Scale{-15, false, 1};
  case 'm':
    if (at(i + 1) == 'e' && at(i + 2) == 'g') return Scale{6, false, 3};
    if (at(i + 1) == 'i' && at(i + 2) == 'l') return Scale{0, true, 3};
    return Scale{-3, false, 1};
  default: break;
  }
  if (allowMicroSign && i + 1 < t.size()) {
    auto a = static_cast<unsigned char>(t[i]), b = static_cast<unsigned char>(t[i + 1]);
    if ((a == 0xC2 && b == 0xB5) || (a == 0xCE && b == 0xBC)) return Scale{-6, false, 2};
  }
  return std::nullopt;
}

std::optional<double> applyScale(std::string_view number, const std::optional<Scale> &scale) {
  if (!scale) return numberTimesPow10(number, 0);
  if (scale->mil) {
    auto v = numberTimesPow10(number, 0);
    if (!v) return std::nullopt;
    return *v * 25.4e-6;
  }
  return numberTimesPow10(number, scale->exp10);
}

long rkmExponent(char letter) {
  switch (lowerAscii(letter)) {
  case 'r': return 0;
  case 'k': return 3;
  case 'm': return 6;
  case 'g': return 9;
  case 't': return 12;
  case 'u': return -6;
  case 'n': return -9;
  case 'p': return -12;
  default: return 100; // not an RKM letter
  }
}

/// IEC 60062 RKM code: `4k7`, `4R7`, `2u2`, `R47`, optionally followed by letters.
std::optional<SpiceValue> parseRkm(std::string_view t) {
  std::size_t i = 0, n = t.size();
  bool negative = false;
  if (i < n && (t[i] == '+' || t[i] == '-')) negative = t[i++] == '-';
  char buf[600];
  std::size_t len = 0;
  if (negative) buf[len++] = '-';
  if (i < n && (t[i] == 'R' || t[i] == 'r') && i + 1 < n && isDigit(t[i + 1])) {
    std::size_t j = i + 1;
    while (j < n && isDigit(t[j])) ++j;
    if (!onlyLetters(t.substr(j)) || j - i > 500) return std::nullopt;
    buf[len++] = '0';
    buf[len++] = '.';
    for (std::size_t k = i + 1; k < j; ++k) buf[len++] = t[k];
    auto v = compose(std::string_view(buf, len), 0);
    if (!v) return std::nullopt;
    return SpiceValue{*v, true};
  }
  std::size_t j = i;
  while (j < n && isDigit(t[j])) ++j;
  if (j == i || j + 1 >= n || !isDigit(t[j + 1])) return std::nullopt;
  long exp10 = rkmExponent(t[j]);
  if (exp10 == 100) return std::nullopt;
  std::size_t k = j + 1;
  while (k < n && isDigit(t[k])) ++k;
  if (!onlyLetters(t.substr(k)) || k - i > 500) return std::nullopt;
  for (std::size_t p = i; p < j; ++p) buf[len++] = t[p];
  buf[len++] = '.';
  for (std::size_t p = j + 1; p < k; ++p) buf[len++] = t[p];
  auto v = compose(std::string_view(buf, len), exp10);
  if (!v) return std::nullopt;
  return SpiceValue{*v, true};
}

} // namespace

std::optional<SpiceValue> parseSpiceValue(std::string_view token) {
  if (auto rkm = parseRkm(token)) return rkm;
  std::size_t end = scanNumber(token);
  if (end == 0) return std::nullopt;
  auto scale = scaleAt(token, end, true);
  std::size_t rest = end + (scale ? scale->length : 0);
  if (!onlyLetters(token.substr(rest))) return std::nullopt;
  auto v = applyScale(token.substr(0, end), scale);
  if (!v) return std::nullopt;
  return SpiceValue{*v, false};
}

std::optional<double> parseSpice3Value(std::string_view token) {
  std::size_t end = scanNumber(token);
  if (end == 0) return std::nullopt;
  // SPICE 3 only looks at the first letter(s) after the number and drops everything after.
  auto scale = scaleAt(token, end, false);
  return applyScale(token.substr(0, end), scale);
}

} // namespace gateloop
