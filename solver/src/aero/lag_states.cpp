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
  const Eigen::ArrayXd none = Eigen::ArrayXd::Zero(n2);
  // dx/dt of the forced states (from zero) or of the homogeneous ones (from one, forcing 0).
  auto lag = [&](bool forced) {
    return [&, forced](const Eigen::VectorXd& v, Eigen::VectorXd& dv, double t) {
      if (forced) forcing(t, f);
      update_speeds(model, ws, t);
      dv.resize(v.size());
      lag_derivative(w, ws.rate, forced ? f : none, v, dv);
    };
  };
  Eigen::VectorXd forced = Eigen::VectorXd::Zero(2 * n2), free = Eigen::VectorXd::Ones(2 * n2);
  if (model.simulation().integrator == Integrator::rk4) {
    StateStepper a, b;
    for (int j = 0; j < steps; ++j) {
      a.do_step(lag(true), forced, j * dt, dt);
      b.do_step(lag(false), free, j * dt, dt);
    }
  } else {
    // The run's exponential steps with κ = 0 (each state its own linear equation).
    ExponentialStepper st;
    st.resize(n2, 0);
    st.set_linear_part(w, none);
    Eigen::ArrayXd r0(n2), rh(n2), r1(n2);
    auto exp_form = [](auto&& d) {  // (x, t, dx/dt) as the exponential stepper calls it
      return [d](const Eigen::VectorXd& v, double t, Eigen::VectorXd& dv) { d(v, dv, t); };
    };
    for (int j = 0; j < steps; ++j) {
      const double t = j * dt;
      update_speeds(model, ws, t);
      r0 = ws.rate;
      update_speeds(model, ws, t + 0.5 * dt);
      rh = ws.rate;
      update_speeds(model, ws, t + dt);
      r1 = ws.rate;
      st.step(exp_form(lag(true)), forced, t, dt, r0, rh, r1, -1);
      st.step(exp_form(lag(false)), free, t, dt, r0, rh, r1, -1);
    }
  }
  x.resize(2 * n2);
  x.array() = forced.array() / (1.0 - free.array());
}

}  // namespace flapline
