#include "flapline/simulation/integrate.hpp"

#include <algorithm>
#include <cassert>
#include <cmath>
#include <limits>
#include <string>

#include "flapline/aero/aero_model.hpp"
#include "flapline/case/stage_kinematics.hpp"
#include "flapline/case/stepper.hpp"
#include "flapline/common/errors.hpp"
#include "flapline/common/math.hpp"
#include "flapline/common/no_malloc.hpp"
#include "flapline/simulation/summarize.hpp"

namespace flapline {
namespace {

std::string strip_name(const Model& model, Eigen::Index k) {
  const Eigen::Index n = model.strips_per_wing();
  return "strip " + std::to_string(k % n + 1) + " of the " + (k < n ? "right" : "left") + " wing";
}

void check_loads(const Model& model, const Workspace& ws, double t) {
  const StripLoads& L = ws.loads;
  for (Eigen::Index k = 0; k < model.strip_count(); ++k) {
    if (!std::isfinite(ws.tangential(k)) || !std::isfinite(ws.w_three_quarter(k)))
      throw NumericalError(t, strip_name(model, k), "section velocity");
    if (!std::isfinite(L.circulation(k)))
      throw NumericalError(t, strip_name(model, k), "circulation");
    if (!L.force_quarter.col(k).allFinite() || !L.force_mid.col(k).allFinite())
      throw NumericalError(t, strip_name(model, k), "force");
    if (!L.couple.col(k).allFinite()) throw NumericalError(t, strip_name(model, k), "couple");
  }
}

/// Sizes the exponential stepper for the Workspace's Model and sets the strips' linear parts
/// (once per build or reset; the weights of each step phase are cached for periodic kinematics).
void prepare_exponential(const Model& model, Workspace& ws, const AeroModel& aero) {
  StepperSlot& st = *ws.stepper;
  if (st.exponential_ready) return;
  const Eigen::Index n2 = model.strip_count();
  const Eigen::Index steps = model.simulation().steps_per_cycle;
  const double bytes = 12.0 * 8.0 * static_cast<double>(n2) * static_cast<double>(steps);
  const bool cache = model.periodic_kinematics() && bytes <= 64.0 * 1024 * 1024;
  st.exponential.resize(n2, cache ? steps : 0);
  for (Eigen::ArrayXd* a : {&st.kappa, &st.rate0, &st.rate_half, &st.rate1}) a->setZero(n2);
  aero.own_induction(model, ws, 0.0, st.kappa);
  st.exponential.set_linear_part(wagner_coefficients(model.aero_options().wagner_fit), st.kappa);
  st.kappa_varies = aero.own_induction_varies(model);
  st.exponential_ready = true;
}

/// "N" for a step count, without converting a huge or non-finite value to an integer.
std::string step_count(double need) {
  return need < 1e9 ? std::to_string(static_cast<long long>(need)) : "about " + format_number(need);
}

/// The explicit part of each scheme must stay inside RK4's stability region, which reaches
/// −2.785 on the real axis: refuse a step that is too long (sampled over the cycle) instead of
/// letting the run blow up.
///   rk4: every lag state is explicit; the fastest decays at stiffest_rate.
///   exponential: each strip's own decay is exact; what stays explicit is the change of U/b within
///   a step times the strip's rates (ExponentialStepper::explicit_gain).
void check_step_size(const Model& model, Workspace& ws, const AeroModel& aero) {
  if (ws.state.size() == 0) return;
  constexpr double limit = 2.5;  // a margin below 2.785
  const int steps = model.simulation().steps_per_cycle;
  const double period = model.period(), dt = period / steps;
  const std::string steps_text = std::to_string(steps);
  if (model.simulation().integrator == Integrator::rk4) {
    double rate = 0.0, worst_t = 0.0;
    for (int j = 0; j < 64; ++j) {
      const double t = j * period / 64, r = aero.stiffest_rate(model, ws, t);
      if (r > rate) rate = r, worst_t = t;
    }
    if (!(rate * dt > limit)) return;
    update_speeds(model, ws, worst_t);
    Eigen::Index k = 0;
    ws.rate.maxCoeff(&k);
    throw InputError(
        "simulation.steps_per_cycle", steps_text,
        "must be at least " + step_count(std::ceil(rate * period / limit)) +
            " for this case with simulation.integrator: rk4 (the fastest lag state decays at " +
            format_number(rate) + " 1/s, on " + strip_name(model, k) + ", chord " +
            format_number(model.pair().chord(k) * 1e3) + " mm; RK4 needs rate x step < 2.5)",
        "a narrow strip moving fast (a chord tapering to zero at the tip, cosine strips, a short "
        "chord at high speed) decays fastest: simulation.integrator: exponential treats each "
        "strip's own decay exactly");
  }
  prepare_exponential(model, ws, aero);
  StepperSlot& st = *ws.stepper;
  double gain = 0.0;
  for (int j = 0; j < 64; ++j) {
    const double t = std::floor(j * steps / 64.0) * dt;
    update_speeds(model, ws, t);
    st.rate0 = ws.rate;
    update_speeds(model, ws, t + 0.5 * dt);
    st.rate_half = ws.rate;
    update_speeds(model, ws, t + dt);
    st.rate1 = ws.rate;
    gain = std::max(gain, st.exponential.explicit_gain(st.rate0, st.rate_half, st.rate1, dt));
  }
  if (!(gain > limit)) return;
  throw InputError("simulation.steps_per_cycle", steps_text,
                   "must be at least " + step_count(std::ceil(gain / limit * steps)) +
                       " for this case: U/b changes so much within a step that the part the "
                       "exponential integrator leaves explicit has a gain of " +
                       format_number(gain) + " per step (it needs < 2.5)",
                   "an abrupt stroke reversal of a narrow strip: raise the steps or smooth the "
                   "stroke waveform");
}

/// The step loop: whole cycles of steps, loads at the output samples, until the cycle means
/// stop changing or the cap is reached (DESIGN §5).
CycleOutcome run_cycles(const Model& model, Workspace& ws, const RunControl& control,
                        SpanwiseAccumulator& spanwise, std::vector<HistoryRow>& history) {
  const SimulationOptions& opt = model.simulation();
  const int steps = opt.steps_per_cycle, stride = steps / opt.samples_per_cycle;
  const double dt = model.period() / steps;
  const double span = model.planform().span();
  Eigen::VectorXd cycle_start_state = ws.state;
  CycleOutcome o;
  o.change = std::numeric_limits<double>::quiet_NaN();
  o.status = RunStatus::not_converged;
  for (int cycle = 0; cycle < opt.max_cycles; ++cycle) {
    CycleAccumulator acc;
    spanwise.reset();
    cycle_start_state = ws.state;
    if (opt.history == HistoryKeep::last_cycle) history.clear();
    for (int k = 0; k < steps; ++k) {
      const double t = (static_cast<double>(cycle) * steps + k) * dt;
      if (k % stride == 0) {
        HistoryRow row;
        row.loads = evaluate(model, ws, t);
        for (std::size_t s = 0; s < 2; ++s)
          row.angles[s] = {ws.poses[s].stroke, ws.poses[s].deviation, ws.poses[s].pitch,
                           ws.poses[s].span_ratio};
        if (control.keep_history) history.push_back(row);
        acc.add(row.loads);
        spanwise.add(model, ws, k / stride);
      }
      advance(model, ws, t, dt);
    }
    o.cycles = cycle + 1;
    const CycleStats stats = acc.stats();
    if (cycle > 0) o.change = cycle_change(stats, o.last, span);
    o.last = stats;
    if (control.on_cycle) control.on_cycle(o.cycles, o.change);
    if (cycle > 0 && o.cycles >= opt.min_cycles && o.change <= opt.tolerance) {
      o.status = RunStatus::converged;
      break;
    }
  }
  if (o.cycles == 1) o.status = RunStatus::single_cycle;
  if (ws.state.size() > 0) {
    const double big = std::max(ws.state.cwiseAbs().maxCoeff(), 1e-300);
    o.state_residual = (ws.state - cycle_start_state).cwiseAbs().maxCoeff() / big;
  }
  return o;
}

/// One ETDRK4 step of ws.state (case/exponential_stepper.hpp).
void exponential_step(const Model& model, Workspace& ws, const AeroModel& aero, double t,
                      double dt) {
  prepare_exponential(model, ws, aero);
  StepperSlot& st = *ws.stepper;
  const NoMallocScope no_malloc;
  if (st.kappa_varies) {  // a folding wing: the linear part at the step start
    aero.own_induction(model, ws, t, st.kappa);
    st.exponential.set_linear_part(wagner_coefficients(model.aero_options().wagner_fit), st.kappa);
  }
  st.rate0 = stage_speeds(model, ws, t).rate;
  st.rate_half = stage_speeds(model, ws, t + 0.5 * dt).rate;
  st.rate1 = stage_speeds(model, ws, t + dt).rate;
  const Eigen::Index phase = cycle_slot(
      t, model.frequency(), static_cast<Eigen::Index>(model.simulation().steps_per_cycle));
  st.exponential.step([&](const Eigen::VectorXd& x, double time,
                          Eigen::VectorXd& dxdt) { aero.derivative(model, ws, time, x, dxdt); },
                      ws.state, t, dt, st.rate0, st.rate_half, st.rate1,
                      model.periodic_kinematics() ? phase : -1);
}

}  // namespace

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

void advance(const Model& model, Workspace& ws, double t, double dt) {
  assert(ws.built_for(model) && "a Workspace serves the Model it was built or reset for");
  const AeroModel& aero = aero_model(model);
  if (model.simulation().integrator == Integrator::exponential && ws.state.size() > 0) {
    exponential_step(model, ws, aero, t, dt);
  } else {
    auto system = [&](const Eigen::VectorXd& x, Eigen::VectorXd& dxdt, double time) {
      aero.derivative(model, ws, time, x, dxdt);
    };
    ws.stepper->rk4.adjust_size(ws.state);  // sizes the stepper's buffers once; a no-op afterwards
    const NoMallocScope
        no_malloc;  // proves the step allocation-free in FLAPLINE_CHECK_NO_MALLOC builds
    ws.stepper->rk4.do_step(system, ws.state, t, dt);
  }
  if (!ws.state.allFinite()) {
    Eigen::Index j = 0;
    for (; j < ws.state.size(); ++j)
      if (!std::isfinite(ws.state(j))) break;
    throw NumericalError(t + dt, strip_name(model, j % model.strip_count()), "lag state");
  }
}

LoadSample evaluate(const Model& model, Workspace& ws, double t) {
  update_sections(model, ws, t);
  aero_model(model).loads(model, ws, t, ws.state);
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
  if (!ws.built_for(model)) {
    assert(false && "simulate: the Workspace was built for another Model (call ws.reset first)");
    ws.reset(model);
  }
  if (model.aero_options().inflow != InflowModel::none)
    return simulate_with_inflow(model, ws, control);
  return simulate_cycles(model, ws, control, nullptr);
}

RunSummary simulate_cycles(const Model& model, Workspace& ws, const RunControl& control,
                           const Eigen::VectorXd* initial_state) {
  assert(ws.built_for(model) && "a Workspace serves the Model it was built or reset for");
  const SimulationOptions& opt = model.simulation();
  const AeroModel& aero = attach_aero(model, ws);
  RunSummary out;
  start_summary(model, out);
  check_step_size(model, ws, aero);
  aero.prepare_run(model, ws);
  if (initial_state && initial_state->size() == ws.state.size())
    ws.state = *initial_state;
  else
    aero.initial_state(model, ws, 0.0, opt.start, ws.state);
  const std::size_t keep_cycles =
      opt.history == HistoryKeep::all ? static_cast<std::size_t>(std::min(opt.max_cycles, 64)) : 1;
  if (control.keep_history)
    out.history.reserve(keep_cycles * static_cast<std::size_t>(opt.samples_per_cycle) + 1);
  SpanwiseAccumulator spanwise(model);
  const CycleOutcome outcome = run_cycles(model, ws, control, spanwise, out.history);
  finish_summary(model, ws, outcome, spanwise, out);
  return out;
}

RunSummary run_case(const Model& model, const RunControl& control) {
  Workspace ws(model);
  return run_case(model, ws, control);
}

CaseRunner::CaseRunner() = default;
CaseRunner::~CaseRunner() = default;
CaseRunner::CaseRunner(CaseRunner&&) noexcept = default;
CaseRunner& CaseRunner::operator=(CaseRunner&&) noexcept = default;

Workspace& CaseRunner::workspace_for(const Model& model) {
  if (ws_)
    ws_->reset(model);
  else
    ws_ = std::make_unique<Workspace>(model);
  return *ws_;
}

RunSummary CaseRunner::simulate(const Model& model, const RunControl& control) {
  return flapline::simulate(model, workspace_for(model), control);
}

RunSummary CaseRunner::run_case(const Model& model, const RunControl& control) {
  return flapline::run_case(model, workspace_for(model), control);
}

RunSummary run_case(const Model& model, Workspace& ws, const RunControl& control) {
  try {
    return simulate(model, ws, control);
  } catch (const InputError& e) {
    RunSummary out;
    start_summary(model, out);
    out.status = RunStatus::input_error;
    out.message = e.what();
    out.error_key = e.key();
    return out;
  } catch (const NumericalError& e) {
    RunSummary out;
    start_summary(model, out);
    out.status = RunStatus::blew_up;
    out.message = e.what();
    return out;
  }
}

}  // namespace flapline
