#pragma once
/// \file
/// Studies about one point of a design space (trim, derivatives, modes): parameters that are
/// config keys or the body's flight state, points evaluated in parallel through the runner.

#include <optional>
#include <string>
#include <vector>

#include <Eigen/Core>

#include "flapline/simulation/run_summary.hpp"
#include "flapline/studies/design.hpp"
#include "flapline/studies/runner.hpp"

namespace flapline::studies {

/// A parameter: a numeric config key (value in the key's YAML unit: deg, Hz, m, …), or a
/// component of the body's velocity (u, v, w in m/s) or rates (p, q, r in rad/s).
struct Parameter {
  enum class Kind { key, velocity, rate };
  std::string name;  ///< key path, or "u", "v", "w", "p", "q", "r"
  Kind kind = Kind::key;
  int axis = 0;     ///< 0, 1, 2 for velocity and rate components
  double base = 0;  ///< value at the base point (for velocity and rates: their offset, 0)
  double low = -1e300, high = 1e300;  ///< bounds (trim: given; derivatives: the key's range)

  /// The six flight-state parameters u, v, w, p, q, r.
  static std::vector<Parameter> flight_state();
};

/// The case with parameter values x (the other parameters at their base).
CaseSpec case_at(const std::vector<Parameter>& params, const Eigen::VectorXd& x,
                 const CaseSpec& base = {});

/// Run the cases, in parallel; the summaries in the cases' order. Throws Interrupted when
/// options.stop ended the study early.
std::vector<RunSummary> evaluate(const std::vector<CaseSpec>& cases,
                                 const CaseBuilderFactory& factory, const RunnerOptions& options);

/// The value of summary key `path` of a run (NaN when undefined).
double summary_value(const RunSummary& s, const std::string& path);

/// What a summary quantity measures, for scaling: a force (key ends in _N), a moment (_Nm),
/// or something else.
enum class QuantityKind { force, moment, other };
QuantityKind quantity_kind(const std::string& path);

}  // namespace flapline::studies
