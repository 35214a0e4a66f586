#pragma once
/// \file
/// Biot–Savart velocity of straight vortex filaments per unit circulation, times 4π (DESIGN §4).
/// The vortex core is added only where the line form is singular (on the filament itself), not
/// along a filament's extension, so points collinear with a segment but beyond its ends see
/// exactly zero.

#include <Eigen/Core>
#include <Eigen/Geometry>
#include <cmath>

namespace flapline {

/// Segment from p1 to p2 (circulation along p2 − p1) at point x, core radius δ:
/// (r₁×r₂)(|r₁|+|r₂|) / (|r₁||r₂|(|r₁||r₂| + r₁·r₂) + δ²|r₀|²/2), r_k = x − p_k, r₀ = p₂ − p₁.
inline Eigen::Vector3d segment_velocity_4pi(const Eigen::Vector3d& p1, const Eigen::Vector3d& p2,
                                            const Eigen::Vector3d& x, double core) {
  const Eigen::Vector3d r1 = x - p1, r2 = x - p2;
  const double n1 = r1.norm(), n2 = r2.norm();
  const double denom =
      n1 * n2 * (n1 * n2 + r1.dot(r2)) + 0.5 * core * core * (p2 - p1).squaredNorm();
  if (denom <= 0.0) return Eigen::Vector3d::Zero();
  return r1.cross(r2) * ((n1 + n2) / denom);
}

/// Semi-infinite filament starting at p and running to infinity along the unit vector u
/// (circulation along u) at point x: (u × r) / (|r|(|r| − u·r) + δ²/2), r = x − p.
inline Eigen::Vector3d leg_velocity_4pi(const Eigen::Vector3d& p, const Eigen::Vector3d& u,
                                        const Eigen::Vector3d& x, double core) {
  const Eigen::Vector3d r = x - p;
  const double n = r.norm();
  const double denom = n * (n - u.dot(r)) + 0.5 * core * core;
  if (denom <= 0.0) return Eigen::Vector3d::Zero();
  return u.cross(r) / denom;
}

}  // namespace flapline
