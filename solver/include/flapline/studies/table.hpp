#pragma once
/// \file
/// A study's result table (sweep.csv): one row per case in case order — `case`, each varied key
/// (column named by its key path), `status`, `message`, `cycles`, then every scalar of
/// summary.json by its dot-joined key path (simulation/summary_keys.hpp). The columns depend on
/// the varied keys only, so every shard of a study has the same header. Numbers are written in
/// shortest round-trip form (a cell parses back to exactly the double the run produced), never
/// as -0; an undefined value or a failed case's result is an empty cell. Rows are single lines.

#include <string>
#include <vector>

#include "flapline/simulation/run_summary.hpp"
#include "flapline/studies/design.hpp"

namespace flapline::studies {

/// The column names.
std::vector<std::string> table_columns(const std::vector<std::string>& varied);

/// The header line (with its newline).
std::string table_header(const std::vector<std::string>& varied);

/// The row of case `index` (with its newline): the case's text for each varied key (empty when
/// the case keeps the base value, `~` when it removes the key), then its results.
std::string table_row(std::size_t index, const std::vector<std::string>& varied, const CaseSpec& c,
                      const RunSummary& summary);

/// One CSV field, quoted when it holds a comma, a quote or leading/trailing spaces.
std::string csv_field(const std::string& text);

/// Split one CSV line into fields (RFC 4180 quoting).
std::vector<std::string> csv_split(const std::string& line);

/// The case index of a row (its first field), or -1 when the line is not a complete row of a
/// table with `columns` columns.
long row_index(const std::string& line, std::size_t columns);

}  // namespace flapline::studies
