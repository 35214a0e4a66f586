// Wing frames and section velocities against the conventions of DESIGN §2 and against
// finite differences of positions. Source of every check value: analytic (the sign
// conventions of DESIGN §2, ISO 1151-1 body axes) or derived numerically from the geometry
// itself (central differences, an independent oracle).
#include <doctest/doctest.h>

#include <cmath>

#include "flapline/common/math.hpp"
#include "flapline/kinematics/wing_motion.hpp"

using namespace flapline;

namespace {
WaveformSpec harmonic(double mean, double amp, double phase) {
  WaveformSpec w;
  w.mean = mean;
  w.amplitude = amp;
  w.phase = phase;
  return w;
}

struct Case {
  GaitSpec gait;
  WingGaitSpec angles;
  FlightSpec flight;
  Eigen::Vector3d hinge{0.01, 0.02, -0.005};
};

Case busy_case() {
  Case c;
  c.gait.frequency = 5.0;
  c.gait.stroke_plane_angle = -0.4;
  c.angles.stroke = harmonic(0.1, 0.9, 0.0);
  c.angles.deviation = harmonic(0.05, 0.2, 0.7);
  c.angles.pitch = harmonic(1.4, 0.6, -1.2);
  c.angles.span_ratio = harmonic(0.8, 0.15, 0.5);
  c.gait.plunge = harmonic(0.0, 0.01, 0.3);
  c.flight.velocity = {3.0, 0.4, -0.3};
  c.flight.rates = {0.5, -0.8, 1.1};
  c.flight.wind = {0.2, -0.1, 0.3};
  return c;
}
}  // namespace

TEST_CASE("angle senses: +stroke moves the tip forward, +deviation up, +pitch leading edge up") {
  GaitSpec g;
  g.frequency = 1.0;
  FlightSpec f;
  const Eigen::Vector3d h = Eigen::Vector3d::Zero();
  WingGaitSpec a;
  a.stroke = harmonic(0.3, 0, 0);
  WingPose p = wing_pose(WingMotion(Side::right, g, a, h, f), 0.0);
  CHECK(p.span_axis.x() > 0.0);  // tip forward (x forward)
  a = WingGaitSpec{};
  a.deviation = harmonic(0.3, 0, 0);
  p = wing_pose(WingMotion(Side::right, g, a, h, f), 0.0);
  CHECK(p.span_axis.z() < 0.0);  // tip up (z down)
  a = WingGaitSpec{};
  a.pitch = harmonic(0.3, 0, 0);
  p = wing_pose(WingMotion(Side::right, g, a, h, f), 0.0);
  CHECK(p.chord_axis.z() < 0.0);   // leading edge up
  CHECK(p.normal_axis.z() < 0.0);  // e_n = e_s × e_c points up at zero angles, tilted back here
  // β = −90°: +stroke is the downstroke; ψ = 90° puts the chord back along +x (DESIGN §2).
  g.stroke_plane_angle = -kPi / 2;
  a = WingGaitSpec{};
  a.stroke = harmonic(0.3, 0, 0);
  a.pitch = harmonic(kPi / 2, 0, 0);
  p = wing_pose(WingMotion(Side::right, g, a, h, f), 0.0);
  CHECK(p.span_axis.z() > 0.0);
  CHECK(p.chord_axis.x() == doctest::Approx(1.0));
}

TEST_CASE("rates and section velocities agree with finite differences of the geometry") {
  const Case c = busy_case();
  const WingMotion m(Side::right, c.gait, c.angles, c.hinge, c.flight);
  const double r = 0.07, chord = 0.03, le = 0.01, tw = 0.15;
  const double h = 1e-6;
  for (double t : {0.013, 0.077, 0.151}) {
    const WingPose p = wing_pose(m, t), pm = wing_pose(m, t - h), pp = wing_pose(m, t + h);
    // ω_rel from Ṙ Rᵀ (skew part)
    const Eigen::Matrix3d W = (pp.rotation - pm.rotation) / (2 * h) * p.rotation.transpose();
    CHECK(std::abs(W(2, 1) - p.omega_rel.x()) < 1e-6);
    CHECK(std::abs(W(0, 2) - p.omega_rel.y()) < 1e-6);
    CHECK(std::abs(W(1, 0) - p.omega_rel.z()) < 1e-6);
    CHECK((((pp.omega_rel - pm.omega_rel) / (2 * h)) - p.omega_rel_dot).norm() < 1e-5);
    CHECK((pp.omega_s - pm.omega_s) / (2 * h) == doctest::Approx(p.omega_s_dot).epsilon(1e-6));

    const auto sec = [&](const WingPose& q) {
      return section_state(q, m, r, chord, le, std::cos(tw), std::sin(tw));
    };
    const SectionState s = sec(p), sm = sec(pm), sp = sec(pp);
    // Point velocity relative to the body = d/dt of its body-frame position.
    CHECK(((sp.mid - sm.mid) / (2 * h) - s.v_rel_mid).norm() < 1e-6);
    CHECK(((sp.quarter - sm.quarter) / (2 * h) - s.v_rel_quarter).norm() < 1e-6);
    // q = wind − V − Ω × x − v_rel (frozen attitude, DESIGN §3)
    const Eigen::Vector3d q =
        c.flight.wind - c.flight.velocity - c.flight.rates.cross(s.mid) - s.v_rel_mid;
    CHECK((q - s.q_mid).norm() < 1e-12);
    // d(w_½)/dt is the exact derivative of the scalar w_½(t).
    CHECK((sp.w_half - sm.w_half) / (2 * h) == doctest::Approx(s.w_half_rate).epsilon(1e-6));
    // thin-airfoil relation of the chord stations: w(ξ) = w_pivot + ω_s c (ξ − x₀)
    CHECK(s.w_half == doctest::Approx(s.w_pivot + p.omega_s * (0.5 * chord - le)).epsilon(1e-12));
    CHECK(s.tangential_speed == doctest::Approx(-s.q_quarter.dot(s.chord_axis)).epsilon(1e-12));
  }
}

TEST_CASE("the affine strip-speed fast path equals the full section kinematics") {
  const Case c = busy_case();
  const WingMotion m(Side::left, c.gait, c.angles, c.hinge, c.flight);
  PlanformSpec ps;
  ps.shape = PlanformShape::tapered;
  ps.span = 0.2;
  ps.root_chord = 0.05;
  ps.tip_chord = 0.02;
  ps.twist_tip = -0.2;
  const Planform plan(ps);
  const Strips st = cut_into_strips(plan, {9, StripSpacing::cosine});
  const WingPose p = wing_pose(m, 0.031);
  Eigen::ArrayXd ut(9), w(9);
  strip_speeds(p, st, ut, w);
  for (int i = 0; i < 9; ++i) {
    const SectionState s = section_state(p, m, st.radius(i), st.chord(i), st.leading_edge(i),
                                         st.cos_twist(i), st.sin_twist(i));
    CHECK(ut(i) == doctest::Approx(s.tangential_speed).epsilon(1e-12));
    CHECK(w(i) == doctest::Approx(s.w_pivot).epsilon(1e-12));
  }
}

TEST_CASE("the left wing's virtual frame mirrors body velocity, rates and wind") {
  const Case c = busy_case();
  const WingMotion left(Side::left, c.gait, c.angles, c.hinge, c.flight);
  CHECK(left.velocity.isApprox(mirror(c.flight.velocity)));
  CHECK(left.rates.isApprox(Eigen::Vector3d(-0.5, -0.8, -1.1)));  // ω -> −Mω
  CHECK(left.wind.isApprox(mirror(c.flight.wind)));
}
