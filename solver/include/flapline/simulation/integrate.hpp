#pragma once
/// \file
/// The run: fixed-step RK4 (Boost.Odeint runge_kutta4) over whole cycles until the cycle means
/// stop changing (DESIGN §5); loads are evaluated at output samples only.

#include <functional>

#include "flapline/simulation/model.hpp"
#include "flapline/simulation/run_summary.hpp"
#include "flapline/simulation/workspace.hpp"

namespace flapline {

/// Optional hooks of a run.
struct RunControl {
  /// Called after every cycle with the number of cycles done and the relative change of the
  /// cycle means (NaN after the first cycle).
  std::function<void(int cycles_done, double change)> on_cycle;
};

/// Run a case. Throws NumericalError when a state or a load becomes non-finite.
/// The Workspace must have been built from the same Model.
RunSummary simulate(const Model& model, Workspace& ws, const RunControl& control = {});

/// Convenience: builds a Workspace for one run.
RunSummary simulate(const Model& model, const RunControl& control = {});

}  // namespace flapline
