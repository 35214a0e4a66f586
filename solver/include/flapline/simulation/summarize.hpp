#pragma once
/// \file
/// Everything a run reports besides its histories (DESIGN §5): cycle statistics, the spanwise
/// loading at chosen phases and as a cycle mean, derived quantities (U_ref, C̄_L, Re, k, J,
/// reverse-flow share), the status message and the warnings. The run loop (integrate.cpp) feeds
/// the accumulators sample by sample; finish_summary fills the RunSummary at the end.

#include <limits>
#include <vector>

#include "flapline/case/model.hpp"
#include "flapline/case/workspace.hpp"
#include "flapline/simulation/run_summary.hpp"

namespace flapline {

/// Sums over the output samples of one cycle.
class CycleAccumulator {
 public:
  void add(const LoadSample& s);
  CycleStats stats() const;

 private:
  Wrench sum_;
  std::array<Wrench, 2> wing_sum_;
  double air_sum_ = 0, air_peak_ = -std::numeric_limits<double>::infinity(), air_pos_ = 0;
  double act_sum_ = 0, act_peak_ = -std::numeric_limits<double>::infinity(), act_pos_ = 0;
  double force_sq_ = 0, induced_ = 0;
  long samples_ = 0;
  // Drive sums per wing and joint: Σ τ², Σ τ_aero², Σ τ_inertial², Σ P, Σ max(P, 0), and peaks.
  struct JointSums {
    double torque_sq = 0, aero_sq = 0, inertial_sq = 0, torque_peak = 0;
    double power = 0, power_pos = 0, power_peak = 0;
  };
  struct WingSums {
    std::array<JointSums, kJoints> joint;
    double power = 0, power_pos = 0, power_peak = 0, inertial_power = 0;
    Wrench inertial;
  };
  std::array<WingSums, 2> drive_;
  double mech_ = 0, mech_pos_ = 0, mech_peak_ = 0, inertial_power_ = 0;
  Wrench inertial_;
  Eigen::Vector3d profile_drag_ = Eigen::Vector3d::Zero();
};

/// Per-strip loading of the current cycle: the rows at the requested phases and the sums for the
/// cycle mean. Built once per run; reset at the start of every cycle.
class SpanwiseAccumulator {
 public:
  explicit SpanwiseAccumulator(const Model& model);
  void reset();
  /// Add the loads of output sample `sample_in_cycle` (ws.sections and ws.loads hold them).
  void add(const Model& model, const Workspace& ws, int sample_in_cycle);
  /// The phase rows followed by one cycle-mean row per strip.
  std::vector<SpanwiseRow> rows(const Model& model) const;

 private:
  std::vector<int> phase_sample_;
  std::vector<SpanwiseRow> phase_rows_;
  Eigen::Matrix3Xd force_;
  Eigen::ArrayXd normal_, gamma_, tangential_, radius_, induced_;
  int samples_ = 0;
};

/// What the run loop hands to finish_summary.
struct CycleOutcome {
  RunStatus status = RunStatus::single_cycle;
  int cycles = 0;
  double change = 0;          ///< last relative change of the cycle means (NaN after one cycle)
  double state_residual = 0;  ///< |x(end) − x(end − T)| / max|x|
  CycleStats last;            ///< statistics of the last cycle
};

/// Net mean wrench and steady-flight residual of a case with a vehicle, from its cycle means.
VehicleBalance vehicle_balance(const Model& model, const CycleStats& averages);

/// Header fields of a summary (model label, resolution, air) before the run starts.
void start_summary(const Model& model, RunSummary& out);

/// Fill status, message, averages, derived quantities, spanwise rows and warnings. Evaluates the
/// kinematics of the last cycle's output samples once more (ws is left at those samples).
void finish_summary(const Model& model, Workspace& ws, const CycleOutcome& outcome,
                    const SpanwiseAccumulator& spanwise, RunSummary& out);

}  // namespace flapline
