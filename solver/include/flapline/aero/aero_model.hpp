#pragma once
/// \file
/// The interface every aerodynamic model implements, at the level of the whole wing pair: the
/// lifting line couples every strip of both wings in one solve per stage, so the interface hands
/// a model all strips at once (DESIGN §4). Adding a model: DEVELOPERS.md, "Adding a model".

#include <Eigen/Core>
#include <memory>

#include "flapline/case/aero_options.hpp"
#include "flapline/case/model.hpp"
#include "flapline/case/simulation_options.hpp"
#include "flapline/case/workspace.hpp"

namespace flapline {

/// Stateless strategy object: all run data lives in the Workspace. Thread-safe for distinct
/// Workspaces.
class AeroModel {
 public:
  virtual ~AeroModel() = default;
  virtual ModelKind kind() const noexcept = 0;

  /// Number of lag states of the wing pair (0 for a quasi-steady model).
  virtual Eigen::Index state_size(const Model& model) const = 0;

  /// Buffers for one run; null when the common Workspace suffices. `previous` is the scratch
  /// a Workspace held before its last reset (or null): a model may take over its allocations,
  /// but must clear every value in them.
  virtual std::unique_ptr<AeroScratch> make_scratch(const Model& model,
                                                    std::unique_ptr<AeroScratch> previous) const;

  /// Called by simulate() once before the step loop: the place for run-long buffers (e.g.
  /// per-phase caches) that a Workspace used for single evaluations does not need.
  virtual void prepare_run(const Model& model, Workspace& ws) const;

  /// Initial states at time t for a start mode (rest: zero).
  virtual void initial_state(const Model& model, Workspace& ws, double t, StartMode start,
                             Eigen::VectorXd& x) const = 0;

  /// dx/dt of all states at time t. Called at every RK4 stage: must not allocate.
  virtual void derivative(const Model& model, Workspace& ws, double t, const Eigen::VectorXd& x,
                          Eigen::VectorXd& dxdt) const = 0;

  /// The largest decay rate (1/s) of the state equations at time t, for the explicit-step
  /// stability check (0 without states).
  virtual double stiffest_rate(const Model& model, Workspace& ws, double t) const;

  /// κ of every strip at time t: ∂f/∂(x₁ + x₂), the change of the strip's forcing normal-wash
  /// with its own lag states through its own trailing vortices — the part of the lag equations
  /// that the exponential integrator treats exactly (case/exponential_stepper.hpp). 0 by default.
  virtual void own_induction(const Model& model, Workspace& ws, double t,
                             Eigen::Ref<Eigen::ArrayXd> kappa) const;

  /// True when κ changes over the cycle (a folding wing on the lifting line).
  virtual bool own_induction_varies(const Model& model) const;

  /// Per-strip loads at time t into ws.loads. ws.sections must already hold the kinematics at t
  /// (update_sections). Called at output times only.
  virtual void loads(const Model& model, Workspace& ws, double t,
                     const Eigen::VectorXd& x) const = 0;
};

/// The model selected by the options (a shared, stateless object).
const AeroModel& aero_model(ModelKind kind);
inline const AeroModel& aero_model(const Model& model) {
  return aero_model(model.aero_options().kind);
}

/// Make `ws` ready for the aerodynamic model of `model`: size the lag states (zero) and build the
/// model's scratch, once per Workspace build or reset (a no-op afterwards; ws.aero_attached).
/// Returns the model.
/// simulate() calls it; call it yourself before using an AeroModel on a fresh Workspace.
const AeroModel& attach_aero(const Model& model, Workspace& ws);

}  // namespace flapline
