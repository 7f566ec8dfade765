// Unit tests of the header generator (export.hpp) for extended models:
// 2-D polynomial with an aux input (float, double, fixed) and the
// Steinhart-Hart thermistor through a divider (ln, reciprocal-kelvin).
#define BOOST_TEST_MODULE surface_export
#include <boost/test/unit_test.hpp>
#include <cmath>
#include <cstring>
#include <limits>
#include <random>

#include "fixture_models.hpp"
#include "ridgecal/firmware/crc_table.hpp"
#include "ridgecal/firmware/export.hpp"

using namespace ridgecal;
using namespace ridgecal::firmware;

namespace {

fwtest::SurfaceFixture fixture(const std::string& name) {
  for (const auto& f : fwtest::surface_fixtures())
    if (f.name == name) return f;
  BOOST_FAIL("no fixture " + name);
  return {};
}

bool has(const std::string& text, const std::string& what) {
  return text.find(what) != std::string::npos;
}

// Counts in the divider for a resistance (inverse of the sensor-low divider).
double counts_for(double r) {
  return 4095.0 * r / (10000.0 + r);
}

}  // namespace

BOOST_AUTO_TEST_CASE(pressure_float_and_double_track_the_model) {
  for (const char* name : {"ptc2d_float", "ptc2d_double"}) {
    const auto f = fixture(name);
    const ExportResult r = generate_header(firmware_model(f.model), f.meta, f.options);
    BOOST_TEST_REQUIRE(r.ok(), r.message);
    BOOST_TEST_MESSAGE(name << ": max deviation " << r.max_deviation << " bar over "
                            << r.points_checked << " points");
    BOOST_TEST(r.max_deviation <= 0.1 * 0.01);
    BOOST_TEST(r.points_checked > 50000u);
    BOOST_TEST(r.readings_checked == 54u);
    BOOST_TEST(r.libm_allowance == 0.0);
    if (r.double_program) BOOST_TEST(r.max_deviation < 1e-11);
    // an independent check of the emulation at random points
    std::mt19937 rng(7);
    std::uniform_real_distribution<double> ux(5861.0, 59787.5), ua(-20.53, 79.87);
    for (int i = 0; i < 2000; ++i) {
      const double x = ux(rng), a = ua(rng);
      const double ref = f.model.eval(x, a);
      const double y = r.float_program
                           ? static_cast<double>(eval_program(
                                 *r.float_program, static_cast<float>(x), static_cast<float>(a)))
                           : eval_program(*r.double_program, x, a);
      const double ref_in =
          r.float_program ? f.model.eval(static_cast<float>(x), static_cast<float>(a)) : ref;
      BOOST_TEST(std::fabs(y - ref_in) <= 2e-5,
                 "at " << x << ", " << a << ": " << y << " vs " << ref_in);
    }
  }
}

BOOST_AUTO_TEST_CASE(float_emulation_is_the_stated_nested_horner) {
  // v = sum_k t^k (sum_l m[k][l] s^l), one rounding per operation, written
  // out by hand for the 3 x 4 table: must match the emulation bit for bit.
  const auto f = fixture("ptc2d_float");
  const ExportResult r = generate_header(firmware_model(f.model), f.meta, f.options);
  BOOST_TEST_REQUIRE(r.ok());
  const FloatProgram& p = *r.float_program;
  BOOST_TEST_REQUIRE(p.reading_degree == 2);
  BOOST_TEST_REQUIRE(p.aux_degree == 3);
  const auto& c = p.coef;
  for (float x : {5861.0f, 20000.5f, 33333.0f, 59787.5f})
    for (float a : {-20.53f, 0.0f, 41.25f, 79.87f}) {
      volatile float t = (x - p.center) * p.inv_half_width;
      volatile float s = (a - p.aux_center) * p.aux_inv_half_width;
      float w2 = c[11], w1 = c[7], w0 = c[3];
      for (int l = 2; l >= 0; --l) {
        volatile float q2 = w2 * s, q1 = w1 * s, q0 = w0 * s;
        w2 = q2 + c[static_cast<std::size_t>(8 + l)];
        w1 = q1 + c[static_cast<std::size_t>(4 + l)];
        w0 = q0 + c[static_cast<std::size_t>(l)];
      }
      volatile float v = w2 * t;
      v = v + w1;
      volatile float v2 = v * t;
      const float expect = v2 + w0;
      const float got = eval_program(p, x, a);
      std::uint32_t be, bg;
      std::memcpy(&be, &expect, 4);
      std::memcpy(&bg, &got, 4);
      BOOST_TEST(be == bg, "at " << x << ", " << a);
    }
}

BOOST_AUTO_TEST_CASE(pressure_header_contract) {
  const auto f = fixture("ptc2d_float");
  const ExportResult r = generate_header(firmware_model(f.model), f.meta, f.options);
  BOOST_TEST_REQUIRE(r.ok());
  const std::string& h = r.header;
  BOOST_TEST(has(h, "GENERATED FILE -- DO NOT EDIT."));
  BOOST_TEST(has(h, "#define FWT_FORMAT_VERSION 2"));
  BOOST_TEST(has(h, "#define FWT_HAS_AUX 1"));
  BOOST_TEST(has(h, "#define FWT_N_COEF 12"));
  BOOST_TEST(has(h, "FWT_INLINE float fwt_eval(float x, float aux)"));
  BOOST_TEST(has(h, "FWT_INLINE float fwt_eval_checked(float x, float aux, int *status)"));
  BOOST_TEST(has(h, "#include <stdint.h>"));
  BOOST_TEST(!has(h, "#include <math.h>"));
  BOOST_TEST(!has(h, "malloc("));
  BOOST_TEST(has(h, "Uses <stdint.h> only"));
  BOOST_TEST(has(h, "extern \"C\""));
  BOOST_TEST(has(h, "CAUTION"));
  BOOST_TEST(has(h, "#pragma STDC FP_CONTRACT OFF"));
  BOOST_TEST(has(h, "static const float FWT_COEF[FWT_N_COEF]"));
  BOOST_TEST(has(h, "calibrated aux:"));
  BOOST_TEST(has(h, "Measured max |error| against the double-precision model"));
  BOOST_TEST(has(h, "for (k = 0U; k < (unsigned)(FWT_N_COEF); ++k)"));
  // the self-check covers the table and every constant (the aux ones too)
  char want[32];
  std::snprintf(want, sizeof want, "0x%08lXUL", static_cast<unsigned long>(r.table_crc32));
  BOOST_TEST(has(h, std::string("#define FWT_TABLE_CRC32 ") + want));
  BOOST_TEST(r.table_crc32 != crc32_bytes(table_bytes(r.float_program->coef)));
  BOOST_TEST(has(h, "FWT_AUX_MIN, FWT_AUX_MAX,"));
  BOOST_TEST(has(h, "FWT_S_CENTER, FWT_S_SCALE,"));
  // every float literal carries the f suffix
  const auto pos = h.find("FWT_COEF[FWT_N_COEF] = {");
  const auto end = h.find("};", pos);
  const std::string table = h.substr(pos, end - pos);
  int entries = 0;
  for (std::size_t i = table.find("f,"); i != std::string::npos; i = table.find("f,", i + 1))
    ++entries;
  BOOST_TEST(entries + 1 >= 11);  // 11 with a comma, the last without
}

BOOST_AUTO_TEST_CASE(checked_variant_reports_both_inputs) {
  const auto f = fixture("ptc2d_float");
  const ExportResult r = generate_header(firmware_model(f.model), f.meta, f.options);
  const FloatProgram& p = *r.float_program;
  int st = -1;
  eval_program_checked(p, 30000.0f, 20.0f, &st);
  BOOST_TEST(st == kInRange);
  eval_program_checked(p, 30000.0f, -40.0f, &st);
  BOOST_TEST(st == kAuxBelowRange);
  eval_program_checked(p, 70000.0f, 90.0f, &st);
  BOOST_TEST(st == kAboveRange + kAuxAboveRange);
  const float y = eval_program_checked(p, 1000.0f, std::numeric_limits<float>::quiet_NaN(), &st);
  BOOST_TEST(st == kBelowRange + kAuxNotANumber);
  BOOST_TEST(y == eval_program(p, p.x_lo, p.a_lo));
}

BOOST_AUTO_TEST_CASE(pressure_fixed_point_proof_and_accuracy) {
  const auto f = fixture("ptc2d_fixed");
  const ExportResult r = generate_header(firmware_model(f.model), f.meta, f.options);
  BOOST_TEST_REQUIRE(r.ok(), r.message);
  const FixedPlan& p = *r.fixed_plan;
  BOOST_TEST_MESSAGE("fixed: max deviation " << r.max_deviation << " bar");
  BOOST_TEST(p.t.raw_min == 5861);
  BOOST_TEST(p.t.raw_max == 59787);
  BOOST_TEST(p.s.raw_min == -2053);
  BOOST_TEST(p.s.raw_max == 7987);
  // output rounding (0.5e-4 bar) plus a little arithmetic
  BOOST_TEST(r.max_deviation < 0.6e-4);
  BOOST_TEST(r.max_deviation >= 0.4e-4);  // the rounding itself must show
  // every intermediate of random evaluations lies inside the proved bounds
  std::mt19937 rng(3);
  std::uniform_int_distribution<std::int32_t> ur(5861, 59787), ua(-2053, 7987);
  for (int i = 0; i < 20000; ++i) {
    const std::int32_t x = ur(rng), a = ua(rng);
    const double y = eval_fixed(p, x, a) / 1e4;
    BOOST_TEST(std::fabs(y - f.model.eval(x, a / 100.0)) < 0.6e-4);
    BOOST_TEST(static_cast<long double>(eval_fixed(p, x, a)) <= p.out.hi);
    BOOST_TEST(static_cast<long double>(eval_fixed(p, x, a)) >= p.out.lo);
  }
  BOOST_TEST(p.max_abs_product < 4.611686018427387904e18L);  // 2^62
  BOOST_TEST(p.max_abs_acc <= 2147483647.0L);
  const std::string& h = r.header;
  BOOST_TEST(has(h, "FWT_INLINE int32_t fwt_eval_fixed(int32_t raw, int32_t raw_aux)"));
  BOOST_TEST(has(h, "static const int32_t FWT_COEF[FWT_N_COEF]"));
  BOOST_TEST(has(h, "Overflow proof"));
  int st = -1;
  eval_fixed_checked(p, 100, 9000, &st);
  BOOST_TEST(st == kBelowRange + kAuxAboveRange);
}

BOOST_AUTO_TEST_CASE(fixed_point_proof_can_fail) {
  // The proof is re-checked from the plan's integers: a coefficient pushed to
  // the int32 edge, or a shift that is too small, must be caught.
  const auto f = fixture("ptc2d_fixed");
  const ExportResult r = generate_header(firmware_model(f.model), f.meta, f.options);
  BOOST_TEST_REQUIRE(r.ok());
  FixedPlan p = *r.fixed_plan;
  std::string why;
  BOOST_TEST(verify_fixed_bounds(&p, &why));
  FixedPlan bad = p;
  bad.t.mul *= 4;  // t_q four times too large: leaves int32
  BOOST_TEST(!verify_fixed_bounds(&bad, &why));
  BOOST_TEST_MESSAGE("caught: " << why);
  bad = p;
  bad.sh_out[0] = 1;
  BOOST_TEST(!verify_fixed_bounds(&bad, &why));
  BOOST_TEST_MESSAGE("caught: " << why);
}

BOOST_AUTO_TEST_CASE(fixed_with_transforms_is_refused_as_bad_input) {
  auto f = fixture("shntc_float");
  f.options.mode = NumericMode::Fixed;
  const ExportResult r = generate_header(firmware_model(f.model), f.meta, f.options);
  BOOST_TEST((r.status == ExportStatus::InvalidInput));
  BOOST_TEST(has(r.message, "use --numeric float or --numeric double"), r.message);
  BOOST_TEST(r.header.empty());
}

BOOST_AUTO_TEST_CASE(steinhart_hart_float_and_double) {
  for (const char* name : {"shntc_float", "shntc_double"}) {
    const auto f = fixture(name);
    const ExportResult r = generate_header(firmware_model(f.model), f.meta, f.options);
    BOOST_TEST_REQUIRE(r.ok(), r.message);
    BOOST_TEST_MESSAGE(name << ": max deviation " << r.max_deviation << " degC, log allowance "
                            << r.libm_allowance << " degC");
    const bool is_float = r.float_program.has_value();
    BOOST_TEST(r.libm_allowance > 0.0);
    BOOST_TEST(r.max_deviation + r.libm_allowance <= 0.01);
    if (is_float)
      BOOST_TEST(r.max_deviation < 2e-3);
    else
      BOOST_TEST(r.max_deviation < 1e-9);
    const std::string& h = r.header;
    BOOST_TEST(has(h, "#include <math.h>"));
    BOOST_TEST(
        has(h, "needs log()/logf() from the C library (libm;\n * newlib and avr-libc provide it"));
    BOOST_TEST(has(h, is_float ? "#define FWT_LOG(v) logf(v)" : "#define FWT_LOG(v) log(v)"));
    BOOST_TEST(has(h, "FWT_KELVIN_OFFSET"));
    BOOST_TEST(has(h, "FWT_DIVIDER_R"));
    BOOST_TEST(!has(h, "FWT_HAS_AUX"));
    BOOST_TEST(has(h, is_float ? "FWT_INLINE float fwt_eval(float x)"
                               : "FWT_INLINE double fwt_eval(double x)"));
    // the Steinhart-Hart law written out independently, through the divider
    for (double ohm : {1500.0, 3602.0, 10000.0, 32650.0, 90000.0}) {
      const double L = std::log(ohm);
      const double degc =
          1.0 / (1.009249522e-3 + 2.378405444e-4 * L + 2.019202697e-7 * L * L * L) - 273.15;
      const double x = counts_for(ohm);
      const double y =
          is_float
              ? static_cast<double>(eval_program(*r.float_program, static_cast<float>(x), 0.0f))
              : eval_program(*r.double_program, x, 0.0);
      BOOST_TEST(std::fabs(y - degc) < (is_float ? 2e-3 : 1e-9),
                 ohm << " ohm: " << y << " vs " << degc << " degC");
      BOOST_TEST(std::fabs(y - f.model.eval(is_float ? static_cast<float>(x) : x)) <
                 (is_float ? 2e-3 : 1e-9));
    }
  }
}

BOOST_AUTO_TEST_CASE(log_models_report_the_allowance_and_refuse_beyond_it) {
  auto f = fixture("shntc_float");
  const ExportResult ok = generate_header(firmware_model(f.model), f.meta, f.options);
  BOOST_TEST_REQUIRE(ok.ok());
  BOOST_TEST(has(ok.header, "log() allowance:"));
  // a tolerance whose 10 % lies between the measured deviation and
  // deviation + allowance: refused because of the allowance
  const double mid = ok.max_deviation + 0.5 * ok.libm_allowance;
  f.meta.tolerance_abs = mid / 0.1;
  const ExportResult r = generate_header(firmware_model(f.model), f.meta, f.options);
  BOOST_TEST((r.status == ExportStatus::Refused), r.message);
  BOOST_TEST(has(r.message, "log() allowance"));
}

BOOST_AUTO_TEST_CASE(refused_when_float_rounding_exceeds_the_limit) {
  auto f = fixture("ptc2d_float");
  f.meta.tolerance_abs = 1e-6;
  const ExportResult r = generate_header(firmware_model(f.model), f.meta, f.options);
  BOOST_TEST((r.status == ExportStatus::Refused));
  BOOST_TEST(!r.header.empty());
  f.options.mode = NumericMode::Double;
  BOOST_TEST(generate_header(firmware_model(f.model), f.meta, f.options).ok());
}

BOOST_AUTO_TEST_CASE(reading_range_through_the_transforms) {
  const auto m = fwtest::steinhart_hart_model();
  const auto [lo, hi] = raw_reading_range(firmware_model(m));
  BOOST_TEST(lo == counts_for(1000.0), boost::test_tools::tolerance(1e-12));
  BOOST_TEST(hi == counts_for(100000.0), boost::test_tools::tolerance(1e-12));
  auto high = m;
  high.transforms.divider.position = DividerPosition::SensorHigh;
  const auto [lo2, hi2] = raw_reading_range(firmware_model(high));
  BOOST_TEST(lo2 == 4095.0 * 10000.0 / 110000.0, boost::test_tools::tolerance(1e-12));
  BOOST_TEST(hi2 == 4095.0 * 10000.0 / 11000.0, boost::test_tools::tolerance(1e-12));
  // the sensor-high divider exports and evaluates through the same chain
  auto f = fixture("shntc_double");
  f.model = high;
  const ExportResult r = generate_header(firmware_model(f.model), f.meta, f.options);
  BOOST_TEST_REQUIRE(r.ok(), r.message);
  BOOST_TEST(has(r.header, "(FWT_DIVIDER_FULL_SCALE - x)) / x"));
  const double x = 0.5 * (lo2 + hi2);
  BOOST_TEST(std::fabs(eval_program(*r.double_program, x, 0.0) - high.eval(x)) < 1e-9);
}

BOOST_AUTO_TEST_CASE(aux_only_surface_declares_before_statements) {
  // Reading degree 0 (the surface depends on aux only): the reading is unused,
  // and the C89 body must still declare everything before the first statement.
  auto f = fixture("ptc2d_float");
  f.model.terms = {Term{0, 0}, Term{0, 1}};
  f.model.coefficients = {2.0, 0.5};
  for (NumericMode mode : {NumericMode::Float, NumericMode::Fixed}) {
    f.options.mode = mode;
    const ExportResult r = generate_header(firmware_model(f.model), f.meta, f.options);
    BOOST_TEST_REQUIRE(r.ok(), r.message);
    const std::string& h = r.header;
    const std::string decl = mode == NumericMode::Float ? "    float w, v;\n    (void)x;\n"
                                                        : "    int64_t w, acc;\n    (void)raw;\n";
    BOOST_TEST(has(h, decl), h);
    BOOST_TEST(r.max_deviation <= (mode == NumericMode::Float ? 1e-6 : 0.5e-4 + 1e-12));
  }
}
