// Momentum-theory inflow (DESIGN §9): the converged w₀ satisfies its momentum relation with the
// run's own mean force; the span disc reproduces Prandtl's elliptic induced drag at high speed.
#include <doctest/doctest.h>

#include <cmath>

#include "flapline/common/errors.hpp"
#include "flapline/common/math.hpp"
#include "flapline/samples/samples.hpp"
#include "flapline/simulation/integrate.hpp"
#include "test_support.hpp"

using namespace flapline;

namespace {
/// Glauert's relation written out: 2ρA·w₀·√(V_p² + (V_n + w₀)²) = T (Glauert 1926; hover:
/// Rankine–Froude w₀ = √(T/(2ρA))).
double glauert_thrust(double rho, double area, double w0, double vp, double vn) {
  return 2.0 * rho * area * w0 * std::sqrt(vp * vp + (vn + w0) * (vn + w0));
}

/// A tight cycle tolerance at a coarse resolution (the relation holds at any resolution; the
/// sanitizer build runs these too).
ModelSpec tight(ModelSpec s) {
  s.simulation.tolerance = 1e-9;
  s.simulation.max_cycles = 400;
  s.strips.count = 8;
  s.simulation.steps_per_cycle = 200;
  s.simulation.samples_per_cycle = 40;
  return s;
}
}  // namespace

TEST_CASE("hover: the stroke disc's w0 satisfies Rankine-Froude with the run's own thrust") {
  for (const ModelKind kind :
       {ModelKind::quasi_steady, ModelKind::wagner, ModelKind::lifting_line}) {
    ModelSpec s = tight(samples::hover_insect());
    s.aero.kind = kind;
    const RunSummary off = simulate(Model(s));
    s.aero.inflow = InflowModel::stroke_disc;
    const RunSummary on = simulate(Model(s));
    CAPTURE(to_string(kind));
    REQUIRE(on.status == RunStatus::converged);
    REQUIRE(on.inflow);
    const InflowResult& r = *on.inflow;
    // Disc area Φ R² for the pair (Ellington 1984, Part V — from memory); Φ = 120° here.
    CHECK(test::close(r.area, (120.0 * kDegree) * 0.05 * 0.05, 1e-12));
    // T is the mean lift for a level stroke plane, and w0 points down (+z).
    CHECK(test::close(r.thrust, on.mean_lift(), 1e-12));
    CHECK(r.velocity.z() > 0.0);
    CHECK(test::close(glauert_thrust(on.air_density, r.area, r.w0, 0.0, 0.0), r.thrust, 1e-8));
    CHECK(test::close(r.w0, std::sqrt(r.thrust / (2.0 * on.air_density * r.area)), 1e-8));
    // The downwash lowers the angle of attack: hover lift falls.
    CHECK(on.mean_lift() < 0.99 * off.mean_lift());
    // Rankine–Froude: the induced power T·w0 equals T^{3/2}/√(2ρA) at the converged w0.
    CHECK(test::close(r.induced_power, r.ideal_power, 1e-8));
  }
}

TEST_CASE("slow flight and climb: the stroke disc's w0 satisfies Glauert's relation") {
  for (const Eigen::Vector3d& velocity :
       {Eigen::Vector3d(1.5, 0.0, 0.0), Eigen::Vector3d(0.5, 0.0, -0.8)}) {
    ModelSpec s = tight(samples::hover_insect());
    s.aero.kind = ModelKind::wagner;
    s.gait.stroke_plane_angle = 20.0 * kDegree;
    s.flight.velocity = velocity;
    s.aero.inflow = InflowModel::stroke_disc;
    const RunSummary on = simulate(Model(s));
    REQUIRE(on.status == RunStatus::converged);
    const InflowResult& r = *on.inflow;
    const Eigen::Vector3d n = rotation_y(20.0 * kDegree) * Eigen::Vector3d::UnitZ();
    const Eigen::Vector3d stream = -velocity;  // air relative to the body
    const double vn = stream.dot(n), vp = (stream - vn * n).norm();
    CHECK(test::close(r.velocity.normalized().dot(n), 1.0, 1e-12));
    CHECK(test::close(r.thrust, -on.averages.mean.force.dot(n), 1e-12));
    CHECK(test::close(glauert_thrust(on.air_density, r.area, r.w0, vp, vn), r.thrust, 1e-8));
    CHECK(on.warnings.empty() == (vn >= 0.0));  // no descent warning in level flight or climb
  }
}

TEST_CASE("descent through the stroke disc is warned about (vortex-ring state)") {
  // Momentum theory fails when the stream meets the disc against the induced flow (common
  // practice; e.g. Glauert 1926 on the windmill brake and vortex-ring states).
  ModelSpec s = samples::hover_insect();
  s.simulation.max_cycles = 4;          // the warning needs no converged run
  s.flight.velocity = {0.3, 0.0, 0.4};  // sinking: the air comes up through the disc
  s.aero.inflow = InflowModel::stroke_disc;
  const RunSummary r = simulate(Model(s));
  bool warned = false;
  for (const std::string& w : r.warnings)
    warned = warned || w.find("vortex-ring") != std::string::npos;
  CHECK(warned);
}

TEST_CASE("span disc at high speed: induced drag tends to Prandtl's elliptic-wing value") {
  // analytic: w0 = L/(2ρA√(V² + w0²)) with A = πb²/4 gives L·w0/V → L²/(½ρV²πb²) (Prandtl 1918),
  // to within (w0/V)²/2.
  ModelSpec s = tight(samples::forward_bat());
  s.flight.velocity = {20.0, 0.0, 0.0};
  s.gait.right.pitch.mean = s.gait.left.pitch.mean = 100.0 * kDegree;
  const RunSummary off = simulate(Model(s));
  REQUIRE(off.mean_lift() > 0.0);
  s.aero.inflow = InflowModel::span_disc;
  const RunSummary on = simulate(Model(s));
  REQUIRE(on.status == RunStatus::converged);
  const InflowResult& r = *on.inflow;
  const double V = 20.0, rho = on.air_density, b = 2.0 * (0.03 + 0.25);
  CHECK(test::close(r.area, kPi * b * b / 4.0, 1e-12));
  const double lift = r.thrust;
  CHECK(lift > 0.1);
  CHECK(test::close(glauert_thrust(rho, r.area, r.w0, V, 0.0), lift, 1e-8));
  const double induced_drag = lift * r.w0 / V;
  const double prandtl = lift * lift / (0.5 * rho * V * V * kPi * b * b);
  const double ratio = r.w0 / V;
  CHECK(ratio < 0.02);
  CHECK(std::abs(induced_drag / prandtl - 1.0) <= 0.5 * ratio * ratio * 1.01);
  // The downwash lowers the wing's angle of attack: the mean lift falls.
  CHECK(on.mean_lift() < off.mean_lift());
  CHECK(on.mean_lift() > 0.0);
}

TEST_CASE("inflow options that cannot apply are refused") {
  ModelSpec s = samples::hover_insect();
  s.aero.inflow = InflowModel::stroke_disc;
  s.gait.stroke_plane_angle = 60.0 * kDegree;
  CHECK_THROWS_AS(Model{s}, InputError);
  s = samples::forward_bat();
  s.aero.kind = ModelKind::lifting_line;
  s.aero.inflow = InflowModel::span_disc;
  CHECK_THROWS_AS(Model{s}, InputError);
  s = samples::hover_insect();
  s.aero.inflow = InflowModel::span_disc;  // no airspeed
  CHECK_THROWS_AS(Model{s}, InputError);
  s.gait.right.stroke.amplitude = s.gait.left.stroke.amplitude = 0.0;  // a fixed wing
  s.aero.inflow = InflowModel::stroke_disc;
  CHECK_THROWS_AS(Model{s}, InputError);
}
