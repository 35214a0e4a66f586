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

/// One RK4 step (Boost.Odeint runge_kutta4) of ws.state from t to t + dt. Allocation-free once
/// the stepper has seen the state's size; throws NumericalError on a non-finite state.
void advance(const Model& model, Workspace& ws, double t, double dt);

/// Kinematics and per-strip loads at t for the current ws.state, summed into body axes
/// (ws.sections and ws.loads hold the per-strip values afterwards). Throws NumericalError on a
/// non-finite load.
LoadSample evaluate(const Model& model, Workspace& ws, double t);

/// Run a case. Throws NumericalError when a state or a load becomes non-finite.
/// The Workspace must have been built from the same Model.
RunSummary simulate(const Model& model, Workspace& ws, const RunControl& control = {});

/// Convenience: builds a Workspace for one run.
RunSummary simulate(const Model& model, const RunControl& control = {});

}  // namespace flapline
