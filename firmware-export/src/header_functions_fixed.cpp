// The fixed-point part of the header: raw ranges, the coefficient table,
// PREFIX_rshift_round(), PREFIX_eval_fixed() with its overflow proof and
// PREFIX_eval_fixed_checked().
#include <cmath>
#include <cstdio>

#include "header_writer.hpp"
#include "ridgecal/firmware/c_literals.hpp"

namespace ridgecal::firmware::detail {

namespace {

// Which integer mappings and shift tables the evaluation uses.
bool uses_t(const FixedPlan& p) {
  return p.reading_degree > 0;
}
bool uses_s(const FixedPlan& p) {
  return p.has_aux && p.aux_degree > 0;
}
bool uses_out_shift(const FixedPlan& p) {
  return p.q[0] > 0;
}

std::string shift_list(const std::vector<int>& v) {
  std::string s;
  for (std::size_t i = 0; i < v.size(); ++i) s += (i ? ", " : "") + std::to_string(v[i]) + "U";
  return s;
}

// The constants of the input mappings and the shift of every Horner step, as
// named macros and tables (so that the self-check covers them).
void emit_mapping_constants(std::ostringstream& o, const HeaderContext& c, const FixedPlan& p) {
  const std::string& P = c.n.P;
  const auto axis = [&](const char* A, const char* var, const char* raw, const FixedAxis& a) {
    o << "/* " << var << "_q = " << var << " * 2^" << a.frac << " = rshift_round((" << raw << " - "
      << P << "_" << A << "_R0) * " << P << "_" << A << "_MUL + " << P << "_" << A << "_ADD, " << P
      << "_" << A << "_SHIFT). */\n"
      << "#define " << P << "_" << A << "_R0 (" << c_int64_literal(a.r0) << ")\n"
      << "#define " << P << "_" << A << "_MUL (" << c_int64_literal(a.mul) << ")\n"
      << "#define " << P << "_" << A << "_ADD (" << c_int64_literal(a.add) << ")\n"
      << "#define " << P << "_" << A << "_SHIFT " << a.shift << "U\n";
  };
  if (uses_t(p)) axis("T", "t", "raw", p.t);
  if (uses_s(p)) axis("S", "s", "raw_aux", p.s);
  if (uses_t(p))
    o << "/* Shift after the product with t_q in Horner step k (entry k). */\n"
      << "static const uint8_t " << P << "_T_STEP_SHIFT[" << p.sh_out.size() << "] = {"
      << shift_list(p.sh_out) << "};\n";
  if (uses_s(p))
    o << "/* Shift after the product with s_q, entry k * " << P
      << "_AUX_DEGREE + l (row k, step l). */\n"
      << "static const uint8_t " << P << "_S_STEP_SHIFT[" << p.sh_in.size() << "] = {"
      << shift_list(p.sh_in) << "};\n";
  if (uses_out_shift(p))
    o << "/* Final shift from Q" << p.q[0] << " to the output unit. */\n"
      << "#define " << P << "_OUT_SHIFT " << p.q[0] << "U\n";
  o << "\n";
}

// The constants the evaluation uses, for the self-check, in a fixed order:
// the coefficient table, the raw ranges, the mappings, the shift tables, the
// output shift and the degree macros.
void check_constants(HeaderContext& c, const FixedPlan& p) {
  using Kind = CheckedConstant::Kind;
  const std::string& P = c.n.P;
  std::vector<CheckedConstant>& k = c.checked;
  const auto table = [&](const std::string& name, Kind kind, const auto& values,
                         const std::string& count) {
    CheckedConstant t = checked_int(name, kind, 0);
    t.bits.clear();
    for (auto v : values) t.bits.push_back(checked_int("", kind, v).bits[0]);
    t.table = true;
    t.count_expr = count;
    k.push_back(t);
  };
  table(P + "_COEF", Kind::I32, p.coef, c.d.table_size);
  k.push_back(checked_int(P + "_RAW_MIN", Kind::I32, p.t.raw_min));
  k.push_back(checked_int(P + "_RAW_MAX", Kind::I32, p.t.raw_max));
  if (p.has_aux) {
    k.push_back(checked_int(P + "_AUX_RAW_MIN", Kind::I32, p.s.raw_min));
    k.push_back(checked_int(P + "_AUX_RAW_MAX", Kind::I32, p.s.raw_max));
  }
  const auto axis = [&](const char* A, const FixedAxis& a) {
    k.push_back(checked_int(P + "_" + A + "_R0", Kind::I64, a.r0));
    k.push_back(checked_int(P + "_" + A + "_MUL", Kind::I64, a.mul));
    k.push_back(checked_int(P + "_" + A + "_ADD", Kind::I64, a.add));
    k.push_back(checked_int(P + "_" + A + "_SHIFT", Kind::I32, a.shift));
  };
  if (uses_t(p)) axis("T", p.t);
  if (uses_s(p)) axis("S", p.s);
  if (uses_t(p)) table(P + "_T_STEP_SHIFT", Kind::U8, p.sh_out, std::to_string(p.sh_out.size()));
  if (uses_s(p)) table(P + "_S_STEP_SHIFT", Kind::U8, p.sh_in, std::to_string(p.sh_in.size()));
  if (uses_out_shift(p)) k.push_back(checked_int(P + "_OUT_SHIFT", Kind::I32, p.q[0]));
  if (c.d.extended) {
    k.push_back(checked_int(P + "_READING_DEGREE", Kind::I32, p.reading_degree));
    k.push_back(checked_int(P + "_AUX_DEGREE", Kind::I32, p.aux_degree));
    k.push_back(checked_int(P + "_N_COEF", Kind::I32, (p.reading_degree + 1) * (p.aux_degree + 1)));
  } else {
    k.push_back(checked_int(P + "_DEGREE", Kind::I32, p.reading_degree));
  }
}

void emit_constants(std::ostringstream& o, const HeaderContext& c, const FixedPlan& p) {
  const std::string& P = c.n.P;
  const int K = p.reading_degree, L = p.aux_degree, N = (K + 1) * (L + 1);
  const std::string os = g(p.output_scale, 9);
  o << "/* Valid raw " << c.d.input_word << " range (integers; reading = raw / " << g(p.t.scale, 9)
    << " " << c.ru << "). */\n"
    << "#define " << P << "_RAW_MIN " << c_int32_literal(static_cast<std::int32_t>(p.t.raw_min))
    << "\n"
    << "#define " << P << "_RAW_MAX " << c_int32_literal(static_cast<std::int32_t>(p.t.raw_max))
    << "\n";
  if (p.has_aux)
    o << "/* Valid raw aux range (integers; aux = raw_aux / " << g(p.s.scale, 9) << " " << c.au
      << "). */\n"
      << "#define " << P << "_AUX_RAW_MIN "
      << c_int32_literal(static_cast<std::int32_t>(p.s.raw_min)) << "\n"
      << "#define " << P << "_AUX_RAW_MAX "
      << c_int32_literal(static_cast<std::int32_t>(p.s.raw_max)) << "\n";
  if (!c.d.extended) {
    const double cal_lo = std::ceil(p.calibrated_reading_min * p.t.scale - 1e-9);
    const double cal_hi = std::floor(p.calibrated_reading_max * p.t.scale + 1e-9);
    if (static_cast<double>(p.t.raw_min) < cal_lo || static_cast<double>(p.t.raw_max) > cal_hi)
      o << "/* NOTE: this raw range extends beyond the calibrated range (raw " << g(cal_lo, 10)
        << " .. " << g(cal_hi, 10)
        << ");\n   results outside it are extrapolations of the fitted curve. */\n";
  }
  o << "/* Output unit: 1 / " << os << " " << c.fu << " (output = round(reference * " << os
    << ")). */\n\n";
  if (c.d.extended) {
    o << "/* Coefficients m[k][l] * " << os
      << " of v = sum_k t^k (sum_l m[k][l] s^l), entry k * (AUX_DEGREE + 1) + l,\n"
      << "   each in Q(q) (value * 2^q, q in the comment). */\n";
  } else {
    o << "/* Coefficients of p * " << os
      << " in powers of t; entry k is in Q(q_k) (value * 2^q_k):\n";
    for (int k = 0; k <= K; ++k)
      o << " *   k=" << k << ": q_k = " << p.q[static_cast<std::size_t>(k)] << "\n";
    o << " */\n";
  }
  o << "static const int32_t " << P << "_COEF[" << c.d.table_size << "] = {\n";
  for (int i = 0; i < N; ++i)
    o << "    " << c_int32_literal(p.coef[static_cast<std::size_t>(i)]) << (i + 1 < N ? "," : " ")
      << " /* " << term_name(i / (L + 1), i % (L + 1), p.has_aux) << ", Q"
      << p.q[static_cast<std::size_t>(i)] << " */\n";
  o << "};\n\n";
  emit_mapping_constants(o, c, p);
  o << "/* floor((v + 2^(s-1)) / 2^s), i.e. v / 2^s rounded half up, for\n"
    << "   -2^62 <= v + 2^(s-1) < 2^62 and 1 <= s <= 61. Only a non-negative value is\n"
    << "   shifted (v is offset by 2^62 first), so the result does not depend on how\n"
    << "   the compiler shifts negative numbers (implementation-defined in C). */\n"
    << P << "_INLINE int64_t " << c.n.p << "_rshift_round(int64_t v, unsigned s)\n{\n"
    << "    const int64_t bias = (int64_t)1 << 62;\n"
    << "    const uint64_t biased = (uint64_t)(v + bias + ((int64_t)1 << (s - 1U)));\n"
    << "    return (int64_t)(biased >> s) - (bias >> s);\n}\n\n";
}

// The overflow-proof lines of PREFIX_eval_fixed's comment: every step's bound
// (one-input header) or the largest product and accumulator (extended).
void emit_overflow_proof(std::ostringstream& o, const HeaderContext& c, const FixedPlan& p) {
  if (!c.d.extended) {
    o << " * Overflow proof (exact integer interval arithmetic over the whole raw range,\n"
      << " * every value below is a proved bound of that intermediate):\n"
      << " *   (raw - r0) * mul + add in " << range_text(p.t.pre) << "\n"
      << " *   t_q in " << range_text(p.t.q) << "\n";
    for (int k = p.reading_degree - 1; k >= 0; --k) {
      const auto i = static_cast<std::size_t>(k);
      o << " *   step " << k << ": acc*t_q in " << range_text(p.prod[i]) << ", >> " << p.sh_out[i]
        << ", acc (Q" << p.q[i] << ") in " << range_text(p.acc[i]) << "\n";
    }
    o << " *   output in " << range_text(p.out) << "\n"
      << " *   limits: every shifted value within [-2^62, 2^62), every product within\n"
      << " *   +/-2^62, accumulators and output within int32.\n";
    return;
  }
  o << " * Overflow proof (exact integer interval arithmetic over the whole raw\n"
    << " * range" << (p.has_aux ? "s" : "") << "; every value is a proved bound):\n"
    << " *   t_q in " << range_text(p.t.q) << "\n";
  if (p.has_aux) o << " *   s_q in " << range_text(p.s.q) << "\n";
  char buf[160];
  std::snprintf(buf, sizeof buf,
                " *   every product |acc * t_q|, |w * s_q| <= %.0Lf (< 2^62)\n"
                " *   every accumulator |acc|, |w| <= %.0Lf (< 2^31)\n",
                p.max_abs_product, p.max_abs_acc);
  o << buf << " *   output in " << range_text(p.out) << "\n";
}

// "rshift_round((RAW - R0) * MUL + ADD, SHIFT)" of one input axis (A: T or S).
std::string axis_map(const HeaderContext& c, const char* A, const char* raw) {
  const std::string m = c.n.P + "_" + A;
  return c.n.p + "_rshift_round(((int64_t)" + raw + " - " + m + "_R0) * " + m + "_MUL + " + m +
         "_ADD, " + m + "_SHIFT)";
}

// The statements of PREFIX_eval_fixed. One-input header: one Horner loop in
// t; extended: the nested Horner (inner in s per row, outer in t).
void emit_eval_statements(std::ostringstream& o, const HeaderContext& c, const FixedPlan& p) {
  const std::string &P = c.n.P, &pre = c.n.p;
  const int K = p.reading_degree, L = p.aux_degree;
  const std::string out = uses_out_shift(p)
                              ? "(int32_t)" + pre + "_rshift_round(acc, " + P + "_OUT_SHIFT)"
                              : std::string("(int32_t)acc");
  if (!c.d.extended) {
    o << (K == 0 ? "    (void)raw;\n" : "    const int64_t t = " + axis_map(c, "T", "raw") + ";\n");
    if (K == 0) {
      o << "    return "
        << (uses_out_shift(p) ? "(int32_t)" + pre + "_rshift_round((int64_t)" + P + "_COEF[0], " +
                                    P + "_OUT_SHIFT)"
                              : P + "_COEF[0]")
        << ";\n}\n\n";
      return;
    }
    o << "    int64_t acc = (int64_t)" << P << "_COEF[" << K << "];\n";
    for (int k = K - 1; k >= 0; --k)
      o << "    acc = " << pre << "_rshift_round(acc * t, (unsigned)" << P << "_T_STEP_SHIFT[" << k
        << "]) + " << P << "_COEF[" << k << "];\n";
    o << "    return " << out << ";\n}\n\n";
    return;
  }
  if (K > 0) o << "    const int64_t t = " << axis_map(c, "T", "raw") << ";\n";
  if (p.has_aux && L > 0) o << "    const int64_t s = " << axis_map(c, "S", "raw_aux") << ";\n";
  o << "    int64_t w, acc;\n";
  if (K == 0) o << "    (void)raw;\n";
  if (p.has_aux && L == 0) o << "    (void)raw_aux;\n";
  for (int k = K; k >= 0; --k) {
    const int row = k * (L + 1);
    o << "    w = (int64_t)" << P << "_COEF[" << row + L << "];\n";
    for (int l = L - 1; l >= 0; --l)
      o << "    w = " << pre << "_rshift_round(w * s, (unsigned)" << P << "_S_STEP_SHIFT["
        << k * L + l << "]) + " << P << "_COEF[" << row + l << "];\n";
    if (k == K)
      o << "    acc = w;\n";
    else
      o << "    acc = " << pre << "_rshift_round(acc * t, (unsigned)" << P << "_T_STEP_SHIFT[" << k
        << "]) + w;\n";
  }
  o << "    return " << out << ";\n}\n\n";
}

void emit_eval_checked(std::ostringstream& o, const HeaderContext& c, const FixedPlan& p,
                       const std::string& args) {
  const std::string &P = c.n.P, &pre = c.n.p;
  const bool aux = p.has_aux;
  o << "/* " << pre << "_eval_fixed_checked: as " << pre
    << "_eval_fixed, but never leaves the raw range" << (aux ? "s" : "") << ":\n"
    << " * raw outside [" << P << "_RAW_MIN, " << P << "_RAW_MAX] is clamped to the nearest limit";
  if (c.d.extended)
    o << (aux ? ", and so is\n * raw_aux to [" + P + "_AUX_RAW_MIN, " + P + "_AUX_RAW_MAX]"
              : std::string())
      << ";\n * *status (if status is not NULL) is set to " << P
      << "_IN_RANGE, _BELOW_RANGE or _ABOVE_RANGE"
      << (aux ? "\n * plus " + P + "_AUX_BELOW_RANGE or _AUX_ABOVE_RANGE" : std::string());
  else
    o << " and\n * *status (if status is not NULL) is set to " << P
      << "_IN_RANGE, _BELOW_RANGE or\n * _ABOVE_RANGE";
  const char* st = c.d.extended ? "st" : "s";
  o << ". Precision as " << pre << "_eval_fixed. */\n"
    << P << "_INLINE int32_t " << pre << "_eval_fixed_checked(" << args << ", int *status)\n{\n"
    << "    int " << st << " = " << P << "_IN_RANGE;\n"
    << "    if (raw < " << P << "_RAW_MIN) {\n        " << st << " = " << P
    << "_BELOW_RANGE;\n        raw = " << P << "_RAW_MIN;\n"
    << "    } else if (raw > " << P << "_RAW_MAX) {\n        " << st << " = " << P
    << "_ABOVE_RANGE;\n        raw = " << P << "_RAW_MAX;\n    }\n";
  if (aux)
    o << "    if (raw_aux < " << P << "_AUX_RAW_MIN) {\n        st += " << P
      << "_AUX_BELOW_RANGE;\n        raw_aux = " << P << "_AUX_RAW_MIN;\n"
      << "    } else if (raw_aux > " << P << "_AUX_RAW_MAX) {\n        st += " << P
      << "_AUX_ABOVE_RANGE;\n        raw_aux = " << P << "_AUX_RAW_MAX;\n    }\n";
  o << "    if (status != 0)\n        *status = " << st << ";\n"
    << "    return " << pre << "_eval_fixed(raw" << (aux ? ", raw_aux" : "") << ");\n}\n\n";
}

}  // namespace

void emit_fixed(std::ostringstream& o, HeaderContext& c, const FixedPlan& p) {
  const std::string &P = c.n.P, &pre = c.n.p, &fu = c.fu;
  const bool aux = p.has_aux;
  const std::string os = g(p.output_scale, 9);
  const std::string args = std::string("int32_t raw") + (aux ? ", int32_t raw_aux" : "");
  emit_constants(o, c, p);
  check_constants(c, p);
  o << "/* " << pre << "_eval_fixed: round(reference * " << os << ") as int32 (1/" << os << " "
    << fu << ")\n"
    << " * for a raw integer reading in [" << P << "_RAW_MIN, " << P << "_RAW_MAX]"
    << (aux ? " and raw aux in [" + P + "_AUX_RAW_MIN, " + P + "_AUX_RAW_MAX]" : std::string())
    << ".\n"
    << " * Precision: integer only -- int32 coefficients, int64 intermediates, every\n"
    << " * shift rounds half up; output resolution 1/" << os << " " << fu << ".\n"
    << " * t_q = t * 2^" << p.t.frac << " = rshift_round((raw - " << p.t.r0 << ") * " << p.t.mul
    << " + " << p.t.add << ", " << p.t.shift << ")\n";
  if (aux)
    o << " * s_q = s * 2^" << p.s.frac << " = rshift_round((raw_aux - " << p.s.r0 << ") * "
      << p.s.mul << " + " << p.s.add << ", " << p.s.shift << ")\n";
  emit_overflow_proof(o, c, p);
  o << " * Measured max |error| against the double-precision model, output rounding\n"
    << " * included: " << g(c.dev.max, 4) << " " << fu << " (" << c.dev.points << " raw input"
    << (c.d.extended ? " pairs" : "s") << " checked). Outside the raw range" << (aux ? "s" : "")
    << " the\n"
    << " * bounds do not hold: use " << pre << "_eval_fixed_checked() for untrusted input. */\n"
    << P << "_INLINE int32_t " << pre << "_eval_fixed(" << args << ")\n{\n";
  emit_eval_statements(o, c, p);
  emit_eval_checked(o, c, p, args);
}

}  // namespace ridgecal::firmware::detail
