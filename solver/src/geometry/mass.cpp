#include "flapline/geometry/mass.hpp"

#include <cmath>
#include <string>

#include "flapline/common/errors.hpp"
#include "flapline/common/math.hpp"

namespace flapline {
namespace {

constexpr double kMaxMass = 100.0;  // kg; a sanity bound for one wing's masses

void check_mass(double m, const std::string& key) {
  if (!(m >= 0.0 && m <= kMaxMass))
    throw InputError(key, format_number(m), "must lie in [0, 100] kg");
}

/// Linear interpolation in a validated table.
double interpolate(const std::vector<double>& x, const std::vector<double>& y, double u) {
  std::size_t j = 1;
  while (j + 1 < x.size() && x[j] < u) ++j;
  const double w = (u - x[j - 1]) / (x[j] - x[j - 1]);
  return y[j - 1] + w * (y[j] - y[j - 1]);
}

}  // namespace

void validate(const WingMassSpec& s) {
  check_mass(s.total, "wing.mass.total");
  const std::size_t n = s.table_span_fraction.size();
  if (n > 0) {
    if (s.total > 0.0)
      throw InputError("wing.mass.total", format_number(s.total),
                       "give either wing.mass.total (uniform areal density) or "
                       "wing.mass.per_span (a table), not both")
          .between_keys();
    if (n < 2)
      throw InputError("wing.mass.per_span", std::to_string(n) + " row",
                       "needs at least 2 rows [span_fraction, kg_per_m, centre_chord_fraction]");
    if (s.table_span_fraction.front() != 0.0 || s.table_span_fraction.back() != 1.0)
      throw InputError("wing.mass.per_span",
                       "span fractions " + format_number(s.table_span_fraction.front()) + " to " +
                           format_number(s.table_span_fraction.back()),
                       "must cover the whole span: first row at 0, last row at 1");
    for (std::size_t i = 0; i < n; ++i) {
      const std::string row = "row " + std::to_string(i + 1);
      // Values "row K: v" place the error on that row's own line (io layer).
      if (i > 0 && !(s.table_span_fraction[i] > s.table_span_fraction[i - 1]))
        throw InputError("wing.mass.per_span", row + ": " + format_number(s.table_span_fraction[i]),
                         "span fractions must increase");
      const double mps = s.table_mass_per_span[i];
      if (!(mps >= 0.0 && mps <= 1e4))
        throw InputError("wing.mass.per_span", row + ": " + format_number(mps),
                         "mass per unit span must lie in [0, 10000] kg/m");
      const double f = s.table_centre_fraction[i];
      if (!(f >= 0.0 && f <= 1.0))
        throw InputError("wing.mass.per_span", row + ": " + format_number(f),
                         "the chordwise centre of mass must lie in [0, 1] (fraction of the chord "
                         "from the leading edge)");
    }
  }
  for (std::size_t i = 0; i < s.points.size(); ++i) {
    const PointMassSpec& p = s.points[i];
    const std::string key = "wing.mass.points";
    const std::string row = "row " + std::to_string(i + 1);
    if (!(p.span_fraction >= 0.0 && p.span_fraction <= 1.0))
      throw InputError(key, row + ": " + format_number(p.span_fraction),
                       "the span fraction must lie in [0, 1]: a point mass must lie on the wing");
    if (!(p.chord_fraction >= 0.0 && p.chord_fraction <= 1.0))
      throw InputError(key, row + ": " + format_number(p.chord_fraction),
                       "the chord fraction (from the leading edge) must lie in [0, 1]: a point "
                       "mass must lie on the wing");
    if (!(p.mass >= 0.0 && p.mass <= kMaxMass))
      throw InputError(key, row + ": " + format_number(p.mass), "the mass must lie in [0, 100] kg");
  }
}

MassElements distribute_mass(const WingMassSpec& spec, const Planform& planform,
                             const Strips& strips) {
  const Eigen::Index n = strips.size();
  const auto np = static_cast<Eigen::Index>(spec.points.size());
  MassElements e;
  for (Eigen::ArrayXd* a : {&e.mass, &e.radius, &e.offset, &e.cos_twist, &e.sin_twist,
                            &e.chord_inertia, &e.stretch_inertia})
    a->setZero(n + np);
  const double R = planform.span();
  const bool table = !spec.table_span_fraction.empty();
  double area = 0.0;
  for (Eigen::Index i = 0; i < n; ++i) {
    const double r = 0.5 * (strips.edge_radius(i) + strips.edge_radius(i + 1));
    const double dr = strips.edge_radius(i + 1) - strips.edge_radius(i);
    const double c = planform.chord(r), twist = planform.twist(r);
    double centre = 0.5;  // chord fraction from the leading edge
    double m = c * dr;    // area, scaled below for the uniform law
    if (table) {
      m = interpolate(spec.table_span_fraction, spec.table_mass_per_span, r / R) * dr;
      centre = interpolate(spec.table_span_fraction, spec.table_centre_fraction, r / R);
    }
    area += c * dr;
    e.mass(i) = m;
    e.radius(i) = r;
    e.offset(i) = planform.leading_edge(r) - centre * c;
    e.cos_twist(i) = std::cos(twist);
    e.sin_twist(i) = std::sin(twist);
    e.chord_inertia(i) = c * c / 12.0;  // per kg, scaled below
    e.stretch_inertia(i) = dr * dr / 12.0;
  }
  if (!table) e.mass.head(n) *= area > 0.0 ? spec.total / area : 0.0;
  e.chord_inertia.head(n) *= e.mass.head(n);
  e.stretch_inertia.head(n) *= e.mass.head(n);
  for (Eigen::Index j = 0; j < np; ++j) {
    const PointMassSpec& p = spec.points[static_cast<std::size_t>(j)];
    const double r = p.span_fraction * R, twist = planform.twist(r);
    e.mass(n + j) = p.mass;
    e.radius(n + j) = r;
    e.offset(n + j) = planform.leading_edge(r) - p.chord_fraction * planform.chord(r);
    e.cos_twist(n + j) = std::cos(twist);
    e.sin_twist(n + j) = std::sin(twist);
  }
  e.total = e.mass.sum();
  return e;
}

}  // namespace flapline
