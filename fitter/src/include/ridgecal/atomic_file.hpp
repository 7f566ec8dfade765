// ridgecal: write an output file so that readers see the old complete file or
// the new complete file, never a partial one.
#pragma once

#include <string>
#include <string_view>

namespace ridgecal {

/// Writes `content` to a temporary file in the same directory as `path`,
/// flushes it to disk, then renames it over `path`.
/// Throws InputError (line 0) when the directory is not writable or the
/// rename fails; the temporary file is removed in that case.
void write_file_atomic(const std::string& path, std::string_view content);

/// True when `a` and `b` name the same file: the same device and inode when
/// both exist, else the same absolute path after resolving symbolic links of
/// the part that exists (a file not yet created). Used to refuse an output
/// that is also an input or another output.
bool same_file(const std::string& a, const std::string& b);

/// Reads a whole file. Throws InputError when it cannot be opened.
std::string read_file_bytes(const std::string& path);

/// Reads a whole file of at most `max_bytes` bytes. A larger file (regular or
/// not, e.g. a pipe) is refused with an InputError whose hint is `hint`,
/// without reading more than max_bytes + 1 bytes of it.
std::string read_file_bytes_limited(const std::string& path, std::size_t max_bytes,
                                    const std::string& hint);

}  // namespace ridgecal
