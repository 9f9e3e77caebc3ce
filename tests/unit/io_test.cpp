// Atomic output: a file appears complete on commit or not at all.
#include <catch2/catch.hpp>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "support.hpp"
#include "tiers/diagnostic.hpp"
#include "tiers/io.hpp"

#include <sys/wait.h>
#include <unistd.h>

#include <csignal>

using namespace tiers;
using tiers::test::slurp;
namespace fs = std::filesystem;

namespace {
fs::path fresh_dir(const char* name) {
  const fs::path dir = fs::temp_directory_path() /
                       (std::string("tiers-io-") + name + "-" + std::to_string(::getpid()));
  fs::remove_all(dir);
  fs::create_directories(dir);
  return dir;
}
}  // namespace

TEST_CASE("atomic_file replaces the target only on commit", "[io]") {
  const fs::path dir = fresh_dir("commit");
  const fs::path target = dir / "out.csv";
  {
    atomic_file f(target.string());
    f.write("hello");
    CHECK_FALSE(fs::exists(target));
    f.commit();
  }
  CHECK(slurp(target) == "hello");
  CHECK(std::distance(fs::directory_iterator(dir), fs::directory_iterator{}) == 1);
  fs::remove_all(dir);
}

TEST_CASE("atomic_file without commit leaves the old file and no temporary", "[io]") {
  const fs::path dir = fresh_dir("abort");
  const fs::path target = dir / "out.csv";
  std::ofstream(target) << "old";
  {
    atomic_file f(target.string());
    f.write(std::string(1 << 20, 'x'));  // more than the buffer: bytes reach the temporary
  }
  CHECK(slurp(target) == "old");
  CHECK(std::distance(fs::directory_iterator(dir), fs::directory_iterator{}) == 1);
  fs::remove_all(dir);
}

TEST_CASE("atomic_file keeps the mode of the file it replaces", "[io]") {
  const fs::path dir = fresh_dir("mode");
  const fs::path target = dir / "out.json";
  std::ofstream(target) << "old";
  fs::permissions(target, fs::perms::owner_read | fs::perms::owner_write | fs::perms::group_read);
  {
    atomic_file f(target.string());
    f.write("new");
    f.commit();
  }
  CHECK(fs::status(target).permissions() ==
        (fs::perms::owner_read | fs::perms::owner_write | fs::perms::group_read));
  fs::remove_all(dir);
}

TEST_CASE("read_input and atomic_file report failures as tiers::error", "[io]") {
  CHECK_THROWS_AS(read_input("/nonexistent/tiers/input.json"), tiers::error);
  CHECK_THROWS_AS(atomic_file("/nonexistent/tiers/out.json"), tiers::error);
  try {
    read_input("/nonexistent/tiers/input.json");
  } catch (const tiers::error& e) {
    CHECK(e.diag().code == "io.open");
    CHECK(std::string(e.what()) ==
          "/nonexistent/tiers/input.json: error: cannot open: No such file or directory [io.open]");
  }
}

TEST_CASE("a terminating signal during a write removes the temporary file", "[io]") {
  const fs::path dir = fresh_dir("signal");
  const fs::path target = dir / "out.csv";
  std::ofstream(target) << "old";
  const pid_t child = ::fork();
  REQUIRE(child >= 0);
  if (child == 0) {
    remove_partial_output_on_signals();
    atomic_file f(target.string());
    f.write(std::string(1 << 20, 'x'));
    std::raise(SIGTERM);
    std::_Exit(0);  // not reached: the signal ends the process
  }
  int status = 0;
  REQUIRE(::waitpid(child, &status, 0) == child);
  CHECK(WIFSIGNALED(status));
  CHECK(WTERMSIG(status) == SIGTERM);
  CHECK(slurp(target) == "old");
  CHECK(std::distance(fs::directory_iterator(dir), fs::directory_iterator{}) == 1);
  fs::remove_all(dir);
}
