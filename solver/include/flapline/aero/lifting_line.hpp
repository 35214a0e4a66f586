#pragma once
/// \file
/// Model 3, lifting_line (DESIGN §4): the wagner lag states plus spanwise coupling. Each strip is
/// a horseshoe vortex — a bound segment on the ¼-chord line between its edges and two
/// semi-infinite trailing legs along −e_c — on the instantaneous geometry of both wings. K is the
/// induced normal-wash at every strip's control point (¼-chord line, strip centre) per unit
/// circulation of every horseshoe, without a strip's own bound segment (the 2D model holds it).
/// Per RK4 stage:
///   (I − D₀K)Γ = D₀w_¾ + P(x₁ + x₂),  f = w_¾ + KΓ,  dx_k/dt = (U/b)(−b_k x_k + A_k b_k f),
/// with P = diag(πc), D₀ = (1 − A₁ − A₂)P; the loads use w_E = Γ/(πc). Steady limit: the discrete
/// Prandtl equation; K = 0: the wagner model.
///
/// Cost: K and the factor of (I − D₀K) depend only on the phase of the cycle for periodic
/// kinematics, so each RK4 stage phase is assembled and factorised once per run and kept as the
/// two matrices G = (I − D₀K)⁻¹ and KG; later cycles cost two matrix-vector products per stage.
/// A rigid wing's own block of K is constant (its horseshoes move with it); only the blocks
/// between the wings, and a morphing wing's own block, change with the phase. When no wing angle
/// moves at all (a fixed wing, possibly plunging) K is constant and factorised once.

#include <Eigen/Core>
#include <Eigen/LU>

#include "flapline/aero/aero_model.hpp"
#include "flapline/aero/state_space.hpp"

namespace flapline {

class LiftingLineModel final : public AeroModel {
 public:
  ModelKind kind() const noexcept override { return ModelKind::lifting_line; }
  Eigen::Index state_size(const Model& model) const override;
  std::unique_ptr<AeroScratch> make_scratch(const Model& model,
                                            std::unique_ptr<AeroScratch> previous) const override;
  void prepare_run(const Model& model, Workspace& ws) const override;
  void initial_state(const Model& model, Workspace& ws, double t, StartMode start,
                     Eigen::VectorXd& x) const override;
  void derivative(const Model& model, Workspace& ws, double t, const Eigen::VectorXd& x,
                  Eigen::VectorXd& dxdt) const override;
  void loads(const Model& model, Workspace& ws, double t, const Eigen::VectorXd& x) const override;
  double stiffest_rate(const Model& model, Workspace& ws, double t) const override;
  void own_induction(const Model& model, Workspace& ws, double t,
                     Eigen::Ref<Eigen::ArrayXd> kappa) const override;
  bool own_induction_varies(const Model& model) const override;
};

/// Horseshoe geometry of all 2N strips in body axes at the poses in ws.poses.
struct HorseshoeGeometry {
  Eigen::Matrix3Xd start;           ///< A: bound segment start (its circulation runs A → B)
  Eigen::Matrix3Xd end;             ///< B
  Eigen::Matrix3Xd trailing_start;  ///< unit direction of the leg at A: −e_c at that edge
  Eigen::Matrix3Xd trailing_end;    ///< unit direction of the leg at B: −e_c at that edge
  Eigen::Matrix3Xd control;         ///< control point: ¼-chord line at the strip centre
  Eigen::Matrix3Xd normal;  ///< e_n of the strip (mirrored, not recomputed, on the left wing)
  Eigen::ArrayXd core;      ///< vortex core δ = 1 % of the strip width (m)
};

/// Geometry at the poses in ws.poses (call wing_pose / update_speeds for the time first).
void horseshoe_geometry(const Model& model, const Workspace& ws, HorseshoeGeometry& g);

/// K (2N × 2N, 1/m): induced normal-wash at control point i per unit circulation of horseshoe j,
/// for the rows `rows` and columns `cols` (index ranges into the 2N strips).
void influence_block(const HorseshoeGeometry& g, Eigen::Index row0, Eigen::Index rows,
                     Eigen::Index col0, Eigen::Index cols, Eigen::Ref<Eigen::MatrixXd> out);

/// Full influence matrix at time t for the model's span coupling (zero blocks where uncoupled).
Eigen::MatrixXd influence_matrix(const Model& model, Workspace& ws, double t);

/// Frozen-time state-space form of a lag model at time t (aero/state_space.hpp).
StateSpace frozen_state_space(const Model& model, Workspace& ws, double t);

}  // namespace flapline
