#pragma once
/// \file
/// Options of the aerodynamic models (DESIGN §4). Key paths in errors: `model.*`.

#include "flapline/common/enum_names.hpp"

namespace flapline {

/// Which aerodynamic model a run uses.
enum class ModelKind {
  quasi_steady,  ///< no states: loads follow the instantaneous kinematics
  wagner,        ///< two Jones–Wagner lag states per strip (2D unsteady strips)
  lifting_line   ///< the wagner states coupled through horseshoe vortices over both wings
};
template <>
struct EnumNames<ModelKind> {
  static constexpr std::array<std::pair<ModelKind, std::string_view>, 3> items{
      {{ModelKind::quasi_steady, "quasi_steady"},
       {ModelKind::wagner, "wagner"},
       {ModelKind::lifting_line, "lifting_line"}}};
};

/// Which strips the lifting line couples.
enum class SpanCoupling {
  none,         ///< K = 0: the wagner model exactly (for checks)
  within_wing,  ///< each wing's strips see their own wing's vortices only
  both_wings    ///< every strip sees both wings' vortices (default)
};
template <>
struct EnumNames<SpanCoupling> {
  static constexpr std::array<std::pair<SpanCoupling, std::string_view>, 3> items{
      {{SpanCoupling::none, "none"},
       {SpanCoupling::within_wing, "within_wing"},
       {SpanCoupling::both_wings, "both_wings"}}};
};

/// Two-exponential fit of Wagner's indicial lift function, φ(s) ≈ 1 − A₁e^{−b₁s} − A₂e^{−b₂s}
/// (s in semichords travelled).
enum class WagnerFit {
  rt_jones,  ///< A = (0.165, 0.335), b = (0.0455, 0.3): R.T. Jones, NACA Report 681 (1940)
  wp_jones   ///< A = (0.165, 0.335), b = (0.041, 0.32): W.P. Jones, ARC R&M (1945)
};
template <>
struct EnumNames<WagnerFit> {
  static constexpr std::array<std::pair<WagnerFit, std::string_view>, 2> items{
      {{WagnerFit::rt_jones, "rt_jones"}, {WagnerFit::wp_jones, "wp_jones"}}};
};

/// Coefficients of a Wagner fit.
struct WagnerCoefficients {
  double a1, a2;  ///< amplitudes A₁, A₂
  double b1, b2;  ///< rates per semichord b₁, b₂
};
WagnerCoefficients wagner_coefficients(WagnerFit fit);

/// What the lag models do where the air meets the trailing edge first (U_t < 0).
enum class ReverseFlow {
  attached,   ///< keep the attached-flow formulas unchanged (default; the share is reported)
  no_suction  ///< drop the leading-edge suction there: a sharp edge facing the flow keeps none
};
template <>
struct EnumNames<ReverseFlow> {
  static constexpr std::array<std::pair<ReverseFlow, std::string_view>, 2> items{
      {{ReverseFlow::attached, "attached"}, {ReverseFlow::no_suction, "no_suction"}}};
};

/// Coefficient law of the quasi-steady model.
enum class CoefficientLaw {
  thin_airfoil,  ///< Γ = πc·w_¾ in the shared load formulas (slow-motion limit of the lag models)
  revolving_fit  ///< lift/drag fits of revolving robotic wings plus the rotational force
};
template <>
struct EnumNames<CoefficientLaw> {
  static constexpr std::array<std::pair<CoefficientLaw, std::string_view>, 2> items{
      {{CoefficientLaw::thin_airfoil, "thin_airfoil"},
       {CoefficientLaw::revolving_fit, "revolving_fit"}}};
};

/// Coefficients of the revolving-wing fit, α in degrees:
/// C_L = lift_offset + lift_amplitude · sin(lift_rate·α − lift_shift),
/// C_D = drag_offset − drag_amplitude · cos(drag_rate·α − drag_shift).
/// Defaults: Dickinson, Lehmann & Sane (1999), Science 284:1954-1960, robotic fruit-fly wing.
struct RevolvingFit {
  double lift_offset = 0.225, lift_amplitude = 1.58, lift_rate = 2.13, lift_shift = 7.20;
  double drag_offset = 1.92, drag_amplitude = 1.55, drag_rate = 2.04, drag_shift = 9.82;

  /// C_L(α) for α in rad, extended oddly to α < 0 and by flat-plate symmetry
  /// (C_L(180° − α) = −C_L(α)) to reverse flow (common practice).
  double lift_coefficient(double alpha) const;
  /// C_D(α), even in α and symmetric about 90° in the same way.
  double drag_coefficient(double alpha) const;
};

/// How the lifting line solves its circulation system (I − D₀K)Γ = r at each stage.
enum class LineSolve {
  structured,  ///< per-phase inverses, split into mirror halves when the wings move alike (default)
  direct       ///< assemble K and factorise I − D₀K afresh at every stage (the reference, slow)
};
template <>
struct EnumNames<LineSolve> {
  static constexpr std::array<std::pair<LineSolve, std::string_view>, 2> items{
      {{LineSolve::structured, "structured"}, {LineSolve::direct, "direct"}}};
};

/// Zero-lift profile (skin-friction) drag of each section.
enum class ProfileDragLaw {
  none,      ///< no profile drag (default)
  constant,  ///< a constant coefficient C_D0 (model.profile_drag.coefficient)
  blasius  ///< laminar flat plate, both faces: C_D0 = 2·1.328/√Re_c (Blasius 1908), Re_c ≥ 100
};
template <>
struct EnumNames<ProfileDragLaw> {
  static constexpr std::array<std::pair<ProfileDragLaw, std::string_view>, 3> items{
      {{ProfileDragLaw::none, "none"},
       {ProfileDragLaw::constant, "constant"},
       {ProfileDragLaw::blasius, "blasius"}}};
};

/// Profile drag ½ρC_D0 c U² per unit span along the air's velocity relative to the section (in
/// the section plane), acting at mid-chord; thin-airfoil law only.
struct ProfileDrag {
  ProfileDragLaw law = ProfileDragLaw::none;
  double coefficient = 0.0;  ///< C_D0 of the constant law, [0, 2]
  /// Floor of the chord Reynolds number U c/ν in the Blasius law.
  static constexpr double kMinReynolds = 100.0;
  /// C_D0 at chord Reynolds number `reynolds` (the floor applied for blasius).
  double coefficient_at(double reynolds) const;
};

/// Momentum-theory inflow: the far wake's uniform induced velocity w₀, updated from each cycle's
/// mean force with under-relaxation and added to the wind of every strip.
enum class InflowModel {
  none,  ///< no far-wake inflow (default)
  stroke_disc,  ///< w₀ along the stroke-plane normal, disc ΦR²·mean(λ²) for the pair (|β| ≤ 45°)
  span_disc  ///< forward flight: w₀ opposite to the mean lift, disc πb²/4 (not lifting_line)
};
template <>
struct EnumNames<InflowModel> {
  static constexpr std::array<std::pair<InflowModel, std::string_view>, 3> items{
      {{InflowModel::none, "none"},
       {InflowModel::stroke_disc, "stroke_disc"},
       {InflowModel::span_disc, "span_disc"}}};
};

/// Every aerodynamic option of a run, with defaults.
struct AeroOptions {
  ModelKind kind = ModelKind::quasi_steady;
  CoefficientLaw law = CoefficientLaw::thin_airfoil;  ///< quasi_steady only
  /// η_s in [0, 1]: share of the leading-edge suction recovered (1 attached flow, 0 separated).
  double suction_recovery = 1.0;
  /// κ_v in [0, 2]: Polhamus vortex-lift factor, allowed only with suction_recovery = 0.
  double vortex_lift = 0.0;
  RevolvingFit fit;                                       ///< revolving_fit law only
  WagnerFit wagner_fit = WagnerFit::rt_jones;             ///< lag models only
  ReverseFlow reverse_flow = ReverseFlow::attached;       ///< thin-airfoil loads
  SpanCoupling span_coupling = SpanCoupling::both_wings;  ///< lifting_line only
  LineSolve line_solve = LineSolve::structured;           ///< lifting_line only
  ProfileDrag profile_drag;                               ///< thin_airfoil law only
  InflowModel inflow = InflowModel::none;
  double inflow_relaxation = 0.5;  ///< (0, 1]: share of each cycle's correction of w₀ applied
};

/// Throws InputError for an option out of range.
void validate(const AeroOptions& options);

}  // namespace flapline
