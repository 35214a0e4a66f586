#pragma once
/// \file
/// Exponential time differencing of the lag states (DESIGN §5, `simulation.integrator:
/// exponential`): the fourth-order scheme ETDRK4 of Cox & Matthews (2002, J. Comput. Phys. 176,
/// 430–455) applied to each strip's own 2×2 block of lag states.
///
/// Per strip i the lag equations are dx/dt = σᵢ(t)(Lᵢx + gᵢ), σ = U/b, with
///   Lᵢ = [b₁(A₁κᵢ − 1)  b₁A₁κᵢ ; b₂A₂κᵢ  b₂(A₂κᵢ − 1)]
/// the strip's own linear part in reduced time (κᵢ = ∂f/∂(x₁ + x₂) through the strip's own
/// trailing vortices; 0 for the wagner model) and g the rest (the kinematic forcing and the other
/// strips' induction). Over a step [t, t + h] the linear part is taken as Ā = (Δs/h)Lᵢ with the
/// reduced-time increment Δs = ∫σ dt by Simpson's rule (fourth order); ETDRK4 treats it exactly
/// and everything else, F(x, t) − Āx, explicitly. For constant σ and forcing the scheme is exact:
/// the equilibrium of a stiff strip (h σ |L| ≫ 1) is reached, not an RK4 instability.
///
/// Each Lᵢ has real distinct eigenvalues when κᵢ ≠ 0 (its off-diagonal entries share one sign),
/// so the scheme works in the eigen-coordinates of each strip with scalar φ-functions, evaluated
/// without cancellation (Taylor series near zero, closed forms elsewhere; the cancellation problem
/// of Kassam & Trefethen 2005, SIAM J. Sci. Comput. 26, 1214–1233).

#include <Eigen/Core>
#include <vector>

#include "flapline/case/aero_options.hpp"
#include "flapline/common/huge_block.hpp"

namespace flapline {

/// ETDRK4 coefficients of one mode for z = hσ̄μ (the factor h is applied by the caller):
/// e^{z/2}, e^{z}, q = φ₁(z/2)/2, and the final-stage weights f₁ = φ₁ − 3φ₂ + 4φ₃,
/// f₂ = φ₂ − 2φ₃, f₃ = −φ₂ + 4φ₃ at z (Cox & Matthews 2002, eq. 26).
struct EtdWeights {
  double e_half = 1, e_full = 1, q = 0.5, f1 = 1.0 / 6, f2 = 1.0 / 3, f3 = 1.0 / 6;
};
EtdWeights etd_weights(double z);

/// φ₁, φ₂, φ₃ at x (φ₀ = eˣ, φ_{k+1}(x) = (φ_k(x) − 1/k!)/x), accurate to a few ulp everywhere.
void phi_functions(double x, double& phi1, double& phi2, double& phi3);

/// The per-strip linear parts and their eigen-decompositions, and the stage buffers of one run.
class ExponentialStepper {
 public:
  /// Lᵢ for every strip from κ (size 2N); states are laid out [x₁ of all strips, x₂ of all].
  void set_linear_part(const WagnerCoefficients& w, const Eigen::Ref<const Eigen::ArrayXd>& kappa);
  /// Sizes the buffers for `strips` strips and, when `phases` > 0, an empty cache of the weights
  /// at each of `phases` step phases per cycle — valid when the rates and the linear parts set
  /// for a step depend only on its phase (periodic kinematics).
  void resize(Eigen::Index strips, Eigen::Index phases);

  /// One step of x from t to t + h. `derivative(x, t, dxdt)` gives the full right-hand side;
  /// `rate0`, `rate_half`, `rate1` hold σ at t, t + h/2 and t + h; `phase` is the step's cache
  /// slot or −1. Allocation-free once sized.
  template <class Derivative>
  void step(Derivative&& derivative, Eigen::VectorXd& x, double t, double h,
            const Eigen::Ref<const Eigen::ArrayXd>& rate0,
            const Eigen::Ref<const Eigen::ArrayXd>& rate_half,
            const Eigen::Ref<const Eigen::ArrayXd>& rate1, Eigen::Index phase);

  /// The gain of the part of the linear terms that stays explicit over one step of length h: per
  /// strip and mode h|σ(stage) − σ̄||μ|, damped by the exact part's weights (≈ 1/|z| for
  /// |z| = hσ̄|μ| > 1, so a stiff strip contributes its relative change of σ within the step);
  /// the largest over the strips. Explicit RK-type stages stay stable below about 2.5.
  /// The weights of the last step, per strip: e^{z/2}, e^{z}, hq, hf₁, hf₂, hf₃ of mode 1, then
  /// of mode 2 (etd_weights, computed for all strips at once).
  Eigen::Map<const Eigen::ArrayXXd> last_weights() const { return {w_, n_, 12}; }

  double explicit_gain(const Eigen::Ref<const Eigen::ArrayXd>& rate0,
                       const Eigen::Ref<const Eigen::ArrayXd>& rate_half,
                       const Eigen::Ref<const Eigen::ArrayXd>& rate1, double h) const;

 private:
  void weights(double h, Eigen::Index phase);
  void to_modes(const Eigen::VectorXd& x, Eigen::ArrayXd& y1, Eigen::ArrayXd& y2) const;
  void from_modes(const Eigen::ArrayXd& y1, const Eigen::ArrayXd& y2, Eigen::VectorXd& x) const;
  /// Ñ = V⁻¹F − σ̄μ∘y for the derivative in `f_`.
  void remainder(const Eigen::ArrayXd& y1, const Eigen::ArrayXd& y2, Eigen::ArrayXd& n1,
                 Eigen::ArrayXd& n2) const;

  Eigen::Index n_ = 0;
  bool diagonal_ = true;
  // Per strip: eigenvalues μ₁, μ₂ of Lᵢ, V (columns = eigenvectors) and V⁻¹.
  Eigen::ArrayXd mu1_, mu2_, v11_, v12_, v21_, v22_, w11_, w12_, w21_, w22_;
  Eigen::ArrayXd mean_rate_;
  // Weights per mode: e^{z/2}, e^{z}, hq, hf₁, hf₂, hf₃ (columns 0..5 mode 1, 6..11 mode 2), of
  // the current step: w_ points at a phase's cached block or at own_.
  Eigen::ArrayXXd own_;
  Eigen::ArrayXd z_, t1_;  // weights() work arrays
  const double* w_ = nullptr;
  HugeBlock cache_;  // phases × (strips × 12) weights
  std::vector<char> filled_;
  Eigen::ArrayXd y1_, y2_, a1_, a2_, b1_, b2_, c1_, c2_, nu1_, nu2_, na1_, na2_, nb1_, nb2_, nc1_,
      nc2_;
  Eigen::VectorXd stage_, f_;
};

template <class Derivative>
void ExponentialStepper::step(Derivative&& derivative, Eigen::VectorXd& x, double t, double h,
                              const Eigen::Ref<const Eigen::ArrayXd>& rate0,
                              const Eigen::Ref<const Eigen::ArrayXd>& rate_half,
                              const Eigen::Ref<const Eigen::ArrayXd>& rate1, Eigen::Index phase) {
  mean_rate_ = (rate0 + 4.0 * rate_half + rate1) / 6.0;  // Δs/h, Simpson's rule
  weights(h, phase);
  const Eigen::Map<const Eigen::ArrayXXd> c(w_, n_, 12);
  const auto E2 = [&](int m) { return c.col(6 * m + 0); };
  const auto E = [&](int m) { return c.col(6 * m + 1); };
  const auto Q = [&](int m) { return c.col(6 * m + 2); };
  const auto F1 = [&](int m) { return c.col(6 * m + 3); };
  const auto F2 = [&](int m) { return c.col(6 * m + 4); };
  const auto F3 = [&](int m) { return c.col(6 * m + 5); };
  to_modes(x, y1_, y2_);
  derivative(x, t, f_);
  remainder(y1_, y2_, nu1_, nu2_);
  a1_ = E2(0) * y1_ + Q(0) * nu1_;
  a2_ = E2(1) * y2_ + Q(1) * nu2_;
  from_modes(a1_, a2_, stage_);
  derivative(stage_, t + 0.5 * h, f_);
  remainder(a1_, a2_, na1_, na2_);
  b1_ = E2(0) * y1_ + Q(0) * na1_;
  b2_ = E2(1) * y2_ + Q(1) * na2_;
  from_modes(b1_, b2_, stage_);
  derivative(stage_, t + 0.5 * h, f_);
  remainder(b1_, b2_, nb1_, nb2_);
  c1_ = E2(0) * a1_ + Q(0) * (2.0 * nb1_ - nu1_);
  c2_ = E2(1) * a2_ + Q(1) * (2.0 * nb2_ - nu2_);
  from_modes(c1_, c2_, stage_);
  derivative(stage_, t + h, f_);
  remainder(c1_, c2_, nc1_, nc2_);
  y1_ = E(0) * y1_ + F1(0) * nu1_ + 2.0 * F2(0) * (na1_ + nb1_) + F3(0) * nc1_;
  y2_ = E(1) * y2_ + F1(1) * nu2_ + 2.0 * F2(1) * (na2_ + nb2_) + F3(1) * nc2_;
  from_modes(y1_, y2_, x);
}

}  // namespace flapline
