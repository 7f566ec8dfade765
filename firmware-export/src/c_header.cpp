// Emits the C header text (the versioned contract in docs/firmware-export.md).
#include <algorithm>
#include <cmath>
#include <cstdio>
#include <sstream>
#include <utility>

#include "export_proof.hpp"
#include "header_common.hpp"
#include "ridgecal/firmware/c_literals.hpp"
#include "ridgecal/firmware/c_text.hpp"
#include "ridgecal/firmware/crc_table.hpp"
#include "ridgecal/firmware/export.hpp"

namespace ridgecal::firmware {

namespace detail {

std::string g(double v, int digits) {
  if (std::isnan(v)) return "n/a";
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.*g", digits, v);
  return buf;
}

std::string hex32(std::uint32_t v) {
  char buf[16];
  std::snprintf(buf, sizeof buf, "0x%08lXUL", static_cast<unsigned long>(v));
  return buf;
}

std::string esc(const std::string& s, std::size_t max_chars) {
  return s.empty() ? std::string("(not given)") : escape_c_comment(s, max_chars);
}

void emit_crc(std::ostringstream& o, const Names& n, const char* elem_type, int bytes,
              const std::string& count_expr) {
  const bool is_double = std::string(elem_type) == "double";
  const bool is_float = std::string(elem_type) == "float";
  o << "/* CRC-32 of the coefficient table as stored in this program's memory.\n"
    << "   Byte order: each entry's " << bytes * 8 << "-bit pattern ("
    << (is_float || is_double ? "IEEE 754" : "two's complement")
    << "), least significant\n   byte first, entries in index order -- the same on "
       "little- and big-endian\n   targets. Bitwise (no table). Call it at start-up via "
    << n.p << "_check_table(). */\n"
    << n.P << "_INLINE uint32_t " << n.p << "_table_crc32(void)\n{\n"
    << "    uint32_t crc = 0xFFFFFFFFUL;\n    unsigned k, b, i;\n"
    << "    for (k = 0U; k < (unsigned)(" << count_expr << "); ++k) {\n";
  if (is_float)
    o << "        union { float f; uint32_t u; } pun;\n        uint32_t bits;\n"
      << "        pun.f = " << n.P << "_COEF[k];\n        bits = pun.u;\n";
  else if (is_double)
    o << "        union { double d; uint64_t u; } pun;\n        uint64_t bits;\n"
      << "        pun.u = 0U;\n        pun.d = " << n.P << "_COEF[k];\n        bits = pun.u;\n";
  else
    o << "        uint32_t bits = (uint32_t)" << n.P << "_COEF[k];\n";
  o << "        for (b = 0U; b < " << bytes << "U; ++b) {\n"
    << "            crc ^= (uint32_t)((bits >> (8U * b)) & 0xFFU);\n"
    << "            for (i = 0U; i < 8U; ++i) {\n"
    << "                if ((crc & 1U) != 0U)\n"
    << "                    crc = (crc >> 1) ^ (uint32_t)0xEDB88320UL;\n"
    << "                else\n"
    << "                    crc >>= 1;\n"
    << "            }\n        }\n    }\n"
    << "    return crc ^ (uint32_t)0xFFFFFFFFUL;\n}\n\n"
    << "/* Start-up self-check: " << n.P << "_TABLE_OK when the coefficient table is intact,\n"
    << "   " << n.P << "_TABLE_CORRUPT otherwise";
  if (is_double)
    o << ", " << n.P << "_TABLE_UNCHECKABLE where double is not\n   IEEE binary64 "
      << "(e.g. avr-gcc, whose double is 32 bits)";
  o << ". */\n" << n.P << "_INLINE int " << n.p << "_check_table(void)\n{\n";
  if (is_double)
    o << "    if (sizeof(double) != 8U)\n        return " << n.P << "_TABLE_UNCHECKABLE;\n";
  o << "    return " << n.p << "_table_crc32() == " << n.P << "_TABLE_CRC32 ? " << n.P
    << "_TABLE_OK : " << n.P << "_TABLE_CORRUPT;\n}\n\n";
}

bool choose_proof_tolerance(const HeaderMeta& meta, const ExportOptions& opt, ProofTolerance& out,
                            std::string& message) {
  if (meta.tolerance_abs && std::isfinite(*meta.tolerance_abs) && *meta.tolerance_abs > 0) {
    out.tolerance = *meta.tolerance_abs;
    out.source = meta.tolerance_abs_source;
  } else if (std::isfinite(meta.validation_rmse) && meta.validation_rmse > 0) {
    out.tolerance = meta.validation_rmse;
    out.source = "validation RMSE, fallback: no absolute tolerance given";
  } else {
    message =
        "meta: neither an absolute tolerance nor a positive validation RMSE is given; the "
        "refusal rule needs one of them";
    return false;
  }
  out.limit = opt.max_deviation_fraction * out.tolerance;
  return true;
}

bool start_result(const HeaderMeta& meta, const ExportOptions& opt, ExportResult& r,
                  ProofTolerance& pt) {
  if (!choose_proof_tolerance(meta, opt, pt, r.message)) return false;
  r.tolerance_used = pt.tolerance;
  r.tolerance_source = pt.source;
  r.deviation_limit = pt.limit;
  return true;
}

void finish_result(ExportResult& r, std::string header, std::uint32_t crc,
                   const std::string& formats, const ProofFigures& proof) {
  r.header = std::move(header);
  r.table_crc32 = crc;
  r.formats = formats;
  r.max_deviation = proof.max;
  r.deviation_at = proof.at;
  r.points_checked = proof.points;
  r.readings_checked = proof.readings;
  const CodeStats partial = r.stats;
  r.stats = stats_for(r.header, partial.table_entries,
                      partial.table_bytes / std::max(1, partial.table_entries),
                      partial.multiplies_per_eval, partial.additions_per_eval);
}

void emit_table_codes_and_linkage(std::ostringstream& o, const Names& n) {
  o << "/* Results of " << n.p << "_check_table() */\n"
    << "#define " << n.P << "_TABLE_OK 0\n"
    << "#define " << n.P << "_TABLE_CORRUPT 1\n"
    << "#define " << n.P << "_TABLE_UNCHECKABLE 2 /* double mode where double is not 64-bit */\n\n"
    << "/* C99/C++: static inline. GNU C89: static __inline__. Other C89: static. */\n"
    << "#if defined(__cplusplus) || (defined(__STDC_VERSION__) && __STDC_VERSION__ >= 199901L)\n"
    << "#define " << n.P << "_INLINE static inline\n"
    << "#elif defined(__GNUC__)\n"
    << "#define " << n.P << "_INLINE static __inline__\n"
    << "#else\n"
    << "#define " << n.P << "_INLINE static\n"
    << "#endif\n\n"
    << "#ifdef __cplusplus\nextern \"C\" {\n#endif\n\n";
}

CodeStats stats_for(const std::string& text, int entries, int entry_bytes, int mul, int add) {
  CodeStats st;
  st.header_bytes = text.size();
  for (char c : text) st.header_lines += c == '\n';
  st.table_entries = entries;
  st.table_bytes = entries * entry_bytes;
  st.multiplies_per_eval = mul;
  st.additions_per_eval = add;
  return st;
}

void emit_epilogue(std::ostringstream& o, const Names& n) {
  o << "#ifdef __cplusplus\n} /* extern \"C\" */\n#endif\n\n#endif /* " << n.P
    << "_RIDGECAL_CALIBRATION_H */\n";
}

}  // namespace detail

namespace {

using detail::esc;
using detail::g;
using detail::hex32;
using detail::Names;
using detail::stats_for;

struct Proof {
  detail::Deviation dev;
  double limit = 0;
  double tolerance = 0;
  std::string tolerance_source;
};

// ---- pieces common to every mode ---------------------------------------------------

void emit_banner(std::ostringstream& o, const Names& n, const PolyModel& model,
                 const HeaderMeta& meta, const ExportOptions& opt, const Proof& proof,
                 const std::string& formats, const std::string& units_out) {
  const std::string ru = esc(meta.reading_unit, 40), fu = esc(meta.reference_unit, 40);
  o << "/* ==========================================================================\n"
    << " * GENERATED FILE -- DO NOT EDIT.\n"
    << " * Written by " << esc(meta.tool_version.empty() ? "ridgecal" : meta.tool_version, 60)
    << " (ridgecal export). Regenerate it from the calibration record\n"
    << " * instead of editing: the coefficient CRC and the QA figures below would no\n"
    << " * longer match.\n"
    << " * Header format version " << kHeaderFormatVersion << " (" << n.P << "_FORMAT_VERSION).\n"
    << " * ==========================================================================\n"
    << " *\n"
    << " * Calibration QA\n"
    << " *   sensor:              " << esc(meta.sensor_name) << "\n"
    << " *   reading unit:        " << ru << "\n"
    << " *   reference unit:      " << fu << "\n"
    << " *   calibrated range:    [" << g(model.scaling.x_min, 9) << ", "
    << g(model.scaling.x_max, 9) << "] " << ru << " (reading)\n"
    << " *   degree, lambda:      " << (meta.degree >= 0 ? meta.degree : model.degree()) << ", "
    << g(meta.lambda) << "\n"
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
    << " * Export proof (evaluated at export time by an exact host emulation of the\n"
    << " * arithmetic below, compared with the double-precision model)\n"
    << " *   numeric mode:        " << to_string(opt.mode) << "\n"
    << " *   number formats:      " << formats << "\n"
    << " *   inputs checked:      " << proof.dev.points << " (" << proof.dev.readings
    << " of them calibration readings)\n"
    << " *   max deviation:       " << g(proof.dev.max, 4) << " " << fu << " at reading "
    << g(proof.dev.at, 9) << units_out << "\n"
    << " *   allowed deviation:   " << g(proof.limit, 4) << " " << fu << " ("
    << g(opt.max_deviation_fraction) << " x tolerance used)\n"
    << " *\n"
    << " * CAUTION: this header reproduces a fitted calibration curve, nothing more.\n"
    << " * Where the measurement is safety-relevant (medical, legal metrology, gas,\n"
    << " * pressure, process safety, ...) calibration, verification and release of\n"
    << " * the instrument must follow local codes and certified procedures; the QA\n"
    << " * figures above do not replace them.\n"
    << " *\n"
    << " * Build requirement: compile every file that includes this header with\n"
    << " * -ffp-contract=off and never with -ffast-math / -Ofast. GCC ignores\n"
    << " * '#pragma STDC FP_CONTRACT OFF' (used below for other compilers), and a\n"
    << " * fused multiply-add changes the last bits of the float/double results.\n"
    << " * Uses <stdint.h> only: no libm, no malloc, no libc calls.\n"
    << " */\n";
}

void emit_prologue(std::ostringstream& o, const Names& n, const PolyModel& model,
                   const ExportOptions& opt, std::uint32_t crc) {
  const std::string guard = n.P + "_RIDGECAL_CALIBRATION_H";
  o << "#ifndef " << guard << "\n#define " << guard << "\n\n#include <stdint.h>\n\n"
    << "#define " << n.P << "_FORMAT_VERSION " << kHeaderFormatVersion << "\n"
    << "#define " << n.P << "_NUMERIC_" << macro_case(to_string(opt.mode)) << " 1\n"
    << "#define " << n.P << "_DEGREE " << model.degree() << "\n"
    << "/* CRC-32 (IEEE: reflected 0xEDB88320, init and xorout 0xFFFFFFFF) over the\n"
    << "   bit patterns of " << n.P << "_COEF[0.." << model.degree()
    << "], each least significant byte\n   first; see " << n.p << "_table_crc32(). */\n"
    << "#define " << n.P << "_TABLE_CRC32 " << hex32(crc) << "\n\n"
    << "/* Status codes of the range-checked evaluation */\n"
    << "#define " << n.P << "_IN_RANGE 0     /* input inside the valid range */\n"
    << "#define " << n.P << "_BELOW_RANGE 1  /* input below: result at the lower limit */\n"
    << "#define " << n.P << "_ABOVE_RANGE 2  /* input above: result at the upper limit */\n"
    << "#define " << n.P << "_NOT_A_NUMBER 3 /* NaN input: result at the lower limit */\n";
  detail::emit_table_codes_and_linkage(o, n);
}

// ---- float / double ----------------------------------------------------------------

template <typename T>
std::string lit(T v) {
  if constexpr (std::is_same_v<T, float>)
    return c_float_literal(v);
  else
    return c_double_literal(v);
}

template <typename T>
void emit_floating_body(std::ostringstream& o, const Names& n, const FloatingProgram<T>& p,
                        const HeaderMeta& meta, const Proof& proof) {
  constexpr bool is_float = std::is_same_v<T, float>;
  const char* type = is_float ? "float" : "double";
  const std::string fmt = is_float ? "IEEE 754 binary32 (float)" : "IEEE 754 binary64 (double)";
  const std::string ru = esc(meta.reading_unit, 40), fu = esc(meta.reference_unit, 40);
  const int deg = static_cast<int>(p.coef.size()) - 1;
  const bool t_basis = p.basis == Basis::ScaledT;
  const std::string var = t_basis ? "t" : "x";

  o << "/* Valid input range (reading units: " << ru << "), the calibrated range rounded\n"
    << "   inward to " << type << ". */\n"
    << "#define " << n.P << "_X_MIN " << lit(p.x_lo) << "\n"
    << "#define " << n.P << "_X_MAX " << lit(p.x_hi) << "\n";
  if (t_basis)
    o << "/* Scaled variable: t = (x - " << n.P << "_T_CENTER) * " << n.P
      << "_T_SCALE, in [-1, 1] on the range. */\n"
      << "#define " << n.P << "_T_CENTER " << lit(p.center) << "\n"
      << "#define " << n.P << "_T_SCALE " << lit(p.inv_half_width) << "\n";
  o << "\n/* Coefficients of p in powers of "
    << (t_basis ? "the scaled variable t" : "the raw reading x") << " (index = power), " << type
    << ". */\n"
    << "static const " << type << " " << n.P << "_COEF[" << n.P << "_DEGREE + 1] = {\n";
  for (int k = 0; k <= deg; ++k)
    o << "    " << lit(p.coef[static_cast<std::size_t>(k)]) << (k < deg ? "," : " ") << " /* "
      << var << "^" << k << " */\n";
  o << "};\n\n";

  o << "/* " << n.p << "_eval: reference value (" << fu << ") for reading x (" << ru << ").\n"
    << " * Precision: " << fmt << " throughout, Horner's scheme in "
    << (t_basis ? "the scaled variable t" : "the raw reading x") << ",\n"
    << " *   one rounding per operation (no fused multiply-add: build with -ffp-contract=off).\n"
    << " * Range: [" << n.P << "_X_MIN, " << n.P << "_X_MAX]; outside it the result is an\n"
    << " *   unchecked extrapolation -- use " << n.p << "_eval_checked() for untrusted input.\n"
    << " * Measured max |error| against the double-precision model: " << g(proof.dev.max, 4) << " "
    << fu << "\n *   (" << proof.dev.points
    << " inputs over the range, calibration readings included). */\n"
    << n.P << "_INLINE " << type << " " << n.p << "_eval(" << type << " x)\n{\n"
    << "#if !defined(__GNUC__) || defined(__clang__)\n#pragma STDC FP_CONTRACT OFF\n#endif\n";
  if (deg == 0) {
    o << "    (void)x;\n    return " << n.P << "_COEF[0];\n}\n\n";
  } else {
    if (t_basis)
      o << "    const " << type << " t = (x - " << n.P << "_T_CENTER) * " << n.P << "_T_SCALE;\n";
    o << "    " << type << " y = " << n.P << "_COEF[" << deg << "];\n";
    for (int k = deg - 1; k >= 0; --k)
      o << "    y = y * " << var << " + " << n.P << "_COEF[" << k << "];\n";
    o << "    return y;\n}\n\n";
  }
  o << "/* " << n.p << "_eval_checked: as " << n.p << "_eval, but never extrapolates.\n"
    << " * An input outside [" << n.P << "_X_MIN, " << n.P << "_X_MAX] (or NaN) is clamped to the\n"
    << " * nearest limit (NaN: lower limit), and *status (if status is not NULL) is set to\n"
    << " * " << n.P << "_IN_RANGE, _BELOW_RANGE, _ABOVE_RANGE or _NOT_A_NUMBER. Precision as "
    << n.p << "_eval. */\n"
    << n.P << "_INLINE " << type << " " << n.p << "_eval_checked(" << type
    << " x, int *status)\n{\n"
    << "    int s;\n"
    << "    if (x >= " << n.P << "_X_MIN && x <= " << n.P << "_X_MAX) {\n        s = " << n.P
    << "_IN_RANGE;\n"
    << "    } else if (x < " << n.P << "_X_MIN) {\n        s = " << n.P
    << "_BELOW_RANGE;\n        x = " << n.P << "_X_MIN;\n"
    << "    } else if (x > " << n.P << "_X_MAX) {\n        s = " << n.P
    << "_ABOVE_RANGE;\n        x = " << n.P << "_X_MAX;\n"
    << "    } else { /* NaN: every comparison above is false */\n        s = " << n.P
    << "_NOT_A_NUMBER;\n        x = " << n.P << "_X_MIN;\n    }\n"
    << "    if (status != 0)\n        *status = s;\n"
    << "    return " << n.p << "_eval(x);\n}\n\n";
}

// ---- fixed -------------------------------------------------------------------------

std::string range_text(const IntRange& r) {
  char buf[96];
  std::snprintf(buf, sizeof buf, "[%.0Lf, %.0Lf]", r.lo, r.hi);
  return buf;
}

void emit_fixed_body(std::ostringstream& o, const Names& n, const FixedPlan& p,
                     const HeaderMeta& meta, const Proof& proof) {
  const std::string ru = esc(meta.reading_unit, 40), fu = esc(meta.reference_unit, 40);
  const int deg = p.degree();
  const FixedAxis& s = p.t;
  o << "/* Valid raw input range (integers; reading = raw / " << g(s.scale, 9) << " " << ru
    << "). */\n"
    << "#define " << n.P << "_RAW_MIN " << c_int32_literal(static_cast<std::int32_t>(s.raw_min))
    << "\n"
    << "#define " << n.P << "_RAW_MAX " << c_int32_literal(static_cast<std::int32_t>(s.raw_max))
    << "\n";
  const double cal_lo = std::ceil(p.calibrated_reading_min * s.scale - 1e-9);
  const double cal_hi = std::floor(p.calibrated_reading_max * s.scale + 1e-9);
  if (static_cast<double>(s.raw_min) < cal_lo || static_cast<double>(s.raw_max) > cal_hi)
    o << "/* NOTE: this raw range extends beyond the calibrated range (raw " << g(cal_lo, 10)
      << " .. " << g(cal_hi, 10)
      << ");\n   results outside it are extrapolations of the fitted curve. */\n";
  o << "/* Output unit: 1 / " << g(p.output_scale, 9) << " " << fu
    << " (output = round(reference * " << g(p.output_scale, 9) << ")). */\n\n"
    << "/* Coefficients of p * " << g(p.output_scale, 9) << " in powers of t; entry k is in Q"
    << "(q_k) (value * 2^q_k):\n";
  for (int k = 0; k <= deg; ++k)
    o << " *   k=" << k << ": q_k = " << p.q[static_cast<std::size_t>(k)] << "\n";
  o << " */\nstatic const int32_t " << n.P << "_COEF[" << n.P << "_DEGREE + 1] = {\n";
  for (int k = 0; k <= deg; ++k)
    o << "    " << c_int32_literal(p.coef[static_cast<std::size_t>(k)]) << (k < deg ? "," : " ")
      << " /* t^" << k << ", Q" << p.q[static_cast<std::size_t>(k)] << " */\n";
  o << "};\n\n";

  o << "/* floor((v + 2^(s-1)) / 2^s), i.e. v / 2^s rounded half up, for\n"
    << "   -2^62 <= v + 2^(s-1) < 2^62 and 1 <= s <= 61. Only a non-negative value is\n"
    << "   shifted (v is offset by 2^62 first), so the result does not depend on how\n"
    << "   the compiler shifts negative numbers (implementation-defined in C). */\n"
    << n.P << "_INLINE int64_t " << n.p << "_rshift_round(int64_t v, unsigned s)\n{\n"
    << "    const int64_t bias = (int64_t)1 << 62;\n"
    << "    const uint64_t biased = (uint64_t)(v + bias + ((int64_t)1 << (s - 1U)));\n"
    << "    return (int64_t)(biased >> s) - (bias >> s);\n}\n\n";

  o << "/* " << n.p << "_eval_fixed: round(reference * " << g(p.output_scale, 9) << ") as int32 ("
    << "1/" << g(p.output_scale, 9) << " " << fu << ")\n"
    << " * for a raw integer reading in [" << n.P << "_RAW_MIN, " << n.P << "_RAW_MAX].\n"
    << " * Precision: integer only -- int32 coefficients, int64 intermediates, every\n"
    << " * shift rounds half up; output resolution 1/" << g(p.output_scale, 9) << " " << fu << ".\n"
    << " * t_q = t * 2^" << p.t.frac << " = rshift_round((raw - " << p.t.r0 << ") * " << p.t.mul
    << " + " << p.t.add << ", " << p.t.shift << ")\n"
    << " * Overflow proof (exact integer interval arithmetic over the whole raw range,\n"
    << " * every value below is a proved bound of that intermediate):\n"
    << " *   (raw - r0) * mul + add in " << range_text(p.t.pre) << "\n"
    << " *   t_q in " << range_text(p.t.q) << "\n";
  for (int k = deg - 1; k >= 0; --k)
    o << " *   step " << k << ": acc*t_q in " << range_text(p.prod[static_cast<std::size_t>(k)])
      << ", >> " << p.sh_out[static_cast<std::size_t>(k)] << ", acc (Q"
      << p.q[static_cast<std::size_t>(k)] << ") in "
      << range_text(p.acc[static_cast<std::size_t>(k)]) << "\n";
  o << " *   output in " << range_text(p.out) << "\n"
    << " *   limits: every shifted value within [-2^62, 2^62), every product within\n"
    << " *   +/-2^62, accumulators and output within int32.\n"
    << " * Measured max |error| against the double-precision model, output rounding\n"
    << " * included: " << g(proof.dev.max, 4) << " " << fu << " (" << proof.dev.points
    << " raw inputs checked). Outside the raw range the\n"
    << " * bounds do not hold: use " << n.p << "_eval_fixed_checked() for untrusted input. */\n"
    << n.P << "_INLINE int32_t " << n.p << "_eval_fixed(int32_t raw)\n{\n";
  if (deg == 0) {
    o << "    (void)raw;\n";
    if (p.q[0] > 0)
      o << "    return (int32_t)" << n.p << "_rshift_round((int64_t)" << n.P << "_COEF[0], "
        << p.q[0] << "U);\n}\n\n";
    else
      o << "    return " << n.P << "_COEF[0];\n}\n\n";
  } else {
    o << "    const int64_t t = " << n.p << "_rshift_round(((int64_t)raw - "
      << c_int64_literal(p.t.r0) << ") * " << c_int64_literal(p.t.mul) << " + "
      << c_int64_literal(p.t.add) << ", " << p.t.shift << "U);\n"
      << "    int64_t acc = (int64_t)" << n.P << "_COEF[" << deg << "];\n";
    for (int k = deg - 1; k >= 0; --k)
      o << "    acc = " << n.p << "_rshift_round(acc * t, " << p.sh_out[static_cast<std::size_t>(k)]
        << "U) + " << n.P << "_COEF[" << k << "];\n";
    if (p.q[0] > 0)
      o << "    return (int32_t)" << n.p << "_rshift_round(acc, " << p.q[0] << "U);\n}\n\n";
    else
      o << "    return (int32_t)acc;\n}\n\n";
  }
  o << "/* " << n.p << "_eval_fixed_checked: as " << n.p
    << "_eval_fixed, but never leaves the raw range:\n"
    << " * raw outside [" << n.P << "_RAW_MIN, " << n.P
    << "_RAW_MAX] is clamped to the nearest limit and\n"
    << " * *status (if status is not NULL) is set to " << n.P << "_IN_RANGE, _BELOW_RANGE or\n"
    << " * _ABOVE_RANGE. Precision as " << n.p << "_eval_fixed. */\n"
    << n.P << "_INLINE int32_t " << n.p << "_eval_fixed_checked(int32_t raw, int *status)\n{\n"
    << "    int s = " << n.P << "_IN_RANGE;\n"
    << "    if (raw < " << n.P << "_RAW_MIN) {\n        s = " << n.P
    << "_BELOW_RANGE;\n        raw = " << n.P << "_RAW_MIN;\n"
    << "    } else if (raw > " << n.P << "_RAW_MAX) {\n        s = " << n.P
    << "_ABOVE_RANGE;\n        raw = " << n.P << "_RAW_MAX;\n    }\n"
    << "    if (status != 0)\n        *status = s;\n"
    << "    return " << n.p << "_eval_fixed(raw);\n}\n\n";
}

}  // namespace

ExportResult generate_c_header(const PolyModel& model, const HeaderMeta& meta,
                               const ExportOptions& opt) {
  ExportResult r;
  r.status = ExportStatus::InvalidInput;
  if (std::string m = opt.validate(); !m.empty()) {
    r.message = m;
    return r;
  }
  if (model.cheb.empty()) {
    r.message = "model: no coefficients";
    return r;
  }
  if (model.degree() > 30) {
    r.message = "model: degree " + std::to_string(model.degree()) + " exceeds 30";
    return r;
  }
  for (double c : model.cheb)
    if (!std::isfinite(c)) {
      r.message = "model: non-finite Chebyshev coefficient";
      return r;
    }
  if (!(std::isfinite(model.scaling.x_min) && std::isfinite(model.scaling.x_max) &&
        model.scaling.x_max > model.scaling.x_min)) {
    r.message = "model: calibrated range must satisfy x_min < x_max (both finite)";
    return r;
  }
  Proof proof;
  detail::ProofTolerance pt;
  if (!detail::start_result(meta, opt, r, pt)) return r;
  proof.tolerance = pt.tolerance;
  proof.tolerance_source = pt.source;
  proof.limit = pt.limit;

  const Names n{opt.prefix, macro_case(opt.prefix)};
  const int deg = model.degree();
  const FirmwareModel fm = firmware_model(model);
  std::ostringstream body;
  std::string formats;
  std::uint32_t crc = 0;
  std::string at_units = " " + esc(meta.reading_unit, 40);

  if (opt.mode == NumericMode::Float || opt.mode == NumericMode::Double) {
    const bool is_float = opt.mode == NumericMode::Float;
    // Both bases are emulated; the one with the smaller max deviation is written.
    detail::Deviation best;
    Basis best_basis = Basis::ScaledT;
    bool have = false;
    for (Basis b : {Basis::ScaledT, Basis::RawX}) {
      detail::Deviation d;
      if (is_float) {
        auto p = detail::make_program<float>(fm, b);
        if (!p) continue;
        d = detail::measure(model, *p, opt.grid_points, meta.calibration_readings);
      } else {
        auto p = detail::make_program<double>(fm, b);
        if (!p) continue;
        d = detail::measure(model, *p, opt.grid_points, meta.calibration_readings);
      }
      if (!have || d.max < best.max) {
        best = d;
        best_basis = b;
        have = true;
      }
    }
    if (!have) {
      r.message =
          std::string("model: a coefficient does not fit in ") + (is_float ? "float" : "double");
      return r;
    }
    proof.dev = best;
    r.basis = best_basis;
    formats =
        std::string(is_float ? "IEEE binary32" : "IEEE binary64") + ", Horner in " +
        (best_basis == Basis::ScaledT ? "scaled t = (x - c) * s (chosen: lower error than raw x)"
                                      : "raw x (chosen: lower error than scaled t)");
    if (is_float) {
      r.float_program = detail::make_program<float>(fm, best_basis);
      crc = crc32_bytes(table_bytes(r.float_program->coef));
      emit_floating_body(body, n, *r.float_program, meta, proof);
      detail::emit_crc(body, n, "float", 4, n.P + "_DEGREE + 1");
    } else {
      r.double_program = detail::make_program<double>(fm, best_basis);
      crc = crc32_bytes(table_bytes(r.double_program->coef));
      emit_floating_body(body, n, *r.double_program, meta, proof);
      detail::emit_crc(body, n, "double", 8, n.P + "_DEGREE + 1");
    }
    const int t_ops = best_basis == Basis::ScaledT ? 1 : 0;
    r.stats = stats_for("", deg + 1, is_float ? 4 : 8, deg + t_ops, deg + t_ops);
  } else {
    FixedPlan plan;
    std::string why;
    if (!plan_fixed(fm, opt, &plan, &why)) {
      r.message = "fixed point: " + why;
      return r;
    }
    proof.dev = detail::measure(model, plan, opt.grid_points, opt.exhaustive_limit,
                                meta.calibration_readings);
    r.fixed_plan = plan;
    std::string qs;
    for (std::size_t k = 0; k < plan.q.size(); ++k)
      qs += (k ? "," : "") + std::to_string(plan.q[k]);
    formats = "int32 coefficients Q[" + qs + "] (t^0..t^n), t in Q" + std::to_string(plan.t.frac) +
              ", int64 intermediates, output = round(y * " + g(plan.output_scale, 9) + ") int32";
    crc = crc32_bytes(table_bytes(plan.coef));
    emit_fixed_body(body, n, plan, meta, proof);
    detail::emit_crc(body, n, "int32_t", 4, n.P + "_DEGREE + 1");
    r.stats = stats_for("", deg + 1, 4, deg + 1, 2 * deg + 2);
    at_units =
        " " + esc(meta.reading_unit, 40) + " (raw " + g(proof.dev.at * plan.t.scale, 10) + ")";
  }

  std::ostringstream o;
  emit_banner(o, n, model, meta, opt, proof, formats, at_units);
  emit_prologue(o, n, model, opt, crc);
  o << body.str();
  detail::emit_epilogue(o, n);

  detail::finish_result(r, o.str(), crc, formats,
                        {proof.dev.max, proof.dev.at, proof.dev.points, proof.dev.readings});
  if (!(proof.dev.max <= proof.limit)) {
    r.status = ExportStatus::Refused;
    r.message = "refused: max deviation " + g(proof.dev.max, 4) + " at reading " +
                g(proof.dev.at, 9) + " exceeds " + g(opt.max_deviation_fraction) +
                " x tolerance (" + g(proof.tolerance) + ", " + proof.tolerance_source +
                ") = " + g(proof.limit, 4) + " in " + to_string(opt.mode) + " mode";
    return r;
  }
  r.status = ExportStatus::Ok;
  r.message = to_string(opt.mode) + " header: max deviation " + g(proof.dev.max, 4) +
              " <= " + g(proof.limit, 4) + " over " + std::to_string(proof.dev.points) + " inputs";
  return r;
}

}  // namespace ridgecal::firmware
