#pragma once
/// \file
/// The gait (wing-beat kinematics) and the body's motion through the air, as given by the user
/// (DESIGN §2-3). Angles in rad, rates in rad/s, lengths in m, in body axes (x forward, y right,
/// z down).

#include <Eigen/Core>

#include "flapline/kinematics/waveform.hpp"

namespace flapline {

/// Which wing. The right wing is computed directly; the left one as a mirrored virtual right wing.
enum class Side { right = 0, left = 1 };
template <>
struct EnumNames<Side> {
  static constexpr std::array<std::pair<Side, std::string_view>, 2> items{
      {{Side::right, "right"}, {Side::left, "left"}}};
};

/// Angle histories of one wing relative to the stroke plane (DESIGN §2): stroke φ (+ forward),
/// deviation θ (+ tip up), pitch ψ (+ leading edge up, 0 = chord in the stroke plane), and the
/// span ratio λ in (0, 1] that scales radial positions (folding).
struct WingGaitSpec {
  WaveformSpec stroke;
  WaveformSpec deviation;
  WaveformSpec pitch;
  WaveformSpec span_ratio = [] {
    WaveformSpec s;
    s.mean = 1.0;
    return s;
  }();
};

/// Key paths in errors: `gait.*`, `gait.left.*`, `gait.right.*`.
struct GaitSpec {
  double frequency = 0.0;           ///< Hz, (0, 2000]
  double stroke_plane_angle = 0.0;  ///< β, rad, [-π, π]; + tilts the stroke plane's front up
  WingGaitSpec right;               ///< the right wing's angles
  WingGaitSpec left;                ///< the left wing's angles (same senses, mirrored)
  /// Heave of both hinges along body z (m, + down): used for plunging-wing checks and
  /// fixed-wing cases; zero for ordinary flapping.
  WaveformSpec plunge;
};

/// Constant body motion and wind in body axes (a frozen-attitude snapshot). Key paths `flight.*`.
struct FlightSpec {
  Eigen::Vector3d velocity = Eigen::Vector3d::Zero();  ///< m/s, body velocity (u, v, w)
  Eigen::Vector3d rates = Eigen::Vector3d::Zero();     ///< rad/s, body rates (p, q, r)
  Eigen::Vector3d wind = Eigen::Vector3d::Zero();      ///< m/s, air velocity
  /// Added to the velocity and rates after they are derived from a flight condition (studies:
  /// perturbations for stability derivatives). Not a config key.
  Eigen::Vector3d velocity_offset = Eigen::Vector3d::Zero();
  Eigen::Vector3d rates_offset = Eigen::Vector3d::Zero();
};

}  // namespace flapline
