#pragma once
/// \file
/// Model 1, quasi_steady (DESIGN §4): no states; the loads follow the instantaneous kinematics.

#include "flapline/aero/aero_model.hpp"

namespace flapline {

class QuasiSteadyModel final : public AeroModel {
 public:
  ModelKind kind() const noexcept override { return ModelKind::quasi_steady; }
  Eigen::Index state_size(const Model&) const override { return 0; }
  void initial_state(const Model&, Workspace&, double, StartMode,
                     Eigen::VectorXd& x) const override;
  void derivative(const Model&, Workspace&, double, const Eigen::VectorXd&,
                  Eigen::VectorXd& dxdt) const override;
  void loads(const Model& model, Workspace& ws, double t, const Eigen::VectorXd& x) const override;
};

}  // namespace flapline
