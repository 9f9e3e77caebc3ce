// Whole-file input and atomic file output on POSIX.
#include "tiers/io.hpp"

#include <fcntl.h>
#include <pthread.h>
#include <sys/stat.h>
#include <unistd.h>

#include <atomic>
#include <cerrno>
#include <charconv>
#include <csignal>
#include <cstring>
#include <ctime>
#include <filesystem>
#include <optional>

#include "detail/utf8.hpp"
#include "tiers/diagnostic.hpp"

namespace tiers {
namespace {

// The temporary files being written, for the signal handler: every thread of a batch run may
// be writing one. Each slot holds a copy of its path, so that the handler never reads memory a
// thread is freeing; a slot is active (2) from the moment its path is complete until the file
// is renamed or removed. The handler claims an active slot (3) before it unlinks the path, so a
// slot is never reused under it.
constexpr std::size_t temp_slots = 256;
struct temp_slot {
  std::atomic<int> state{0};  // 0 free, 1 being filled, 2 active, 3 taken by the handler
  char path[4096];
};
temp_slot slots[temp_slots];

// A temporary file exists before its slot is active, and other threads go on running while the
// handler sweeps. So a thread creates and registers its temporary with the signals blocked and
// counted in `creating`; the handler first says the process is ending (`ending`), waits for
// those creations to be registered, then sweeps; a thread that sees `ending` creates nothing.
std::atomic<int> creating{0};
std::atomic<bool> ending{false};

extern "C" void on_fatal_signal(int sig) {
  // Only async-signal-safe calls here: nanosleep, unlink, signal, raise.
  ending.store(true);
  for (int k = 0; k < 2000 && creating.load() > 0; ++k) {
    struct timespec pause {
      0, 1'000'000
    };
    ::nanosleep(&pause, nullptr);
  }
  for (temp_slot& slot : slots) {
    int active = 2;
    if (slot.state.compare_exchange_strong(active, 3)) ::unlink(slot.path);
  }
  std::signal(sig, SIG_DFL);
  std::raise(sig);
}

// The slot that now holds `path`, or -1 when every slot is in use (or the path is too long):
// that file is then not removed on a signal, which docs/cli.md says.
int remember_temp(const std::string& path) {
  if (path.size() >= sizeof(temp_slot::path)) return -1;
  for (std::size_t k = 0; k < temp_slots; ++k) {
    int free = 0;
    if (!slots[k].state.compare_exchange_strong(free, 1)) continue;
    std::memcpy(slots[k].path, path.c_str(), path.size() + 1);
    slots[k].state.store(2);
    return static_cast<int>(k);
  }
  return -1;
}

void forget_temp(int& slot) {
  if (slot < 0) return;
  // Fails only while the handler removes the file: the process is ending then.
  int active = 2;
  slots[slot].state.compare_exchange_strong(active, 0);
  slot = -1;
}

// The process's umask, read once before any thread can create a file: reading it means setting
// it, which would race with threads creating files and folders (they would get mode 0777).
const mode_t process_umask = [] {
  const mode_t mask = ::umask(0);
  ::umask(mask);
  return mask;
}();

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

std::string name_from_path(std::string_view path, bool* repaired) {
  const std::string stem = std::filesystem::path(path).stem().string();
  std::size_t replaced = 0;
  std::string name = detail::repair_utf8(stem, replaced);
  if (repaired) *repaired = replaced > 0;
  return name;
}

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

namespace {

// The descriptor a path names when it is one of the process's own: /dev/stdout, /dev/stderr,
// /dev/fd/N, /proc/self/fd/N (or a link to one). Writing there goes to that descriptor as it
// is (a redirect, a pipe, a file opened for appending); replacing the path would instead put a
// file where the link was, and the output would never reach the redirect.
std::optional<int> own_descriptor(const std::string& path) {
  std::error_code ec;
  std::string p = path;
  for (int hops = 0; hops < 8; ++hops) {
    for (const auto& [name, fd] :
         {std::pair<std::string_view, int>{"/dev/stdout", 1}, {"/dev/stderr", 2}})
      if (p == name) return fd;
    for (std::string_view prefix : {"/dev/fd/", "/proc/self/fd/"})
      if (p.rfind(prefix, 0) == 0) {
        int fd = -1;
        const char* digits = p.c_str() + prefix.size();
        const auto [end, err] = std::from_chars(digits, p.c_str() + p.size(), fd);
        if (err == std::errc{} && *end == '\0' && fd >= 0) return fd;
      }
    struct stat st {};
    if (::lstat(p.c_str(), &st) != 0 || !S_ISLNK(st.st_mode)) return std::nullopt;
    const std::filesystem::path link = std::filesystem::read_symlink(p, ec);
    if (ec) return std::nullopt;
    p = (link.is_absolute() ? link : std::filesystem::path(p).parent_path() / link).string();
  }
  return std::nullopt;
}

}  // namespace

bool atomic_file::writes_directly(const std::string& path) {
  struct stat st {};
  return own_descriptor(path) || (::stat(path.c_str(), &st) == 0 && !S_ISREG(st.st_mode));
}

atomic_file::atomic_file(std::string path) : path_(std::move(path)) {
  if (const std::optional<int> fd = own_descriptor(path_)) {
    fd_ = ::dup(*fd);
    if (fd_ < 0) fail("io.open", path_, "cannot open for writing");
    return;
  }
  // A symbolic link to a regular file: the file it names is replaced, and the link stays.
  std::string target_path = path_;
  {
    std::error_code ec;
    struct stat lst {};
    if (::lstat(path_.c_str(), &lst) == 0 && S_ISLNK(lst.st_mode)) {
      const std::filesystem::path resolved = std::filesystem::canonical(path_, ec);
      if (!ec) target_path = resolved.string();
    }
  }
  struct stat st {};
  const bool exists = ::stat(target_path.c_str(), &st) == 0;
  if (exists && !S_ISREG(st.st_mode)) {
    // A device or pipe (say /dev/null) cannot be replaced by renaming: write to it directly.
    fd_ = ::open(path_.c_str(), O_WRONLY | O_CLOEXEC);
    if (fd_ < 0) fail("io.open", path_, "cannot open for writing");
    return;
  }
  replaced_ = target_path;
  const std::filesystem::path target(target_path);
  const std::filesystem::path dir = target.has_parent_path() ? target.parent_path() : ".";
  // Short, whatever the target's name: a name of up to 255 bytes must still be writable.
  std::string pattern = (dir / ".tiers-XXXXXX").string();
  {
    sigset_t fatal, old;
    sigemptyset(&fatal);
    for (int sig : {SIGINT, SIGTERM, SIGHUP})
      sigaddset(&fatal, sig);
    ::pthread_sigmask(SIG_BLOCK, &fatal, &old);
    creating.fetch_add(1);
    if (ending.load()) {  // the process is being ended by a signal: make nothing more
      creating.fetch_sub(1);
      for (;;)
        ::pause();
    }
    fd_ = ::mkstemp(pattern.data());
    const int why = errno;
    if (fd_ >= 0) {
      temp_path_ = pattern;
      temp_slot_ = remember_temp(temp_path_);
    }
    creating.fetch_sub(1);
    ::pthread_sigmask(SIG_SETMASK, &old, nullptr);
    errno = why;
  }
  if (fd_ < 0) fail("io.open", path_, "cannot create a temporary file in the output's folder");
  ::fcntl(fd_, F_SETFD, FD_CLOEXEC);
  // mkstemp makes the file private; give it the mode a plainly created file would have, or
  // the replaced file's mode, owner and group (the owner only as root: others cannot give a
  // file away, and the new file is then theirs).
  mode_t mode = 0;
  if (exists) {
    mode = st.st_mode & 07777;
    if (st.st_uid != ::geteuid() || st.st_gid != ::getegid())
      if (::fchown(fd_, st.st_uid, st.st_gid) != 0 && st.st_gid != ::getegid())
        (void)::fchown(fd_, static_cast<uid_t>(-1), st.st_gid);  // the group, where allowed
  } else {
    mode = 0666 & ~process_umask;
  }
  ::fchmod(fd_, mode);
}

atomic_file::~atomic_file() {
  if (fd_ >= 0) ::close(fd_);
  if (!temp_path_.empty()) {
    forget_temp(temp_slot_);
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
  if (::rename(temp_path_.c_str(), replaced_.c_str()) != 0)
    fail("io.write", path_, "cannot replace");
  forget_temp(temp_slot_);
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
