// Buffered byte output that writers append to: a string, a stream or a file.
#pragma once

#include <cstddef>
#include <memory>
#include <string>
#include <string_view>

namespace tiers {

/// A buffered byte sink. Writers call `write`/`put`; the buffer goes to `emit` in large
/// chunks, so a writer never builds its whole output in memory.
class byte_sink {
 public:
  byte_sink();
  byte_sink(const byte_sink&) = delete;
  byte_sink& operator=(const byte_sink&) = delete;
  virtual ~byte_sink();

  void write(std::string_view s) {
    if (s.size() <= capacity_ - used_) {
      s.copy(buffer_.get() + used_, s.size());
      used_ += s.size();
    } else {
      write_slow(s);
    }
  }
  void put(char c) {
    if (used_ == capacity_) flush_buffer();
    buffer_[used_++] = c;
  }
  /// Hands everything buffered to `emit`.
  void flush();

 protected:
  /// Receives the bytes; throws tiers::error on failure.
  virtual void emit(const char* data, std::size_t size) = 0;

 private:
  void write_slow(std::string_view s);
  void flush_buffer();
  std::unique_ptr<char[]> buffer_;
  std::size_t capacity_;
  std::size_t used_ = 0;
};

/// Appends to a string; for tests and small outputs.
class string_sink final : public byte_sink {
 public:
  explicit string_sink(std::string& out) : out_(out) {}
  ~string_sink() override;

 protected:
  void emit(const char* data, std::size_t size) override { out_.append(data, size); }

 private:
  std::string& out_;
};

/// Writes one field of a CSV (RFC 4180) or TSV row: quoted, its quotes doubled, only when it
/// holds the delimiter, a quote or a line break.
void write_csv_field(byte_sink& out, std::string_view field, char delimiter = ',');

}  // namespace tiers
