// Internal: exact 128-bit integer helpers for the fixed-point overflow proofs,
// used by the fixed-point plan (fixed_point.cpp).
#pragma once

#include <cstdint>

namespace ridgecal::firmware::detail {

using i128 = __int128;

inline constexpr i128 kTwo62 = static_cast<i128>(1) << 62;
inline constexpr std::int64_t kInt32Max = 2147483647LL;
/// Largest right shift the generated code uses.
inline constexpr int kMaxShift = 61;
/// Headroom target for every accumulator and coefficient: |value| <= 2^30, one
/// bit below int32 so that rounding can never tip a proved bound over.
inline constexpr int kAccBits = 30;

/// floor(v / 2^s), exactly (s >= 0).
inline i128 floor_div_pow2(i128 v, int s) {
  const i128 d = static_cast<i128>(1) << s;
  i128 q = v / d;
  if ((v % d) != 0 && v < 0) --q;
  return q;
}

/// Mathematical value of the generated rounding right shift by s (s >= 1):
/// floor((v + 2^(s-1)) / 2^s).
inline i128 rshift_round_exact(i128 v, int s) {
  return floor_div_pow2(v + (static_cast<i128>(1) << (s - 1)), s);
}

/// True when a rounding right shift by s of every value in [lo, hi] is safe in
/// int64: 1 <= s <= kMaxShift and the rounding addend cannot overflow.
inline bool rshift_precondition(i128 lo, i128 hi, int s) {
  if (s < 1 || s > kMaxShift) return false;
  const i128 half = static_cast<i128>(1) << (s - 1);
  return lo + half >= -kTwo62 && hi + half < kTwo62;
}

}  // namespace ridgecal::firmware::detail
