// What every subcommand shares: input options, loading a document, exit codes, diagnostics.
#pragma once

#include <CLI/CLI.hpp>
#include <optional>
#include <stdexcept>
#include <string>
#include <vector>

#include "tiers/dataset.hpp"
#include "tiers/format.hpp"
#include "tiers/inputs.hpp"

namespace tiers::cli {

/// Exit statuses fixed by the command-line contract.
enum exit_status : int { exit_ok = 0, exit_rejected = 1, exit_usage = 2 };

/// A mistake in how the command was called: exit status 2 (the library's, which says so of
/// bad option values too).
using usage_error = tiers::usage_error;

/// The input was rejected and the reasons were printed already: exit status 1.
struct rejected : std::exception {
  const char* what() const noexcept override { return "input rejected"; }
};

/// How to read one input file; filled in by add_input_options.
struct input_options : reading_settings {
  std::string path;
};

/// Adds -o/--output (with `output_help`; required unless `output_help` is given), --to and
/// --allow-loss, for the commands that write a document.
void add_output_options(CLI::App& cmd, std::string& output, std::string& to, bool& allow_loss,
                        const char* output_help = nullptr);

/// A validator for limits and counts: a whole number of at least 1, written without a sign.
CLI::Validator positive_size();

/// Adds --from, --columns, --tier-name, --time-unit, --rate, --source and --kind to `cmd`.
void add_input_options(CLI::App& cmd, input_options& in);

/// The library's reading_options, its warning about the file's name printed, and a likely
/// slip in --rate named (once a run).
read_options reading_options(const input_options& in, const std::string& path);

/// Reads and parses the input, printing every diagnostic; throws rejected on errors. When the
/// format names no tier (WebVTT, a table without a tier column) and so the reading options
/// named the first tier (after the file, or --tier-name), `given_name` is set to that name:
/// writing it to another such file loses nothing of the content.
/// `warned`, when given, is set when reading gave a warning (something skipped or not applied).
document load_document(const input_options& in, std::string* given_name = nullptr,
                       bool* warned = nullptr);

/// An input file read into memory, with the format and the options to read it.
struct loaded_input {
  std::string content;
  const format* fmt = nullptr;
  read_options options;
  bool settled = false;  ///< --source or --kind change the tiers read: no streaming
};
/// load_document in two steps: reading the file (printing why, and throwing rejected, when no
/// format fits it), then parsing it, which frees the file's bytes.
loaded_input load_input(const input_options& in);
document parse_input(const input_options& in, loaded_input&& input,
                     std::string* given_name = nullptr, bool* warned = nullptr);

/// Converts `input` to the file `output` without a document where nothing can be lost and
/// the input's order allows (streams_losslessly, stream_document): each annotation goes to the
/// writer as it is read, so memory holds the input alone. Prints the diagnostics and throws
/// rejected on errors (nothing written); false, with nothing written, when it cannot stream.
bool stream_output(const loaded_input& input, const format& to, const std::string& output,
                   const std::string& file);

/// The output format: --to, else the extension of `output`; throws usage_error when neither
/// tells (writing to standard output needs --to).
const format& output_format(const std::string& to, const std::string& output);

/// Writes `doc` as `fmt` to `output` (`-` or empty: standard output), atomically. When the
/// format cannot carry everything (plus `losses` found earlier), lists each loss as an error
/// and writes nothing (throws rejected), or with `allow_loss` as warnings and writes.
/// Diagnostics name `file`. A first tier called `given_name` (see load_document) is renamed by
/// a one-tier output without loss.
void write_output(const document& doc, const format& fmt, const std::string& output,
                  bool allow_loss, const std::string& file, std::vector<std::string> losses = {},
                  const std::string& given_name = {});

/// The library's words_file_of, its diagnostics printed (throws rejected on errors).
std::optional<words_file> words_file_of(const std::string& spec, const input_options& reading,
                                        std::optional<std::string>& tier);

/// The files of shard `spec` ("K/N", K from 1 to N) of `files`: the list is sorted, and every
/// Nth file from the Kth is taken, so that N workers given 1/N … N/N share the files without
/// overlap, whatever order they were named in. Throws usage_error on a bad spec.
std::vector<std::string> shard_of(std::vector<std::string> files, const std::string& spec);

/// An option check that accepts exactly the names of a library's table (e.g. clash_rule_names).
template <class E, std::size_t N>
CLI::IsMember one_of(const enum_name<E> (&table)[N]) {
  std::vector<std::string> names;
  for (const enum_name<E>& n : table)
    names.emplace_back(n.name);
  return CLI::IsMember(names);
}

/// The value of a name that one_of(table) accepted.
template <class E, std::size_t N>
E named(const enum_name<E> (&table)[N], std::string_view name) {
  return *value_named(table, name);
}

/// Prints one diagnostic to standard error.
void report(const diagnostic& d);

/// Prints every diagnostic, naming `file` where one names no file; throws rejected when one of
/// them is an error. The one way a command turns a library's diagnostics into its exit status.
void report_all(std::vector<diagnostic> diagnostics, std::string_view file = {});

/// A result's value, once its diagnostics are printed by report_all (which throws on errors).
template <class T>
T take(result<T>&& r, std::string_view file = {}) {
  report_all(std::move(r.diagnostics), file);
  return std::move(r.value);
}

/// Parses a --rate value (parse_rate_setting), naming a likely slip once a run.
rational parse_rate_option(const std::string& text);

}  // namespace tiers::cli
