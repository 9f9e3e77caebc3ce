// Diagnostics: the FILE:LINE:COLUMN form and locating byte offsets.
#include <catch2/catch.hpp>

#include "tiers/diagnostic.hpp"

using namespace tiers;

TEST_CASE("diagnostics print as FILE:LINE:COLUMN: severity: message [code]", "[diagnostic]") {
  diagnostic d;
  d.file = "a.csv";
  d.line = 3;
  d.column = 7;
  d.code = "csv.quote";
  d.message = "quoted field is not closed";
  CHECK(format_diagnostic(d) == "a.csv:3:7: error: quoted field is not closed [csv.quote]");
  d.column = 0;
  d.level = severity::warning;
  CHECK(format_diagnostic(d) == "a.csv:3: warning: quoted field is not closed [csv.quote]");
  d.line = 0;
  d.file.clear();
  d.code.clear();
  CHECK(format_diagnostic(d) == "warning: quoted field is not closed");
}

TEST_CASE("offsets become lines and code-point columns, with LF, CR and CRLF ending lines",
          "[diagnostic]") {
  const std::string_view text = "ab\ncd\r\nef\rgh\xC3\xA9z";
  CHECK(locate(text, 0).line == 1);
  CHECK(locate(text, 1).column == 2);
  CHECK(locate(text, 3).line == 2);
  CHECK(locate(text, 5).column == 3);  // the CR of CRLF is still on line 2
  CHECK(locate(text, 7).line == 3);
  CHECK(locate(text, 10).line == 4);
  CHECK(locate(text, 14).column == 4);  // after g, h and the two-byte é
  CHECK(locate(text, 999).line == 4);   // past the end: the end

  std::vector<diagnostic> ds(3);
  ds[0].offset = 10;
  ds[1].offset = 3;
  ds[2].offset = no_offset;
  locate_all(text, ds);
  CHECK(ds[0].line == 4);
  CHECK(ds[1].line == 2);
  CHECK(ds[2].line == 0);
}

TEST_CASE("control characters in messages are shown escaped, one line each", "[diagnostic]") {
  diagnostic d;
  d.file = "a.tiers";
  d.line = 3;
  d.column = 1;
  d.code = "tiers.syntax";
  d.message = "time '1\r2\n\x1b[31m' is not a time";
  CHECK(format_diagnostic(d) ==
        "a.tiers:3:1: error: time '1\\r2\\n\\x1b[31m' is not a time [tiers.syntax]");
}

TEST_CASE("text for people shows control characters escaped", "[diagnostic]") {
  // ECMA-48: ESC (0x1B) and CSI (U+009B) open control sequences; BEL (0x07) ends an OSC.
  CHECK(escape_controls("\x1b]0;title\x07") == "\\x1b]0;title\\x07");
  CHECK(escape_controls("a\nb\tc\x7f") == "a\\nb\\tc\\x7f");
  CHECK(escape_controls("a\nb", true) == "a\nb");
  CHECK(escape_controls("\xc2\x9b"
                        "2J caf\xc3\xa9") == "\\u009b2J caf\xc3\xa9");
  diagnostic d;
  d.file = "ep\x1b[2J.vtt";
  d.message = "x";
  CHECK(format_diagnostic(d) == "ep\\x1b[2J.vtt: error: x");
}
