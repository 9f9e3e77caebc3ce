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

void write_csv_field(byte_sink& out, std::string_view s, char delimiter) {
  const bool needs_quotes =
      s.find_first_of(delimiter == ',' ? std::string_view(",\"\r\n")
                                       : std::string_view("\t\"\r\n")) != std::string_view::npos;
  if (!needs_quotes) return out.write(s);
  out.put('"');
  std::size_t run = 0;
  for (std::size_t q = s.find('"'); q != std::string_view::npos; q = s.find('"', q + 1)) {
    out.write(s.substr(run, q + 1 - run));
    out.put('"');
    run = q + 1;
  }
  out.write(s.substr(run));
  out.put('"');
}

}  // namespace tiers
