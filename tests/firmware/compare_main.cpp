// fw_compare EXPECTED ACTUAL: checks a target's driver output against the
// host emulation (expected.txt from fw_fixture).
//
// Every line must be identical (bit for bit), with one documented exception:
// double mode on a target whose double is 32 bits (avr-gcc; the driver's
// "P dbl=4" line says so). There the header's double code runs in binary32,
// and each result must lie within kNarrowDoubleRelBound x (largest |expected
// result|) of the host's binary64 result, and fwt_check_table() must report
// TABLE_UNCHECKABLE (2).
//
// Extended models with ln (log/logf from the target's C library): expected.txt
// starts with "# tol <bound> <bound32>"; every V/K result must then lie within
// <bound> of the host's result (<bound32> where double is 32 bits), all other
// fields identical. The bounds are written by fw_fixture from the export's
// measured deviation and its log() allowance (docs/firmware-export.md).
// Exit 0: agree; 1: differ; 2: unreadable/incomplete input.
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <cstring>
#include <fstream>
#include <iostream>
#include <sstream>
#include <string>
#include <vector>

namespace {

// Bound for double mode on a 32-bit-double target: 16 binary32 ulps (2^-24
// relative each) of the largest result magnitude. Source: the measured
// difference on ATmega328P for the NTC fixture (degree 5) was 1.06e-5 degC
// with max |p| = 101 degC, i.e. 1.8 such ulps; a degree-n binary32 Horner
// with |t| <= 1 accumulates at most ~2n roundings of 2^-24 x sum|coef|.
// 16 leaves a margin of ~9x over the measurement without hiding a formula
// error (those are orders of magnitude larger).
constexpr double kNarrowDoubleRelBound = 16.0 * 5.9604644775390625e-08;

std::vector<std::string> read_lines(const char* path) {
  std::ifstream in(path);
  std::vector<std::string> out;
  std::string l;
  while (std::getline(in, l)) {
    if (!l.empty() && l.back() == '\r') l.pop_back();
    out.push_back(l);
  }
  return out;
}

std::vector<std::string> fields(const std::string& l) {
  std::istringstream is(l);
  std::vector<std::string> f;
  std::string w;
  while (is >> w) f.push_back(w);
  return f;
}

double as_double(const std::string& hex) {
  const std::uint64_t u = std::stoull(hex, nullptr, 16);
  if (hex.size() == 16) {
    double d;
    std::memcpy(&d, &u, 8);
    return d;
  }
  const std::uint32_t v = static_cast<std::uint32_t>(u);
  float f;
  std::memcpy(&f, &v, 4);
  return static_cast<double>(f);
}

}  // namespace

int main(int argc, char** argv) {
  if (argc != 3) {
    std::cerr << "usage: fw_compare EXPECTED ACTUAL\n";
    return 2;
  }
  auto exp = read_lines(argv[1]);
  double tol = 0, tol32 = 0;
  if (!exp.empty() && exp[0].rfind("# tol ", 0) == 0) {
    std::istringstream is(exp[0].substr(6));
    is >> tol >> tol32;
    if (!(tol > 0)) {
      std::cerr << "fw_compare: bad tol line\n";
      return 2;
    }
    exp.erase(exp.begin());
  }
  std::vector<std::string> act;
  int dbl_size = 0;
  for (const auto& l : read_lines(argv[2])) {
    if (l.rfind("P dbl=", 0) == 0)
      dbl_size = std::atoi(l.c_str() + 6);
    else if (!l.empty())
      act.push_back(l);
  }
  if (exp.empty() || exp.back().rfind("END ", 0) != 0) {
    std::cerr << "fw_compare: expected file has no END line\n";
    return 2;
  }
  if (act.empty() || act.back().rfind("END ", 0) != 0) {
    std::cerr << "fw_compare: target output is incomplete (no END line; " << act.size()
              << " lines)\n";
    return 2;
  }
  if (act.size() != exp.size()) {
    std::cerr << "fw_compare: " << act.size() << " lines, expected " << exp.size() << "\n";
    return 1;
  }
  const bool double_mode = exp[0].find("mode=double") != std::string::npos;
  const bool narrow = double_mode && dbl_size == 4;
  double max_expected = 0;
  if (narrow)
    for (const auto& l : exp) {
      const auto f = fields(l);
      if ((f[0] == "V" || f[0] == "K") && std::isfinite(as_double(f.back())))
        max_expected = std::fmax(max_expected, std::fabs(as_double(f.back())));
    }
  const bool tol_mode = tol > 0;
  const double bound = tol_mode ? (narrow ? tol32 : tol) : kNarrowDoubleRelBound * max_expected;
  std::size_t identical = 0, within = 0, bad = 0;
  double max_diff = 0;
  for (std::size_t i = 0; i < exp.size(); ++i) {
    if (exp[i] == act[i]) {
      ++identical;
      continue;
    }
    bool ok = false;
    if (narrow || tol_mode) {
      const auto e = fields(exp[i]), a = fields(act[i]);
      if (e.size() == a.size() && !e.empty() && e[0] == a[0]) {
        if (e[0] == "C") {
          ok = narrow && a[2] == "2";  // TABLE_UNCHECKABLE where double is 32 bits
        } else if (e[0] == "V" || e[0] == "K") {
          bool same_prefix = true;
          for (std::size_t k = 0; k + 1 < e.size(); ++k) same_prefix = same_prefix && e[k] == a[k];
          const double d = std::fabs(as_double(e.back()) - as_double(a.back()));
          max_diff = std::fmax(max_diff, d);
          ok = same_prefix && d <= bound;
        }
      }
    }
    if (ok) {
      ++within;
    } else {
      if (++bad <= 10)
        std::cerr << "line " << i + 1 << ":\n  expected: " << exp[i] << "\n  actual:   " << act[i]
                  << "\n";
    }
  }
  std::cout << "fw_compare: " << exp.size() << " lines, " << identical << " bit-identical";
  if (narrow || tol_mode)
    std::cout << ", " << within << " within the "
              << (tol_mode ? "stated log() bound" : "32-bit-double bound") << " (max |diff| "
              << max_diff << ", bound " << bound << ")";
  std::cout << ", " << bad << " differing\n";
  return bad == 0 ? 0 : 1;
}
