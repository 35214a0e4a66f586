#pragma once
/// \file
/// Control and stability derivatives (DESIGN §9): ∂(cycle-mean quantity)/∂(parameter) by
/// central differences with a Richardson check. With D(h) and D(h/2) the two estimates,
/// the value is D(h/2) and the error estimate |D(h/2) − D(h)|/3 (central; one-sided at a range
/// bound: forward or backward differences, estimate |D(h/2) − D(h)|). An entry is flagged when
/// its estimate exceeds 1 % of |D| plus an absolute floor (1e-9 of the quantity's scale per unit
/// step), so entries that are zero by symmetry are not flagged.
///
/// Steps h: a config key 1e-3·|value| in its YAML unit (deg, Hz, m, …), 1e-3 of the unit when
/// the value is 0; u, v, w 1e-3·max(|V|, 1) m/s; p, q, r 1e-3 rad/s.

#include <string>
#include <vector>

#include <Eigen/Core>

#include "flapline/studies/local.hpp"

namespace flapline::studies {

struct DerivativeTable {
  std::vector<std::string> quantities;  ///< summary key paths (rows)
  std::vector<Parameter> parameters;    ///< columns
  Eigen::MatrixXd value;                ///< D(h/2), quantity unit per parameter unit
  Eigen::MatrixXd error;                ///< Richardson error estimate
  Eigen::Matrix<bool, Eigen::Dynamic, Eigen::Dynamic> flagged;
  std::vector<double> step;         ///< h per parameter
  std::vector<std::string> scheme;  ///< "central", "forward" or "backward" per parameter
  RunSummary base;                  ///< the run at the base point
  int runs = 0;
};

/// The quantities of a derivative table: mean X, Y, Z, L, M, N and actuator power.
std::vector<std::string> derivative_quantities();

/// Step of a parameter at the base point (documented above); `speed` is |V|.
double derivative_step(const Parameter& p, double speed);

/// Derivatives of `quantities` with respect to `params` about `base`. A parameter whose ±h case
/// is refused for its own range (InputError) uses a one-sided difference; a failing run at the
/// base point throws InputError.
DerivativeTable derivatives(const std::vector<Parameter>& params,
                            const std::vector<std::string>& quantities, const CaseSpec& base,
                            const CaseBuilderFactory& factory, const RunnerOptions& options);

}  // namespace flapline::studies
