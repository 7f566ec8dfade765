// Outputs never destroy data (issue 15): an output that is also an input or
// another output is refused before anything is written; the outputs of one
// command are written all or none; a FIFO or device given as output is
// written, never replaced; a symbolic link is kept; a new file follows the
// umask and a replaced file keeps its mode.
#define BOOST_TEST_MODULE cli_output_safety
#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <atomic>
#include <boost/test/unit_test.hpp>
#include <cerrno>
#include <chrono>
#include <filesystem>
#include <fstream>
#include <string>
#include <thread>
#include <vector>

#include "cli_common.hpp"
#include "export_command.hpp"
#include "fit_command.hpp"
#include "report_command.hpp"
#include "test_support.hpp"
#include "verify_command.hpp"

namespace fs = std::filesystem;
using namespace ridgecal::cli;
using ridgecal::test::call_main;
using ridgecal::test::slurp;
using ridgecal::test::TempDir;

namespace {

const std::string kSample =
    std::string(RIDGECAL_SAMPLES_DIR) + "/loadcell-hopper/loadcell-hopper.csv";

// A private copy of the load-cell sample (it is overwritten on failure).
fs::path copy_sample(const TempDir& t, const std::string& name = "run.csv") {
  const fs::path p = t.path() / name;
  fs::copy_file(kSample, p);
  return p;
}

std::vector<std::string> fit_args(const fs::path& csv) {
  return {csv.string(), "--setpoint", "setpoint", "--tol-offset", "0.01", "--timestamp", "none"};
}

fs::path make_record(const TempDir& t) {
  const fs::path rec = t.path() / "rec.json";
  auto args = fit_args(copy_sample(t, "for-record.csv"));
  args.insert(args.end(), {"-o", rec.string()});
  std::string err;
  BOOST_REQUIRE_MESSAGE(call_main(fit_main, args, &err) == kExitOk, err);
  return rec;
}

// Runs a subcommand that must refuse with exit 2 and a message containing
// `needle`, and checks that `kept` still holds `before`.
void expect_refusal(SubcommandMain m, const std::vector<std::string>& args,
                    const std::string& needle, const fs::path& kept, const std::string& before) {
  std::string text;
  const int rc = call_main(m, args, &text);
  BOOST_TEST_CONTEXT(text) {
    BOOST_TEST(rc == kExitBadInput);
    BOOST_TEST(text.find(needle) != std::string::npos);
    BOOST_TEST(slurp(kept) == before);
  }
}

mode_t mode_of(const fs::path& p) {
  struct stat st {};
  BOOST_REQUIRE(::stat(p.c_str(), &st) == 0);
  return st.st_mode & 07777;
}

}  // namespace

BOOST_AUTO_TEST_CASE(fit_refuses_to_overwrite_its_input) {
  TempDir t;
  const fs::path csv = copy_sample(t);
  const std::string before = slurp(csv);
  auto args = fit_args(csv);
  args.insert(args.end(), {"-o", csv.string()});
  expect_refusal(fit_main, args, "same file as the input", csv, before);
  // The same file under other names: a hard link, a symbolic link, "./".
  fs::create_hard_link(csv, t.path() / "hard.csv");
  fs::create_symlink(csv, t.path() / "soft.json");
  for (const fs::path& alias :
       {t.path() / "hard.csv", t.path() / "soft.json", t.path() / "." / "run.csv"}) {
    args = fit_args(csv);
    args.insert(args.end(), {"--report", alias.string()});
    expect_refusal(fit_main, args, "same file as the input", csv, before);
  }
}

BOOST_AUTO_TEST_CASE(fit_refuses_one_file_for_record_and_report) {
  TempDir t;
  const fs::path csv = copy_sample(t);
  const fs::path out = t.path() / "x.json";
  auto args = fit_args(csv);
  args.insert(args.end(), {"-o", out.string(), "--report", out.string()});
  std::string text;
  BOOST_TEST(call_main(fit_main, args, &text) == kExitBadInput);
  BOOST_TEST(text.find("the report output is the same file as the record output") !=
             std::string::npos);
  BOOST_TEST(!fs::exists(out));
}

BOOST_AUTO_TEST_CASE(verify_report_and_export_refuse_to_overwrite_their_inputs) {
  TempDir t;
  const fs::path rec = make_record(t);
  const std::string rec_before = slurp(rec);
  const fs::path asfound = copy_sample(t, "asfound.csv");
  const std::string asfound_before = slurp(asfound);
  expect_refusal(verify_main,
                 {rec.string(), asfound.string(), "--setpoint", "setpoint", "-o", asfound.string()},
                 "same file as the input", asfound, asfound_before);
  expect_refusal(verify_main,
                 {rec.string(), asfound.string(), "--setpoint", "setpoint", "-o", rec.string()},
                 "same file as the input", rec, rec_before);
  expect_refusal(report_main, {rec.string(), "-o", rec.string()}, "same file as the input", rec,
                 rec_before);
  expect_refusal(export_main,
                 {rec.string(), "--prefix", "lc", "--numeric", "float", "-o", rec.string()},
                 "same file as the input", rec, rec_before);
}

BOOST_AUTO_TEST_CASE(fit_writes_record_and_report_all_or_none) {
  TempDir t;
  const fs::path csv = copy_sample(t);
  const fs::path out = t.path() / "x.json";
  { std::ofstream(out) << "old record\n"; }
  auto args = fit_args(csv);
  // The report cannot be written (its directory does not exist): exit 2 and
  // the record is left as it was, though it comes first.
  args.insert(args.end(),
              {"-o", out.string(), "--report", (t.path() / "missing" / "r.html").string()});
  std::string text;
  BOOST_TEST(call_main(fit_main, args, &text) == kExitBadInput, text);
  BOOST_TEST(slurp(out) == "old record\n");
  for (const auto& e : fs::directory_iterator(t.path()))
    BOOST_TEST(e.path().filename().string().find(".tmp-") == std::string::npos, e.path());
}

BOOST_AUTO_TEST_CASE(a_fifo_output_is_written_not_replaced) {
  TempDir t;
  const fs::path csv = copy_sample(t);
  const fs::path fifo = t.path() / "out.fifo";
  BOOST_REQUIRE(::mkfifo(fifo.c_str(), 0600) == 0);
  const int rfd = ::open(fifo.c_str(), O_RDONLY | O_NONBLOCK);
  BOOST_REQUIRE(rfd >= 0);
  std::atomic<bool> done{false};
  std::string got;
  std::thread reader([&] {
    char buf[4096];
    for (;;) {
      const ssize_t n = ::read(rfd, buf, sizeof buf);
      if (n > 0) {
        got.append(buf, static_cast<std::size_t>(n));
        continue;
      }
      if (done) {
        if (n == 0 || (n < 0 && errno == EAGAIN)) break;
      }
      std::this_thread::sleep_for(std::chrono::milliseconds(1));
    }
  });
  auto args = fit_args(csv);
  args.insert(args.end(), {"-o", fifo.string()});
  std::string text;
  const int rc = call_main(fit_main, args, &text);
  done = true;
  reader.join();
  ::close(rfd);
  BOOST_TEST(rc == kExitOk, text);
  struct stat st {};
  BOOST_REQUIRE(::lstat(fifo.c_str(), &st) == 0);
  BOOST_TEST(S_ISFIFO(st.st_mode));  // not replaced by a regular file
  BOOST_TEST(got.find("\"format_version\"") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(a_symbolic_link_is_kept_and_modes_follow_umask_or_old_file) {
  TempDir t;
  const fs::path csv = copy_sample(t);
  const fs::path real = t.path() / "real.json";
  { std::ofstream(real) << "old\n"; }
  fs::permissions(real, fs::perms::owner_read | fs::perms::owner_write | fs::perms::group_read);
  fs::create_symlink(real, t.path() / "link.json");
  auto args = fit_args(csv);
  args.insert(args.end(), {"-o", (t.path() / "link.json").string()});
  std::string text;
  BOOST_REQUIRE(call_main(fit_main, args, &text) == kExitOk);
  BOOST_TEST(fs::is_symlink(t.path() / "link.json"));
  BOOST_TEST(slurp(real).find("\"format_version\"") != std::string::npos);
  BOOST_TEST(mode_of(real) == 0640u);  // the replaced file keeps its mode
  // A new file follows the umask (077 here: 0600), not a fixed 0644.
  const mode_t old_mask = ::umask(077);
  args = fit_args(csv);
  args.insert(args.end(), {"-o", (t.path() / "new.json").string()});
  const int rc = call_main(fit_main, args, &text);
  ::umask(old_mask);
  BOOST_REQUIRE(rc == kExitOk);
  BOOST_TEST(mode_of(t.path() / "new.json") == 0600u);
}
