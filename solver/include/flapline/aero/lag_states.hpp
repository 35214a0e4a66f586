#pragma once
/// \file
/// The two Jones–Wagner lag states per strip shared by the wagner and lifting_line models:
/// dx_k/dt = (U/b)(−b_k x_k + A_k b_k f) with f the forcing normal-wash (w_¾, plus the induced
/// normal-wash KΓ on the lifting line). State layout [x₁ of all 2N strips, x₂ of all 2N strips].

#include <Eigen/Core>
#include <functional>

#include "flapline/case/aero_options.hpp"

namespace flapline {

class Model;
class Workspace;

/// dx/dt for rates U/b and forcing f (arrays over the 2N strips). Allocation-free.
inline void lag_derivative(const WagnerCoefficients& w,
                           const Eigen::Ref<const Eigen::ArrayXd>& rate,
                           const Eigen::Ref<const Eigen::ArrayXd>& forcing,
                           const Eigen::VectorXd& x, Eigen::VectorXd& dxdt) {
  const Eigen::Index n2 = rate.size();
  dxdt.head(n2).array() = rate * w.b1 * (w.a1 * forcing - x.head(n2).array());
  dxdt.tail(n2).array() = rate * w.b2 * (w.a2 * forcing - x.tail(n2).array());
}

/// Fills `forcing` (size 2N) with the forcing normal-wash at time t.
using LagForcing = std::function<void(double t, Eigen::ArrayXd& forcing)>;

/// Lag states on the periodic orbit at t = 0 for a forcing that depends on time only: one cycle
/// of the run's steps (its integrator and step) of the forced equations from zero gives x_T, one
/// of the homogeneous ones from one gives each state's amplification Φ, and x₀ = x_T/(1 − Φ) —
/// exact for the discrete map, since every state obeys its own linear equation.
void periodic_lag_state(const Model& model, Workspace& ws, const LagForcing& forcing,
                        Eigen::VectorXd& x);

}  // namespace flapline
