#include "flapline/aero/quasi_steady.hpp"

#include "flapline/aero/section_loads.hpp"
#include "flapline/case/model.hpp"
#include "flapline/case/stage_kinematics.hpp"
#include "flapline/case/workspace.hpp"

namespace flapline {

void QuasiSteadyModel::initial_state(const Model&, Workspace&, double, StartMode,
                                     Eigen::VectorXd& x) const {
  x.resize(0);
}

void QuasiSteadyModel::derivative(const Model&, Workspace&, double, const Eigen::VectorXd&,
                                  Eigen::VectorXd& dxdt) const {
  dxdt.resize(0);
}

void QuasiSteadyModel::loads(const Model& model, Workspace& ws, double,
                             const Eigen::VectorXd&) const {
  if (model.aero_options().law == CoefficientLaw::revolving_fit) {
    revolving_fit_loads(model, ws);
    return;
  }
  ws.loads.w_effective = ws.w_three_quarter;  // Γ = πc·w_¾: lag states at their steady values
  circulation_loads(model, ws);
}

}  // namespace flapline
