// Unit tests of the firmware header generator (ridgecal::firmware_export).
#define BOOST_TEST_MODULE firmware_export
#include <boost/test/unit_test.hpp>
#include <cmath>
#include <cstring>
#include <limits>
#include <random>
#include <regex>

#include "fixture_models.hpp"
#include "ridgecal/firmware/c_literals.hpp"
#include "ridgecal/firmware/c_text.hpp"
#include "ridgecal/firmware/crc_table.hpp"
#include "ridgecal/firmware/export.hpp"

using namespace ridgecal;
using namespace ridgecal::firmware;

namespace {

std::uint32_t fbits(float f) {
  std::uint32_t u;
  std::memcpy(&u, &f, 4);
  return u;
}
std::uint64_t dbits(double d) {
  std::uint64_t u;
  std::memcpy(&u, &d, 8);
  return u;
}

HeaderMeta ntc_meta() {
  HeaderMeta m = fwtest::base_meta("NTC", "counts", "degC", 0.1);
  for (int i = 0; i < 10; ++i) m.calibration_readings.push_back(250.0 + 350.0 * i);
  return m;
}

ExportOptions opts(NumericMode mode) {
  ExportOptions o;
  o.prefix = "fwt";
  o.mode = mode;
  return o;
}

// The banner comment: from the start of the header to its first "*/".
std::string first_comment(const std::string& header) {
  const auto end = header.find("*/");
  BOOST_REQUIRE(end != std::string::npos);
  return header.substr(0, end + 2);
}

// The header without its comments (block comments only: the generator writes no //).
std::string code_only(const std::string& h) {
  std::string out;
  for (std::size_t i = 0; i < h.size(); ++i) {
    if (h.compare(i, 2, "/*") == 0) {
      const auto end = h.find("*/", i + 2);
      BOOST_REQUIRE(end != std::string::npos);
      i = end + 1;
      out += ' ';
    } else {
      out += h[i];
    }
  }
  return out;
}

}  // namespace

// ---- names and options ---------------------------------------------------------------

BOOST_AUTO_TEST_CASE(numeric_mode_spellings) {
  for (NumericMode m : {NumericMode::Float, NumericMode::Double, NumericMode::Fixed})
    BOOST_TEST((numeric_mode_from_string(to_string(m)) == m));
  BOOST_TEST(to_string(NumericMode::Fixed) == "fixed");
  BOOST_TEST(!numeric_mode_from_string("Float").has_value());
  BOOST_TEST(!numeric_mode_from_string("").has_value());
  BOOST_TEST(!numeric_mode_from_string("float ").has_value());
}

BOOST_AUTO_TEST_CASE(prefix_rules) {
  for (const char* ok :
       {"calib", "T", "ntc2", "a_b", "ADC_ch0", "x1234567890123456789012345678901234567"})
    BOOST_TEST(check_c_prefix(ok).empty(), ok);
  BOOST_TEST(check_c_prefix(std::string(40, 'a')).empty());
  const char* bad[] = {"",    "1abc", "_x",  "__x", "_X",       "a__b",  "a_",
                       "a-b", "a b",  "a*/", "a;b", "\xc3\xa4", "tab\t", "new\nline"};
  for (const char* b : bad) BOOST_TEST(!check_c_prefix(b).empty(), "accepted '" << b << "'");
  BOOST_TEST(!check_c_prefix(std::string(41, 'a')).empty());
  // the message names the value and the rule
  const std::string msg = check_c_prefix("9lives");
  BOOST_TEST(msg.find("9lives") != std::string::npos);
  BOOST_TEST(msg.find("digit") != std::string::npos);
  BOOST_TEST(macro_case("ntc_Ch2") == "NTC_CH2");
}

BOOST_AUTO_TEST_CASE(options_validate_names_field_value_rule) {
  ExportOptions o;
  BOOST_TEST(o.validate().empty());
  BOOST_TEST(o.max_deviation_fraction == 0.10);
  BOOST_TEST(o.output_scale == 1000.0);
  o.max_deviation_fraction = 1.5;
  std::string m = o.validate();
  BOOST_TEST(m.find("max_deviation_fraction") != std::string::npos);
  BOOST_TEST(m.find("1.5") != std::string::npos);
  BOOST_TEST(m.find("<= 1") != std::string::npos);
  o = ExportOptions{};
  o.prefix = "a b";
  BOOST_TEST(o.validate().find("prefix") != std::string::npos);
  o = ExportOptions{};
  o.raw_min = 10;
  o.raw_max = 5;
  BOOST_TEST(o.validate().find("raw_min") != std::string::npos);
  o = ExportOptions{};
  o.output_scale = 0;
  BOOST_TEST(o.validate().find("output_scale") != std::string::npos);
  o = ExportOptions{};
  o.raw_max = 3000000000LL;
  BOOST_TEST(o.validate().find("raw_max") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(invalid_prefix_is_never_written) {
  ExportOptions o = opts(NumericMode::Float);
  o.prefix = "x */ int evil; /*";
  const ExportResult r = generate_header(firmware_model(fwtest::ntc_model()), ntc_meta(), o);
  BOOST_TEST((r.status == ExportStatus::InvalidInput));
  BOOST_TEST(r.header.empty());
}

// ---- comment escaping ------------------------------------------------------------------

BOOST_AUTO_TEST_CASE(comment_escaping_hostile_strings) {
  const std::string hostile[] = {
      "*/ int injected = 1; /*",
      "<script>alert('x')</script>",
      "line1\nline2\r\n#define EVIL 1",
      "quotes \" and ' and \\",
      "trailing backslash \\",
      "trigraph ?\?/ and ?\?=",
      "non-ASCII: 25 \xc2\xb0"
      "C, \xce\xbc"
      "m, \xe2\x80\xae",
      std::string("nul\0byte", 8),
      "/* nested */ */ /* ** / *",
      "*//*",
      std::string(5000, '*') + "/",
  };
  for (const std::string& h : hostile) {
    const std::string e = escape_c_comment(h);
    BOOST_TEST(e.find("*/") == std::string::npos, e);
    BOOST_TEST(e.find("/*") == std::string::npos, e);
    BOOST_TEST(e.find("??") == std::string::npos, e);
    for (char c : e) BOOST_TEST((c >= 0x20 && c < 0x7f), "byte " << int(c) << " in " << e);
    BOOST_TEST(e.size() <= 200 + std::strlen("...[truncated]") + 3);
    BOOST_TEST((e.empty() || e.back() != '\\'));
  }
  BOOST_TEST(escape_c_comment("25 \xc2\xb0"
                              "C") == "25 \\xC2\\xB0C");
  BOOST_TEST(escape_c_comment("a\nb") == "a\\x0Ab");
  BOOST_TEST(escape_c_comment("plain text 1.5 mV") == "plain text 1.5 mV");
  BOOST_TEST(escape_c_comment(std::string(300, 'a')).find("[truncated]") != std::string::npos);

  // Inside a whole header: the banner comment ends where the generator ends it.
  HeaderMeta meta = ntc_meta();
  meta.sensor_name = hostile[0];
  meta.reading_unit = hostile[2];
  meta.reference_unit = hostile[6];
  meta.tolerance_description = hostile[8];
  meta.pass_fail = hostile[1];
  meta.record_sha256 = hostile[9];
  meta.tool_version = hostile[10];
  for (NumericMode mode : {NumericMode::Float, NumericMode::Double, NumericMode::Fixed}) {
    const ExportResult r = generate_header(firmware_model(fwtest::ntc_model()), meta, opts(mode));
    BOOST_REQUIRE(r.ok());
    const std::string banner = first_comment(r.header);
    BOOST_TEST(banner.find("Uses <stdint.h> only") != std::string::npos);
    const auto injected = r.header.find("int injected");
    BOOST_TEST((injected == std::string::npos || injected < banner.size()));
    BOOST_TEST(r.header.find("\n#define EVIL") == std::string::npos);
    BOOST_TEST(code_only(r.header).find("EVIL") == std::string::npos);
    for (char c : r.header) BOOST_TEST(((c >= 0x20 && c < 0x7f) || c == '\n'));
  }
}

// ---- literals ----------------------------------------------------------------------------

BOOST_AUTO_TEST_CASE(float_literals_round_trip) {
  std::mt19937 rng(12345);
  std::vector<float> values = {0.0f,
                               -0.0f,
                               1.0f,
                               -1.0f,
                               0.1f,
                               1e-45f,
                               1.17549435e-38f,
                               std::numeric_limits<float>::max(),
                               -3.4028235e38f,
                               16777217.0f,
                               0.00054054055f,
                               123456789.0f};
  for (int i = 0; i < 20000; ++i) {
    std::uint32_t u = rng();
    float f;
    std::memcpy(&f, &u, 4);
    if (std::isfinite(f)) values.push_back(f);
  }
  for (float v : values) {
    const std::string s = c_float_literal(v);
    BOOST_TEST(fbits(parse_c_float_literal(s)) == fbits(v), s);
    BOOST_TEST(s.back() == 'f');
    BOOST_TEST(s.find_first_of(".e") != std::string::npos, s);
  }
  BOOST_TEST(c_float_literal(9.0f) == "9.0f");
  BOOST_TEST(c_float_literal(-3.5f) == "-3.5f");
}

BOOST_AUTO_TEST_CASE(double_literals_round_trip) {
  std::mt19937_64 rng(777);
  std::vector<double> values = {0.0,
                                -0.0,
                                0.1,
                                1.0 / 3.0,
                                5e-324,
                                2.2250738585072014e-308,
                                std::numeric_limits<double>::max(),
                                9007199254740993.0};
  for (int i = 0; i < 20000; ++i) {
    std::uint64_t u = rng();
    double d;
    std::memcpy(&d, &u, 8);
    if (std::isfinite(d)) values.push_back(d);
  }
  for (double v : values) {
    const std::string s = c_double_literal(v);
    BOOST_TEST(dbits(parse_c_double_literal(s)) == dbits(v), s);
    BOOST_TEST(s.find_first_of(".e") != std::string::npos, s);
    BOOST_TEST(s.back() != 'f');
  }
}

BOOST_AUTO_TEST_CASE(integer_literals) {
  BOOST_TEST(c_int32_literal(0) == "0L");
  BOOST_TEST(c_int32_literal(-5) == "-5L");
  BOOST_TEST(c_int32_literal(INT32_MIN) == "(-2147483647L - 1L)");
  BOOST_TEST(c_int64_literal(2147483647LL) == "(int64_t)2147483647L");
  // 2^40 + 3 = 256 * 2^32 + 3
  BOOST_TEST(c_int64_literal(1099511627779LL) ==
             "((int64_t)256L * (int64_t)65536L * (int64_t)65536L + (int64_t)3UL)");
  // -(2^40) - 5 = -257 * 2^32 + (2^32 - 5)
  BOOST_TEST(c_int64_literal(-1099511627781LL) ==
             "((int64_t)-257L * (int64_t)65536L * (int64_t)65536L + (int64_t)4294967291UL)");
}

// ---- CRC ---------------------------------------------------------------------------------

BOOST_AUTO_TEST_CASE(crc32_known_answers) {
  BOOST_TEST(crc32_text("123456789") == 0xCBF43926u);  // the CRC-32 check value
  BOOST_TEST(crc32_text("") == 0x00000000u);
  BOOST_TEST(crc32_text("The quick brown fox jumps over the lazy dog") == 0x414FA339u);
}

BOOST_AUTO_TEST_CASE(table_byte_order_is_value_defined) {
  const auto f = table_bytes(std::vector<float>{1.0f});
  BOOST_TEST((f == std::vector<std::uint8_t>{0x00, 0x00, 0x80, 0x3f}));
  const auto d = table_bytes(std::vector<double>{1.0});
  BOOST_TEST((d == std::vector<std::uint8_t>{0, 0, 0, 0, 0, 0, 0xf0, 0x3f}));
  const auto i = table_bytes(std::vector<std::int32_t>{-2, 0x01020304});
  BOOST_TEST((i == std::vector<std::uint8_t>{0xfe, 0xff, 0xff, 0xff, 4, 3, 2, 1}));
}

// The self-check covers every constant of the evaluation, in the order the
// header's TABLE_CRC32 comment lists (docs/firmware-export.md). Restated here
// for the float header of the NTC model: the table, X_MIN, X_MAX, T_CENTER and
// T_SCALE (scaled-t basis) and DEGREE. The other modes are proved by
// compiling and flipping every constant (constant-flip.sh).
BOOST_AUTO_TEST_CASE(header_carries_crc_of_every_constant) {
  const ExportResult r =
      generate_header(firmware_model(fwtest::ntc_model()), ntc_meta(), opts(NumericMode::Float));
  BOOST_REQUIRE(r.ok());
  BOOST_REQUIRE(r.float_program.has_value());
  const FloatProgram& p = *r.float_program;
  BOOST_REQUIRE(p.basis == Basis::ScaledT);
  std::vector<std::uint8_t> bytes = table_bytes(p.coef);
  for (float v : {p.x_lo, p.x_hi, p.center, p.inv_half_width}) {
    const auto b = table_bytes(std::vector<float>{v});
    bytes.insert(bytes.end(), b.begin(), b.end());
  }
  const auto deg = table_bytes(std::vector<std::int32_t>{p.reading_degree});
  bytes.insert(bytes.end(), deg.begin(), deg.end());
  const std::uint32_t expect = crc32_bytes(bytes);
  BOOST_TEST(r.table_crc32 == expect);
  BOOST_TEST(r.table_crc32 != crc32_bytes(table_bytes(p.coef)));  // more than the table
  char text[64];
  std::snprintf(text, sizeof text, "#define FWT_TABLE_CRC32 0x%08lXUL",
                static_cast<unsigned long>(expect));
  BOOST_TEST(r.header.find(text) != std::string::npos, text);
  const auto from = r.header.find("in this order"), to = r.header.find("see fwt_table_crc32");
  BOOST_REQUIRE(from < to);
  const std::string listed = r.header.substr(from, to - from);
  for (const char* name :
       {"FWT_COEF[0..", "FWT_X_MIN,", "FWT_X_MAX,", "FWT_T_CENTER,", "FWT_T_SCALE,", "FWT_DEGREE;"})
    BOOST_TEST(listed.find(name) != std::string::npos, name << " in " << listed);
  for (NumericMode mode : {NumericMode::Double, NumericMode::Fixed}) {
    const ExportResult q =
        generate_header(firmware_model(fwtest::ntc_model()), ntc_meta(), opts(mode));
    BOOST_REQUIRE(q.ok());
    std::snprintf(text, sizeof text, "#define FWT_TABLE_CRC32 0x%08lXUL",
                  static_cast<unsigned long>(q.table_crc32));
    BOOST_TEST(q.header.find(text) != std::string::npos, text);
  }
}

// The record's verdict, digest and date reach the compiler as macros.
BOOST_AUTO_TEST_CASE(header_states_verdict_digest_and_date) {
  HeaderMeta meta = ntc_meta();
  meta.verdict = HeaderVerdict::Fail;
  meta.calibration_date = "2026-03-04T05:06:07Z\"*/";  // hostile tail: never closes the string
  meta.record_sha256 = std::string(64, 'a');
  const ExportResult r =
      generate_header(firmware_model(fwtest::ntc_model()), meta, opts(NumericMode::Float));
  BOOST_REQUIRE(r.ok());
  BOOST_TEST(r.header.find("#define FWT_VERDICT FWT_VERDICT_FAIL\n") != std::string::npos);
  BOOST_TEST(r.header.find("#define FWT_VERDICT_PASS 1\n") != std::string::npos);
  BOOST_TEST(r.header.find("#define FWT_CALIBRATION_DATE \"2026-03-04T05:06:07Z???\"") !=
             std::string::npos);
  BOOST_TEST(r.header.find("#define FWT_RECORD_SHA256 \"" + std::string(64, 'a') + "\"") !=
             std::string::npos);
  for (HeaderVerdict v : {HeaderVerdict::NotJudged, HeaderVerdict::Pass, HeaderVerdict::Fail,
                          HeaderVerdict::RecordModified})
    BOOST_TEST((header_verdict_from_string(to_string(v)) == v));
  BOOST_CHECK_THROW(header_verdict_from_string("PASS"), std::invalid_argument);
}

// ---- header contract ----------------------------------------------------------------------

BOOST_AUTO_TEST_CASE(header_contract_elements) {
  for (NumericMode mode : {NumericMode::Float, NumericMode::Double, NumericMode::Fixed}) {
    const ExportResult r =
        generate_header(firmware_model(fwtest::ntc_model()), ntc_meta(), opts(mode));
    BOOST_REQUIRE(r.ok());
    const std::string& full = r.header;
    const std::string h = code_only(full);
    BOOST_TEST(full.find("//") == std::string::npos);  // C89: block comments only
    for (const char* must :
         {"GENERATED FILE -- DO NOT EDIT", "#define FWT_FORMAT_VERSION 2", "#include <stdint.h>",
          "Measured max |error|", "Precision:", "#ifndef FWT_RIDGECAL_CALIBRATION_H",
          "extern \"C\" {", "static const", "FWT_INLINE", "fwt_check_table(void)",
          "record SHA-256:", "tool version:", "local codes and certified procedures",
          "-ffp-contract=off", "max deviation:", "_checked("})
      BOOST_TEST(full.find(must) != std::string::npos, to_string(mode) << " lacks " << must);
    // stdint.h is the only include; no allocation, no libm
    std::size_t includes = 0;
    for (std::size_t p = h.find("#include"); p != std::string::npos; p = h.find("#include", p + 1))
      ++includes;
    BOOST_TEST(includes == 1u);
    for (const char* never : {"malloc", "math.h", "sqrt", "pow(", "long long", "LL"})
      BOOST_TEST(h.find(never) == std::string::npos, to_string(mode) << " has " << never);
    if (mode != NumericMode::Fixed)
      BOOST_TEST(h.find("#pragma STDC FP_CONTRACT OFF") != std::string::npos);
    if (mode == NumericMode::Float) {
      BOOST_TEST(h.find("double") == std::string::npos);
      // every floating literal in code carries the f suffix
      const std::string code = h;
      std::regex lit(R"((^|[^\w.])(\d+\.\d*(e[-+]?\d+)?)([^\w.]|$))");
      BOOST_TEST(!std::regex_search(code, lit), "unsuffixed float literal in float header");
    }
    if (mode == NumericMode::Fixed) {
      BOOST_TEST(h.find("float") == std::string::npos);
      BOOST_TEST(h.find("double") == std::string::npos);
      BOOST_TEST(h.find("FWT_RAW_MIN 200L") != std::string::npos);
    }
  }
}

// ---- emulation and proof ------------------------------------------------------------------

BOOST_AUTO_TEST_CASE(float_emulation_tracks_model) {
  const auto m = fwtest::ntc_model();
  const ExportResult r = generate_header(firmware_model(m), ntc_meta(), opts(NumericMode::Float));
  BOOST_REQUIRE(r.ok());
  BOOST_TEST((r.basis == Basis::ScaledT));
  // binary32: a few ulps of max|p| (~101 degC): 2^-24 * 101 * 8 ~ 5e-5
  constexpr double kFloatBound = 5e-5;
  BOOST_TEST(r.max_deviation < kFloatBound);
  BOOST_TEST(r.max_deviation > 0.0);  // float cannot be exact everywhere
  BOOST_TEST(r.points_checked == 2001u + 10u);
  BOOST_TEST(r.readings_checked == 10u);
  int st = -1;
  const auto& p = *r.float_program;
  BOOST_TEST(fbits(eval_program_checked(p, 100.0f, &st)) == fbits(eval_program(p, p.x_lo)));
  BOOST_TEST(st == kBelowRange);
  eval_program_checked(p, 5000.0f, &st);
  BOOST_TEST(st == kAboveRange);
  BOOST_TEST(fbits(eval_program_checked(p, std::nanf(""), &st)) == fbits(eval_program(p, p.x_lo)));
  BOOST_TEST(st == kNotANumber);
  eval_program_checked(p, 1000.0f, &st);
  BOOST_TEST(st == kInRange);
}

BOOST_AUTO_TEST_CASE(scaled_t_chosen_far_from_zero) {
  PolyModel m;
  m.scaling = {1.0e6, 1.0e6 + 500.0};
  m.cheb = {10.0, 3.0, -0.5, 0.25};
  const ExportResult r = generate_header(firmware_model(m), ntc_meta(), opts(NumericMode::Float));
  BOOST_TEST((r.basis == Basis::ScaledT));
  BOOST_TEST(r.formats.find("scaled t") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(double_mode_is_near_exact) {
  const ExportResult r =
      generate_header(firmware_model(fwtest::ntc_model()), ntc_meta(), opts(NumericMode::Double));
  BOOST_REQUIRE(r.ok());
  // binary64 Horner of degree 5 on values ~100: well below 1e-12
  constexpr double kDoubleBound = 1e-12;
  BOOST_TEST(r.max_deviation < kDoubleBound);
}

BOOST_AUTO_TEST_CASE(rshift_round_is_floor_of_half_up) {
  std::mt19937_64 rng(99);
  for (int i = 0; i < 200000; ++i) {
    const int s = 1 + static_cast<int>(rng() % 61);
    const std::int64_t lim =
        (static_cast<std::int64_t>(1) << 62) - (static_cast<std::int64_t>(1) << (s - 1));
    std::int64_t v = static_cast<std::int64_t>(rng() >> 1) % lim;
    if (rng() & 1) v = -v;
    const __int128 num = static_cast<__int128>(v) + (static_cast<__int128>(1) << (s - 1));
    const __int128 den = static_cast<__int128>(1) << s;
    __int128 q = num / den;
    if (num % den != 0 && num < 0) --q;
    BOOST_REQUIRE(rshift_round(v, s) == static_cast<std::int64_t>(q));
  }
  BOOST_TEST(rshift_round(-3, 1) == -1);  // -1.5 rounds half up to -1
  BOOST_TEST(rshift_round(-5, 1) == -2);  // -2.5 -> -2
  BOOST_TEST(rshift_round(5, 1) == 3);    // 2.5 -> 3
}

BOOST_AUTO_TEST_CASE(fixed_point_bounds_hold_for_every_input) {
  for (const auto& f : fwtest::target_fixtures()) {
    if (f.options.mode != NumericMode::Fixed) continue;
    FixedPlan p;
    std::string why;
    BOOST_REQUIRE_MESSAGE(plan_fixed(firmware_model(f.model), f.options, &p, &why), why);
    const int n = p.degree();
    // Replay the generated arithmetic with 128-bit integers and check every
    // intermediate against the proved interval and the hard limits.
    const long double two62 = std::ldexp(1.0L, 62);
    for (std::int64_t raw = p.t.raw_min; raw <= p.t.raw_max; ++raw) {
      const __int128 pre = static_cast<__int128>(raw - p.t.r0) * p.t.mul + p.t.add;
      BOOST_REQUIRE(static_cast<long double>(pre) >= p.t.pre.lo);
      BOOST_REQUIRE(static_cast<long double>(pre) <= p.t.pre.hi);
      const std::int64_t t = rshift_round(static_cast<std::int64_t>(pre), p.t.shift);
      std::int64_t acc = p.coef[static_cast<std::size_t>(n)];
      for (int k = n - 1; k >= 0; --k) {
        const __int128 prod = static_cast<__int128>(acc) * t;
        const auto& b = p.prod[static_cast<std::size_t>(k)];
        BOOST_REQUIRE(static_cast<long double>(prod) >= b.lo);
        BOOST_REQUIRE(static_cast<long double>(prod) <= b.hi);
        BOOST_REQUIRE(std::fabs(static_cast<long double>(prod)) < two62);
        acc = rshift_round(static_cast<std::int64_t>(prod), p.sh_out[static_cast<std::size_t>(k)]) +
              p.coef[static_cast<std::size_t>(k)];
        BOOST_REQUIRE(static_cast<long double>(acc) >= p.acc[static_cast<std::size_t>(k)].lo);
        BOOST_REQUIRE(static_cast<long double>(acc) <= p.acc[static_cast<std::size_t>(k)].hi);
      }
      const std::int32_t out = eval_fixed(p, static_cast<std::int32_t>(raw));
      BOOST_REQUIRE(static_cast<long double>(out) >= p.out.lo);
      BOOST_REQUIRE(static_cast<long double>(out) <= p.out.hi);
    }
    BOOST_TEST(p.out.hi <= 2147483647.0L);
    BOOST_TEST(p.out.lo >= -2147483647.0L);
  }
}

BOOST_AUTO_TEST_CASE(fixed_point_accuracy_and_exhaustive_check) {
  const ExportResult r =
      generate_header(firmware_model(fwtest::ntc_model()), ntc_meta(), opts(NumericMode::Fixed));
  BOOST_REQUIRE(r.ok());
  // output rounding to 1/1000 degC is 0.0005; arithmetic adds far less
  constexpr double kFixedBound = 0.0005 + 1e-6;
  BOOST_TEST(r.max_deviation <= kFixedBound);
  BOOST_TEST(r.points_checked == 3701u + 10u);  // every raw count 200..3900, plus readings
  int st = -1;
  BOOST_TEST(eval_fixed_checked(*r.fixed_plan, 100, &st) == eval_fixed(*r.fixed_plan, 200));
  BOOST_TEST(st == kBelowRange);
  eval_fixed_checked(*r.fixed_plan, INT32_MAX, &st);
  BOOST_TEST(st == kAboveRange);
}

BOOST_AUTO_TEST_CASE(fixed_point_rejects_unrepresentable_output) {
  ExportOptions o = opts(NumericMode::Fixed);
  o.output_scale = 1e9;  // ~1e11 output units: beyond int32
  const ExportResult r = generate_header(firmware_model(fwtest::ntc_model()), ntc_meta(), o);
  BOOST_TEST((r.status == ExportStatus::InvalidInput));
  BOOST_TEST(r.message.find("31 bits") != std::string::npos, r.message);
}

BOOST_AUTO_TEST_CASE(fixed_point_wide_bipolar_range) {
  const auto f = fwtest::target_fixtures();
  const auto it =
      std::find_if(f.begin(), f.end(), [](const auto& x) { return x.name == "bridge_fixed"; });
  BOOST_REQUIRE(it != f.end());
  const ExportResult r = generate_header(firmware_model(it->model), it->meta, it->options);
  BOOST_REQUIRE(r.ok());
  BOOST_TEST(r.fixed_plan->t.raw_min == -30000);
  BOOST_TEST(r.points_checked == 60001u);
}

// ---- refusal rule ---------------------------------------------------------------------------

BOOST_AUTO_TEST_CASE(refusal_at_the_limit) {
  const auto m = fwtest::ntc_model();
  HeaderMeta meta = ntc_meta();
  const ExportResult base = generate_header(firmware_model(m), meta, opts(NumericMode::Float));
  BOOST_REQUIRE(base.ok());
  const double dev = base.max_deviation;
  // limit = 0.1 x tolerance: just above the deviation passes, just below refuses
  meta.tolerance_abs = dev / 0.1 * 1.01;
  BOOST_TEST(generate_header(firmware_model(m), meta, opts(NumericMode::Float)).ok());
  meta.tolerance_abs = dev / 0.1 * 0.99;
  const ExportResult refused = generate_header(firmware_model(m), meta, opts(NumericMode::Float));
  BOOST_TEST((refused.status == ExportStatus::Refused));
  BOOST_TEST(refused.message.find("refused") != std::string::npos);
  BOOST_TEST(refused.max_deviation == dev);
  // a larger fraction lets the same header through
  ExportOptions o = opts(NumericMode::Float);
  o.max_deviation_fraction = 0.2;
  BOOST_TEST(generate_header(firmware_model(m), meta, o).ok());
}

BOOST_AUTO_TEST_CASE(fixed_refused_when_output_rounding_is_too_coarse) {
  HeaderMeta meta = ntc_meta();
  meta.tolerance_abs = 0.001;  // limit 1e-4 < output rounding 5e-4 at milli-units
  const ExportResult r =
      generate_header(firmware_model(fwtest::ntc_model()), meta, opts(NumericMode::Fixed));
  BOOST_TEST((r.status == ExportStatus::Refused));
  ExportOptions o = opts(NumericMode::Fixed);
  o.output_scale = 100000.0;  // 1e-5 degC units
  BOOST_TEST(generate_header(firmware_model(fwtest::ntc_model()), meta, o).ok());
}

BOOST_AUTO_TEST_CASE(tolerance_fallback) {
  HeaderMeta meta = ntc_meta();
  meta.tolerance_abs.reset();
  meta.validation_rmse = 0.02;
  ExportResult r =
      generate_header(firmware_model(fwtest::ntc_model()), meta, opts(NumericMode::Float));
  BOOST_TEST(r.ok());
  BOOST_TEST(r.tolerance_used == 0.02);
  BOOST_TEST(r.tolerance_source.find("validation RMSE") != std::string::npos);
  BOOST_TEST(r.header.find("validation RMSE, fallback") != std::string::npos);
  meta.validation_rmse = HeaderMeta::kUnset;
  r = generate_header(firmware_model(fwtest::ntc_model()), meta, opts(NumericMode::Float));
  BOOST_TEST((r.status == ExportStatus::InvalidInput));
}

BOOST_AUTO_TEST_CASE(degenerate_models) {
  PolyModel constant;
  constant.scaling = {0.0, 10.0};
  constant.cheb = {4.25};
  for (NumericMode mode : {NumericMode::Float, NumericMode::Double, NumericMode::Fixed}) {
    const ExportResult r = generate_header(firmware_model(constant), ntc_meta(), opts(mode));
    BOOST_TEST(r.ok(), to_string(mode) << ": " << r.message);
    BOOST_TEST(r.max_deviation == 0.0);
  }
  PolyModel empty;
  BOOST_TEST((generate_header(firmware_model(empty), ntc_meta(), opts(NumericMode::Float)).status ==
              ExportStatus::InvalidInput));
  PolyModel flat = fwtest::ntc_model();
  flat.scaling = {5.0, 5.0};
  BOOST_TEST((generate_header(firmware_model(flat), ntc_meta(), opts(NumericMode::Float)).status ==
              ExportStatus::InvalidInput));
  PolyModel nan = fwtest::ntc_model();
  nan.cheb[2] = std::nan("");
  BOOST_TEST((generate_header(firmware_model(nan), ntc_meta(), opts(NumericMode::Fixed)).status ==
              ExportStatus::InvalidInput));
}

BOOST_AUTO_TEST_CASE(fixed_raw_range_beyond_calibration_is_flagged) {
  ExportOptions o = opts(NumericMode::Fixed);
  BOOST_TEST(generate_header(firmware_model(fwtest::ntc_model()), ntc_meta(), o)
                 .header.find("extrapolations") == std::string::npos);
  o.raw_min = 0;
  o.raw_max = 4095;  // the whole 12-bit ADC, wider than the calibrated 200..3900
  const ExportResult r = generate_header(firmware_model(fwtest::ntc_model()), ntc_meta(), o);
  BOOST_REQUIRE(r.ok());
  BOOST_TEST(r.header.find("beyond the calibrated range") != std::string::npos);
  // readings 0.2..0.8 with input_scale 1: no integer input at all
  PolyModel volts;
  volts.scaling = {0.2, 0.8};
  volts.cheb = {1.0, 2.0};
  const ExportResult v =
      generate_header(firmware_model(volts), ntc_meta(), opts(NumericMode::Fixed));
  BOOST_TEST((v.status == ExportStatus::InvalidInput));
  BOOST_TEST(v.message.find("input_scale") != std::string::npos, v.message);
  o = opts(NumericMode::Fixed);
  o.input_scale = 1000.0;  // millivolts
  BOOST_TEST(generate_header(firmware_model(volts), ntc_meta(), o).ok());
}

// ---- one writer for every model ------------------------------------------------------

BOOST_AUTO_TEST_CASE(calibration_adapter_picks_the_dialect) {
  // A one-input calibration reaches the writer as general_model(cal), the
  // N = 1 case, and must give exactly the header of its polynomial; an
  // extended calibration that of its model, in the extended dialect.
  Calibration one;
  one.model = one_input_model(fwtest::ntc_model());
  for (NumericMode mode : {NumericMode::Float, NumericMode::Double, NumericMode::Fixed}) {
    const ExportResult a = generate_header(firmware_model(one), ntc_meta(), opts(mode));
    const ExportResult b =
        generate_header(firmware_model(fwtest::ntc_model()), ntc_meta(), opts(mode));
    BOOST_TEST_REQUIRE(a.ok(), to_string(mode) << ": " << a.message);
    BOOST_TEST(a.header == b.header, to_string(mode));
    BOOST_TEST(a.header.find("#define FWT_DEGREE 5\n") != std::string::npos);
    BOOST_TEST(a.header.find("_EXTENDED_MODEL") == std::string::npos);
  }
  Calibration ext;
  ext.model = fwtest::pressure_extended_model();
  const HeaderMeta meta = fwtest::base_meta("PT-7", "counts", "bar", 0.01);
  const ExportResult e = generate_header(firmware_model(ext), meta, opts(NumericMode::Float));
  BOOST_TEST_REQUIRE(e.ok(), e.message);
  BOOST_TEST(e.header == generate_header(firmware_model(fwtest::pressure_extended_model()), meta,
                                         opts(NumericMode::Float))
                             .header);
  BOOST_TEST(e.header.find("#define FWT_EXTENDED_MODEL 1") != std::string::npos);
  BOOST_TEST(e.header.find("FWT_INLINE float fwt_eval(float x, float aux)") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(model_without_reference_is_invalid_input) {
  // The proof needs the double-precision model: a FirmwareModel not made by
  // firmware_model() is refused as bad input, and nothing is written.
  FirmwareModel m = firmware_model(fwtest::ntc_model());
  m.reference = nullptr;
  const ExportResult r = generate_header(m, ntc_meta(), opts(NumericMode::Float));
  BOOST_TEST((r.status == ExportStatus::InvalidInput));
  BOOST_TEST(r.message.find("no reference model") != std::string::npos, r.message);
  BOOST_TEST(r.header.empty());
}
