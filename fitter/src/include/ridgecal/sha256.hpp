// ridgecal: SHA-256 digests (OpenSSL), as lowercase hex.
#pragma once

#include <string>
#include <string_view>

namespace ridgecal {

/// SHA-256 of a byte string, 64 lowercase hex characters.
std::string sha256_hex(std::string_view bytes);

}  // namespace ridgecal
