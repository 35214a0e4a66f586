// Source: Theodorsen 1935 (NACA Report 496), Wagner 1925 (ZAMM 5) through the branch-cut integral
// of REFERENCES.md §1, Garrick 1936 (NACA Report 567); evaluated with Boost.Math.
#include "flapline/reference/unsteady_theory.hpp"

#include <boost/math/constants/constants.hpp>
#include <boost/math/quadrature/exp_sinh.hpp>
#include <boost/math/special_functions/bessel.hpp>
#include <boost/math/special_functions/hankel.hpp>
#include <cmath>

namespace flapline::reference {
namespace {
constexpr double kPi = boost::math::constants::pi<double>();
const std::complex<double> kI(0.0, 1.0);
}  // namespace

std::complex<double> theodorsen(double k) {
  const std::complex<double> h1 = boost::math::cyl_hankel_2(1, k);
  const std::complex<double> h0 = boost::math::cyl_hankel_2(0, k);
  return h1 / (h1 + kI * h0);
}

std::complex<double> theodorsen_fit(double k, double a1, double a2, double b1, double b2) {
  return 1.0 - a1 - a2 + a1 * b1 / (b1 + kI * k) + a2 * b2 / (b2 + kI * k);
}

double wagner(double s) {
  using boost::math::cyl_bessel_i;
  using boost::math::cyl_bessel_k;
  auto integrand = [s](double x) -> double {
    if (x > 300.0) return 0.0;               // I₀ overflows; the integrand is below 1e-250 there
    if (x < 1e-12) return std::exp(-x * s);  // x K₁(x) -> 1, x K₀(x) -> 0, x I -> 0
    // x²[...] written with xK and xI so that K₁ ~ 1/x does not overflow near 0
    const double kk = x * (cyl_bessel_k(1, x) - cyl_bessel_k(0, x));
    const double ii = x * (cyl_bessel_i(0, x) + cyl_bessel_i(1, x));
    return std::exp(-x * s) / (kk * kk + kPi * kPi * ii * ii);
  };
  boost::math::quadrature::exp_sinh<double> integrator;
  return 1.0 - integrator.integrate(integrand, 1e-12);
}

double wagner_fit(double s, double a1, double a2, double b1, double b2) {
  return 1.0 - a1 * std::exp(-b1 * s) - a2 * std::exp(-b2 * s);
}

std::complex<double> plunge_lift(double k, std::complex<double> c) {
  return kPi * (-k * k + 2.0 * kI * k * c);
}

std::complex<double> pitch_lift(double k, double a, std::complex<double> c) {
  return kPi * (kI * k + a * k * k) + 2.0 * kPi * c * (1.0 + kI * k * (0.5 - a));
}

GarrickPlunge garrick_plunge(double rho, double b, double omega, double h0, double speed,
                             std::complex<double> c) {
  const double base = kPi * rho * b * omega * omega * h0 * h0;
  return {base * std::norm(c), base * speed * c.real(), std::norm(c) / c.real()};
}

}  // namespace flapline::reference
