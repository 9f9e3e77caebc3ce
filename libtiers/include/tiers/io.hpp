// Reading input files and writing output files atomically.
#pragma once

#include <string>
#include <string_view>

#include "tiers/sink.hpp"

namespace tiers {

/// The whole content of `path`; `-` reads standard input. Throws tiers::error.
std::string read_input(const std::string& path);

/// The name a file gives the tier it holds: its stem (`talk.words.vtt` → `talk.words`), as
/// UTF-8. A file system's names may hold any bytes; those that are not UTF-8 become U+FFFD and
/// `repaired`, when given, is set, so that the caller can say so.
std::string name_from_path(std::string_view path, bool* repaired = nullptr);

/// Writes a file atomically: bytes go to a temporary file beside the target, which replaces the
/// target only on `commit`. Destroyed without `commit`, it removes the temporary file, so a
/// failed run never leaves a partial output and never touches an existing one.
class atomic_file final : public byte_sink {
 public:
  explicit atomic_file(std::string path);  ///< throws tiers::error
  ~atomic_file() override;
  void commit();  ///< flushes, syncs and renames; throws tiers::error
  /// Whether bytes for `path` go straight to it (a device, a pipe, the process's own
  /// descriptors) rather than to a temporary file: what was written before a failure could
  /// not be taken back, so a writer that streams should not start before its input is read.
  static bool writes_directly(const std::string& path);

 protected:
  void emit(const char* data, std::size_t size) override;

 private:
  std::string path_;
  std::string replaced_;  // the regular file renamed over: path_, or the file its link names
  std::string temp_path_;
  int fd_ = -1;
  int temp_slot_ = -1;  // where the signal handler finds temp_path_
};

/// Makes SIGINT, SIGTERM and SIGHUP remove the temporary files of every atomic_file being
/// written, by any thread (up to 256 at once), before the process ends as the signal would end
/// it. For programs; call once.
/// (SIGKILL cannot be caught: then the temporary file stays, and the target is still whole.)
void remove_partial_output_on_signals();

/// Writes to standard output.
class stdout_sink final : public byte_sink {
 public:
  ~stdout_sink() override;

 protected:
  void emit(const char* data, std::size_t size) override;
};

}  // namespace tiers
