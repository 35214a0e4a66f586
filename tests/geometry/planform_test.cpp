// Planform area moments and the beta family (Ellington 1984, Part II).
#include <doctest/doctest.h>

#include <cmath>

#include "flapline/common/errors.hpp"
#include "flapline/common/math.hpp"
#include "flapline/geometry/planform.hpp"

using namespace flapline;

namespace {
PlanformSpec rectangle() {
  PlanformSpec s;
  s.shape = PlanformShape::rectangular;
  s.span = 0.3;
  s.chord = 0.05;
  return s;
}
}  // namespace

TEST_CASE("rectangular planform: r̂₁ = 1/2, r̂₂ = 1/√3, r̂₃ = (1/4)^{1/3}") {
  // analytic: r̂_k^k = ∫₀¹ x^k dx = 1/(k+1) for constant chord (REFERENCES §4 gives 0.5, 0.57735,
  // 0.62996).
  const Planform p(rectangle());
  CHECK(p.area() == doctest::Approx(0.015).epsilon(1e-12));
  CHECK(p.radius_moment(1) == doctest::Approx(0.5).epsilon(1e-9));
  CHECK(p.radius_moment(2) == doctest::Approx(1.0 / std::sqrt(3.0)).epsilon(1e-9));
  CHECK(p.radius_moment(3) == doctest::Approx(std::cbrt(0.25)).epsilon(1e-9));
  CHECK(p.aspect_ratio() == doctest::Approx(2 * 0.3 / 0.05).epsilon(1e-12));  // 4R²/(2S)
}

TEST_CASE("elliptic planform: analytic moments") {
  // analytic: c = c0 sqrt(1 − x²); S = π c0 R/4, ∫c r dr = c0R²/3, ∫c r² dr = π c0 R³/16,
  // ∫ c r³ dr = 2 c0 R⁴/15  =>  r̂₁ = 4/(3π), r̂₂ = 1/2, r̂₃ = (8/(15π))^{1/3}.
  PlanformSpec s;
  s.shape = PlanformShape::elliptic;
  s.span = 0.2;
  s.root_chord = 0.06;
  const Planform p(s);
  CHECK(p.area() == doctest::Approx(kPi * 0.06 * 0.2 / 4).epsilon(1e-10));
  CHECK(p.radius_moment(1) == doctest::Approx(4.0 / (3.0 * kPi)).epsilon(1e-9));
  CHECK(p.radius_moment(2) == doctest::Approx(0.5).epsilon(1e-9));
  CHECK(p.radius_moment(3) == doctest::Approx(std::cbrt(8.0 / (15.0 * kPi))).epsilon(1e-9));
  // The pair is an elliptic wing of aspect ratio (2R)²/(2S) = 8R/(π c0) (analytic).
  CHECK(p.aspect_ratio() == doctest::Approx(8 * 0.2 / (kPi * 0.06)).epsilon(1e-10));
}

TEST_CASE("tapered planform: analytic moments") {
  // analytic: c = c0 + (c1 − c0)x; ∫c x^k dx = c0/(k+1) + (c1 − c0)/(k+2).
  PlanformSpec s;
  s.shape = PlanformShape::tapered;
  s.span = 1.0;
  s.root_chord = 0.3;
  s.tip_chord = 0.1;
  const Planform p(s);
  auto m = [](int k) { return 0.3 / (k + 1) + (0.1 - 0.3) / (k + 2); };
  CHECK(p.area() == doctest::Approx(m(0)).epsilon(1e-12));
  CHECK(p.radius_moment(1) == doctest::Approx(m(1) / m(0)).epsilon(1e-10));
  CHECK(p.radius_moment(2) == doctest::Approx(std::sqrt(m(2) / m(0))).epsilon(1e-10));
}

TEST_CASE("beta planform reproduces its r̂₁ and r̂₂ (method of moments, Ellington 1984)") {
  PlanformSpec s;
  s.shape = PlanformShape::beta;
  s.span = 0.05;
  s.mean_chord = 0.016;
  for (auto [r1, r2] : {std::pair{0.5, 0.55}, std::pair{0.45, 0.52}, std::pair{0.55, 0.6}}) {
    s.first_moment_radius = r1;
    s.second_moment_radius = r2;
    const Planform p(s);
    CHECK(p.area() == doctest::Approx(0.05 * 0.016).epsilon(1e-10));
    CHECK(p.radius_moment(1) == doctest::Approx(r1).epsilon(1e-10));
    CHECK(p.radius_moment(2) == doctest::Approx(r2).epsilon(1e-10));
    // The chord integrates to the area too (quadrature of the shape itself).
    const double area = integrate_gauss([&](double r) { return p.chord(r); }, 0.0, 0.05, 400);
    CHECK(area == doctest::Approx(p.area()).epsilon(2e-4));
  }
  // r̂₁ = 0.5 with r̂₂ = 1/√3 is the rectangle p = q = 1; with Ellington's r̂₂ = 0.929·0.5^0.732
  // the exponents are p = q = 1.4892 (REFERENCES §4, identity verified there).
  s.first_moment_radius = 0.5;
  s.second_moment_radius = 0.929 * std::pow(0.5, 0.732);
  const Planform ell(s);
  CHECK(ell.beta_p() == doctest::Approx(1.4892).epsilon(2e-4));
  CHECK(ell.beta_q() == doctest::Approx(1.4892).epsilon(2e-4));
  CHECK(Planform::max_second_moment_radius(0.5) ==
        doctest::Approx(1 / std::sqrt(3.0)).epsilon(1e-12));
}

TEST_CASE("table planform: linear chord and pitch axis from the leading-edge column") {
  PlanformSpec s;
  s.shape = PlanformShape::table;
  s.span = 2.0;
  s.table_span_fraction = {0.0, 0.5, 1.0};
  s.table_chord = {0.4, 0.4, 0.2};
  s.table_leading_edge = {0.1, 0.1, 0.05};
  const Planform p(s);
  CHECK(p.chord(1.5) == doctest::Approx(0.3));
  CHECK(p.leading_edge(1.5) == doctest::Approx(0.075));
  // analytic: S = 0.4·1 + (0.4 + 0.2)/2·1 = 0.7
  CHECK(p.area() == doctest::Approx(0.7).epsilon(1e-12));
}

TEST_CASE("planform validation names the key and the allowed range") {
  PlanformSpec s = rectangle();
  s.span = -1;
  CHECK_THROWS_WITH_AS(Planform{s}, doctest::Contains("wing.span"), InputError);
  s = rectangle();
  s.pitch_axis = 1.5;
  CHECK_THROWS_WITH_AS(Planform{s}, doctest::Contains("[0, 1]"), InputError);
  s.shape = PlanformShape::beta;
  s.pitch_axis = 0.25;
  s.mean_chord = 0.01;
  s.first_moment_radius = 0.5;
  s.second_moment_radius = 0.7;  // beyond 1/√3: infinite chord
  CHECK_THROWS_WITH_AS(Planform{s}, doctest::Contains("wing.second_moment_radius"), InputError);
}
