#include "flapline/geometry/strips.hpp"

#include <cmath>

#include "flapline/common/errors.hpp"
#include "flapline/common/math.hpp"

namespace flapline {

Strips cut_into_strips(const Planform& planform, const StripSpec& spec) {
  if (spec.count < 1 || spec.count > 400)
    throw InputError("wing.strips", std::to_string(spec.count), "must lie in [1, 400] (per wing)");
  const int n = spec.count;
  const double R = planform.span();
  Strips s;
  s.edge_radius.resize(n + 1);
  for (int j = 0; j <= n; ++j) {
    const double u = static_cast<double>(j) / n;
    s.edge_radius(j) = spec.spacing == StripSpacing::uniform ? R * u : R * std::sin(0.5 * kPi * u);
  }
  s.edge_radius(n) = R;
  s.edge_chord = s.edge_radius.unaryExpr([&](double r) { return planform.chord(r); });
  s.edge_leading_edge = s.edge_radius.unaryExpr([&](double r) { return planform.leading_edge(r); });
  s.edge_twist = s.edge_radius.unaryExpr([&](double r) { return planform.twist(r); });
  // Centres: mid-point of the edges (uniform) or of their angles θ (cosine), r_i = R sin θ_{i+½}.
  // The angle mid-point makes the discrete lifting line reproduce Prandtl's and Glauert's
  // solutions closely from a few strips (tests/aero/lifting_line_test.cpp).
  s.radius = 0.5 * (s.edge_radius.head(n) + s.edge_radius.tail(n));
  if (spec.spacing == StripSpacing::cosine)
    for (int i = 0; i < n; ++i) s.radius(i) = R * std::sin(0.5 * kPi * (i + 0.5) / n);
  s.width = s.edge_radius.tail(n) - s.edge_radius.head(n);
  s.chord = s.radius.unaryExpr([&](double r) { return planform.chord(r); });
  s.leading_edge = s.radius.unaryExpr([&](double r) { return planform.leading_edge(r); });
  s.pivot_fraction = s.leading_edge / s.chord;
  s.twist = s.radius.unaryExpr([&](double r) { return planform.twist(r); });
  s.cos_twist = s.twist.cos();
  s.sin_twist = s.twist.sin();
  for (int i = 0; i < n; ++i)
    if (!(s.chord(i) > 0.0))
      throw InputError("wing.strips", std::to_string(n),
                       "strip " + std::to_string(i + 1) + " has zero chord at its centre",
                       "the planform's chord must be positive inside the span")
          .between_keys();
  return s;
}

}  // namespace flapline
