#pragma once
/// \file
/// The fixed-step integrator of the lag states: Boost.Odeint's classical RK4 on Eigen vectors.
/// Kept out of workspace.hpp so that code which only reads results does not compile Odeint.

#include <Eigen/Core>
#include <boost/numeric/odeint.hpp>
#include <boost/numeric/odeint/external/eigen/eigen.hpp>

#include "flapline/case/exponential_stepper.hpp"

namespace flapline {

using StateStepper =
    boost::numeric::odeint::runge_kutta4<Eigen::VectorXd, double, Eigen::VectorXd, double,
                                         boost::numeric::odeint::vector_space_algebra>;

/// A Workspace's steppers (their buffers are sized on the first step and reused).
struct StepperSlot {
  StateStepper rk4;
  ExponentialStepper exponential;
  /// The exponential stepper is sized and holds the linear parts of the Workspace's Model
  /// (cleared by Workspace::reset).
  bool exponential_ready = false;
  bool kappa_varies = false;  ///< the linear parts change over the cycle (set at each step)
  Eigen::ArrayXd kappa, rate0, rate_half, rate1;
};

}  // namespace flapline
