// Atomic output: a file appears complete on commit or not at all.
#include <catch2/catch.hpp>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "support.hpp"
#include "tiers/diagnostic.hpp"
#include "tiers/io.hpp"

#include <fcntl.h>
#include <sys/stat.h>
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

TEST_CASE("atomic_file writes names of up to 255 bytes (its temporary name is short)", "[io]") {
  const fs::path dir = fresh_dir("long-name");
  const fs::path target = dir / (std::string(250, 'n') + ".json");  // 255 bytes, NAME_MAX
  {
    atomic_file f(target.string());
    f.write("long");
    f.commit();
  }
  CHECK(slurp(target) == "long");
  fs::remove_all(dir);
}

TEST_CASE("atomic_file replaces the file a link names, and keeps the link", "[io]") {
  const fs::path dir = fresh_dir("link");
  std::ofstream(dir / "real.json") << "old";
  fs::create_symlink("real.json", dir / "link.json");
  {
    atomic_file f((dir / "link.json").string());
    f.write("new");
    f.commit();
  }
  CHECK(fs::is_symlink(dir / "link.json"));
  CHECK(slurp(dir / "real.json") == "new");
  fs::remove_all(dir);
}

TEST_CASE("atomic_file writes to the process's own descriptors, never replacing their links",
          "[io]") {
  // As `-o /dev/stdout` with the output redirected: the link stays, the bytes reach the fd.
  const fs::path dir = fresh_dir("own-fd");
  const fs::path redirect = dir / "redirect.txt";
  const int fd = ::open(redirect.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0644);
  REQUIRE(fd >= 0);
  const fs::path link = dir / "stdout-link";
  fs::create_symlink("/proc/self/fd/" + std::to_string(fd), link);
  {
    atomic_file f(link.string());
    f.write("through the descriptor");
    f.commit();
  }
  ::close(fd);
  CHECK(fs::is_symlink(link));
  CHECK(slurp(redirect) == "through the descriptor");
  fs::remove_all(dir);
}

TEST_CASE("atomic_file writes into a named pipe and leaves the pipe in place", "[io]") {
  const fs::path dir = fresh_dir("fifo");
  const fs::path fifo = dir / "pipe";
  REQUIRE(::mkfifo(fifo.c_str(), 0600) == 0);
  const fs::path received = dir / "received.txt";
  const pid_t child = ::fork();
  REQUIRE(child >= 0);
  if (child == 0) {  // the pipe's reader, as `tiers … -o pipe` has one in a shell pipeline
    std::ifstream in(fifo);
    std::ofstream(received) << in.rdbuf();
    ::_exit(0);
  }
  {
    atomic_file f(fifo.string());
    f.write("through the pipe");
    f.commit();
  }
  int status = 0;
  ::waitpid(child, &status, 0);
  CHECK(fs::is_fifo(fifo));
  CHECK(slurp(received) == "through the pipe");
  fs::remove_all(dir);
}

TEST_CASE("atomic_file keeps the owner and group of the file it replaces, as root", "[io]") {
  if (::geteuid() != 0) {
    WARN("not root: a file's owner cannot be given away, so this is not tested here");
    return;
  }
  const fs::path dir = fresh_dir("owner");
  const fs::path target = dir / "theirs.json";
  std::ofstream(target) << "old";
  REQUIRE(::chown(target.c_str(), 65534, 65534) == 0);  // nobody, by Debian's numbering
  ::chmod(target.c_str(), 0600);
  {
    atomic_file f(target.string());
    f.write("new");
    f.commit();
  }
  struct stat st {};
  REQUIRE(::stat(target.c_str(), &st) == 0);
  CHECK(st.st_uid == 65534);
  CHECK(st.st_gid == 65534);
  CHECK((st.st_mode & 07777) == 0600);
  fs::remove_all(dir);
}
