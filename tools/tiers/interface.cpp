#include "interface.hpp"

#include <string_view>

#include "tiers/format.hpp"
#include "tiers/profile.hpp"

namespace tiers::cli {

namespace {

// CLI11 writes a checked option's value name as "FORMAT:{text,json,sarif}" (the name, then each
// validator's description after a colon); an IsMember check describes itself in braces.
void split_value_name(const std::string& full, option_spec& o) {
  // The name itself may hold a colon in brackets: TIER|FILE[:TIER].
  std::size_t colon = 0;
  for (int depth = 0; colon < full.size(); ++colon) {
    if (full[colon] == '[') ++depth;
    if (full[colon] == ']') --depth;
    if (full[colon] == ':' && depth == 0) break;
  }
  o.value = full.substr(0, colon);
  for (std::size_t open = full.find(":{"); open != std::string::npos;
       open = full.find(":{", open + 1)) {
    const std::size_t close = full.find('}', open);
    if (close == std::string::npos) break;
    std::string_view list(full.data() + open + 2, close - open - 2);
    while (!list.empty()) {
      const std::size_t comma = list.find(',');
      o.choices.emplace_back(list.substr(0, comma));
      list = comma == std::string_view::npos ? std::string_view{} : list.substr(comma + 1);
    }
  }
}

// A value that may name a file: FILE, PATH, PAGE, SHEET.csv, "TIER|FILE[:TIER]", and PROFILE
// (a built-in name or a JSON file).
bool names_a_file(std::string_view value) {
  for (std::string_view file_like : {"FILE", "PATH", "PAGE", "SHEET", "PROFILE", "PLAN", "SIGNAL"})
    if (value.find(file_like) != std::string_view::npos) return true;
  return false;
}

option_spec option_of(const CLI::Option& opt) {
  option_spec o;
  for (const std::string& n : opt.get_lnames())
    o.longs.push_back("--" + n);
  for (const std::string& n : opt.get_snames())
    o.shorts.push_back("-" + n);
  o.positional = o.longs.empty() && o.shorts.empty();
  if (opt.get_expected_max() != 0 || o.positional) split_value_name(opt.get_type_name(), o);
  if (o.positional && o.value.empty()) o.value = opt.get_name();
  if (o.choices.empty()) o.choices = known_values(o.value);
  if (o.value.empty())
    o.kind = value_kind::none;
  else if (o.value == "DIR")
    o.kind = value_kind::folder;
  else if (names_a_file(o.value))
    o.kind = value_kind::file;
  else
    o.kind = value_kind::other;
  o.repeatable = opt.get_expected_max() > 1;
  o.required = opt.get_required();
  o.help = opt.get_description();
  o.default_value = opt.get_default_str();
  return o;
}

command_spec command_of(const CLI::App& app) {
  command_spec c{app.get_name(), app.get_description(), {}};
  // --help and --version first, then the options as defined (which is --help's order).
  for (const CLI::Option* opt : app.get_options())
    c.options.push_back(option_of(*opt));
  return c;
}

}  // namespace

std::vector<std::string> option_spec::names() const {
  std::vector<std::string> all = shorts;
  all.insert(all.end(), longs.begin(), longs.end());
  return all;
}

std::vector<std::string> known_values(const std::string& value_name) {
  std::vector<std::string> words;
  if (value_name == "FORMAT" || value_name == "F") {
    for (const format& f : formats())
      words.emplace_back(f.name);
  } else if (value_name == "PROFILE") {
    for (std::string_view p : builtin_profiles())
      words.emplace_back(p);
  }
  return words;
}

interface_spec describe(const CLI::App& app) {
  interface_spec spec{command_of(app), {}};
  for (const CLI::App* sub : app.get_subcommands([](const CLI::App*) { return true; }))
    spec.commands.push_back(command_of(*sub));
  return spec;
}

}  // namespace tiers::cli
