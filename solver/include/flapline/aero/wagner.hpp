#pragma once
/// \file
/// Model 2, wagner (DESIGN §4): two Jones–Wagner lag states per strip, advanced in reduced time
/// and forced by the ¾-chord normal-wash,
///   dx_k/dt = (U/b)(−b_k x_k + A_k b_k w_¾),   w_E = (1 − A₁ − A₂) w_¾ + x₁ + x₂,
/// so nothing divides by the local speed U when it passes through zero at stroke reversal. For a
/// step at constant speed w_E/w_¾ follows the fit φ(s) = 1 − A₁e^{−b₁s} − A₂e^{−b₂s}; for
/// small harmonic motion at constant U it reproduces Theodorsen's lift with C(k) replaced by the
/// fit's C_J(k) (Theodorsen 1935, NACA Report 496). State layout: [x₁ of all 2N strips, x₂ of all
/// 2N strips], right wing's strips first; units m/s.

#include "flapline/aero/aero_model.hpp"

namespace flapline {

class WagnerModel final : public AeroModel {
 public:
  ModelKind kind() const noexcept override { return ModelKind::wagner; }
  Eigen::Index state_size(const Model& model) const override;
  void initial_state(const Model& model, Workspace& ws, double t, StartMode start,
                     Eigen::VectorXd& x) const override;
  void derivative(const Model& model, Workspace& ws, double t, const Eigen::VectorXd& x,
                  Eigen::VectorXd& dxdt) const override;
  void loads(const Model& model, Workspace& ws, double t, const Eigen::VectorXd& x) const override;
  double stiffest_rate(const Model& model, Workspace& ws, double t) const override;
};

}  // namespace flapline
