// Helpers shared by the unit tests: a document that uses every part of the model, reading and
// writing through the registry, and saving written JSON for the schema check.
#pragma once

#include <string>
#include <string_view>

#include "tiers/tiers.hpp"

namespace tiers::test {

/// An interval annotation from `start` to `end` seconds (rounded to the nanosecond).
annotation seg(double start, double end, std::string label);

/// A tier of these annotations, unnamed.
tier tier_of(std::vector<annotation> annotations);

/// Invented demo data that exercises every field of the model at least once.
document rich_document();

/// The whole content of a file (empty when it cannot be read).
std::string slurp(const std::string& path);

/// The content of `samples/NAME`.
std::string sample(std::string_view name);

/// Writes `doc` as format `name` into a string.
std::string write_as(std::string_view name, const document& doc);

/// Reads `text` as format `name`; fails the test (with the diagnostics) when reading fails.
document read_as(std::string_view name, std::string_view text, const read_options& options = {});

/// Reads `text` expecting failure; returns the first error, located.
diagnostic first_error(std::string_view name, std::string_view text,
                       const read_options& options = {});

/// Saves JSON the tests wrote into $TIERS_TEST_OUTPUT (when set), so that the schema test
/// can validate every one of them against schemas/tiers.schema.json.
void save_json_output(std::string_view label, std::string_view json);

/// The same for other outputs the reference tests read (TTML for the IMSC implementation).
void save_output(std::string_view label, std::string_view text, std::string_view extension);

}  // namespace tiers::test
