#pragma once
/// \file
/// Small numerical helpers shared by the core: elementary rotations, the mirror through the body
/// x-z plane, Gauss-Legendre nodes.

#include <Eigen/Core>
#include <Eigen/Geometry>
#include <array>
#include <cmath>

namespace flapline {

inline constexpr double kPi = 3.14159265358979323846;
inline constexpr double kDegree = kPi / 180.0;  ///< radians per degree

/// Right-handed rotation about body x by angle a (rad).
inline Eigen::Matrix3d rotation_x(double a) {
  const double c = std::cos(a), s = std::sin(a);
  Eigen::Matrix3d m;
  m << 1, 0, 0, 0, c, -s, 0, s, c;
  return m;
}
/// Right-handed rotation about y by angle a (rad).
inline Eigen::Matrix3d rotation_y(double a) {
  const double c = std::cos(a), s = std::sin(a);
  Eigen::Matrix3d m;
  m << c, 0, s, 0, 1, 0, -s, 0, c;
  return m;
}
/// Right-handed rotation about z by angle a (rad).
inline Eigen::Matrix3d rotation_z(double a) {
  const double c = std::cos(a), s = std::sin(a);
  Eigen::Matrix3d m;
  m << c, -s, 0, s, c, 0, 0, 0, 1;
  return m;
}

/// Mirror through the body x-z plane, M = diag(1, -1, 1) (DESIGN §2): polar vectors map v -> Mv,
/// axial vectors (rates, moments) map w -> -Mw.
inline Eigen::Vector3d mirror(const Eigen::Vector3d& v) {
  return {v.x(), -v.y(), v.z()};
}
inline Eigen::Vector3d mirror_axial(const Eigen::Vector3d& w) {
  return {-w.x(), w.y(), -w.z()};
}

/// 8-point Gauss-Legendre rule on [-1, 1] (nodes, weights); exact for polynomials of degree 15.
struct GaussLegendre8 {
  static constexpr std::array<double, 8> nodes{
      -0.9602898564975363, -0.7966664774136267, -0.5255324099163290, -0.1834346424956498,
      0.1834346424956498,  0.5255324099163290,  0.7966664774136267,  0.9602898564975363};
  static constexpr std::array<double, 8> weights{
      0.1012285362903763, 0.2223810344533745, 0.3137066458778873, 0.3626837833783620,
      0.3626837833783620, 0.3137066458778873, 0.2223810344533745, 0.1012285362903763};
};

/// Integrate f over [a, b] with `panels` composite 8-point Gauss-Legendre panels.
template <class F>
double integrate_gauss(F&& f, double a, double b, int panels) {
  double sum = 0.0;
  const double h = (b - a) / panels;
  for (int p = 0; p < panels; ++p) {
    const double mid = a + (p + 0.5) * h;
    for (std::size_t k = 0; k < 8; ++k)
      sum += GaussLegendre8::weights[k] * f(mid + 0.5 * h * GaussLegendre8::nodes[k]);
  }
  return 0.5 * h * sum;
}

}  // namespace flapline
