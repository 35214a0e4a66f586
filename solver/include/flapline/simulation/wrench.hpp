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

/// Joint coordinates per wing: stroke, deviation, pitch, span ratio, plunge.
inline constexpr int kJoints = 5;
/// Their names in summary keys and CSV columns, and the units of their generalised forces and
/// rates as those names carry them.
inline constexpr std::array<const char*, kJoints> kJointNames{"stroke", "deviation", "pitch",
                                                              "span_ratio", "plunge"};
inline constexpr std::array<const char*, kJoints> kJointForceUnits{"Nm", "Nm", "Nm", "J", "N"};
inline constexpr std::array<const char*, kJoints> kJointRateUnits{"rad_s", "rad_s", "rad_s",
                                                                  "per_s", "m_s"};

/// Drive quantities of one wing at one instant (filled by add_drive, simulation/drive.hpp).
struct WingDriveSample {
  std::array<double, kJoints> rate{};         ///< q̇ (rad/s, 1/s, m/s)
  std::array<double, kJoints> torque_aero{};  ///< −Σ(F·∂x/∂q + C·∂ω/∂q̇) (N·m, J, N)
  std::array<double, kJoints> torque_inertial{};  ///< Σ(m a·∂x/∂q + Ḣ·∂ω/∂q̇) + stretching term
  std::array<double, kJoints> torque_gravity{};  ///< −Σ m g·∂x/∂q (with a vehicle; else 0)
  /// What the drive supplies: aerodynamic + inertial, + gravity when the case has a vehicle.
  std::array<double, kJoints> torque{};
  std::array<double, kJoints> joint_power{};  ///< τ_j q̇_j (W)
  double power_inertial = 0.0;                ///< Σ τ_inertial q̇ (W)
  double power = 0.0;                         ///< Σ_j power: mechanical power of this wing (W)
  Wrench inertial;  ///< −Σ m a and −Σ(x × m a + Ḣ) on the body, body axes
};

/// Loads of the pair at one instant.
struct LoadSample {
  double time = 0.0;           ///< s
  Wrench total;                ///< both wings
  std::array<Wrench, 2> wing;  ///< right, left
  /// Power given to the air, P = −Σ(F·(v − wind) + C·ω_wing) (W).
  double power_air = 0.0;
  /// Actuator power, with velocities and rates relative to the body (W).
  double power_actuator = 0.0;
  std::array<double, 2> wing_power_air{0.0, 0.0};
  /// Induced drag −ρΣΓ·w_i·width (N): the force tilt from the induced normal-wash w_i = KΓ
  /// (lifting line only; 0 otherwise). For a steady wing it is the drag.
  double induced_drag = 0.0;
  /// Profile drag of both wings (body axes; part of `total`, zero without model.profile_drag) (N).
  Eigen::Vector3d profile_drag = Eigen::Vector3d::Zero();
  /// Inertial load of the wings' masses on the body (both wings; zero for massless wings).
  Wrench inertial;
  /// Drive of each wing (right, left): joint torques and power (simulation/drive.hpp).
  std::array<WingDriveSample, 2> drive;
  /// Mechanical power of both drives, Σ τ q̇ = inertial power + actuator power (+ gravity's) (W).
  double power_mechanical = 0.0;
  double power_inertial = 0.0;  ///< inertial part of power_mechanical (W)
};

/// Sum ws.loads (virtual frames) into body axes: forces Mv and moments −Mv for the left wing.
LoadSample sum_loads(const Model& model, const Workspace& ws, double t);

}  // namespace flapline
