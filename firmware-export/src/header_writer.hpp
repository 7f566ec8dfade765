// Internal: the pieces of the one C header writer. generate_header.cpp runs
// the export proof (header_proof.cpp) and then writes, in this order, the
// banner and macros (header_banner.cpp), the constants, table and functions
// of the numeric mode (header_functions_float.cpp / header_functions_fixed.cpp)
// and the table check (header_text.cpp). Each piece is written once for every
// model; where the one-input and the extended header differ
// (FirmwareModel::extended), the difference is a phrase or a flag of the
// piece (Dialect), not a second writer.
#pragma once

#include <cstddef>
#include <cstdint>
#include <optional>
#include <sstream>
#include <string>
#include <vector>

#include "ridgecal/firmware/export.hpp"

namespace ridgecal::firmware::detail {

struct Names {
  std::string p;  // function prefix, e.g. "calib"
  std::string P;  // macro prefix, e.g. "CALIB"
};

/// What the export proof measured: header arithmetic vs the double model.
struct Deviation {
  double max = 0;            ///< max |emulated - model|, reference units
  double at = 0;             ///< reading where it occurs
  double at_aux = 0;         ///< aux value there (0 without an aux input)
  std::size_t points = 0;    ///< inputs checked in total
  std::size_t readings = 0;  ///< of which calibration points
  double allowance = 0;      ///< ln models: the log() allowance (reference units)
};

/// The tolerance the proof judges against and the allowed deviation.
struct ProofTolerance {
  double tolerance = 0;
  double limit = 0;
  std::string source;
};

/// The points the proof checks. The one-input header checks grid_points
/// readings (fixed: every raw reading up to exhaustive_limit) and skips a
/// calibration reading outside the program's inward-rounded range; the
/// extended header checks at most 801 readings x 101 aux values and clamps a
/// calibration point on the region's edge into the program's range.
struct ProofGrid {
  int reading_points = 2001;
  int aux_points = 1;
  std::int64_t exhaustive_limit = 0;  ///< fixed: all raw readings when at most this many
  bool clamp_readings = false;
};
ProofGrid proof_grid(const FirmwareModel& m, const ExportOptions& opt);

/// The phrases in which the two header dialects differ.
struct Dialect {
  bool extended = false;
  const char* input_word;    ///< "input" / "reading": what a status code speaks of
  const char* outcome_word;  ///< "result" / "evaluated"
  std::string table_size;    ///< "P_DEGREE + 1" / "P_N_COEF"
};
Dialect dialect(const FirmwareModel& m, const Names& n);

/// A constant the evaluation uses, covered by the header's self-check
/// (PREFIX_table_crc32): a macro or a table, with the exact bit pattern the
/// C code will see. The CRC runs over every entry in the order of
/// HeaderContext::checked, each value's `bytes()` least significant bytes
/// first (a float its IEEE binary32 pattern, an int32 its two's complement).
struct CheckedConstant {
  enum class Kind { F32, F64, I32, I64, U8 };
  std::string name;  ///< the macro or table name, e.g. "CALIB_X_MIN"
  Kind kind = Kind::I32;
  std::vector<std::uint64_t> bits;  ///< one value, or every entry of a table
  bool table = false;               ///< a table NAME[bits.size()] (else a macro)
  std::string count_expr;           ///< tables: the C expression of their length
  int bytes() const;                ///< 4, 8, 4, 8, 1
};
CheckedConstant checked_f32(const std::string& name, float v);
CheckedConstant checked_f64(const std::string& name, double v);
CheckedConstant checked_int(const std::string& name, CheckedConstant::Kind k, std::int64_t v);

/// Everything a piece of the header text reads.
struct HeaderContext {
  const FirmwareModel& model;
  const HeaderMeta& meta;
  const ExportOptions& opt;
  Names n;
  Dialect d;
  ProofTolerance tol;
  Deviation dev;
  std::string formats;
  bool needs_log = false;  ///< the C calls log()/logf()
  std::string ru, fu, au;  ///< the units, escaped for a comment
  /// Every constant the evaluation uses, the coefficient table first; filled
  /// by emit_floating / emit_fixed, read by the CRC and the self-check.
  std::vector<CheckedConstant> checked;
};

// ---- header_text.cpp: text helpers --------------------------------------------------

/// %.*g, "n/a" for NaN.
std::string g(double v, int digits = 6);
/// "0x%08lXUL"
std::string hex32(std::uint32_t v);
/// escape_c_comment, "(not given)" for an empty string.
std::string esc(const std::string& s, std::size_t max_chars = 200);
/// A float (suffix f) or double literal that reads back to v.
template <typename T>
std::string lit(T v);
/// "[lo, hi]" of an integer interval.
std::string range_text(const IntRange& r);
/// "t^k", with an aux input "t^k s^l"; var replaces t (one-input raw-x basis).
std::string term_name(int k, int l, bool has_aux, const char* var = "t");
/// PREFIX_table_crc32() and PREFIX_check_table() over every constant of
/// c.checked; `double_mode`: the check is UNCHECKABLE where double is not 64-bit.
void emit_crc(std::ostringstream& o, const HeaderContext& c, bool double_mode);
/// The CRC-32 the generated PREFIX_table_crc32() computes over c.checked.
std::uint32_t checked_crc32(const std::vector<CheckedConstant>& checked);
/// "P_COEF[0..n-1], P_X_MIN, ...": the names of the checked constants.
std::string checked_names(const std::vector<CheckedConstant>& checked);
/// Size figures of a generated header: its bytes and lines, the table size,
/// and the operations per evaluation.
CodeStats stats_for(const std::string& text, int entries, int entry_bytes, int mul, int add);

// ---- header_banner.cpp ----------------------------------------------------------------

/// The "do not edit" banner with the QA and export-proof block. `at` is the
/// text after "at reading <value>" (units or the aux value).
void emit_banner(std::ostringstream& o, const HeaderContext& c, const std::string& at);
/// Include guard, includes, the model macros, CRC, status codes, the
/// PREFIX_TABLE_* codes, PREFIX_INLINE and the opening of extern "C".
void emit_prologue(std::ostringstream& o, const HeaderContext& c, std::uint32_t crc);
/// extern "C" close and the include guard's #endif.
void emit_epilogue(std::ostringstream& o, const Names& n);

// ---- header_functions_float.cpp / header_functions_fixed.cpp ------------------------

/// Range, scaling and transform constants, the coefficient table,
/// PREFIX_eval() and PREFIX_eval_checked() of a float/double program.
template <typename T>
void emit_floating(std::ostringstream& o, HeaderContext& c, const FloatingProgram<T>& p);
/// Raw ranges, the coefficient table, PREFIX_rshift_round(),
/// PREFIX_eval_fixed() and PREFIX_eval_fixed_checked() of a fixed-point plan.
void emit_fixed(std::ostringstream& o, HeaderContext& c, const FixedPlan& p);

// ---- header_proof.cpp -------------------------------------------------------------------

/// The tolerance of `meta` when given, else its validation RMSE; limit =
/// opt.max_deviation_fraction times it. False, with `message` set, when
/// neither is usable.
bool choose_proof_tolerance(const HeaderMeta& meta, const ExportOptions& opt, ProofTolerance& out,
                            std::string& message);

/// The float/double program of a model (T = float or double) for a basis, with
/// the inward-rounded range; nullopt if a constant does not fit the type
/// (overflow to inf) or the basis is not offered (raw x: one-input header only).
template <typename T>
std::optional<FloatingProgram<T>> make_program(const FirmwareModel& m, Basis b);

/// Emulates the program or plan over the proof grid and the calibration
/// points and compares with m.reference.
template <typename T>
Deviation measure(const FirmwareModel& m, const FloatingProgram<T>& p, const ProofGrid& grid,
                  const HeaderMeta& meta);
Deviation measure(const FirmwareModel& m, const FixedPlan& p, const ProofGrid& grid,
                  const HeaderMeta& meta);

}  // namespace ridgecal::firmware::detail
