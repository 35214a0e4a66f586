#include "flapline/geometry/planform.hpp"

#include <algorithm>
#include <cmath>

#include "flapline/common/errors.hpp"
#include "flapline/common/math.hpp"

namespace flapline {
namespace {

/// Lengths of the wing: positive and at most kMaxLength, so that areas, moments and speeds stay
/// far from overflow.
constexpr double kMaxLength = 1000.0;  // m

void require_positive(double v, const char* key, const char* unit) {
  if (!(v > 0.0 && v <= kMaxLength))
    throw InputError(key, format_number(v),
                     "must lie in (0, " + format_number(kMaxLength) + "] (" + unit + ")");
}

}  // namespace

double Planform::max_second_moment_radius(double r1) {
  // p = r1*nu, q = (1-r1)*nu with nu = r1(1-r1)/(r2²-r1²) - 1 (Ellington 1984 Part II, method of
  // moments); p, q >= 1  <=>  nu >= 1/min(r1, 1-r1).
  const double m = std::min(r1, 1.0 - r1);
  return std::sqrt(r1 * r1 + r1 * (1.0 - r1) / (1.0 + 1.0 / m));
}

Planform::Planform(PlanformSpec spec) : spec_(std::move(spec)) {
  const auto& s = spec_;
  require_positive(s.span, "wing.span", "m");
  if (s.shape != PlanformShape::table && (!(s.pitch_axis >= 0.0 && s.pitch_axis <= 1.0)))
    throw InputError("wing.pitch_axis", format_number(s.pitch_axis),
                     "must lie in [0, 1] (chord fraction from the leading edge)");
  if (!s.hinge.allFinite() || s.hinge.cwiseAbs().maxCoeff() > kMaxLength)
    throw InputError(
        "wing.hinge",
        "[" + format_number(s.hinge.x()) + ", " + format_number(s.hinge.y()) + ", " +
            format_number(s.hinge.z()) + "]",
        "must be three numbers within ±" + format_number(kMaxLength) + " (m, body axes)");
  for (auto [v, key] :
       {std::pair{s.twist_root, "wing.twist_root"}, std::pair{s.twist_tip, "wing.twist_tip"}})
    if (!(std::abs(v) <= 45.0 * kDegree))
      throw InputError(key, format_number(v / kDegree), "must lie in [-45, 45] (deg)");

  switch (s.shape) {
    case PlanformShape::rectangular:
      require_positive(s.chord, "wing.chord", "m");
      break;
    case PlanformShape::elliptic:
      require_positive(s.root_chord, "wing.root_chord", "m");
      break;
    case PlanformShape::tapered:
      require_positive(s.root_chord, "wing.root_chord", "m");
      if (!(s.tip_chord >= 0.0 && s.tip_chord <= kMaxLength))
        throw InputError("wing.tip_chord", format_number(s.tip_chord),
                         "must lie in [0, " + format_number(kMaxLength) + "] (m)");
      break;
    case PlanformShape::beta: {
      require_positive(s.mean_chord, "wing.mean_chord", "m");
      const double r1 = s.first_moment_radius, r2 = s.second_moment_radius;
      if (!(r1 > 0.0 && r1 < 1.0))
        throw InputError("wing.first_moment_radius", format_number(r1), "must lie in (0, 1)");
      const double r2max = max_second_moment_radius(r1);
      if (!(r2 > r1))
        throw InputError("wing.second_moment_radius", format_number(r2),
                         "must exceed first_moment_radius (" + format_number(r1) +
                             "): for any planform r̂₂ ≥ r̂₁, since the mean square of the radius "
                             "is at least the square of its mean (equal only with all the area "
                             "at one radius)",
                         "for r̂₁ = " + format_number(r1) + " choose r̂₂ in (" + format_number(r1) +
                             ", " + format_number(r2max) + "]")
            .between_keys();
      if (!(r2 <= r2max + 1e-12))
        throw InputError("wing.second_moment_radius", format_number(r2),
                         "must lie in (" + format_number(r1) + ", " + format_number(r2max) +
                             "] for first_moment_radius " + format_number(r1),
                         "larger values give an infinite chord at the root or tip")
            .between_keys();
      const double nu = r1 * (1.0 - r1) / (r2 * r2 - r1 * r1) - 1.0;
      p_ = r1 * nu;
      q_ = (1.0 - r1) * nu;
      // c(r) = c̄ r̂^{p-1}(1-r̂)^{q-1} / B(p, q) so that ∫c dr = c̄ R.
      const double beta_fn = std::exp(std::lgamma(p_) + std::lgamma(q_) - std::lgamma(p_ + q_));
      beta_scale_ = s.mean_chord / beta_fn;
      break;
    }
    case PlanformShape::table: {
      const auto& u = s.table_span_fraction;
      const std::size_t n = u.size();
      if (n < 2 || s.table_chord.size() != n || s.table_leading_edge.size() != n)
        throw InputError("wing.table", std::to_string(n) + " rows",
                         "needs at least 2 rows of span_fraction, chord, leading_edge");
      if (u.front() != 0.0 || u.back() != 1.0)
        throw InputError(
            "wing.table",
            "span_fraction " + format_number(u.front()) + ".." + format_number(u.back()),
            "span_fraction must start at 0 and end at 1");
      for (std::size_t i = 0; i < n; ++i) {
        if (i > 0 && !(u[i] > u[i - 1]))
          throw InputError("wing.table", "row " + std::to_string(i + 1),
                           "span_fraction must increase strictly");
        if (!(s.table_chord[i] >= 0.0 && s.table_chord[i] <= kMaxLength))
          throw InputError(
              "wing.table",
              "row " + std::to_string(i + 1) + " chord " + format_number(s.table_chord[i]),
              "chord must lie in [0, " + format_number(kMaxLength) + "] (m)");
        if (!(s.table_leading_edge[i] >= 0.0 && s.table_leading_edge[i] <= s.table_chord[i]))
          throw InputError("wing.table",
                           "row " + std::to_string(i + 1) + " leading_edge " +
                               format_number(s.table_leading_edge[i]),
                           "leading_edge must lie in [0, chord] (m ahead of the pitch axis)");
      }
      break;
    }
  }
  area_ = area_moment(0);
  if (!(area_ > 0.0)) throw InputError("wing", "area 0", "the planform must have a positive area");
  r1_ = area_moment(1) / (area_ * s.span);
  r2_ = std::sqrt(area_moment(2) / (area_ * s.span * s.span));
  r3_ = std::cbrt(area_moment(3) / (area_ * s.span * s.span * s.span));
}

double Planform::chord(double r) const {
  const auto& s = spec_;
  const double x = std::clamp(r / s.span, 0.0, 1.0);
  switch (s.shape) {
    case PlanformShape::rectangular:
      return s.chord;
    case PlanformShape::elliptic:
      return s.root_chord * std::sqrt(std::max(0.0, 1.0 - x * x));
    case PlanformShape::tapered:
      return s.root_chord + (s.tip_chord - s.root_chord) * x;
    case PlanformShape::beta:
      return beta_scale_ * std::pow(x, p_ - 1.0) * std::pow(1.0 - x, q_ - 1.0);
    case PlanformShape::table: {
      const auto& u = s.table_span_fraction;
      const auto it = std::upper_bound(u.begin(), u.end(), x);
      const std::size_t j = std::min<std::size_t>(
          static_cast<std::size_t>(std::max<std::ptrdiff_t>(it - u.begin(), 1)), u.size() - 1);
      const double w = (x - u[j - 1]) / (u[j] - u[j - 1]);
      return s.table_chord[j - 1] + w * (s.table_chord[j] - s.table_chord[j - 1]);
    }
  }
  return 0.0;
}

double Planform::leading_edge(double r) const {
  const auto& s = spec_;
  if (s.shape != PlanformShape::table) return s.pitch_axis * chord(r);
  const double x = std::clamp(r / s.span, 0.0, 1.0);
  const auto& u = s.table_span_fraction;
  const auto it = std::upper_bound(u.begin(), u.end(), x);
  const std::size_t j = std::min<std::size_t>(
      static_cast<std::size_t>(std::max<std::ptrdiff_t>(it - u.begin(), 1)), u.size() - 1);
  const double w = (x - u[j - 1]) / (u[j] - u[j - 1]);
  return s.table_leading_edge[j - 1] + w * (s.table_leading_edge[j] - s.table_leading_edge[j - 1]);
}

double Planform::twist(double r) const {
  const double x = std::clamp(r / spec_.span, 0.0, 1.0);
  return spec_.twist_root + (spec_.twist_tip - spec_.twist_root) * x;
}

double Planform::area_moment(int k) const {
  const double R = spec_.span;
  if (spec_.shape == PlanformShape::beta) {
    // ∫ c r^k dr = c̄ R^{k+1} B(p+k, q)/B(p, q) (analytic for the beta family).
    const double ratio = std::exp(std::lgamma(p_ + k) + std::lgamma(p_ + q_) -
                                  std::lgamma(p_ + q_ + k) - std::lgamma(p_));
    return spec_.mean_chord * std::pow(R, k + 1) * ratio;
  }
  if (spec_.shape == PlanformShape::table) {
    // Chord is linear on each row interval: 8-point Gauss is exact there.
    double sum = 0.0;
    const auto& u = spec_.table_span_fraction;
    for (std::size_t j = 1; j < u.size(); ++j)
      sum += integrate_gauss([&](double r) { return chord(r) * std::pow(r, k); }, u[j - 1] * R,
                             u[j] * R, 1);
    return sum;
  }
  // r = R sin θ removes the square-root behaviour of the elliptic chord at the tip.
  return integrate_gauss(
      [&](double th) {
        const double r = R * std::sin(th);
        return chord(r) * std::pow(r, k) * R * std::cos(th);
      },
      0.0, kPi / 2, 32);
}

double Planform::radius_moment(int k) const {
  if (k == 1) return r1_;
  if (k == 2) return r2_;
  if (k == 3) return r3_;
  const double R = spec_.span;
  return std::pow(area_moment(k) / (area_ * std::pow(R, k)), 1.0 / k);
}

}  // namespace flapline
