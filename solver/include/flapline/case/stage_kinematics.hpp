#pragma once
/// \file
/// Kinematics at RK4 stages and output samples, with their per-phase caches (DESIGN §1, §5):
/// the layer between the wing motion and the aerodynamic models. Everything here reads the Model
/// and writes the Workspace; nothing allocates once the Workspace is built.

#include <Eigen/Core>

#include "flapline/case/model.hpp"
#include "flapline/case/workspace.hpp"

namespace flapline {

/// Index of the per-phase cache slot of time t on a grid of `slots` per cycle (frequency in Hz),
/// or −1 when there is no cache (slots = 0) or t is off the grid. Shared by every phase cache.
Eigen::Index cycle_slot(double t, double frequency, Eigen::Index slots);

/// U/b (1/s) and w_¾ (m/s) of every strip at a stage time.
struct StageSpeeds {
  Eigen::Ref<const Eigen::ArrayXd> rate;
  Eigen::Ref<const Eigen::ArrayXd> w_three_quarter;
};

/// Stage quantities of the lag models at time t. The kinematics are periodic, so each RK4 stage
/// phase (a multiple of half a step) is computed once per run and then read from the cache; other
/// times are computed directly (update_speeds). Allocation-free.
StageSpeeds stage_speeds(const Model& model, Workspace& ws, double t);

/// Poses and the stage quantities at time t (allocation-free; affine-in-r fast path).
void update_speeds(const Model& model, Workspace& ws, double t);

/// Poses, stage quantities and full section kinematics at time t (output times). Output-sample
/// phases of periodic kinematics are computed once per run and copied afterwards.
void update_sections(const Model& model, Workspace& ws, double t);

/// The same without the cache.
void compute_sections(const Model& model, Workspace& ws, double t);

}  // namespace flapline
