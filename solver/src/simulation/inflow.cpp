// Momentum-theory inflow (DESIGN §9): the far wake's uniform induced velocity w₀, found by
// updating w₀ from each cycle's mean force with under-relaxation until both the cycle means and
// w₀ settle.
#include <algorithm>
#include <cmath>
#include <limits>

#include "flapline/common/errors.hpp"
#include "flapline/common/math.hpp"
#include "flapline/simulation/integrate.hpp"
#include "flapline/simulation/summarize.hpp"

namespace flapline {
namespace {

/// Glauert's relation w·√(V_p² + (V_n + w)²) = T/(2ρA) for w ≥ 0 (w = 0 for T ≤ 0), solved by
/// bisection to round-off. g(0) = 0 and g(max(0, −V_n) + √k) ≥ k bracket a root; in hover it is
/// w = √(T/(2ρA)) (Rankine–Froude).
double glauert(double thrust, double rho, double area, double vp, double vn) {
  if (!(thrust > 0.0)) return 0.0;
  const double k = thrust / (2.0 * rho * area);
  auto g = [&](double w) { return w * std::sqrt(vp * vp + (vn + w) * (vn + w)) - k; };
  double lo = 0.0, hi = std::max(0.0, -vn) + std::sqrt(k);
  if (vp == 0.0 && vn == 0.0) return std::sqrt(k);
  for (int i = 0; i < 200 && hi - lo > 1e-16 * hi; ++i) {
    const double mid = 0.5 * (lo + hi);
    (g(mid) < 0.0 ? lo : hi) = mid;
  }
  return 0.5 * (lo + hi);
}

/// Mean of λ² over the cycle and both wings (1000 samples per wing; exact for a constant λ).
double mean_span_ratio_squared(const Model& model) {
  constexpr int n = 1000;
  double sum = 0.0;
  for (int s = 0; s < 2; ++s)
    for (int j = 0; j < n; ++j) {
      const double lam = model.motion(static_cast<Side>(s))
                             .span_ratio.at(j * model.period() / n, model.frequency())
                             .value;
      sum += lam * lam;
    }
  return sum / (2.0 * n);
}

}  // namespace

RunSummary simulate_with_inflow(const Model& model, Workspace& ws, const RunControl& control) {
  const SimulationOptions& opt = model.simulation();
  const AeroOptions& ao = model.aero_options();
  const FlightSpec& flight = model.flight();
  const double rho = model.air().density, span = model.planform().span();
  const Eigen::Vector3d freestream = flight.wind - flight.velocity;  // air relative to the body
  const bool disc = ao.inflow == InflowModel::stroke_disc;
  double area = 0.0;
  Eigen::Vector3d direction = Eigen::Vector3d::Zero();  // of w₀ (unit)
  if (disc) {
    // Ellington 1984, Part V (from memory): the pair sweeps Φ R² (Φ the mean of the wings'
    // peak-to-peak strokes in rad), scaled by mean λ² for folding wings.
    double phi = 0.0;
    for (int s = 0; s < 2; ++s) {
      const Waveform& w = model.motion(static_cast<Side>(s)).stroke;
      phi += 0.5 * (w.maximum() - w.minimum());
    }
    area = phi * span * span * mean_span_ratio_squared(model);
    direction = rotation_y(model.spec().gait.stroke_plane_angle) * Eigen::Vector3d::UnitZ();
  } else {
    const double b = 2.0 * (std::abs(model.spec().wing.hinge.y()) + span);  // tip to tip
    area = kPi * b * b / 4.0;
  }
  const Eigen::Vector3d along =
      freestream.norm() > 0.0 ? Eigen::Vector3d(freestream.normalized()) : Eigen::Vector3d::Zero();
  Eigen::Vector3d w_vec = Eigen::Vector3d::Zero();
  Eigen::VectorXd state;
  RunSummary last;
  CycleStats previous;
  int cycles = 0;
  bool converged = false;
  double change = std::numeric_limits<double>::quiet_NaN(), residual = 0.0, thrust = 0.0;
  double target = 0.0;
  Eigen::Vector3d used = Eigen::Vector3d::Zero();
  RunControl inner = control;
  inner.on_cycle = nullptr;
  for (int c = 0; c < opt.max_cycles; ++c) {
    ModelSpec spec = model.spec();
    spec.condition.reset();  // velocity and rates are already resolved
    spec.flight.wind += w_vec;
    spec.aero.inflow = InflowModel::none;
    spec.simulation.min_cycles = spec.simulation.max_cycles = 1;
    const Model cycle_model(std::move(spec));
    ws.reset(cycle_model);
    last = simulate_cycles(cycle_model, ws, inner, state.size() > 0 ? &state : nullptr);
    state = ws.state;
    ++cycles;
    used = w_vec;
    const Eigen::Vector3d force = last.averages.mean.force;
    if (disc) {
      thrust = -force.dot(direction);
    } else {  // the lift, the mean force normal to the airspeed, carries it; w₀ opposes it
      const Eigen::Vector3d lift = force - force.dot(along) * along;
      thrust = lift.norm();
      if (thrust > 0.0) direction = -lift / thrust;
    }
    const double vn = freestream.dot(direction);
    const double vp = (freestream - vn * direction).norm();
    target = glauert(thrust, rho, area, vp, vn);
    const Eigen::Vector3d target_vec = target * direction;
    const double w_scale = std::max(target_vec.norm(), used.norm());
    residual = w_scale > 0.0 ? (target_vec - used).norm() / w_scale : 0.0;
    if (c > 0) change = cycle_change(last.averages, previous, span);
    previous = last.averages;
    if (control.on_cycle) control.on_cycle(cycles, std::max(change, residual));
    if (c > 0 && cycles >= opt.min_cycles && change <= opt.tolerance && residual <= opt.tolerance) {
      converged = true;
      break;
    }
    w_vec = used + ao.inflow_relaxation * (target_vec - used);
  }
  ws.reset(model);

  // The last cycle's summary, told as a run of `cycles` cycles of the original case.
  last.cycles = cycles;
  last.periodicity_residual = std::isfinite(change) ? change : 0.0;
  last.model_label += ", " + std::string(to_string(ao.inflow)) + " inflow";
  last.warnings.erase(
      std::remove_if(last.warnings.begin(), last.warnings.end(),
                     [](const std::string& w) { return w.rfind("cycle means", 0) == 0; }),
      last.warnings.end());
  if (converged) {
    last.status = RunStatus::converged;
    last.message = "converged after " + std::to_string(cycles) + " cycles (with the inflow)";
  } else if (cycles == 1) {
    last.status = RunStatus::single_cycle;
    last.message = "one cycle run; periodicity and inflow not checked";
  } else {
    last.status = RunStatus::not_converged;
    last.message = "cycle cap reached after " + std::to_string(cycles) + " cycles";
    last.warnings.push_back("cycle means change by " + format_number(change) +
                            " and the inflow by " + format_number(residual) + " (tolerance " +
                            format_number(opt.tolerance) + ") after " + std::to_string(cycles) +
                            " cycles: raise simulation.max_cycles or lower "
                            "model.inflow_relaxation");
  }
  const double shift = (cycles - 1) * model.period();
  for (HistoryRow& h : last.history) h.loads.time += shift;
  // Airspeed-based figures and the vehicle balance belong to the flight, not to the inflow.
  DerivedQuantities& d = last.derived;
  d.airspeed = (flight.velocity - flight.wind).norm();
  if (d.stroke_peak_to_peak > 1e-12)
    d.advance_ratio = d.airspeed / (2.0 * d.stroke_peak_to_peak * model.frequency() * span);
  if (model.vehicle()) last.vehicle = vehicle_balance(model, last.averages);

  InflowResult r;
  r.kind = ao.inflow;
  r.w0 = used.norm();
  r.velocity = used;
  r.area = area;
  r.thrust = thrust;
  r.induced_power = thrust * r.w0;
  r.ideal_power = thrust > 0.0 ? std::pow(thrust, 1.5) / std::sqrt(2.0 * rho * area) : 0.0;
  if (last.averages.power_air_mean > 0.0) {
    r.induced_fraction = r.induced_power / last.averages.power_air_mean;
    r.ideal_fraction = r.ideal_power / last.averages.power_air_mean;
  }
  r.momentum_residual = residual;
  last.inflow = r;
  if (disc && freestream.dot(direction) < -1e-9 * std::max(1.0, freestream.norm()))
    last.warnings.push_back(
        "the air passes the stroke disc against the induced flow (descent): "
        "momentum theory fails there (vortex-ring state); treat w0 as a rough guess");
  if (!(thrust > 0.0))
    last.warnings.push_back("the mean force along the inflow direction is not a thrust (T = " +
                            format_number(thrust) + " N): no inflow was applied");
  return last;
}

}  // namespace flapline
