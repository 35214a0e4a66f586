#pragma once
/// \file
/// Summing per-strip loads into body-frame forces, moments and power (DESIGN §2, §5).

#include <Eigen/Core>
#include <array>

namespace flapline {

class Model;
class Workspace;

/// Force (N) and moment (N·m) about the body origin, body axes: X forward, Y right, Z down;
/// L roll (+ right wing down), M pitch (+ nose up), N yaw (+ nose right).
struct Wrench {
  Eigen::Vector3d force = Eigen::Vector3d::Zero();
  Eigen::Vector3d moment = Eigen::Vector3d::Zero();
  Wrench& operator+=(const Wrench& o) {
    force += o.force;
    moment += o.moment;
    return *this;
  }
};

/// Loads of the pair at one instant.
struct LoadSample {
  double time = 0.0;            ///< s
  Wrench total;                 ///< both wings
  std::array<Wrench, 2> wing;   ///< right, left
  /// Power given to the air, P = −Σ(F·(v − wind) + C·ω_wing) (W).
  double power_air = 0.0;
  /// Actuator power, with velocities and rates relative to the body (W).
  double power_actuator = 0.0;
  std::array<double, 2> wing_power_air{0.0, 0.0};
  /// Induced drag −ρΣΓ·w_i·width (N): the force tilt from the induced normal-wash w_i = KΓ
  /// (lifting line only; 0 otherwise). For a steady wing it is the drag.
  double induced_drag = 0.0;
};

/// Sum ws.loads (virtual frames) into body axes: forces Mv and moments −Mv for the left wing.
LoadSample sum_loads(const Model& model, const Workspace& ws, double t);

}  // namespace flapline
