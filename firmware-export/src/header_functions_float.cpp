// The float/double part of the header: range, scaling and transform
// constants, the coefficient table, PREFIX_eval() and PREFIX_eval_checked().
#include <type_traits>

#include "header_writer.hpp"

namespace ridgecal::firmware::detail {

namespace {

template <typename T>
void emit_constants(std::ostringstream& o, const HeaderContext& c, const FloatingProgram<T>& p,
                    const char* type) {
  const std::string& P = c.n.P;
  const bool t_basis = p.basis == Basis::ScaledT;
  if (c.d.extended)
    o << "/* Valid reading range (" << c.ru << "), the calibrated range rounded inward to " << type
      << ". */\n";
  else
    o << "/* Valid input range (reading units: " << c.ru << "), the calibrated range rounded\n"
      << "   inward to " << type << ". */\n";
  o << "#define " << P << "_X_MIN " << lit(p.x_lo) << "\n"
    << "#define " << P << "_X_MAX " << lit(p.x_hi) << "\n";
  if (p.has_aux)
    o << "/* Valid aux range (" << c.au << "), rounded inward. */\n"
      << "#define " << P << "_AUX_MIN " << lit(p.a_lo) << "\n"
      << "#define " << P << "_AUX_MAX " << lit(p.a_hi) << "\n";
  if (p.divider)
    o << "/* Divider (" << to_string(c.model.transforms.divider.position)
      << "): " << (p.sensor_low ? "r = R * x / (FULL_SCALE - x)" : "r = R * (FULL_SCALE - x) / x")
      << ", ohms. */\n"
      << "#define " << P << "_DIVIDER_R " << lit(p.divider_r) << "\n"
      << "#define " << P << "_DIVIDER_FULL_SCALE " << lit(p.divider_fs) << "\n";
  if (p.ln) {
    if (std::is_same_v<T, float>)
      o << "/* logf is C99; a C89 compiler gets log() rounded to float (within the bound). */\n"
        << "#if defined(__cplusplus) || (defined(__STDC_VERSION__) && __STDC_VERSION__ >= "
           "199901L)\n"
        << "#define " << P << "_LOG(v) logf(v)\n#else\n"
        << "#define " << P << "_LOG(v) ((float)log((double)(v)))\n#endif\n";
    else
      o << "#define " << P << "_LOG(v) log(v)\n";
  }
  if (c.d.extended)
    o << "/* Scaled variables: t = (u - " << P << "_T_CENTER) * " << P << "_T_SCALE"
      << (p.has_aux ? ", s = (aux - " + P + "_S_CENTER) * " + P + "_S_SCALE" : std::string())
      << ",\n   in [-1, 1] on the calibrated region (u = the transformed reading). */\n";
  else if (t_basis)
    o << "/* Scaled variable: t = (x - " << P << "_T_CENTER) * " << P
      << "_T_SCALE, in [-1, 1] on the range. */\n";
  if (t_basis)
    o << "#define " << P << "_T_CENTER " << lit(p.center) << "\n"
      << "#define " << P << "_T_SCALE " << lit(p.inv_half_width) << "\n";
  if (p.has_aux)
    o << "#define " << P << "_S_CENTER " << lit(p.aux_center) << "\n"
      << "#define " << P << "_S_SCALE " << lit(p.aux_inv_half_width) << "\n";
  if (p.reciprocal_kelvin)
    o << "/* Inverse reference transform: reference = 1 / v - KELVIN_OFFSET (degC). */\n"
      << "#define " << P << "_KELVIN_OFFSET " << lit(p.kelvin) << "\n";

  const char* var = t_basis ? "t" : "x";
  if (c.d.extended)
    o << "\n/* Coefficients m[k][l] of v = sum_k t^k (sum_l m[k][l] s^l), entry k * (AUX_DEGREE "
         "+ 1) + l, "
      << type << ". */\n";
  else
    o << "\n/* Coefficients of p in powers of "
      << (t_basis ? "the scaled variable t" : "the raw reading x") << " (index = power), " << type
      << ". */\n";
  o << "static const " << type << " " << P << "_COEF[" << c.d.table_size << "] = {\n";
  const int K = p.reading_degree, L = p.aux_degree, N = (K + 1) * (L + 1);
  for (int i = 0; i < N; ++i)
    o << "    " << lit(p.coef[static_cast<std::size_t>(i)]) << (i + 1 < N ? "," : " ") << " /* "
      << term_name(i / (L + 1), i % (L + 1), p.has_aux, var) << " */\n";
  o << "};\n\n";
}

// The statements of PREFIX_eval. One-input header: one Horner loop in t (or
// x); extended: the transforms and the nested Horner, declarations first (C89).
template <typename T>
void emit_eval_statements(std::ostringstream& o, const HeaderContext& c,
                          const FloatingProgram<T>& p, const char* type) {
  const std::string& P = c.n.P;
  const int K = p.reading_degree, L = p.aux_degree;
  if (!c.d.extended) {
    const char* var = p.basis == Basis::ScaledT ? "t" : "x";
    if (K == 0) {
      o << "    (void)x;\n    return " << P << "_COEF[0];\n}\n\n";
      return;
    }
    if (p.basis == Basis::ScaledT)
      o << "    const " << type << " t = (x - " << P << "_T_CENTER) * " << P << "_T_SCALE;\n";
    o << "    " << type << " y = " << P << "_COEF[" << K << "];\n";
    for (int k = K - 1; k >= 0; --k)
      o << "    y = y * " << var << " + " << P << "_COEF[" << k << "];\n";
    o << "    return y;\n}\n\n";
    return;
  }
  if (K > 0) o << "    " << type << " u, t;\n";
  if (p.has_aux && L > 0) o << "    " << type << " s;\n";
  o << "    " << type << " w, v;\n";
  if (K == 0) o << "    (void)x;\n";
  if (p.has_aux && L == 0) o << "    (void)aux;\n";
  if (K > 0) {
    if (!p.divider)
      o << "    u = x;\n";
    else if (p.sensor_low)
      o << "    u = (" << P << "_DIVIDER_R * x) / (" << P << "_DIVIDER_FULL_SCALE - x);\n";
    else
      o << "    u = (" << P << "_DIVIDER_R * (" << P << "_DIVIDER_FULL_SCALE - x)) / x;\n";
    if (p.ln) o << "    u = " << P << "_LOG(u);\n";
    o << "    t = (u - " << P << "_T_CENTER) * " << P << "_T_SCALE;\n";
  }
  if (p.has_aux && L > 0) o << "    s = (aux - " << P << "_S_CENTER) * " << P << "_S_SCALE;\n";
  for (int k = K; k >= 0; --k) {
    const int row = k * (L + 1);
    o << "    w = " << P << "_COEF[" << row + L << "];\n";
    for (int l = L - 1; l >= 0; --l) o << "    w = w * s + " << P << "_COEF[" << row + l << "];\n";
    o << (k == K ? "    v = w;\n" : "    v = v * t + w;\n");
  }
  if (p.reciprocal_kelvin)
    o << "    v = " << (std::is_same_v<T, float> ? "1.0f" : "1.0") << " / v - " << P
      << "_KELVIN_OFFSET;\n";
  o << "    return v;\n}\n\n";
}

template <typename T>
void emit_eval(std::ostringstream& o, const HeaderContext& c, const FloatingProgram<T>& p,
               const char* type, const std::string& args) {
  const std::string &P = c.n.P, &fu = c.fu;
  const std::string fmt =
      std::is_same_v<T, float> ? "IEEE 754 binary32 (float)" : "IEEE 754 binary64 (double)";
  const std::string ln_fn = std::is_same_v<T, float> ? "logf" : "log";
  o << "/* " << c.n.p << "_eval: reference value (" << fu << ") for reading x (" << c.ru << ")";
  if (c.d.extended)
    o << (p.has_aux ? " and aux (" + c.au + ")" : std::string()) << ".\n"
      << " * Computes: " << (p.divider ? "divider -> " : "") << (p.ln ? "ln -> " : "")
      << "scaling -> nested Horner v = sum_k t^k (sum_l m[k][l] s^l)"
      << (p.reciprocal_kelvin ? " -> 1/v - 273.15" : "") << ".\n"
      << " * Precision: " << fmt << " throughout, one rounding per operation\n"
      << " *   (no fused multiply-add: build with -ffp-contract=off)"
      << (p.ln ? ", ln by " + ln_fn + " (C library)" : std::string()) << ".\n"
      << " * Range: [" << P << "_X_MIN, " << P << "_X_MAX]"
      << (p.has_aux ? " x [" + P + "_AUX_MIN, " + P + "_AUX_MAX]" : std::string());
  else
    o << ".\n * Precision: " << fmt << " throughout, Horner's scheme in "
      << (p.basis == Basis::ScaledT ? "the scaled variable t" : "the raw reading x") << ",\n"
      << " *   one rounding per operation (no fused multiply-add: build with -ffp-contract=off).\n"
      << " * Range: [" << P << "_X_MIN, " << P << "_X_MAX]";
  o << "; outside it the result is an\n"
    << " *   unchecked extrapolation -- use " << c.n.p << "_eval_checked() for untrusted input.\n"
    << " * Measured max |error| against the double-precision model: " << g(c.dev.max, 4) << " "
    << fu << "\n *   (" << c.dev.points;
  if (c.d.extended)
    o << " inputs over the region, calibration points included"
      << (p.ln ? "; on a target add the log() allowance " + g(c.dev.allowance, 3) + " " + fu
               : std::string());
  else
    o << " inputs over the range, calibration readings included";
  o << "). */\n"
    << P << "_INLINE " << type << " " << c.n.p << "_eval(" << args << ")\n{\n"
    << "#if !defined(__GNUC__) || defined(__clang__)\n#pragma STDC FP_CONTRACT OFF\n#endif\n";
  emit_eval_statements(o, c, p, type);
}

// PREFIX_eval_checked: clamps each input into its range and reports its status.
template <typename T>
void emit_eval_checked(std::ostringstream& o, const HeaderContext& c, const FloatingProgram<T>& p,
                       const char* type, const std::string& args) {
  const std::string& P = c.n.P;
  const std::string& pre = c.n.p;
  o << "/* " << pre << "_eval_checked: as " << pre << "_eval, but never extrapolates.\n";
  if (c.d.extended)
    o << " * A reading outside [" << P << "_X_MIN, " << P
      << "_X_MAX] (or NaN) is clamped to the nearest\n"
      << " * limit (NaN: lower limit)"
      << (p.has_aux ? ", and so is aux to [" + P + "_AUX_MIN, " + P + "_AUX_MAX]" : std::string())
      << ";\n * *status (if status is not NULL) is set to " << P
      << "_IN_RANGE, _BELOW_RANGE, _ABOVE_RANGE\n * or _NOT_A_NUMBER"
      << (p.has_aux ? " for the reading, plus " + P +
                          "_AUX_BELOW_RANGE, _AUX_ABOVE_RANGE or\n * _AUX_NOT_A_NUMBER for aux"
                    : std::string());
  else
    o << " * An input outside [" << P << "_X_MIN, " << P << "_X_MAX] (or NaN) is clamped to the\n"
      << " * nearest limit (NaN: lower limit), and *status (if status is not NULL) is set to\n"
      << " * " << P << "_IN_RANGE, _BELOW_RANGE, _ABOVE_RANGE or _NOT_A_NUMBER";
  const char* st = c.d.extended ? "st" : "s";
  o << ". Precision as " << pre << "_eval. */\n"
    << P << "_INLINE " << type << " " << pre << "_eval_checked(" << args << ", int *status)\n{\n"
    << "    int " << st << ";\n"
    << "    if (x >= " << P << "_X_MIN && x <= " << P << "_X_MAX) {\n        " << st << " = " << P
    << "_IN_RANGE;\n"
    << "    } else if (x < " << P << "_X_MIN) {\n        " << st << " = " << P
    << "_BELOW_RANGE;\n        x = " << P << "_X_MIN;\n"
    << "    } else if (x > " << P << "_X_MAX) {\n        " << st << " = " << P
    << "_ABOVE_RANGE;\n        x = " << P << "_X_MAX;\n"
    << "    } else { /* NaN: every comparison above is false */\n        " << st << " = " << P
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
  o << "    if (status != 0)\n        *status = " << st << ";\n"
    << "    return " << pre << "_eval(x" << (p.has_aux ? ", aux" : "") << ");\n}\n\n";
}

// The constants emit_constants wrote, for the self-check: the table first,
// then every macro in the order written, then the degree macros.
template <typename T>
void check_constants(HeaderContext& c, const FloatingProgram<T>& p) {
  const std::string& P = c.n.P;
  const auto one = [](const std::string& name, T v) {
    if constexpr (std::is_same_v<T, float>)
      return checked_f32(name, v);
    else
      return checked_f64(name, v);
  };
  CheckedConstant table = one(P + "_COEF", T(0));
  table.bits.clear();
  for (T v : p.coef) table.bits.push_back(one("", v).bits[0]);
  table.table = true;
  table.count_expr = c.d.table_size;
  std::vector<CheckedConstant>& k = c.checked;
  k.push_back(table);
  k.push_back(one(P + "_X_MIN", p.x_lo));
  k.push_back(one(P + "_X_MAX", p.x_hi));
  if (p.has_aux) {
    k.push_back(one(P + "_AUX_MIN", p.a_lo));
    k.push_back(one(P + "_AUX_MAX", p.a_hi));
  }
  if (p.divider) {
    k.push_back(one(P + "_DIVIDER_R", p.divider_r));
    k.push_back(one(P + "_DIVIDER_FULL_SCALE", p.divider_fs));
  }
  if (p.basis == Basis::ScaledT) {
    k.push_back(one(P + "_T_CENTER", p.center));
    k.push_back(one(P + "_T_SCALE", p.inv_half_width));
  }
  if (p.has_aux) {
    k.push_back(one(P + "_S_CENTER", p.aux_center));
    k.push_back(one(P + "_S_SCALE", p.aux_inv_half_width));
  }
  if (p.reciprocal_kelvin) k.push_back(one(P + "_KELVIN_OFFSET", p.kelvin));
  using Kind = CheckedConstant::Kind;
  if (c.d.extended) {
    k.push_back(checked_int(P + "_READING_DEGREE", Kind::I32, p.reading_degree));
    k.push_back(checked_int(P + "_AUX_DEGREE", Kind::I32, p.aux_degree));
    k.push_back(checked_int(P + "_N_COEF", Kind::I32, (p.reading_degree + 1) * (p.aux_degree + 1)));
  } else {
    k.push_back(checked_int(P + "_DEGREE", Kind::I32, p.reading_degree));
  }
}

}  // namespace

template <typename T>
void emit_floating(std::ostringstream& o, HeaderContext& c, const FloatingProgram<T>& p) {
  const char* type = std::is_same_v<T, float> ? "float" : "double";
  const std::string args =
      std::string(type) + " x" + (p.has_aux ? std::string(", ") + type + " aux" : "");
  emit_constants(o, c, p, type);
  check_constants(c, p);
  emit_eval(o, c, p, type, args);
  emit_eval_checked(o, c, p, type, args);
}

template void emit_floating<float>(std::ostringstream&, HeaderContext&, const FloatProgram&);
template void emit_floating<double>(std::ostringstream&, HeaderContext&, const DoubleProgram&);

}  // namespace ridgecal::firmware::detail
