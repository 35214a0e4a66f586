#pragma once
/// \file
/// Wing frames, rates and section velocities (DESIGN §2). Every function works on a virtual right
/// wing: the left wing is computed with mirrored body velocity, rates and wind, and its results
/// are mapped back by the caller (forces Mv, moments -Mv).

#include <Eigen/Core>
#include <Eigen/Geometry>
#include <cmath>

#include "flapline/geometry/strips.hpp"
#include "flapline/kinematics/gait.hpp"

namespace flapline {

/// Everything that moves one wing, already mirrored into the virtual right-wing frame.
struct WingMotion {
  Side side = Side::right;
  double frequency = 1.0;        ///< Hz
  Eigen::Matrix3d stroke_plane;  ///< R_y(β)
  Waveform stroke, deviation, pitch, span_ratio, plunge;
  Eigen::Vector3d hinge;     ///< m (the right wing's hinge for both sides)
  Eigen::Vector3d velocity;  ///< m/s, body velocity in the virtual frame
  Eigen::Vector3d rates;     ///< rad/s, body rates in the virtual frame
  Eigen::Vector3d wind;      ///< m/s, wind in the virtual frame

  /// Mirror the body motion for the left wing. `gait` holds this side's angles.
  WingMotion(Side side, const GaitSpec& gait_spec, const WingGaitSpec& angles,
             const Eigen::Vector3d& hinge, const FlightSpec& flight);
};

/// Pose and rates of one wing at one instant (virtual frame, body axes).
struct WingPose {
  double stroke = 0, deviation = 0, pitch = 0;  ///< rad
  double span_ratio = 1, span_ratio_rate = 0, span_ratio_accel = 0;
  double stroke_rate = 0, deviation_rate = 0, pitch_rate = 0;  ///< rad/s
  double plunge_rate = 0;                                      ///< m/s
  Eigen::Matrix3d rotation;       ///< R_BW = R_y(β) R_z(-φ) R_x(-θ) R_y(ψ) (no twist)
  Eigen::Vector3d chord_axis;     ///< e_c of an untwisted section, toward the leading edge
  Eigen::Vector3d normal_axis;    ///< e_n = e_s × e_c of an untwisted section
  Eigen::Vector3d span_axis;      ///< e_s, root to tip
  Eigen::Vector3d omega_rel;      ///< rad/s, wing rate relative to the body
  Eigen::Vector3d omega_rel_dot;  ///< rad/s², its body-frame time derivative
  Eigen::Vector3d omega;          ///< rad/s, ω_wing = body rates + ω_rel
  Eigen::Vector3d hinge, hinge_velocity, hinge_accel;  ///< hinge incl. plunge, body frame
  /// Air velocity relative to the pitch-axis point at unscaled radius r: q = q0 + r q1.
  Eigen::Vector3d q0, q1;
  double omega_s = 0;      ///< rad/s, ω_wing · e_s (section pitch rate, + leading edge up)
  double omega_s_dot = 0;  ///< rad/s², its time derivative
  // Cross products shared by every section (section_state combines them per strip):
  // e_* ∈ {e_s, e_c, e_n} of an untwisted section.
  Eigen::Vector3d rel_cross_s, rel_cross_c, rel_cross_n;  ///< ω_rel × e_*
  Eigen::Vector3d abs_cross_s, abs_cross_c, abs_cross_n;  ///< ω × e_*
  /// Body-frame rate of ω × (x − h) for a material offset along e_*: ω̇_rel × e_* + ω × (ω_rel ×
  /// e_*)
  Eigen::Vector3d acc_cross_s, acc_cross_c, acc_cross_n;
  Eigen::Vector3d q_dot_base;  ///< −(Ω × ḣ + ḧ): body-frame rate of q at the hinge
};

/// Pose of one wing at time t (s).
WingPose wing_pose(const WingMotion& motion, double t);

/// Complete kinematics of one section (virtual frame, body axes).
struct SectionState {
  Eigen::Vector3d chord_axis, normal_axis;   ///< e_c, e_n including twist
  Eigen::Vector3d pivot, quarter, mid;       ///< m, positions of the pitch axis, ¼- and ½-chord
  Eigen::Vector3d q_quarter, q_mid;          ///< m/s, air velocity relative to those points
  Eigen::Vector3d v_rel_quarter, v_rel_mid;  ///< m/s, point velocity relative to the body
  double tangential_speed = 0;               ///< U_t = -q·e_c (m/s, > 0 leading edge first)
  double w_pivot = 0;                        ///< normal-wash at the pitch axis (m/s)
  double w_half = 0;                         ///< normal-wash at mid-chord w_½ (m/s)
  double w_three_quarter = 0;                ///< normal-wash at ¾-chord w_¾ (m/s)
  double w_half_rate = 0;                    ///< d(w_½)/dt, exact (m/s²)
  double speed = 0;                          ///< U = sqrt(U_t² + w_½²) (m/s)
  /// Angle of attack atan2(w_½, U_t) (rad).
  double alpha() const { return std::atan2(w_half, tangential_speed); }
};

/// Kinematics of the section at unscaled radius r (m) with chord c, leading edge `le` ahead of
/// the pitch axis and twist τ (given as cos τ, sin τ).
SectionState section_state(const WingPose& pose, const WingMotion& motion, double r, double chord,
                           double le, double cos_twist, double sin_twist);

/// The speeds a lag-state derivative needs, for all strips of one wing at once (affine in r):
/// U_t and the pitch-axis normal-wash w_pivot. Output arrays have one entry per strip.
void strip_speeds(const WingPose& pose, const Strips& strips, Eigen::Ref<Eigen::ArrayXd> tangential,
                  Eigen::Ref<Eigen::ArrayXd> w_pivot);

}  // namespace flapline
