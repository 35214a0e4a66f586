#include "flapline/simulation/integrate.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <string>

#include "flapline/common/errors.hpp"
#include "flapline/common/math.hpp"
#include "flapline/simulation/stepper.hpp"

namespace flapline {
namespace {

constexpr double kHighAlpha = 30.0 * kDegree;  // attached-flow caution threshold (common practice)

/// Sums over the output samples of one cycle.
struct CycleAccumulator {
  Wrench sum;
  std::array<Wrench, 2> wing_sum;
  double air_sum = 0, air_peak = -std::numeric_limits<double>::infinity(), air_pos = 0;
  double act_sum = 0, act_peak = -std::numeric_limits<double>::infinity(), act_pos = 0;
  double force_sq = 0, induced = 0;
  long samples = 0;

  void add(const LoadSample& s) {
    sum += s.total;
    wing_sum[0] += s.wing[0];
    wing_sum[1] += s.wing[1];
    air_sum += s.power_air;
    air_peak = std::max(air_peak, s.power_air);
    air_pos += std::max(0.0, s.power_air);
    act_sum += s.power_actuator;
    act_peak = std::max(act_peak, s.power_actuator);
    act_pos += std::max(0.0, s.power_actuator);
    force_sq += s.total.force.squaredNorm();
    induced += s.induced_drag;
    ++samples;
  }
  CycleStats stats() const {
    CycleStats c;
    const double inv = 1.0 / static_cast<double>(samples);
    c.mean.force = sum.force * inv;
    c.mean.moment = sum.moment * inv;
    for (std::size_t s = 0; s < 2; ++s) {
      c.wing_mean[s].force = wing_sum[s].force * inv;
      c.wing_mean[s].moment = wing_sum[s].moment * inv;
    }
    c.power_air_mean = air_sum * inv;
    c.power_air_peak = air_peak;
    c.power_air_mean_positive = air_pos * inv;
    c.power_actuator_mean = act_sum * inv;
    c.power_actuator_peak = act_peak;
    c.power_actuator_mean_positive = act_pos * inv;
    c.force_rms = std::sqrt(force_sq * inv);
    c.induced_drag_mean = induced * inv;
    return c;
  }
};

std::string strip_name(const Model& model, Eigen::Index k) {
  const Eigen::Index n = model.strips_per_wing();
  return "strip " + std::to_string(k % n + 1) + " of the " + (k < n ? "right" : "left") + " wing";
}

void check_loads(const Model& model, const Workspace& ws, double t) {
  const StripLoads& L = ws.loads;
  for (Eigen::Index k = 0; k < model.strip_count(); ++k) {
    if (!std::isfinite(ws.tangential(k)) || !std::isfinite(ws.w_three_quarter(k)))
      throw NumericalError(t, strip_name(model, k), "section velocity");
    if (!std::isfinite(L.circulation(k))) throw NumericalError(t, strip_name(model, k), "circulation");
    if (!L.force_quarter.col(k).allFinite() || !L.force_mid.col(k).allFinite())
      throw NumericalError(t, strip_name(model, k), "force");
    if (!L.couple.col(k).allFinite()) throw NumericalError(t, strip_name(model, k), "couple");
  }
}

/// Relative change between consecutive cycle means (DESIGN §5): forces against RMS|F|, moments
/// against RMS|F|·R; one scale for all components.
double cycle_change(const CycleStats& a, const CycleStats& b, double span) {
  const double scale = std::max(a.force_rms, b.force_rms);
  const double df = (a.mean.force - b.mean.force).cwiseAbs().maxCoeff();
  const double dm = (a.mean.moment - b.mean.moment).cwiseAbs().maxCoeff() / span;
  const double d = std::max(df, dm);
  if (scale > 0.0) return d / scale;
  return d == 0.0 ? 0.0 : std::numeric_limits<double>::infinity();
}

/// With FLAPLINE_CHECK_NO_MALLOC, Eigen asserts on any heap allocation while disallowed.
inline void set_allocation_allowed(bool allowed) {
#ifdef FLAPLINE_CHECK_NO_MALLOC
  Eigen::internal::set_is_malloc_allowed(allowed);
#else
  (void)allowed;
#endif
}

std::string percent(double f) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.1f %%", 100.0 * f);
  return buf;
}

/// RK4's stability region reaches −2.785 on the real axis; refuse a step that is too long for the
/// fastest state (sampled over the cycle) instead of letting the run blow up.
void check_step_size(const Model& model, Workspace& ws) {
  if (ws.state.size() == 0) return;
  double rate = 0.0;
  for (int j = 0; j < 64; ++j)
    rate = std::max(rate, model.aero().stiffest_rate(model, ws, j * model.period() / 64));
  const double limit = 2.5;  // a margin below 2.785
  const int steps = model.simulation().steps_per_cycle;
  if (rate * model.period() / steps > limit) {
    const int need = static_cast<int>(std::ceil(rate * model.period() / limit));
    throw InputError("simulation.steps_per_cycle", std::to_string(steps),
                     "must be at least " + std::to_string(need) +
                         " for this case (the fastest lag state decays at " +
                         format_number(rate) + " 1/s; RK4 needs rate x step < 2.5)",
                     "slow flapping of a short chord at high speed needs many steps per cycle");
  }
}

}  // namespace

void advance(const Model& model, Workspace& ws, double t, double dt) {
  const AeroModel& aero = model.aero();
  auto system = [&](const Eigen::VectorXd& x, Eigen::VectorXd& dxdt, double time) {
    aero.derivative(model, ws, time, x, dxdt);
  };
  ws.stepper->rk4.adjust_size(ws.state);  // sizes the stepper's buffers once; a no-op afterwards
  set_allocation_allowed(false);
  ws.stepper->rk4.do_step(system, ws.state, t, dt);
  set_allocation_allowed(true);
  if (!ws.state.allFinite()) {
    Eigen::Index j = 0;
    for (; j < ws.state.size(); ++j)
      if (!std::isfinite(ws.state(j))) break;
    throw NumericalError(t + dt, strip_name(model, j % model.strip_count()), "lag state");
  }
}

LoadSample evaluate(const Model& model, Workspace& ws, double t) {
  update_sections(model, ws, t);
  model.aero().loads(model, ws, t, ws.state);
  LoadSample out = sum_loads(model, ws, t);
  // A non-finite strip load makes the sums non-finite; only then look for the culprit.
  if (!out.total.force.allFinite() || !out.total.moment.allFinite() ||
      !std::isfinite(out.power_air) || !std::isfinite(out.power_actuator))
    check_loads(model, ws, t);
  return out;
}

RunSummary simulate(const Model& model, const RunControl& control) {
  Workspace ws(model);
  return simulate(model, ws, control);
}

RunSummary simulate(const Model& model, Workspace& ws, const RunControl& control) {
  const SimulationOptions& opt = model.simulation();
  const AeroModel& aero = model.aero();
  const Planform& planform = model.planform();
  const double period = model.period();
  const int steps = opt.steps_per_cycle, samples = opt.samples_per_cycle;
  const int stride = steps / samples;
  const double dt = period / steps;
  const Eigen::Index n = model.strips_per_wing(), n2 = model.strip_count();

  RunSummary out;
  out.title = model.spec().title;
  out.model = model.aero_options().kind;
  out.model_label = std::string(to_string(out.model));
  if (out.model == ModelKind::quasi_steady)
    out.model_label += " (" + std::string(to_string(model.aero_options().law)) + ")";
  else if (out.model == ModelKind::wagner)
    out.model_label += " (" + std::string(to_string(model.aero_options().wagner_fit)) + " fit)";
  else
    out.model_label += " (" + std::string(to_string(model.aero_options().wagner_fit)) + " fit, " +
                       std::string(to_string(model.aero_options().span_coupling)) + ")";
  out.frequency = model.frequency();
  out.steps_per_cycle = steps;
  out.samples_per_cycle = samples;
  out.strips_per_wing = static_cast<int>(n);
  out.air_density = model.air().density;
  out.kinematic_viscosity = model.air().kinematic_viscosity;

  check_step_size(model, ws);
  aero.prepare_run(model, ws);
  aero.initial_state(model, ws, 0.0, opt.start, ws.state);
  Eigen::VectorXd cycle_start_state = ws.state;

  const std::size_t keep_cycles =
      opt.history == HistoryKeep::all ? static_cast<std::size_t>(std::min(opt.max_cycles, 64)) : 1;
  out.history.reserve(keep_cycles * static_cast<std::size_t>(samples) + 1);

  // Spanwise buffers: requested phases snapped to samples, and cycle means.
  std::vector<int> phase_sample;
  for (double p : opt.spanwise_phases)
    phase_sample.push_back(static_cast<int>(std::lround(p * samples)) % samples);
  std::vector<SpanwiseRow> phase_rows(phase_sample.size() * static_cast<std::size_t>(n2));

  // Reference section at r̂₂R (Ellington 1984) for U_ref.
  const double r_ref = planform.radius_moment(2) * planform.span();
  const double c_ref = planform.chord(r_ref), le_ref = planform.leading_edge(r_ref);
  const double tw_ref = planform.twist(r_ref);

  CycleAccumulator acc;
  // Per-strip force (virtual frame) and its cycle sums for the mean spanwise loading.
  Eigen::Matrix3Xd mean_force(3, n2);
  Eigen::ArrayXd mean_normal(n2), mean_gamma(n2), mean_tangential(n2), mean_radius(n2);
  Eigen::ArrayXd mean_induced(n2);
  auto reset_means = [&] {
    mean_induced.setZero();
    mean_force.setZero();
    mean_normal.setZero();
    mean_gamma.setZero();
    mean_tangential.setZero();
    mean_radius.setZero();
  };
  auto strip_row = [&](Eigen::Index k) {
    SpanwiseRow row;
    row.side = k < n ? Side::right : Side::left;
    row.strip = static_cast<int>(k % n);
    row.span_fraction = model.pair().radius(k) / planform.span();
    row.chord = model.pair().chord(k);
    return row;
  };
  const double tan_high = std::tan(kHighAlpha);

  auto record = [&](double t, int sample_in_cycle) {
    HistoryRow row;
    row.loads = evaluate(model, ws, t);
    for (std::size_t s = 0; s < 2; ++s)
      row.angles[s] = {ws.poses[s].stroke, ws.poses[s].deviation, ws.poses[s].pitch,
                       ws.poses[s].span_ratio};
    out.history.push_back(row);
    acc.add(row.loads);
    // Force per unit span of every strip; the left wing's is mapped to body axes at the end.
    for (Eigen::Index k = 0; k < n2; ++k) {
      const std::size_t s = k < n ? 0 : 1;
      const SectionState& sec = ws.sections[static_cast<std::size_t>(k)];
      const double lambda = ws.poses[s].span_ratio;
      const double inv_width = 1.0 / (lambda * model.pair().width(k));
      const Eigen::Vector3d f = (ws.loads.force_quarter.col(k) + ws.loads.force_mid.col(k)) * inv_width;
      mean_force.col(k) += f;
      mean_normal(k) += f.dot(sec.normal_axis);
      mean_gamma(k) += ws.loads.circulation(k);
      mean_tangential(k) += sec.tangential_speed;
      mean_induced(k) += ws.loads.w_induced(k);
      mean_radius(k) += lambda * model.pair().radius(k);
      for (std::size_t p = 0; p < phase_sample.size(); ++p) {
        if (phase_sample[p] != sample_in_cycle) continue;
        SpanwiseRow& r = phase_rows[p * static_cast<std::size_t>(n2) + static_cast<std::size_t>(k)];
        r = strip_row(k);
        r.phase = static_cast<double>(sample_in_cycle) / samples;
        r.radius = lambda * model.pair().radius(k);
        r.force_per_span = s == 0 ? f : mirror(f);
        r.normal_force_per_span = f.dot(sec.normal_axis);
        r.circulation = ws.loads.circulation(k);
        r.alpha = sec.alpha();
        r.tangential_speed = sec.tangential_speed;
        r.induced_wash = ws.loads.w_induced(k);
      }
    }
  };

  CycleStats previous;
  double change = std::numeric_limits<double>::quiet_NaN();
  int cycles_done = 0;
  out.status = RunStatus::cycle_cap_reached;
  for (int cycle = 0; cycle < opt.max_cycles; ++cycle) {
    acc = CycleAccumulator{};
    reset_means();
    cycle_start_state = ws.state;
    if (opt.history == HistoryKeep::last_cycle) out.history.clear();
    for (int k = 0; k < steps; ++k) {
      const double t = (static_cast<double>(cycle) * steps + k) * dt;
      if (k % stride == 0) record(t, k / stride);
      advance(model, ws, t, dt);
    }
    cycles_done = cycle + 1;
    const CycleStats stats = acc.stats();
    if (cycle > 0) change = cycle_change(stats, previous, planform.span());
    previous = stats;
    if (control.on_cycle) control.on_cycle(cycles_done, change);
    if (cycle > 0 && cycles_done >= opt.min_cycles && change <= opt.tolerance) {
      out.status = RunStatus::converged;
      break;
    }
  }
  if (cycles_done == 1) out.status = RunStatus::single_cycle;
  out.cycles = cycles_done;
  out.periodicity_residual = std::isfinite(change) ? change : 0.0;
  if (ws.state.size() > 0) {
    const double big = std::max(ws.state.cwiseAbs().maxCoeff(), 1e-300);
    out.state_residual = (ws.state - cycle_start_state).cwiseAbs().maxCoeff() / big;
  }
  out.averages = previous;

  // Figures (DESIGN §5).
  Figures& fig = out.figures;
  fig.span = planform.span();
  fig.area = planform.area();
  fig.mean_chord = planform.mean_chord();
  fig.aspect_ratio = planform.aspect_ratio();
  fig.r1 = planform.radius_moment(1);
  fig.r2 = planform.radius_moment(2);
  fig.r3 = planform.radius_moment(3);
  const Waveform& stroke = model.motion(Side::right).stroke;
  fig.stroke_amplitude = stroke.maximum() - stroke.minimum();
  fig.airspeed = (model.spec().flight.velocity - model.spec().flight.wind).norm();
  // Kinematic figures over the output samples of one cycle (the same every cycle).
  long strip_samples = 0, reverse = 0, high_alpha = 0;
  double speed_sq = 0.0;
  for (int j = 0; j < samples; ++j) {
    const double t = (static_cast<double>(cycles_done - 1) + static_cast<double>(j) / samples) * period;
    update_sections(model, ws, t);
    strip_samples += n2;
    // Reverse flow: U_t below zero by more than round-off (at a stroke reversal U_t passes
    // through zero, and ±1e-17 is no reverse flow).
    const double noise = 1e-9 * ws.speed.maxCoeff();
    for (Eigen::Index k = 0; k < n2; ++k) {
      const SectionState& sec = ws.sections[static_cast<std::size_t>(k)];
      if (sec.tangential_speed < -noise) ++reverse;
      // |atan2(w, U_t)| > 30°  <=>  |w| > tan 30° · max(U_t, 0)
      if (std::abs(sec.w_half) > tan_high * std::max(sec.tangential_speed, 0.0)) ++high_alpha;
    }
    for (int s = 0; s < 2; ++s) {
      const SectionState ref =
          section_state(ws.poses[static_cast<std::size_t>(s)], model.motion(static_cast<Side>(s)),
                        r_ref, c_ref, le_ref, std::cos(tw_ref), std::sin(tw_ref));
      speed_sq += ref.speed * ref.speed;
    }
  }
  fig.reference_speed = std::sqrt(speed_sq / (2.0 * samples));  // both wings
  const double rho = model.air().density;
  const double lift = out.mean_lift();
  if (fig.reference_speed > 0.0) {
    const double u = fig.reference_speed;
    fig.mean_lift_coefficient = lift / (0.5 * rho * u * u * 2.0 * fig.area);
    fig.reynolds_number = u * fig.mean_chord / model.air().kinematic_viscosity;
    fig.reduced_frequency = kPi * model.frequency() * fig.mean_chord / u;
  }
  if (fig.stroke_amplitude > 1e-12)
    fig.advance_ratio =
        fig.airspeed / (2.0 * fig.stroke_amplitude * model.frequency() * fig.span);
  if (std::abs(out.averages.power_air_mean) > 1e-15)
    fig.lift_to_power = lift / out.averages.power_air_mean;
  fig.reverse_flow_fraction =
      static_cast<double>(reverse) / static_cast<double>(strip_samples);
  fig.high_alpha_fraction =
      static_cast<double>(high_alpha) / static_cast<double>(strip_samples);

  out.spanwise = std::move(phase_rows);
  const double inv_samples = 1.0 / samples;
  for (Eigen::Index k = 0; k < n2; ++k) {
    SpanwiseRow r = strip_row(k);
    r.cycle_mean = true;
    const Eigen::Vector3d f = mean_force.col(k) * inv_samples;
    r.force_per_span = k < n ? f : mirror(f);
    r.normal_force_per_span = mean_normal(k) * inv_samples;
    r.circulation = mean_gamma(k) * inv_samples;
    r.tangential_speed = mean_tangential(k) * inv_samples;
    r.induced_wash = mean_induced(k) * inv_samples;
    r.radius = mean_radius(k) * inv_samples;
    r.alpha = std::numeric_limits<double>::quiet_NaN();  // a mean angle is not reported
    out.spanwise.push_back(r);
  }

  // Status message and warnings.
  switch (out.status) {
    case RunStatus::converged:
      out.message = "converged after " + std::to_string(cycles_done) + " cycles";
      break;
    case RunStatus::cycle_cap_reached:
      out.message = "cycle cap reached after " + std::to_string(cycles_done) + " cycles";
      out.warnings.push_back("cycle means still change by " + format_number(change) +
                             " (tolerance " + format_number(opt.tolerance) + ") after " +
                             std::to_string(cycles_done) +
                             " cycles: raise simulation.max_cycles or start from quasi_steady");
      break;
    case RunStatus::single_cycle:
      out.message = "one cycle run; periodicity not checked";
      break;
  }
  if (fig.reverse_flow_fraction > 0.05)
    out.warnings.push_back(percent(fig.reverse_flow_fraction) +
                           " of strip samples see reverse flow (U_t < 0); the attached-flow "
                           "formulas are kept there (a model limit)");
  const AeroOptions& ao = model.aero_options();
  if (fig.high_alpha_fraction > 0.05 && ao.suction_recovery > 0.0 &&
      !(ao.kind == ModelKind::quasi_steady && ao.law == CoefficientLaw::revolving_fit))
    out.warnings.push_back(percent(fig.high_alpha_fraction) +
                           " of strip samples have |alpha| > 30 deg with attached-flow suction; "
                           "a separated leading edge (model.suction_recovery: 0) may suit better");
  return out;
}

}  // namespace flapline
