#pragma once
/// \file
/// Files of `flapline trim`, `flapline derivatives` and `flapline modes` (layouts:
/// configs/README.md, "Trim, derivatives and modes").

#include <map>
#include <string>
#include <vector>

#include "flapline/studies/derivatives.hpp"
#include "flapline/studies/modes.hpp"
#include "flapline/studies/trim.hpp"

namespace flapline::io {

/// trim.json: status, free values with bounds and starts, each target with the achieved value
/// and scaled residual, the scaling, iterations and runs, the Jacobian at the solution and its
/// condition number, active bounds, the residual history and the settings of the inner runs.
std::string trim_json(const studies::TrimResult& r, const std::vector<studies::Parameter>& free,
                      double tolerance, const std::string& inner_runs);

/// derivatives.csv: `quantity`, then one column per parameter (values D(h/2)).
std::string derivatives_csv(const studies::DerivativeTable& t);

/// derivatives.json: values, error estimates, flags, steps and schemes, units, the base point,
/// and the non-dimensional table with its reference quantities.
std::string derivatives_json(const studies::DerivativeTable& t);

/// The unit of a summary quantity (from its key name) and of a parameter.
std::string quantity_unit(const std::string& quantity);
std::string parameter_unit(const studies::Parameter& p);

/// Non-dimensional derivative table: forces / (q S), moments / (q S R), power / (q S U_ref) with
/// q = ½ρU_ref², S the pair's area, R the span, U_ref the reference speed; per unit of a
/// config key as written, per unit of u/U_ref, per unit of p·R/U_ref.
Eigen::MatrixXd nondimensional(const studies::DerivativeTable& t);

/// Heat map of the non-dimensional table (each row scaled by its largest entry).
std::map<std::string, std::string> derivative_plots(const studies::DerivativeTable& t,
                                                    const std::string& stem);

/// modes.json.
std::string modes_json(const studies::LinearModel& lm, const std::vector<std::string>& inputs,
                       const std::vector<std::string>& input_units,
                       const std::vector<studies::Mode>& modes,
                       const std::vector<std::string>& warnings);

/// Eigenvalues in the complex plane with lines of constant damping.
std::map<std::string, std::string> modes_plot(const std::vector<studies::Mode>& modes);

/// The trim's scaled residual against iteration.
std::map<std::string, std::string> trim_plot(const studies::TrimResult& r);

}  // namespace flapline::io
