#pragma once
/// \file
/// Every per-run buffer (DESIGN §1): built once from a Model, reused for every step. A Workspace
/// belongs to one thread at a time; give each worker its own.

#include <Eigen/Core>
#include <array>
#include <boost/numeric/odeint.hpp>
#include <boost/numeric/odeint/external/eigen/eigen.hpp>
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
  void resize(Eigen::Index n);
};

using StateStepper = boost::numeric::odeint::runge_kutta4<
    Eigen::VectorXd, double, Eigen::VectorXd, double,
    boost::numeric::odeint::vector_space_algebra>;

class Workspace {
 public:
  explicit Workspace(const Model& model);
  Workspace(const Workspace&) = delete;
  Workspace& operator=(const Workspace&) = delete;

  std::array<WingPose, 2> poses;  ///< right, left (virtual frames)
  // Stage quantities for all 2N strips (update_speeds):
  Eigen::ArrayXd tangential;       ///< U_t (m/s)
  Eigen::ArrayXd w_pivot;          ///< normal-wash at the pitch axis (m/s)
  Eigen::ArrayXd w_three_quarter;  ///< w_¾ (m/s)
  Eigen::ArrayXd w_half;           ///< w_½ (m/s)
  Eigen::ArrayXd speed;            ///< U (m/s)
  std::vector<SectionState> sections;  ///< full kinematics at output times (update_sections)
  StripLoads loads;
  Eigen::VectorXd state;  ///< lag states
  StateStepper stepper;
  std::unique_ptr<AeroScratch> aero_scratch;
};

/// Poses and the stage quantities at time t (allocation-free; affine-in-r fast path).
void update_speeds(const Model& model, Workspace& ws, double t);

/// Poses, stage quantities and full section kinematics at time t (output times).
void update_sections(const Model& model, Workspace& ws, double t);

}  // namespace flapline
