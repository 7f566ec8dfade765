#include "ridgecal/atomic_file.hpp"

#include <fcntl.h>
#include <fmt/format.h>
#include <sys/stat.h>
#include <unistd.h>

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

void write_file_atomic(const std::string& path, std::string_view content) {
  std::string tmpl = path + ".tmp-XXXXXX";
  std::vector<char> buf(tmpl.begin(), tmpl.end());
  buf.push_back('\0');
  const int fd = ::mkstemp(buf.data());
  if (fd < 0)
    throw InputError(
        path, 0, std::string("cannot create a temporary file beside it: ") + std::strerror(errno),
        "check that the output directory exists and is writable");
  const std::string tmp(buf.data());
  const char* p = content.data();
  std::size_t left = content.size();
  bool ok = true;
  while (left > 0) {
    const ssize_t n = ::write(fd, p, left);
    if (n < 0) {
      if (errno == EINTR) continue;
      ok = false;
      break;
    }
    p += n;
    left -= static_cast<std::size_t>(n);
  }
  const int saved_errno = errno;
  ok = ok && ::fchmod(fd, 0644) == 0 && ::fsync(fd) == 0;
  ok = (::close(fd) == 0) && ok;
  if (!ok || ::rename(tmp.c_str(), path.c_str()) != 0) {
    const int err = ok ? errno : saved_errno;
    ::unlink(tmp.c_str());
    throw InputError(path, 0, std::string("cannot write the output file: ") + std::strerror(err),
                     "check free disk space and permissions");
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
