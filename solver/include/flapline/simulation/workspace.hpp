#pragma once
/// \file
/// Every per-run buffer (DESIGN §1): built once from a Model, reused for every step. A Workspace
/// belongs to one thread at a time; give each worker its own.

#include <Eigen/Core>
#include <array>
#include <memory>
#include <vector>

#include "flapline/aero/aero_model.hpp"
#include "flapline/kinematics/wing_motion.hpp"

namespace flapline {

class Model;

/// Loads of every strip of the pair, each in its wing's virtual right-wing frame.
struct StripLoads {
  Eigen::Matrix3Xd force_quarter;  ///< N, acting at the ¼-chord point
  Eigen::Matrix3Xd force_mid;      ///< N, acting at mid-chord (added mass)
  Eigen::Matrix3Xd couple;         ///< N·m
  Eigen::ArrayXd circulation;      ///< Γ (m²/s), + along e_c × e_n
  Eigen::ArrayXd w_effective;      ///< w_E (m/s)
  Eigen::ArrayXd w_suction;        ///< w_S (m/s)
  Eigen::ArrayXd w_induced;        ///< KΓ, induced normal-wash at the control point (m/s)
  void resize(Eigen::Index n);
};

struct StepperSlot;  // simulation/stepper.hpp

class Workspace {
 public:
  explicit Workspace(const Model& model);
  ~Workspace();
  Workspace(const Workspace&) = delete;
  Workspace& operator=(const Workspace&) = delete;

  std::array<WingPose, 2> poses;  ///< right, left (virtual frames)
  // Stage quantities for all 2N strips (update_speeds):
  Eigen::ArrayXd tangential;       ///< U_t (m/s)
  Eigen::ArrayXd w_pivot;          ///< normal-wash at the pitch axis (m/s)
  Eigen::ArrayXd w_three_quarter;  ///< w_¾ (m/s)
  Eigen::ArrayXd w_half;           ///< w_½ (m/s)
  Eigen::ArrayXd speed;            ///< U (m/s)
  Eigen::ArrayXd rate;             ///< U/b, semichords travelled per second (1/s)
  std::vector<SectionState> sections;  ///< full kinematics at output times (update_sections)
  /// Stage cache (stage_speeds): U/b and w_¾ of every strip at each of the 2·steps_per_cycle RK4
  /// stage phases, filled during the first cycle. Empty when the kinematics are not periodic or
  /// the cache would exceed 64 MiB.
  Eigen::ArrayXXd stage_rate, stage_w34;
  std::vector<char> stage_filled;
  /// Output-sample cache (update_sections): poses, section kinematics and stage arrays at each of
  /// the samples_per_cycle output phases, filled during the first cycle; same conditions.
  std::vector<std::array<WingPose, 2>> sample_poses;
  std::vector<SectionState> sample_sections;
  Eigen::ArrayXXd sample_arrays;  ///< 2N × (6·samples): tangential, w_pivot, w_¾, w_½, U, U/b
  std::vector<char> sample_filled;
  StripLoads loads;
  Eigen::VectorXd state;  ///< lag states
  std::unique_ptr<StepperSlot> stepper;  ///< RK4 with its buffers (simulation/stepper.hpp)
  std::unique_ptr<AeroScratch> aero_scratch;
};

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
