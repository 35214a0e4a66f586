// Source: Glauert 1926 (monoplane equation), Prandtl 1918-19 (elliptic wing), Helmbold 1942.
#include "flapline/reference/lifting_line_theory.hpp"

#include <Eigen/Dense>
#include <boost/math/constants/constants.hpp>
#include <cmath>

namespace flapline::reference {
namespace {
constexpr double kPi = boost::math::constants::pi<double>();
}

GlauertSolution glauert_lifting_line(const std::function<double(double)>& chord, double span,
                                     double a0, int terms) {
  Eigen::MatrixXd a(terms, terms);
  Eigen::VectorXd rhs(terms);
  for (int m = 0; m < terms; ++m) {
    const double theta = (m + 1) * kPi / (2.0 * terms);
    const double eta = std::abs(std::cos(theta));
    const double mu = a0 * chord(eta) / (4.0 * span);
    for (int j = 0; j < terms; ++j) {
      const int n = 2 * j + 1;
      a(m, j) = std::sin(n * theta) * (std::sin(theta) + n * mu);
    }
    rhs(m) = mu * std::sin(theta);
  }
  const Eigen::VectorXd coeff = a.partialPivLu().solve(rhs);
  GlauertSolution out;
  out.coefficients.assign(coeff.data(), coeff.data() + terms);
  // S = ∫c dy over the span, by Gauss on θ (y = −(b/2)cos θ, dy = (b/2) sin θ dθ).
  double area = 0.0;
  const int panels = 4000;
  for (int k = 0; k < panels; ++k) {
    const double theta = (k + 0.5) * kPi / panels;
    area += chord(std::abs(std::cos(theta))) * 0.5 * span * std::sin(theta) * kPi / panels;
  }
  out.aspect_ratio = span * span / area;
  out.lift_slope = kPi * out.aspect_ratio * coeff(0);
  for (int j = 1; j < terms; ++j) {
    const double r = coeff(j) / coeff(0);
    out.delta += (2 * j + 1) * r * r;
  }
  return out;
}

double elliptic_lift_slope(double a0, double aspect_ratio) {
  return a0 / (1.0 + a0 / (kPi * aspect_ratio));
}

double helmbold_lift_slope(double a0, double aspect_ratio) {
  const double x = a0 / (kPi * aspect_ratio);
  return a0 / (std::sqrt(1.0 + x * x) + x);
}

}  // namespace flapline::reference
