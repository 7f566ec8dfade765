// Emits the C header for an extended ("surface") model: transforms, an
// optional aux input and the 2-D polynomial by nested Horner's scheme. The
// contract is the 1-D one (docs/firmware-export.md) with the additions listed
// there under "Extended models".
#include <algorithm>
#include <cmath>
#include <cstdio>
#include <limits>
#include <sstream>

#include "export_proof.hpp"
#include "header_common.hpp"
#include "ridgecal/firmware/c_literals.hpp"
#include "ridgecal/firmware/c_text.hpp"
#include "ridgecal/firmware/crc_table.hpp"
#include "ridgecal/firmware/surface_export.hpp"

namespace ridgecal::firmware {

using detail::esc;
using detail::g;
using detail::hex32;
using detail::Names;
using detail::stats_for;

std::pair<double, double> surface_reading_range(const SurfaceModel& m) {
  return raw_reading_range(firmware_model(m));
}

namespace {

struct Proof {
  double max = 0;
  double at_x = 0, at_aux = 0;
  std::size_t points = 0, readings = 0;
  double allowance = 0;  // libm allowance (ln models)
  double limit = 0, tolerance = 0;
  std::string tolerance_source;
};

template <typename T>
std::string lit(T v) {
  if constexpr (std::is_same_v<T, float>)
    return c_float_literal(v);
  else
    return c_double_literal(v);
}

// Largest change of the output when u changes by kLogUlps ulps of T at u.
template <typename T>
double log_allowance_at(const SurfaceModel& m, double x, double aux) {
  const double u = m.transforms.input(x);
  if (!std::isfinite(u)) return 0;
  const T ut = static_cast<T>(u);
  const double ulp =
      static_cast<double>(std::nextafter(ut, std::numeric_limits<T>::infinity()) - ut);
  const double du = kLogUlps * ulp;
  const auto f = [&](double uu) { return m.transforms.output_inverse(m.eval_fitted(uu, aux)); };
  return std::max(std::fabs(f(u + du) - f(u)), std::fabs(f(u - du) - f(u)));
}

template <typename T>
void check_point(const SurfaceModel& m, const FloatingProgram<T>& p, T x, T a, Proof* d) {
  const T y = eval_program(p, x, a);
  const double ref = m.eval(static_cast<double>(x), static_cast<double>(a));
  ++d->points;
  const double e = std::isfinite(y) ? std::fabs(static_cast<double>(y) - ref)
                                    : std::numeric_limits<double>::infinity();
  if (!(e <= d->max)) {
    d->max = e;
    d->at_x = static_cast<double>(x);
    d->at_aux = static_cast<double>(a);
  }
  if (p.ln)
    d->allowance = std::max(d->allowance,
                            log_allowance_at<T>(m, static_cast<double>(x), static_cast<double>(a)));
}

template <typename T>
void measure(const SurfaceModel& m, const FloatingProgram<T>& p, int grid_points,
             const HeaderMeta& meta, Proof* d) {
  const int nr = std::min(grid_points, 801);
  const int na = p.has_aux ? 101 : 1;
  const double xl = static_cast<double>(p.x_lo), xh = static_cast<double>(p.x_hi);
  const double al = static_cast<double>(p.a_lo), ah = static_cast<double>(p.a_hi);
  for (int j = 0; j < na; ++j) {
    const double av = na == 1 ? al : (j + 1 == na ? ah : al + (ah - al) * j / (na - 1));
    const T a = std::fmin(std::fmax(static_cast<T>(av), p.a_lo), p.a_hi);
    for (int i = 0; i < nr; ++i) {
      const double xv = i + 1 == nr ? xh : xl + (xh - xl) * i / (nr - 1);
      const T x = std::fmin(std::fmax(static_cast<T>(xv), p.x_lo), p.x_hi);
      check_point(m, p, x, a, d);
    }
  }
  // calibration points inside the calibrated region; one on its edge is
  // clamped to the inward-rounded limit
  const auto [cx_lo, cx_hi] = surface_reading_range(m);
  for (std::size_t i = 0; i < meta.calibration_readings.size(); ++i) {
    const double r = meta.calibration_readings[i];
    const double av = p.has_aux && i < meta.calibration_aux.size() ? meta.calibration_aux[i] : 0.0;
    if (!std::isfinite(r) || !std::isfinite(av)) continue;
    if (!(r >= std::min(cx_lo, xl) && r <= std::max(cx_hi, xh))) continue;
    if (p.has_aux && !(av >= std::min(m.aux.min, al) && av <= std::max(m.aux.max, ah))) continue;
    const T x = std::fmin(std::fmax(static_cast<T>(r), p.x_lo), p.x_hi);
    const T a = p.has_aux ? std::fmin(std::fmax(static_cast<T>(av), p.a_lo), p.a_hi) : T(0);
    check_point(m, p, x, a, d);
    ++d->readings;
  }
}

void measure_fixed(const SurfaceModel& m, const FixedPlan& p, int grid_points,
                   const HeaderMeta& meta, Proof* d) {
  const auto check = [&](std::int64_t r, std::int64_t ra) {
    const std::int32_t out =
        eval_fixed(p, static_cast<std::int32_t>(r), static_cast<std::int32_t>(ra));
    const double x = static_cast<double>(r) / p.t.scale;
    const double a = p.has_aux ? static_cast<double>(ra) / p.s.scale : 0.0;
    const double e = std::fabs(static_cast<double>(out) / p.output_scale - m.eval(x, a));
    ++d->points;
    if (!(e <= d->max)) {
      d->max = e;
      d->at_x = x;
      d->at_aux = a;
    }
  };
  const auto axis = [](std::int64_t lo, std::int64_t hi, int n) {
    std::vector<std::int64_t> v;
    if (hi - lo + 1 <= n) {
      for (std::int64_t r = lo; r <= hi; ++r) v.push_back(r);
    } else {
      for (int i = 0; i < n; ++i)
        v.push_back(lo + std::llround(static_cast<long double>(i) / (n - 1) *
                                      static_cast<long double>(hi - lo)));
    }
    return v;
  };
  const auto xs = axis(p.t.raw_min, p.t.raw_max, std::min(grid_points, 801));
  const auto as = p.has_aux ? axis(p.s.raw_min, p.s.raw_max, 101) : std::vector<std::int64_t>{0};
  for (std::int64_t a : as)
    for (std::int64_t x : xs) check(x, a);
  for (std::size_t i = 0; i < meta.calibration_readings.size(); ++i) {
    const double r = std::nearbyint(meta.calibration_readings[i] * p.t.scale);
    const double av = p.has_aux && i < meta.calibration_aux.size()
                          ? std::nearbyint(meta.calibration_aux[i] * p.s.scale)
                          : 0.0;
    if (!std::isfinite(r) || !std::isfinite(av)) continue;
    if (r < static_cast<double>(p.t.raw_min) || r > static_cast<double>(p.t.raw_max)) continue;
    if (p.has_aux &&
        (av < static_cast<double>(p.s.raw_min) || av > static_cast<double>(p.s.raw_max)))
      continue;
    check(static_cast<std::int64_t>(r), static_cast<std::int64_t>(av));
    ++d->readings;
  }
}

std::string term_name(int k, int l, bool has_aux) {
  std::string s = "t^" + std::to_string(k);
  if (has_aux) s += " s^" + std::to_string(l);
  return s;
}

std::string range_text(const IntRange& r) {
  char buf[96];
  std::snprintf(buf, sizeof buf, "[%.0Lf, %.0Lf]", r.lo, r.hi);
  return buf;
}

// ---- banner and prologue -------------------------------------------------------------

void emit_banner(std::ostringstream& o, const Names& n, const SurfaceModel& model,
                 const HeaderMeta& meta, const ExportOptions& opt, const Proof& proof,
                 const std::string& formats, bool needs_log) {
  const std::string ru = esc(meta.reading_unit, 40), fu = esc(meta.reference_unit, 40),
                    au = esc(meta.aux_unit, 40);
  const auto [xlo, xhi] = surface_reading_range(model);
  o << "/* ==========================================================================\n"
    << " * GENERATED FILE -- DO NOT EDIT.\n"
    << " * Written by " << esc(meta.tool_version.empty() ? "ridgecal" : meta.tool_version, 60)
    << " (ridgecal export). Regenerate it from the calibration record\n"
    << " * instead of editing: the coefficient CRC and the QA figures below would no\n"
    << " * longer match.\n"
    << " * Header format version " << kHeaderFormatVersion << " (" << n.P << "_FORMAT_VERSION).\n"
    << " * ==========================================================================\n"
    << " *\n"
    << " * Calibration QA (extended model" << (model.has_aux ? ", second input aux" : "")
    << (model.transforms.identity() ? "" : ", transforms") << ")\n"
    << " *   sensor:              " << esc(meta.sensor_name) << "\n"
    << " *   reading unit:        " << ru << "\n"
    << " *   reference unit:      " << fu << "\n";
  if (model.has_aux) o << " *   aux unit:            " << au << "\n";
  o << " *   transforms:          " << esc(model.transforms.describe(), 160) << "\n"
    << " *   calibrated reading:  [" << g(xlo, 9) << ", " << g(xhi, 9) << "] " << ru;
  if (!model.transforms.identity())
    o << "\n *                        (transformed: [" << g(model.input.min, 9) << ", "
      << g(model.input.max, 9) << "])";
  o << "\n";
  if (model.has_aux)
    o << " *   calibrated aux:      [" << g(model.aux.min, 9) << ", " << g(model.aux.max, 9) << "] "
      << au << "\n";
  o << " *   terms, degrees:      " << model.terms.size() << " terms (" << to_string(model.basis)
    << " basis), reading degree " << model.reading_degree();
  if (model.has_aux) o << ", aux degree " << model.aux_degree();
  o << "\n"
    << " *   lambda:              " << g(meta.lambda) << "\n"
    << " *   validation:          RMSE " << g(meta.validation_rmse) << ", max |error| "
    << g(meta.validation_max_abs_error) << " " << fu << "\n"
    << " *   test:                RMSE " << g(meta.test_rmse) << ", max |error| "
    << g(meta.test_max_abs_error) << " " << fu << "\n"
    << " *   tolerance:           " << esc(meta.tolerance_description) << "\n"
    << " *   tolerance used:      " << g(proof.tolerance) << " " << fu << " ("
    << proof.tolerance_source << ")\n"
    << " *   result:              " << esc(meta.pass_fail, 400) << "\n"
    << " *   record SHA-256:      " << esc(meta.record_sha256, 80) << "\n"
    << " *   tool version:        " << esc(meta.tool_version, 60) << "\n"
    << " *\n"
    << " * Export proof (evaluated at export time by a host emulation of the\n"
    << " * arithmetic below over a grid of (reading" << (model.has_aux ? ", aux" : "")
    << ") points, compared with the double-precision model)\n"
    << " *   numeric mode:        " << to_string(opt.mode) << "\n"
    << " *   number formats:      " << formats << "\n"
    << " *   inputs checked:      " << proof.points << " (" << proof.readings
    << " of them calibration points)\n"
    << " *   max deviation:       " << g(proof.max, 4) << " " << fu << " at reading "
    << g(proof.at_x, 9);
  if (model.has_aux) o << ", aux " << g(proof.at_aux, 9);
  o << "\n";
  if (needs_log)
    o << " *   log() allowance:     " << g(proof.allowance, 4) << " " << fu
      << " (a target C library whose log/logf\n"
      << " *                        differs from the host's by up to " << g(kLogUlps)
      << " ulps, propagated)\n"
      << " *   bound on a target:   " << g(proof.max + proof.allowance, 4) << " " << fu
      << " (max deviation + log() allowance)\n";
  o << " *   allowed deviation:   " << g(proof.limit, 4) << " " << fu << " ("
    << g(opt.max_deviation_fraction) << " x tolerance used)\n"
    << " *\n"
    << " * CAUTION: this header reproduces a fitted calibration surface, nothing more,\n"
    << " * and only inside the calibrated region of every input. Where the measurement\n"
    << " * is safety-relevant (medical, legal metrology, gas, pressure, process\n"
    << " * safety, ...) calibration, verification and release of the instrument must\n"
    << " * follow local codes and certified procedures; the QA figures above do not\n"
    << " * replace them.\n"
    << " *\n"
    << " * Build requirement: compile every file that includes this header with\n"
    << " * -ffp-contract=off and never with -ffast-math / -Ofast. GCC ignores\n"
    << " * '#pragma STDC FP_CONTRACT OFF' (used below for other compilers), and a\n"
    << " * fused multiply-add changes the last bits of the float/double results.\n";
  if (needs_log)
    o << " * Uses <stdint.h> and <math.h>: needs log()/logf() from the C library (libm;\n"
      << " * newlib and avr-libc provide it; link with -lm). No malloc, no other libc calls.\n"
      << " * log/logf results may differ by a few ulps between C libraries, so results\n"
      << " * agree with the export proof within the bound above, not bit for bit.\n";
  else
    o << " * Uses <stdint.h> only: no libm, no malloc, no libc calls.\n";
  o << " */\n";
}

void emit_prologue(std::ostringstream& o, const Names& n, const SurfaceModel& model,
                   const ExportOptions& opt, int K, int L, std::uint32_t crc, bool needs_log) {
  const std::string guard = n.P + "_RIDGECAL_CALIBRATION_H";
  o << "#ifndef " << guard << "\n#define " << guard << "\n\n#include <stdint.h>\n";
  if (needs_log) o << "#include <math.h>\n";
  o << "\n#define " << n.P << "_FORMAT_VERSION " << kHeaderFormatVersion << "\n"
    << "#define " << n.P << "_NUMERIC_" << macro_case(to_string(opt.mode)) << " 1\n"
    << "#define " << n.P
    << "_EXTENDED_MODEL 1 /* transforms and/or aux input: see the functions */\n";
  if (model.has_aux)
    o << "#define " << n.P << "_HAS_AUX 1 /* the functions take (reading, aux) */\n";
  o << "#define " << n.P << "_READING_DEGREE " << K << "\n"
    << "#define " << n.P << "_AUX_DEGREE " << L << "\n"
    << "#define " << n.P << "_N_COEF " << (K + 1) * (L + 1)
    << " /* (READING_DEGREE + 1) * (AUX_DEGREE + 1) */\n"
    << "/* CRC-32 (IEEE: reflected 0xEDB88320, init and xorout 0xFFFFFFFF) over the\n"
    << "   bit patterns of " << n.P << "_COEF[0.." << (K + 1) * (L + 1) - 1
    << "], each least significant byte\n   first; see " << n.p << "_table_crc32(). */\n"
    << "#define " << n.P << "_TABLE_CRC32 " << hex32(crc) << "\n\n"
    << "/* Status codes of the range-checked evaluation"
    << (model.has_aux ? ": the reading's code plus the aux input's code" : "") << " */\n"
    << "#define " << n.P << "_IN_RANGE 0     /* input inside the valid range */\n"
    << "#define " << n.P << "_BELOW_RANGE 1  /* reading below: evaluated at the lower limit */\n"
    << "#define " << n.P << "_ABOVE_RANGE 2  /* reading above: evaluated at the upper limit */\n"
    << "#define " << n.P << "_NOT_A_NUMBER 3 /* NaN reading: evaluated at the lower limit */\n";
  if (model.has_aux)
    o << "#define " << n.P << "_AUX_BELOW_RANGE 4  /* aux below: evaluated at its lower limit */\n"
      << "#define " << n.P << "_AUX_ABOVE_RANGE 8  /* aux above: evaluated at its upper limit */\n"
      << "#define " << n.P << "_AUX_NOT_A_NUMBER 12 /* NaN aux: evaluated at its lower limit */\n"
      << "/* e.g. status & 3 is the reading's code, status & 12 the aux input's. */\n";
  detail::emit_table_codes_and_linkage(o, n);
}

// ---- float / double ------------------------------------------------------------------

template <typename T>
void emit_floating_body(std::ostringstream& o, const Names& n, const FloatingProgram<T>& p,
                        const SurfaceModel& model, const HeaderMeta& meta, const Proof& proof) {
  constexpr bool is_float = std::is_same_v<T, float>;
  const char* type = is_float ? "float" : "double";
  const std::string ru = esc(meta.reading_unit, 40), fu = esc(meta.reference_unit, 40),
                    au = esc(meta.aux_unit, 40);
  const int K = p.reading_degree, L = p.aux_degree;
  const std::string P = n.P;
  o << "/* Valid reading range (" << ru << "), the calibrated range rounded inward to " << type
    << ". */\n"
    << "#define " << P << "_X_MIN " << lit(p.x_lo) << "\n"
    << "#define " << P << "_X_MAX " << lit(p.x_hi) << "\n";
  if (p.has_aux)
    o << "/* Valid aux range (" << au << "), rounded inward. */\n"
      << "#define " << P << "_AUX_MIN " << lit(p.a_lo) << "\n"
      << "#define " << P << "_AUX_MAX " << lit(p.a_hi) << "\n";
  if (p.divider)
    o << "/* Divider (" << to_string(model.transforms.divider.position)
      << "): " << (p.sensor_low ? "r = R * x / (FULL_SCALE - x)" : "r = R * (FULL_SCALE - x) / x")
      << ", ohms. */\n"
      << "#define " << P << "_DIVIDER_R " << lit(p.divider_r) << "\n"
      << "#define " << P << "_DIVIDER_FULL_SCALE " << lit(p.divider_fs) << "\n";
  if (p.ln) {
    if (is_float)
      o << "/* logf is C99; a C89 compiler gets log() rounded to float (within the bound). */\n"
        << "#if defined(__cplusplus) || (defined(__STDC_VERSION__) && __STDC_VERSION__ >= "
           "199901L)\n"
        << "#define " << P << "_LOG(v) logf(v)\n#else\n"
        << "#define " << P << "_LOG(v) ((float)log((double)(v)))\n#endif\n";
    else
      o << "#define " << P << "_LOG(v) log(v)\n";
  }
  o << "/* Scaled variables: t = (u - " << P << "_T_CENTER) * " << P << "_T_SCALE"
    << (p.has_aux ? ", s = (aux - " + P + "_S_CENTER) * " + P + "_S_SCALE" : std::string()) << ",\n"
    << "   in [-1, 1] on the calibrated region (u = the transformed reading). */\n"
    << "#define " << P << "_T_CENTER " << lit(p.center) << "\n"
    << "#define " << P << "_T_SCALE " << lit(p.inv_half_width) << "\n";
  if (p.has_aux)
    o << "#define " << P << "_S_CENTER " << lit(p.aux_center) << "\n"
      << "#define " << P << "_S_SCALE " << lit(p.aux_inv_half_width) << "\n";
  if (p.reciprocal_kelvin)
    o << "/* Inverse reference transform: reference = 1 / v - KELVIN_OFFSET (degC). */\n"
      << "#define " << P << "_KELVIN_OFFSET " << lit(p.kelvin) << "\n";
  o << "\n/* Coefficients m[k][l] of v = sum_k t^k (sum_l m[k][l] s^l), entry k * (AUX_DEGREE + 1) "
       "+ l, "
    << type << ". */\n"
    << "static const " << type << " " << P << "_COEF[" << P << "_N_COEF] = {\n";
  const int N = (K + 1) * (L + 1);
  for (int k = 0; k <= K; ++k)
    for (int l = 0; l <= L; ++l) {
      const int i = k * (L + 1) + l;
      o << "    " << lit(p.coef[static_cast<std::size_t>(i)]) << (i + 1 < N ? "," : " ") << " /* "
        << term_name(k, l, p.has_aux) << " */\n";
    }
  o << "};\n\n";

  const std::string args =
      std::string(type) + " x" + (p.has_aux ? std::string(", ") + type + " aux" : "");
  o << "/* " << n.p << "_eval: reference value (" << fu << ") for reading x (" << ru << ")"
    << (p.has_aux ? " and aux (" + au + ")" : std::string()) << ".\n"
    << " * Computes: " << (p.divider ? "divider -> " : "") << (p.ln ? "ln -> " : "")
    << "scaling -> nested Horner v = sum_k t^k (sum_l m[k][l] s^l)"
    << (p.reciprocal_kelvin ? " -> 1/v - 273.15" : "") << ".\n"
    << " * Precision: " << (is_float ? "IEEE 754 binary32 (float)" : "IEEE 754 binary64 (double)")
    << " throughout, one rounding per operation\n"
    << " *   (no fused multiply-add: build with -ffp-contract=off)"
    << (p.ln ? (is_float ? ", ln by logf (C library)" : ", ln by log (C library)") : "") << ".\n"
    << " * Range: [" << P << "_X_MIN, " << P << "_X_MAX]"
    << (p.has_aux ? " x [" + P + "_AUX_MIN, " + P + "_AUX_MAX]" : std::string())
    << "; outside it the result is an\n"
    << " *   unchecked extrapolation -- use " << n.p << "_eval_checked() for untrusted input.\n"
    << " * Measured max |error| against the double-precision model: " << g(proof.max, 4) << " "
    << fu << "\n"
    << " *   (" << proof.points << " inputs over the region, calibration points included"
    << (p.ln ? "; on a target add the log() allowance " + g(proof.allowance, 3) + " " + fu
             : std::string())
    << "). */\n"
    << n.P << "_INLINE " << type << " " << n.p << "_eval(" << args << ")\n{\n"
    << "#if !defined(__GNUC__) || defined(__clang__)\n#pragma STDC FP_CONTRACT OFF\n#endif\n";
  const bool need_u = K > 0;
  // declarations first (C89), then the (void) casts of unused inputs
  if (need_u) o << "    " << type << " u, t;\n";
  if (p.has_aux && L > 0) o << "    " << type << " s;\n";
  o << "    " << type << " w, v;\n";
  if (!need_u) o << "    (void)x;\n";
  if (p.has_aux && L == 0) o << "    (void)aux;\n";
  if (need_u) {
    if (p.divider) {
      if (p.sensor_low)
        o << "    u = (" << P << "_DIVIDER_R * x) / (" << P << "_DIVIDER_FULL_SCALE - x);\n";
      else
        o << "    u = (" << P << "_DIVIDER_R * (" << P << "_DIVIDER_FULL_SCALE - x)) / x;\n";
    } else {
      o << "    u = x;\n";
    }
    if (p.ln) o << "    u = " << P << "_LOG(u);\n";
    o << "    t = (u - " << P << "_T_CENTER) * " << P << "_T_SCALE;\n";
  }
  if (p.has_aux && L > 0) o << "    s = (aux - " << P << "_S_CENTER) * " << P << "_S_SCALE;\n";
  for (int k = K; k >= 0; --k) {
    const int row = k * (L + 1);
    o << "    w = " << P << "_COEF[" << row + L << "];\n";
    for (int l = L - 1; l >= 0; --l) o << "    w = w * s + " << P << "_COEF[" << row + l << "];\n";
    if (k == K)
      o << "    v = w;\n";
    else
      o << "    v = v * t + w;\n";
  }
  if (p.reciprocal_kelvin)
    o << "    v = " << (is_float ? "1.0f" : "1.0") << " / v - " << P << "_KELVIN_OFFSET;\n";
  o << "    return v;\n}\n\n";

  // checked variant
  o << "/* " << n.p << "_eval_checked: as " << n.p << "_eval, but never extrapolates.\n"
    << " * A reading outside [" << P << "_X_MIN, " << P
    << "_X_MAX] (or NaN) is clamped to the nearest\n"
    << " * limit (NaN: lower limit)"
    << (p.has_aux ? ", and so is aux to [" + P + "_AUX_MIN, " + P + "_AUX_MAX]" : std::string())
    << ";\n"
    << " * *status (if status is not NULL) is set to " << P
    << "_IN_RANGE, _BELOW_RANGE, _ABOVE_RANGE\n"
    << " * or _NOT_A_NUMBER"
    << (p.has_aux ? " for the reading, plus " + P +
                        "_AUX_BELOW_RANGE, _AUX_ABOVE_RANGE or\n * _AUX_NOT_A_NUMBER for aux"
                  : std::string())
    << ". Precision as " << n.p << "_eval. */\n"
    << n.P << "_INLINE " << type << " " << n.p << "_eval_checked(" << args << ", int *status)\n{\n"
    << "    int st;\n"
    << "    if (x >= " << P << "_X_MIN && x <= " << P << "_X_MAX) {\n        st = " << P
    << "_IN_RANGE;\n"
    << "    } else if (x < " << P << "_X_MIN) {\n        st = " << P
    << "_BELOW_RANGE;\n        x = " << P << "_X_MIN;\n"
    << "    } else if (x > " << P << "_X_MAX) {\n        st = " << P
    << "_ABOVE_RANGE;\n        x = " << P << "_X_MAX;\n"
    << "    } else { /* NaN: every comparison above is false */\n        st = " << P
    << "_NOT_A_NUMBER;\n        x = " << P << "_X_MIN;\n    }\n";
  if (p.has_aux)
    o << "    if (aux >= " << P << "_AUX_MIN && aux <= " << P
      << "_AUX_MAX) {\n        /* in range */\n"
      << "    } else if (aux < " << P << "_AUX_MIN) {\n        st += " << P
      << "_AUX_BELOW_RANGE;\n        aux = " << P << "_AUX_MIN;\n"
      << "    } else if (aux > " << P << "_AUX_MAX) {\n        st += " << P
      << "_AUX_ABOVE_RANGE;\n        aux = " << P << "_AUX_MAX;\n"
      << "    } else {\n        st += " << P << "_AUX_NOT_A_NUMBER;\n        aux = " << P
      << "_AUX_MIN;\n    }\n";
  o << "    if (status != 0)\n        *status = st;\n"
    << "    return " << n.p << "_eval(x" << (p.has_aux ? ", aux" : "") << ");\n}\n\n";
}

// ---- fixed ---------------------------------------------------------------------------

void emit_fixed_body(std::ostringstream& o, const Names& n, const FixedPlan& p,
                     const HeaderMeta& meta, const Proof& proof) {
  const std::string ru = esc(meta.reading_unit, 40), fu = esc(meta.reference_unit, 40),
                    au = esc(meta.aux_unit, 40);
  const std::string P = n.P;
  const int K = p.reading_degree, L = p.aux_degree;
  o << "/* Valid raw reading range (integers; reading = raw / " << g(p.t.scale, 9) << " " << ru
    << "). */\n"
    << "#define " << P << "_RAW_MIN " << c_int32_literal(static_cast<std::int32_t>(p.t.raw_min))
    << "\n"
    << "#define " << P << "_RAW_MAX " << c_int32_literal(static_cast<std::int32_t>(p.t.raw_max))
    << "\n";
  if (p.has_aux)
    o << "/* Valid raw aux range (integers; aux = raw_aux / " << g(p.s.scale, 9) << " " << au
      << "). */\n"
      << "#define " << P << "_AUX_RAW_MIN "
      << c_int32_literal(static_cast<std::int32_t>(p.s.raw_min)) << "\n"
      << "#define " << P << "_AUX_RAW_MAX "
      << c_int32_literal(static_cast<std::int32_t>(p.s.raw_max)) << "\n";
  o << "/* Output unit: 1 / " << g(p.output_scale, 9) << " " << fu
    << " (output = round(reference * " << g(p.output_scale, 9) << ")). */\n\n"
    << "/* Coefficients m[k][l] * " << g(p.output_scale, 9)
    << " of v = sum_k t^k (sum_l m[k][l] s^l), entry k * (AUX_DEGREE + 1) + l,\n"
    << "   each in Q(q) (value * 2^q, q in the comment). */\n"
    << "static const int32_t " << P << "_COEF[" << P << "_N_COEF] = {\n";
  const int N = (K + 1) * (L + 1);
  for (int i = 0; i < N; ++i)
    o << "    " << c_int32_literal(p.coef[static_cast<std::size_t>(i)]) << (i + 1 < N ? "," : " ")
      << " /* " << term_name(i / (L + 1), i % (L + 1), p.has_aux) << ", Q"
      << p.q[static_cast<std::size_t>(i)] << " */\n";
  o << "};\n\n";
  o << "/* floor((v + 2^(s-1)) / 2^s), i.e. v / 2^s rounded half up, for\n"
    << "   -2^62 <= v + 2^(s-1) < 2^62 and 1 <= s <= 61. Only a non-negative value is\n"
    << "   shifted (v is offset by 2^62 first), so the result does not depend on how\n"
    << "   the compiler shifts negative numbers (implementation-defined in C). */\n"
    << P << "_INLINE int64_t " << n.p << "_rshift_round(int64_t v, unsigned s)\n{\n"
    << "    const int64_t bias = (int64_t)1 << 62;\n"
    << "    const uint64_t biased = (uint64_t)(v + bias + ((int64_t)1 << (s - 1U)));\n"
    << "    return (int64_t)(biased >> s) - (bias >> s);\n}\n\n";
  const std::string args = std::string("int32_t raw") + (p.has_aux ? ", int32_t raw_aux" : "");
  o << "/* " << n.p << "_eval_fixed: round(reference * " << g(p.output_scale, 9) << ") as int32 (1/"
    << g(p.output_scale, 9) << " " << fu << ")\n"
    << " * for a raw integer reading in [" << P << "_RAW_MIN, " << P << "_RAW_MAX]"
    << (p.has_aux ? " and raw aux in [" + P + "_AUX_RAW_MIN, " + P + "_AUX_RAW_MAX]"
                  : std::string())
    << ".\n"
    << " * Precision: integer only -- int32 coefficients, int64 intermediates, every\n"
    << " * shift rounds half up; output resolution 1/" << g(p.output_scale, 9) << " " << fu << ".\n"
    << " * t_q = t * 2^" << p.t.frac << " = rshift_round((raw - " << p.t.r0 << ") * " << p.t.mul
    << " + " << p.t.add << ", " << p.t.shift << ")\n";
  if (p.has_aux)
    o << " * s_q = s * 2^" << p.s.frac << " = rshift_round((raw_aux - " << p.s.r0 << ") * "
      << p.s.mul << " + " << p.s.add << ", " << p.s.shift << ")\n";
  o << " * Overflow proof (exact integer interval arithmetic over the whole raw\n"
    << " * range" << (p.has_aux ? "s" : "") << "; every value is a proved bound):\n"
    << " *   t_q in " << range_text(p.t.q) << "\n";
  if (p.has_aux) o << " *   s_q in " << range_text(p.s.q) << "\n";
  char buf[160];
  std::snprintf(buf, sizeof buf,
                " *   every product |acc * t_q|, |w * s_q| <= %.0Lf (< 2^62)\n"
                " *   every accumulator |acc|, |w| <= %.0Lf (< 2^31)\n",
                p.max_abs_product, p.max_abs_acc);
  o << buf << " *   output in " << range_text(p.out) << "\n"
    << " * Measured max |error| against the double-precision model, output rounding\n"
    << " * included: " << g(proof.max, 4) << " " << fu << " (" << proof.points
    << " raw input pairs checked). Outside the raw range" << (p.has_aux ? "s" : "") << " the\n"
    << " * bounds do not hold: use " << n.p << "_eval_fixed_checked() for untrusted input. */\n"
    << P << "_INLINE int32_t " << n.p << "_eval_fixed(" << args << ")\n{\n";
  if (K > 0)
    o << "    const int64_t t = " << n.p << "_rshift_round(((int64_t)raw - "
      << c_int64_literal(p.t.r0) << ") * " << c_int64_literal(p.t.mul) << " + "
      << c_int64_literal(p.t.add) << ", " << p.t.shift << "U);\n";
  if (p.has_aux && L > 0)
    o << "    const int64_t s = " << n.p << "_rshift_round(((int64_t)raw_aux - "
      << c_int64_literal(p.s.r0) << ") * " << c_int64_literal(p.s.mul) << " + "
      << c_int64_literal(p.s.add) << ", " << p.s.shift << "U);\n";
  o << "    int64_t w, acc;\n";
  if (K == 0) o << "    (void)raw;\n";
  if (p.has_aux && L == 0) o << "    (void)raw_aux;\n";
  for (int k = K; k >= 0; --k) {
    const int row = k * (L + 1);
    o << "    w = (int64_t)" << P << "_COEF[" << row + L << "];\n";
    for (int l = L - 1; l >= 0; --l)
      o << "    w = " << n.p << "_rshift_round(w * s, "
        << p.sh_in[static_cast<std::size_t>(k * L + l)] << "U) + " << P << "_COEF[" << row + l
        << "];\n";
    if (k == K)
      o << "    acc = w;\n";
    else
      o << "    acc = " << n.p << "_rshift_round(acc * t, " << p.sh_out[static_cast<std::size_t>(k)]
        << "U) + w;\n";
  }
  if (p.q[0] > 0)
    o << "    return (int32_t)" << n.p << "_rshift_round(acc, " << p.q[0] << "U);\n}\n\n";
  else
    o << "    return (int32_t)acc;\n}\n\n";

  o << "/* " << n.p << "_eval_fixed_checked: as " << n.p
    << "_eval_fixed, but never leaves the raw range" << (p.has_aux ? "s" : "") << ":\n"
    << " * raw outside [" << P << "_RAW_MIN, " << P << "_RAW_MAX] is clamped to the nearest limit"
    << (p.has_aux ? ", and so is\n * raw_aux to [" + P + "_AUX_RAW_MIN, " + P + "_AUX_RAW_MAX]"
                  : std::string())
    << ";\n"
    << " * *status (if status is not NULL) is set to " << P
    << "_IN_RANGE, _BELOW_RANGE or _ABOVE_RANGE"
    << (p.has_aux ? "\n * plus " + P + "_AUX_BELOW_RANGE or _AUX_ABOVE_RANGE" : std::string())
    << ". Precision as " << n.p << "_eval_fixed. */\n"
    << P << "_INLINE int32_t " << n.p << "_eval_fixed_checked(" << args << ", int *status)\n{\n"
    << "    int st = " << P << "_IN_RANGE;\n"
    << "    if (raw < " << P << "_RAW_MIN) {\n        st = " << P
    << "_BELOW_RANGE;\n        raw = " << P << "_RAW_MIN;\n"
    << "    } else if (raw > " << P << "_RAW_MAX) {\n        st = " << P
    << "_ABOVE_RANGE;\n        raw = " << P << "_RAW_MAX;\n    }\n";
  if (p.has_aux)
    o << "    if (raw_aux < " << P << "_AUX_RAW_MIN) {\n        st += " << P
      << "_AUX_BELOW_RANGE;\n        raw_aux = " << P << "_AUX_RAW_MIN;\n"
      << "    } else if (raw_aux > " << P << "_AUX_RAW_MAX) {\n        st += " << P
      << "_AUX_ABOVE_RANGE;\n        raw_aux = " << P << "_AUX_RAW_MAX;\n    }\n";
  o << "    if (status != 0)\n        *status = st;\n"
    << "    return " << n.p << "_eval_fixed(raw" << (p.has_aux ? ", raw_aux" : "") << ");\n}\n\n";
}

}  // namespace

SurfaceExportResult generate_surface_header(const SurfaceModel& model, const HeaderMeta& meta,
                                            const ExportOptions& opt) {
  SurfaceExportResult sr;
  ExportResult& r = sr.common;
  r.status = ExportStatus::InvalidInput;
  if (std::string m = opt.validate(); !m.empty()) {
    r.message = m;
    return sr;
  }
  if (model.terms.empty() || model.coefficients.size() != model.terms.size()) {
    r.message = "model: no coefficients (or not one per term)";
    return sr;
  }
  if (model.reading_degree() > 30 || model.aux_degree() > 30) {
    r.message = "model: a degree exceeds 30";
    return sr;
  }
  for (double c : model.coefficients)
    if (!std::isfinite(c)) {
      r.message = "model: non-finite coefficient";
      return sr;
    }
  const auto axis_ok = [](const AxisScaling& a) {
    return std::isfinite(a.min) && std::isfinite(a.max) && a.max > a.min &&
           std::isfinite(a.center) && std::isfinite(a.half_width) && a.half_width > 0;
  };
  if (!axis_ok(model.input) || (model.has_aux && !axis_ok(model.aux))) {
    r.message = "model: calibrated range must satisfy min < max (both finite) for every input";
    return sr;
  }
  if (std::string e = model.transforms.validate(); !e.empty()) {
    r.message = "model: " + e;
    return sr;
  }
  const bool needs_log =
      model.transforms.reading == ReadingTransform::Ln && opt.mode != NumericMode::Fixed;
  if (opt.mode == NumericMode::Fixed && !model.transforms.identity()) {
    r.message =
        "fixed point: the model has transforms (" + model.transforms.describe() +
        "); the integer-only header supports the plain polynomial in (reading, aux) only -- "
        "use --numeric float or --numeric double";
    return sr;
  }
  Proof proof;
  detail::ProofTolerance pt;
  if (!detail::start_result(meta, opt, r, pt)) return sr;
  proof.tolerance = pt.tolerance;
  proof.tolerance_source = pt.source;
  proof.limit = pt.limit;

  const Names n{opt.prefix, macro_case(opt.prefix)};
  std::ostringstream body;
  std::string formats;
  std::uint32_t crc = 0;
  int K = 0, L = 0;
  if (opt.mode == NumericMode::Float || opt.mode == NumericMode::Double) {
    const bool is_float = opt.mode == NumericMode::Float;
    const std::string fmt_name = is_float ? "IEEE binary32" : "IEEE binary64";
    formats =
        fmt_name + ", nested Horner in scaled t" + (model.has_aux ? ", s" : "") +
        (needs_log ? std::string(", ln by ") + (is_float ? "logf" : "log") + " (C library)" : "");
    int terms_ops = 0;
    if (is_float) {
      auto p = detail::make_program<float>(firmware_model(model), Basis::ScaledT);
      if (!p) {
        r.message = "model: a constant does not fit in float";
        return sr;
      }
      measure(model, *p, opt.grid_points, meta, &proof);
      sr.float_program = p;
      K = p->reading_degree;
      L = p->aux_degree;
      crc = crc32_bytes(table_bytes(p->coef));
      emit_floating_body(body, n, *p, model, meta, proof);
      detail::emit_crc(body, n, "float", 4, n.P + "_N_COEF");
    } else {
      auto p = detail::make_program<double>(firmware_model(model), Basis::ScaledT);
      if (!p) {
        r.message = "model: a constant does not fit in double";
        return sr;
      }
      measure(model, *p, opt.grid_points, meta, &proof);
      sr.double_program = p;
      K = p->reading_degree;
      L = p->aux_degree;
      crc = crc32_bytes(table_bytes(p->coef));
      emit_floating_body(body, n, *p, model, meta, proof);
      detail::emit_crc(body, n, "double", 8, n.P + "_N_COEF");
    }
    terms_ops = (K + 1) * L + K;
    const int tr_mul = (model.transforms.divider.enabled ? 2 : 0) + 1 + (model.has_aux ? 1 : 0) +
                       (model.transforms.reference == ReferenceTransform::ReciprocalKelvin ? 1 : 0);
    const int tr_add = (model.transforms.divider.enabled ? 1 : 0) + 1 + (model.has_aux ? 1 : 0) +
                       (model.transforms.reference == ReferenceTransform::ReciprocalKelvin ? 1 : 0);
    r.stats =
        stats_for("", (K + 1) * (L + 1), is_float ? 4 : 8, terms_ops + tr_mul, terms_ops + tr_add);
  } else {
    FixedPlan plan;
    std::string why;
    if (!plan_fixed(firmware_model(model), opt, &plan, &why)) {
      r.message = "fixed point: " + why;
      return sr;
    }
    measure_fixed(model, plan, opt.grid_points, meta, &proof);
    sr.fixed_plan = plan;
    K = plan.reading_degree;
    L = plan.aux_degree;
    formats = "int32 coefficients (Q per entry), t in Q" + std::to_string(plan.t.frac) +
              (plan.has_aux ? ", s in Q" + std::to_string(plan.s.frac) : std::string()) +
              ", int64 intermediates, output = round(y * " + g(plan.output_scale, 9) + ") int32";
    crc = crc32_bytes(table_bytes(plan.coef));
    emit_fixed_body(body, n, plan, meta, proof);
    detail::emit_crc(body, n, "int32_t", 4, n.P + "_N_COEF");
    const int ops = (K + 1) * L + K;
    r.stats = stats_for("", (K + 1) * (L + 1), 4, ops + 2, 2 * ops + 4);
  }
  sr.libm_allowance = proof.allowance;

  std::ostringstream o;
  emit_banner(o, n, model, meta, opt, proof, formats, needs_log);
  emit_prologue(o, n, model, opt, K, L, crc, needs_log);
  o << body.str();
  detail::emit_epilogue(o, n);

  detail::finish_result(r, o.str(), crc, formats,
                        {proof.max, proof.at_x, proof.points, proof.readings});
  sr.deviation_at_aux = proof.at_aux;
  const double bound = proof.max + proof.allowance;
  const std::string where = " at reading " + g(proof.at_x, 9) +
                            (model.has_aux ? ", aux " + g(proof.at_aux, 9) : std::string());
  if (!(bound <= proof.limit)) {
    r.status = ExportStatus::Refused;
    r.message = "refused: max deviation " + g(proof.max, 4) + where +
                (needs_log ? " (+ log() allowance " + g(proof.allowance, 3) + ")" : std::string()) +
                " exceeds " + g(opt.max_deviation_fraction) + " x tolerance (" +
                g(proof.tolerance) + ", " + proof.tolerance_source + ") = " + g(proof.limit, 4) +
                " in " + to_string(opt.mode) + " mode";
    return sr;
  }
  r.status = ExportStatus::Ok;
  r.message = to_string(opt.mode) + " header (extended model): max deviation " + g(proof.max, 4) +
              (needs_log ? " + log() allowance " + g(proof.allowance, 3) : std::string()) +
              " <= " + g(proof.limit, 4) + " over " + std::to_string(proof.points) + " inputs";
  return sr;
}

}  // namespace ridgecal::firmware
