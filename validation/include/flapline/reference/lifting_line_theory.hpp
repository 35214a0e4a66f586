#pragma once
/// \file
/// Steady lifting-line theory (Prandtl 1918-19; Glauert 1926, *The Elements of Aerofoil and
/// Airscrew Theory*): the reference side of the finite-wing validation cases. Source of each
/// formula beside it.

#include <functional>
#include <vector>

namespace flapline::reference {

/// Solution of Glauert's monoplane equation for a symmetric, untwisted wing of full span b:
/// Σ A_n sin nθ (sin θ + nμ) = μ α sin θ, μ = a₀c(θ)/(4b), y = −(b/2)cos θ, odd n only.
struct GlauertSolution {
  std::vector<double> coefficients;  ///< A₁, A₃, A₅, … per unit α
  double aspect_ratio = 0;           ///< b²/S
  double lift_slope = 0;             ///< C_Lα = πAR·A₁ (per rad)
  double delta = 0;                  ///< δ = Σ_{n≥3} n (A_n/A₁)²
  double span_efficiency() const { return 1.0 / (1.0 + delta); }
};

/// `chord(eta)` gives the chord at η = 2|y|/b ∈ [0, 1]; `terms` odd harmonics are collocated at
/// θ_m = mπ/(2·terms), m = 1..terms.
GlauertSolution glauert_lifting_line(const std::function<double(double)>& chord, double span,
                                     double a0, int terms);

/// Elliptic wing: C_Lα = a₀/(1 + a₀/(πAR)), C_Di = C_L²/(πAR) (Prandtl).
double elliptic_lift_slope(double a0, double aspect_ratio);

/// Helmbold (1942) low-aspect-ratio straight-wing lift slope:
/// a = a₀/[√(1 + (a₀/(πAR))²) + a₀/(πAR)].
double helmbold_lift_slope(double a0, double aspect_ratio);

}  // namespace flapline::reference
