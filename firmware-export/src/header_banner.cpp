// The header's opening: the "do not edit" banner with the QA and export-proof
// block, the include guard and the model macros; and its closing.
#include "header_writer.hpp"
#include "ridgecal/firmware/c_text.hpp"

namespace ridgecal::firmware::detail {

Dialect dialect(const FirmwareModel& m, const Names& n) {
  if (m.extended) return {true, "reading", "evaluated", n.P + "_N_COEF"};
  return {false, "input", "result", n.P + "_DEGREE + 1"};
}

namespace {

// The model lines of the QA block.
void emit_model_lines(std::ostringstream& o, const HeaderContext& c) {
  const FirmwareModel& m = c.model;
  const AxisScaling& in = m.inputs[0];
  if (!c.d.extended) {
    o << " *   calibrated range:    [" << g(in.min, 9) << ", " << g(in.max, 9) << "] " << c.ru
      << " (reading)\n"
      << " *   degree, lambda:      " << (c.meta.degree >= 0 ? c.meta.degree : m.reading_degree)
      << ", " << g(c.meta.lambda) << "\n";
    return;
  }
  const auto [xlo, xhi] = raw_reading_range(m);
  if (m.has_aux()) o << " *   aux unit:            " << c.au << "\n";
  o << " *   transforms:          " << esc(m.transforms.describe(), 160) << "\n"
    << " *   calibrated reading:  [" << g(xlo, 9) << ", " << g(xhi, 9) << "] " << c.ru;
  if (!m.transforms.identity())
    o << "\n *                        (transformed: [" << g(in.min, 9) << ", " << g(in.max, 9)
      << "])";
  o << "\n";
  if (m.has_aux())
    o << " *   calibrated aux:      [" << g(m.inputs[1].min, 9) << ", " << g(m.inputs[1].max, 9)
      << "] " << c.au << "\n";
  o << " *   terms, degrees:      " << m.fitted_terms << " terms (" << m.fitted_basis
    << " basis), reading degree " << m.reading_degree;
  if (m.has_aux()) o << ", aux degree " << m.aux_degree;
  o << "\n"
    << " *   lambda:              " << g(c.meta.lambda) << "\n";
}

}  // namespace

void emit_banner(std::ostringstream& o, const HeaderContext& c, const std::string& at) {
  const FirmwareModel& m = c.model;
  const HeaderMeta& meta = c.meta;
  const bool ext = c.d.extended, aux = m.has_aux();
  o << "/* ==========================================================================\n"
    << " * GENERATED FILE -- DO NOT EDIT.\n"
    << " * Written by " << esc(meta.tool_version.empty() ? "ridgecal" : meta.tool_version, 60)
    << " (ridgecal export). Regenerate it from the calibration record\n"
    << " * instead of editing: the self-check CRC and the QA figures below would no\n"
    << " * longer match.\n"
    << " * Header format version " << kHeaderFormatVersion << " (" << c.n.P << "_FORMAT_VERSION).\n"
    << " * ==========================================================================\n"
    << " *\n"
    << " * Calibration QA";
  if (ext)
    o << " (extended model" << (aux ? ", second input aux" : "")
      << (m.transforms.identity() ? "" : ", transforms") << ")";
  o << "\n"
    << " *   sensor:              " << esc(meta.sensor_name) << "\n"
    << " *   reading unit:        " << c.ru << "\n"
    << " *   reference unit:      " << c.fu << "\n";
  emit_model_lines(o, c);
  o << " *   validation:          RMSE " << g(meta.validation_rmse) << ", max |error| "
    << g(meta.validation_max_abs_error) << " " << c.fu << "\n"
    << " *   test:                RMSE " << g(meta.test_rmse) << ", max |error| "
    << g(meta.test_max_abs_error) << " " << c.fu << "\n"
    << " *   tolerance:           " << esc(meta.tolerance_description) << "\n"
    << " *   tolerance used:      " << g(c.tol.tolerance) << " " << c.fu << " (" << c.tol.source
    << ")\n"
    << " *   result:              " << esc(meta.pass_fail, 400) << "\n"
    << " *   record SHA-256:      " << esc(meta.record_sha256, 80) << "\n"
    << " *   tool version:        " << esc(meta.tool_version, 60) << "\n"
    << " *\n";
  if (ext)
    o << " * Export proof (evaluated at export time by a host emulation of the\n"
      << " * arithmetic below over a grid of (reading" << (aux ? ", aux" : "")
      << ") points, compared with the double-precision model)\n";
  else
    o << " * Export proof (evaluated at export time by an exact host emulation of the\n"
      << " * arithmetic below, compared with the double-precision model)\n";
  o << " *   numeric mode:        " << to_string(c.opt.mode) << "\n"
    << " *   number formats:      " << c.formats << "\n"
    << " *   inputs checked:      " << c.dev.points << " (" << c.dev.readings
    << " of them calibration " << (ext ? "points" : "readings") << ")\n"
    << " *   max deviation:       " << g(c.dev.max, 4) << " " << c.fu << " at reading "
    << g(c.dev.at, 9) << at << "\n";
  if (c.needs_log)
    o << " *   log() allowance:     " << g(c.dev.allowance, 4) << " " << c.fu
      << " (a target C library whose log/logf\n"
      << " *                        differs from the host's by up to " << g(kLogUlps)
      << " ulps, propagated)\n"
      << " *   bound on a target:   " << g(c.dev.max + c.dev.allowance, 4) << " " << c.fu
      << " (max deviation + log() allowance)\n";
  o << " *   allowed deviation:   " << g(c.tol.limit, 4) << " " << c.fu << " ("
    << g(c.opt.max_deviation_fraction) << " x tolerance used)\n"
    << " *\n";
  if (ext)
    o << " * CAUTION: this header reproduces a fitted calibration surface, nothing more,\n"
      << " * and only inside the calibrated region of every input. Where the measurement\n"
      << " * is safety-relevant (medical, legal metrology, gas, pressure, process\n"
      << " * safety, ...) calibration, verification and release of the instrument must\n"
      << " * follow local codes and certified procedures; the QA figures above do not\n"
      << " * replace them.\n";
  else
    o << " * CAUTION: this header reproduces a fitted calibration curve, nothing more.\n"
      << " * Where the measurement is safety-relevant (medical, legal metrology, gas,\n"
      << " * pressure, process safety, ...) calibration, verification and release of\n"
      << " * the instrument must follow local codes and certified procedures; the QA\n"
      << " * figures above do not replace them.\n";
  o << " *\n"
    << " * Build requirement: compile every file that includes this header with\n"
    << " * -ffp-contract=off and never with -ffast-math / -Ofast. GCC ignores\n"
    << " * '#pragma STDC FP_CONTRACT OFF' (used below for other compilers), and a\n"
    << " * fused multiply-add changes the last bits of the float/double results.\n";
  if (c.needs_log)
    o << " * Uses <stdint.h> and <math.h>: needs log()/logf() from the C library (libm;\n"
      << " * newlib and avr-libc provide it; link with -lm). No malloc, no other libc calls.\n"
      << " * log/logf results may differ by a few ulps between C libraries, so results\n"
      << " * agree with the export proof within the bound above, not bit for bit.\n";
  else
    o << " * Uses <stdint.h> only: no libm, no malloc, no libc calls.\n";
  o << " */\n";
}

namespace {

// Characters safe in a C string literal and meaningful in a date or digest;
// anything else becomes '?'.
std::string c_string_safe(const std::string& s) {
  std::string out;
  for (char ch : s.substr(0, 80)) {
    const bool ok = (ch >= '0' && ch <= '9') || (ch >= 'A' && ch <= 'Z') ||
                    (ch >= 'a' && ch <= 'z') || ch == ':' || ch == '.' || ch == '+' || ch == '-';
    out += ok ? ch : '?';
  }
  return out;
}

// The suffix of PREFIX_VERDICT_... for a verdict.
const char* verdict_macro(HeaderVerdict v) {
  switch (v) {
    case HeaderVerdict::Pass:
      return "PASS";
    case HeaderVerdict::Fail:
      return "FAIL";
    case HeaderVerdict::RecordModified:
      return "RECORD_MODIFIED";
    case HeaderVerdict::Undecided:
      return "UNDECIDED";
    case HeaderVerdict::NotJudged:
      break;
  }
  return "NOT_JUDGED";
}

// A comma-separated list broken into lines of at most `width` characters.
std::string wrap_list(const std::string& list, const std::string& indent, std::size_t width) {
  std::string out, line = indent;
  std::size_t pos = 0;
  while (pos < list.size()) {
    std::size_t next = list.find(", ", pos);
    const std::string item =
        list.substr(pos, next == std::string::npos ? std::string::npos : next + 1 - pos);
    if (line.size() > indent.size() && line.size() + item.size() + 1 > width) {
      out += line + "\n";
      line = indent;
    }
    line += (line.size() > indent.size() ? " " : "") + item;
    pos = next == std::string::npos ? list.size() : next + 2;
  }
  return out + line;
}

}  // namespace

void emit_prologue(std::ostringstream& o, const HeaderContext& c, std::uint32_t crc) {
  const Names& n = c.n;
  const FirmwareModel& m = c.model;
  const bool aux = m.has_aux();
  const int K = m.reading_degree, L = m.aux_degree, N = (K + 1) * (L + 1);
  const std::string guard = n.P + "_RIDGECAL_CALIBRATION_H";
  o << "#ifndef " << guard << "\n#define " << guard << "\n\n#include <stdint.h>\n";
  if (c.needs_log) o << "#include <math.h>\n";
  o << "\n#define " << n.P << "_FORMAT_VERSION " << kHeaderFormatVersion << "\n"
    << "#define " << n.P << "_NUMERIC_" << macro_case(to_string(c.opt.mode)) << " 1\n";
  if (c.d.extended) {
    o << "#define " << n.P
      << "_EXTENDED_MODEL 1 /* transforms and/or aux input: see the functions */\n";
    if (aux) o << "#define " << n.P << "_HAS_AUX 1 /* the functions take (reading, aux) */\n";
    o << "#define " << n.P << "_READING_DEGREE " << K << "\n"
      << "#define " << n.P << "_AUX_DEGREE " << L << "\n"
      << "#define " << n.P << "_N_COEF " << N << " /* (READING_DEGREE + 1) * (AUX_DEGREE + 1) */\n";
  } else {
    o << "#define " << n.P << "_DEGREE " << K << "\n";
  }
  const std::string w = c.d.input_word, r = c.d.outcome_word;
  o << "/* CRC-32 (IEEE: reflected 0xEDB88320, init and xorout 0xFFFFFFFF) over the\n"
    << "   bit patterns of every constant the evaluation uses, in this order\n"
    << wrap_list(checked_names(c.checked), "   ", 76) << ";\n   see " << n.p
    << "_table_crc32(). */\n"
    << "#define " << n.P << "_TABLE_CRC32 " << hex32(crc) << "\n\n"
    << "/* The record behind this header, for compile-time checks, e.g.\n"
    << " *   #if " << n.P << "_VERDICT != " << n.P << "_VERDICT_PASS\n"
    << " *   #error \"this calibration did not pass\"\n"
    << " *   #endif */\n"
    << "#define " << n.P
    << "_VERDICT_NOT_JUDGED 0 /* no tolerance in the record: nothing judged */\n"
    << "#define " << n.P << "_VERDICT_PASS 1\n"
    << "#define " << n.P << "_VERDICT_FAIL 2\n"
    << "#define " << n.P
    << "_VERDICT_RECORD_MODIFIED 3 /* record edited after ridgecal wrote it */\n"
    << "#define " << n.P
    << "_VERDICT_UNDECIDED 4 /* no point outside the tolerance, but conformity not shown (guard "
       "band, U or model adequacy) */\n"
    << "#define " << n.P << "_VERDICT " << n.P << "_VERDICT_" << verdict_macro(c.meta.verdict)
    << "\n"
    << "#define " << n.P << "_RECORD_SHA256 \"" << c_string_safe(c.meta.record_sha256)
    << "\" /* SHA-256 of the calibration record */\n"
    << "#define " << n.P << "_CALIBRATION_DATE \"" << c_string_safe(c.meta.calibration_date)
    << "\" /* when the record was made, UTC; \"\" if it does not say */\n\n"
    << "/* Status codes of the range-checked evaluation"
    << (aux ? ": the reading's code plus the aux input's code" : "") << " */\n"
    << "#define " << n.P << "_IN_RANGE 0     /* input inside the valid range */\n"
    << "#define " << n.P << "_BELOW_RANGE 1  /* " << w << " below: " << r
    << " at the lower limit */\n"
    << "#define " << n.P << "_ABOVE_RANGE 2  /* " << w << " above: " << r
    << " at the upper limit */\n"
    << "#define " << n.P << "_NOT_A_NUMBER 3 /* NaN " << w << ": " << r
    << " at the lower limit */\n";
  if (aux)
    o << "#define " << n.P << "_AUX_BELOW_RANGE 4  /* aux below: evaluated at its lower limit */\n"
      << "#define " << n.P << "_AUX_ABOVE_RANGE 8  /* aux above: evaluated at its upper limit */\n"
      << "#define " << n.P << "_AUX_NOT_A_NUMBER 12 /* NaN aux: evaluated at its lower limit */\n"
      << "/* e.g. status & 3 is the reading's code, status & 12 the aux input's. */\n";
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

void emit_epilogue(std::ostringstream& o, const Names& n) {
  o << "#ifdef __cplusplus\n} /* extern \"C\" */\n#endif\n\n#endif /* " << n.P
    << "_RIDGECAL_CALIBRATION_H */\n";
}

}  // namespace ridgecal::firmware::detail
