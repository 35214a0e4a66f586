// Wing inertia, joint torques and power (DESIGN §9); profile drag (DESIGN §4).
#include <doctest/doctest.h>

#include <algorithm>
#include <cmath>

#include "flapline/common/math.hpp"
#include "flapline/samples/samples.hpp"
#include "flapline/simulation/integrate.hpp"
#include "test_support.hpp"

using namespace flapline;

namespace {

using samples::harmonic;

/// A uniform rectangular plate (R = 0.1 m, c = 0.03 m, pitch axis x₀ = 0.3), root at the hinge,
/// at constant pitch ψ, stroking harmonically in a level stroke plane in near-vacuum.
ModelSpec plate(double psi, int strips, StripSpacing spacing) {
  ModelSpec s;
  s.title = "uniform plate (check case)";
  s.wing.shape = PlanformShape::rectangular;
  s.wing.span = 0.1;
  s.wing.chord = 0.03;
  s.wing.pitch_axis = 0.3;
  s.strips.count = strips;
  s.strips.spacing = spacing;
  s.wing_mass.total = 0.002;
  s.gait.frequency = 10.0;
  s.gait.right.stroke = s.gait.left.stroke = harmonic(0.0, 50.0 * kDegree, 0.0);
  s.gait.right.pitch = s.gait.left.pitch = harmonic(psi, 0.0, 0.0);
  s.air.density = 1e-9;
  s.simulation.samples_per_cycle = 400;
  s.simulation.max_cycles = 2;
  s.simulation.min_cycles = 2;
  return s;
}

/// The folding bat wing with plunge, deviation, a mass table, point masses and a body that moves
/// and turns: every term of the acceleration is exercised.
ModelSpec busy_bat() {
  ModelSpec s = samples::forward_bat();
  s.gait.plunge = harmonic(0.0, 0.01, 0.3);
  s.gait.right.deviation = s.gait.left.deviation = harmonic(2.0 * kDegree, 6.0 * kDegree, 1.1);
  s.gait.left.stroke.amplitude = 26.0 * kDegree;
  s.wing_mass.table_span_fraction = {0.0, 0.5, 1.0};
  s.wing_mass.table_mass_per_span = {0.08, 0.05, 0.02};
  s.wing_mass.table_centre_fraction = {0.3, 0.4, 0.45};
  s.wing_mass.points = {{1.0, 0.2, 0.002}, {0.4, 0.1, 0.001}};
  s.flight.rates = {0.3, -0.2, 0.5};
  s.flight.velocity = {6.0, 0.4, -0.3};
  s.simulation.samples_per_cycle = 50;
  s.simulation.max_cycles = 3;
  return s;
}

Eigen::Vector3d element_position(const WingPose& p, const MassElements& me, Eigen::Index e) {
  const Eigen::Vector3d ec = me.cos_twist(e) * p.chord_axis + me.sin_twist(e) * p.normal_axis;
  return p.hinge + p.span_ratio * me.radius(e) * p.span_axis + me.offset(e) * ec;
}

/// Energy function h = q̇·∂T/∂q̇ − T of one wing's masses, T the kinetic energy in the inertial
/// frame (body at constant velocity and rates). Written from energies alone, with point velocities
/// by central differences of positions: independent of the drive's acceleration algebra.
double energy_function(const Model& model, Side side, double t) {
  const WingMotion& m = model.motion(side);
  const MassElements& me = model.mass();
  const double eps = 1e-5 * model.period();
  const WingPose p = wing_pose(m, t), pp = wing_pose(m, t + eps), pm = wing_pose(m, t - eps);
  double h = 0.0;
  for (Eigen::Index e = 0; e < me.size(); ++e) {
    const Eigen::Vector3d x = element_position(p, me, e);
    const Eigen::Vector3d v_rel =
        (element_position(pp, me, e) - element_position(pm, me, e)) / (2.0 * eps);
    const Eigen::Vector3d v = m.velocity + m.rates.cross(x) + v_rel;
    const double mass = me.mass(e);
    h += mass * v.dot(v_rel) - 0.5 * mass * v.squaredNorm();
    // Thin strip: I_s = m c²/12 about e_s, I_c = m(λΔr)²/12 about e_c, I_n = I_s + I_c.
    const Eigen::Vector3d ec = me.cos_twist(e) * p.chord_axis + me.sin_twist(e) * p.normal_axis;
    const Eigen::Vector3d en = me.cos_twist(e) * p.normal_axis - me.sin_twist(e) * p.chord_axis;
    const double lam = p.span_ratio, j = me.stretch_inertia(e);
    const double is = me.chord_inertia(e), ic = j * lam * lam;
    const Eigen::Vector3d w = p.omega;
    const Eigen::Vector3d iw =
        is * w.dot(p.span_axis) * p.span_axis + ic * w.dot(ec) * ec + (is + ic) * w.dot(en) * en;
    h += iw.dot(p.omega_rel) - 0.5 * iw.dot(w);
    // Stretching energy ½(mΔr²/12)λ̇²: q̇·∂T/∂q̇ − T = ½ J λ̇².
    h += 0.5 * j * p.span_ratio_rate * p.span_ratio_rate;
  }
  return h;
}

double max_abs(const RunSummary& r, double (*f)(const HistoryRow&)) {
  double m = 0.0;
  for (const HistoryRow& h : r.history) m = std::max(m, std::abs(f(h)));
  return m;
}

}  // namespace

TEST_CASE("a uniform plate's stroke torque is I·φ̈ with the exact stroke-axis inertia") {
  // analytic: I = m[R²/3 + (c²/12 + (½ − x₀)²c²)cos²ψ] about the stroke axis, whatever the strip
  // count and spacing; with ψ constant and no deviation the inertial stroke torque is I φ̈.
  for (const double psi : {0.0, 35.0 * kDegree, 90.0 * kDegree}) {
    for (const auto& [count, spacing] :
         {std::pair{3, StripSpacing::uniform}, std::pair{7, StripSpacing::cosine},
          std::pair{40, StripSpacing::cosine}}) {
      const Model model(plate(psi, count, spacing));
      const double m = 0.002, R = 0.1, c = 0.03, x0 = 0.3;
      const double inertia = m * (R * R / 3.0 + (c * c / 12.0 + (0.5 - x0) * (0.5 - x0) * c * c) *
                                                    std::cos(psi) * std::cos(psi));
      const RunSummary r = simulate(model);
      REQUIRE(!r.history.empty());
      const double omega = 2.0 * kPi * 10.0, amplitude = inertia * 50.0 * kDegree * omega * omega;
      double peak = 0.0;
      for (const HistoryRow& h : r.history) {
        const double t = h.loads.time;
        const double accel = model.motion(Side::right).stroke.at(t, 10.0).accel;
        for (int s = 0; s < 2; ++s) {
          CAPTURE(psi);
          CAPTURE(count);
          CHECK(std::abs(h.loads.drive[static_cast<std::size_t>(s)].torque_inertial[0] -
                         inertia * accel) <= 1e-12 * amplitude);
        }
        peak = std::max(peak, std::abs(h.loads.drive[0].torque_inertial[0]));
      }
      // The samples include the stroke's turning points: the amplitude I φ₀ ω² (analytic).
      CHECK(test::close(peak, amplitude, 1e-12));
    }
  }
}

TEST_CASE("the inertial work over a half-stroke is the change of kinetic energy") {
  // analytic: body at rest, so Σ τ_inertial q̇ = dT/dt and T = ½ I φ̇² for the plate.
  const Model model(plate(20.0 * kDegree, 10, StripSpacing::cosine));
  const RunSummary r = simulate(model);
  const int n = model.simulation().samples_per_cycle;
  // Last cycle: rows from index size − n. A quarter period runs from φ̇ = max to φ̇ = 0 when the
  // stroke is φ₀ cos ωt... the cycle phase of each row tells which; integrate by Simpson's rule
  // over the half-stroke from the first row of the cycle (n/2 intervals).
  const std::size_t first = r.history.size() - static_cast<std::size_t>(n);
  const int half = n / 2;
  double work = 0.0;
  const double dt = model.period() / n;
  for (int i = 0; i <= half; ++i) {
    const double w = (i == 0 || i == half) ? 1.0 : (i % 2 ? 4.0 : 2.0);
    const HistoryRow& h = i < half ? r.history[first + static_cast<std::size_t>(i)]
                                   : r.history[first + static_cast<std::size_t>(i)];
    work += w * h.loads.drive[0].power_inertial;
  }
  work *= dt / 3.0;
  auto kinetic = [&](double t) { return energy_function(model, Side::right, t); };
  const double t0 = r.history[first].loads.time, t1 = t0 + 0.5 * model.period();
  const double quarter = model.period() / 4.0;
  const double scale = std::abs(kinetic(t0 + quarter)) + std::abs(kinetic(t0));
  CHECK(std::abs(work - (kinetic(t1) - kinetic(t0))) <= 1e-7 * scale);
  // And over a quarter stroke, where the energy does change.
  double quarter_work = 0.0;
  const int q = n / 4;
  for (int i = 0; i <= q; ++i) {
    const double w = (i == 0 || i == q) ? 1.0 : (i % 2 ? 4.0 : 2.0);
    quarter_work +=
        w * r.history[first + static_cast<std::size_t>(i)].loads.drive[0].power_inertial;
  }
  quarter_work *= dt / 3.0;
  const double change = kinetic(t0 + quarter) - kinetic(t0);
  CHECK(std::abs(change) > 0.1 * scale);
  CHECK(std::abs(quarter_work - change) <= 1e-7 * scale);
}

TEST_CASE("joint powers sum to the actuator plus inertial power; inertial power is dh/dt") {
  // Σ_j τ_aero,j q̇_j = −Σ(F·v_rel + C·ω_rel) (the actuator power) to round-off for any axes;
  // Σ_j τ_inertial,j q̇_j = d/dt(q̇·∂T/∂q̇ − T) (Lagrange's equations; analytic), checked against
  // central differences of the energy function written from energies alone.
  const Model model(busy_bat());
  const RunSummary r = simulate(model);
  REQUIRE(has_results(r.status));
  const double p_scale =
      max_abs(r, [](const HistoryRow& h) { return std::abs(h.loads.power_actuator); });
  const double i_scale =
      std::max(max_abs(r, [](const HistoryRow& h) { return h.loads.drive[0].power_inertial; }),
               max_abs(r, [](const HistoryRow& h) { return h.loads.drive[1].power_inertial; }));
  REQUIRE(i_scale > 0.0);
  const double delta = 1e-4 * model.period();
  for (const HistoryRow& h : r.history) {
    const LoadSample& l = h.loads;
    double aero = 0.0, total = 0.0;
    for (const WingDriveSample& d : l.drive)
      for (std::size_t j = 0; j < 5; ++j) {
        aero += d.torque_aero[j] * d.rate[j];
        total += d.torque[j] * d.rate[j];
      }
    CHECK(std::abs(aero - l.power_actuator) <= 1e-12 * p_scale);
    CHECK(std::abs(total - (l.power_actuator + l.power_inertial)) <= 1e-12 * (p_scale + i_scale));
    CHECK(std::abs(total - l.power_mechanical) <= 1e-12 * (p_scale + i_scale));
    for (int s = 0; s < 2; ++s) {
      const Side side = static_cast<Side>(s);
      const double dh = (energy_function(model, side, l.time + delta) -
                         energy_function(model, side, l.time - delta)) /
                        (2.0 * delta);
      CHECK(std::abs(l.drive[static_cast<std::size_t>(s)].power_inertial - dh) <= 1e-5 * i_scale);
    }
  }
}

TEST_CASE("without body rates the cycle means of inertial force, moment and power vanish") {
  // analytic: periodic momentum, angular momentum and energy (forward velocity allowed).
  for (ModelSpec s : {samples::hover_insect(), samples::forward_bat(), samples::rolling_bat()}) {
    s.wing_mass.total = 0.001;
    s.wing_mass.points = {{0.9, 0.3, 0.0005}};
    s.gait.plunge = harmonic(0.0, 0.005, 0.0);
    s.simulation.samples_per_cycle = 200;
    const RunSummary r = simulate(Model(s));
    CAPTURE(s.title);
    const double f = max_abs(r, [](const HistoryRow& h) { return h.loads.inertial.force.norm(); });
    const double m = max_abs(r, [](const HistoryRow& h) { return h.loads.inertial.moment.norm(); });
    const double p = max_abs(r, [](const HistoryRow& h) { return h.loads.power_inertial; });
    REQUIRE(f > 0.0);
    CHECK(r.averages.inertial_mean.force.norm() <= 1e-9 * f);
    CHECK(r.averages.inertial_mean.moment.norm() <= 1e-9 * m);
    CHECK(std::abs(r.averages.power_inertial_mean) <= 1e-9 * p);
    // Perfect storage returns the inertial work: the mean mechanical power is the actuator's.
    CHECK(std::abs(r.averages.power_mechanical_storage_perfect - r.averages.power_actuator_mean) <=
          1e-9 * (std::abs(r.averages.power_actuator_mean) + p));
    CHECK(r.averages.power_mechanical_storage_none >= r.averages.power_mechanical_storage_perfect);
  }
}

TEST_CASE("a symmetric gait's inertial Y, L, N vanish; swapping the sides flips them") {
  // property of the mirror construction (DESIGN §2)
  ModelSpec sym = samples::forward_bat();
  sym.wing_mass.total = 0.01;
  const RunSummary a = simulate(Model(sym));
  const double f = max_abs(a, [](const HistoryRow& h) { return h.loads.inertial.force.norm(); });
  const double m = max_abs(a, [](const HistoryRow& h) { return h.loads.inertial.moment.norm(); });
  for (const HistoryRow& h : a.history) {
    CHECK(std::abs(h.loads.inertial.force.y()) <= 1e-12 * f);
    CHECK(std::abs(h.loads.inertial.moment.x()) <= 1e-12 * m);
    CHECK(std::abs(h.loads.inertial.moment.z()) <= 1e-12 * m);
  }
  ModelSpec roll = samples::rolling_bat();
  roll.wing_mass.total = 0.01;
  ModelSpec swapped = roll;
  std::swap(swapped.gait.left, swapped.gait.right);
  const RunSummary b = simulate(Model(roll)), c = simulate(Model(swapped));
  REQUIRE(b.history.size() == c.history.size());
  double y_max = 0.0;
  for (std::size_t i = 0; i < b.history.size(); ++i) {
    const Wrench& u = b.history[i].loads.inertial;
    const Wrench& v = c.history[i].loads.inertial;
    y_max = std::max(y_max, std::abs(u.force.y()));
    CHECK(std::abs(u.force.y() + v.force.y()) <= 1e-12 * f);
    CHECK(std::abs(u.moment.x() + v.moment.x()) <= 1e-12 * m);
    CHECK(std::abs(u.moment.z() + v.moment.z()) <= 1e-12 * m);
    CHECK(std::abs(u.force.x() - v.force.x()) <= 1e-12 * f);
    CHECK(std::abs(u.moment.y() - v.moment.y()) <= 1e-12 * m);
  }
  CHECK(y_max > 1e-3 * f);  // the asymmetric gait does shake the body sideways
}

TEST_CASE("massless wings: every existing result is unchanged and the inertial parts are zero") {
  const ModelSpec s = samples::forward_bat();
  const RunSummary r = simulate(Model(s));
  for (const HistoryRow& h : r.history) {
    CHECK(h.loads.inertial.force.norm() == 0.0);
    CHECK(h.loads.power_inertial == 0.0);
    CHECK(h.loads.power_mechanical == doctest::Approx(h.loads.power_actuator).epsilon(1e-12));
  }
}

namespace {
/// A fixed rectangular wing at zero pitch in a stream V along −x (body flying at +V).
ModelSpec fixed_wing(double speed) {
  ModelSpec s;
  s.title = "fixed wing in a stream (check case)";
  s.wing.shape = PlanformShape::rectangular;
  s.wing.span = 0.2;
  s.wing.chord = 0.05;
  s.strips.count = 8;
  s.gait.frequency = 5.0;
  s.flight.velocity = {speed, 0.0, 0.0};
  s.simulation.max_cycles = 2;
  return s;
}
}  // namespace

TEST_CASE("profile drag of a fixed wing is ½ρU²S·C_D0, constant or Blasius") {
  // analytic: a flat wing at zero incidence carries no lift, only its profile drag; the Blasius
  // laminar flat plate gives C_D0 = 2·1.328/√Re on both faces (Blasius 1908), floored at Re = 100.
  const double S = 0.2 * 0.05;
  for (const ModelKind kind :
       {ModelKind::quasi_steady, ModelKind::wagner, ModelKind::lifting_line}) {
    ModelSpec s = fixed_wing(5.0);
    s.aero.kind = kind;
    s.aero.profile_drag.law = ProfileDragLaw::constant;
    s.aero.profile_drag.coefficient = 0.03;
    const RunSummary r = simulate(Model(s));
    const double rho = r.air_density;
    const double expected = -2.0 * 0.5 * rho * 25.0 * S * 0.03;  // both wings
    CHECK(test::close(r.averages.mean.force.x(), expected, 1e-12));
    CHECK(test::close(r.averages.profile_drag_mean.x(), expected, 1e-12));
    CHECK(std::abs(r.averages.mean.force.z()) <= 1e-12 * std::abs(expected));
    // The drag's power goes into the air: D·V.
    CHECK(test::close(r.averages.power_air_mean, -expected * 5.0, 1e-12));
  }
  const double rho = Air{}.density, nu = Air{}.kinematic_viscosity;
  for (const double re : {2.0e4, 50.0}) {
    const double speed = re * nu / 0.05;
    ModelSpec s = fixed_wing(speed);
    s.air.density = rho;
    s.air.kinematic_viscosity = nu;
    s.aero.profile_drag.law = ProfileDragLaw::blasius;
    const RunSummary r = simulate(Model(s));
    const double cd0 = 2.656 / std::sqrt(std::max(re, 100.0));
    CHECK(test::close(r.averages.mean.force.x(), -rho * speed * speed * S * cd0, 1e-12));
  }
}

TEST_CASE("in the quasi-steady model profile drag lowers the mean X by exactly its own mean") {
  // The quasi-steady loads are a sum of independent terms (DESIGN §4).
  ModelSpec s = samples::forward_bat();
  const RunSummary a = simulate(Model(s));
  s.aero.profile_drag.law = ProfileDragLaw::blasius;
  const RunSummary b = simulate(Model(s));
  CHECK(b.averages.profile_drag_mean.x() < 0.0);
  CHECK(std::abs(b.averages.mean.force.x() - a.averages.mean.force.x() -
                 b.averages.profile_drag_mean.x()) <= 1e-12 * a.averages.force_rms);
  CHECK(std::abs(b.averages.mean.force.z() - a.averages.mean.force.z() -
                 b.averages.profile_drag_mean.z()) <= 1e-12 * a.averages.force_rms);
}

TEST_CASE("with a vehicle attitude the wing's weight loads the joints: m g R/2 on the deviation") {
  // analytic: a uniform plate held level (stroke, deviation and pitch constant, body level and at
  // rest) carries its weight about the deviation axis, τ = m g r̄ with r̄ = R/2 the centre of mass
  // (uniform strips); the stroke axis is vertical, so it carries none. Standard gravity
  // 9.80665 m/s² (CGPM 1901).
  ModelSpec s = plate(0.0, 9, StripSpacing::cosine);
  s.gait.right.stroke = s.gait.left.stroke = harmonic(0.0, 0.0, 0.0);
  s.gait.right.pitch = s.gait.left.pitch = harmonic(0.0, 5.0 * kDegree, 0.0);  // pitch moves
  VehicleSpec v;
  v.mass = 0.05;
  v.ixx = v.iyy = v.izz = 1e-5;
  s.vehicle = v;
  const RunSummary with = simulate(Model(s));
  const double expected = 0.002 * kStandardGravity * 0.1 / 2.0;
  for (const HistoryRow& h : with.history)
    for (const WingDriveSample& d : h.loads.drive) {
      CHECK(test::close(d.torque_gravity[1], expected, 1e-12));
      CHECK(std::abs(d.torque_gravity[0]) <= 1e-12 * expected);
      CHECK(test::close(d.torque_gravity[4], -0.002 * kStandardGravity,
                        1e-12));  // plunge holds it up
      CHECK(test::close(d.torque[1], d.torque_aero[1] + d.torque_inertial[1] + d.torque_gravity[1],
                        1e-12));
    }
  s.vehicle.reset();  // without a vehicle there is no attitude: no gravity part
  const RunSummary without = simulate(Model(s));
  for (const HistoryRow& h : without.history)
    for (const WingDriveSample& d : h.loads.drive) CHECK(d.torque_gravity[1] == 0.0);
}
