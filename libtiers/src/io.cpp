// Whole-file input and atomic file output on POSIX.
#include "tiers/io.hpp"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <atomic>
#include <cerrno>
#include <csignal>
#include <cstring>
#include <filesystem>

#include "tiers/diagnostic.hpp"

namespace tiers {
namespace {

// The temporary file being written, for the signal handler; one atomic_file at a time is
// enough for a command-line program.
std::atomic<const char*> active_temp{nullptr};

extern "C" void on_fatal_signal(int sig) {
  // Only async-signal-safe calls here: unlink, signal, raise.
  if (const char* path = active_temp.exchange(nullptr)) ::unlink(path);
  std::signal(sig, SIG_DFL);
  std::raise(sig);
}

void forget_temp(const std::string& path) {
  const char* mine = path.c_str();
  active_temp.compare_exchange_strong(mine, nullptr);
}

[[noreturn]] void fail(std::string code, const std::string& file, const std::string& what) {
  diagnostic d;
  d.code = std::move(code);
  d.file = file == "-" ? "<stdin>" : file;
  d.message = what + ": " + std::strerror(errno);
  throw error(std::move(d));
}

void read_all(int fd, const std::string& name, std::string& out) {
  char chunk[1 << 16];
  for (;;) {
    const ssize_t n = ::read(fd, chunk, sizeof chunk);
    if (n == 0) return;
    if (n < 0) {
      if (errno == EINTR) continue;
      fail("io.read", name, "cannot read");
    }
    out.append(chunk, static_cast<std::size_t>(n));
  }
}

void write_all(int fd, const char* data, std::size_t size, const std::string& name) {
  while (size > 0) {
    const ssize_t n = ::write(fd, data, size);
    if (n < 0) {
      if (errno == EINTR) continue;
      fail("io.write", name, "cannot write");
    }
    data += n;
    size -= static_cast<std::size_t>(n);
  }
}

}  // namespace

std::string read_input(const std::string& path) {
  std::string content;
  if (path == "-") {
    read_all(STDIN_FILENO, path, content);
    return content;
  }
  const int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC);
  if (fd < 0) fail("io.open", path, "cannot open");
  struct stat st {};
  if (::fstat(fd, &st) == 0) {
    if (S_ISDIR(st.st_mode)) {
      ::close(fd);
      errno = EISDIR;
      fail("io.open", path, "cannot read");
    }
    if (S_ISREG(st.st_mode)) content.reserve(static_cast<std::size_t>(st.st_size));
  }
  try {
    read_all(fd, path, content);
  } catch (...) {
    ::close(fd);
    throw;
  }
  ::close(fd);
  return content;
}

atomic_file::atomic_file(std::string path) : path_(std::move(path)) {
  struct stat st {};
  const bool exists = ::stat(path_.c_str(), &st) == 0;
  if (exists && !S_ISREG(st.st_mode)) {
    // A device or pipe (say /dev/null) cannot be replaced by renaming: write to it directly.
    fd_ = ::open(path_.c_str(), O_WRONLY | O_CLOEXEC);
    if (fd_ < 0) fail("io.open", path_, "cannot open for writing");
    return;
  }
  const std::filesystem::path target(path_);
  const std::filesystem::path dir = target.has_parent_path() ? target.parent_path() : ".";
  std::string pattern = (dir / ("." + target.filename().string() + ".tiers-XXXXXX")).string();
  fd_ = ::mkstemp(pattern.data());
  if (fd_ < 0) fail("io.open", path_, "cannot create a temporary file in the output's folder");
  temp_path_ = pattern;
  active_temp.store(temp_path_.c_str());
  ::fcntl(fd_, F_SETFD, FD_CLOEXEC);
  // mkstemp makes the file private; give it the mode a plainly created file would have.
  mode_t mode = 0;
  if (exists) {
    mode = st.st_mode & 07777;
  } else {
    const mode_t mask = ::umask(0);
    ::umask(mask);
    mode = 0666 & ~mask;
  }
  ::fchmod(fd_, mode);
}

atomic_file::~atomic_file() {
  if (fd_ >= 0) ::close(fd_);
  if (!temp_path_.empty()) {
    forget_temp(temp_path_);
    ::unlink(temp_path_.c_str());
  }
}

void atomic_file::emit(const char* data, std::size_t size) {
  write_all(fd_, data, size, path_);
}

void atomic_file::commit() {
  flush();
  if (temp_path_.empty()) {
    if (::close(fd_) != 0) {
      fd_ = -1;
      fail("io.write", path_, "cannot write");
    }
    fd_ = -1;
    return;
  }
  if (::fsync(fd_) != 0) fail("io.write", path_, "cannot write");
  const int rc = ::close(fd_);
  fd_ = -1;
  if (rc != 0) fail("io.write", path_, "cannot write");
  if (::rename(temp_path_.c_str(), path_.c_str()) != 0) fail("io.write", path_, "cannot replace");
  forget_temp(temp_path_);
  temp_path_.clear();
}

void remove_partial_output_on_signals() {
  for (int sig : {SIGINT, SIGTERM, SIGHUP}) {
    struct sigaction action {};
    action.sa_handler = on_fatal_signal;
    sigemptyset(&action.sa_mask);
    ::sigaction(sig, &action, nullptr);
  }
}

stdout_sink::~stdout_sink() {
  try {
    flush();
  } catch (const error&) {
    // Reported by an explicit flush where it matters; a destructor must not throw.
  }
}

void stdout_sink::emit(const char* data, std::size_t size) {
  write_all(STDOUT_FILENO, data, size, "<stdout>");
}

}  // namespace tiers
