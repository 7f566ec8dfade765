#include "ridgecal/firmware/crc_table.hpp"

#include <boost/crc.hpp>
#include <cstring>

namespace ridgecal::firmware {

std::uint32_t crc32_bytes(const std::vector<std::uint8_t>& bytes) {
  boost::crc_32_type crc;
  crc.process_bytes(bytes.data(), bytes.size());
  return crc.checksum();
}

std::uint32_t crc32_text(std::string_view text) {
  boost::crc_32_type crc;
  crc.process_bytes(text.data(), text.size());
  return crc.checksum();
}

namespace {
template <typename Bits>
void append_le(std::vector<std::uint8_t>& out, Bits bits) {
  for (std::size_t b = 0; b < sizeof(Bits); ++b)
    out.push_back(static_cast<std::uint8_t>((bits >> (8 * b)) & 0xFFu));
}
}  // namespace

std::vector<std::uint8_t> table_bytes(const std::vector<float>& table) {
  std::vector<std::uint8_t> out;
  for (float v : table) {
    std::uint32_t bits;
    std::memcpy(&bits, &v, sizeof bits);
    append_le(out, bits);
  }
  return out;
}

std::vector<std::uint8_t> table_bytes(const std::vector<double>& table) {
  std::vector<std::uint8_t> out;
  for (double v : table) {
    std::uint64_t bits;
    std::memcpy(&bits, &v, sizeof bits);
    append_le(out, bits);
  }
  return out;
}

std::vector<std::uint8_t> table_bytes(const std::vector<std::int32_t>& table) {
  std::vector<std::uint8_t> out;
  for (std::int32_t v : table) append_le(out, static_cast<std::uint32_t>(v));
  return out;
}

}  // namespace ridgecal::firmware
