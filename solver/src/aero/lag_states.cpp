#include "flapline/aero/lag_states.hpp"

#include "flapline/case/model.hpp"
#include "flapline/case/stage_kinematics.hpp"
#include "flapline/case/stepper.hpp"
#include "flapline/case/workspace.hpp"

namespace flapline {

void periodic_lag_state(const Model& model, Workspace& ws, const LagForcing& forcing,
                        Eigen::VectorXd& x) {
  const WagnerCoefficients w = wagner_coefficients(model.aero_options().wagner_fit);
  const Eigen::Index n2 = model.strip_count();
  const int steps = model.simulation().steps_per_cycle;
  const double dt = model.period() / steps;
  Eigen::ArrayXd f(n2);
  // z = [forced x (2·2N); homogeneous y (2·2N)]
  Eigen::VectorXd z = Eigen::VectorXd::Zero(4 * n2);
  z.tail(2 * n2).setOnes();
  auto system = [&](const Eigen::VectorXd& v, Eigen::VectorXd& dv, double t) {
    forcing(t, f);
    update_speeds(model, ws, t);
    const Eigen::ArrayXd& rate = ws.rate;
    dv.resize(v.size());
    dv.segment(0, n2).array() = rate * w.b1 * (w.a1 * f - v.segment(0, n2).array());
    dv.segment(n2, n2).array() = rate * w.b2 * (w.a2 * f - v.segment(n2, n2).array());
    dv.segment(2 * n2, n2).array() = -rate * w.b1 * v.segment(2 * n2, n2).array();
    dv.segment(3 * n2, n2).array() = -rate * w.b2 * v.segment(3 * n2, n2).array();
  };
  StateStepper stepper;
  for (int j = 0; j < steps; ++j) stepper.do_step(system, z, j * dt, dt);
  x.resize(2 * n2);
  x.array() = z.head(2 * n2).array() / (1.0 - z.tail(2 * n2).array());
}

}  // namespace flapline
