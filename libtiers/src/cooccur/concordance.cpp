// The concordance of a co-occurrence table: every co-occurrence of its pairs, with context and
// a link into the media, for a reviewer to read and open.
#include <set>
#include <string_view>

#include "spans.hpp"
#include "tiers/cooccur.hpp"
#include "tiers/text.hpp"

namespace tiers {
namespace {

// W3C Media Fragments URI 1.0, temporal dimension in NPT seconds: `#t=start,end`, joined with
// `&` to a fragment the URI has already.
std::string media_link(const std::string& media, time_ns start, time_ns end) {
  if (media.empty()) return "";
  const std::string t = "t=" + format_seconds(std::max<time_ns>(0, start)) + "," +
                        format_seconds(std::max<time_ns>(0, end));
  return media + (media.find('#') == std::string::npos ? "#" : "&") + t;
}

// The texts of annotations [from, to) of `order`, joined by spaces.
std::string joined(const tier& t, const std::vector<std::size_t>& order, std::size_t from,
                   std::size_t to) {
  std::string out;
  for (std::size_t k = from; k < to; ++k)
    out += (out.empty() ? "" : " ") + t.annotations[order[k]].text;
  return out;
}

}  // namespace

void write_concordance_csv(const std::vector<pair_statistics>& table,
                           const std::vector<cooccur_recording>& recordings, std::size_t context,
                           byte_sink& out) {
  std::set<std::pair<std::string_view, std::string_view>> shown;
  for (const pair_statistics& s : table)
    shown.emplace(s.a, s.b);
  out.write("file,a,a_start,a_end,a_text,b,b_start,b_end,before,after,link\r\n");
  for (const cooccur_recording& r : recordings) {
    const cooccur_options& o = r.options;
    auto fold = [&](const std::string& s) { return o.fold_case ? fold_case(s) : s; };
    // A in start order, for the context; labels as counted.
    std::vector<std::size_t> order;
    for (std::size_t k = 0; k < r.a->annotations.size(); ++k)
      if (r.a->annotations[k].end >= r.a->annotations[k].start) order.push_back(k);
    std::stable_sort(order.begin(), order.end(), [&](std::size_t x, std::size_t y) {
      return r.a->annotations[x].start < r.a->annotations[y].start;
    });
    std::vector<std::string> a_labels, b_labels;
    std::vector<detail::a_item> as;
    for (std::size_t k : order) {
      const annotation& x = r.a->annotations[k];
      as.push_back({x.start, x.end, static_cast<std::uint32_t>(a_labels.size())});
      a_labels.push_back(fold(x.text));
    }
    const std::vector<std::string> wanted = detail::counted_labels(o);
    std::vector<detail::b_span> bs =
        detail::b_spans(*r.b, o.window, [&](const std::string& text, std::uint32_t& id) {
          std::string l = fold(text);
          if (!wanted.empty() && !std::binary_search(wanted.begin(), wanted.end(), l)) return false;
          id = static_cast<std::uint32_t>(b_labels.size());
          b_labels.push_back(std::move(l));
          return true;
        });
    detail::each_related(as, bs, o.relation, [&](std::size_t k, const detail::b_span& s) {
      const std::string& al = a_labels[as[k].label];
      const std::string& bl = b_labels[s.label];
      if (!shown.count({al, bl})) return;
      const annotation& x = r.a->annotations[order[k]];
      const annotation& y = r.b->annotations[s.index];
      const std::string fields[] = {
          r.name,
          al,
          format_seconds(x.start),
          format_seconds(x.end),
          x.text,
          bl,
          format_seconds(y.start),
          format_seconds(y.end),
          joined(*r.a, order, k >= context ? k - context : 0, k),
          joined(*r.a, order, k + 1, std::min(order.size(), k + 1 + context)),
          media_link(r.media, std::min(x.start, y.start), std::max(x.end, y.end))};
      for (std::size_t f = 0; f < std::size(fields); ++f) {
        if (f > 0) out.put(',');
        write_csv_field(out, fields[f]);
      }
      out.write("\r\n");
    });
  }
}

}  // namespace tiers
