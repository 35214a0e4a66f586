#pragma once
/// \file
/// The frozen-time state-space matrices of the lag models (`flapline run --state-space T`).

#include <Eigen/Core>

namespace flapline {

/// Frozen-time state-space form of a lag model at time t: state x = (x₁, x₂) per strip (4N),
/// input the kinematic w_¾ per strip (2N), output Γ per strip (2N):
///   ẋ = A x + B w_¾,  Γ = C x + D w_¾.
/// For the wagner model K = 0.
struct StateSpace {
  double time = 0;
  Eigen::MatrixXd A, B, C, D;
};
}  // namespace flapline
