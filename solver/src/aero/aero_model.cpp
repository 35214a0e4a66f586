#include "flapline/aero/aero_model.hpp"

#include <cassert>

#include "flapline/aero/lifting_line.hpp"
#include "flapline/aero/quasi_steady.hpp"
#include "flapline/aero/wagner.hpp"

namespace flapline {

std::unique_ptr<AeroScratch> AeroModel::make_scratch(const Model&,
                                                     std::unique_ptr<AeroScratch>) const {
  return nullptr;
}

void AeroModel::prepare_run(const Model&, Workspace&) const {}

double AeroModel::stiffest_rate(const Model&, Workspace&, double) const {
  return 0.0;
}

void AeroModel::own_induction(const Model&, Workspace&, double,
                              Eigen::Ref<Eigen::ArrayXd> kappa) const {
  kappa.setZero();
}

bool AeroModel::own_induction_varies(const Model&) const {
  return false;
}

const AeroModel& aero_model(ModelKind kind) {
  static const QuasiSteadyModel quasi_steady;
  static const WagnerModel wagner;
  static const LiftingLineModel lifting_line;
  switch (kind) {
    case ModelKind::quasi_steady:
      return quasi_steady;
    case ModelKind::wagner:
      return wagner;
    case ModelKind::lifting_line:
      return lifting_line;
  }
  assert(false && "every ModelKind has a model");
  return quasi_steady;
}

const AeroModel& attach_aero(const Model& model, Workspace& ws) {
  assert(ws.built_for(model) && "a Workspace serves the Model it was built or reset for");
  const AeroModel& aero = aero_model(model);
  if (!ws.aero_attached) {
    ws.state.setZero(aero.state_size(model));
    ws.aero_scratch = aero.make_scratch(model, std::move(ws.aero_scratch));
    if (ws.aero_scratch) ws.aero_scratch->kind = aero.kind();
    ws.aero_attached = true;
  }
  return aero;
}

}  // namespace flapline
