#pragma once
/// \file
/// Every per-run buffer (DESIGN §1): built once from a Model, reused for every step. A Workspace
/// belongs to one thread at a time; give each worker its own. It remembers the Model it was built
/// for (algorithms assert that they are handed that one) and can be `reset` for another Model:
/// a result never depends on what a Workspace computed before.

#include <Eigen/Core>
#include <array>
#include <memory>
#include <vector>

#include "flapline/case/aero_options.hpp"
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
  /// N, the profile-drag part of force_mid (model.profile_drag; zero without it)
  Eigen::Matrix3Xd profile_drag;
  void resize(Eigen::Index n);
};

/// Per-run buffers an aerodynamic model needs beyond the common Workspace (e.g. an influence
/// matrix and its per-phase factorisations). The aero layer defines the concrete types and
/// fills Workspace::aero_scratch (attach_aero in aero/aero_model.hpp).
struct AeroScratch {
  virtual ~AeroScratch() = default;
  ModelKind kind = ModelKind::quasi_steady;  ///< the model that made it
};

struct StepperSlot;  // case/stepper.hpp

class Workspace {
 public:
  explicit Workspace(const Model& model);
  ~Workspace();
  Workspace(const Workspace&) = delete;
  Workspace& operator=(const Workspace&) = delete;
  Workspace(Workspace&&) noexcept;
  Workspace& operator=(Workspace&&) noexcept;

  /// True when this Workspace was built (or last reset) for `model` (the same object).
  bool built_for(const Model& model) const noexcept { return model_ == &model; }
  /// Make this Workspace serve `model` (another case, or the same one afresh): every cache —
  /// stage, output-sample and influence caches, lag states, any warm start — is cleared, and
  /// the buffers are kept when the sizes allow, reallocated otherwise.
  void reset(const Model& model);

  std::array<WingPose, 2> poses;  ///< right, left (virtual frames)
  // Stage quantities for all 2N strips (update_speeds):
  Eigen::ArrayXd tangential;           ///< U_t (m/s)
  Eigen::ArrayXd w_pivot;              ///< normal-wash at the pitch axis (m/s)
  Eigen::ArrayXd w_three_quarter;      ///< w_¾ (m/s)
  Eigen::ArrayXd w_half;               ///< w_½ (m/s)
  Eigen::ArrayXd speed;                ///< U (m/s)
  Eigen::ArrayXd rate;                 ///< U/b, semichords travelled per second (1/s)
  std::vector<SectionState> sections;  ///< full kinematics at output times (update_sections)
  /// Stage cache (stage_speeds): U/b and w_¾ of every strip at each of the 2·steps_per_cycle
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
  Eigen::VectorXd state;                 ///< lag states (sized by attach_aero)
  std::unique_ptr<StepperSlot> stepper;  ///< the steppers with their buffers (case/stepper.hpp)
  /// The aero model's buffers (null for a model that needs none). attach_aero builds them once
  /// per build or reset, handing the previous ones to make_scratch so large caches are reused.
  std::unique_ptr<AeroScratch> aero_scratch;
  /// False after a build or reset until attach_aero has sized the states and the scratch.
  bool aero_attached = false;

 private:
  const Model* model_ = nullptr;
  void allocate(const Model& model);
};

}  // namespace flapline
