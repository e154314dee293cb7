// Tests of the SPICE value reader (netlist-io/spice_value.h) and the expression evaluator
// (netlist-io/spice_expression.h).
#include "netlist-io/spice_expression.h"
#include "netlist-io/spice_value.h"

#include <gtest/gtest.h>

#include <charconv>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <map>
#include <string>

using namespace gateloop;

namespace {

double valueOf(std::string_view token) {
  auto v = parseSpiceValue(token);
  EXPECT_TRUE(v.has_value()) << token;
  return v ? v->value : std::nan("");
}

bool rkmOf(std::string_view token) {
  auto v = parseSpiceValue(token);
  EXPECT_TRUE(v.has_value()) << token;
  return v && v->rkm;
}

// physics.md section 6: "Compare with rel 1e-12".
#define EXPECT_REL(actual, expected)                                                               \
  EXPECT_NEAR((actual), (expected), std::fabs(expected) * 1e-12) << #actual

} // namespace

// --- Check values of physics.md section 6 (SPICE number syntax) -----------------------------------

TEST(SpiceValue, ScaleFactorsFromSpice3Manual) {
  // physics.md section 6 check values; Berkeley SPICE3 manual scale-factor table.
  EXPECT_REL(valueOf("10MEG"), 1e7);   // physics.md 6: MEG = 1e6
  EXPECT_REL(valueOf("10Meg"), 1e7);   // physics.md 6: case-insensitive
  EXPECT_REL(valueOf("10meg"), 1e7);   // Berkeley SPICE3 manual scale-factor table
  EXPECT_REL(valueOf("10M"), 0.01);    // physics.md 6: M = milli
  EXPECT_REL(valueOf("10m"), 0.01);    // Berkeley SPICE3 manual scale-factor table
  EXPECT_REL(valueOf("1T"), 1e12);     // physics.md 6
  EXPECT_REL(valueOf("3G"), 3e9);      // Berkeley SPICE3 manual scale-factor table
  EXPECT_REL(valueOf("2.2u"), 2.2e-6); // physics.md 6
  EXPECT_REL(valueOf("2.2UF"), 2.2e-6); // physics.md 6: letters after the scale ignored
  EXPECT_REL(valueOf("4.7n"), 4.7e-9); // Berkeley SPICE3 manual scale-factor table
  EXPECT_REL(valueOf(".5p"), 5e-13);   // physics.md 6
  EXPECT_REL(valueOf("1F"), 1e-15);    // physics.md 6: F = femto, not farad
  EXPECT_REL(valueOf("1MIL"), 2.54e-5); // physics.md 6: MIL = 25.4e-6 (tested before M)
  EXPECT_REL(valueOf("-3.3n"), -3.3e-9); // physics.md 6
  EXPECT_REL(valueOf("1e-9"), 1e-9);   // physics.md 6
  EXPECT_REL(valueOf("2.65e3"), 2650.0); // Berkeley SPICE3 manual: exponent form
  EXPECT_REL(valueOf("1e3k"), 1e6);    // physics.md 6: exponent and scale combine
  EXPECT_REL(valueOf("+5"), 5.0);      // Berkeley SPICE3 manual: optional sign
  EXPECT_REL(valueOf("5."), 5.0);      // Berkeley SPICE3 manual: decimal without fraction
}

TEST(SpiceValue, TrailingLettersIgnored) {
  EXPECT_REL(valueOf("4.7kOhm"), 4700.0); // physics.md 6 / spec 4.1
  EXPECT_REL(valueOf("10V"), 10.0);       // spec 4.1
  EXPECT_REL(valueOf("10Volts"), 10.0);   // physics.md 6
  EXPECT_REL(valueOf("4.7qq"), 4.7);      // spec 4.1
  EXPECT_REL(valueOf("1Mohm"), 1e-3);     // physics.md 6: Mohm is milli-ohm in SPICE
  EXPECT_REL(valueOf("1.5MA"), 1.5e-3);   // physics.md 6
  EXPECT_REL(valueOf("10Hz"), 10.0);      // physics.md 6
  EXPECT_REL(valueOf("10e"), 10.0);       // an e without digits is a trailing letter
}

TEST(SpiceValue, MicroSignReadAsMicro) {
  // Decision in docs/spice-reader.md: U+00B5 and U+03BC count as the u scale factor.
  EXPECT_REL(valueOf("4.7\xC2\xB5"), 4.7e-6);
  EXPECT_REL(valueOf("10\xCE\xBC" "F"), 10e-6);
}

TEST(SpiceValue, ExactlyTheNearestDouble) {
  // The scale is folded into the decimal exponent, so the result equals the literal exactly.
  EXPECT_EQ(valueOf("2.2u"), 2.2e-6);
  EXPECT_EQ(valueOf("4.7n"), 4.7e-9);
  EXPECT_EQ(valueOf("100p"), 100e-12);
}

TEST(SpiceValue, SameDoubleAsTheLibraryConversion) {
  // Short values take a fast path (exact mantissa times an exact power of ten); every value must
  // still be the double std::from_chars gives for the same decimal number, bit for bit. The
  // reference is the C++ library's correctly rounded conversion. Mantissas of 1 to 18 digits
  // with the point anywhere, scale factors and exponents that fall inside and outside the path.
  std::uint64_t state = 12345;
  auto next = [&] {
    state = state * 6364136223846793005ull + 1442695040888963407ull;
    return state >> 33;
  };
  const std::pair<const char *, int> scales[] = {{"", 0}, {"k", 3}, {"meg", 6}, {"u", -6}, {"n", -9}, {"p", -12}, {"f", -15}};
  for (int n = 0; n < 20000; ++n) {
    int length = 1 + static_cast<int>(next() % 18);
    std::string digits;
    for (int k = 0; k < length; ++k) digits += static_cast<char>('0' + next() % 10);
    std::string mantissa = digits;
    int pointAt = static_cast<int>(next() % (length + 1));
    if (pointAt < length) mantissa.insert(mantissa.begin() + pointAt, '.');
    if (next() % 4 == 0) mantissa.insert(mantissa.begin(), '-');
    int exponent = static_cast<int>(next() % 61) - 30;
    const auto &[suffix, scaleExp] = scales[next() % 7];
    // (Built by appending: GCC 12 warns wrongly on "e" + std::to_string(...).)
    std::string token = mantissa;
    if (next() % 2) token.append(1, 'e').append(std::to_string(exponent));
    else exponent = 0;
    token.append(suffix);
    std::string reference = mantissa;
    reference.append(1, 'e').append(std::to_string(exponent + scaleExp));
    double expected = 0;
    auto r = std::from_chars(reference.data(), reference.data() + reference.size(), expected);
    ASSERT_EQ(r.ec, std::errc()) << reference;
    auto got = parseSpiceValue(token);
    ASSERT_TRUE(got.has_value()) << token;
    EXPECT_EQ(std::memcmp(&got->value, &expected, sizeof expected), 0) << token << " gave " << got->value << ", "
                                                                       << reference << " gives " << expected;
  }
}

TEST(SpiceValue, RejectsWhatIsNotANumber) {
  EXPECT_FALSE(parseSpiceValue(""));
  EXPECT_FALSE(parseSpiceValue("k"));
  EXPECT_FALSE(parseSpiceValue("abc"));
  EXPECT_FALSE(parseSpiceValue("."));
  EXPECT_FALSE(parseSpiceValue("-"));
  EXPECT_FALSE(parseSpiceValue("{x}"));
  // Decision (docs/spice-reader.md): non-letters after the number are not silently dropped.
  EXPECT_FALSE(parseSpiceValue("4.7k7"));
  EXPECT_FALSE(parseSpiceValue("5%"));
  EXPECT_FALSE(parseSpiceValue("1e999")); // out of double range
}

// --- IEC 60062 RKM codes (physics.md 5.2) -----------------------------------------------------------

TEST(SpiceValue, RkmCodes) {
  EXPECT_REL(valueOf("4R7"), 4.7);     // IEC 60062 RKM code, physics.md 5.2
  EXPECT_REL(valueOf("R47"), 0.47);    // IEC 60062 RKM code, physics.md 5.2
  EXPECT_REL(valueOf("4K7"), 4700.0);  // IEC 60062 RKM code, physics.md 5.2
  EXPECT_REL(valueOf("4k7"), 4700.0);  // IEC 60062 RKM code (lower-case k common practice)
  EXPECT_REL(valueOf("1M0"), 1e6);     // IEC 60062 RKM code, physics.md 5.2: M = mega here
  EXPECT_REL(valueOf("2G2"), 2.2e9);   // IEC 60062 RKM code, physics.md 5.2
  EXPECT_REL(valueOf("4n7"), 4.7e-9);  // IEC 60062 RKM code (capacitor), physics.md 5.2
  EXPECT_REL(valueOf("2u2"), 2.2e-6);  // IEC 60062 RKM code (capacitor)
  EXPECT_REL(valueOf("4k7J"), 4700.0); // IEC 60062: tolerance letter appended
  EXPECT_TRUE(rkmOf("4k7"));
  EXPECT_TRUE(rkmOf("R47"));
  EXPECT_TRUE(rkmOf("1M0"));
}

TEST(SpiceValue, NotRkm) {
  EXPECT_REL(valueOf("47R"), 47.0); // physics.md 5.2: 47R = 47, and SPICE reads 47 as well
  EXPECT_FALSE(rkmOf("47R"));
  EXPECT_REL(valueOf("472"), 472.0); // physics.md 5.2: three-digit codes are not interpreted
  EXPECT_FALSE(rkmOf("472"));
  EXPECT_FALSE(rkmOf("4.7k"));
  EXPECT_FALSE(rkmOf("1e3"));
  EXPECT_REL(valueOf("0R"), 0.0); // physics.md 5.2: 0R jumper, same in SPICE
}

TEST(SpiceValue, Spice3ReadingOfRkmText) {
  // physics.md 5.2 "Conflict with SPICE": what a Berkeley-derived parser makes of the same text.
  EXPECT_REL(*parseSpice3Value("4k7"), 4000.0); // physics.md 5.2
  EXPECT_REL(*parseSpice3Value("4R7"), 4.0);    // physics.md 5.2
  EXPECT_REL(*parseSpice3Value("1M0"), 1e-3);   // physics.md 5.2
  EXPECT_FALSE(parseSpice3Value("R47"));        // no leading number: rejected
  EXPECT_REL(*parseSpice3Value("4.7k7"), 4700.0); // physics.md 6: all after the scale dropped
  EXPECT_REL(*parseSpice3Value("10MEG"), 1e7);  // physics.md 6
}

// --- Expressions ------------------------------------------------------------------------------------

namespace {

class MapScope : public SpiceExpressionScope {
public:
  std::map<std::string, double> params;
  std::map<std::string, SpiceFunction> functions;
  SpiceLookup parameter(std::string_view name, double &value) const override {
    auto it = params.find(std::string(name));
    if (it == params.end()) return SpiceLookup::Unknown;
    value = it->second;
    return SpiceLookup::Found;
  }
  const SpiceFunction *function(std::string_view name) const override {
    auto it = functions.find(std::string(name));
    return it == functions.end() ? nullptr : &it->second;
  }
};

double eval(std::string_view text, const SpiceExpressionScope &scope) {
  auto r = evaluateSpiceExpression(text, scope);
  EXPECT_TRUE(r.ok) << text << ": " << r.error;
  return r.value;
}

} // namespace

TEST(SpiceExpression, Arithmetic) {
  MapScope s;
  s.params["rg"] = 4.7;
  s.params["n"] = 3;
  EXPECT_DOUBLE_EQ(eval("1+2*3", s), 7.0);
  EXPECT_DOUBLE_EQ(eval("(1+2)*3", s), 9.0);
  EXPECT_DOUBLE_EQ(eval("-2^2", s), -4.0);   // unary minus binds looser than power
  EXPECT_DOUBLE_EQ(eval("2^3^2", s), 512.0); // right-associative
  EXPECT_DOUBLE_EQ(eval("2**10", s), 1024.0);
  EXPECT_DOUBLE_EQ(eval("2^-1", s), 0.5);
  EXPECT_DOUBLE_EQ(eval("rg*2", s), 9.4);
  EXPECT_DOUBLE_EQ(eval("rg/n", s), 4.7 / 3);
  EXPECT_DOUBLE_EQ(eval("4.7k*2", s), 9400.0); // SPICE numbers inside expressions
  EXPECT_DOUBLE_EQ(eval("4k7+1", s), 4701.0);
  EXPECT_DOUBLE_EQ(eval("1e-3*2", s), 2e-3);
  EXPECT_DOUBLE_EQ(eval("1e+3", s), 1000.0);
  EXPECT_DOUBLE_EQ(eval("10-1e2", s), -90.0);
  EXPECT_DOUBLE_EQ(eval(" 1 ? 2 : 3 ", s), 2.0);
  EXPECT_DOUBLE_EQ(eval("n > 2 && n < 4", s), 1.0);
}

TEST(SpiceExpression, Functions) {
  MapScope s;
  EXPECT_DOUBLE_EQ(eval("sqrt(16)", s), 4.0);
  EXPECT_DOUBLE_EQ(eval("exp(0)", s), 1.0);
  EXPECT_DOUBLE_EQ(eval("log(exp(2))", s), 2.0); // log is the natural logarithm
  EXPECT_DOUBLE_EQ(eval("log10(1000)", s), 3.0);
  EXPECT_DOUBLE_EQ(eval("abs(-3)", s), 3.0);
  EXPECT_DOUBLE_EQ(eval("min(3, 1, 2)", s), 1.0);
  EXPECT_DOUBLE_EQ(eval("max(3, 1)", s), 3.0);
  EXPECT_DOUBLE_EQ(eval("pow(2, 8)", s), 256.0);
  EXPECT_DOUBLE_EQ(eval("SQRT(4)", s), 2.0);
  EXPECT_NEAR(eval("pi", s), 3.141592653589793, 1e-15);
  SpiceFunction f;
  f.args = {"a", "b"};
  f.body = "a*b+1";
  s.functions["f"] = f;
  EXPECT_DOUBLE_EQ(eval("f(2, 3)", s), 7.0);
}

TEST(SpiceExpression, Errors) {
  MapScope s;
  auto r = evaluateSpiceExpression("1/(2-2)", s);
  EXPECT_FALSE(r.ok);
  EXPECT_EQ(r.error, "division by zero");
  EXPECT_EQ(r.errorOffset, 1u);
  r = evaluateSpiceExpression("2*rgate", s);
  EXPECT_FALSE(r.ok);
  EXPECT_EQ(r.error, "unknown parameter rgate");
  EXPECT_EQ(r.errorOffset, 2u);
  r = evaluateSpiceExpression("(1+2", s);
  EXPECT_FALSE(r.ok);
  EXPECT_EQ(r.error, "expected ')'");
  r = evaluateSpiceExpression("sqrt(-1)", s);
  EXPECT_FALSE(r.ok);
  r = evaluateSpiceExpression("min(1)", s);
  EXPECT_FALSE(r.ok);
  r = evaluateSpiceExpression("nosuch(1)", s);
  EXPECT_EQ(r.error, "unknown function nosuch");
  r = evaluateSpiceExpression("", s);
  EXPECT_FALSE(r.ok);
  r = evaluateSpiceExpression("1 2", s);
  EXPECT_FALSE(r.ok);
  r = evaluateSpiceExpression("10^400", s);
  EXPECT_FALSE(r.ok); // not finite
  std::string deep(5000, '(');
  r = evaluateSpiceExpression(deep, s);
  EXPECT_FALSE(r.ok);
  EXPECT_EQ(r.error, "expression nested too deeply");
  SpiceFunction loop;
  loop.args = {"x"};
  loop.body = "g(x)";
  s.functions["g"] = loop;
  r = evaluateSpiceExpression("g(1)", s);
  EXPECT_FALSE(r.ok);
  EXPECT_NE(r.error.find("too deeply"), std::string::npos) << r.error;
}

TEST(SpiceExpression, Delimiters) {
  std::string_view body;
  EXPECT_TRUE(spiceExpressionBody("{a+b}", body));
  EXPECT_EQ(body, "a+b");
  EXPECT_TRUE(spiceExpressionBody("'a*2'", body));
  EXPECT_EQ(body, "a*2");
  EXPECT_FALSE(spiceExpressionBody("4.7k", body));
  EXPECT_FALSE(spiceExpressionBody("{", body));
}
