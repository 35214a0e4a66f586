#pragma once
/// \file
/// Planform of one wing (the right one; the left wing is its mirror image): span, chord
/// distribution, pitch-axis position, root hinge and linear twist (DESIGN §3).

#include <Eigen/Core>
#include <string>
#include <vector>

#include "flapline/common/enum_names.hpp"

namespace flapline {

/// Chord-distribution families.
enum class PlanformShape {
  rectangular,  ///< constant chord
  elliptic,     ///< c = c_root sqrt(1 - (r/R)^2), largest chord at the root
  tapered,      ///< linear from root chord to tip chord
  beta,         ///< Ellington (1984) beta distribution given by r̂₁ and r̂₂
  table         ///< tabulated chord and leading edge, linear between rows
};
template <>
struct EnumNames<PlanformShape> {
  static constexpr std::array<std::pair<PlanformShape, std::string_view>, 5> items{
      {{PlanformShape::rectangular, "rectangular"},
       {PlanformShape::elliptic, "elliptic"},
       {PlanformShape::tapered, "tapered"},
       {PlanformShape::beta, "beta"},
       {PlanformShape::table, "table"}}};
};

/// Everything that defines a planform. Lengths in m, angles in rad. Key paths in errors: `wing.*`.
struct PlanformSpec {
  PlanformShape shape = PlanformShape::rectangular;
  double span = 0.0;                   ///< R, m, hinge (root) to tip of one wing; > 0
  double chord = 0.0;                  ///< m, rectangular chord; > 0
  double root_chord = 0.0;             ///< m, elliptic and tapered root chord; > 0
  double tip_chord = 0.0;              ///< m, tapered tip chord; >= 0
  double mean_chord = 0.0;             ///< m, beta: area / span; > 0
  double first_moment_radius = 0.5;    ///< r̂₁ of the beta family, (0, 1)
  double second_moment_radius = 0.55;  ///< r̂₂ of the beta family, (r̂₁, r̂₂,max]
  /// Table rows (shape = table): radial position as a fraction of the span (0 first, 1 last,
  /// increasing), chord (m, >= 0) and leading-edge position (m ahead of the pitch axis, within
  /// [0, chord]).
  std::vector<double> table_span_fraction, table_chord, table_leading_edge;
  double pitch_axis = 0.25;  ///< x₀, chord fraction from the leading edge, [0, 1] (not for tables)
  Eigen::Vector3d hinge = Eigen::Vector3d::Zero();  ///< m, right-wing root in body axes
  double twist_root = 0.0;  ///< rad, extra pitch (+ leading edge up) at the root
  double twist_tip = 0.0;   ///< rad, extra pitch at the tip; linear in between
};

/// Validated planform with its area moments. Immutable; cheap queries.
class Planform {
 public:
  /// Validate and build; throws InputError naming `wing.<field>`.
  explicit Planform(PlanformSpec spec);

  const PlanformSpec& spec() const noexcept { return spec_; }
  double span() const noexcept { return spec_.span; }
  /// Chord (m) at radial position r (m), 0 <= r <= R.
  double chord(double r) const;
  /// Distance (m) of the leading edge ahead of the pitch axis at r.
  double leading_edge(double r) const;
  /// Linear twist (rad) at r.
  double twist(double r) const;
  /// Area of one wing S (m²).
  double area() const noexcept { return area_; }
  /// Mean chord S/R of one wing (m).
  double mean_chord() const noexcept { return area_ / spec_.span; }
  /// Aspect ratio of the pair, 4R²/S_pair = 2R²/S (DESIGN §3).
  double aspect_ratio() const noexcept { return 2.0 * spec_.span * spec_.span / area_; }
  /// Non-dimensional radius of the k-th moment of area, r̂_k = [∫c r^k dr / (S R^k)]^{1/k}
  /// (Ellington 1984, Part II); k = 1, 2, 3 are cached.
  double radius_moment(int k) const;
  /// ∫₀^R c(r) r^k dr (m^{k+1}), by quadrature suited to the shape.
  double area_moment(int k) const;

  /// Beta-family exponents p, q (shape = beta); ĉ ∝ r̂^{p-1}(1-r̂)^{q-1}.
  double beta_p() const noexcept { return p_; }
  double beta_q() const noexcept { return q_; }
  /// Largest r̂₂ that keeps p, q >= 1 (finite chord at root and tip) for a given r̂₁.
  static double max_second_moment_radius(double r1);

 private:
  PlanformSpec spec_;
  double p_ = 1.0, q_ = 1.0, beta_scale_ = 0.0;
  double area_ = 0.0;
  double r1_ = 0.0, r2_ = 0.0, r3_ = 0.0;
};

}  // namespace flapline
