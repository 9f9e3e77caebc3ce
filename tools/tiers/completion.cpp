// `tiers completion bash|zsh|fish`. Each script holds the words it offers (commands, options,
// the values of enumerated options) as data, so completing needs no run of `tiers`.
#include "completion.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <memory>

#include "commands.hpp"
#include "table_output.hpp"
#include "tiers/version.hpp"

namespace tiers::cli {

namespace {

std::string joined(const std::vector<std::string>& words, const char* between = " ") {
  return fmt::format("{}", fmt::join(words, between));
}

const option_spec* positional_of(const command_spec& c) {
  for (const option_spec& o : c.options)
    if (o.positional) return &o;
  return nullptr;
}

std::vector<std::string> command_names(const interface_spec& spec) {
  std::vector<std::string> names;
  for (const command_spec& c : spec.commands)
    names.push_back(c.name);
  return names;
}

std::string header(const char* shell, const char* how) {
  return fmt::format(
      "# {} completion for tiers {}, written from its command line by `tiers completion {}`.\n"
      "# {}\n",
      shell, tiers::version(), shell, how);
}

// ---- bash ------------------------------------------------------------------------------------

// What to offer for a value of kind `o`, as lines of the bash function.
std::string bash_value(const option_spec& o) {
  std::string out;
  if (!o.choices.empty()) out += fmt::format("_tiers_words '{}' \"$cur\"; ", joined(o.choices));
  if (o.kind == value_kind::file) out += "_tiers_files \"$cur\"; ";
  if (o.kind == value_kind::folder) out += "_tiers_folders \"$cur\"; ";
  return out + "return";
}

std::string bash_command(const command_spec& c) {
  std::string out = fmt::format("    {})\n      case $prev in\n", c.name);
  std::vector<std::string> names;
  for (const option_spec& o : c.options) {
    if (o.positional) continue;
    for (const std::string& n : o.names())
      names.push_back(n);
    if (o.kind != value_kind::none)
      out += fmt::format("        {}) {} ;;\n", joined(o.names(), "|"), bash_value(o));
  }
  out += "      esac\n";
  const option_spec* p = positional_of(c);
  out += fmt::format("      if [[ $cur == -* ]]; then _tiers_words '{}' \"$cur\"; {}\n",
                     joined(names), p ? "else " + bash_value(*p) + "; fi" : "fi");
  return out + "      ;;\n";
}

// ---- zsh -------------------------------------------------------------------------------------

// Inside single quotes and an _arguments spec: quotes closed and reopened, brackets and colons
// escaped.
std::string zsh_text(const std::string& text) {
  std::string out;
  for (char ch : text) {
    if (ch == '\'')
      out += "'\\''";
    else if (ch == '[' || ch == ']' || ch == ':' || ch == '\\')
      out += std::string("\\") + ch;
    else
      out += ch;
  }
  return out;
}

std::string zsh_action(const option_spec& o) {
  const std::string message = zsh_text(o.value);
  if (o.kind == value_kind::file && !o.choices.empty())
    return fmt::format(":{}:{{_files; compadd -- {}}}", message, joined(o.choices));
  if (o.kind == value_kind::file) return ":" + message + ":_files";
  if (o.kind == value_kind::folder) return ":" + message + ":_files -/";
  if (!o.choices.empty()) return fmt::format(":{}:({})", message, joined(o.choices));
  return ":" + message + ": ";
}

std::string zsh_command(const command_spec& c) {
  std::string out = fmt::format("        {})\n          _arguments -s -S \\\n", c.name);
  for (const option_spec& o : c.options) {
    const std::string help = zsh_text(short_help(o.help));
    if (o.positional) {
      out += fmt::format("            '{}{}' \\\n", o.repeatable ? "*" : "", zsh_action(o));
      continue;
    }
    const std::vector<std::string> names = o.names();
    const std::string exclusive =
        names.size() > 1 && !o.repeatable ? "(" + joined(names) + ")" : "";
    for (const std::string& n : names) {
      const bool is_long = n.size() > 2;
      const char* takes = o.kind == value_kind::none ? "" : is_long ? "=" : "+";
      out += fmt::format("            '{}{}{}{}[{}]{}' \\\n", o.repeatable ? "*" : "", exclusive, n,
                         takes, help, o.kind == value_kind::none ? "" : zsh_action(o));
    }
  }
  return out + "            && return 0\n          ;;\n";
}

// ---- fish ------------------------------------------------------------------------------------

std::string fish_text(const std::string& text) {
  std::string out = "'";
  for (char ch : text) {
    if (ch == '\'' || ch == '\\') out += '\\';
    out += ch;
  }
  return out + "'";
}

std::string fish_value(const option_spec& o) {
  if (o.kind == value_kind::file)
    return o.choices.empty() ? " -r -F" : " -r -F -a " + fish_text(joined(o.choices));
  if (o.kind == value_kind::folder) return " -x -a '(__fish_complete_directories)'";
  if (!o.choices.empty()) return " -x -a " + fish_text(joined(o.choices));
  return o.kind == value_kind::none ? "" : " -x";
}

// One option's line; `when` is the condition under which fish offers it.
std::string fish_option(const std::string& when, const option_spec& o) {
  std::string line = "complete -c tiers -n " + when;
  if (o.positional) return line + fish_value(o) + "\n";
  for (const std::string& s : o.shorts)
    line += " -s " + s.substr(1);
  for (const std::string& l : o.longs)
    line += " -l " + l.substr(2);
  return line + fish_value(o) + " -d " + fish_text(short_help(o.help)) + "\n";
}

std::string fish_command(const command_spec& c) {
  const std::string when = fish_text("__fish_seen_subcommand_from " + c.name);
  std::string out;
  for (const option_spec& o : c.options)
    out += fish_option(when, o);
  return out;
}

}  // namespace

std::string short_help(const std::string& help) {
  std::size_t end = help.size();
  for (const char* stop : {"; ", ": ", ". ", " ("})
    end = std::min(end, help.find(stop));
  std::string out = help.substr(0, end);
  if (out.size() > 72) out = out.substr(0, out.rfind(' ', 71)) + "…";
  return out;
}

std::string bash_completion(const interface_spec& spec) {
  std::string out = header("bash", "Load it with: source <(tiers completion bash)");
  out += R"(
_tiers_words() {
  local IFS=' '
  COMPREPLY+=($(compgen -W "$1" -- "$2"))
}
_tiers_files() {
  local IFS=$'\n'
  compopt -o filenames 2>/dev/null
  COMPREPLY+=($(compgen -f -- "$1"))
}
_tiers_folders() {
  local IFS=$'\n'
  compopt -o filenames 2>/dev/null
  COMPREPLY+=($(compgen -d -- "$1"))
}

_tiers() {
  COMPREPLY=()
  local cur=${COMP_WORDS[COMP_CWORD]} prev=
  ((COMP_CWORD > 0)) && prev=${COMP_WORDS[COMP_CWORD-1]}
  # bash splits --format=json at the '=': the option is then the word before it.
  if [[ $cur == = ]]; then cur=; elif [[ $prev == = ]] && ((COMP_CWORD > 1)); then prev=${COMP_WORDS[COMP_CWORD-2]}; fi
  local command= i
  for ((i = 1; i < COMP_CWORD; i++)); do
    case ${COMP_WORDS[i]} in -*) ;; *) command=${COMP_WORDS[i]}; break ;; esac
  done
  case $command in
)";
  std::vector<std::string> top;
  for (const option_spec& o : spec.program.options)
    for (const std::string& n : o.names())
      top.push_back(n);
  out += fmt::format(
      "    '')\n      if [[ $cur == -* ]]; then _tiers_words '{}' \"$cur\"; else _tiers_words "
      "'{}' \"$cur\"; fi\n      ;;\n",
      joined(top), joined(command_names(spec)));
  for (const command_spec& c : spec.commands)
    out += bash_command(c);
  return out + "  esac\n}\ncomplete -F _tiers tiers\n";
}

std::string zsh_completion(const interface_spec& spec) {
  std::string out =
      "#compdef tiers\n" + header("zsh",
                                  "Install it as _tiers in a folder of $fpath, or: source "
                                  "<(tiers completion zsh)");
  out +=
      "\n_tiers() {\n  local curcontext=$curcontext state line\n  local -a commands\n"
      "  commands=(\n";
  for (const command_spec& c : spec.commands)
    out += fmt::format("    '{}:{}'\n", c.name, zsh_text(short_help(c.help)));
  out += "  )\n  _arguments -C \\\n";
  for (const option_spec& o : spec.program.options)
    for (const std::string& n : o.names())
      out += fmt::format("    '(- *){}[{}]' \\\n", n, zsh_text(short_help(o.help)));
  out +=
      "    '1:command:->command' \\\n    '*::argument:->argument' && return 0\n"
      "  case $state in\n"
      "    command) _describe -t commands 'tiers command' commands ;;\n"
      "    argument)\n      case $line[1] in\n";
  for (const command_spec& c : spec.commands)
    out += zsh_command(c);
  return out +
         "      esac\n      ;;\n  esac\n}\n\nif [[ $zsh_eval_context[-1] == loadautofunc ]]; "
         "then\n  _tiers \"$@\"\nelse\n  compdef _tiers tiers\nfi\n";
}

std::string fish_completion(const interface_spec& spec) {
  std::string out = header("fish",
                           "Install it as tiers.fish in a folder of "
                           "$fish_complete_path, or: tiers completion fish | source");
  out += "\ncomplete -c tiers -f\n";
  for (const option_spec& o : spec.program.options)
    out += fish_option("__fish_use_subcommand", o);
  for (const command_spec& c : spec.commands)
    out += fmt::format("complete -c tiers -n __fish_use_subcommand -a {} -d {}\n", c.name,
                       fish_text(short_help(c.help)));
  for (const command_spec& c : spec.commands)
    out += fish_command(c);
  return out;
}

void setup_completion(CLI::App& app, int& status) {
  struct options {
    std::string shell;
    report_output out;
  };
  auto o = std::make_shared<options>();
  CLI::App* cmd = app.add_subcommand(
      "completion", "Print the shell completion script of tiers for bash, zsh or fish");
  cmd->add_option("shell", o->shell, "The shell: bash, zsh or fish")
      ->required()
      ->check(CLI::IsMember({"bash", "zsh", "fish"}))
      ->type_name("SHELL");
  cmd->add_option("-o,--output", o->out.output, "Write the script to this file (default: stdout)")
      ->type_name("FILE");
  cmd->callback([o, &app, &status] {
    const interface_spec spec = describe(app);
    emit(o->out, o->shell == "bash"  ? bash_completion(spec)
                 : o->shell == "zsh" ? zsh_completion(spec)
                                     : fish_completion(spec));
    status = 0;
  });
}

}  // namespace tiers::cli
