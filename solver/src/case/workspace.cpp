#include "flapline/case/workspace.hpp"

#include <cassert>

#include "flapline/case/model.hpp"
#include "flapline/case/stepper.hpp"

namespace flapline {

void StripLoads::resize(Eigen::Index n) {
  force_quarter.setZero(3, n);
  force_mid.setZero(3, n);
  couple.setZero(3, n);
  circulation.setZero(n);
  w_effective.setZero(n);
  w_suction.setZero(n);
  w_induced.setZero(n);
  profile_drag.setZero(3, n);
}

Workspace::~Workspace() = default;
Workspace::Workspace(Workspace&&) noexcept = default;
Workspace& Workspace::operator=(Workspace&&) noexcept = default;

Workspace::Workspace(const Model& model) {
  allocate(model);
}

void Workspace::allocate(const Model& model) {
  model_ = &model;
  if (!stepper) stepper = std::make_unique<StepperSlot>();
  stepper->exponential_ready = false;
  const Eigen::Index n = model.strip_count();
  tangential.setZero(n);
  w_pivot.setZero(n);
  w_three_quarter.setZero(n);
  w_half.setZero(n);
  speed.setZero(n);
  rate.setZero(n);
  sections.assign(static_cast<std::size_t>(n), SectionState{});
  loads.resize(n);
  state.resize(0);
  aero_attached = false;
  const Eigen::Index slots = 2 * model.simulation().steps_per_cycle;
  const double bytes = 2.0 * 8.0 * static_cast<double>(n) * static_cast<double>(slots);
  const bool lag_model = model.aero_options().kind != ModelKind::quasi_steady;
  const bool stage_cache = lag_model && model.periodic_kinematics() && bytes <= 64.0 * 1024 * 1024;
  stage_rate.resize(stage_cache ? n : 0, stage_cache ? slots : 0);  // a no-op when the size holds
  stage_w34.resize(stage_cache ? n : 0, stage_cache ? slots : 0);
  stage_filled.assign(stage_cache ? static_cast<std::size_t>(slots) : 0, 0);
  const std::size_t samples = static_cast<std::size_t>(model.simulation().samples_per_cycle);
  const double sample_bytes =
      static_cast<double>(samples) * static_cast<double>(n) * (sizeof(SectionState) + 48.0);
  const bool sample_cache = model.periodic_kinematics() && sample_bytes <= 64.0 * 1024 * 1024;
  const std::size_t kept = sample_cache ? samples : 0;
  sample_poses.resize(kept);
  sample_sections.resize(kept * static_cast<std::size_t>(n));
  sample_arrays.resize(sample_cache ? n : 0, 6 * static_cast<Eigen::Index>(kept));
  sample_filled.assign(kept, 0);
}

void Workspace::reset(const Model& model) {
  // aero_scratch stays: the next attach_aero hands it to make_scratch, which reuses what fits.
  allocate(model);
}

}  // namespace flapline
