#include "flapline/simulation/summarize.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <limits>
#include <string>

#include "flapline/case/stage_kinematics.hpp"
#include "flapline/common/errors.hpp"
#include "flapline/common/math.hpp"

namespace flapline {
namespace {

constexpr double kHighAlpha = 30.0 * kDegree;  // attached-flow caution threshold (common practice)

std::string percent(double f) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.1f %%", 100.0 * f);
  return buf;
}

SpanwiseRow strip_row(const Model& model, Eigen::Index k) {
  const Eigen::Index n = model.strips_per_wing();
  SpanwiseRow row;
  row.side = k < n ? Side::right : Side::left;
  row.strip = static_cast<int>(k % n);
  row.span_fraction = model.pair().radius(k) / model.planform().span();
  row.chord = model.pair().chord(k);
  return row;
}

/// U_ref, reverse-flow and high-α shares over the output samples of the last cycle (kinematic:
/// the same every cycle), then C̄_L, Re, k, J (DESIGN §5).
void derive_quantities(const Model& model, Workspace& ws, int last_cycle, RunSummary& out) {
  const Planform& planform = model.planform();
  const int samples = model.simulation().samples_per_cycle;
  const double period = model.period();
  const Eigen::Index n2 = model.strip_count();
  DerivedQuantities& d = out.derived;
  d.span = planform.span();
  d.area = planform.area();
  d.mean_chord = planform.mean_chord();
  d.aspect_ratio = planform.aspect_ratio();
  d.r1 = planform.radius_moment(1);
  d.r2 = planform.radius_moment(2);
  d.r3 = planform.radius_moment(3);
  const Waveform& stroke = model.motion(Side::right).stroke;
  d.stroke_peak_to_peak = stroke.maximum() - stroke.minimum();
  const Waveform& left_stroke = model.motion(Side::left).stroke;
  d.left_stroke_peak_to_peak = left_stroke.maximum() - left_stroke.minimum();
  d.mirror_gait = model.mirror_gait();
  d.airspeed = (model.spec().flight.velocity - model.spec().flight.wind).norm();
  // Reference section at r̂₂R (Ellington 1984) for U_ref.
  const double r_ref = d.r2 * d.span;
  const double c_ref = planform.chord(r_ref), le_ref = planform.leading_edge(r_ref);
  const double tw_ref = planform.twist(r_ref);
  const double tan_high = std::tan(kHighAlpha);
  long strip_samples = 0, reverse = 0, high_alpha = 0;
  double speed_sq = 0.0;
  for (int j = 0; j < samples; ++j) {
    const double t = (static_cast<double>(last_cycle) + static_cast<double>(j) / samples) * period;
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
  d.reference_speed = std::sqrt(speed_sq / (2.0 * samples));  // both wings
  const double rho = model.air().density;
  const double lift = out.mean_lift();
  if (d.reference_speed > 0.0) {
    const double u = d.reference_speed;
    d.mean_lift_coefficient = lift / (0.5 * rho * u * u * 2.0 * d.area);
    d.reynolds_number = u * d.mean_chord / model.air().kinematic_viscosity;
    d.reduced_frequency = kPi * model.frequency() * d.mean_chord / u;
  }
  if (d.stroke_peak_to_peak > 1e-12)
    d.advance_ratio = d.airspeed / (2.0 * d.stroke_peak_to_peak * model.frequency() * d.span);
  const CycleStats& a = out.averages;
  if (std::abs(a.power_mechanical_storage_perfect) > 1e-15)
    d.lift_per_power_storage_perfect = lift / a.power_mechanical_storage_perfect;
  if (a.power_mechanical_storage_none > 1e-15)
    d.lift_per_power_storage_none = lift / a.power_mechanical_storage_none;
  d.reverse_flow_fraction = static_cast<double>(reverse) / static_cast<double>(strip_samples);
  d.high_alpha_fraction = static_cast<double>(high_alpha) / static_cast<double>(strip_samples);
}

/// Gaits that are probably not meant: wings that never flap in still air, wings that cross.
void kinematic_warnings(const Model& model, RunSummary& out) {
  const FlightSpec& f = model.flight();
  bool flaps = false;
  for (int s = 0; s < 2; ++s) {
    const Waveform& w = model.motion(static_cast<Side>(s)).stroke;
    flaps = flaps || w.maximum() - w.minimum() > 1e-9;
  }
  if (!flaps && (f.velocity - f.wind).norm() == 0.0 && f.rates.norm() == 0.0)
    out.warnings.push_back(
        "the stroke is constant and the body meets no stream: the wings do "
        "not flap (check gait.stroke: an amplitude of 0?)");
  // The right wing's outline (leading and trailing edges at root and tip) must stay on its own
  // side of the body's plane of symmetry, where the left wing is its mirror image.
  const Strips& st = model.strips();
  const Eigen::Index last = st.size();
  constexpr int samples = 96;
  double worst = 0.0, worst_phase = 0.0;
  for (int s = 0; s < (model.mirror_gait() ? 1 : 2); ++s) {  // mirror gait: the left is alike
    const WingMotion& m = model.motion(static_cast<Side>(s));
    for (int j = 0; j < samples; ++j) {
      const double phase = static_cast<double>(j) / samples;
      const WingPose p = wing_pose(m, phase * model.period());
      for (const Eigen::Index e : {Eigen::Index{0}, last}) {
        const double r = st.edge_radius(e), c = st.edge_chord(e), le = st.edge_leading_edge(e);
        const Eigen::Vector3d ec =
            std::cos(st.edge_twist(e)) * p.chord_axis + std::sin(st.edge_twist(e)) * p.normal_axis;
        for (const double l : {le, le - c}) {
          const double y = (p.hinge + p.span_ratio * r * p.span_axis + l * ec).y();
          if (y < worst) worst = y, worst_phase = phase;
        }
      }
    }
  }
  if (worst < -1e-9 * model.planform().span())
    out.warnings.push_back("the wings cross the body's plane of symmetry (by " +
                           format_number(-worst * 1e3) + " mm at phase " +
                           format_number(worst_phase) +
                           "): the two wings would collide; reduce the stroke or deviation, or "
                           "move the hinges (wing.hinge) apart");
}

void status_and_warnings(const Model& model, const CycleOutcome& o, RunSummary& out) {
  const SimulationOptions& opt = model.simulation();
  switch (out.status) {
    case RunStatus::converged:
      out.message = "converged after " + std::to_string(o.cycles) + " cycles";
      break;
    case RunStatus::not_converged:
      out.message = "cycle cap reached after " + std::to_string(o.cycles) + " cycles";
      out.warnings.push_back("cycle means still change by " + format_number(o.change) +
                             " (tolerance " + format_number(opt.tolerance) + ") after " +
                             std::to_string(o.cycles) +
                             " cycles: raise simulation.max_cycles or start from quasi_steady");
      break;
    case RunStatus::single_cycle:
      out.message = "one cycle run; periodicity not checked";
      break;
    case RunStatus::input_error:
    case RunStatus::blew_up:
      break;
  }
  const DerivedQuantities& d = out.derived;
  if (d.reverse_flow_fraction > 0.5)
    out.warnings.push_back(percent(d.reverse_flow_fraction) +
                           " of strip samples see reverse flow (U_t < 0): the wings mostly lead "
                           "with the trailing edge, which usually means the pitch waveform is half "
                           "a cycle off — try adding 180 to gait.pitch.phase, or 180 − mean for "
                           "its mean");
  else if (d.reverse_flow_fraction > 0.05)
    out.warnings.push_back(percent(d.reverse_flow_fraction) +
                           " of strip samples see reverse flow (U_t < 0); the attached-flow "
                           "formulas are kept there (a model limit)");
  kinematic_warnings(model, out);
  const AeroOptions& ao = model.aero_options();
  if (d.high_alpha_fraction > 0.05 && ao.suction_recovery > 0.0 &&
      !(ao.kind == ModelKind::quasi_steady && ao.law == CoefficientLaw::revolving_fit))
    out.warnings.push_back(percent(d.high_alpha_fraction) +
                           " of strip samples have |alpha| > 30 deg with attached-flow suction; "
                           "a separated leading edge (model.suction_recovery: 0) may suit better");
}

}  // namespace

void CycleAccumulator::add(const LoadSample& s) {
  sum_ += s.total;
  wing_sum_[0] += s.wing[0];
  wing_sum_[1] += s.wing[1];
  air_sum_ += s.power_air;
  air_peak_ = std::max(air_peak_, s.power_air);
  air_pos_ += std::max(0.0, s.power_air);
  act_sum_ += s.power_actuator;
  act_peak_ = std::max(act_peak_, s.power_actuator);
  act_pos_ += std::max(0.0, s.power_actuator);
  force_sq_ += s.total.force.squaredNorm();
  induced_ += s.induced_drag;
  for (std::size_t w = 0; w < 2; ++w) {
    const WingDriveSample& d = s.drive[w];
    WingSums& a = drive_[w];
    for (std::size_t j = 0; j < static_cast<std::size_t>(kJoints); ++j) {
      JointSums& q = a.joint[j];
      q.torque_sq += d.torque[j] * d.torque[j];
      q.aero_sq += d.torque_aero[j] * d.torque_aero[j];
      q.inertial_sq += d.torque_inertial[j] * d.torque_inertial[j];
      q.torque_peak = std::max(q.torque_peak, std::abs(d.torque[j]));
      q.power += d.joint_power[j];
      q.power_pos += std::max(0.0, d.joint_power[j]);
      q.power_peak = std::max(q.power_peak, std::abs(d.joint_power[j]));
    }
    a.power += d.power;
    a.power_pos += std::max(0.0, d.power);
    a.power_peak = std::max(a.power_peak, std::abs(d.power));
    a.inertial_power += d.power_inertial;
    a.inertial += d.inertial;
  }
  mech_ += s.power_mechanical;
  mech_pos_ += std::max(0.0, s.power_mechanical);
  mech_peak_ = std::max(mech_peak_, std::abs(s.power_mechanical));
  inertial_power_ += s.power_inertial;
  inertial_ += s.inertial;
  profile_drag_ += s.profile_drag;
  ++samples_;
}

CycleStats CycleAccumulator::stats() const {
  CycleStats c;
  const double inv = 1.0 / static_cast<double>(samples_);
  c.mean.force = sum_.force * inv;
  c.mean.moment = sum_.moment * inv;
  for (std::size_t s = 0; s < 2; ++s) {
    c.wing_mean[s].force = wing_sum_[s].force * inv;
    c.wing_mean[s].moment = wing_sum_[s].moment * inv;
  }
  c.power_air_mean = air_sum_ * inv;
  c.power_air_peak = air_peak_;
  c.power_air_mean_positive = air_pos_ * inv;
  c.power_actuator_mean = act_sum_ * inv;
  c.power_actuator_peak = act_peak_;
  c.power_actuator_mean_positive = act_pos_ * inv;
  c.force_rms = std::sqrt(force_sq_ * inv);
  c.induced_drag_mean = induced_ * inv;
  for (std::size_t w = 0; w < 2; ++w) {
    const WingSums& a = drive_[w];
    WingDriveStats& o = c.drive[w];
    for (std::size_t j = 0; j < static_cast<std::size_t>(kJoints); ++j) {
      const JointSums& q = a.joint[j];
      JointStats& js = o.joint[j];
      js.torque_rms = std::sqrt(q.torque_sq * inv);
      js.torque_peak = q.torque_peak;
      js.torque_aero_rms = std::sqrt(q.aero_sq * inv);
      js.torque_inertial_rms = std::sqrt(q.inertial_sq * inv);
      js.power_storage_perfect = q.power * inv;
      js.power_storage_none = q.power_pos * inv;
      js.power_peak = q.power_peak;
    }
    o.power_storage_perfect = a.power * inv;
    o.power_storage_none = a.power_pos * inv;
    o.power_peak = a.power_peak;
    o.power_inertial_mean = a.inertial_power * inv;
    o.inertial_mean.force = a.inertial.force * inv;
    o.inertial_mean.moment = a.inertial.moment * inv;
  }
  c.power_mechanical_storage_perfect = mech_ * inv;
  c.power_mechanical_storage_none = mech_pos_ * inv;
  c.power_mechanical_peak = mech_peak_;
  c.power_inertial_mean = inertial_power_ * inv;
  c.inertial_mean.force = inertial_.force * inv;
  c.inertial_mean.moment = inertial_.moment * inv;
  c.profile_drag_mean = profile_drag_ * inv;
  return c;
}

SpanwiseAccumulator::SpanwiseAccumulator(const Model& model) {
  const SimulationOptions& opt = model.simulation();
  const int samples = opt.samples_per_cycle;
  const Eigen::Index n2 = model.strip_count();
  for (double p : opt.spanwise_phases)
    phase_sample_.push_back(static_cast<int>(std::lround(p * samples)) % samples);
  phase_rows_.resize(phase_sample_.size() * static_cast<std::size_t>(n2));
  force_.setZero(3, n2);
  normal_.setZero(n2);
  gamma_.setZero(n2);
  tangential_.setZero(n2);
  radius_.setZero(n2);
  induced_.setZero(n2);
}

void SpanwiseAccumulator::reset() {
  force_.setZero();
  normal_.setZero();
  gamma_.setZero();
  tangential_.setZero();
  radius_.setZero();
  induced_.setZero();
  samples_ = 0;
}

void SpanwiseAccumulator::add(const Model& model, const Workspace& ws, int sample_in_cycle) {
  const Eigen::Index n = model.strips_per_wing(), n2 = model.strip_count();
  const int samples = model.simulation().samples_per_cycle;
  ++samples_;
  // Force per unit span of every strip; the left wing's is mapped to body axes in the rows.
  for (Eigen::Index k = 0; k < n2; ++k) {
    const std::size_t s = k < n ? 0 : 1;
    const SectionState& sec = ws.sections[static_cast<std::size_t>(k)];
    const double lambda = ws.poses[s].span_ratio;
    const double inv_width = 1.0 / (lambda * model.pair().width(k));
    const Eigen::Vector3d f =
        (ws.loads.force_quarter.col(k) + ws.loads.force_mid.col(k)) * inv_width;
    force_.col(k) += f;
    normal_(k) += f.dot(sec.normal_axis);
    gamma_(k) += ws.loads.circulation(k);
    tangential_(k) += sec.tangential_speed;
    induced_(k) += ws.loads.w_induced(k);
    radius_(k) += lambda * model.pair().radius(k);
    for (std::size_t p = 0; p < phase_sample_.size(); ++p) {
      if (phase_sample_[p] != sample_in_cycle) continue;
      SpanwiseRow& r = phase_rows_[p * static_cast<std::size_t>(n2) + static_cast<std::size_t>(k)];
      r = strip_row(model, k);
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
}

std::vector<SpanwiseRow> SpanwiseAccumulator::rows(const Model& model) const {
  const Eigen::Index n = model.strips_per_wing(), n2 = model.strip_count();
  std::vector<SpanwiseRow> out = phase_rows_;
  const double inv = samples_ > 0 ? 1.0 / samples_ : 0.0;
  for (Eigen::Index k = 0; k < n2; ++k) {
    SpanwiseRow r = strip_row(model, k);
    r.cycle_mean = true;
    const Eigen::Vector3d f = force_.col(k) * inv;
    r.force_per_span = k < n ? f : mirror(f);
    r.normal_force_per_span = normal_(k) * inv;
    r.circulation = gamma_(k) * inv;
    r.tangential_speed = tangential_(k) * inv;
    r.induced_wash = induced_(k) * inv;
    r.radius = radius_(k) * inv;
    r.alpha = std::numeric_limits<double>::quiet_NaN();  // a mean angle is not reported
    out.push_back(r);
  }
  return out;
}

void start_summary(const Model& model, RunSummary& out) {
  const AeroOptions& ao = model.aero_options();
  out.title = model.spec().title;
  out.model = ao.kind;
  out.model_label = std::string(to_string(out.model));
  if (out.model == ModelKind::quasi_steady)
    out.model_label += " (" + std::string(to_string(ao.law)) + ")";
  else if (out.model == ModelKind::wagner)
    out.model_label += " (" + std::string(to_string(ao.wagner_fit)) + " fit, " +
                       std::string(to_string(model.simulation().integrator)) + " steps)";
  else
    out.model_label += " (" + std::string(to_string(ao.wagner_fit)) + " fit, " +
                       std::string(to_string(ao.span_coupling)) + ", " +
                       std::string(to_string(model.simulation().integrator)) + " steps)";
  out.frequency = model.frequency();
  out.steps_per_cycle = model.simulation().steps_per_cycle;
  out.samples_per_cycle = model.simulation().samples_per_cycle;
  out.strips_per_wing = static_cast<int>(model.strips_per_wing());
  out.air_density = model.air().density;
  out.kinematic_viscosity = model.air().kinematic_viscosity;
}

VehicleBalance vehicle_balance(const Model& model, const CycleStats& averages) {
  const VehicleSpec& v = *model.vehicle();
  const FlightSpec& f = model.flight();
  VehicleBalance b;
  b.weight = v.mass * kStandardGravity;
  b.gravity_force = v.mass * gravity_body(v.roll, v.pitch);
  const Eigen::Vector3d va = f.velocity - f.wind;  // the body's velocity relative to the air
  b.body_drag = -0.5 * model.air().density * va.norm() * va * v.drag_area;
  b.net.force = averages.mean.force + b.gravity_force + b.body_drag;
  b.net.moment = averages.mean.moment;  // weight and body drag act at the reference point
  b.lift_to_weight = -averages.mean.force.z() / b.weight;
  const Eigen::Matrix3d inertia = inertia_matrix(v);
  b.steady_residual.force = b.net.force - v.mass * f.rates.cross(f.velocity);
  b.steady_residual.moment = b.net.moment - f.rates.cross(inertia * f.rates);
  return b;
}

void finish_summary(const Model& model, Workspace& ws, const CycleOutcome& outcome,
                    const SpanwiseAccumulator& spanwise, RunSummary& out) {
  out.status = outcome.status;
  out.cycles = outcome.cycles;
  out.periodicity_residual = std::isfinite(outcome.change) ? outcome.change : 0.0;
  out.state_residual = outcome.state_residual;
  out.averages = outcome.last;
  derive_quantities(model, ws, outcome.cycles - 1, out);
  if (model.vehicle()) out.vehicle = vehicle_balance(model, out.averages);
  out.spanwise = spanwise.rows(model);
  status_and_warnings(model, outcome, out);
}

}  // namespace flapline
