#include "flapline/aero/wagner.hpp"

#include <algorithm>

#include "flapline/aero/section_loads.hpp"
#include "flapline/simulation/model.hpp"
#include "flapline/simulation/workspace.hpp"

namespace flapline {

Eigen::Index WagnerModel::state_size(const Model& model) const { return 2 * model.strip_count(); }

void WagnerModel::initial_state(const Model& model, Workspace& ws, double t, StartMode start,
                                Eigen::VectorXd& x) const {
  const Eigen::Index n2 = model.strip_count();
  x.setZero(2 * n2);
  if (start == StartMode::rest) return;
  if (start == StartMode::periodic) {
    wagner_periodic_state(model, ws, x);
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
  const WagnerCoefficients w = wagner_coefficients(model.aero_options().wagner_fit);
  const Eigen::Index n2 = model.strip_count();
  const StageSpeeds st = stage_speeds(model, ws, t);  // U/b: semichords per second
  dxdt.head(n2).array() = st.rate * w.b1 * (w.a1 * st.w_three_quarter - x.head(n2).array());
  dxdt.tail(n2).array() = st.rate * w.b2 * (w.a2 * st.w_three_quarter - x.tail(n2).array());
}

void WagnerModel::loads(const Model& model, Workspace& ws, double, const Eigen::VectorXd& x) const {
  const WagnerCoefficients w = wagner_coefficients(model.aero_options().wagner_fit);
  const Eigen::Index n2 = model.strip_count();
  ws.loads.w_effective = (1.0 - w.a1 - w.a2) * ws.w_three_quarter + x.head(n2).array() +
                         x.tail(n2).array();
  circulation_loads(model, ws);
}


double WagnerModel::stiffest_rate(const Model& model, Workspace& ws, double t) const {
  const WagnerCoefficients w = wagner_coefficients(model.aero_options().wagner_fit);
  update_speeds(model, ws, t);
  return std::max(w.b1, w.b2) * ws.rate.maxCoeff();
}

void wagner_periodic_state(const Model& model, Workspace& ws, Eigen::VectorXd& x) {
  const WagnerCoefficients w = wagner_coefficients(model.aero_options().wagner_fit);
  const Eigen::Index n2 = model.strip_count();
  const int steps = model.simulation().steps_per_cycle;
  const double dt = model.period() / steps;
  // z = [forced x (2·2N); homogeneous y (2·2N)]
  Eigen::VectorXd z = Eigen::VectorXd::Zero(4 * n2);
  z.tail(2 * n2).setOnes();
  auto system = [&](const Eigen::VectorXd& v, Eigen::VectorXd& dv, double t) {
    update_speeds(model, ws, t);
    const auto& rate = ws.rate;
    dv.resize(v.size());
    dv.segment(0, n2).array() = rate * w.b1 * (w.a1 * ws.w_three_quarter - v.segment(0, n2).array());
    dv.segment(n2, n2).array() = rate * w.b2 * (w.a2 * ws.w_three_quarter - v.segment(n2, n2).array());
    dv.segment(2 * n2, n2).array() = -rate * w.b1 * v.segment(2 * n2, n2).array();
    dv.segment(3 * n2, n2).array() = -rate * w.b2 * v.segment(3 * n2, n2).array();
  };
  StateStepper stepper;
  for (int j = 0; j < steps; ++j) stepper.do_step(system, z, j * dt, dt);
  x.resize(2 * n2);
  x.array() = z.head(2 * n2).array() / (1.0 - z.tail(2 * n2).array());
}

}  // namespace flapline
