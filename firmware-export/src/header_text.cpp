// Text helpers of the header writer and the coefficient-table check
// (PREFIX_table_crc32, PREFIX_check_table), the same for every model.
#include <cmath>
#include <cstdio>
#include <type_traits>

#include "header_writer.hpp"
#include "ridgecal/firmware/c_literals.hpp"
#include "ridgecal/firmware/c_text.hpp"

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
