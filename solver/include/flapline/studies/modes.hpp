#pragma once
/// \file
/// Wing-beat-averaged flight dynamics (DESIGN §9): the standard small-perturbation rigid-body
/// equations in body axes about a reference flight state (e.g. Etkin & Reid, Dynamics of Flight:
/// Stability and Control, ch. 4), with the cycle-mean forces and moments as functions of the
/// body's velocity and rates (the stability derivatives) and of gait parameters (the control
/// derivatives). State x = (u, v, w, p, q, r, φ, θ):
///   m V̇ = F(V, ω, δ) + m g_B(φ, θ) − m ω×V,   I ω̇ = M(V, ω, δ) − ω×(Iω),
///   φ̇ = p + (q sin φ + r cos φ) tan θ,         θ̇ = q cos φ − r sin φ,
/// linearised about (V₀, ω₀, φ₀, θ₀) as ẋ = A x + B δ. F and M here exclude gravity (the net
/// mean wrench less the weight: aerodynamic plus body drag).

#include <string>
#include <vector>

#include <Eigen/Core>

#include "flapline/case/vehicle.hpp"
#include "flapline/simulation/run_summary.hpp"

namespace flapline::studies {

/// The reference state and the derivatives: F_x (3×6) and M_x (3×6) with respect to
/// (u, v, w, p, q, r); F_d, M_d (3×k) with respect to k control parameters.
struct LinearModelInput {
  VehicleSpec vehicle;
  Eigen::Vector3d velocity = Eigen::Vector3d::Zero();  ///< V₀, m/s, body axes
  Eigen::Vector3d rates = Eigen::Vector3d::Zero();     ///< ω₀, rad/s
  Eigen::Matrix<double, 3, 6> force_state = Eigen::Matrix<double, 3, 6>::Zero();
  Eigen::Matrix<double, 3, 6> moment_state = Eigen::Matrix<double, 3, 6>::Zero();
  Eigen::MatrixXd force_control, moment_control;  ///< 3 × k
};

struct LinearModel {
  Eigen::Matrix<double, 8, 8> A;
  Eigen::MatrixXd B;                                     ///< 8 × k
  static const std::vector<std::string>& state_names();  ///< u v w p q r phi theta
  static const std::vector<std::string>& state_units();
};

/// The matrices of the linearised equations above.
LinearModel linear_model(const LinearModelInput& in);

/// One mode (an eigenvalue, or a complex-conjugate pair counted once).
struct Mode {
  std::string family;         ///< "longitudinal", "lateral" or "coupled"
  double real = 0, imag = 0;  ///< the eigenvalue (1/s); imag >= 0 for a pair
  bool oscillatory = false;
  double natural_frequency = 0;       ///< |λ| (rad/s)
  double damping_ratio = 0;           ///< −Re λ/|λ|
  double period = 0;                  ///< 2π/Im λ (s), oscillatory only
  double time_to_half = 0;            ///< ln 2/(−Re λ) (s) when decaying; 0 otherwise
  double time_to_double = 0;          ///< ln 2/Re λ (s) when growing; 0 otherwise
  std::vector<std::string> dominant;  ///< states with the largest scaled eigenvector parts
};

/// Eigen-analysis of A. Longitudinal (u, w, q, θ) and lateral (v, p, r, φ) blocks are
/// analysed apart when they do not couple (every cross entry ≤ 1e-9 of the largest entry);
/// `velocity_scale` (m/s) weighs the eigenvector parts (velocities per scale, rates per
/// scale/g, angles in rad).
std::vector<Mode> flight_modes(const Eigen::Matrix<double, 8, 8>& A, double velocity_scale);

/// Warnings about a modes analysis: the reference state is not trimmed (RMS of the scaled
/// steady-flight residual — forces per weight, moments per weight·span — above 1e-6, as trim
/// measures it), and modes with |λ| above 2πf/10 (not slow compared with the wing-beat).
std::vector<std::string> mode_warnings(const std::vector<Mode>& modes, const RunSummary& base,
                                       double frequency);

/// Refuses (InputError on vehicle.attitude.pitch) a pitch within 1° of ±90°, where the
/// Euler-angle kinematics are singular.
void check_modes_attitude(const VehicleSpec& v);

}  // namespace flapline::studies

#include "flapline/case/model.hpp"
#include "flapline/studies/derivatives.hpp"

namespace flapline::studies {

/// A whole modes analysis at the flight state of `base` (which must have a vehicle): the
/// stability derivatives of the net mean wrench (u … r) and the control derivatives of
/// `controls`, the linear model, its modes and the warnings. Throws InputError for a pitch near
/// ±90° or a failing base run; Interrupted when stopped.
struct ModesStudy {
  DerivativeTable derivatives;  ///< columns u, v, w, p, q, r, then the controls
  LinearModel linear;
  std::vector<Mode> modes;
  std::vector<std::string> warnings;
};
ModesStudy modes_study(const Model& base, const std::vector<Parameter>& controls,
                       const CaseBuilderFactory& factory, const RunnerOptions& options);

}  // namespace flapline::studies
