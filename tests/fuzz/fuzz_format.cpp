// Fuzz target for one format's reader (TIERS_FUZZ_FORMAT): never a crash, every diagnostic
// located and worded; and what the reader accepts and the format can carry whole, its writer
// writes and its reader reads back to the same document (but for how references are spelt).
#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>

#include "tiers/tiers.hpp"

namespace {

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
  if (!r.ok()) return 0;
  if (!tiers::find_losses(r.doc, fmt).empty()) return 0;  // said, not silent
  std::string written;
  {
    tiers::string_sink out(written);
    fmt.write(r.doc, out, {});
  }
  tiers::read_options again = options;
  again.positions = false;
  tiers::read_result back = tiers::read_document(written, fmt, again, "written");
  if (!back.ok()) __builtin_trap();
  tiers::document first = r.doc;
  drop_spelling_only_markup(first);
  drop_spelling_only_markup(back.doc);
  if (!(back.doc == first)) __builtin_trap();  // a round trip that changed it
  return 0;
}
