#include "flapline/simulation/run_summary.hpp"

#include <cmath>
#include <cstdarg>
#include <cstdio>

#include "flapline/common/math.hpp"

namespace flapline {

const char* const kCautions =
    "Cautions: these are model estimates, not flight clearance. Test a new vehicle on a tether or "
    "in a net first, and follow your local aviation rules and licensed practice.";

namespace {

std::string line(const char* fmt, ...) {
  char buf[512];
  va_list args;
  va_start(args, fmt);
  std::vsnprintf(buf, sizeof buf, fmt, args);
  va_end(args);
  return std::string(buf) + "\n";
}

std::string opt(const std::optional<double>& v, const char* fmt = "%.4g") {
  if (!v) return "n/a";
  char buf[64];
  std::snprintf(buf, sizeof buf, fmt, *v);
  return buf;
}

std::string header(const RunSummary& s) {
  std::string out;
  out += line("flapline run: %s", s.title.empty() ? "(untitled)" : s.title.c_str());
  out += line("model %s, %d strips per wing, %d steps and %d samples per cycle at %.4g Hz",
              s.model_label.c_str(), s.strips_per_wing, s.steps_per_cycle, s.samples_per_cycle,
              s.frequency);
  out += line("status: %s (%s; cycle means changed by %.2e of the force scale in the last cycle)",
              std::string(to_string(s.status)).c_str(), s.message.c_str(), s.periodicity_residual);
  return out;
}

/// Forces below 1e-12 of the run's force scale (RMS |F|) and moments below 1e-12 of that times
/// the span print as 0.
std::string wrench_lines(const RunSummary& s, const Wrench& w, const char* indent) {
  std::string out;
  out += line("%slift %+.5g N   thrust %+.5g N   side force %+.5g N", indent,
              s.shown_force(-w.force.z()), s.shown_force(w.force.x()), s.shown_force(w.force.y()));
  out += line("%sroll L %+.5g N m   pitch M %+.5g N m   yaw N %+.5g N m", indent,
              s.shown_moment(w.moment.x()), s.shown_moment(w.moment.y()),
              s.shown_moment(w.moment.z()));
  return out;
}

std::string footer(const RunSummary& s) {
  std::string out;
  for (const auto& w : s.warnings) out += "warning: " + w + "\n";
  out += kCautions;
  out += "\n";
  return out;
}

/// The drive section of the full report: per wing and joint, RMS and peak torque, power bounds.
std::string drive_lines(const RunSummary& s) {
  const CycleStats& a = s.averages;
  std::string out =
      "drive (generalised forces the joints supply; power with perfect elastic storage = mean, "
      "with none = mean of the positive part):\n";
  out += line(
      " pair: mechanical power %.5g W (perfect storage), %.5g W (no storage), peak %.5g W; "
      "inertial power mean %.3g W",
      a.power_mechanical_storage_perfect, a.power_mechanical_storage_none, a.power_mechanical_peak,
      shown_value(a.power_inertial_mean, a.power_mechanical_peak));
  out += line(" lift / drive power %s N/W (perfect storage), %s N/W (no storage)",
              opt(s.derived.lift_per_power_storage_perfect).c_str(),
              opt(s.derived.lift_per_power_storage_none).c_str());
  static const char* units[] = {"N m", "N m", "N m", "J", "N"};  // kJointForceUnits, spelt out
  for (std::size_t w = 0; w < 2; ++w) {
    const WingDriveStats& d = a.drive[w];
    out += line(" %s wing: power %.5g W (perfect storage), %.5g W (no storage), peak %.5g W",
                w == 0 ? "right" : "left", d.power_storage_perfect, d.power_storage_none,
                d.power_peak);
    for (std::size_t j = 0; j < static_cast<std::size_t>(kJoints); ++j) {
      const JointStats& q = d.joint[j];
      out += line(
          "   %-10s torque RMS %.4g %s (aero %.4g, inertial %.4g), peak %.4g %s; power "
          "%.4g W / %.4g W, peak %.4g W",
          kJointNames[j], q.torque_rms, units[j], shown_value(q.torque_aero_rms, q.torque_peak),
          shown_value(q.torque_inertial_rms, q.torque_peak), q.torque_peak, units[j],
          shown_value(q.power_storage_perfect, q.power_peak),
          shown_value(q.power_storage_none, q.power_peak), q.power_peak);
    }
  }
  return out;
}

}  // namespace

double shown_value(double v, double scale) {
  return std::abs(v) <= kShownFraction * std::abs(scale) ? 0.0 : v + 0.0;
}

std::string RunSummary::brief_report() const {
  std::string out = header(*this);
  out += "cycle means, body axes (x forward, y right, z down; lift = -Z, thrust = X):\n";
  out += wrench_lines(*this, averages.mean, "  ");
  out += line("  power to the air: mean %.5g W, peak %.5g W; actuator mean %.5g W",
              averages.power_air_mean, averages.power_air_peak, averages.power_actuator_mean);
  if (averages.power_mechanical_storage_none != 0.0)
    out += line(
        "  drive power: %.5g W with perfect elastic storage, %.5g W with none; lift/power "
        "%s N/W (no storage)",
        averages.power_mechanical_storage_perfect, averages.power_mechanical_storage_none,
        opt(derived.lift_per_power_storage_none).c_str());
  if (inflow)
    out += line("  inflow: w0 %.5g m/s (%s), induced power %.5g W", inflow->w0,
                std::string(to_string(inflow->kind)).c_str(), inflow->induced_power);
  out += line("  mean lift coefficient %s, Re %s, reduced frequency %s, advance ratio %s%s",
              opt(derived.mean_lift_coefficient).c_str(),
              opt(derived.reynolds_number, "%.0f").c_str(), opt(derived.reduced_frequency).c_str(),
              opt(derived.advance_ratio).c_str(), derived.mirror_gait ? "" : " (right wing)");
  if (!derived.mirror_gait)
    out += line("  drive power per wing (perfect storage): right %.5g W, left %.5g W",
                averages.drive[0].power_storage_perfect, averages.drive[1].power_storage_perfect);
  out += line("  reverse flow: %.1f %% of strip samples", 100.0 * derived.reverse_flow_fraction);
  return out + footer(*this);
}

std::string RunSummary::full_report() const {
  std::string out = header(*this);
  out += line("cycles run %d; lag states changed by %.2e (relative) over the last cycle", cycles,
              state_residual);
  out += line("air: density %.5g kg/m^3, kinematic viscosity %.4g m^2/s", air_density,
              kinematic_viscosity);
  const DerivedQuantities& f = derived;
  out += line("wing: span %.5g m, area %.5g m^2 (one wing), mean chord %.5g m, aspect ratio %.4g",
              f.span, f.area, f.mean_chord, f.aspect_ratio);
  out += line("      r1 %.4f, r2 %.4f, r3 %.4f (non-dimensional radii of moments of area)", f.r1,
              f.r2, f.r3);
  if (f.mirror_gait)
    out += line("gait: stroke amplitude (peak to peak) %.4g deg; airspeed %.4g m/s",
                f.stroke_peak_to_peak / kDegree, f.airspeed);
  else
    out += line(
        "gait (differs between the wings): stroke amplitude (peak to peak) %.4g deg right, "
        "%.4g deg left; airspeed %.4g m/s; the advance ratio below uses the right wing's",
        f.stroke_peak_to_peak / kDegree, f.left_stroke_peak_to_peak / kDegree, f.airspeed);
  out += line("reference speed U_ref %.5g m/s (RMS at r2 R)", f.reference_speed);
  out += "cycle means, body axes (x forward, y right, z down; lift = -Z, thrust = X):\n";
  out += " pair:\n" + wrench_lines(*this, averages.mean, "   ");
  out += " right wing:\n" + wrench_lines(*this, averages.wing_mean[0], "   ");
  out += " left wing:\n" + wrench_lines(*this, averages.wing_mean[1], "   ");
  out += line(" power to the air: mean %.5g W, peak %.5g W, mean of positive part %.5g W",
              averages.power_air_mean, averages.power_air_peak, averages.power_air_mean_positive);
  out += line(" actuator power:   mean %.5g W, peak %.5g W, mean of positive part %.5g W",
              averages.power_actuator_mean, averages.power_actuator_peak,
              averages.power_actuator_mean_positive);
  out += line(" RMS of |F| %.5g N; induced drag %.5g N", averages.force_rms,
              averages.induced_drag_mean);
  out += drive_lines(*this);
  if (inflow)
    out += line(
        " inflow (%s): w0 %.5g m/s over a disc of %.5g m^2 carrying %.5g N; induced power "
        "%.5g W, Rankine-Froude ideal %.5g W",
        std::string(to_string(inflow->kind)).c_str(), inflow->w0, inflow->area, inflow->thrust,
        inflow->induced_power, inflow->ideal_power);
  out +=
      line(" mean lift coefficient %s, Reynolds number %s, reduced frequency %s, advance ratio %s",
           opt(f.mean_lift_coefficient).c_str(), opt(f.reynolds_number, "%.0f").c_str(),
           opt(f.reduced_frequency).c_str(), opt(f.advance_ratio).c_str());
  out += line(" reverse flow %.1f %%, |alpha| > 30 deg %.1f %% of strip samples",
              100.0 * f.reverse_flow_fraction, 100.0 * f.high_alpha_fraction);
  return out + footer(*this);
}

}  // namespace flapline
