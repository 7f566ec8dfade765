#include "ridgecal/sha256.hpp"

#include <openssl/evp.h>

#include <cassert>
#include <memory>

namespace ridgecal {

std::string sha256_hex(std::string_view bytes) {
  unsigned char digest[EVP_MAX_MD_SIZE];
  unsigned int len = 0;
  const int ok = EVP_Digest(bytes.data(), bytes.size(), digest, &len, EVP_sha256(), nullptr);
  assert(ok == 1 && len == 32);
  (void)ok;
  static const char* hex = "0123456789abcdef";
  std::string out;
  out.reserve(2 * len);
  for (unsigned int i = 0; i < len; ++i) {
    out += hex[digest[i] >> 4];
    out += hex[digest[i] & 0xF];
  }
  return out;
}

}  // namespace ridgecal
