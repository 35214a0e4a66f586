#include "flapline/aero/wagner.hpp"

#include <algorithm>

#include "flapline/aero/lag_states.hpp"
#include "flapline/aero/section_loads.hpp"
#include "flapline/case/model.hpp"
#include "flapline/case/stage_kinematics.hpp"
#include "flapline/case/workspace.hpp"

namespace flapline {

Eigen::Index WagnerModel::state_size(const Model& model) const {
  return 2 * model.strip_count();
}

void WagnerModel::initial_state(const Model& model, Workspace& ws, double t, StartMode start,
                                Eigen::VectorXd& x) const {
  const Eigen::Index n2 = model.strip_count();
  x.setZero(2 * n2);
  if (start == StartMode::rest) return;
  if (start == StartMode::periodic) {
    periodic_lag_state(
        model, ws,
        [&](double time, Eigen::ArrayXd& f) {
          update_speeds(model, ws, time);
          f = ws.w_three_quarter;
        },
        x);
    return;
  }
  // Steady solution of dx_k/dt = 0: x_k = A_k w_¾.
  const WagnerCoefficients w = wagner_coefficients(model.aero_options().wagner_fit);
  update_speeds(model, ws, t);
  x.head(n2) = w.a1 * ws.w_three_quarter.matrix();
  x.tail(n2) = w.a2 * ws.w_three_quarter.matrix();
}

void WagnerModel::derivative(const Model& model, Workspace& ws, double t, const Eigen::VectorXd& x,
                             Eigen::VectorXd& dxdt) const {
  const StageSpeeds st = stage_speeds(model, ws, t);
  lag_derivative(wagner_coefficients(model.aero_options().wagner_fit), st.rate, st.w_three_quarter,
                 x, dxdt);
}

void WagnerModel::loads(const Model& model, Workspace& ws, double, const Eigen::VectorXd& x) const {
  const WagnerCoefficients w = wagner_coefficients(model.aero_options().wagner_fit);
  const Eigen::Index n2 = model.strip_count();
  ws.loads.w_effective =
      (1.0 - w.a1 - w.a2) * ws.w_three_quarter + x.head(n2).array() + x.tail(n2).array();
  ws.loads.w_induced.setZero();
  circulation_loads(model, ws);
}

double WagnerModel::stiffest_rate(const Model& model, Workspace& ws, double t) const {
  const WagnerCoefficients w = wagner_coefficients(model.aero_options().wagner_fit);
  update_speeds(model, ws, t);
  return std::max(w.b1, w.b2) * ws.rate.maxCoeff();
}

}  // namespace flapline
