// ridgecal: loading a calibration record for a consumer (export, report,
// verify), with its integrity checked.
//
// A record carries a SHA-256 over its own content (see record.hpp). A record
// edited by hand no longer matches it. Consumers refuse such a record unless
// the user passes --allow-modified, and then say so in their output.
//
// Wiring a subcommand (one call, one note):
//
//   const GuardedRecord r = load_record_checked(cmd.record_path, cmd.allow_modified);
//   ... use r.record (and r.seal for the digest) ...
//   if (r.modified) { print/embed modified_record_note(cmd.record_path); }
//
// and add the option with allow_modified_option_help() as its help text.
#pragma once

#include <nlohmann/json.hpp>
#include <string>

#include "ridgecal/record.hpp"

namespace ridgecal {

/// What load_record_checked returns.
struct GuardedRecord {
  CalibrationRecord record;  ///< parsed content
  bool modified = false;  ///< true: the integrity digest did not match (only with allow_modified)
  RecordSeal seal;        ///< the stored and the recomputed digest
};

/// Reads, integrity-checks and parses a record file.
/// Throws InputError (exit 2 in the CLI) when the file cannot be read, is not
/// a valid record, or — unless `allow_modified` — when its integrity digest is
/// missing or does not match its content. The message says how to re-create
/// the record ('ridgecal fit' on the original data) and names --allow-modified.
GuardedRecord load_record_checked(const std::string& path, bool allow_modified);

/// The same for record text already in memory (`file` for messages).
GuardedRecord check_record_text(const std::string& text, const std::string& file,
                                bool allow_modified);

/// One line for outputs made from a modified record, e.g.
/// "NOTE: record.json was modified after ridgecal wrote it (its integrity
/// SHA-256 does not match); used because --allow-modified was given."
std::string modified_record_note(const std::string& path);

/// Help text for the --allow-modified option of every record consumer.
const char* allow_modified_option_help();

}  // namespace ridgecal
