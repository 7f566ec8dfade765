// ridgecal: writing output files without ever destroying data.
//
// Every output is written to a temporary file beside it, flushed to disk and
// renamed over the target, so a reader sees the old complete file or the new
// complete one, never a partial one. Several outputs of one command are
// written all or none: every temporary file is complete before the first
// rename. A target that is not a regular file (a device such as /dev/null or
// /dev/full, a FIFO, /dev/stdout) is never replaced: it is written directly,
// after the regular outputs. A symbolic link to a file is kept: its target is
// replaced. A new file gets the mode 0666 less the process umask; a replaced
// file keeps its mode (and, where permitted, its owner). The directory is
// fsynced after the rename, so the new name survives a power cut.
#pragma once

#include <string>
#include <string_view>
#include <vector>

namespace ridgecal {

/// One output of a command: where, and what.
struct OutputFile {
  std::string path;
  std::string content;
};

/// Writes every output, all or none (see above). Throws InputError (line 0,
/// the failing path) when a temporary file cannot be created or written (a
/// missing or read-only directory, a full disk) or a target is a directory;
/// every temporary file is then removed and no target has changed. Only a
/// failure of the rename itself, after all writes succeeded (a file system
/// error), or of a direct write to a non-regular target, can leave the
/// outputs before it written.
void write_outputs_atomic(const std::vector<OutputFile>& outputs);

/// One output: write_outputs_atomic({{path, content}}).
void write_file_atomic(const std::string& path, std::string_view content);

/// True when `a` and `b` name the same file: the same device and inode when
/// both exist, else the same absolute path after resolving symbolic links of
/// the part that exists (a file not yet created). Used to refuse an output
/// that is also an input or another output.
bool same_file(const std::string& a, const std::string& b);

/// Refuses, before anything is read or written, an output that is the same
/// file (same_file) as one of the inputs or as another output. Throws
/// InputError naming the output and the file it would overwrite. Empty paths
/// and "-" (standard output) are ignored. `what` names each output for the
/// message ("record", "report", ...), parallel to `outputs`.
void refuse_output_clashes(const std::vector<std::string>& inputs,
                           const std::vector<std::string>& outputs,
                           const std::vector<std::string>& what);

/// Reads a whole file. Throws InputError when it cannot be opened.
std::string read_file_bytes(const std::string& path);

/// Reads a whole file of at most `max_bytes` bytes. A larger file (regular or
/// not, e.g. a pipe) is refused with an InputError whose hint is `hint`,
/// without reading more than max_bytes + 1 bytes of it.
std::string read_file_bytes_limited(const std::string& path, std::size_t max_bytes,
                                    const std::string& hint);

}  // namespace ridgecal
