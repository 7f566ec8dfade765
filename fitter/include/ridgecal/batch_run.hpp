// ridgecal: calibrating every unit of a production batch.
//
// Input: a batch CSV (or a directory of CSV files), streamed unit by unit
// (batch_reader.hpp). Every unit is fitted with the same FitOptions, on
// `jobs` worker threads. Output, in an output directory:
//   records/<unit>.json  one calibration record per fitted unit (record.hpp);
//                        <unit> is unit_file_stem(label);
//   summary.csv, summary.json  one row per unit in input order (batch_summary.hpp);
//   <directory>/<unit><extension>  optional extra outputs per fitted unit
//                        (BatchOptions::unit_outputs; `ridgecal batch` uses
//                        them for reports/<unit>.html and headers/<unit>.h).
// Every file is written atomically (temporary file in the same directory,
// then rename); the summaries are streamed into their temporary files and
// renamed when the batch ends, so memory stays flat with the number of units.
//
// Determinism: a unit's result depends only on its rows and the options
// (creation time is taken once per batch), and the summary follows input
// order, so all outputs are byte-identical for any number of jobs.
//
// Failure of one unit (bad row, too few setpoints, a reappearing unit) is
// recorded in its summary row and does not stop the others. With a tolerance
// (assess.tolerance) every fitted unit is judged as `ridgecal fit` judges it
// (assessment.hpp): verdict PASS or FAIL in the summary and the record. Units
// are assessed when a tolerance is given or records are written (a record
// carries the assessment, as `ridgecal fit` writes it); a summary-only run
// without a tolerance skips the assessment, which costs about 15 times the
// fit, and its summary has no diagnostic warnings.
#pragma once

#include <atomic>
#include <cstdint>
#include <functional>
#include <string>
#include <vector>

#include "ridgecal/assessment.hpp"
#include "ridgecal/batch_reader.hpp"
#include "ridgecal/batch_summary.hpp"
#include "ridgecal/calibration.hpp"
#include "ridgecal/extended_fit.hpp"
#include "ridgecal/hardware_checks.hpp"
#include "ridgecal/record.hpp"

namespace ridgecal {

/// An extra output written for every fitted unit, beside its record, by a
/// writer from another library (the HTML report, the firmware header).
/// `write(record_path, output_path)` is called on worker threads,
/// concurrently for different units, after the unit's record is written: it
/// must be thread-safe and must write `output_path` atomically. It returns ""
/// on success, else why the output was not written; the unit then gets the
/// warning "<name> not written: <why>" and counts in BatchResult::outputs_failed,
/// and a file of that name left by an earlier run is removed, so that it
/// cannot pass for this run's. The same removal happens for a unit that fails.
struct UnitOutput {
  std::string name;       ///< e.g. "report"; used in warnings
  std::string directory;  ///< relative to out_dir, e.g. "reports"; a plain name
  std::string extension;  ///< e.g. ".html"
  std::function<std::string(const std::string& record_path, const std::string& output_path)> write;
  /// Written for units whose verdict is PASS only (the firmware header: a
  /// unit that failed or was not judged must not reach firmware). For the
  /// others the file of that name is removed, the unit gets the warning
  /// "<name> withheld: verdict <v>", and it counts in
  /// BatchResult::outputs_withheld (not in outputs_failed). Default false.
  bool pass_only = false;
};

struct BatchOptions {
  BatchInputOptions input;  ///< unit column and the other columns
  FitOptions fit;           ///< the same fit settings for every unit
  /// Second input and transforms (extended_fit.hpp), the same for every
  /// unit; when active() every unit is fitted with fit_extended and its aux
  /// column is input.csv.aux_column.
  ExtendedOptions comp;
  AssessmentOptions assess;       ///< tolerance, decision rule, uncertainty, diagnostics (as `fit`)
  SensorInfo sensor;              ///< copied into every record (name may be empty)
  HardwareCheckOptions hardware;  ///< stuck/open/saturated checks before each fit (default on)
  std::string out_dir;            ///< created if missing; required
  int jobs = 0;               ///< worker threads; 0 = all cores (std::thread::hardware_concurrency)
  bool write_records = true;  ///< false: summaries only
  bool sync_records =
      true;                 ///< fsync each record before the rename (durable; slower on real disks)
  std::string created_utc;  ///< creation time written to every record and the summary ("" = omit)
  int window_per_job = 16;  ///< units in flight per job (bounds memory), >= 1
  std::vector<UnitOutput> unit_outputs;  ///< extra per-unit outputs; need write_records
  /// Not null: polled by the batch; when it holds a nonzero signal number
  /// (e.g. set by a SIGINT handler) the batch stops cleanly: it reads no
  /// further unit, abandons the units not yet started, finishes those in
  /// flight, and writes summaries marked partial ("partial" in summary.json,
  /// a closing "# partial: ..." line in summary.csv) listing the units
  /// completed. BatchResult::interrupted_by is then that number.
  const std::atomic<int>* stop = nullptr;

  /// Empty when valid, else a message naming the field, the value and the rule.
  std::string validate() const;
  /// The number of worker threads `jobs` stands for (>= 1).
  int effective_jobs() const;
};

struct BatchProgress {
  std::uint64_t units_done = 0;
  std::uint64_t units_failed = 0;
  std::uint64_t bytes_read = 0;
  std::uint64_t bytes_total = 0;
  double seconds = 0.0;
  bool finished = false;
};

struct BatchResult {
  std::uint64_t units = 0;
  std::uint64_t ok = 0;                ///< fitted (whatever their verdict)
  std::uint64_t failed = 0;            ///< not fitted
  std::uint64_t out_of_tolerance = 0;  ///< fitted with verdict FAIL
  std::uint64_t undecided = 0;  ///< fitted with verdict UNDECIDED (adequacy check, decision.hpp)
  std::uint64_t outputs_failed = 0;    ///< fitted units with an extra output not written
  std::uint64_t outputs_withheld = 0;  ///< fitted units with a pass_only output withheld
  int interrupted_by = 0;              ///< the signal that stopped the batch (options.stop), or 0
  double seconds = 0.0;
  BatchTotals totals;  ///< passed / out of tolerance / undecided / not judged / not fitted, reasons
};

/// Called from the batch's main thread, about every `progress_interval_s`
/// seconds and once at the end (finished = true).
using ProgressCallback = std::function<void(const BatchProgress&)>;

/// An exclusive lock on an output directory, held while the object lives:
/// flock() on the file `.ridgecal.lock` inside it, created if missing and
/// removed on release (a waiter that opened the removed file notices and
/// retries). Throws InputError (exit 2) when another process holds it:
/// two batches (or a batch and a merge) never write into one directory at once.
class OutputDirLock {
 public:
  explicit OutputDirLock(const std::string& dir);
  ~OutputDirLock();
  OutputDirLock(const OutputDirLock&) = delete;
  OutputDirLock& operator=(const OutputDirLock&) = delete;

 private:
  std::string path_;
  int fd_ = -1;
};

/// Throws InputError naming the input when an input of the batch is also one
/// of its outputs (summary.csv, summary.json, the lock file, or a file in a
/// directory of per-unit outputs), compared with same_file(); nothing is
/// written before.
void refuse_inputs_as_outputs(const std::vector<std::string>& inputs, const BatchOptions& options);

/// Runs the batch. Preconditions: options.validate() is empty.
/// Throws InputError when an input is also an output (refuse_inputs_as_outputs,
/// before anything is written), another batch holds the output directory's
/// lock (OutputDirLock), the input as a whole is unusable (missing file or
/// column, no header, a line over the limits) or an output cannot be written; the summaries are
/// then not written (records already written stay).
BatchResult run_batch(const std::vector<std::string>& inputs, const BatchOptions& options,
                      const ProgressCallback& progress = {}, double progress_interval_s = 0.5);

/// The settings object stored in the summary (columns and fit options).
nlohmann::json batch_settings_json(const BatchOptions& options);

/// Fits one chunk and writes its record (if enabled): the summary row. Never
/// throws for problems of the unit itself (they become the row's error).
UnitSummary process_unit(const UnitChunk& chunk, const BatchOptions& options);

}  // namespace ridgecal
