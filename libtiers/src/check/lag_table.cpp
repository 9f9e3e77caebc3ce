// The lag table: every caption cue's lag behind its words, for drift studies.
#include "detail/json_text.hpp"
#include "tiers/check.hpp"

namespace tiers {
namespace {

void csv_seconds(byte_sink& out, const std::optional<time_ns>& t) {
  if (t) out.write(format_seconds(*t));
}

}  // namespace

void write_lag_table_csv(const std::vector<lag_rows>& files, byte_sink& out) {
  out.write("file,cue,id,start,end,word_start,lag,words,matched\r\n");
  for (const lag_rows& f : files)
    for (const lag_report::cue& c : f.cues) {
      write_csv_field(out, f.file);
      out.put(',');
      out.write(std::to_string(c.position));
      out.put(',');
      if (c.id) write_csv_field(out, *c.id);
      out.put(',');
      csv_seconds(out, c.start);
      out.put(',');
      csv_seconds(out, c.end);
      out.put(',');
      csv_seconds(out, c.word_start);
      out.put(',');
      csv_seconds(out, c.lag);
      out.put(',');
      out.write(std::to_string(c.words));
      out.put(',');
      out.write(std::to_string(c.matched));
      out.write("\r\n");
    }
}

void write_lag_table_json(const std::vector<lag_rows>& files, byte_sink& out) {
  detail::json_writer j(out);
  j.begin_object(true);
  j.string("format", "tiers-lag-table");
  j.count("version", 1);
  j.key("cues").begin_array(true);
  for (const lag_rows& f : files)
    for (const lag_report::cue& c : f.cues) {
      j.begin_object();
      j.string("file", f.file);
      j.count("cue", c.position);
      if (c.id)
        j.string("id", *c.id);
      else
        j.key("id").null();
      j.seconds("start", c.start);
      j.seconds("end", c.end);
      j.maybe_seconds("word_start", c.word_start);
      j.maybe_seconds("lag", c.lag);
      j.count("words", c.words);
      j.count("matched", c.matched);
      j.end_object();
    }
  j.end_array();
  j.end_object();
  out.put('\n');
}

}  // namespace tiers
