#include "ridgecal/batch_run.hpp"

#include <fcntl.h>
#include <fmt/format.h>
#include <sys/file.h>
#include <sys/stat.h>
#include <unistd.h>

#include <algorithm>
#include <cerrno>
#include <chrono>
#include <cmath>
#include <condition_variable>
#include <csignal>
#include <cstring>
#include <deque>
#include <exception>
#include <filesystem>
#include <limits>
#include <map>
#include <mutex>
#include <thread>

#include "ridgecal/atomic_file.hpp"
#include "ridgecal/batch_fast_parse.hpp"
#include "ridgecal/batch_output_dir.hpp"
#include "ridgecal/calibrate.hpp"
#include "ridgecal/errors.hpp"
#include "ridgecal/sha256.hpp"
#include "ridgecal/text_check.hpp"

namespace ridgecal {

namespace fs = std::filesystem;
using nlohmann::json;

std::string BatchOptions::validate() const {
  if (const std::string e = input.validate(); !e.empty()) return e;
  if (const std::string e = fit.validate(); !e.empty()) return e;
  if (const std::string e = comp.validate(fit); !e.empty()) return e;
  if (comp.aux != !input.csv.aux_column.empty())
    return "comp.aux and input.csv.aux_column disagree; set both (a second input) or neither";
  if (const std::string e = assess.validate(); !e.empty()) return e;
  if (const std::string e = hardware.validate(); !e.empty()) return "hardware: " + e;
  if (out_dir.empty()) return "out_dir is empty; give the output directory";
  if (jobs < 0 || jobs > 1024)
    return fmt::format("jobs is {}; it must be between 0 (all cores) and 1024", jobs);
  for (const UnitOutput& o : unit_outputs) {
    if (!write_records)
      return fmt::format(
          "unit output '{}' needs records (write_records is false); records are its input", o.name);
    if (o.directory.empty() || o.directory.find('/') != std::string::npos || o.directory == "." ||
        o.directory == ".." || o.directory == "records")
      return fmt::format(
          "unit output '{}' has directory '{}'; it must be a plain directory name other than "
          "'records'",
          o.name, o.directory);
    if (!o.write) return fmt::format("unit output '{}' has no writer", o.name);
  }
  if (window_per_job < 1 || window_per_job > 4096)
    return fmt::format("window_per_job is {}; it must be between 1 and 4096", window_per_job);
  return {};
}

int BatchOptions::effective_jobs() const {
  if (jobs > 0) return jobs;
  const unsigned hc = std::thread::hardware_concurrency();
  return hc > 0 ? static_cast<int>(hc) : 1;
}

json batch_settings_json(const BatchOptions& o) {
  const FitOptions& f = o.fit;
  json s;
  s["columns"] = {{"unit", o.input.unit_column},
                  {"reading", o.input.csv.reading_column},
                  {"reference", o.input.csv.reference_column},
                  {"setpoint", o.input.csv.setpoint_column},
                  {"role", o.input.csv.role_column},
                  {"delimiter", std::string(1, o.input.csv.delimiter)}};
  // only when given: the settings (and their digest) of batches without it are unchanged
  if (!o.input.csv.direction_column.empty())
    s["columns"]["direction"] = o.input.csv.direction_column;
  if (o.input.csv.decimal_comma) s["columns"]["decimal_comma"] = true;
  s["fit"] = {{"degrees", f.degrees},
              {"lambdas", f.lambdas},
              {"rule", to_string(f.rule)},
              {"intercept", f.intercept},
              {"test_fraction", f.split.test_fraction},
              {"seed", f.split.seed},
              {"folds", f.split.folds},
              {"loso_below", f.split.loso_below},
              {"fixed_degree", f.fixed_degree ? json(*f.fixed_degree) : json(nullptr)},
              {"fixed_lambda", f.fixed_lambda ? json(*f.fixed_lambda) : json(nullptr)}};
  s["judgement"] = {
      {"tolerance", o.assess.tolerance ? json(o.assess.tolerance->describe()) : json(nullptr)},
      {"decision", to_string(o.assess.rule)},
      {"reference_uncertainty", o.assess.uncertainty.reference_uncertainty},
      {"reference_k", o.assess.uncertainty.reference_k},
      {"resolution", o.assess.uncertainty.resolution},
      {"coverage_k", o.assess.uncertainty.coverage_k}};
  s["sensor"] = {{"name", o.sensor.name},
                 {"reading_unit", o.sensor.reading_unit},
                 {"reference_unit", o.sensor.reference_unit}};
  if (o.comp
          .active()) {  // only then: the settings (and their digest) of plain batches are unchanged
    const ExtendedOptions& c = o.comp;
    s["compensation"] = {{"aux_column", o.input.csv.aux_column},
                         {"aux_setpoint_column", o.input.csv.aux_setpoint_column},
                         {"aux_step", c.aux_step},
                         {"aux_degrees", c.aux_degrees},
                         {"powers", c.powers},
                         {"transforms", c.transforms.describe()}};
  }
  return s;
}

namespace {

[[noreturn]] void write_failed(const std::string& path, const char* what, int err) {
  throw InputError(path, 0,
                   fmt::format("cannot write the output file ({}): {}", what, std::strerror(err)),
                   "check free disk space and permissions");
}

// A file written in pieces to a temporary name beside `path`, renamed over it
// by commit(); removed if never committed.
class StreamingAtomicFile {
 public:
  explicit StreamingAtomicFile(std::string path) : path_(std::move(path)) {
    std::string tmpl = path_ + ".tmp-XXXXXX";
    std::vector<char> buf(tmpl.begin(), tmpl.end());
    buf.push_back('\0');
    fd_ = ::mkstemp(buf.data());
    if (fd_ < 0) write_failed(path_, "temporary file", errno);
    tmp_ = buf.data();
  }
  StreamingAtomicFile(const StreamingAtomicFile&) = delete;
  StreamingAtomicFile& operator=(const StreamingAtomicFile&) = delete;
  ~StreamingAtomicFile() {
    if (fd_ >= 0) ::close(fd_);
    if (!committed_) ::unlink(tmp_.c_str());
  }
  void append(const std::string& s) {
    buf_ += s;
    if (buf_.size() >= (1u << 16)) flush();
  }
  void commit(bool sync) {
    flush();
    if (::fchmod(fd_, 0644) != 0) write_failed(path_, "chmod", errno);
    if (sync && ::fsync(fd_) != 0) write_failed(path_, "fsync", errno);
    const int fd = fd_;
    fd_ = -1;
    if (::close(fd) != 0) write_failed(path_, "close", errno);
    if (::rename(tmp_.c_str(), path_.c_str()) != 0) write_failed(path_, "rename", errno);
    committed_ = true;
  }

 private:
  void flush() {
    const char* p = buf_.data();
    std::size_t left = buf_.size();
    while (left > 0) {
      const ssize_t n = ::write(fd_, p, left);
      if (n < 0) {
        if (errno == EINTR) continue;
        write_failed(path_, "write", errno);
      }
      p += n;
      left -= static_cast<std::size_t>(n);
    }
    buf_.clear();
  }
  std::string path_, tmp_;
  std::string buf_;
  int fd_ = -1;
  bool committed_ = false;
};

void write_whole_file_atomic(const std::string& path, const std::string& content, bool sync) {
  StreamingAtomicFile f(path);
  f.append(content);
  f.commit(sync);
}

}  // namespace

UnitSummary process_unit(const UnitChunk& chunk, const BatchOptions& options) {
  UnitSummary u;
  // A label refused by the reader (control characters, invalid UTF-8) is
  // shown escaped, so that two such labels stay distinct in the summaries.
  u.unit = name_problem(chunk.unit, kMaxRecordNameBytes).empty()
               ? chunk.unit
               : shown_text(chunk.unit, 4 * kMaxRecordNameBytes);
  u.rows = chunk.rows;
  u.lambda = u.validation_rmse = u.test_rmse = u.max_abs_error =
      std::numeric_limits<double>::quiet_NaN();
  const std::string stem = chunk.stem.empty() ? unit_file_stem(chunk.unit) : chunk.stem;
  const std::string rel = "records/" + stem + ".json";
  auto output_path = [&](const UnitOutput& o) {
    return options.out_dir + "/" + o.directory + "/" + stem + o.extension;
  };
  auto fail = [&](std::string why, UnitReason reason) {
    u.status = UnitStatus::Failed;
    u.reason = reason;
    u.error = std::move(why);
    // A record left by an earlier run must not pass for this run's result.
    if (options.write_records && chunk.error.empty()) {
      ::unlink((options.out_dir + "/" + rel).c_str());
      for (const UnitOutput& o : options.unit_outputs) ::unlink(output_path(o).c_str());
    }
    return u;
  };
  if (!chunk.error.empty()) return fail(chunk.error, UnitReason::BadInput);
  Dataset data;
  if (!parse_unit_chunk_fast(chunk, options.input.csv, data)) {
    try {
      data = parse_unit_chunk(chunk, options.input.csv);
    } catch (const InputError& e) {
      return fail(format_input_error(e), reason_for_input(e.cause()));
    }
  }
  // The record's input digest: the fast parser leaves it empty (it is needed
  // only when the record is written).
  if (options.write_records && data.sha256.empty()) data.sha256 = sha256_hex(chunk.text);
  // Fit, assessment and record as `ridgecal fit` makes them (calibrate.hpp).
  // The assessment costs about 15 times the fit, so a summary-only run
  // without a tolerance skips it; its summary then has no diagnostic warnings.
  CalibrateOptions copt;
  copt.fit = options.fit;
  copt.comp = options.comp;
  copt.assess = options.assess;
  copt.sensor = options.sensor;
  copt.hardware = options.hardware;
  copt.sensor.name =
      options.sensor.name.empty() ? chunk.unit : options.sensor.name + " / unit " + chunk.unit;
  copt.created_utc = options.created_utc;
  copt.skip_unjudged_assessment = !options.write_records;
  CalibrateResult result;
  try {
    // throws InputError e.g. for a setpoint with mixed roles, a reading outside a transform's
    // domain
    result = calibrate(data, copt);
  } catch (const InputError& e) {
    return fail(format_input_error(e), reason_for_input(e.cause()));
  }
  if (!result.status.ok) return fail(result.status.message, UnitReason::FitFailed);
  const CalibrationRecord& rec = result.record;
  const Calibration& cal = rec.calibration;
  u.status = UnitStatus::Ok;
  u.degree = general_model(cal).total_degree();
  u.lambda = cal.lambda;
  u.validation_rmse =
      cal.validation.n ? cal.validation.rmse : std::numeric_limits<double>::quiet_NaN();
  u.test_rmse = cal.test.n ? cal.test.rmse : std::numeric_limits<double>::quiet_NaN();
  double maxe = 0.0;
  for (const PointResult& p : cal.points) maxe = std::max(maxe, std::fabs(p.error));
  u.max_abs_error = maxe;
  // Issue 13: the selection notes (e.g. degrees dropped for lack of setpoints)
  // stay in the record's selection; a unit's warnings are the record's warnings
  // only (their grid-edge checks replace the former unit-level ones).
  // The verdict is the record's, computed once by the assessment.
  if (const auto v = result.verdict())
    u.verdict = *v == Verdict::Pass   ? UnitVerdict::Pass
                : *v == Verdict::Fail ? UnitVerdict::Fail
                                      : UnitVerdict::Undecided;
  u.reason = reason_for_record(rec);
  u.worst = worst_point(rec);
  for (const Warning& w : rec.warnings) u.warnings.push_back(to_string(w.code) + ": " + w.message);
  if (options.write_records) {
    write_whole_file_atomic(options.out_dir + "/" + rel, record_text(record_to_json(rec)),
                            options.sync_records);
    u.record = rel;
    for (const UnitOutput& o : options.unit_outputs) {
      const std::string path = output_path(o);
      if (o.pass_only && u.verdict != UnitVerdict::Pass) {
        ::unlink(path.c_str());  // an earlier run's file must not pass for this run's
        u.warnings.push_back(o.name + " withheld: verdict " +
                             (u.verdict == UnitVerdict::NotAssessed ? std::string("not judged")
                                                                    : to_string(u.verdict)));
        ++u.outputs_withheld;
        continue;
      }
      std::string why;
      try {
        why = o.write(options.out_dir + "/" + rel, path);
      } catch (const std::exception& e) {
        why = e.what();
      }
      if (!why.empty()) {
        ::unlink(path.c_str());
        u.warnings.push_back(o.name + " not written: " + why);
        ++u.outputs_failed;
      }
    }
  }
  return u;
}

namespace {
std::string signal_name(int sig) {
  switch (sig) {
    case SIGINT:
      return "SIGINT";
    case SIGTERM:
      return "SIGTERM";
    default:
      return fmt::format("signal {}", sig);
  }
}
}  // namespace

BatchResult run_batch(const std::vector<std::string>& inputs, const BatchOptions& options,
                      const ProgressCallback& progress, double progress_interval_s) {
  using Clock = std::chrono::steady_clock;
  const auto t0 = Clock::now();
  refuse_inputs_as_outputs(inputs, options);
  std::error_code ec;
  fs::create_directories(options.out_dir, ec);
  if (ec)
    throw InputError(options.out_dir, 0, "cannot create the output directory: " + ec.message(),
                     "check the path and permissions");
  const OutputDirLock lock(options.out_dir);
  if (options.write_records) {
    fs::create_directories(batch_records_dir(options), ec);
    if (ec)
      throw InputError(batch_records_dir(options), 0,
                       "cannot create the directory: " + ec.message(), "check permissions");
  }
  for (const UnitOutput& o : options.unit_outputs) {
    const std::string dir = options.out_dir + "/" + o.directory;
    fs::create_directories(dir, ec);
    if (ec)
      throw InputError(dir, 0, "cannot create the directory: " + ec.message(), "check permissions");
  }

  UnitReader reader(inputs, options.input);
  StreamingAtomicFile csv(options.out_dir + "/summary.csv");
  StreamingAtomicFile js(options.out_dir + "/summary.json");
  csv.append(summary_csv_header());
  js.append(summary_json_head(options.created_utc, batch_settings_json(options), inputs));

  BatchResult res;
  BatchProgress prog;
  auto last_report = Clock::now();
  auto seconds = [&] { return std::chrono::duration<double>(Clock::now() - t0).count(); };
  std::string last_unit;                   // of the last row written
  auto emit = [&](const UnitSummary& u) {  // main thread only, in input order
    last_unit = u.unit;
    csv.append(summary_csv_row(u));
    js.append(summary_json_unit(u, res.units == 0));
    ++res.units;
    res.totals.add(u);
    (u.status == UnitStatus::Ok ? res.ok : res.failed)++;
    if (u.verdict == UnitVerdict::Fail) ++res.out_of_tolerance;
    if (u.verdict == UnitVerdict::Undecided) ++res.undecided;
    if (u.outputs_failed > 0) ++res.outputs_failed;
    if (u.outputs_withheld > 0) ++res.outputs_withheld;
    if (progress &&
        std::chrono::duration<double>(Clock::now() - last_report).count() >= progress_interval_s) {
      last_report = Clock::now();
      prog = BatchProgress{res.units, res.failed, reader.bytes_read(), reader.bytes_total(),
                           seconds(), false};
      progress(prog);
    }
  };

  const int jobs = options.effective_jobs();
  auto stopping = [&] { return options.stop != nullptr && options.stop->load() != 0; };
  // Reads the next unit and gives it its file name (in input order, so names
  // do not depend on the number of jobs).
  UnitFileNames names;
  auto next_unit = [&](UnitChunk& c) {
    if (!reader.next(c)) return false;
    if (c.error.empty() && options.write_records) {  // (no files, no names without records)
      c.stem = names.assign(c.unit);
      if (c.stem.empty())
        c.error = fmt::format(
            "{}:{}: the file name of unit '{}' ({}) is taken by an earlier unit of this batch "
            "(ignoring case)",
            c.file, c.first_line, c.unit, unit_file_stem(c.unit));
    }
    return true;
  };
  UnitChunk chunk;
  bool input_done = false;      // every unit of the input was read
  std::uint64_t abandoned = 0;  // units read but not started because of a stop
  if (jobs == 1) {
    while (!stopping()) {
      if (!next_unit(chunk)) {
        input_done = true;
        break;
      }
      emit(process_unit(chunk, options));
    }
  } else {
    // Main thread: reads, and writes the summary rows in input order.
    // Workers: fit and write records. At most `window` units are in flight.
    // Workers take units in input order, so the units started are always the
    // first ones read: on a stop, those still queued are dropped and the
    // summary lists every unit started.
    const std::uint64_t window =
        static_cast<std::uint64_t>(jobs) * static_cast<std::uint64_t>(options.window_per_job);
    std::mutex mu;
    std::condition_variable work_cv, done_cv;
    std::deque<UnitChunk> queue;
    std::map<std::uint64_t, UnitSummary> done;
    bool closed = false, abort = false;
    std::exception_ptr error;
    std::vector<std::thread> workers;
    for (int w = 0; w < jobs; ++w)
      workers.emplace_back([&] {
        for (;;) {
          UnitChunk c;
          {
            std::unique_lock<std::mutex> lk(mu);
            work_cv.wait(lk, [&] { return !queue.empty() || closed || abort; });
            if (abort || queue.empty()) return;
            c = std::move(queue.front());
            queue.pop_front();
          }
          try {
            UnitSummary s = process_unit(c, options);
            std::lock_guard<std::mutex> lk(mu);
            done.emplace(c.index, std::move(s));
          } catch (...) {
            std::lock_guard<std::mutex> lk(mu);
            if (!error) error = std::current_exception();
            abort = true;
            work_cv.notify_all();
          }
          done_cv.notify_one();
        }
      });
    std::uint64_t read = 0;
    // Emits finished units in order.
    auto drain = [&](std::unique_lock<std::mutex>& lk) {
      for (auto it = done.find(res.units); it != done.end(); it = done.find(res.units)) {
        UnitSummary s = std::move(it->second);
        done.erase(it);
        lk.unlock();
        emit(s);
        lk.lock();
      }
    };
    const auto tick = std::chrono::milliseconds(50);  // how often a wait looks at `stop`
    try {
      for (;;) {
        if (stopping()) break;
        const bool got = next_unit(chunk);
        std::unique_lock<std::mutex> lk(mu);
        for (;;) {
          drain(lk);
          if (abort || stopping() || read - res.units < window) break;
          done_cv.wait_for(lk, tick, [&] { return abort || done.count(res.units) > 0; });
        }
        if (!got) input_done = true;
        if (abort || !got || stopping()) break;
        queue.push_back(std::move(chunk));
        ++read;
        work_cv.notify_one();
      }
      std::unique_lock<std::mutex> lk(mu);
      closed = true;
      work_cv.notify_all();
      while (!abort && res.units < read) {
        if (stopping()) {  // abandon the units not started
          abandoned += queue.size();
          read -= queue.size();
          queue.clear();
        }
        drain(lk);
        if (res.units < read)
          done_cv.wait_for(lk, tick, [&] { return abort || done.count(res.units) > 0; });
      }
    } catch (...) {
      std::lock_guard<std::mutex> lk(mu);
      abort = true;
      if (!error) error = std::current_exception();
      work_cv.notify_all();
    }
    {
      std::lock_guard<std::mutex> lk(mu);
      closed = true;
      work_cv.notify_all();
    }
    for (auto& t : workers) t.join();
    if (error) std::rethrow_exception(error);
  }

  std::string partial;
  if (stopping() && (!input_done || abandoned > 0)) {  // (a stop after the last unit cuts nothing)
    res.interrupted_by = options.stop->load();
    const std::string sig = signal_name(res.interrupted_by);
    partial = fmt::format(
        "{{\"signal\": {}, \"units_completed\": {}, \"last_unit\": {}, \"note\": {}}}",
        json(sig).dump(), res.units,
        res.units ? json(last_unit).dump(-1, ' ', false, json::error_handler_t::replace)
                  : std::string("null"),
        json("the batch was interrupted: the units after last_unit were not processed").dump());
    csv.append(fmt::format(
        "# partial: interrupted by {} after {} units; the units after the last row were not "
        "processed\n",
        sig, res.units));
  }
  js.append(summary_json_tail(res.totals, partial));
  csv.commit(true);
  js.commit(true);
  res.seconds = seconds();
  if (progress)
    progress(BatchProgress{res.units, res.failed, reader.bytes_read(), reader.bytes_total(),
                           res.seconds, true});
  return res;
}

}  // namespace ridgecal
