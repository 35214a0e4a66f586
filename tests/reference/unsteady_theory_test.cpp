// The special-function layer of the validation references (REFERENCES §1-2): Theodorsen's C(k)
// and the exact Wagner function from Boost.Math, against values computed independently there.
// Source of the values: REFERENCES.md tables (computed with SciPy, mpmath and Boost.Math from
// Theodorsen 1935, NACA Report 496, and Wagner 1925, ZAMM 5).
#include <doctest/doctest.h>

#include <cmath>

#include "flapline/reference/unsteady_theory.hpp"

using namespace flapline::reference;

TEST_CASE("Theodorsen's function matches the computed table") {
  // REFERENCES §2 (computed with SciPy/mpmath/Boost.Math; definition Theodorsen 1935, NACA
  // Report 496): F(k), G(k) to 1e-6.
  const double table[][3] = {
      {0.01, 0.982422, -0.045652}, {0.05, 0.909009, -0.130644}, {0.1, 0.831924, -0.172302},
      {0.2, 0.727580, -0.188624},  {0.3, 0.664971, -0.179319},  {0.5, 0.597936, -0.150710},
      {0.8, 0.554147, -0.116502},  {1.0, 0.539435, -0.100273},  {2.0, 0.512955, -0.057691}};
  for (const auto& row : table) {
    const auto c = theodorsen(row[0]);
    CHECK(std::abs(c.real() - row[1]) < 1e-6);
    CHECK(std::abs(c.imag() - row[2]) < 1e-6);
  }
  // Large-k limit F ≈ ½ + 1/(16k²), G ≈ −1/(8k) (REFERENCES §2: k = 10 gives 0.500618/−0.012447).
  CHECK(std::abs(theodorsen(10.0).real() - 0.500618) < 2e-6);
  CHECK(std::abs(theodorsen(10.0).imag() + 0.012447) < 2e-6);
}

TEST_CASE("exact Wagner function matches the computed table") {
  // REFERENCES §1 (exact theory, computed; Wagner 1925, ZAMM 5): φ(0) = ½ and values to 1e-6.
  const double table[][2] = {{0.5, 0.555664}, {1, 0.600606},  {2, 0.669290},  {5, 0.788203},
                             {10, 0.875045},  {20, 0.936649}, {50, 0.976764}, {100, 0.989059}};
  CHECK(std::abs(wagner(0.0) - 0.5) < 1e-9);
  for (const auto& row : table) CHECK(std::abs(wagner(row[0]) - row[1]) < 1e-6);
}

TEST_CASE("the R.T. Jones fit stays within its known error of the exact function") {
  // REFERENCES §1: max |φ_J − φ| = 0.0096 near s ≈ 80; errors −0.0064 (s=1), +0.0056 (s=5),
  // −0.0039 (s=20) (computed).
  double worst = 0.0;
  for (double s = 0.0; s <= 200.0; s += 0.5)
    worst = std::max(worst, std::abs(wagner_fit(s, 0.165, 0.335, 0.0455, 0.3) - wagner(s)));
  CHECK(worst < 0.01);
  CHECK(worst > 0.009);
  CHECK(wagner_fit(1, 0.165, 0.335, 0.0455, 0.3) - wagner(1) ==
        doctest::Approx(-0.0064).epsilon(0.02));
  // C_J(0.5) = 0.5900 − 0.1627i vs exact 0.5979 − 0.1507i (REFERENCES §1)
  const auto cj = theodorsen_fit(0.5, 0.165, 0.335, 0.0455, 0.3);
  CHECK(std::abs(cj.real() - 0.5900) < 1e-4);
  CHECK(std::abs(cj.imag() + 0.1627) < 1e-4);
}

TEST_CASE("Theodorsen lift closed forms match the computed check values") {
  // REFERENCES §2 (computed from the BAH 1955 form): plunge and pitch about ¼ chord, k = 0.1, 0.5.
  auto near = [](std::complex<double> a, double re, double im) {
    return std::abs(a.real() - re) < 1e-5 && std::abs(a.imag() - im) < 1e-5;
  };
  CHECK(near(plunge_lift(0.1, theodorsen(0.1)), 0.076845, 0.522713));
  CHECK(near(plunge_lift(0.5, theodorsen(0.5)), -0.311930, 1.878472));
  CHECK(near(plunge_lift(1.0, theodorsen(1.0)), -2.511559, 3.389369));
  CHECK(near(pitch_lift(0.1, -0.5, theodorsen(0.1)), 5.319686, -0.245734));
  CHECK(near(pitch_lift(0.5, -0.5, theodorsen(0.5)), 3.837712, 2.502332));
  CHECK(near(pitch_lift(1.0, 0.0, theodorsen(1.0)), 3.704386, 4.206244));
}
