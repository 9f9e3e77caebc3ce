// The buffer behind byte_sink and the string sink.
#include "tiers/sink.hpp"

namespace tiers {

namespace {
constexpr std::size_t buffer_size = 1 << 16;
}

byte_sink::byte_sink() : buffer_(new char[buffer_size]), capacity_(buffer_size) {}

byte_sink::~byte_sink() = default;

void byte_sink::flush() {
  flush_buffer();
}

void byte_sink::flush_buffer() {
  if (used_ == 0) return;
  const std::size_t n = used_;
  used_ = 0;
  emit(buffer_.get(), n);
}

void byte_sink::write_slow(std::string_view s) {
  flush_buffer();
  if (s.size() >= capacity_) {
    emit(s.data(), s.size());
  } else {
    s.copy(buffer_.get(), s.size());
    used_ = s.size();
  }
}

string_sink::~string_sink() {
  flush();
}

}  // namespace tiers
