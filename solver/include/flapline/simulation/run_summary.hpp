#pragma once
/// \file
/// What every run ends in (STYLE §5): status, message, results, warnings, and a short and a full
/// text report. Units are SI; angles in rad inside, degrees in the reports.

#include <array>
#include <optional>
#include <string>
#include <vector>

#include "flapline/case/aero_options.hpp"
#include "flapline/kinematics/gait.hpp"
#include "flapline/simulation/wrench.hpp"

namespace flapline {

/// How a run ended. A failed run is a value too (run_case), so a study records it and goes on.
enum class RunStatus {
  converged,      ///< consecutive cycle means agreed within the tolerance
  not_converged,  ///< simulation.max_cycles ran out first (results are those of the last cycle)
  single_cycle,   ///< only one cycle was run, so periodicity was not checked
  input_error,    ///< a rule that needs the whole case failed (e.g. too few steps); no results
  blew_up         ///< a state or a load became non-finite; no results
};
template <>
struct EnumNames<RunStatus> {
  static constexpr std::array<std::pair<RunStatus, std::string_view>, 5> items{
      {{RunStatus::converged, "converged"},
       {RunStatus::not_converged, "not_converged"},
       {RunStatus::single_cycle, "single_cycle"},
       {RunStatus::input_error, "input_error"},
       {RunStatus::blew_up, "blew_up"}}};
};

/// True when the run produced results (converged, not converged or a single cycle).
inline bool has_results(RunStatus s) noexcept {
  return s != RunStatus::input_error && s != RunStatus::blew_up;
}

/// Numbers shown to people (terminal, reports): a value within kShownFraction of its scale of
/// zero is rounding noise of a quantity zero by symmetry or by construction (the side force of a
/// symmetric gait, an aerodynamic load along the span, the mean inertial power of a periodic
/// gait) and is shown as 0; never −0. Machine-readable files keep full precision.
inline constexpr double kShownFraction = 1e-12;
double shown_value(double v, double scale);

/// The safety cautions every summary ends with.
extern const char* const kCautions;

/// Gait angles of one wing at a sample (rad; span ratio dimensionless).
struct WingAngles {
  double stroke = 0, deviation = 0, pitch = 0, span_ratio = 1;
};

/// One output sample of the history.
struct HistoryRow {
  LoadSample loads;
  std::array<WingAngles, 2> angles;  ///< right, left
};

/// Cycle statistics of one joint's drive (simulation/drive.hpp).
struct JointStats {
  double torque_rms = 0, torque_peak = 0;  ///< of the total τ (N·m, J, N); peak = max |τ|
  double torque_aero_rms = 0, torque_inertial_rms = 0;  ///< RMS of the parts
  /// Power bounds of flight energetics (Ellington 1984, Phil. Trans. R. Soc. B 305, Part VI — from
  /// memory): mean of τq̇ (perfect elastic storage) and mean of its positive part (no storage).
  double power_storage_perfect = 0, power_storage_none = 0;
  double power_peak = 0;  ///< max |τq̇| (W)
};

/// Cycle statistics of one wing's drive.
struct WingDriveStats {
  std::array<JointStats, kJoints> joint;
  /// The wing's mechanical power Σ_j τ_j q̇_j: mean, mean of its positive part, max |·| (W).
  double power_storage_perfect = 0, power_storage_none = 0, power_peak = 0;
  double power_inertial_mean = 0;  ///< W (0 for a periodic gait without body rates)
  Wrench inertial_mean;            ///< mean inertial load on the body
};

/// Statistics of one whole cycle (uniform samples; the end point is the next cycle's start).
struct CycleStats {
  Wrench mean;                                                                 ///< both wings
  std::array<Wrench, 2> wing_mean;                                             ///< right, left
  double power_air_mean = 0, power_air_peak = 0, power_air_mean_positive = 0;  ///< W
  double power_actuator_mean = 0, power_actuator_peak = 0, power_actuator_mean_positive = 0;
  double force_rms = 0;                 ///< RMS of |F| of the pair over the cycle (N)
  double induced_drag_mean = 0;         ///< cycle mean of LoadSample::induced_drag (N)
  std::array<WingDriveStats, 2> drive;  ///< right, left
  /// Both drives' mechanical power: mean, mean of the positive part, max |·| (W).
  double power_mechanical_storage_perfect = 0, power_mechanical_storage_none = 0;
  double power_mechanical_peak = 0;
  double power_inertial_mean = 0;  ///< W
  Wrench inertial_mean;            ///< both wings' inertial load on the body, cycle mean
  Eigen::Vector3d profile_drag_mean = Eigen::Vector3d::Zero();  ///< N, body axes (pair)
};

/// Derived scalars (DESIGN §5): planform figures, reference speed and the non-dimensional groups,
/// flow shares. summary.json group `derived`.
struct DerivedQuantities {
  double span = 0;                      ///< R (m)
  double area = 0;                      ///< one wing S (m²)
  double mean_chord = 0;                ///< c̄ = S/R (m)
  double aspect_ratio = 0;              ///< of the pair, 4R²/S_pair
  double r1 = 0, r2 = 0, r3 = 0;        ///< non-dimensional radii of moments of area
  double stroke_peak_to_peak = 0;       ///< Φ, peak-to-peak stroke of the right wing (rad)
  double left_stroke_peak_to_peak = 0;  ///< the left wing's (rad)
  bool mirror_gait = true;              ///< both wings take the same angles (Model::mirror_gait)
  double airspeed = 0;                  ///< |V − wind| (m/s)
  double reference_speed = 0;  ///< U_ref, RMS of U at r̂₂R over the cycle, both wings (m/s)
  std::optional<double> mean_lift_coefficient;  ///< L̄/(½ρU_ref²S_pair)
  std::optional<double> reynolds_number;        ///< U_ref c̄/ν
  std::optional<double> reduced_frequency;      ///< π f c̄/U_ref
  std::optional<double> advance_ratio;          ///< V/(2ΦfR); none when Φ = 0
  /// Mean lift / the drive's mechanical power with perfect elastic storage (its mean) and with
  /// none (mean of its positive part) (N/W); none when that power is 0.
  std::optional<double> lift_per_power_storage_perfect, lift_per_power_storage_none;
  double reverse_flow_fraction = 0;  ///< share of strip samples with U_t < 0 (last cycle)
  double high_alpha_fraction = 0;    ///< share of strip samples with |α| > 30° (last cycle)
};

/// Loading of one strip at one phase (or its cycle mean), body axes.
struct SpanwiseRow {
  bool cycle_mean = false;  ///< true: averaged over the last cycle
  double phase = 0;         ///< cycle fraction of the sample (snapped to the output samples)
  Side side = Side::right;
  int strip = 0;             ///< 0-based, root to tip
  double radius = 0;         ///< m from the hinge at that instant (span ratio applied)
  double span_fraction = 0;  ///< r/R of the unfolded wing
  double chord = 0;          ///< m
  Eigen::Vector3d force_per_span = Eigen::Vector3d::Zero();  ///< N/m, body axes
  double normal_force_per_span = 0;                          ///< N/m along e_n
  double circulation = 0;                                    ///< m²/s
  double alpha = 0;                                          ///< rad (NaN in cycle-mean rows)
  double tangential_speed = 0;                               ///< U_t (m/s)
  double induced_wash = 0;  ///< KΓ at the control point (m/s; lifting line)
};

/// With a vehicle: the net mean wrench and the steady-flight balance (DESIGN §9).
struct VehicleBalance {
  double weight = 0;                                        ///< m·g (N)
  Eigen::Vector3d gravity_force = Eigen::Vector3d::Zero();  ///< m·g_B (N), body axes
  Eigen::Vector3d body_drag = Eigen::Vector3d::Zero();      ///< −½ρ|V_a|V_a·C_D S (N)
  Wrench net;                 ///< cycle-mean aerodynamic wrench + weight + body drag
  double lift_to_weight = 0;  ///< −Z̄_aero / (m g)
  /// Steady flight needs net force = m ω×V_B and net moment = ω×(Iω): net minus those.
  Wrench steady_residual;
};

/// Momentum-theory inflow of the last cycle (model.inflow; DESIGN §9).
struct InflowResult {
  InflowModel kind = InflowModel::none;
  double w0 = 0;  ///< m/s, speed of the uniform induced velocity in the last cycle
  Eigen::Vector3d velocity = Eigen::Vector3d::Zero();  ///< m/s, w₀ as a vector (body axes)
  double area = 0;                                     ///< m², the disc
  double thrust = 0;  ///< N, T = −F̄·n (stroke disc) or the lift normal to the airspeed (span disc)
  double induced_power = 0;  ///< T·w₀ (W)
  double ideal_power = 0;    ///< Rankine–Froude T^{3/2}/√(2ρA) (W; 0 for T ≤ 0)
  /// Both over the mean power given to the air; none when that is not positive.
  std::optional<double> induced_fraction, ideal_fraction;
  /// |w₀ − w(T)| / max(w₀, w(T)): how well w₀ satisfies its momentum relation with this T.
  double momentum_residual = 0;
};

struct RunSummary {
  RunStatus status = RunStatus::single_cycle;
  std::string message;
  std::vector<std::string> warnings;

  std::string title;
  ModelKind model = ModelKind::quasi_steady;
  std::string model_label;  ///< e.g. "quasi_steady (thin_airfoil)"
  double frequency = 0;     ///< Hz
  int steps_per_cycle = 0, samples_per_cycle = 0, strips_per_wing = 0;
  int cycles = 0;                   ///< cycles integrated
  double periodicity_residual = 0;  ///< last change of cycle means / convergence scale
  double state_residual = 0;        ///< |x(end) − x(end − T)| / max|x| (0 without states)
  double air_density = 0;           ///< kg/m³
  double kinematic_viscosity = 0;   ///< m²/s

  std::string error_key;  ///< key path of the offending setting (status input_error)

  CycleStats averages;  ///< of the last cycle
  DerivedQuantities derived;
  std::optional<VehicleBalance> vehicle;  ///< with a vehicle section only
  std::optional<InflowResult> inflow;     ///< with model.inflow only
  std::vector<HistoryRow> history;
  std::vector<SpanwiseRow> spanwise;

  /// Lift = −Z, thrust = X, side force = Y of the cycle mean (N).
  double mean_lift() const { return -averages.mean.force.z(); }
  double mean_thrust() const { return averages.mean.force.x(); }
  double mean_side_force() const { return averages.mean.force.y(); }
  /// A force or moment as shown to people: the scale is the run's RMS |F| (× span for moments).
  double shown_force(double v) const { return shown_value(v, averages.force_rms); }
  double shown_moment(double v) const { return shown_value(v, averages.force_rms * derived.span); }

  /// A dozen lines: the headline numbers, warnings and the cautions.
  std::string brief_report() const;
  /// Everything in the summary as text, per wing, with units.
  std::string full_report() const;
};

}  // namespace flapline
