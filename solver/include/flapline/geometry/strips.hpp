#pragma once
/// \file
/// Cutting one wing into blade strips (DESIGN §3). Radial positions are those of the fully
/// extended wing (span ratio 1); morphing scales them at run time.

#include <Eigen/Core>

#include "flapline/common/enum_names.hpp"
#include "flapline/geometry/planform.hpp"

namespace flapline {

/// How strip edges are spaced along the span.
enum class StripSpacing {
  uniform,  ///< equal widths, centres at the edge mid-points
  cosine    ///< half-cosine edges r_j = R sin(πj/2N), centres R sin(π(j+½)/2N): fine at the tip
};
template <>
struct EnumNames<StripSpacing> {
  static constexpr std::array<std::pair<StripSpacing, std::string_view>, 2> items{
      {{StripSpacing::uniform, "uniform"}, {StripSpacing::cosine, "cosine"}}};
};

/// Key paths in errors: `wing.strips`, `wing.strip_spacing`.
struct StripSpec {
  int count = 20;  ///< strips per wing, [1, 400]
  StripSpacing spacing = StripSpacing::cosine;
};

/// One wing's strips. Every array has one entry per strip (N) except the edge arrays (N + 1).
/// Values are taken at the strip centre (never at the exact tip).
struct Strips {
  Eigen::ArrayXd edge_radius;        ///< m, strip edges from root to tip
  Eigen::ArrayXd edge_chord;         ///< m, chord at the edges
  Eigen::ArrayXd edge_leading_edge;  ///< m, leading edge ahead of the pitch axis at the edges
  Eigen::ArrayXd edge_twist;         ///< rad, twist at the edges
  Eigen::ArrayXd radius;             ///< m, strip centre
  Eigen::ArrayXd width;              ///< m
  Eigen::ArrayXd chord;              ///< m
  Eigen::ArrayXd leading_edge;       ///< m ahead of the pitch axis (= x₀ c)
  Eigen::ArrayXd pivot_fraction;     ///< x₀ = leading_edge / chord
  Eigen::ArrayXd twist;              ///< rad
  Eigen::ArrayXd cos_twist, sin_twist;

  Eigen::Index size() const noexcept { return radius.size(); }
};

/// Cut a validated planform into strips; throws InputError for a bad count.
Strips cut_into_strips(const Planform& planform, const StripSpec& spec);

}  // namespace flapline
