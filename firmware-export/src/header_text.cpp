// Text helpers of the header writer and the coefficient-table check
// (PREFIX_table_crc32, PREFIX_check_table), the same for every model.
#include <cassert>
#include <cmath>
#include <cstdio>
#include <cstring>
#include <type_traits>

#include "header_writer.hpp"
#include "ridgecal/firmware/c_literals.hpp"
#include "ridgecal/firmware/c_text.hpp"
#include "ridgecal/firmware/crc_table.hpp"

namespace ridgecal::firmware::detail {

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

template <typename T>
std::string lit(T v) {
  if constexpr (std::is_same_v<T, float>)
    return c_float_literal(v);
  else
    return c_double_literal(v);
}
template std::string lit<float>(float);
template std::string lit<double>(double);

std::string range_text(const IntRange& r) {
  char buf[96];
  std::snprintf(buf, sizeof buf, "[%.0Lf, %.0Lf]", r.lo, r.hi);
  return buf;
}

std::string term_name(int k, int l, bool has_aux, const char* var) {
  std::string s = var + ("^" + std::to_string(k));
  if (has_aux) s += " s^" + std::to_string(l);
  return s;
}

int CheckedConstant::bytes() const {
  switch (kind) {
    case Kind::F32:
    case Kind::I32:
      return 4;
    case Kind::F64:
    case Kind::I64:
      return 8;
    case Kind::U8:
      return 1;
  }
  return 0;
}

CheckedConstant checked_f32(const std::string& name, float v) {
  std::uint32_t u = 0;
  std::memcpy(&u, &v, sizeof u);
  return CheckedConstant{name, CheckedConstant::Kind::F32, {u}, false, ""};
}

CheckedConstant checked_f64(const std::string& name, double v) {
  std::uint64_t u = 0;
  std::memcpy(&u, &v, sizeof u);
  return CheckedConstant{name, CheckedConstant::Kind::F64, {u}, false, ""};
}

CheckedConstant checked_int(const std::string& name, CheckedConstant::Kind k, std::int64_t v) {
  std::uint64_t u = 0;
  switch (k) {
    case CheckedConstant::Kind::I32:
      u = static_cast<std::uint32_t>(static_cast<std::int32_t>(v));
      break;
    case CheckedConstant::Kind::I64:
      u = static_cast<std::uint64_t>(v);
      break;
    case CheckedConstant::Kind::U8:
      u = static_cast<std::uint8_t>(v);
      break;
    default:
      assert(false && "checked_int: an integer kind");
  }
  return CheckedConstant{name, k, {u}, false, ""};
}

std::uint32_t checked_crc32(const std::vector<CheckedConstant>& checked) {
  std::vector<std::uint8_t> bytes;
  for (const CheckedConstant& k : checked)
    for (std::uint64_t v : k.bits)
      for (int b = 0; b < k.bytes(); ++b)
        bytes.push_back(static_cast<std::uint8_t>((v >> (8 * b)) & 0xFFU));
  return crc32_bytes(bytes);
}

std::string checked_names(const std::vector<CheckedConstant>& checked) {
  std::string s;
  for (const CheckedConstant& k : checked) {
    if (!s.empty()) s += ", ";
    s += k.name;
    if (k.table) s += "[0.." + std::to_string(k.bits.size() - 1) + "]";
  }
  return s;
}

namespace {

// The C expression of one checked value's bit pattern as a uint64_t.
std::string bits_expr(const Names& n, const CheckedConstant& k, const std::string& value) {
  switch (k.kind) {
    case CheckedConstant::Kind::F32:
      return n.p + "_bits_f(" + value + ")";
    case CheckedConstant::Kind::F64:
      return n.p + "_bits_d(" + value + ")";
    case CheckedConstant::Kind::I32:
      return "(uint64_t)(uint32_t)(" + value + ")";
    case CheckedConstant::Kind::I64:
      return "(uint64_t)(" + value + ")";
    case CheckedConstant::Kind::U8:
      return "(uint64_t)" + value;
  }
  return "";
}

}  // namespace

void emit_crc(std::ostringstream& o, const HeaderContext& c, bool double_mode) {
  const Names& n = c.n;
  bool has_f = false, has_d = false;
  for (const CheckedConstant& k : c.checked) {
    has_f |= k.kind == CheckedConstant::Kind::F32;
    has_d |= k.kind == CheckedConstant::Kind::F64;
  }
  o << "/* Self-check of every constant the evaluation uses: CRC-32 (IEEE) over\n"
    << "   " << n.P << "_TABLE_CRC32's list, each value's bit pattern ("
    << (has_f   ? "IEEE 754 binary32"
        : has_d ? "IEEE 754 binary64"
                : "two's complement")
    << (has_f || has_d ? "; integers two's complement" : "")
    << "),\n   least significant byte first -- the same on little- and big-endian targets.\n"
    << "   Bitwise (no table). Call it at start-up via " << n.p << "_check_table(). */\n"
    << n.P << "_INLINE uint32_t " << n.p << "_crc32_step(uint32_t crc, uint64_t bits, unsigned n)\n"
    << "{\n    unsigned b, i;\n    for (b = 0U; b < n; ++b) {\n"
    << "        crc ^= (uint32_t)((bits >> (8U * b)) & 0xFFU);\n"
    << "        for (i = 0U; i < 8U; ++i) {\n"
    << "            if ((crc & 1U) != 0U)\n"
    << "                crc = (crc >> 1) ^ (uint32_t)0xEDB88320UL;\n"
    << "            else\n"
    << "                crc >>= 1;\n"
    << "        }\n    }\n    return crc;\n}\n\n";
  if (has_f)
    o << n.P << "_INLINE uint64_t " << n.p << "_bits_f(float f)\n{\n"
      << "    union { float f; uint32_t u; } pun;\n    pun.f = f;\n    return pun.u;\n}\n\n";
  if (has_d)
    o << n.P << "_INLINE uint64_t " << n.p << "_bits_d(double d)\n{\n"
      << "    union { double d; uint64_t u; } pun;\n    pun.u = 0U;\n    pun.d = d;\n"
      << "    return pun.u;\n}\n\n";
  o << n.P << "_INLINE uint32_t " << n.p << "_table_crc32(void)\n{\n"
    << "    uint32_t crc = 0xFFFFFFFFUL;\n    unsigned k;\n";
  for (const CheckedConstant& k : c.checked) {
    const std::string bytes = std::to_string(k.bytes()) + "U";
    if (k.table)
      o << "    for (k = 0U; k < (unsigned)(" << k.count_expr << "); ++k)\n"
        << "        crc = " << n.p << "_crc32_step(crc, " << bits_expr(n, k, k.name + "[k]") << ", "
        << bytes << ");\n";
    else
      o << "    crc = " << n.p << "_crc32_step(crc, " << bits_expr(n, k, k.name) << ", " << bytes
        << ");\n";
  }
  o << "    return crc ^ (uint32_t)0xFFFFFFFFUL;\n}\n\n"
    << "/* Start-up self-check: " << n.P << "_TABLE_OK when every constant is intact,\n"
    << "   " << n.P << "_TABLE_CORRUPT otherwise";
  if (double_mode)
    o << ", " << n.P << "_TABLE_UNCHECKABLE where double is not\n   IEEE binary64 "
      << "(e.g. avr-gcc, whose double is 32 bits)";
  o << ". */\n" << n.P << "_INLINE int " << n.p << "_check_table(void)\n{\n";
  if (double_mode)
    o << "    if (sizeof(double) != 8U)\n        return " << n.P << "_TABLE_UNCHECKABLE;\n";
  o << "    return " << n.p << "_table_crc32() == " << n.P << "_TABLE_CRC32 ? " << n.P
    << "_TABLE_OK : " << n.P << "_TABLE_CORRUPT;\n}\n\n";
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

}  // namespace ridgecal::firmware::detail
