#pragma once
/// \file
/// Classical unsteady thin-airfoil results, evaluated with Boost.Math special functions: the
/// reference side of the validation cases. Each function names its published source. Kept outside
/// flapline::core on purpose (DESIGN §1). Conventions (REFERENCES.md): semichord b = c/2, reduced
/// frequency k = ωb/U, reduced time s = Ut/b, harmonic time factor e^{iωt}.

#include <complex>

namespace flapline::reference {

/// Theodorsen's function C(k) = H₁⁽²⁾(k) / [H₁⁽²⁾(k) + i H₀⁽²⁾(k)] (Theodorsen 1935, NACA
/// Report 496), k > 0.
std::complex<double> theodorsen(double k);

/// C(k) implied by a two-exponential Wagner fit 1 − a₁e^{−b₁s} − a₂e^{−b₂s}:
/// C = 1 − a₁ − a₂ + a₁b₁/(b₁ + ik) + a₂b₂/(b₂ + ik) (Duhamel/Laplace; REFERENCES §1).
std::complex<double> theodorsen_fit(double k, double a1, double a2, double b1, double b2);

/// Exact Wagner function φ(s) from the non-oscillatory branch-cut integral
/// φ(s) = 1 − ∫₀^∞ e^{−xs} dx / (x² [(K₁(x) − K₀(x))² + π²(I₀(x) + I₁(x))²]) (REFERENCES §1;
/// Wagner 1925, ZAMM 5), s >= 0.
double wagner(double s);

/// Two-exponential fit φ(s) = 1 − a₁e^{−b₁s} − a₂e^{−b₂s}.
double wagner_fit(double s, double a1, double a2, double b1, double b2);

/// Complex lift amplitude per unit span, divided by ρU²b, of a thin airfoil in small harmonic
/// plunge h = h̄e^{iωt} (h positive down, lift positive up), per unit h̄/b:
/// π(−k² + 2ikC) (Theodorsen 1935; Bisplinghoff, Ashley & Halfman 1955).
std::complex<double> plunge_lift(double k, std::complex<double> c);

/// The same for pitch α = ᾱe^{iωt} (nose up) about the axis a·b aft of mid-chord, per unit ᾱ:
/// π[ik + ak²] + 2πC[1 + ik(½ − a)].
std::complex<double> pitch_lift(double k, double a, std::complex<double> c);

/// Garrick (1936, NACA Report 567) for pure plunge h = h₀cos ωt at speed U: mean thrust
/// T̄ = πρbω²h₀²(F² + G²), mean input power P̄ = πρbω²h₀²U·F per unit span, propulsive
/// efficiency η = T̄U/P̄ = (F² + G²)/F.
struct GarrickPlunge {
  double thrust;      ///< N/m
  double power;       ///< W/m
  double efficiency;  ///< −
};
GarrickPlunge garrick_plunge(double rho, double b, double omega, double h0, double speed,
                             std::complex<double> c);

}  // namespace flapline::reference
