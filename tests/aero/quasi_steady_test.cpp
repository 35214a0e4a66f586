// Quasi-steady model (DESIGN §4, model 1) against closed forms.
#include <doctest/doctest.h>

#include <cmath>

#include "flapline/common/math.hpp"
#include "flapline/samples/samples.hpp"
#include "flapline/simulation/integrate.hpp"
#include "test_support.hpp"

using namespace flapline;

namespace {
// Right wing's mean force of a steady revolving wing.
Eigen::Vector3d revolving_force(ModelSpec spec) {
  return simulate(Model(std::move(spec))).averages.wing_mean[0].force;
}
}  // namespace

TEST_CASE("revolving wing: lift = ½ρ C_L(α) Ω² ∫c r² dr for every coefficient law") {
  // analytic: a section at radius r of a wing revolving at Ω about an axis through the hinge sees
  // the in-plane speed U = Ωr at incidence α (the pitch), so its lift per unit span is
  // ½ρU²c·C_L(α); integrating over the span gives ½ρC_L(α)Ω²∫c r² dr, and likewise for the drag.
  // The thin-airfoil law gives C_L = 2π sin α with full suction (normal force πρcU²sin α cos α
  // plus suction πρcU²sin²α along the chord: their vertical sum) and 2π sin α cos²α, drag
  // C_D = 2π sin²α cos α without suction (thin-airfoil theory, Glauert 1926; DESIGN §4).
  // 40 uniform strips: the midpoint rule's error on ∫r² is Δr²/(4R²) = 1.6e-4, inside 0.5 %.
  const double omega = 12.0, rho = 1.225;
  const ModelSpec base = samples::revolving_wing(omega, 0.0);
  const double c = base.wing.chord, R = base.wing.span;
  const double inertia = c * R * R * R / 3.0;  // ∫c r² dr
  const double q = 0.5 * rho * omega * omega * inertia;
  for (double alpha_deg : {5.0, 15.0, 30.0, 45.0}) {
    const double a = alpha_deg * kDegree;
    ModelSpec s = samples::revolving_wing(omega, a);
    CAPTURE(alpha_deg);
    SUBCASE("thin_airfoil, suction recovery 1") {
      const Eigen::Vector3d f = revolving_force(s);
      CHECK(test::close(-f.z(), q * 2 * kPi * std::sin(a), 5e-3));
      CHECK(std::abs(f.x()) < 1e-9 * std::abs(f.z()));  // no drag with full suction
    }
    SUBCASE("thin_airfoil, suction recovery 0") {
      s.aero.suction_recovery = 0.0;
      const Eigen::Vector3d f = revolving_force(s);
      CHECK(test::close(-f.z(), q * 2 * kPi * std::sin(a) * std::cos(a) * std::cos(a), 5e-3));
      CHECK(test::close(-f.x(), q * 2 * kPi * std::sin(a) * std::sin(a) * std::cos(a), 5e-3));
    }
    SUBCASE("revolving_fit (Dickinson, Lehmann & Sane 1999)") {
      s.aero.law = CoefficientLaw::revolving_fit;
      const RevolvingFit fit;
      const Eigen::Vector3d f = revolving_force(s);
      CHECK(test::close(-f.z(), q * fit.lift_coefficient(a), 5e-3));
      CHECK(test::close(-f.x(), q * fit.drag_coefficient(a), 5e-3));
    }
  }
}

TEST_CASE("a wing sweeping forward with its leading edge up lifts; leading edge down pushes down") {
  // Sign convention pinned (DESIGN §2): lift = −Z.
  CHECK(-revolving_force(samples::revolving_wing(10.0, 0.2)).z() > 0.0);
  CHECK(-revolving_force(samples::revolving_wing(10.0, -0.2)).z() < 0.0);
}

TEST_CASE("quasi-steady with full suction gives no mean power to still air") {
  // DESIGN §4: the circulatory forces with the couple's U_t term do work πρcU_t w_E(w_¾ − w_E),
  // zero without lag, and the added mass does the work of an exact derivative (analytic).
  ModelSpec s = samples::hover_insect();
  s.aero.suction_recovery = 1.0;
  const RunSummary r = simulate(Model(s));
  CHECK(std::abs(r.averages.power_air_mean) < 1e-9 * r.averages.power_air_peak);
  // Dropping the suction adds πρcU_t w_S² > 0 (DESIGN §4).
  s.aero.suction_recovery = 0.0;
  CHECK(simulate(Model(s)).averages.power_air_mean > 0.0);
}

TEST_CASE("added-mass power of a rigid wing in still air averages to zero over a cycle") {
  // analytic: in still air q_mid·e_n = w_½, so the added-mass force does work
  // m_a (dw_½/dt) w_½ = d/dt(½ m_a w_½²) per unit span, and the couple's ω̇_s part
  // (π/8)ρb⁴ ω̇_s ω_s = d/dt((π/16)ρb⁴ω_s²): exact derivatives of periodic functions.
  const Model model(samples::hover_insect());
  Workspace ws(model);
  const int samples = 1000;
  const double rho = model.air().density;
  double sum = 0.0, sum_sq = 0.0;
  for (int j = 0; j < samples; ++j) {
    const double t = j * model.period() / samples;
    update_sections(model, ws, t);
    attach_aero(model, ws).loads(model, ws, t, ws.state);
    double p = 0.0;
    for (Eigen::Index k = 0; k < model.strip_count(); ++k) {
      const auto& sec = ws.sections[static_cast<std::size_t>(k)];
      const auto& pose = ws.poses[k < model.strips_per_wing() ? 0 : 1];
      const double b = 0.5 * model.pair().chord(k);
      const double width = pose.span_ratio * model.pair().width(k);
      p += ws.loads.force_mid.col(k).dot(sec.q_mid) +
           width * 0.125 * kPi * rho * std::pow(b, 4) * pose.omega_s_dot * pose.omega_s;
    }
    sum += p;
    sum_sq += p * p;
  }
  const double mean = sum / samples, rms = std::sqrt(sum_sq / samples);
  CHECK(rms > 0.0);
  CHECK(std::abs(mean) < 1e-9 * rms);  // uniform samples of a smooth periodic derivative
}
