// Wagner lag model (DESIGN §4, model 2) against Wagner's and Theodorsen's exact results.
#include <doctest/doctest.h>

#include <cmath>
#include <complex>

#include "flapline/common/errors.hpp"
#include "flapline/common/math.hpp"
#include "flapline/reference/unsteady_theory.hpp"
#include "flapline/samples/samples.hpp"
#include "flapline/simulation/integrate.hpp"
#include "test_support.hpp"

using namespace flapline;
namespace ref = flapline::reference;

namespace {

constexpr double kSpeed = 10.0, kChord = 0.1, kSemichord = 0.05, kSpan = 0.5;

/// A fixed rectangular wing in a free stream along body x (the non-flapping mode): pitch about
/// the pitch axis and plunge of the hinge are prescribed; no span coupling in this model, so
/// every strip is a 2D section.
ModelSpec fixed_wing(double pitch_axis) {
  ModelSpec s;
  s.title = "fixed wing";
  s.wing.shape = PlanformShape::rectangular;
  s.wing.span = kSpan;
  s.wing.chord = kChord;
  s.wing.pitch_axis = pitch_axis;
  s.strips.count = 2;
  s.gait.frequency = 1.0;
  s.flight.velocity = {kSpeed, 0.0, 0.0};
  s.aero.kind = ModelKind::wagner;
  return s;
}

/// Complex amplitude of the lift per unit span / (ρU²b) of a small harmonic motion, from the
/// last cycle of a converged run: L̂ = 2i·mean(L e^{−iωt}) for L = Im(L̂ e^{iωt}).
std::complex<double> harmonic_lift(ModelSpec s, double k) {
  const double omega = k * kSpeed / kSemichord;
  s.gait.frequency = omega / (2 * kPi);
  const double semichords_per_cycle = 2 * kPi / k;
  // The slow pole e^{−0.0455 s} is below 1e-11 after 600 semichords.
  const int cycles = static_cast<int>(std::ceil(600.0 / semichords_per_cycle)) + 1;
  s.simulation.min_cycles = s.simulation.max_cycles = cycles;
  s.simulation.steps_per_cycle = 256;
  s.simulation.samples_per_cycle = 64;
  s.simulation.start = StartMode::quasi_steady;
  s.simulation.history = HistoryKeep::last_cycle;
  const Model model(s);
  const RunSummary r = simulate(model);
  REQUIRE(r.history.size() == 64u);
  std::complex<double> sum = 0.0;
  for (const HistoryRow& row : r.history) {
    const double lift = -row.loads.total.force.z() / (2 * kSpan);
    sum += lift * std::exp(std::complex<double>(0.0, -omega * row.loads.time));
  }
  const double rho = model.air().density;
  return std::complex<double>(0.0, 2.0) * sum / 64.0 / (rho * kSpeed * kSpeed * kSemichord);
}

}  // namespace

TEST_CASE("step in angle at constant speed follows the Wagner fit and the exact Wagner function") {
  // Starting from rest at a fixed pitch is the indicial (step) response: Γ(s)/Γ(∞) = w_E/w_¾
  // = φ(s), s = Ut/b. Against the fit used (R.T. Jones 1940, NACA Report 681; W.P. Jones 1945,
  // coefficients from memory, REFERENCES §6) to integration accuracy 1e-6; against the exact
  // function (Wagner 1925, computed with Boost.Math, REFERENCES §1) within each fit's own error:
  // R.T. Jones 0.0096 at s ≈ 82 (REFERENCES §1, tolerance 0.01), W.P. Jones 0.01002 at s ≈ 21.5
  // (computed with the same Boost.Math routine, tolerance 0.0105).
  for (WagnerFit fit : {WagnerFit::rt_jones, WagnerFit::wp_jones}) {
    CAPTURE(to_string(fit));
    ModelSpec s = fixed_wing(0.25);
    s.aero.wagner_fit = fit;
    const double alpha = 2.0 * kDegree;
    s.gait.right.pitch.mean = s.gait.left.pitch.mean = alpha;
    const Model model(s);
    Workspace ws(model);
    attach_aero(model, ws).initial_state(model, ws, 0.0, StartMode::rest, ws.state);
    const WagnerCoefficients c = wagner_coefficients(fit);
    const double steady = kPi * kChord * kSpeed * std::sin(alpha);  // Γ(∞) = πc·w_¾
    const double dt = 0.05 * kSemichord / kSpeed;                   // Δs = 0.05
    double worst_fit = 0.0, worst_exact = 0.0;
    for (int j = 0; j <= 2000; ++j) {  // s from 0 to 100
      const double t = j * dt, sred = kSpeed * t / kSemichord;
      evaluate(model, ws, t);
      const double ratio = ws.loads.circulation(0) / steady;
      worst_fit =
          std::max(worst_fit, std::abs(ratio - ref::wagner_fit(sred, c.a1, c.a2, c.b1, c.b2)));
      if (j % 20 == 0) worst_exact = std::max(worst_exact, std::abs(ratio - ref::wagner(sred)));
      advance(model, ws, t, dt);
    }
    CHECK(worst_fit < 1e-6);
    CHECK(worst_exact < (fit == WagnerFit::rt_jones ? 0.01 : 0.0105));
  }
}

TEST_CASE("harmonic plunge and pitch reproduce Theodorsen's lift") {
  // Theodorsen 1935 (NACA Report 496) in the form of Bisplinghoff, Ashley & Halfman 1955:
  // plunge π(−k² + 2ikC), pitch about a·b aft of mid-chord π(ik + ak²) + 2πC(1 + ik(½ − a)).
  // With C_J(k) of the R.T. Jones fit the model must agree to 1e-4 (this tests the code; the
  // amplitude 1e-3 keeps the quadratic terms, U containing w_½, near 1e-6); with the exact C(k)
  // within 2 % in amplitude and 1.2° in phase (the fit's own error, REFERENCES §1-2).
  struct Motion {
    const char* name;
    double pitch_axis;  // x₀; a = 2x₀ − 1
    bool plunge;
  };
  const Motion motions[] = {{"plunge", 0.25, true},
                            {"pitch about the quarter chord", 0.25, false},
                            {"pitch about mid-chord", 0.5, false}};
  const double amplitude = 1e-3;
  for (const Motion& m : motions) {
    for (double k : {0.05, 0.1, 0.2, 0.5, 1.0}) {
      CAPTURE(m.name);
      CAPTURE(k);
      ModelSpec s = fixed_wing(m.pitch_axis);
      WaveformSpec wave;
      wave.amplitude = m.plunge ? amplitude * kSemichord : amplitude;  // h̄/b or ᾱ = 1e-3
      if (m.plunge)
        s.gait.plunge = wave;
      else
        s.gait.right.pitch = s.gait.left.pitch = wave;
      const std::complex<double> got = harmonic_lift(s, k) / amplitude;
      const double a = 2 * m.pitch_axis - 1;
      const auto cj = ref::theodorsen_fit(k, 0.165, 0.335, 0.0455, 0.3);
      const auto c = ref::theodorsen(k);
      const auto want_fit = m.plunge ? ref::plunge_lift(k, cj) : ref::pitch_lift(k, a, cj);
      const auto want = m.plunge ? ref::plunge_lift(k, c) : ref::pitch_lift(k, a, c);
      CHECK(std::abs(got - want_fit) < 1e-4 * std::abs(want_fit));
      CHECK(std::abs(std::abs(got) / std::abs(want) - 1.0) < 0.02);
      CHECK(std::abs(std::arg(got / want)) < 1.2 * kDegree);
      MESSAGE(m.name << " k=" << k << ": amplitude error vs exact C(k) "
                     << 100 * (std::abs(got) / std::abs(want) - 1) << " %, phase error "
                     << std::arg(got / want) / kDegree << " deg");
    }
  }
}

TEST_CASE("slow motion reproduces the quasi-steady thin-airfoil model") {
  // DESIGN §4: the lag states at their steady values are the quasi-steady law; the difference in
  // mean lift shrinks in proportion to the reduced frequency (first-order lag, analytic).
  auto relative_gap = [](double frequency) {
    ModelSpec s = samples::forward_bat();
    s.gait.frequency = frequency;
    s.simulation.steps_per_cycle = 8000;  // the fast lag state needs Δt·0.3U/b < 2.5
    s.simulation.start = StartMode::quasi_steady;
    s.simulation.min_cycles = s.simulation.max_cycles = 3;
    const double qs = simulate(Model(s)).mean_lift();
    s.aero.kind = ModelKind::wagner;
    const double lag = simulate(Model(s)).mean_lift();
    return std::abs(lag - qs) / std::abs(qs);
  };
  const double g1 = relative_gap(0.06), g2 = relative_gap(0.03);  // k ≈ 0.0025 and 0.0013
  CHECK(g1 < 0.01);
  CHECK(g2 / g1 == doctest::Approx(0.5).epsilon(0.2));
}

TEST_CASE("stroke reversal passes without spikes in the lag states (hover)") {
  ModelSpec s = samples::hover_insect();
  s.aero.kind = ModelKind::wagner;
  const Model model(s);
  Workspace ws(model);
  attach_aero(model, ws).initial_state(model, ws, 0.0, StartMode::quasi_steady, ws.state);
  const int steps = s.simulation.steps_per_cycle;
  const double dt = model.period() / steps;
  const Eigen::Index n2 = model.strip_count(), k = 14;  // an outboard strip of the right wing
  std::vector<double> x1, x2, w34;
  for (int j = 0; j < 15 * steps; ++j) {
    const double t = j * dt;
    if (j >= 14 * steps) {
      x1.push_back(ws.state(k));
      x2.push_back(ws.state(n2 + k));
      update_speeds(model, ws, t);
      w34.push_back(ws.w_three_quarter(k));
    }
    advance(model, ws, t, dt);
  }
  const double w_max = std::max(std::abs(*std::max_element(w34.begin(), w34.end())),
                                std::abs(*std::min_element(w34.begin(), w34.end())));
  for (const auto* x : {&x1, &x2}) {
    const double lo = *std::min_element(x->begin(), x->end());
    const double hi = *std::max_element(x->begin(), x->end());
    double jump = 0.0;
    for (std::size_t j = 1; j < x->size(); ++j)
      jump = std::max(jump, std::abs((*x)[j] - (*x)[j - 1]));
    CHECK(jump < 0.05 * (hi - lo));  // smooth at 400 steps per cycle: no spike
    CHECK(std::max(std::abs(lo), std::abs(hi)) <= 0.335 * w_max * 1.0001);  // |x_k| <= A_k max|w_¾|
  }
}

TEST_CASE("RK4 converges with fourth order on mean lift in forward flight") {
  // Fixed-step RK4 global error O(h⁴) (common practice); forward flight keeps U away from zero.
  auto mean_lift = [](int steps) {
    ModelSpec s = samples::forward_bat();
    s.aero.kind = ModelKind::wagner;
    s.simulation.steps_per_cycle = steps;
    s.simulation.samples_per_cycle = 20;
    s.simulation.start = StartMode::quasi_steady;
    s.simulation.min_cycles = s.simulation.max_cycles = 4;
    return simulate(Model(s)).mean_lift();
  };
  const double ref_value = mean_lift(1280);
  const double e1 = std::abs(mean_lift(40) - ref_value), e2 = std::abs(mean_lift(80) - ref_value),
               e3 = std::abs(mean_lift(160) - ref_value);
  const double p1 = std::log2(e1 / e2), p2 = std::log2(e2 / e3);
  MESSAGE("observed orders " << p1 << ", " << p2);
  CHECK(p1 == doctest::Approx(4.0).epsilon(0.15));
  CHECK(p2 == doctest::Approx(4.0).epsilon(0.15));
}

TEST_CASE("mirror and swap identities hold for the wagner model") {
  ModelSpec sym = samples::forward_bat();
  sym.aero.kind = ModelKind::wagner;
  const RunSummary r = simulate(Model(sym));
  const double f = r.averages.force_rms, m = f * sym.wing.span;
  CHECK(std::abs(r.averages.mean.force.y()) <= 1e-12 * f);
  CHECK(std::abs(r.averages.mean.moment.x()) <= 1e-12 * m);
  CHECK(std::abs(r.averages.mean.moment.z()) <= 1e-12 * m);
  ModelSpec a = samples::rolling_bat();
  a.aero.kind = ModelKind::wagner;
  ModelSpec b = a;
  std::swap(b.gait.left, b.gait.right);
  const RunSummary ra = simulate(Model(a)), rb = simulate(Model(b));
  CHECK(std::abs(ra.averages.mean.moment.x() + rb.averages.mean.moment.x()) <= 1e-12 * m);
  CHECK(std::abs(ra.averages.mean.force.y() + rb.averages.mean.force.y()) <= 1e-12 * f);
  CHECK(std::abs(ra.averages.mean.moment.z() + rb.averages.mean.moment.z()) <= 1e-12 * m);
  CHECK(std::abs(ra.averages.mean.force.z() - rb.averages.mean.force.z()) <= 1e-12 * f);
}

TEST_CASE("every demo runs with the wagner model, leads with its leading edge and converges") {
  for (ModelSpec s : {samples::hover_insect(), samples::forward_bat(), samples::rolling_bat()}) {
    CAPTURE(s.title);
    s.aero.kind = ModelKind::wagner;
    const RunSummary r = simulate(Model(s));
    CHECK(r.status == RunStatus::converged);
    CHECK(r.derived.reverse_flow_fraction <= 0.05);
    CHECK(r.mean_lift() > 0.0);
    // The periodic start puts the lag states on their periodic orbit: the run stops after the
    // minimum two cycles with the cycle means of the long run from rest (to the tolerance).
    s.simulation.start = StartMode::periodic;
    const RunSummary p = simulate(Model(s));
    CHECK(p.cycles == 2);
    CHECK(p.periodicity_residual < 1e-10);
    CHECK((p.averages.mean.force - r.averages.mean.force).norm() <= 1e-4 * r.averages.force_rms);
  }
}

TEST_CASE("reverse_flow no_suction drops the suction only where U_t < 0") {
  // The revolving-wing sample carries its left wing trailing edge first (all reverse flow):
  // with no_suction its loads equal those with suction recovery 0, the right wing's are untouched.
  ModelSpec base = samples::revolving_wing(10.0, 0.2);
  base.aero.kind = ModelKind::wagner;
  base.simulation.start = StartMode::quasi_steady;
  ModelSpec alt = base;
  alt.aero.reverse_flow = ReverseFlow::no_suction;
  ModelSpec none = base;
  none.aero.suction_recovery = 0.0;
  const RunSummary rb = simulate(Model(base)), ra = simulate(Model(alt)),
                   rn = simulate(Model(none));
  CHECK(rb.derived.reverse_flow_fraction == doctest::Approx(0.5));
  const double f = rb.averages.force_rms;
  CHECK((ra.averages.wing_mean[0].force - rb.averages.wing_mean[0].force).norm() <= 1e-12 * f);
  CHECK((ra.averages.wing_mean[1].force - rn.averages.wing_mean[1].force).norm() <= 1e-12 * f);
  CHECK((ra.averages.wing_mean[1].force - rb.averages.wing_mean[1].force).norm() > 1e-3 * f);
}

TEST_CASE("too few steps for the fast lag state is refused before the run; a blow-up is named") {
  // RK4's real stability limit is 2.785 (common practice; Hairer & Wanner, Solving ODEs II):
  // with U/b·0.3·Δt ≈ 3000 the run is refused with the number of steps it needs.
  ModelSpec s = fixed_wing(0.25);
  s.wing.chord = 0.001;
  s.flight.velocity = {100.0, 0.0, 0.0};
  s.gait.right.pitch.mean = s.gait.left.pitch.mean = 0.05;
  s.simulation.steps_per_cycle = 20;
  s.simulation.samples_per_cycle = 4;
  s.simulation.integrator = Integrator::rk4;
  CHECK_THROWS_WITH_AS(simulate(Model(s)), doctest::Contains("simulation.steps_per_cycle"),
                       InputError);
  // Stepping past the limit by hand blows up: the error names time, strip and quantity.
  const Model model(s);
  Workspace ws(model);
  attach_aero(model, ws).initial_state(model, ws, 0.0, StartMode::rest, ws.state);
  auto run = [&] {
    for (int j = 0; j < 1000; ++j) advance(model, ws, j * 0.05, 0.05);
  };
  CHECK_THROWS_WITH_AS(run(), doctest::Contains("lag state"), NumericalError);
  CHECK_THROWS_WITH_AS(run(), doctest::Contains("of the right wing"), NumericalError);
}
