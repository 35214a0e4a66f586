// Cutting a wing into strips (DESIGN §3).
#include <doctest/doctest.h>

#include <cmath>

#include "flapline/common/errors.hpp"
#include "flapline/common/math.hpp"
#include "flapline/geometry/strips.hpp"

using namespace flapline;

TEST_CASE("uniform and cosine strips tile the span; centres never at the tip") {
  PlanformSpec ps;
  ps.shape = PlanformShape::elliptic;
  ps.span = 1.0;
  ps.root_chord = 0.2;
  ps.pitch_axis = 0.3;
  ps.twist_tip = -6 * kDegree;
  const Planform p(ps);
  for (StripSpacing spacing : {StripSpacing::uniform, StripSpacing::cosine}) {
    const Strips s = cut_into_strips(p, {16, spacing});
    CHECK(s.size() == 16);
    CHECK(s.width.sum() == doctest::Approx(1.0).epsilon(1e-14));
    CHECK(s.radius.maxCoeff() < 1.0);
    CHECK((s.chord > 0).all());
    CHECK((s.pivot_fraction - 0.3).abs().maxCoeff() < 1e-12);
    // Linear twist at the strip centre (analytic).
    CHECK(s.twist(15) == doctest::Approx(-6 * kDegree * s.radius(15)).epsilon(1e-12));
  }
  // Cosine spacing r_j = R sin(πj/2N), centres at the angle mid-points R sin(π(j+½)/2N):
  // finer at the tip than at the root (analytic).
  const Strips c = cut_into_strips(p, {16, StripSpacing::cosine});
  CHECK(c.width(15) < c.width(0));
  CHECK(c.edge_radius(1) == doctest::Approx(std::sin(kPi / 32)).epsilon(1e-14));
  CHECK(c.radius(0) == doctest::Approx(std::sin(kPi / 64)).epsilon(1e-14));
  CHECK(StripSpec{}.spacing == StripSpacing::cosine);  // the default
}

TEST_CASE("strip count out of range is an input error") {
  PlanformSpec ps;
  ps.span = 1;
  ps.chord = 0.1;
  const Planform p(ps);
  CHECK_THROWS_WITH_AS(cut_into_strips(p, {0, StripSpacing::uniform}),
                       doctest::Contains("wing.strips"), InputError);
}
