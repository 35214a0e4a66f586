#pragma once
/// \file
/// The mass of one wing, cut into mass elements (DESIGN §9): every strip carries its mass at its
/// chordwise centre of mass with the inertia of a thin uniform strip, and point masses (spars,
/// hinges, tip weights) are elements without inertia of their own. Both wings carry the same
/// masses. Radial positions are those of the fully extended wing; folding scales them at run time.
/// Key paths in errors: `wing.mass.*`.

#include <Eigen/Core>
#include <vector>

#include "flapline/geometry/planform.hpp"
#include "flapline/geometry/strips.hpp"

namespace flapline {

/// A point mass on the wing.
struct PointMassSpec {
  double span_fraction = 0.0;   ///< r/R of the unfolded wing, [0, 1]
  double chord_fraction = 0.0;  ///< from the leading edge, fraction of the local chord, [0, 1]
  double mass = 0.0;            ///< kg, [0, 100]
};

/// What the user gave: a total mass spread at uniform areal density, or a table of mass per unit
/// span with the chordwise centre of mass, and any point masses. Nothing given: a massless wing.
struct WingMassSpec {
  double total = 0.0;  ///< kg of one wing at uniform areal density (without the point masses)
  /// Table rows: span fraction (0 first, 1 last, increasing), mass per unit span (kg/m, ≥ 0),
  /// chordwise centre of mass as a fraction of the local chord from the leading edge; linear in
  /// between.
  std::vector<double> table_span_fraction, table_mass_per_span, table_centre_fraction;
  std::vector<PointMassSpec> points;
  /// True when the wing has any mass.
  bool any() const noexcept {
    return total > 0.0 || !table_span_fraction.empty() || !points.empty();
  }
};

/// One wing's mass elements (strips first, then point masses). Per element: mass m at the point
/// r e_s + ℓ e_c of the unfolded wing (e_c twisted); thin-strip inertia about its own centre of
/// mass m c²/12 about e_s, m(λΔr)²/12 about e_c and their sum about e_n; the stretching inertia
/// mΔr²/12 of the span-ratio coordinate (0 for point masses).
struct MassElements {
  Eigen::ArrayXd mass;    ///< kg
  Eigen::ArrayXd radius;  ///< m, unscaled radius of the centre of mass
  Eigen::ArrayXd offset;  ///< ℓ, m ahead of the pitch axis
  Eigen::ArrayXd cos_twist, sin_twist;
  Eigen::ArrayXd chord_inertia;    ///< m c²/12 (kg·m²)
  Eigen::ArrayXd stretch_inertia;  ///< m Δr²/12 (kg·m², unscaled)
  double total = 0.0;              ///< kg, one wing
  Eigen::Index size() const noexcept { return mass.size(); }
};

/// Throws InputError naming `wing.mass.*` (ranges, table coverage, both total and table).
void validate(const WingMassSpec& spec);

/// Distribute the mass over the strips' edges (each strip's mass centre at the mid-point of its
/// edges, so a uniform rectangle's inertia is exact whatever the spacing) and add the points.
MassElements distribute_mass(const WingMassSpec& spec, const Planform& planform,
                             const Strips& strips);

}  // namespace flapline
