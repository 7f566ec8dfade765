#include "ridgecal/atomic_file.hpp"

#include <fcntl.h>
#include <fmt/format.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cassert>
#include <cerrno>
#include <cstdint>
#include <cstdlib>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <vector>

#include "ridgecal/errors.hpp"

namespace ridgecal {

namespace {

// The process umask, read without changing it (umask(2) can only be read by
// setting it, which races with other threads creating files). Linux reports
// it in /proc/self/status since 4.7; 022 (common practice) otherwise.
mode_t process_umask() {
  std::ifstream in("/proc/self/status");
  for (std::string line; std::getline(in, line);)
    if (line.rfind("Umask:", 0) == 0)
      return static_cast<mode_t>(std::strtoul(line.c_str() + 6, nullptr, 8));
  return 022;
}

bool write_all(int fd, std::string_view content) {
  const char* p = content.data();
  std::size_t left = content.size();
  while (left > 0) {
    const ssize_t n = ::write(fd, p, left);
    if (n < 0) {
      if (errno == EINTR) continue;
      return false;
    }
    p += n;
    left -= static_cast<std::size_t>(n);
  }
  return true;
}

[[noreturn]] void fail(const std::string& path, const std::string& what, int err) {
  throw InputError(path, 0, what + ": " + std::strerror(err),
                   "check that the output directory exists and is writable, the free disk space "
                   "and the permissions");
}

// One output being written: where it ends up and how.
struct Staged {
  std::string target;  // the file renamed over (a link's target), or the device written to
  std::string temp;    // temporary file beside it; empty for a direct write
  const OutputFile* output = nullptr;
};

// The device, FIFO, terminal or /dev, /proc name an output must be written to
// in place, never renamed over.
bool write_in_place(const std::string& path, const struct stat* st) {
  if (path.rfind("/dev/", 0) == 0 || path.rfind("/proc/", 0) == 0) return true;
  return st != nullptr && !S_ISREG(st->st_mode);
}

// The file descriptor an output name refers to when it names one of this
// process's own open files (/dev/stdout, /dev/fd/3, ...), else -1. Such an
// output is written through that descriptor, at its offset, so it interleaves
// correctly with the process's other writes to it.
int own_descriptor(const std::string& path) {
  if (path == "/dev/stdout") return 1;
  if (path == "/dev/stderr") return 2;
  for (const char* prefix : {"/dev/fd/", "/proc/self/fd/"}) {
    const std::string p(prefix);
    if (path.size() > p.size() && path.compare(0, p.size(), p) == 0 &&
        path.find_first_not_of("0123456789", p.size()) == std::string::npos &&
        path.size() < p.size() + 6)
      return std::stoi(path.substr(p.size()));
  }
  return -1;
}

void remove_temps(const std::vector<Staged>& staged) {
  for (const Staged& s : staged)
    if (!s.temp.empty()) ::unlink(s.temp.c_str());
}

void fsync_directory(const std::string& file) {
  const std::filesystem::path dir = std::filesystem::path(file).parent_path();
  const int fd = ::open(dir.empty() ? "." : dir.c_str(), O_RDONLY | O_DIRECTORY);
  if (fd < 0) return;  // durability is best effort once the rename is done
  ::fsync(fd);
  ::close(fd);
}

// Creates, fills and flushes the temporary file of one regular output.
// Throws after removing it on any failure.
std::string stage(const std::string& target, const std::string& shown, std::string_view content,
                  mode_t umask_bits) {
  struct stat old {};
  const bool exists = ::stat(target.c_str(), &old) == 0;
  std::string tmpl = target + ".tmp-XXXXXX";
  const int fd = ::mkstemp(tmpl.data());
  if (fd < 0) fail(shown, "cannot create a temporary file beside it", errno);
  const mode_t mode = exists ? (old.st_mode & 07777) : (0666 & ~umask_bits);
  bool ok = write_all(fd, content);
  int err = errno;
  if (ok && ::fchmod(fd, mode) != 0) ok = false, err = errno;
  if (ok && exists && (old.st_uid != ::geteuid() || old.st_gid != ::getegid()))
    (void)!::fchown(fd, old.st_uid, old.st_gid);  // keep the owner where permitted
  if (ok && ::fsync(fd) != 0) ok = false, err = errno;
  if (::close(fd) != 0 && ok) ok = false, err = errno;
  if (!ok) {
    ::unlink(tmpl.c_str());
    fail(shown, "cannot write the output file", err);
  }
  return tmpl;
}

}  // namespace

void write_outputs_atomic(const std::vector<OutputFile>& outputs) {
  const mode_t umask_bits = process_umask();
  std::vector<Staged> staged;
  try {
    for (const OutputFile& o : outputs) {
      assert(!o.path.empty());
      struct stat st {};
      const bool exists = ::stat(o.path.c_str(), &st) == 0;
      if (exists && S_ISDIR(st.st_mode))
        throw InputError(o.path, 0, "the output is a directory",
                         "give a file name for this output");
      if (write_in_place(o.path, exists ? &st : nullptr)) {
        staged.push_back({o.path, "", &o});
        continue;
      }
      // Keep a symbolic link: replace the file it points to.
      std::error_code ec;
      const std::filesystem::path resolved = std::filesystem::weakly_canonical(o.path, ec);
      const std::string target = ec ? o.path : resolved.string();
      staged.push_back({target, stage(target, o.path, o.content, umask_bits), &o});
    }
  } catch (...) {
    remove_temps(staged);
    throw;
  }
  for (std::size_t i = 0; i < staged.size(); ++i) {
    const Staged& s = staged[i];
    if (s.temp.empty()) continue;
    if (::rename(s.temp.c_str(), s.target.c_str()) != 0) {
      const int err = errno;
      std::vector<Staged> rest(staged.begin() + static_cast<std::ptrdiff_t>(i), staged.end());
      remove_temps(rest);
      fail(s.output->path, "cannot rename the finished output into place", err);
    }
    fsync_directory(s.target);
  }
  for (const Staged& s : staged) {
    if (!s.temp.empty()) continue;
    if (const int own = own_descriptor(s.target); own >= 0) {
      if (!write_all(own, s.output->content))
        fail(s.output->path, "cannot write the output", errno);
      continue;
    }
    const int fd = ::open(s.target.c_str(), O_WRONLY | O_CLOEXEC);
    if (fd < 0) fail(s.output->path, "cannot open the output for writing", errno);
    const bool ok = write_all(fd, s.output->content);
    const int err = errno;
    if (::close(fd) != 0 || !ok) fail(s.output->path, "cannot write the output", ok ? errno : err);
  }
}

void write_file_atomic(const std::string& path, std::string_view content) {
  write_outputs_atomic({OutputFile{path, std::string(content)}});
}

void refuse_output_clashes(const std::vector<std::string>& inputs,
                           const std::vector<std::string>& outputs,
                           const std::vector<std::string>& what) {
  assert(what.size() == outputs.size());
  const auto skip = [](const std::string& p) { return p.empty() || p == "-"; };
  for (std::size_t i = 0; i < outputs.size(); ++i) {
    if (skip(outputs[i])) continue;
    for (const std::string& in : inputs)
      if (!skip(in) && same_file(outputs[i], in))
        throw InputError(outputs[i], 0,
                         fmt::format("the {} output is the same file as the input '{}'; writing "
                                     "it would destroy that input",
                                     what[i], in),
                         "write the output to another file");
    for (std::size_t k = 0; k < i; ++k)
      if (!skip(outputs[k]) && same_file(outputs[i], outputs[k]))
        throw InputError(
            outputs[i], 0,
            fmt::format("the {} output is the same file as the {} output", what[i], what[k]),
            "give each output its own file");
  }
}

bool same_file(const std::string& a, const std::string& b) {
  struct stat sa {
  }, sb{};
  const bool ea = ::stat(a.c_str(), &sa) == 0;
  const bool eb = ::stat(b.c_str(), &sb) == 0;
  if (ea && eb) return sa.st_dev == sb.st_dev && sa.st_ino == sb.st_ino;
  if (ea != eb) return false;  // one exists, the other does not: different files
  std::error_code ec1, ec2;
  const auto pa = std::filesystem::weakly_canonical(std::filesystem::absolute(a), ec1);
  const auto pb = std::filesystem::weakly_canonical(std::filesystem::absolute(b), ec2);
  if (ec1 || ec2) return std::filesystem::absolute(a) == std::filesystem::absolute(b);
  return pa == pb;
}

std::string read_file_bytes(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(path, 0, "cannot open the file", "check the path and the permissions");
  std::ostringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

std::string read_file_bytes_limited(const std::string& path, std::size_t max_bytes,
                                    const std::string& hint) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(path, 0, "cannot open the file", "check the path and the permissions");
  struct stat st {};
  if (::stat(path.c_str(), &st) == 0 && S_ISREG(st.st_mode) &&
      static_cast<std::uintmax_t>(st.st_size) > max_bytes)
    throw InputError(
        path, 0, fmt::format("the file is {} bytes; the limit is {} bytes", st.st_size, max_bytes),
        hint);
  std::string out;
  char buf[1 << 16];
  while (in) {
    in.read(buf, sizeof buf);
    const std::size_t got = static_cast<std::size_t>(in.gcount());
    if (got > max_bytes - out.size())
      throw InputError(
          path, 0, fmt::format("the input is longer than the limit of {} bytes", max_bytes), hint);
    out.append(buf, got);
  }
  if (in.bad())
    throw InputError(path, 0, "cannot read the file", "check the path and the permissions");
  return out;
}

}  // namespace ridgecal
