// The batch's output directory: where the records go, its lock against a
// second batch or merge, and the refusal of inputs the batch would overwrite.
#include "ridgecal/batch_output_dir.hpp"

#include <fcntl.h>
#include <fmt/format.h>
#include <sys/file.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>
#include <filesystem>

#include "ridgecal/atomic_file.hpp"
#include "ridgecal/errors.hpp"

namespace ridgecal {

namespace fs = std::filesystem;

std::string batch_records_dir(const BatchOptions& o) {
  return o.out_dir + "/records";
}

namespace {
constexpr const char* kLockName = ".ridgecal.lock";
}  // namespace

OutputDirLock::OutputDirLock(const std::string& dir) : path_(dir + "/" + kLockName) {
  for (int attempt = 0;; ++attempt) {
    fd_ = ::open(path_.c_str(), O_RDWR | O_CREAT | O_CLOEXEC, 0666);
    if (fd_ < 0)
      throw InputError(path_, 0,
                       std::string("cannot create the lock file: ") + std::strerror(errno),
                       "check the permissions of the output directory");
    if (::flock(fd_, LOCK_EX | LOCK_NB) != 0) {
      const int err = errno;
      ::close(fd_);
      fd_ = -1;
      if (err == EWOULDBLOCK)
        throw InputError(dir, 0,
                         fmt::format("another ridgecal batch or merge is writing into this "
                                     "directory (it holds {})",
                                     kLockName),
                         "wait for it to finish, or give another --out-dir");
      throw InputError(path_, 0, std::string("cannot lock the file: ") + std::strerror(err),
                       "use an output directory on a local file system");
    }
    // The holder before us may have removed the file after we opened it: the
    // lock counts only on the file the name still refers to.
    struct stat a {
    }, b{};
    if (::fstat(fd_, &a) == 0 && ::stat(path_.c_str(), &b) == 0 && a.st_dev == b.st_dev &&
        a.st_ino == b.st_ino)
      return;
    ::close(fd_);
    fd_ = -1;
    if (attempt >= 100)
      throw InputError(path_, 0, "the lock file keeps changing", "is another batch starting?");
  }
}

OutputDirLock::~OutputDirLock() {
  if (fd_ < 0) return;
  ::unlink(path_.c_str());  // while still locked: see the constructor
  ::close(fd_);
}

void refuse_inputs_as_outputs(const std::vector<std::string>& inputs, const BatchOptions& options) {
  const std::string& o = options.out_dir;
  std::vector<std::string> dirs;
  if (options.write_records) dirs.push_back(batch_records_dir(options));
  for (const UnitOutput& u : options.unit_outputs) dirs.push_back(o + "/" + u.directory);
  for (const std::string& in : inputs) {
    for (const char* name : {"summary.csv", "summary.json", kLockName})
      if (same_file(in, o + "/" + name))
        throw InputError(in, 0,
                         fmt::format("this input is also an output of the batch ({} in the "
                                     "output directory), which would overwrite it",
                                     name),
                         "give another --out-dir, or move the input out of it");
    const std::string parent = fs::path(in).parent_path().string();
    for (const std::string& d : dirs)
      if (same_file(parent.empty() ? "." : parent, d))
        throw InputError(in, 0,
                         fmt::format("this input lies in {}, where the batch writes a file for "
                                     "every unit and could overwrite it",
                                     d),
                         "give another --out-dir, or move the input out of it");
  }
}

}  // namespace ridgecal
