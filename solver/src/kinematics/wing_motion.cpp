#include "flapline/kinematics/wing_motion.hpp"

#include <cmath>

#include "flapline/common/math.hpp"

namespace flapline {

WingMotion::WingMotion(Side side_, const GaitSpec& gait_spec, const WingGaitSpec& angles,
                       const Eigen::Vector3d& hinge_, const FlightSpec& flight)
    : side(side_),
      frequency(gait_spec.frequency),
      stroke_plane(rotation_y(gait_spec.stroke_plane_angle)),
      hinge(hinge_) {
  const std::string prefix = side == Side::right ? "gait.right." : "gait.left.";
  const double deg = 1.0 / kDegree;
  stroke = Waveform(angles.stroke, prefix + "stroke", deg);
  deviation = Waveform(angles.deviation, prefix + "deviation", deg);
  pitch = Waveform(angles.pitch, prefix + "pitch", deg);
  span_ratio = Waveform(angles.span_ratio, prefix + "span_ratio");
  plunge = Waveform(gait_spec.plunge, "gait.plunge");
  if (side == Side::right) {
    velocity = flight.velocity;
    rates = flight.rates;
    wind = flight.wind;
  } else {
    velocity = mirror(flight.velocity);
    rates = mirror_axial(flight.rates);
    wind = mirror(flight.wind);
  }
}

WingPose wing_pose(const WingMotion& m, double t) {
  WingPose p;
  const double f = m.frequency;
  const WaveSample phi = m.stroke.at(t, f), theta = m.deviation.at(t, f), psi = m.pitch.at(t, f);
  const WaveSample lam = m.span_ratio.at(t, f), h = m.plunge.at(t, f);
  p.stroke = phi.value;
  p.deviation = theta.value;
  p.pitch = psi.value;
  p.span_ratio = lam.value;
  p.span_ratio_rate = lam.rate;
  p.span_ratio_accel = lam.accel;
  p.stroke_rate = phi.rate;
  p.deviation_rate = theta.rate;
  p.pitch_rate = psi.rate;
  p.plunge_rate = h.rate;

  // Stroke-plane frame: a1 = -z (stroke axis), a2 = R_z(-φ)x (deviation axis),
  // a3 = R_z(-φ)R_x(-θ)y (span axis); ω_S = φ̇ a1 - θ̇ a2 + ψ̇ a3 (DESIGN §2).
  const Eigen::Matrix3d rz = rotation_z(-phi.value);
  const Eigen::Matrix3d rzx = rz * rotation_x(-theta.value);
  const Eigen::Vector3d a1(0.0, 0.0, -1.0);
  const Eigen::Vector3d a2 = rz.col(0);
  const Eigen::Vector3d a3 = rzx.col(1);
  const Eigen::Vector3d w2 = phi.rate * a1 - theta.rate * a2;  // rate of the a3 frame
  const Eigen::Vector3d a2_dot = (phi.rate * a1).cross(a2);
  const Eigen::Vector3d a3_dot = w2.cross(a3);
  const Eigen::Vector3d omega_s = w2 + psi.rate * a3;
  const Eigen::Vector3d omega_s_dot =
      phi.accel * a1 - theta.accel * a2 - theta.rate * a2_dot + psi.accel * a3 + psi.rate * a3_dot;

  p.rotation = m.stroke_plane * rzx * rotation_y(psi.value);
  p.chord_axis = p.rotation.col(0);
  p.span_axis = p.rotation.col(1);
  p.normal_axis = -p.rotation.col(2);  // e_s × e_c = y × x = -z in the wing frame
  p.omega_rel = m.stroke_plane * omega_s;
  p.omega_rel_dot = m.stroke_plane * omega_s_dot;
  p.omega = m.rates + p.omega_rel;

  const Eigen::Vector3d down(0.0, 0.0, 1.0);
  p.hinge = m.hinge + h.value * down;
  p.hinge_velocity = h.rate * down;
  p.hinge_accel = h.accel * down;

  // v_pivot(r) = V + Ω×h + ḣ + r(λ ω×e_s + λ̇ e_s); q = wind - v.
  p.q0 = m.wind - m.velocity - m.rates.cross(p.hinge) - p.hinge_velocity;
  p.q1 = -(p.span_ratio * p.omega.cross(p.span_axis) + p.span_ratio_rate * p.span_axis);
  p.omega_s = p.omega.dot(p.span_axis);
  // d/dt(ω·e_s) = ω̇_rel·e_s + ω·(ω_rel × e_s) (body rates constant in body axes).
  p.rel_cross_s = p.omega_rel.cross(p.span_axis);
  p.rel_cross_c = p.omega_rel.cross(p.chord_axis);
  p.rel_cross_n = p.omega_rel.cross(p.normal_axis);
  p.abs_cross_s = p.omega.cross(p.span_axis);
  p.abs_cross_c = p.omega.cross(p.chord_axis);
  p.abs_cross_n = p.omega.cross(p.normal_axis);
  p.acc_cross_s = p.omega_rel_dot.cross(p.span_axis) + p.omega.cross(p.rel_cross_s);
  p.acc_cross_c = p.omega_rel_dot.cross(p.chord_axis) + p.omega.cross(p.rel_cross_c);
  p.acc_cross_n = p.omega_rel_dot.cross(p.normal_axis) + p.omega.cross(p.rel_cross_n);
  p.omega_s_dot = p.omega_rel_dot.dot(p.span_axis) + p.omega.dot(p.rel_cross_s);
  p.q_dot_base = -(m.rates.cross(p.hinge_velocity) + p.hinge_accel);
  return p;
}

SectionState section_state(const WingPose& p, const WingMotion&, double r, double chord, double le,
                           double ct, double st) {
  // A point x = h + a e_s + ℓ e_c of the section (a = λr, ℓ = distance ahead of the pitch axis)
  // moves relative to the body with v_rel = ḣ + λ̇r e_s + ω_rel × (x − h); the air relative to it is
  // q = wind − V − Ω × x − v_rel, and its body-frame rate is q̇ = −Ω × v_rel − a_rel (DESIGN §2).
  // Every cross product with e_s, e_c, e_n comes precomputed in the pose.
  SectionState s;
  const double a = p.span_ratio * r, a_rate = p.span_ratio_rate * r;
  const double a_accel = p.span_ratio_accel * r;
  s.chord_axis = ct * p.chord_axis + st * p.normal_axis;
  s.normal_axis = ct * p.normal_axis - st * p.chord_axis;
  const Eigen::Vector3d rel_c = ct * p.rel_cross_c + st * p.rel_cross_n;  // ω_rel × e_c
  const Eigen::Vector3d rel_n = ct * p.rel_cross_n - st * p.rel_cross_c;  // ω_rel × e_n
  const Eigen::Vector3d abs_c = ct * p.abs_cross_c + st * p.abs_cross_n;  // ω × e_c
  const Eigen::Vector3d acc_c = ct * p.acc_cross_c + st * p.acc_cross_n;
  const double l_quarter = le - 0.25 * chord, l_mid = le - 0.5 * chord;

  s.pivot = p.hinge + a * p.span_axis;
  s.quarter = s.pivot + l_quarter * s.chord_axis;
  s.mid = s.pivot + l_mid * s.chord_axis;
  const Eigen::Vector3d v_pivot = p.hinge_velocity + a_rate * p.span_axis + a * p.rel_cross_s;
  s.v_rel_quarter = v_pivot + l_quarter * rel_c;
  s.v_rel_mid = v_pivot + l_mid * rel_c;
  const Eigen::Vector3d q_pivot = p.q0 + r * p.q1;
  s.q_quarter = q_pivot - l_quarter * abs_c;
  s.q_mid = q_pivot - l_mid * abs_c;

  s.tangential_speed = -s.q_mid.dot(s.chord_axis);
  s.w_pivot = q_pivot.dot(s.normal_axis);
  s.w_half = s.q_mid.dot(s.normal_axis);
  s.w_three_quarter = s.w_pivot + p.omega_s * (0.75 * chord - le);
  s.speed = std::sqrt(s.tangential_speed * s.tangential_speed + s.w_half * s.w_half);

  // q̇ at mid-chord: −(Ω×ḣ + ḧ) − λ̈r e_s − λ̇r(Ω×e_s + 2ω_rel×e_s) − a(…)_s − ℓ(…)_c, then
  // d(w_½)/dt = q̇·e_n + q·(ω_rel × e_n).
  const Eigen::Vector3d q_dot = p.q_dot_base - a_accel * p.span_axis -
                                a_rate * (p.abs_cross_s + p.rel_cross_s) - a * p.acc_cross_s -
                                l_mid * acc_c;
  s.w_half_rate = q_dot.dot(s.normal_axis) + s.q_mid.dot(rel_n);
  return s;
}

void strip_speeds(const WingPose& p, const Strips& strips, Eigen::Ref<Eigen::ArrayXd> tangential,
                  Eigen::Ref<Eigen::ArrayXd> w_pivot) {
  // U_t0(r) = -(q0 + r q1)·e_c0, w0(r) = (q0 + r q1)·e_n0; twist rotates both (DESIGN §8: a rigid
  // wing's section velocities are affine in r, so no per-strip vector work is needed).
  const double ut_a = -p.q0.dot(p.chord_axis), ut_b = -p.q1.dot(p.chord_axis);
  const double w_a = p.q0.dot(p.normal_axis), w_b = p.q1.dot(p.normal_axis);
  const auto& r = strips.radius;
  tangential = strips.cos_twist * (ut_a + ut_b * r) - strips.sin_twist * (w_a + w_b * r);
  w_pivot = strips.cos_twist * (w_a + w_b * r) + strips.sin_twist * (ut_a + ut_b * r);
}

}  // namespace flapline
