#include "flapline/aero/lag_states.hpp"

#include "flapline/case/exponential_stepper.hpp"
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
  if (model.simulation().integrator == Integrator::rk4) {
    StateStepper stepper;
    for (int j = 0; j < steps; ++j) stepper.do_step(system, z, j * dt, dt);
  } else {
    // The run's exponential steps with κ = 0 (each state its own linear equation): the same map
    // for the forced states from zero and the homogeneous ones from one.
    ExponentialStepper stepper;
    stepper.resize(n2, 0);
    stepper.set_linear_part(w, Eigen::ArrayXd::Zero(n2));
    Eigen::ArrayXd r0(n2), rh(n2), r1(n2);
    Eigen::VectorXd forced = z.head(2 * n2), free = z.tail(2 * n2), dv(4 * n2);
    for (int j = 0; j < steps; ++j) {
      const double t = j * dt;
      update_speeds(model, ws, t);
      r0 = ws.rate;
      update_speeds(model, ws, t + 0.5 * dt);
      rh = ws.rate;
      update_speeds(model, ws, t + dt);
      r1 = ws.rate;
      auto part = [&](bool homogeneous) {
        return [&, homogeneous](const Eigen::VectorXd& v, double time, Eigen::VectorXd& d) {
          Eigen::VectorXd full = Eigen::VectorXd::Zero(4 * n2);
          full.segment(homogeneous ? 2 * n2 : 0, 2 * n2) = v;
          system(full, dv, time);
          d = dv.segment(homogeneous ? 2 * n2 : 0, 2 * n2);
        };
      };
      stepper.step(part(false), forced, t, dt, r0, rh, r1, -1);
      stepper.step(part(true), free, t, dt, r0, rh, r1, -1);
    }
    z.head(2 * n2) = forced;
    z.tail(2 * n2) = free;
  }
  x.resize(2 * n2);
  x.array() = z.head(2 * n2).array() / (1.0 - z.tail(2 * n2).array());
}

}  // namespace flapline
