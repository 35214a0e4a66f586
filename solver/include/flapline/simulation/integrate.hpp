#pragma once
/// \file
/// The run on an explicit Workspace (internal: the installed API is simulation/run.hpp): fixed
/// steps (simulation.integrator: exponential ETDRK4 or Boost.Odeint's runge_kutta4) over whole
/// cycles until the cycle means stop changing (DESIGN §5); loads are evaluated at output samples
/// only.

#include <functional>

#include "flapline/aero/aero_model.hpp"
#include "flapline/case/model.hpp"
#include "flapline/case/stage_kinematics.hpp"
#include "flapline/case/workspace.hpp"
#include "flapline/simulation/run.hpp"
#include "flapline/simulation/run_summary.hpp"

namespace flapline {

/// One step of ws.state from t to t + dt with the model's integrator. Allocation-free once the
/// stepper has seen the state's size; throws NumericalError on a non-finite state.
void advance(const Model& model, Workspace& ws, double t, double dt);

/// Kinematics and per-strip loads at t for the current ws.state, summed into body axes
/// (ws.sections and ws.loads hold the per-strip values afterwards). Throws NumericalError on a
/// non-finite load.
LoadSample evaluate(const Model& model, Workspace& ws, double t);

/// Run a case. Throws InputError when a rule that needs the whole case fails (the lag models'
/// step-size check) and NumericalError when a state or a load becomes non-finite.
/// The Workspace must have been built for (or reset to) the same Model; a run starts from clean
/// caches only on a fresh or reset Workspace, so reuse one across cases with ws.reset(model).
RunSummary simulate(const Model& model, Workspace& ws, const RunControl& control = {});

/// Relative change between consecutive cycle means (DESIGN §5): forces against RMS|F|, moments
/// against RMS|F|·span; one scale for all components.
double cycle_change(const CycleStats& a, const CycleStats& b, double span);

/// The run loop alone (no inflow iteration): from `initial_state` when given (a state vector of
/// the right size), else from simulation.start.
RunSummary simulate_cycles(const Model& model, Workspace& ws, const RunControl& control,
                           const Eigen::VectorXd* initial_state);

/// A run with momentum inflow (model.inflow, simulation/inflow.cpp): one cycle at a time, the
/// induced velocity updated from each cycle's mean force with under-relaxation. `ws` is reset
/// for `model` at the end.
RunSummary simulate_with_inflow(const Model& model, Workspace& ws, const RunControl& control);

/// The same, but a failed run is a value: status input_error (with error_key) or blew_up and the
/// message; never throws those two. For studies, which record a failure and go on.
RunSummary run_case(const Model& model, Workspace& ws, const RunControl& control = {});

}  // namespace flapline
