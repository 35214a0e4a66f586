#include "flapline/studies/derivatives.hpp"

#include <algorithm>
#include <cmath>

#include "flapline/common/errors.hpp"

namespace flapline::studies {

std::vector<std::string> derivative_quantities() {
  return {"cycle_mean.X_N",       "cycle_mean.Y_N",        "cycle_mean.Z_N",
          "cycle_mean.L_roll_Nm", "cycle_mean.M_pitch_Nm", "cycle_mean.N_yaw_Nm",
          "power.actuator_mean_W"};
}

double derivative_step(const Parameter& p, double speed) {
  switch (p.kind) {
    case Parameter::Kind::key:
      return p.base != 0.0 ? 1e-3 * std::abs(p.base) : 1e-3;
    case Parameter::Kind::velocity:
      return 1e-3 * std::max(speed, 1.0);
    case Parameter::Kind::rate:
      return 1e-3;
  }
  return 1e-3;
}

DerivativeTable derivatives(const std::vector<Parameter>& params,
                            const std::vector<std::string>& quantities, const CaseSpec& base,
                            const CaseBuilderFactory& factory, const RunnerOptions& options) {
  DerivativeTable t;
  t.quantities = quantities;
  t.parameters = params;
  const Eigen::Index n = static_cast<Eigen::Index>(params.size());
  const Eigen::Index m = static_cast<Eigen::Index>(quantities.size());
  Eigen::VectorXd x0(n);
  for (Eigen::Index j = 0; j < n; ++j) x0(j) = params[static_cast<std::size_t>(j)].base;

  // The base run first: its speed and rates set the steps of the flight-state parameters.
  std::vector<RunSummary> first = evaluate({case_at(params, x0, base)}, factory, options);
  t.base = first.front();
  t.runs = 1;
  if (!has_results(t.base.status))
    throw InputError(t.base.error_key.empty() ? "derivatives" : t.base.error_key,
                     std::string(to_string(t.base.status)), t.base.message);
  const double speed = t.base.derived.airspeed;

  // Four cases per parameter: x ± h, x ± h/2.
  std::vector<CaseSpec> cases;
  for (Eigen::Index j = 0; j < n; ++j) {
    const double h = derivative_step(params[static_cast<std::size_t>(j)], speed);
    t.step.push_back(h);
    for (double d : {h, -h, 0.5 * h, -0.5 * h}) {
      Eigen::VectorXd x = x0;
      x(j) += d;
      cases.push_back(case_at(params, x, base));
    }
  }
  const std::vector<RunSummary> s = evaluate(cases, factory, options);
  t.runs += static_cast<int>(cases.size());

  t.value.setZero(m, n);
  t.error.setZero(m, n);
  t.flagged.setConstant(m, n, false);
  auto values = [&](const RunSummary& r) {
    Eigen::VectorXd v(m);
    for (Eigen::Index i = 0; i < m; ++i)
      v(i) = summary_value(r, quantities[static_cast<std::size_t>(i)]);
    return v;
  };
  const Eigen::VectorXd f0 = values(t.base);
  // Scales for the flagging floor.
  const double force = std::max(t.base.averages.force_rms, 1e-300);
  const double span = t.base.derived.span;
  const double power = std::max({std::abs(t.base.averages.power_actuator_mean),
                                 std::abs(t.base.averages.power_actuator_peak), 1e-300});
  for (Eigen::Index j = 0; j < n; ++j) {
    const RunSummary& rp = s[static_cast<std::size_t>(4 * j)];
    const RunSummary& rm = s[static_cast<std::size_t>(4 * j + 1)];
    const RunSummary& rp2 = s[static_cast<std::size_t>(4 * j + 2)];
    const RunSummary& rm2 = s[static_cast<std::size_t>(4 * j + 3)];
    const double h = t.step[static_cast<std::size_t>(j)];
    const bool plus_ok = has_results(rp.status) && has_results(rp2.status);
    const bool minus_ok = has_results(rm.status) && has_results(rm2.status);
    Eigen::VectorXd dh, dh2;
    double richardson = 3.0;
    if (plus_ok && minus_ok) {
      t.scheme.push_back("central");
      dh = (values(rp) - values(rm)) / (2 * h);
      dh2 = (values(rp2) - values(rm2)) / h;
    } else if (plus_ok) {  // at a lower bound of the key's range
      t.scheme.push_back("forward");
      dh = (values(rp) - f0) / h;
      dh2 = (values(rp2) - f0) / (0.5 * h);
      richardson = 1.0;
    } else if (minus_ok) {
      t.scheme.push_back("backward");
      dh = (f0 - values(rm)) / h;
      dh2 = (f0 - values(rm2)) / (0.5 * h);
      richardson = 1.0;
    } else {
      const RunSummary& bad = has_results(rp.status) ? rm : rp;
      throw InputError(params[static_cast<std::size_t>(j)].name, std::string(to_string(bad.status)),
                       "no step of " + shortest(h) + " either way runs: " + bad.message);
    }
    t.value.col(j) = dh2;
    t.error.col(j) = (dh2 - dh).cwiseAbs() / richardson;
    for (Eigen::Index i = 0; i < m; ++i) {
      const std::string& q = quantities[static_cast<std::size_t>(i)];
      const QuantityKind k = quantity_kind(q);
      const double scale = k == QuantityKind::force    ? force
                           : k == QuantityKind::moment ? force * span
                                                       : power;
      const double floor = 1e-9 * scale / h;
      t.flagged(i, j) = t.error(i, j) > 0.01 * std::abs(t.value(i, j)) + floor;
    }
  }
  return t;
}

}  // namespace flapline::studies
