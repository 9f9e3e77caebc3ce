// The review page: one self-contained HTML file; review.js builds the player, the verdict
// buttons and the clip list from the sheet's rows written here as data.
#include <fmt/format.h>

#include "detail/embedded.hpp"
#include "detail/json_text.hpp"
#include "detail/markup.hpp"
#include "detail/script_data.hpp"
#include "tiers/review.hpp"
#include "tiers/version.hpp"

namespace tiers {
namespace {

std::string_view asset(std::string_view name) {
  return detail::embedded_text(detail::review_asset_table(), name);
}

std::string html(std::string_view text) {
  return detail::escaped(text);
}

// The rows as the sheet holds them (every field a string, as written), so that the page saves
// back exactly the sheet it was made with, its verdicts and notes filled in.
std::string page_data(const std::vector<sample_row>& rows, const review_page_options& o) {
  std::string sheet;
  {
    string_sink sink(sheet);
    write_review_sheet(rows, sink);
  }
  std::string data;
  string_sink out(data);
  detail::json_writer j(out);
  j.begin_object(true);
  j.string("key", o.key);
  j.string("title", o.title);
  j.string("save_as", o.save_as);
  j.string("sheet", sheet);
  j.key("media").begin_array(true);
  for (const sample_row& r : rows)
    j.string(r.media);
  j.end_array();
  j.end_object();
  return data;
}

}  // namespace

void write_review_page(const std::vector<sample_row>& rows, const review_page_options& o,
                       byte_sink& out) {
  out.write(
      fmt::format("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n"
                  "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n"
                  "<meta name=\"generator\" content=\"tiers {}\">\n<title>{}</title>\n<style>\n",
                  html(version()), html(o.title)));
  out.write(asset("review.css"));
  out.write(fmt::format(
      R"h(</style>
</head>
<body>
<header>
<h1>{}</h1>
<p class="meta">{} clips · tiers {}</p>
<div class="progress" aria-live="polite"><div class="bar"><span></span></div><p></p></div>
</header>
<main>
<section class="clip" aria-label="The clip under review">
<div class="player"><video controls preload="metadata"></video><p class="media-status" role="status"></p></div>
<div class="about">
<p class="position"></p>
<dl></dl>
<div class="verdicts" role="group" aria-label="Verdict">
<button type="button" data-verdict="yes" title="The annotation is right (y)"><kbd>y</kbd> Yes</button>
<button type="button" data-verdict="no" title="The annotation is wrong (n)"><kbd>n</kbd> No</button>
<button type="button" data-verdict="unsure" title="Cannot tell (u)"><kbd>u</kbd> Unsure</button>
</div>
<label class="note">Note <textarea rows="2"></textarea></label>
<div class="moves">
<button type="button" data-move="previous" title="The clip before (k or ←)">← Previous</button>
<button type="button" data-move="play" title="Play the clip again (space or r)">Play again</button>
<button type="button" data-move="next" title="The next clip not judged (j or →)">Next →</button>
<button type="button" data-move="save" title="Save the sheet with the verdicts (s)">Save sheet (CSV)</button>
</div>
<p class="help">Keys: <kbd>y</kbd> yes, <kbd>n</kbd> no, <kbd>u</kbd> unsure, <kbd>e</kbd> note,
<kbd>j</kbd>/<kbd>→</kbd> next, <kbd>k</kbd>/<kbd>←</kbd> previous, <kbd>space</kbd> play again,
<kbd>s</kbd> save. Verdicts are kept in this browser until the sheet is saved.</p>
</div>
</section>
<section class="list" aria-label="Every clip">
<table><thead><tr><th>#</th><th>Label</th><th>Confidence</th><th>Stratum</th><th>File</th><th>Time</th><th>Verdict</th></tr></thead><tbody></tbody></table>
</section>
</main>
<script type="application/json" id="review-data">
)h",
      html(o.title), rows.size(), html(version())));
  detail::write_script_data(out, page_data(rows, o));
  out.write("\n</script>\n<script>\n");
  out.write(asset("review.js"));
  out.write("</script>\n</body>\n</html>\n");
}

}  // namespace tiers
