#include "flapline/io/local_studies.hpp"

#include <cmath>
#include <nlohmann/json.hpp>

#include "flapline/io/plots.hpp"
#include "flapline/version.hpp"

namespace flapline::io {
namespace {

using nlohmann::json;

double clean(double v) {
  return v == 0.0 ? 0.0 : v;
}

json matrix(const Eigen::MatrixXd& m) {
  json out = json::array();
  for (Eigen::Index i = 0; i < m.rows(); ++i) {
    json row = json::array();
    for (Eigen::Index j = 0; j < m.cols(); ++j)
      row.push_back(std::isfinite(m(i, j)) ? json(clean(m(i, j))) : json(nullptr));
    out.push_back(row);
  }
  return out;
}

std::vector<std::string> names(const std::vector<studies::Parameter>& p) {
  std::vector<std::string> n;
  for (const auto& x : p) n.push_back(x.name);
  return n;
}

}  // namespace

std::string quantity_unit(const std::string& q) {
  auto ends = [&q](const std::string& s) {
    return q.size() >= s.size() && q.compare(q.size() - s.size(), s.size(), s) == 0;
  };
  if (ends("_Nm")) return "N m";
  if (ends("_N")) return "N";
  if (ends("_W")) return "W";
  if (ends("_m_s")) return "m/s";
  if (ends("_deg")) return "deg";
  return "1";
}

std::string parameter_unit(const studies::Parameter& p) {
  switch (p.kind) {
    case studies::Parameter::Kind::velocity:
      return "m/s";
    case studies::Parameter::Kind::rate:
      return "rad/s";
    case studies::Parameter::Kind::key:
      break;
  }
  return "unit of the key as written in YAML (configs/README.md)";
}

std::string trim_json(const studies::TrimResult& r, const std::vector<studies::Parameter>& free,
                      double tolerance, const std::string& inner_runs) {
  json j;
  j["version"] = kVersion;
  j["status"] = std::string(to_string(r.status));
  j["message"] = r.message;
  json frees = json::array();
  for (std::size_t i = 0; i < free.size(); ++i) {
    const auto ii = static_cast<Eigen::Index>(i);
    frees.push_back({{"key", free[i].name},
                     {"value", r.values.size() ? json(clean(r.values(ii))) : json(nullptr)},
                     {"start", free[i].base},
                     {"lower_bound", free[i].low},
                     {"upper_bound", free[i].high}});
  }
  j["free"] = frees;
  json targets = json::array();
  for (std::size_t i = 0; i < r.quantities.size(); ++i) {
    const auto ii = static_cast<Eigen::Index>(i);
    const double achieved = r.achieved.size() ? r.achieved(ii) : std::nan("");
    targets.push_back(
        {{"quantity", r.quantities[i]},
         {"unit", quantity_unit(r.quantities[i])},
         {"target", clean(r.targets(ii))},
         {"achieved", std::isfinite(achieved) ? json(clean(achieved)) : json(nullptr)},
         {"scale", r.scale(ii)},
         {"scaled_residual", std::isfinite(achieved)
                                 ? json(clean((achieved - r.targets(ii)) / r.scale(ii)))
                                 : json(nullptr)}});
  }
  j["targets"] = targets;
  j["residual_rms_scaled"] = r.residual;
  j["tolerance"] = tolerance;
  j["iterations"] = r.iterations;
  j["runs"] = r.runs;
  j["jacobian"] = {
      {"rows", r.quantities}, {"columns", names(free)}, {"values", matrix(r.jacobian)}};
  j["condition_number"] = std::isfinite(r.condition) ? json(r.condition) : json(nullptr);
  j["active_bounds"] = r.active_bounds;
  j["residual_history"] = r.history;
  j["inner_runs"] = inner_runs;
  j["scaling"] =
      "forces by the weight (with a vehicle), else by the largest target force, else by the base "
      "run's force RMS; moments by that times the span; other quantities by max(|target|, |base "
      "value|, 1e-12)";
  return j.dump(2) + "\n";
}

std::string derivatives_csv(const studies::DerivativeTable& t) {
  std::string out = "quantity";
  for (const auto& p : t.parameters) out += "," + p.name;
  out += "\n";
  for (std::size_t i = 0; i < t.quantities.size(); ++i) {
    out += t.quantities[i];
    for (Eigen::Index j = 0; j < t.value.cols(); ++j)
      out += "," + studies::shortest(clean(t.value(static_cast<Eigen::Index>(i), j)));
    out += "\n";
  }
  return out;
}

Eigen::MatrixXd nondimensional(const studies::DerivativeTable& t) {
  const RunSummary& b = t.base;
  const double u = b.derived.reference_speed, rho = b.air_density;
  const double q = 0.5 * rho * u * u, s = 2.0 * b.derived.area, r = b.derived.span;
  Eigen::MatrixXd nd = t.value;
  for (Eigen::Index i = 0; i < nd.rows(); ++i) {
    const std::string unit = quantity_unit(t.quantities[static_cast<std::size_t>(i)]);
    const double qs = unit == "N"     ? q * s
                      : unit == "N m" ? q * s * r
                      : unit == "W"   ? q * s * u
                                      : 1.0;
    for (Eigen::Index j = 0; j < nd.cols(); ++j) {
      const auto& p = t.parameters[static_cast<std::size_t>(j)];
      const double ps = p.kind == studies::Parameter::Kind::velocity ? u
                        : p.kind == studies::Parameter::Kind::rate   ? (u > 0 ? u / r : 1.0)
                                                                     : 1.0;
      nd(i, j) = qs > 0 ? t.value(i, j) * ps / qs : 0.0;
    }
  }
  return nd;
}

std::string derivatives_json(const studies::DerivativeTable& t) {
  json j;
  j["version"] = kVersion;
  j["quantities"] = t.quantities;
  std::vector<std::string> qu;
  for (const auto& q : t.quantities) qu.push_back(quantity_unit(q));
  j["quantity_units"] = qu;
  json params = json::array();
  for (std::size_t k = 0; k < t.parameters.size(); ++k)
    params.push_back({{"name", t.parameters[k].name},
                      {"unit", parameter_unit(t.parameters[k])},
                      {"base", t.parameters[k].base},
                      {"step", t.step[k]},
                      {"scheme", t.scheme[k]}});
  j["parameters"] = params;
  j["values"] = matrix(t.value);
  j["error_estimates"] = matrix(t.error);
  json flags = json::array();
  for (Eigen::Index i = 0; i < t.flagged.rows(); ++i) {
    json row = json::array();
    for (Eigen::Index k = 0; k < t.flagged.cols(); ++k) row.push_back(bool(t.flagged(i, k)));
    flags.push_back(row);
  }
  j["flagged"] = flags;
  j["method"] =
      "D(h) and D(h/2) by central differences (forward or backward at a range bound); value "
      "D(h/2), error estimate |D(h/2) - D(h)|/3 (central) or |D(h/2) - D(h)| (one-sided); "
      "flagged where the estimate exceeds 1 % of |D| plus 1e-9 of the quantity's scale per step";
  j["units"] = "each value is the quantity's unit per the parameter's unit";
  const RunSummary& b = t.base;
  j["base_point"] = {{"lift_N", b.mean_lift()},
                     {"reference_speed_m_s", b.derived.reference_speed},
                     {"air_density_kg_m3", b.air_density},
                     {"airspeed_m_s", b.derived.airspeed},
                     {"status", std::string(to_string(b.status))}};
  const double u = b.derived.reference_speed;
  j["nondimensional"] = {
      {"values", matrix(nondimensional(t))},
      {"reference",
       {{"dynamic_pressure_Pa", 0.5 * b.air_density * u * u},
        {"area_pair_m2", 2.0 * b.derived.area},
        {"span_m", b.derived.span},
        {"speed_m_s", u}}},
      {"rule",
       "forces / (q S_pair), moments / (q S_pair R), power / (q S_pair U_ref); per unit of a "
       "config key as written, per unit of u/U_ref, per unit of p R/U_ref"}};
  j["runs"] = t.runs;
  return j.dump(2) + "\n";
}

std::map<std::string, std::string> derivative_plots(const studies::DerivativeTable& t,
                                                    const std::string& stem) {
  const Eigen::MatrixXd nd = nondimensional(t);
  ColourMap m;
  m.cells = true;
  for (Eigen::Index j = 0; j < nd.cols(); ++j) {
    m.x.push_back(static_cast<double>(j));
    m.xtics.push_back(t.parameters[static_cast<std::size_t>(j)].name);
  }
  for (Eigen::Index i = 0; i < nd.rows(); ++i) {
    m.y.push_back(static_cast<double>(i));
    m.ytics.push_back(t.quantities[static_cast<std::size_t>(i)]);
  }
  m.z.assign(m.x.size(), std::vector<double>(m.y.size(), 0.0));
  for (Eigen::Index i = 0; i < nd.rows(); ++i) {
    const double top = nd.row(i).cwiseAbs().maxCoeff();
    for (Eigen::Index j = 0; j < nd.cols(); ++j)
      m.z[static_cast<std::size_t>(j)][static_cast<std::size_t>(i)] =
          top > 0 ? nd(i, j) / top : 0.0;
  }
  m.zlabel = "non-dimensional derivative / largest in its row";
  Plot p;
  p.title = "Derivatives (non-dimensional, each row scaled by its largest entry)";
  return render(p, m, stem);
}

std::string modes_json(const studies::LinearModel& lm, const std::vector<std::string>& inputs,
                       const std::vector<std::string>& input_units,
                       const std::vector<studies::Mode>& modes,
                       const std::vector<std::string>& warnings) {
  json j;
  j["version"] = kVersion;
  j["equations"] =
      "dx/dt = A x + B d, x = (u, v, w, p, q, r, phi, theta) about the reference flight state; "
      "small-perturbation rigid-body equations in body axes with cycle-mean forces and moments";
  j["states"] = studies::LinearModel::state_names();
  j["state_units"] = studies::LinearModel::state_units();
  j["inputs"] = inputs;
  j["input_units"] = input_units;
  j["A"] = matrix(lm.A);
  j["B"] = matrix(lm.B);
  json out = json::array();
  for (const auto& m : modes) {
    json e = {{"family", m.family},
              {"eigenvalue", {{"real", clean(m.real)}, {"imag", clean(m.imag)}}},
              {"oscillatory", m.oscillatory},
              {"natural_frequency_rad_s", m.natural_frequency},
              {"damping_ratio", clean(m.damping_ratio)},
              {"dominant_states", m.dominant}};
    if (m.oscillatory) e["period_s"] = m.period;
    if (m.time_to_half > 0) e["time_to_half_s"] = m.time_to_half;
    if (m.time_to_double > 0) e["time_to_double_s"] = m.time_to_double;
    out.push_back(e);
  }
  j["modes"] = out;
  j["warnings"] = warnings;
  return j.dump(2) + "\n";
}

std::map<std::string, std::string> modes_plot(const std::vector<studies::Mode>& modes) {
  Plot p;
  p.title = "Eigenvalues of the wing-beat-averaged flight dynamics";
  p.xlabel = "real part (1/s)";
  p.ylabel = "imaginary part (rad/s)";
  double reach = 1e-9;
  for (const auto& m : modes) reach = std::max({reach, std::abs(m.real), std::abs(m.imag)});
  for (double zeta : {0.1, 0.3, 0.7}) {
    Series s;
    s.title = "damping ratio " + studies::shortest(zeta);
    s.dashed = true;
    const double r = 1.2 * reach;
    s.x = {-zeta * r, 0.0, -zeta * r};
    s.y = {std::sqrt(1 - zeta * zeta) * r, 0.0, -std::sqrt(1 - zeta * zeta) * r};
    p.series.push_back(s);
  }
  std::map<std::string, Series> fam;
  for (const auto& m : modes) {
    Series& s = fam[m.family];
    s.title = m.family + " modes";
    s.style = "points";
    s.x.push_back(m.real);
    s.y.push_back(m.imag);
    if (m.oscillatory) {
      s.x.push_back(m.real);
      s.y.push_back(-m.imag);
    }
  }
  for (auto& [name, s] : fam) p.series.push_back(s);
  return render(p, "modes_eigenvalues");
}

std::map<std::string, std::string> trim_plot(const studies::TrimResult& r) {
  Plot p;
  p.title = "Trim: scaled residual (RMS) against iteration";
  p.xlabel = "iteration";
  p.ylabel = "log10 of the scaled residual";
  Series s;
  s.title = "residual";
  s.style = "linespoints";
  for (std::size_t i = 0; i < r.history.size(); ++i) {
    s.x.push_back(static_cast<double>(i));
    s.y.push_back(std::log10(std::max(r.history[i], 1e-300)));
  }
  p.series.push_back(s);
  return render(p, "trim_residual");
}

}  // namespace flapline::io
