// The names of a batch's units: the 64-bit hash of a label, the set of hashes
// met so far (batch_reader.hpp), and the file stem of each unit's outputs.
#include <fmt/format.h>

#include <algorithm>
#include <cstdint>

#include "ridgecal/batch_reader.hpp"

namespace ridgecal {

std::uint64_t unit_label_hash(const std::string& s) {
  std::uint64_t h = 0xcbf29ce484222325ULL;
  for (unsigned char c : s) {
    h ^= c;
    h *= 0x100000001b3ULL;
  }
  return h;
}

bool HashSet64::insert(std::uint64_t h) {
  if (std::binary_search(sorted_.begin(), sorted_.end(), h)) return false;
  if (std::find(tail_.begin(), tail_.end(), h) != tail_.end()) return false;
  tail_.push_back(h);
  if (tail_.size() >= 1024) {
    std::sort(tail_.begin(), tail_.end());
    const std::size_t mid = sorted_.size();
    sorted_.insert(sorted_.end(), tail_.begin(), tail_.end());
    std::inplace_merge(sorted_.begin(), sorted_.begin() + static_cast<std::ptrdiff_t>(mid),
                       sorted_.end());
    tail_.clear();
  }
  return true;
}

namespace {

std::string lower_ascii(std::string s) {
  for (char& c : s)
    if (c >= 'A' && c <= 'Z') c = static_cast<char>(c - 'A' + 'a');
  return s;
}

// Windows device names: CON, PRN, AUX, NUL, COM0-9, LPT0-9, alone or before
// the first '.', in any case (common practice of portable archivers).
bool reserved_on_windows(const std::string& name) {
  const std::string base = lower_ascii(name.substr(0, name.find('.')));
  if (base == "con" || base == "prn" || base == "aux" || base == "nul") return true;
  return base.size() == 4 && (base.compare(0, 3, "com") == 0 || base.compare(0, 3, "lpt") == 0) &&
         base[3] >= '0' && base[3] <= '9';
}

// Ends in '-' and 8 lowercase hex digits: the form of a hashed name.
bool has_hash_suffix(const std::string& s) {
  if (s.size() < 9 || s[s.size() - 9] != '-') return false;
  for (std::size_t i = s.size() - 8; i < s.size(); ++i)
    if (!((s[i] >= '0' && s[i] <= '9') || (s[i] >= 'a' && s[i] <= 'f'))) return false;
  return true;
}

std::string hash_suffix(const std::string& unit) {
  return fmt::format("-{:08x}", static_cast<std::uint32_t>(unit_label_hash(unit) >> 32));
}

}  // namespace

std::string unit_file_stem(const std::string& unit) {
  std::string s;
  bool changed = unit.empty() || unit.size() > 100;
  for (char c : unit.substr(0, 100)) {
    const bool ok = (c >= 'A' && c <= 'Z') || (c >= 'a' && c <= 'z') || (c >= '0' && c <= '9') ||
                    c == '.' || c == '_' || c == '-';
    s += ok ? c : '_';
    changed = changed || !ok;
  }
  if (!s.empty() && s[0] == '.') {
    s[0] = '_';
    changed = true;
  }
  if (reserved_on_windows(s)) {
    s.insert(s.begin(), '_');
    changed = true;
  }
  if (changed || has_hash_suffix(s)) s += hash_suffix(unit);
  return s;
}

std::string UnitFileNames::assign(const std::string& unit) {
  std::string s = unit_file_stem(unit);
  if (used_.insert(unit_label_hash(lower_ascii(s)))) return s;
  if (has_hash_suffix(s)) return {};  // a hashed name taken (improbable): no name
  s += hash_suffix(unit);             // a plain label that differs from an earlier one in case
  if (used_.insert(unit_label_hash(lower_ascii(s)))) return s;
  return {};
}

}  // namespace ridgecal
