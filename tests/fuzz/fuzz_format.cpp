// Fuzz target for one format's reader (TIERS_FUZZ_FORMAT): never a crash, every diagnostic
// located and worded; no control character of the input vanishes without a diagnostic; what the
// reader accepts, every format's writer writes as UTF-8, and every format that can carry it
// whole reads it back; and its own format reads it back to the same document (but for how
// references are spelt).
#include <bitset>
#include <cstddef>
#include <cstdint>
#include <memory>
#include <string>
#include <string_view>

#include "detail/utf8.hpp"
#include "tiers/tiers.hpp"

namespace {

using controls = std::bitset<32>;  // C0 control characters, by code

void note_control(controls& seen, std::uint32_t c) {
  if (c < 0x20 && c != '\t' && c != '\n' && c != '\r') seen.set(c);
}

std::uint32_t hex_value(std::string_view digits, bool& ok) {
  std::uint32_t v = 0;
  ok = !digits.empty();
  for (char d : digits) {
    const int x = d >= '0' && d <= '9'   ? d - '0'
                  : d >= 'a' && d <= 'f' ? d - 'a' + 10
                  : d >= 'A' && d <= 'F' ? d - 'A' + 10
                                         : -1;
    if (x < 0 || v > 0xFFFFF) ok = false;
    if (!ok) return 0;
    v = v * 16 + static_cast<std::uint32_t>(x);
  }
  return v;
}

// The input without the parts that carry no data by design: a table's header row (a column's
// name reaches the document only through the values under it; a header with no rows is an
// empty table), after a byte order mark and empty lines, and the comment lines of the tiers
// format.
std::string data_of(std::string_view in, std::string_view format) {
  if (format == "csv" || format == "tsv") {
    if (in.starts_with("\xEF\xBB\xBF")) in.remove_prefix(3);  // a byte order mark, then the table
    // The header ends at the first line break outside quotes. As RFC 4180 reads, a field is
    // quoted only when its first character is a quote; a quote inside an unquoted field is
    // literal (the reader takes it so), and "" inside a quoted one is a quote.
    const char delimiter = format == "csv" ? ',' : '\t';
    bool quoted = false, field_start = true;
    std::size_t k = in.find_first_not_of("\r\n");  // empty lines before the header
    for (; k < in.size(); ++k) {
      const char c = in[k];
      if (quoted) {
        if (c == '"') {
          if (k + 1 < in.size() && in[k + 1] == '"')
            ++k;
          else
            quoted = false;
        }
        continue;
      }
      if (c == '"' && field_start) {
        quoted = true;
        field_start = false;
        continue;
      }
      if (c == '\n') return std::string(in.substr(k + 1));
      field_start = c == delimiter;
    }
    return {};
  }
  if (format == "vtt") {
    // A timing line's tab or form feed separates its times and settings (WebVTT §6.1, "ASCII
    // whitespace"): a separator, not data that the document should keep.
    std::string out;
    for (std::size_t from = 0; from < in.size();) {
      std::size_t end = in.find_first_of("\r\n", from);
      if (end == std::string_view::npos) end = in.size();
      const std::string_view line = in.substr(from, end - from);
      if (line.find("-->") == std::string_view::npos) out.append(line);
      if (end < in.size()) out += in[end];
      from = end + 1;
    }
    return out;
  }
  if (format != "tiers") return std::string(in);
  std::string out;
  for (std::size_t k = 0; k < in.size();) {
    std::size_t end = in.find('\n', k);
    end = end == std::string_view::npos ? in.size() : end + 1;
    const std::string_view line = in.substr(k, end - k);
    const std::size_t first = line.find_first_not_of(" \t");
    if (first == std::string_view::npos || line[first] != '#') out += line;
    k = end;
  }
  return out;
}

// The control characters an input holds where it carries data: raw, and spelt as the format
// decodes them — XML character references (outside comments, CDATA sections and PIs, where
// they are text) and JSON \u escapes.
controls controls_in_input(std::string_view whole, std::string_view format) {
  const std::string data = data_of(whole, format);
  const std::string_view in = data;
  controls seen;
  for (char c : in)
    note_control(seen, static_cast<unsigned char>(c));
  for (std::size_t k = 0; k < in.size(); ++k) {
    if (format == "json" && in[k] == '\\' && k + 1 < in.size()) {
      bool ok = false;
      if (in[k + 1] == 'u' && k + 6 <= in.size()) {
        const std::uint32_t v = hex_value(in.substr(k + 2, 4), ok);
        if (ok) note_control(seen, v);
      }
      ++k;  // the escaped character is not the start of another escape
    } else if (format == "ttml" && in[k] == '<') {
      for (auto [open, close] : {std::pair{"<!--", "-->"}, {"<![CDATA[", "]]>"}, {"<?", "?>"}})
        if (in.substr(k, std::string_view(open).size()) == open) {
          const std::size_t end = in.find(close, k + 2);
          k = end == std::string_view::npos ? in.size() : end;
          break;
        }
    } else if (format == "ttml" && in.substr(k, 2) == "&#") {
      const std::size_t semi = in.find(';', k);
      if (semi == std::string_view::npos || semi - k > 14) continue;
      const std::string_view body = in.substr(k + 2, semi - k - 2);
      bool ok = !body.empty();
      std::uint32_t v = 0;
      if (ok && body[0] == 'x') {
        v = hex_value(body.substr(1), ok);
      } else {
        for (char d : body) {
          ok = ok && d >= '0' && d <= '9' && v < 100000000;
          if (ok) v = v * 10 + static_cast<std::uint32_t>(d - '0');
        }
      }
      if (ok) note_control(seen, v);
    }
  }
  return seen;
}

controls controls_in_document(const tiers::document& doc) {
  controls seen;
  tiers::detail::visit_strings(doc, [&](std::string_view s) {
    for (char c : s)
      note_control(seen, static_cast<unsigned char>(c));
  });
  return seen;
}

// Markup without a tag only spells the text's characters (a character reference where the
// file had the character, or the other way round): writers spell text as the standard asks,
// so a file that spelt it otherwise reads back with other markup, and nothing is lost.
void drop_spelling_only_markup(tiers::document& doc) {
  for (tiers::tier& t : doc.tiers)
    for (tiers::annotation& a : t.annotations)
      if (a.markup && a.markup->find('<') == std::string::npos) a.markup.reset();
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string_view in(reinterpret_cast<const char*>(data), size);
  const tiers::format& fmt = *tiers::find_format(TIERS_FUZZ_FORMAT);
  tiers::read_options options;
  options.positions = true;
  options.tier_name = "fuzz";
  options.rate = tiers::rational{25, 1};
  const tiers::read_result r = tiers::read_document(in, fmt, options, "fuzz");
  for (const tiers::diagnostic& d : r.diagnostics)
    if (d.code.empty() || d.message.empty() || (d.offset != tiers::no_offset && d.line == 0))
      __builtin_trap();  // every problem says what and where
  // Streaming gives the bytes that reading the document and writing it give, refuses what
  // reading refuses, or says that it cannot stream.
  for (const tiers::format& to : tiers::formats()) {
    if (!tiers::streams_losslessly(fmt, to)) continue;
    std::string streamed, whole;
    tiers::stream_result s;
    {
      tiers::string_sink sink(streamed);
      const std::unique_ptr<tiers::document_handler> writer = to.stream_writer(sink);
      s = tiers::stream_document(in, fmt, options, *writer, "fuzz");
    }
    if (s.status == tiers::stream_status::not_streamed) continue;
    if (s.ok() != r.ok()) __builtin_trap();
    if (!r.ok()) continue;
    {
      tiers::string_sink sink(whole);
      to.write(r.value, sink, {});
    }
    if (streamed != whole) __builtin_trap();
  }
  if (!r.ok()) return 0;
  // A control character the input holds is in the document, or a diagnostic says what became
  // of it: an `&#0;` that cut a text short without a word fails here.
  if ((controls_in_input(in, fmt.name) & ~controls_in_document(r.value)).any() &&
      r.diagnostics.empty())
    __builtin_trap();
  // Every writer writes UTF-8; what a format carries whole, it reads back without an error.
  for (const tiers::format& to : tiers::formats()) {
    std::string out;
    {
      tiers::string_sink sink(out);
      to.write(r.value, sink, {});
    }
    if (tiers::detail::find_invalid_utf8(out) != std::string_view::npos) __builtin_trap();
    if (!tiers::find_losses(r.value, to).empty()) continue;
    tiers::read_options plain;
    plain.tier_name = "fuzz";
    plain.rate = options.rate;
    if (!tiers::read_document(out, to, plain, "written").ok()) __builtin_trap();
  }
  if (!tiers::find_losses(r.value, fmt).empty()) return 0;  // said, not silent
  std::string written;
  {
    tiers::string_sink out(written);
    fmt.write(r.value, out, {});
  }
  tiers::read_options again = options;
  again.positions = false;
  tiers::read_result back = tiers::read_document(written, fmt, again, "written");
  if (!back.ok()) __builtin_trap();
  tiers::document first = r.value;
  drop_spelling_only_markup(first);
  drop_spelling_only_markup(back.value);
  if (!(back.value == first)) __builtin_trap();  // a round trip that changed it
  return 0;
}
