#pragma once
/// \file
/// The side-by-side table of `flapline compare`: one column per case, one row per quantity, as
/// CSV and Markdown, and overlay figures of the lift and power histories.

#include <map>
#include <string>
#include <vector>

#include "flapline/simulation/run_summary.hpp"

namespace flapline::io {

/// One compared case: a short name (the config's file stem) and its run.
struct ComparedCase {
  std::string name;
  RunSummary summary;
};

/// Quantities of the table, in order: {label with unit, value of a run}.
struct ComparedQuantity {
  std::string label;
  double (*value)(const RunSummary&);
};
const std::vector<ComparedQuantity>& compared_quantities();

/// comparison.csv: header "quantity,<name1>,<name2>,…", one row per quantity.
std::string comparison_csv(const std::vector<ComparedCase>& cases);

/// comparison.md: the same as a Markdown table, with the common settings in a note.
std::string comparison_markdown(const std::vector<ComparedCase>& cases,
                                const std::string& settings);

/// lift_overlay and power_overlay figures (PNG and SVG); requires gnuplot_available().
std::map<std::string, std::string> comparison_plots(const std::vector<ComparedCase>& cases);

}  // namespace flapline::io
