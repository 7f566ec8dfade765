// Outputs never destroy data (issue 15): the file-identity check behind the
// refusal of an output that is also an input or another output.
#define BOOST_TEST_MODULE output_files
#include <unistd.h>

#include <boost/test/unit_test.hpp>
#include <filesystem>
#include <fstream>

#include "ridgecal/atomic_file.hpp"
#include "test_support.hpp"

namespace fs = std::filesystem;
using namespace ridgecal;
using ridgecal::test::TempDir;

BOOST_AUTO_TEST_CASE(same_file_by_inode_path_and_link) {
  TempDir dir;
  const fs::path a = dir.path() / "a.csv";
  std::ofstream(a) << "x\n";
  BOOST_TEST(same_file(a.string(), a.string()));
  // Another spelling of the same existing file.
  BOOST_TEST(same_file(a.string(), (dir.path() / "." / "a.csv").string()));
  // A hard link and a symbolic link are the same file (device and inode).
  fs::create_hard_link(a, dir.path() / "hard.csv");
  fs::create_symlink(a, dir.path() / "soft.csv");
  BOOST_TEST(same_file(a.string(), (dir.path() / "hard.csv").string()));
  BOOST_TEST(same_file((dir.path() / "soft.csv").string(), a.string()));
  // Different files, and an existing against a not-yet-created one.
  std::ofstream(dir.path() / "b.csv") << "x\n";
  BOOST_TEST(!same_file(a.string(), (dir.path() / "b.csv").string()));
  BOOST_TEST(!same_file(a.string(), (dir.path() / "new.json").string()));
  // Two spellings of one file not yet created (through a linked directory).
  fs::create_directory(dir.path() / "d");
  fs::create_directory_symlink(dir.path() / "d", dir.path() / "dl");
  BOOST_TEST(same_file((dir.path() / "d" / "n.json").string(),
                       (dir.path() / "dl" / ".." / "d" / "n.json").string()));
  BOOST_TEST(
      same_file((dir.path() / "d" / "n.json").string(), (dir.path() / "dl" / "n.json").string()));
  BOOST_TEST(
      !same_file((dir.path() / "d" / "n.json").string(), (dir.path() / "d" / "m.json").string()));
}
