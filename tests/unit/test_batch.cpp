// ridgecal batch: partial failures, determinism across jobs, streaming of
// many small units, reappearing units, and merging shard summaries.
#define BOOST_TEST_MODULE batch
#include <fmt/format.h>
#include <stdlib.h>

#include <atomic>
#include <boost/test/unit_test.hpp>
#include <cstddef>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <new>
#include <string>

#include "ridgecal/atomic_file.hpp"
#include "ridgecal/batch_fast_parse.hpp"
#include "ridgecal/batch_run.hpp"
#include "ridgecal/batch_synthetic.hpp"
#include "ridgecal/errors.hpp"

using namespace ridgecal;
namespace fs = std::filesystem;

// Live heap bytes, counted by this test program's own global operator new and
// delete: what the code holds, independent of the allocator's caching, of
// arenas per thread and of RSS (and of AddressSanitizer's quarantine).
namespace heap_count {
std::atomic<std::size_t> live{0};
std::atomic<std::size_t> peak{0};
// Each block carries its size in a header that keeps the alignment of malloc.
constexpr std::size_t kHeader = alignof(std::max_align_t);
void* allocate(std::size_t n) {
  void* p = std::malloc(n + kHeader);
  if (p == nullptr) throw std::bad_alloc();
  *static_cast<std::size_t*>(p) = n;
  const std::size_t now = live.fetch_add(n) + n;
  std::size_t seen = peak.load();
  while (now > seen && !peak.compare_exchange_weak(seen, now)) {
  }
  return static_cast<char*>(p) + kHeader;
}
void release(void* p) noexcept {
  if (p == nullptr) return;
  char* block = static_cast<char*>(p) - kHeader;
  live.fetch_sub(*reinterpret_cast<std::size_t*>(block));
  std::free(block);
}
/// Starts a new peak at the current live size; returns that size.
std::size_t restart_peak() {
  const std::size_t now = live.load();
  peak.store(now);
  return now;
}
}  // namespace heap_count

void* operator new(std::size_t n) {
  return heap_count::allocate(n);
}
void* operator new[](std::size_t n) {
  return heap_count::allocate(n);
}
void* operator new(std::size_t n, const std::nothrow_t&) noexcept {
  try {
    return heap_count::allocate(n);
  } catch (...) {
    return nullptr;
  }
}
void* operator new[](std::size_t n, const std::nothrow_t& t) noexcept {
  return operator new(n, t);
}
void operator delete(void* p) noexcept {
  heap_count::release(p);
}
void operator delete[](void* p) noexcept {
  heap_count::release(p);
}
void operator delete(void* p, std::size_t) noexcept {
  heap_count::release(p);
}
void operator delete[](void* p, std::size_t) noexcept {
  heap_count::release(p);
}
void operator delete(void* p, const std::nothrow_t&) noexcept {
  heap_count::release(p);
}
void operator delete[](void* p, const std::nothrow_t&) noexcept {
  heap_count::release(p);
}

namespace {

struct TempDir {
  fs::path path;
  TempDir() {
    std::string t = (fs::temp_directory_path() / "ridgecal-batch-test-XXXXXX").string();
    BOOST_REQUIRE(::mkdtemp(t.data()) != nullptr);
    path = t;
  }
  ~TempDir() {
    std::error_code ec;
    fs::remove_all(path, ec);
  }
  std::string operator/(const std::string& name) const { return (path / name).string(); }
};

void write(const std::string& path, const std::string& text) {
  std::ofstream(path, std::ios::binary) << text;
}

std::string synthetic_file(std::uint64_t first, std::uint64_t count,
                           const SyntheticUnitOptions& so = {}) {
  std::string s = synthetic_csv_header();
  for (std::uint64_t i = first; i < first + count; ++i) append_synthetic_unit_csv(s, i, so);
  return s;
}

BatchOptions options_for(const std::string& out_dir, int jobs) {
  BatchOptions o;
  o.input.unit_column = "unit";
  o.input.csv.setpoint_column = "setpoint";
  o.fit.degrees = {1, 2, 3, 4, 5, 6, 7, 8};
  o.fit.split.loso_below = 0;
  o.out_dir = out_dir;
  o.jobs = jobs;
  o.sync_records = false;
  o.created_utc = "2026-01-01T00:00:00Z";
  o.window_per_job = 2;  // small window: exercises the in-order hand-over
  return o;
}

// Every file under dir (relative name -> bytes).
std::map<std::string, std::string> tree(const std::string& dir) {
  std::map<std::string, std::string> m;
  for (const auto& e : fs::recursive_directory_iterator(dir))
    if (e.is_regular_file())
      m[fs::relative(e.path(), dir).string()] = read_file_bytes(e.path().string());
  return m;
}

SelectionRule o_rule_other(SelectionRule r) {
  return r == SelectionRule::OneSe ? SelectionRule::MinCv : SelectionRule::OneSe;
}

}  // namespace

BOOST_AUTO_TEST_CASE(a_bad_unit_is_reported_and_the_others_complete) {
  TempDir tmp;
  std::string csv = synthetic_file(0, 2);
  csv += "BAD,S01,12,1.0\nBAD,S02,oops,2.0\n";  // a non-numeric reading
  csv += "FEW,S01,10,1.0\nFEW,S01,11,1.0\n";    // one setpoint only
  csv += synthetic_file(2, 1).substr(std::string(synthetic_csv_header()).size());
  csv += "U000000,S01,1,1\n";  // U000000 again, after other units
  write(tmp / "in.csv", csv);
  const BatchOptions o = options_for(tmp / "out", 2);
  const BatchResult r = run_batch({tmp / "in.csv"}, o);
  BOOST_TEST(r.units == 6u);
  BOOST_TEST(r.ok == 3u);
  BOOST_TEST(r.failed == 3u);
  const BatchSummary s = read_batch_summary(tmp / "out/summary.json");
  BOOST_REQUIRE(s.units.size() == 6u);
  BOOST_TEST(s.units[0].unit == "U000000");
  BOOST_TEST((s.units[0].status == UnitStatus::Ok));
  BOOST_TEST(s.units[2].unit == "BAD");
  BOOST_TEST((s.units[2].status == UnitStatus::Failed));
  BOOST_TEST(s.units[2].error.find("not a number") != std::string::npos, s.units[2].error);
  // The line number refers to the batch file: header is line 1, BAD's second row is line 2 + 96
  // + 1.
  BOOST_TEST(s.units[2].error.find(":99:") != std::string::npos, s.units[2].error);
  BOOST_TEST(s.units[3].unit == "FEW");
  BOOST_TEST((s.units[3].status == UnitStatus::Failed));
  BOOST_TEST(s.units[4].unit == "U000002");
  BOOST_TEST((s.units[4].status == UnitStatus::Ok));
  BOOST_TEST(s.units[5].unit == "U000000");
  BOOST_TEST(s.units[5].error.find("appears again") != std::string::npos, s.units[5].error);
  BOOST_TEST(fs::exists(tmp / "out/records/U000002.json"));
  BOOST_TEST(!fs::exists(tmp / "out/records/BAD.json"));
  const std::string summary_csv = read_file_bytes(tmp / "out/summary.csv");
  BOOST_TEST(summary_csv.find("\nBAD,failed,2,,,,,,n/a,bad-input,,,,,") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(outputs_are_byte_identical_for_any_number_of_jobs) {
  TempDir tmp;
  std::string csv = synthetic_file(0, 60);
  csv += "BAD,S01,1,1\n";
  write(tmp / "in.csv", csv);
  std::map<std::string, std::string> first;
  for (int jobs : {1, 2, 3}) {
    const std::string out = tmp / ("out" + std::to_string(jobs));
    run_batch({tmp / "in.csv"}, options_for(out, jobs));
    const auto t = tree(out);
    BOOST_TEST(t.size() == 62u);  // 60 records + 2 summaries
    if (jobs == 1)
      first = t;
    else
      BOOST_TEST((t == first), "outputs with " << jobs << " jobs differ from 1 job");
  }
}

BOOST_AUTO_TEST_CASE(memory_stays_flat_with_many_small_units) {
  // 150,000 tiny units (two setpoints, fixed straight line): if the batch held
  // its input, its results or its summaries in memory, the peak would grow by
  // tens of MiB between the small and the large run.
  TempDir tmp;
  auto make = [&](const std::string& name, int units) {
    std::ofstream f(tmp / name, std::ios::binary);
    f << "unit,reading,reference\n";
    for (int i = 0; i < units; ++i)
      f << "unit-" << i << ",1," << (i % 7) << "\nunit-" << i << ",2," << (i % 5) + 10 << "\n";
  };
  make("small.csv", 2000);
  make("large.csv", 150000);
  BatchOptions o = options_for(tmp / "out", 2);
  o.fit.fixed_degree = 1;
  o.fit.fixed_lambda = 0.0;
  o.fit.split.test_fraction = 0.0;
  o.write_records = false;
  o.window_per_job = 16;
  o.input.csv.setpoint_column.clear();
  // Peak live heap (heap_count above) of each run, above what was live before
  // it: deterministic up to the two jobs' interleaving, which moves it by a
  // few slots of the same window (2 jobs x 16 units) in both runs. Growth per
  // additional unit, measured: 20.8 bytes (268 KiB for 2,000 units, 3,279 KiB
  // for 150,000: the set of unit names seen, kept to detect a unit that
  // reappears). Holding the summaries would add ~200 bytes a unit (the summary
  // JSON's size), the input or results more. Bound: 64 bytes a unit (margin
  // x3 over the measurement, a third of the summary's size).
  constexpr double kPeakGrowthPerUnitBound = 64.0;
  std::size_t base = heap_count::restart_peak();
  BOOST_TEST(run_batch({tmp / "small.csv"}, o).ok == 2000u);
  const std::size_t small_peak = heap_count::peak.load() - base;
  base = heap_count::restart_peak();
  const BatchResult r = run_batch({tmp / "large.csv"}, o);
  const std::size_t large_peak = heap_count::peak.load() - base;
  BOOST_TEST(r.units == 150000u);
  BOOST_TEST(r.ok == 150000u);
  BOOST_TEST_MESSAGE("peak live heap "
                     << small_peak / 1024 << " KiB for 2,000 units, " << large_peak / 1024
                     << " KiB for 150,000 units (" << fs::file_size(tmp / "large.csv") / 1024
                     << " KiB of input, " << fs::file_size(tmp / "out/summary.json") / 1024
                     << " KiB of summary JSON)");
  const double per_unit =
      (static_cast<double>(large_peak) - static_cast<double>(small_peak)) / (150000 - 2000);
  BOOST_TEST_MESSAGE("peak live heap growth " << per_unit << " bytes per unit");
  BOOST_TEST(per_unit < kPeakGrowthPerUnitBound,
             "peak live heap grew from " << small_peak << " to " << large_peak
                                         << " bytes: " << per_unit << " bytes per unit");
}

BOOST_AUTO_TEST_CASE(a_directory_without_unit_column_is_one_unit_per_file) {
  TempDir tmp;
  fs::create_directories(tmp / "in");
  const SyntheticUnitOptions so;
  for (int i = 0; i < 3; ++i)
    write(tmp / ("in/dev" + std::to_string(i) + ".csv"),
          synthetic_file(static_cast<std::uint64_t>(i), 1, so));
  write(tmp / "in/notes.txt", "not a csv");
  BatchOptions o = options_for(tmp / "out", 2);
  o.input.unit_column.clear();
  const BatchResult r = run_batch(batch_input_files(tmp / "in"), o);
  BOOST_TEST(r.ok == 3u);
  const BatchSummary s = read_batch_summary(tmp / "out/summary.json");
  BOOST_TEST(s.units[0].unit == "dev0");
  BOOST_TEST(s.units[2].unit == "dev2");
}

BOOST_AUTO_TEST_CASE(a_missing_unit_column_stops_the_batch_before_any_output) {
  TempDir tmp;
  write(tmp / "in.csv", "device,setpoint,reading,reference\nA,S1,1,1\n");
  BOOST_CHECK_THROW(run_batch({tmp / "in.csv"}, options_for(tmp / "out", 2)), InputError);
  BOOST_TEST(!fs::exists(tmp / "out/summary.json"));
  BOOST_TEST(!fs::exists(tmp / "out/summary.csv"));
}

BOOST_AUTO_TEST_CASE(shard_summaries_merge_into_the_whole) {
  TempDir tmp;
  write(tmp / "a.csv", synthetic_file(0, 7));
  write(tmp / "b.csv", synthetic_file(7, 5));
  write(tmp / "all.csv", synthetic_file(0, 12));
  run_batch({tmp / "a.csv"}, options_for(tmp / "A", 1));
  run_batch({tmp / "b.csv"}, options_for(tmp / "B", 2));
  run_batch({tmp / "all.csv"}, options_for(tmp / "ALL", 2));
  const BatchSummary a = read_batch_summary(tmp / "A/summary.json");
  const BatchSummary b = read_batch_summary(tmp / "B/summary.json");
  const BatchSummary all = read_batch_summary(tmp / "ALL/summary.json");
  // Shards given in any order give the same merge.
  const BatchSummary m = merge_batch_summaries({b, a}, {"B", "A"}, MergeOptions{});
  BOOST_REQUIRE(m.units.size() == 12u);
  for (std::size_t i = 0; i < 12; ++i) {
    BOOST_TEST(m.units[i].unit == all.units[i].unit);
    BOOST_TEST(m.units[i].lambda == all.units[i].lambda);
    BOOST_TEST(m.units[i].validation_rmse == all.units[i].validation_rmse);
  }
  fs::create_directories(tmp / "M");
  write_batch_summary(m, tmp / "M");
  const BatchSummary again = read_batch_summary(tmp / "M/summary.json");
  BOOST_TEST(again.units.size() == 12u);
  // The merged CSV equals the whole run's CSV in its first nine columns (same
  // units, order, figures and verdicts; warnings and errors may cite lines of
  // the shard files).
  auto first_columns = [](const std::string& csv) {
    std::string out;
    std::size_t pos = 0;
    while (pos < csv.size()) {
      const std::size_t nl = csv.find('\n', pos);
      std::string line = csv.substr(pos, nl - pos);
      std::size_t cut = 0;
      for (int i = 0; i < 9 && cut != std::string::npos; ++i)
        cut = line.find(',', cut + (i ? 1 : 0));
      out += line.substr(0, cut) + "\n";
      pos = nl == std::string::npos ? csv.size() : nl + 1;
    }
    return out;
  };
  BOOST_TEST(first_columns(read_file_bytes(tmp / "M/summary.csv")) ==
             first_columns(read_file_bytes(tmp / "ALL/summary.csv")));

  // A unit in two shards is refused.
  BOOST_CHECK_THROW(merge_batch_summaries({a, all}, {"A", "ALL"}, MergeOptions{}), InputError);
  // Different settings are refused unless allowed.
  BatchOptions other = options_for(tmp / "C", 1);
  other.fit.rule = o_rule_other(other.fit.rule);
  write(tmp / "c.csv", synthetic_file(20, 2));
  run_batch({tmp / "c.csv"}, other);
  const BatchSummary c = read_batch_summary(tmp / "C/summary.json");
  BOOST_CHECK_THROW(merge_batch_summaries({a, c}, {"A", "C"}, MergeOptions{}), InputError);
  MergeOptions mixed;
  mixed.allow_mixed_settings = true;
  BOOST_TEST(merge_batch_summaries({a, c}, {"A", "C"}, mixed).settings_sha256 == "mixed");
}

BOOST_AUTO_TEST_CASE(hostile_unit_labels_get_safe_distinct_file_names) {
  BOOST_TEST(unit_file_stem("U000001") == "U000001");
  const std::string up = unit_file_stem("../../etc/passwd");
  BOOST_TEST(up.find('/') == std::string::npos);
  BOOST_TEST(up.substr(0, 1) != ".");
  BOOST_TEST(unit_file_stem("a/b") != unit_file_stem("a_b"));
  BOOST_TEST(unit_file_stem("a/b") != unit_file_stem("a:b"));
  BOOST_TEST(unit_file_stem("..") != "..");
  BOOST_TEST(unit_file_stem("").size() > 0u);
}

namespace {
UnitChunk chunk_of(const std::string& header, const std::string& rows, std::size_t first_line = 5) {
  UnitChunk c;
  c.unit = "u";
  c.file = "f.csv";
  c.header_line = 2;
  c.first_line = first_line;
  c.text = header + "\n" + rows;
  return c;
}
}  // namespace

BOOST_AUTO_TEST_CASE(the_fast_chunk_parser_agrees_with_the_general_parser) {
  CsvOptions with_sp;
  with_sp.setpoint_column = "setpoint";
  CsvOptions with_role = with_sp;
  with_role.role_column = "role";
  const CsvOptions plain;
  struct Case {
    CsvOptions opt;
    std::string header, rows;
  };
  std::string synth = synthetic_file(3, 1);
  synth = synth.substr(synth.find('\n') + 1);
  const Case cases[] = {
      {with_sp, "unit,setpoint,reading,reference", synth},
      {with_sp, " unit , setpoint ,reading, reference ",
       "u, S1 , +12.5,1e-3\n# note\n\nu,S2,13,\t2.0e0\n"},
      {plain, "unit,reading,reference", "u,1,0.1\nu,2,0.30000000000000004\nu,3,-0\n"},
      {with_role, "unit,setpoint,reading,reference,role",
       "u,A,1,1,fit\nu,B,2,2,CHECK\nu,C,3,3,Fit\n"},
  };
  for (const Case& c : cases) {
    const UnitChunk ch = chunk_of(c.header, c.rows);
    Dataset fast;
    BOOST_REQUIRE(parse_unit_chunk_fast(ch, c.opt, fast));
    const Dataset slow = parse_unit_chunk(ch, c.opt);
    BOOST_REQUIRE(fast.rows.size() == slow.rows.size());
    for (std::size_t i = 0; i < slow.rows.size(); ++i) {
      BOOST_TEST(fast.rows[i].reading == slow.rows[i].reading);
      BOOST_TEST(fast.rows[i].reference == slow.rows[i].reference);
      BOOST_TEST(fast.rows[i].setpoint == slow.rows[i].setpoint);
      BOOST_TEST((fast.rows[i].role == slow.rows[i].role));
      BOOST_TEST(fast.rows[i].line == slow.rows[i].line);
    }
  }
  // Anything unusual goes to the general parser, which reports it (or, for
  // quotes, handles it).
  const Case unusual[] = {
      {with_sp, "unit,setpoint,reading,reference", "u,\"S,1\",1,1\nu,S2,2,2\n"},
      {with_sp, "unit,setpoint,reading,reference", "u,S1,1\n"},
      {with_sp, "unit,setpoint,reading,reference", "u,S1,nan,1\n"},
      {with_sp, "unit,setpoint,reading,reference", "u,S1,1,1,\n"},
      {with_sp, "unit,setpoint,reading,reference", "u,,1,1\n"},
      {with_sp, "unit,setpoint,reading,reading", "u,S1,1,1\n"},
      {with_role, "unit,setpoint,reading,reference,role", "u,A,1,1,maybe\n"},
      {with_sp, "unit,setpoint,reading,reference", "# only a comment\n"},
  };
  for (const Case& c : unusual) {
    Dataset fast;
    BOOST_TEST(!parse_unit_chunk_fast(chunk_of(c.header, c.rows), c.opt, fast), c.rows);
  }
  BOOST_CHECK_THROW(parse_unit_chunk(chunk_of(unusual[2].header, unusual[2].rows), with_sp),
                    InputError);
  // Options only the general parser reads: the fast path declines, and the
  // general parser fills the aux values (which the fast path would drop).
  CsvOptions with_aux = with_sp;
  with_aux.aux_column = "temp";
  const UnitChunk aux_chunk =
      chunk_of("unit,setpoint,reading,reference,temp", "u,S1,1,1,20.5\nu,S2,2,2,21.5\n");
  Dataset fast;
  BOOST_TEST(!parse_unit_chunk_fast(aux_chunk, with_aux, fast));
  BOOST_TEST(parse_unit_chunk(aux_chunk, with_aux).rows.at(1).aux == 21.5);
  CsvOptions with_direction = with_sp;
  with_direction.direction_column = "dir";
  BOOST_TEST(!parse_unit_chunk_fast(
      chunk_of("unit,setpoint,reading,reference,dir", "u,S1,1,1,up\n"), with_direction, fast));
}

BOOST_AUTO_TEST_CASE(a_unit_whose_data_the_fit_rejects_does_not_stop_the_batch) {
  // Unit M has a setpoint with both roles: the fit's grouping rejects it.
  TempDir tmp;
  std::string csv = "unit,setpoint,reading,reference,role\n";
  for (const char* u : {"A", "M", "B"})
    for (int s = 0; s < 8; ++s)
      for (int r = 0; r < 2; ++r)
        csv += fmt::format(
            "{},S{},{},{},{}\n", u, s, 100 * s + r, 2.0 * s + 0.01 * s * s,
            (std::string(u) == "M" && s == 3 && r == 1) ? "check" : (s == 4 ? "check" : "fit"));
  write(tmp / "in.csv", csv);
  BatchOptions o = options_for(tmp / "out", 2);
  o.input.csv.role_column = "role";
  o.fit.degrees = {1, 2};
  const BatchResult r = run_batch({tmp / "in.csv"}, o);
  BOOST_TEST(r.ok == 2u);
  BOOST_TEST(r.failed == 1u);
  const BatchSummary s = read_batch_summary(tmp / "out/summary.json");
  BOOST_TEST(s.units[1].unit == "M");
  BOOST_TEST(s.units[1].error.find("different roles") != std::string::npos, s.units[1].error);
}

BOOST_AUTO_TEST_CASE(with_a_tolerance_every_fitted_unit_gets_a_verdict) {
  // The synthetic units have max errors of a few tenths of a degree: a
  // tolerance of +-10 passes them all, +-0.01 fails them all.
  TempDir tmp;
  write(tmp / "in.csv", synthetic_file(0, 4) + "BAD,S01,1,1\n");
  for (const double tol : {10.0, 0.01}) {
    const std::string out = tmp / ("out" + std::to_string(tol));
    BatchOptions o = options_for(out, 2);
    ToleranceSpec t;
    t.offset = tol;
    o.assess.tolerance = t;
    const BatchResult r = run_batch({tmp / "in.csv"}, o);
    BOOST_TEST(r.ok == 4u);
    BOOST_TEST(r.failed == 1u);
    BOOST_TEST(r.out_of_tolerance == (tol > 1 ? 0u : 4u));
    const BatchSummary s = read_batch_summary(out + "/summary.json");
    for (std::size_t i = 0; i < 4; ++i)
      BOOST_TEST((s.units[i].verdict == (tol > 1 ? UnitVerdict::Pass : UnitVerdict::Fail)));
    BOOST_TEST((s.units[4].verdict == UnitVerdict::NotAssessed));
    const auto rec = nlohmann::json::parse(read_file_bytes(out + "/records/U000001.json"));
    BOOST_TEST(rec.contains("decision"));
    BOOST_TEST(read_file_bytes(out + "/summary.csv").find(tol > 1 ? ",PASS," : ",FAIL,") !=
               std::string::npos);
  }
}

// Issue 15 item 3: the naming rule (docs/batch.md) keeps plain names and
// hashed names apart, and avoids names Windows reserves.
BOOST_AUTO_TEST_CASE(file_names_of_units_never_collide) {
  const std::string hashed = unit_file_stem("SN 001");
  BOOST_TEST(hashed.rfind("SN_001-", 0) == 0u);
  // A label that is literally another unit's hashed name is hashed itself.
  BOOST_TEST(unit_file_stem(hashed) != hashed);
  BOOST_TEST(unit_file_stem(hashed).rfind(hashed + "-", 0) == 0u);
  for (const char* r : {"CON", "con", "Nul", "AUX", "PRN", "COM1", "lpt9", "nul.txt", "CON.a.b"}) {
    const std::string s = unit_file_stem(r);
    BOOST_TEST(s.front() == '_', r << " -> " << s);
  }
  BOOST_TEST(unit_file_stem("CONSOLE") == "CONSOLE");
  BOOST_TEST(unit_file_stem("COM10") == "COM10");
  // Within a batch: names differing only in case, and a taken hashed name.
  UnitFileNames names;
  BOOST_TEST(names.assign("AB1") == "AB1");
  const std::string second = names.assign("ab1");
  BOOST_TEST(second.rfind("ab1-", 0) == 0u);
  BOOST_TEST(second.size() == 12u);
  BOOST_TEST(names.assign("SN 001") == hashed);
  BOOST_TEST(names.assign("SN 001") == "");  // (a reappearing label fails before this)
}

// Issue 15 item 10: formula-like cells of summary.csv get a leading apostrophe.
BOOST_AUTO_TEST_CASE(summary_csv_neutralises_formulas_but_keeps_numbers) {
  BOOST_TEST(csv_text_cell("=1+2") == "'=1+2");
  BOOST_TEST(csv_text_cell("+SUM(A1)") == "'+SUM(A1)");
  BOOST_TEST(csv_text_cell("-2+3") == "'-2+3");
  BOOST_TEST(csv_text_cell("@cmd") == "'@cmd");
  BOOST_TEST(csv_text_cell("\tx") == "'\tx");
  BOOST_TEST(csv_text_cell("\rx") == "\"'\rx\"");
  BOOST_TEST(csv_text_cell("=a,b") == "\"'=a,b\"");
  BOOST_TEST(csv_text_cell("-0.25") == "-0.25");
  BOOST_TEST(csv_text_cell("+1e3") == "+1e3");
  BOOST_TEST(csv_text_cell("U1") == "U1");
  BOOST_TEST(csv_text_cell("") == "");
}

// Issue 15 item 9: the fast parser declines what the general parser refuses
// (control characters in a setpoint label, magnitudes out of range, fields
// at the length limit), so the batch reports it as `fit` does.
BOOST_AUTO_TEST_CASE(the_fast_parser_declines_what_fit_refuses) {
  CsvOptions sp;
  sp.setpoint_column = "setpoint";
  Dataset ds;
  BOOST_TEST(
      parse_unit_chunk_fast(chunk_of("setpoint,reading,reference", "S1,1,2\nS2,3,4\n"), sp, ds));
  BOOST_TEST(!parse_unit_chunk_fast(chunk_of("setpoint,reading,reference", "S\x07,1,2\n"), sp, ds));
  BOOST_TEST(!parse_unit_chunk_fast(chunk_of("setpoint,reading,reference", "S\xe9,1,2\n"), sp, ds));
  BOOST_TEST(
      !parse_unit_chunk_fast(chunk_of("setpoint,reading,reference", "S1,1e301,2\n"), sp, ds));
  BOOST_TEST(
      !parse_unit_chunk_fast(chunk_of("setpoint,reading,reference", "S1,1e-301,2\n"), sp, ds));
  CsvOptions small = sp;
  small.limits.max_field_bytes = 4;
  BOOST_TEST(
      !parse_unit_chunk_fast(chunk_of("setpoint,reading,reference", "S123,1,2\n"), small, ds));
  BOOST_CHECK_THROW(parse_unit_chunk(chunk_of("setpoint,reading,reference", "S123,1,2\n"), small),
                    InputError);
  BOOST_CHECK_THROW(parse_unit_chunk(chunk_of("setpoint,reading,reference", "S\x07,1,2\n"), sp),
                    InputError);
}

// Issue 15 items 6, 9, 11: the reader's limits, labels and quoted newlines.
BOOST_AUTO_TEST_CASE(the_reader_applies_limits_and_label_checks) {
  TempDir tmp;
  write(tmp / "in.csv",
        "unit,reading,reference\n"
        "A,1,2\nA,2,3\nA,3,4\n"
        "B,1,2\nB,2,3\nB,3,4\nB,4,5\n"
        "\"C\n1\",1,2\n"
        "D\x1b,1,2\n"
        "E,1,2\n");
  BatchInputOptions in;
  in.unit_column = "unit";
  in.csv.limits.max_rows = 3;
  UnitReader r({tmp / "in.csv"}, in);
  UnitChunk c;
  BOOST_TEST_REQUIRE(r.next(c));
  BOOST_TEST(c.unit == "A");
  BOOST_TEST(c.error == "");
  BOOST_TEST_REQUIRE(r.next(c));
  BOOST_TEST(c.unit == "B");
  BOOST_TEST(c.error.find(":8: the unit has more than 3 data rows") != std::string::npos, c.error);
  BOOST_TEST(c.text.find("B,4,5") == std::string::npos);  // not kept
  BOOST_TEST_REQUIRE(r.next(c));
  BOOST_TEST(c.unit == "C\n1");
  BOOST_TEST(c.first_line == 9u);
  BOOST_TEST(c.error.find(":9: the unit label") != std::string::npos, c.error);
  BOOST_TEST_REQUIRE(r.next(c));
  BOOST_TEST(c.error.find(":11: the unit label 'D\\x1b' contains the control character") !=
                 std::string::npos,
             c.error);
  BOOST_TEST_REQUIRE(r.next(c));
  BOOST_TEST(c.unit == "E");
  BOOST_TEST(c.first_line == 12u);
  BOOST_TEST(c.error == "");
  BOOST_TEST(!r.next(c));
}
