// Trim, derivatives and flight modes against analytic results (DESIGN §9). Cases come from YAML
// text through io::CaseLoader, as on the command line.
#include <doctest/doctest.h>

#include <cmath>
#include <memory>

#include "flapline/common/errors.hpp"
#include "flapline/common/math.hpp"
#include "flapline/io/config.hpp"
#include "flapline/studies/derivatives.hpp"
#include "flapline/studies/modes.hpp"
#include "flapline/studies/trim.hpp"
#include "test_support.hpp"

using namespace flapline;
using namespace flapline::studies;

namespace {

const std::vector<std::string> kInner{"simulation.start=periodic", "simulation.tolerance=1e-9"};

std::unique_ptr<io::CaseLoader> hover(std::vector<std::string> sets = {}) {
  sets.insert(sets.end(), kInner.begin(), kInner.end());
  return std::make_unique<io::CaseLoader>(test::source_path("configs/hover_insect.yaml"), sets);
}

CaseBuilderFactory factory(const io::CaseLoader& l) {
  return io::case_builders(l);
}

Parameter key(const io::CaseLoader& l, const std::string& k, double lo = -1e300,
              double hi = 1e300) {
  Parameter p;
  p.name = k;
  p.base = *l.number_at(k);
  p.low = lo;
  p.high = hi;
  return p;
}

/// An invented fixed wing in a stream, thin-airfoil strips, no flapping (the derivative check).
const char* const kFixedWing = R"(
title: fixed rectangular wing in a stream (test)
wing: {planform: rectangular, span: 0.5, chord: 0.1, pitch_axis: 0.25, strips: 8}
gait: {frequency: 5}
flight: {velocity: [10.0, 0.0, 0.0]}
model: {kind: quasi_steady}
simulation: {steps_per_cycle: 40, samples_per_cycle: 20}
)";

}  // namespace

TEST_CASE("trim: quasi-steady hover lift target gives f* = f·sqrt(L*/L)") {
  const auto l = hover();
  const RunSummary base = evaluate({CaseSpec{}}, factory(*l), {}).front();
  const double target = 0.8 * base.mean_lift();
  TrimOptions o;
  const TrimResult r = trim({key(*l, "gait.frequency", 10, 40)}, {{"cycle_mean.lift_N", target}},
                            {}, factory(*l), o);
  CHECK(r.status == TrimStatus::trimmed);
  // analytic: every load term scales with f² in still air with the body at rest.
  const double expected = 25.0 * std::sqrt(target / base.mean_lift());
  CHECK(std::abs(r.values(0) - expected) <= 1e-8 * expected);
}

TEST_CASE("trim recovers left and right stroke amplitudes from their mean wrench") {
  const auto l = hover();
  // The wrench of a known asymmetric gait is the target; start elsewhere.
  const CaseSpec known{
      {{"gait.left.stroke.amplitude", "52", false}, {"gait.right.stroke.amplitude", "58", false}}};
  const RunSummary ref = evaluate({known}, factory(*l), {}).front();
  std::vector<Parameter> free{key(*l, "gait.left.stroke.amplitude", 40, 70),
                              key(*l, "gait.right.stroke.amplitude", 40, 70)};
  const TrimResult r = trim(free,
                            {{"cycle_mean.lift_N", ref.mean_lift()},
                             {"cycle_mean.L_roll_Nm", ref.averages.mean.moment.x()}},
                            {}, factory(*l), {});
  CHECK(r.status == TrimStatus::trimmed);
  CHECK(r.values(0) == doctest::Approx(52.0).epsilon(1e-6));
  CHECK(r.values(1) == doctest::Approx(58.0).epsilon(1e-6));

  // The trim Jacobian and `derivatives` agree at the trim point (same central differences).
  std::vector<Parameter> at = free;
  at[0].base = r.values(0);
  at[1].base = r.values(1);
  const DerivativeTable d =
      derivatives(at, {"cycle_mean.lift_N", "cycle_mean.L_roll_Nm"}, {}, factory(*l), {});
  for (int i = 0; i < 2; ++i)
    for (int j = 0; j < 2; ++j)
      CHECK(r.jacobian(i, j) == doctest::Approx(d.value(i, j)).epsilon(1e-3));  // two step sizes
}

TEST_CASE("an unreachable target: not_reachable with the active bound, never trimmed") {
  const auto l = hover();
  const RunSummary base = evaluate({CaseSpec{}}, factory(*l), {}).front();
  const TrimResult r = trim({key(*l, "gait.frequency", 20, 30)},
                            {{"cycle_mean.lift_N", 10.0 * base.mean_lift()}}, {}, factory(*l), {});
  CHECK(r.status == TrimStatus::not_reachable);
  REQUIRE(r.active_bounds.size() == 1u);
  CHECK(r.active_bounds[0].find("upper bound 30") != std::string::npos);
  CHECK(r.values(0) == 30.0);
}

TEST_CASE("derivatives: f² and density laws, symmetry, Richardson") {
  const auto l = hover();
  const DerivativeTable t =
      derivatives({key(*l, "gait.frequency"), key(*l, "gait.stroke.amplitude")},
                  derivative_quantities(), {}, factory(*l), {});
  const double Z = t.base.averages.mean.force.z();
  // analytic: Z̄ ∝ f² in quasi-steady hover, so ∂Z̄/∂f = 2Z̄/f.
  CHECK(t.value(2, 0) == doctest::Approx(2.0 * Z / 25.0).epsilon(1e-6));
  // A symmetric gait and a symmetric parameter: no side force, roll or yaw.
  for (int i : {1, 3, 5})
    for (int j : {0, 1}) {
      CHECK(std::abs(t.value(i, j)) <= 1e-12 * std::abs(t.value(2, 0)));
      CHECK_FALSE(t.flagged(i, j));
    }
  CHECK(t.scheme[0] == "central");

  // analytic: every load is proportional to the density (∂loads/∂ρ = loads/ρ).
  const auto dense = hover({"air.density=1.2"});
  const DerivativeTable r =
      derivatives({key(*dense, "air.density")}, derivative_quantities(), {}, factory(*dense), {});
  CHECK(r.value(2, 0) == doctest::Approx(r.base.averages.mean.force.z() / 1.2).epsilon(1e-9));
  CHECK(r.value(6, 0) == doctest::Approx(r.base.averages.power_actuator_mean / 1.2).epsilon(1e-9));

  // Richardson: for a smooth case the estimate shrinks about fourfold when h halves (central
  // differences, error ∝ h²): compare D(h) − D(h/2) with D(h/2) − D(h/4), for the pitch
  // amplitude (the lift is quadratic in the stroke amplitude, where the differences are exact).
  auto one = [&](double h) {
    std::vector<CaseSpec> c;
    for (double s : {h, -h}) c.push_back({{{"gait.pitch.amplitude", shortest(45.0 + s), false}}});
    const auto runs = evaluate(c, factory(*l), {});
    return (runs[0].averages.mean.force.z() - runs[1].averages.mean.force.z()) / (2 * h);
  };
  const double d1 = one(2.0), d2 = one(1.0), d4 = one(0.5);
  CHECK(std::abs(d1 - d2) / std::abs(d2 - d4) == doctest::Approx(4.0).epsilon(0.05));
}

TEST_CASE("a fixed wing at zero pitch in still air: Z_w = −πρU·S_pair (thin-airfoil strips)") {
  // analytic: lift ½ρU²S·2πα with α = w/U gives ∂Z/∂w = −πρUS (no finite-span loss in strips).
  io::CaseLoader l(kFixedWing, "fixed.yaml", ".", {});
  std::vector<Parameter> w = Parameter::flight_state();
  const DerivativeTable t = derivatives({w[2]}, {"cycle_mean.Z_N"}, {}, factory(l), {});
  const double rho = t.base.air_density, U = 10.0, S = 2 * 0.5 * 0.1;
  CHECK(t.value(0, 0) == doctest::Approx(-kPi * rho * U * S).epsilon(1e-6));
}

TEST_CASE("linear model: heave, a textbook A matrix, eigenvalues") {
  LinearModelInput in;
  in.vehicle.mass = 0.5;
  in.vehicle.ixx = 0.01;
  in.vehicle.iyy = 0.02;
  in.vehicle.izz = 0.025;
  in.force_state(2, 2) = -3.0;  // Z_w only
  const LinearModel heave = linear_model(in);
  const std::vector<Mode> modes = flight_modes(heave.A, 1.0);
  bool found = false;
  for (const Mode& m : modes)
    if (std::abs(m.real - (-3.0 / 0.5)) <= 1e-12 && m.imag == 0.0) found = true;
  CHECK(found);  // analytic: ẇ = (Z_w/m) w

  // A hand-written longitudinal A matrix (Etkin & Reid's small-perturbation equations, level
  // flight at U₀ along x, θ₀ = 0, no rates): u̇ = X_u/m u + X_w/m w − g θ, ẇ = Z_u/m u + Z_w/m w
  // + (Z_q/m + U₀) q, q̇ = (M_u u + M_w w + M_q q)/I_y, θ̇ = q.
  LinearModelInput lv;
  lv.vehicle = in.vehicle;
  lv.velocity = Eigen::Vector3d(4.0, 0.0, 0.0);
  const double Xu = -0.1, Xw = 0.2, Zu = -0.3, Zw = -2.0, Zq = -0.05, Mu = 0.01, Mw = -0.04,
               Mq = -0.02;
  lv.force_state(0, 0) = Xu;
  lv.force_state(0, 2) = Xw;
  lv.force_state(2, 0) = Zu;
  lv.force_state(2, 2) = Zw;
  lv.force_state(2, 4) = Zq;
  lv.moment_state(1, 0) = Mu;
  lv.moment_state(1, 2) = Mw;
  lv.moment_state(1, 4) = Mq;
  const LinearModel m = linear_model(lv);
  const double g = 9.80665, mass = 0.5, Iy = 0.02;
  Eigen::Matrix4d textbook;
  textbook << Xu / mass, Xw / mass, 0.0, -g,       //
      Zu / mass, Zw / mass, Zq / mass + 4.0, 0.0,  //
      Mu / Iy, Mw / Iy, Mq / Iy, 0.0,              //
      0.0, 0.0, 1.0, 0.0;
  const int idx[4] = {0, 2, 4, 7};
  for (int i = 0; i < 4; ++i)
    for (int j = 0; j < 4; ++j) CHECK(m.A(idx[i], idx[j]) == doctest::Approx(textbook(i, j)));
}

TEST_CASE("--balance in a steady turn: the residual vanishes where net force = m ω×V") {
  // A vehicle turning at Ω with rates from the turn relation; the residual subtracts m ω×V and
  // ω×(Iω): check the summary's arithmetic against the relation itself.
  const std::string text = std::string(kFixedWing) + R"(
vehicle: {mass: 0.05, inertia: {xx: 1.0e-4, yy: 2.0e-4, zz: 2.5e-4, xz: 1.0e-5},
          attitude: {roll: 20, pitch: 5}}
)";
  std::string with_turn = text;
  with_turn.replace(with_turn.find("flight: {velocity: [10.0, 0.0, 0.0]}"),
                    std::string("flight: {velocity: [10.0, 0.0, 0.0]}").size(),
                    "flight: {airspeed: 10, flight_path_angle: 0, turn_rate: 30}");
  io::CaseLoader l(with_turn, "turn.yaml", ".", {});
  const RunSummary s = evaluate({CaseSpec{}}, factory(l), {}).front();
  REQUIRE(s.vehicle);
  const Model model = l.build({});
  const Eigen::Vector3d w = model.flight().rates, V = model.flight().velocity;
  const double th = 5 * kDegree, ph = 20 * kDegree, om = 30 * kDegree;
  // The steady-turn relation (Euler-angle kinematics with φ̇ = θ̇ = 0, ψ̇ = Ω).
  CHECK((w - om * Eigen::Vector3d(-std::sin(th), std::sin(ph) * std::cos(th),
                                  std::cos(ph) * std::cos(th)))
            .norm() <= 1e-15);
  // V_B = V[cos α, 0, sin α] with α = θ − γ.
  CHECK((V - 10.0 * Eigen::Vector3d(std::cos(th), 0.0, std::sin(th))).norm() <= 1e-13);
  const Eigen::Matrix3d I = inertia_matrix(*model.vehicle());
  CHECK((s.vehicle->steady_residual.force - (s.vehicle->net.force - 0.05 * w.cross(V))).norm() <=
        1e-15);
  CHECK((s.vehicle->steady_residual.moment - (s.vehicle->net.moment - w.cross(I * w))).norm() <=
        1e-15);
  // Gravity in body axes and the lift-to-weight ratio.
  CHECK((s.vehicle->gravity_force - 0.05 * 9.80665 *
                                        Eigen::Vector3d(-std::sin(th), std::sin(ph) * std::cos(th),
                                                        std::cos(ph) * std::cos(th)))
            .norm() <= 1e-15);
  CHECK(s.vehicle->lift_to_weight == doctest::Approx(s.mean_lift() / (0.05 * 9.80665)));
}
