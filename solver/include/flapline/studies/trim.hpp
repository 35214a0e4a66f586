#pragma once
/// \file
/// Trim (DESIGN §9): the values of free parameters, within bounds, for which chosen summary
/// quantities reach their targets — or, with `balance`, for which the vehicle is in steady
/// flight (net mean force = m ω×V_B, net mean moment = ω×(Iω)). Bounded nonlinear least squares:
/// a projected Levenberg–Marquardt iteration on the parameters scaled to their bounds, with the
/// central-difference Jacobian of `derivatives` (all its runs in parallel).
///
/// Residuals are scaled: forces by the weight (with a vehicle), otherwise by the largest target
/// force, otherwise by the base run's force RMS; moments by that force scale times the span;
/// other quantities by max(|target|, |base value|, 1e-12).

#include <string>
#include <vector>

#include <Eigen/Core>

#include "flapline/studies/local.hpp"

namespace flapline::studies {

/// A target: a summary key path and its value.
struct Target {
  std::string quantity;
  double value = 0;
};

struct TrimOptions {
  double tolerance = 1e-6;  ///< on the RMS of the scaled residuals: below it, `trimmed`
  int max_iterations = 60;
  double relative_step = 1e-4;  ///< Jacobian step as a fraction of each parameter's bound range
  RunnerOptions runner;
  /// Called after every iteration with (iteration, scaled residual RMS).
  std::function<void(int, double)> on_iteration;
};

enum class TrimStatus { trimmed, not_reachable, not_converged, failed };
}  // namespace flapline::studies

namespace flapline {
template <>
struct EnumNames<studies::TrimStatus> {
  static constexpr std::array<std::pair<studies::TrimStatus, std::string_view>, 4> items{
      {{studies::TrimStatus::trimmed, "trimmed"},
       {studies::TrimStatus::not_reachable, "not_reachable"},
       {studies::TrimStatus::not_converged, "not_converged"},
       {studies::TrimStatus::failed, "failed"}}};
};
}  // namespace flapline

namespace flapline::studies {

struct TrimResult {
  TrimStatus status = TrimStatus::not_converged;
  std::string message;
  Eigen::VectorXd values;               ///< free parameters at the end
  std::vector<std::string> quantities;  ///< residual names (targets, or the six balance terms)
  Eigen::VectorXd targets, achieved;    ///< per quantity (balance: 0 and the residual itself)
  Eigen::VectorXd scale;                ///< residual scaling per quantity
  double residual = 0;                  ///< RMS of the scaled residuals
  int iterations = 0, runs = 0;
  Eigen::MatrixXd jacobian;                ///< ∂achieved/∂values at the end (unscaled)
  double condition = 0;                    ///< of the scaled Jacobian
  std::vector<std::string> active_bounds;  ///< e.g. "gait.frequency at its upper bound 40"
  std::vector<double> history;             ///< scaled residual RMS per iteration (0: the start)
  RunSummary summary;                      ///< the run at the final values
};

/// Solve. `targets` empty means balance. Failing runs end the trim with status `failed`.
TrimResult trim(const std::vector<Parameter>& free, const std::vector<Target>& targets,
                const CaseSpec& base, const CaseBuilderFactory& factory,
                const TrimOptions& options);

}  // namespace flapline::studies
