#include "flapline/aero/aero_model.hpp"

#include "flapline/aero/quasi_steady.hpp"
#include "flapline/aero/lifting_line.hpp"
#include "flapline/aero/wagner.hpp"

namespace flapline {

std::unique_ptr<AeroScratch> AeroModel::make_scratch(const Model&) const { return nullptr; }

void AeroModel::prepare_run(const Model&, Workspace&) const {}

double AeroModel::stiffest_rate(const Model&, Workspace&, double) const { return 0.0; }

std::shared_ptr<const AeroModel> make_aero_model(const AeroOptions& options) {
  switch (options.kind) {
    case ModelKind::quasi_steady:
      return std::make_shared<QuasiSteadyModel>();
    case ModelKind::wagner:
      return std::make_shared<WagnerModel>();
    case ModelKind::lifting_line:
      return std::make_shared<LiftingLineModel>();
  }
  return nullptr;
}

}  // namespace flapline
