#pragma once
/// \file
/// The vehicle and its flight condition (DESIGN §9): mass, inertia about the centre of mass (the
/// reference point), body drag area, attitude, and an optional flight condition (airspeed,
/// flight-path angle, sideslip, turn rate) from which the body's velocity and rates follow.
/// Angles in rad, SI units. Key paths `vehicle.*`, `flight.*`.

#include <Eigen/Core>
#include <optional>

namespace flapline {

/// Standard gravity, g = 9.80665 m/s² (CGPM 1901; ISO 80000-3).
inline constexpr double kStandardGravity = 9.80665;

struct VehicleSpec {
  double mass = 0.0;  ///< kg, whole vehicle with its wings, (0, 1000]
  double ixx = 0.0, iyy = 0.0, izz = 0.0,
         ixz = 0.0;        ///< kg·m², about the centre of mass, body axes
  double drag_area = 0.0;  ///< C_D·S of the body, m², [0, 100]
  double roll = 0.0;       ///< φ, rad, [−π, π]
  double pitch = 0.0;      ///< θ, rad, [−π/2, π/2]
};

/// Airspeed V, flight-path angle γ and sideslip β; with the attitude they give the body's
/// velocity relative to the air, V_B = V·[cos α cos β, sin β, sin α cos β] with α = θ − γ (wings
/// level). A turn rate Ω about the vertical (+ turning right) gives the body rates of a steady
/// level turn, ω_B = Ω·[−sin θ, sin φ cos θ, cos φ cos θ] (the Euler-angle kinematics with
/// φ̇ = θ̇ = 0, ψ̇ = Ω; e.g. Etkin & Reid, Dynamics of Flight, ch. 4 — from memory).
struct FlightCondition {
  double airspeed = 0.0;           ///< V, m/s, [0, 1000]
  double flight_path_angle = 0.0;  ///< γ, rad, [−π/2, π/2]; + climbing
  double sideslip = 0.0;           ///< β, rad, [−π/2, π/2]; + air from the right
  double turn_rate = 0.0;          ///< Ω, rad/s; + turning right (nose right)
};

/// Gravity in body axes for roll φ and pitch θ: g_B = g·[−sin θ, sin φ cos θ, cos φ cos θ].
Eigen::Vector3d gravity_body(double roll, double pitch);

/// V_B relative to the air for a flight condition at pitch θ.
Eigen::Vector3d air_velocity_body(const FlightCondition& c, double pitch);

/// ω_B of a steady turn at the attitude.
Eigen::Vector3d turn_rates_body(double turn_rate, double roll, double pitch);

/// The inertia matrix [[Ixx, 0, −Ixz], [0, Iyy, 0], [−Ixz, 0, Izz]] (symmetric vehicle).
Eigen::Matrix3d inertia_matrix(const VehicleSpec& v);

/// Throws InputError naming `vehicle.<field>` (mass, inertia positive definite, drag area,
/// attitude ranges).
void validate(const VehicleSpec& v);

}  // namespace flapline
