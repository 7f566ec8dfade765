// ridgecal firmware export: CRC-32 of a coefficient table, as the C side sees it.
#pragma once

#include <cstdint>
#include <string_view>
#include <vector>

namespace ridgecal::firmware {

/// CRC-32 (IEEE 802.3 / zlib: reflected polynomial 0xEDB88320, initial value
/// and final xor 0xFFFFFFFF) of a byte sequence, computed with Boost.CRC.
std::uint32_t crc32_bytes(const std::vector<std::uint8_t>& bytes);
std::uint32_t crc32_text(std::string_view text);

/// The byte stream the generated C code feeds to its CRC: each table entry's
/// bit pattern (IEEE bits for float/double, two's complement for int32),
/// least significant byte first, entries in table order. Defined on the
/// values, so it is the same on little- and big-endian targets.
std::vector<std::uint8_t> table_bytes(const std::vector<float>& table);
std::vector<std::uint8_t> table_bytes(const std::vector<double>& table);
std::vector<std::uint8_t> table_bytes(const std::vector<std::int32_t>& table);

}  // namespace ridgecal::firmware
