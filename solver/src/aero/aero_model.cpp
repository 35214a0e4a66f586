#include "flapline/aero/aero_model.hpp"

#include "flapline/aero/quasi_steady.hpp"

namespace flapline {

std::unique_ptr<AeroScratch> AeroModel::make_scratch(const Model&) const { return nullptr; }

std::shared_ptr<const AeroModel> make_aero_model(const AeroOptions& options) {
  switch (options.kind) {
    case ModelKind::quasi_steady:
      return std::make_shared<QuasiSteadyModel>();
  }
  return nullptr;
}

}  // namespace flapline
