#pragma once
/// \file
/// What the drive of each wing supplies (DESIGN §9): generalised forces conjugate to the joint
/// coordinates q = (φ, θ, ψ, λ, z_p) — stroke, deviation, pitch (rad), span ratio (–) and the
/// shared plunge (m, body +z) — split into aerodynamic, inertial and gravitational parts, the
/// power of each joint, and the inertial load the wing's mass puts on the body.
///
/// For a material point x(q) of the wing, τ_j = Σ m a·∂x/∂q_j + Ḣ·∂ω/∂q̇_j − Σ(F·∂x/∂q_j +
/// C·∂ω/∂q̇_j) (d'Alembert's principle in Lagrange's form), with a the inertial acceleration (the
/// body moving at constant velocity and rates included) and F, C the strip loads at their points
/// of action. Since Σ_j ∂x/∂q_j q̇_j is the point's velocity relative to the body, Σ_j τ_j q̇_j
/// is the inertial power plus the actuator power exactly, whatever the axes.

#include <array>

#include "flapline/simulation/wrench.hpp"

namespace flapline {

class Model;
class Workspace;

/// Fill out.drive, out.inertial, out.power_mechanical and out.power_inertial from the poses in
/// ws and the strip-load sums of sum_loads: each wing's wrench about the body origin in its
/// virtual frame (Σ x×F + C, ΣF) and Σ r F·e_s (r unscaled), which give the aerodynamic joint
/// torques without another pass over the strips (Σ(x − h)×F = Σ x×F − h×ΣF).
void add_drive(const Model& model, const Workspace& ws, const std::array<Wrench, 2>& virtual_wrench,
               const std::array<double, 2>& span_load, LoadSample& out);

}  // namespace flapline
