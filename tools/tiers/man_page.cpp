#include "man_page.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <set>
#include <string_view>

#include "tiers/version.hpp"

namespace tiers::cli {

namespace {

// Calls `f` with each line of `text` (without its newline).
template <class F>
void for_each_line(std::string_view text, F&& f) {
  std::size_t start = 0;
  while (start < text.size()) {
    std::size_t end = text.find('\n', start);
    if (end == std::string_view::npos) end = text.size();
    f(text.substr(start, end - start));
    start = end + 1;
  }
}

// One code point of UTF-8 text from `i`, which moves past it; a stray byte stands for itself.
char32_t next_code_point(std::string_view s, std::size_t& i) {
  const auto b = static_cast<unsigned char>(s[i]);
  const int extra = b >= 0xF0 ? 3 : b >= 0xE0 ? 2 : b >= 0xC0 ? 1 : 0;
  if (extra == 0 || i + static_cast<std::size_t>(extra) >= s.size()) {
    ++i;
    return b;
  }
  char32_t cp = b & (0x3F >> extra);
  for (int k = 1; k <= extra; ++k)
    cp = (cp << 6) | (static_cast<unsigned char>(s[i + static_cast<std::size_t>(k)]) & 0x3F);
  i += static_cast<std::size_t>(extra) + 1;
  return cp;
}

// Text as it must be written in man(7): backslashes escaped, characters beyond ASCII named by
// their code point (so that the page is ASCII and renders anywhere), and in code, dashes as
// minus signs (what a reader types).
std::string escaped(std::string_view s, bool code) {
  std::string out;
  for (std::size_t i = 0; i < s.size();) {
    const char32_t cp = next_code_point(s, i);
    if (cp == '\\')
      out += "\\e";
    else if (cp == '-' && code)
      out += "\\-";
    else if (cp < 0x80)
      out += static_cast<char>(cp);
    else
      out += fmt::format("\\[u{:04X}]", static_cast<std::uint32_t>(cp));
  }
  return out;
}

// Lines of at most 80 bytes where a space allows (mandoc's lint asks for it; in fill mode a
// line break is a space), none starting with a dot or an apostrophe, which would be read as a
// request.
std::string guarded_lines(const std::string& text) {
  std::string out;
  for_each_line(text, [&](std::string_view line) {
    while (!line.empty()) {
      while (!line.empty() && (line.back() == ' ' || line.back() == '\t'))
        line.remove_suffix(1);
      std::size_t cut = line.size();
      if (line.size() > 80) {
        cut = line.rfind(' ', 80);
        if (cut == std::string_view::npos || cut == 0) cut = line.find(' ', 80);
        if (cut == std::string_view::npos) cut = line.size();
      }
      const std::string_view piece = line.substr(0, cut);
      if (!piece.empty() && (piece[0] == '.' || piece[0] == '\'')) out += "\\&";
      out += piece;
      out += '\n';
      line.remove_prefix(cut);
      while (!line.empty() && line.front() == ' ')
        line.remove_prefix(1);
    }
  });
  return out;
}

struct block {
  enum { paragraph, bullet } kind;
  std::string text;
};

// The prose of a stretch of Markdown: paragraphs and bullets, without fenced blocks, tables
// and headings.
std::vector<block> prose_of(std::string_view md) {
  std::vector<block> blocks;
  bool fenced = false, open = false;
  for_each_line(md, [&](std::string_view line) {
    if (line.starts_with("```")) {
      fenced = !fenced;
      open = false;
      return;
    }
    const bool blank = line.find_first_not_of(' ') == std::string_view::npos;
    if (fenced || blank || line.starts_with("|") || line.starts_with("#")) {
      open = false;
      return;
    }
    if (line.starts_with("- ")) {
      blocks.push_back({block::bullet, std::string(line.substr(2))});
      open = true;
    } else if (open) {
      blocks.back().text += "\n" + std::string(line.substr(line.find_first_not_of(' ')));
    } else {
      blocks.push_back({block::paragraph, std::string(line)});
      open = true;
    }
  });
  return blocks;
}

// Blocks that open a section: a paragraph right after .SH needs no .PP (and mandoc says so).
std::string roff_of_blocks(const std::vector<block>& blocks) {
  std::string out;
  for (const block& b : blocks) {
    if (b.kind == block::bullet)
      out += ".IP \\(bu 2\n";
    else if (!out.empty())
      out += ".PP\n";
    out += roff_of_markdown(b.text);
  }
  return out;
}

// The section of docs/cli.md whose heading is "## `tiers COMMAND …" (or "## TITLE"), up to the
// next heading of its level.
std::string_view section_of(std::string_view md, std::string_view heading) {
  std::size_t at = md.find("\n## " + std::string(heading));
  if (at == std::string_view::npos) return {};
  at = md.find('\n', at + 1);
  const std::size_t end = md.find("\n## ", at);
  return md.substr(at + 1, (end == std::string_view::npos ? md.size() : end) - at - 1);
}

std::string option_names(const option_spec& o) {
  std::string out;
  for (const std::string& n : o.names())
    out += (out.empty() ? "" : ", ") + fmt::format("\\fB{}\\fR", escaped(n, true));
  return out;
}

std::string value_of(const option_spec& o) {
  return o.value.empty() ? "" : fmt::format(" \\fI{}\\fR", escaped(o.value, false));
}

std::string synopsis(const command_spec& c) {
  std::string out = fmt::format(".SH SYNOPSIS\n.B tiers {}\n[\\fIOPTIONS\\fR]", c.name);
  for (const option_spec& o : c.options) {
    if (o.required && !o.positional)
      out += fmt::format(" \\fB{}\\fR{}",
                         escaped(o.longs.empty() ? o.shorts.front() : o.longs.front(), true),
                         value_of(o));
    if (o.positional) {
      const std::string arg =
          fmt::format("\\fI{}\\fR{}", escaped(o.value, false), o.repeatable ? " ..." : "");
      out += o.required ? " " + arg : " [" + arg + "]";
    }
  }
  return out + "\n";
}

std::string options_section(const command_spec& c) {
  std::string out = ".SH OPTIONS\n";
  for (const option_spec& o : c.options) {
    out += ".TP\n";
    out += o.positional
               ? fmt::format("\\fI{}\\fR{}\n", escaped(o.value, false), o.repeatable ? " ..." : "")
               : option_names(o) + value_of(o) + "\n";
    std::string help = o.help;
    if (!help.empty() && help.back() != '.') help += ".";
    // The choices, unless the help names them all already.
    const bool named = std::all_of(o.choices.begin(), o.choices.end(), [&](const std::string& w) {
      return help.find(w) != std::string::npos;
    });
    if (!named) help += " One of: " + fmt::format("`{}`", fmt::join(o.choices, "`, `")) + ".";
    if (!o.default_value.empty()) help += " Default: `" + o.default_value + "`.";
    if (o.repeatable && !o.positional) help += " May be given more than once.";
    if (o.required) help += " Required.";
    out += roff_of_markdown(help);
  }
  return out;
}

std::string exit_status() {
  return ".SH EXIT STATUS\n.TP\n.B 0\nSuccess.\n.TP\n.B 1\n" +
         guarded_lines(
             "The input was rejected, would lose data, or (\\fBcheck\\fR, "
             "\\fBdataset\\fR) problems of error severity were found; every reason is "
             "printed, located, on standard error.") +
         ".TP\n.B 2\n" +
         guarded_lines(
             "A usage error: an unknown option or format, a missing argument, a bad "
             "option value.");
}

std::string title(const std::string& name, const std::string& date) {
  std::string upper = name;
  std::transform(upper.begin(), upper.end(), upper.begin(),
                 [](char ch) { return ch >= 'a' && ch <= 'z' ? static_cast<char>(ch - 32) : ch; });
  return fmt::format(".TH {} 1 {} \"tiers {}\" \"User Commands\"\n", upper, date, tiers::version());
}

std::string lower_first(std::string text) {
  if (!text.empty() && text[0] >= 'A' && text[0] <= 'Z' &&
      (text.size() < 2 || !(text[1] >= 'A' && text[1] <= 'Z')))
    text[0] = static_cast<char>(text[0] + 32);
  return text;
}

// An example as a page shows it: a line too long for the page loses its trailing comment, and
// is then cut as a shell continues a line (a backslash, four spaces), so that it still reads
// as one command. Empty for a job script's line, which needs its variables.
std::string fitted(const std::string& example) {
  if (example.find("${") != std::string::npos) return {};
  std::string out;
  for_each_line(example, [&](std::string_view line) {
    if (line.size() > 78 && line.find("  #") != std::string_view::npos)
      line = line.substr(0, line.find_last_not_of(' ', line.find("  #")) + 1);
    while (line.size() > 78) {
      const std::size_t cut = line.rfind(' ', 74);
      if (cut == std::string_view::npos || cut < 8) break;
      out += std::string(line.substr(0, cut)) + " \\\n    ";
      line.remove_prefix(cut + 1);
    }
    out += std::string(line) + "\n";
  });
  return out;
}

std::string examples_section(const command_spec& c, const manual_sources& docs) {
  std::vector<std::string> all;
  auto add = [&](std::vector<std::string> found) {
    for (const std::string& e : found)
      if (std::string f = fitted(e);
          !f.empty() && std::find(all.begin(), all.end(), f) == all.end())
        all.push_back(std::move(f));
  };
  add(examples_of(docs.cli_md, c.name));
  for (const std::string& page : docs.other_pages)
    add(examples_of(page, c.name));
  if (all.empty()) return {};
  if (all.size() > 6) all.resize(6);
  std::string out = ".SH EXAMPLES\n";
  for (const std::string& e : all)
    out +=
        (&e == &all.front() ? ".EX\n" : ".PP\n.EX\n") + guarded_lines(escaped(e, false)) + ".EE\n";
  return out;
}

std::string see_also(const std::string& self, std::string_view text, const interface_spec& spec) {
  std::set<std::string> pages;
  if (self != "tiers") pages.insert("tiers");
  for (const command_spec& c : spec.commands)
    if (c.name != self && text.find("tiers " + c.name) != std::string_view::npos)
      pages.insert("tiers-" + c.name);
  std::string out = ".SH SEE ALSO\n";
  std::size_t k = 0;
  for (const std::string& p : pages)
    out += fmt::format(".BR {} (1){}\n", escaped(p, true), ++k < pages.size() ? "," : "");
  return out;
}

man_page command_page(const command_spec& c, const interface_spec& spec, const manual_sources& docs,
                      const std::string& date) {
  const std::string name = "tiers-" + c.name;
  const std::string_view section = section_of(docs.cli_md, "`tiers " + c.name + " ");
  std::string page = title(name, date);
  page += ".SH NAME\n" + guarded_lines(fmt::format("{} \\- {}", escaped(name, true),
                                                   escaped(lower_first(c.help), false)));
  page += synopsis(c);
  page += ".SH DESCRIPTION\n";
  const std::vector<block> prose = prose_of(section);
  page += prose.empty() ? roff_of_markdown(c.help + ".") : roff_of_blocks(prose);
  page += options_section(c);
  page += exit_status();
  page += examples_section(c, docs);
  page += see_also(c.name, section, spec);
  return {name, page};
}

man_page program_page(const interface_spec& spec, const manual_sources& docs,
                      const std::string& date) {
  std::string page = title("tiers", date);
  page +=
      ".SH NAME\n" + guarded_lines("tiers \\- " + escaped(lower_first(spec.program.help), false));
  page +=
      ".SH SYNOPSIS\n.B tiers\n\\fICOMMAND\\fR [\\fIOPTIONS\\fR] [\\fIARGUMENTS\\fR]\n"
      ".br\n.B tiers \\-\\-version\n";
  page += ".SH DESCRIPTION\n" + roff_of_markdown(spec.program.help + ".") + ".PP\n" +
          guarded_lines(
              "Each command has its manual page, \\fBtiers\\-\\fR\\fICOMMAND\\fR(1), "
              "and \\fBtiers \\fR\\fICOMMAND\\fR \\fB\\-\\-help\\fR lists its options.");
  page += ".SH COMMANDS\n";
  for (const command_spec& c : spec.commands)
    page += fmt::format(".TP\n.BR tiers\\-{} (1)\n", escaped(c.name, true)) +
            roff_of_markdown(c.help + ".");
  page += options_section(spec.program);
  page += ".SH CONVENTIONS\n" + roff_of_blocks(prose_of(section_of(docs.cli_md, "Conventions")));
  page += exit_status();
  std::string text;
  for (const command_spec& c : spec.commands)
    text += "tiers " + c.name + "\n";
  page += see_also("tiers", text, spec);
  return {"tiers", page};
}

}  // namespace

namespace {

std::string inline_roff(const std::string& text) {
  std::string out;
  for (std::size_t i = 0; i < text.size();) {
    if (text[i] == '`') {
      const std::size_t close = text.find('`', i + 1);
      if (close != std::string::npos) {
        out += "\\fB" + escaped(std::string_view(text).substr(i + 1, close - i - 1), true) + "\\fR";
        i = close + 1;
        continue;
      }
    }
    if (text.compare(i, 2, "**") == 0) {
      const std::size_t close = text.find("**", i + 2);
      if (close != std::string::npos) {
        out += "\\fB" + inline_roff(text.substr(i + 2, close - i - 2)) + "\\fR";
        i = close + 2;
        continue;
      }
    }
    if (text[i] == '[') {
      const std::size_t middle = text.find("](", i);
      const std::size_t close = middle == std::string::npos ? middle : text.find(')', middle);
      if (close != std::string::npos && text.find('\n', i) > middle) {
        out += inline_roff(text.substr(i + 1, middle - i - 1));
        i = close + 1;
        continue;
      }
    }
    const std::size_t next = text.find_first_of("`*[", i + 1);
    out += escaped(
        std::string_view(text).substr(i, (next == std::string::npos ? text.size() : next) - i),
        false);
    i = next == std::string::npos ? text.size() : next;
  }
  return out;
}

}  // namespace

std::string roff_of_markdown(const std::string& text) {
  return guarded_lines(inline_roff(text));
}

std::vector<std::string> examples_of(const std::string& markdown, const std::string& command) {
  std::vector<std::string> found;
  bool fenced = false;
  std::string current;
  for_each_line(markdown, [&](std::string_view line) {
    if (line.starts_with("```")) {
      fenced = !fenced;
      return;
    }
    if (!fenced) return;
    if (!current.empty()) {
      current += "\n" + std::string(line);
    } else {
      if (line.starts_with("$ ")) line.remove_prefix(2);
      const std::string head = "tiers " + command;
      if (!line.starts_with(head) || (line.size() > head.size() && line[head.size()] != ' '))
        return;
      current = std::string(line);
    }
    if (current.back() != '\\') {
      if (std::find(found.begin(), found.end(), current) == found.end()) found.push_back(current);
      current.clear();
    }
  });
  return found;
}

std::vector<man_page> manual_pages(const interface_spec& spec, const manual_sources& docs,
                                   const std::string& date) {
  std::vector<man_page> pages{program_page(spec, docs, date)};
  for (const command_spec& c : spec.commands)
    pages.push_back(command_page(c, spec, docs, date));
  return pages;
}

}  // namespace tiers::cli
