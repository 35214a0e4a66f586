#pragma once
/// \file
/// The figures of `flapline run --plot` (PNG and SVG through gnuplot): force, moment and power
/// histories over the last cycle in body axes, gait angles, spanwise loading, the planform with
/// its strips, and a stroke diagram (the section at r̂₂R drawn at successive phases).

#include <map>
#include <string>

#include "flapline/case/model.hpp"
#include "flapline/simulation/run_summary.hpp"

namespace flapline::io {

/// The body-axis convention, printed on every load figure.
extern const char* const kAxesNote;

/// {file name: content} of every figure of a run. Requires gnuplot_available().
std::map<std::string, std::string> run_plots(const RunSummary& summary, const Model& model);

}  // namespace flapline::io
