#include "flapline/case/model.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <string>
#include <vector>

#include "flapline/common/errors.hpp"
#include "flapline/common/math.hpp"

namespace flapline {
namespace {

/// `shown` converts to the unit the user typed (e.g. rad/s to deg/s) for the message.
void check_vector(const Eigen::Vector3d& v, const char* key, double limit, const char* unit,
                  double shown = 1.0) {
  if (!v.allFinite() || v.cwiseAbs().maxCoeff() > limit)
    throw InputError(key,
                     "[" + format_number(v.x() * shown) + ", " + format_number(v.y() * shown) +
                         ", " + format_number(v.z() * shown) + "]",
                     "each component must be finite and within ±" + format_number(limit * shown) +
                         " (" + unit + ")");
}

const GaitSpec& validated(const GaitSpec& g) {
  if (!(g.frequency > 0.0 && g.frequency <= 2000.0))
    throw InputError("gait.frequency", format_number(g.frequency), "must lie in (0, 2000] (Hz)");
  if (!(std::abs(g.stroke_plane_angle) <= kPi + 1e-12))
    throw InputError("gait.stroke_plane_angle", format_number(g.stroke_plane_angle / kDegree),
                     "must lie in [-180, 180] (deg)");
  return g;
}

const FlightSpec& validated(const FlightSpec& f) {
  check_vector(f.velocity, "flight.velocity", 1000.0, "m/s");
  check_vector(f.rates, "flight.rates", 100.0 * 2 * kPi, "deg/s", 1.0 / kDegree);
  check_vector(f.wind, "flight.wind", 1000.0, "m/s");
  return f;
}

void check_span_ratio(const WingMotion& m) {
  const std::string key =
      std::string("gait.") + (m.side == Side::right ? "right" : "left") + ".span_ratio";
  if (!(m.span_ratio.minimum() > 0.0 && m.span_ratio.maximum() <= 1.0 + 1e-12))
    throw InputError(key,
                     "from " + format_number(m.span_ratio.minimum()) + " to " +
                         format_number(m.span_ratio.maximum()),
                     "must stay within (0, 1] over the whole cycle")
        .between_keys();
}

/// The fastest a point of a wing moves relative to the body, bounded by the sum of the peaks of
/// its causes: the body's rates times the wing's farthest point, each joint's peak rate (sampled
/// at 1024 instants of the cycle) times the lever arm it acts on, and the plunge rate. Refused
/// above kMaxSpeed for either wing, naming the key of that wing's largest cause: the models are
/// incompressible (and a huge speed would overflow the step checks that follow).
void check_speeds(const std::array<WingMotion, 2>& motion, double span, double max_chord) {
  constexpr double kMaxSpeed = 1000.0;  // m/s
  constexpr int kSamples = 1024;
  const Waveform& z = motion[0].plunge;
  if (!(std::max(std::abs(z.minimum()), std::abs(z.maximum())) <= 1000.0))
    throw InputError("gait.plunge",
                     "from " + format_number(z.minimum()) + " to " + format_number(z.maximum()),
                     "must stay within ±1000 (m) over the whole cycle");
  struct Cause {
    std::string key;
    double speed = 0.0;
    std::string how;
  };
  const double reach = motion[0].hinge.norm() + span;
  double worst_total = -1.0;
  Cause worst;
  std::string worst_side;
  for (const WingMotion& m : motion) {
    const std::string side = std::string("gait.") + (m.side == Side::right ? "right" : "left");
    const double period = 1.0 / m.frequency;
    struct Joint {
      const Waveform* w;
      const char* name;
      double arm;
      const char* arm_name;
      double peak = 0.0;
    };
    Joint joints[] = {{&m.stroke, "stroke", span, "the span"},
                      {&m.deviation, "deviation", span, "the span"},
                      {&m.pitch, "pitch", max_chord, "the largest chord"},
                      {&m.span_ratio, "span_ratio", span, "the span"},
                      {&m.plunge, "plunge", 1.0, ""}};
    for (int j = 0; j < kSamples; ++j) {
      const double t = period * j / kSamples;
      for (Joint& q : joints) q.peak = std::max(q.peak, std::abs(q.w->at(t, m.frequency).rate));
    }
    std::vector<Cause> causes{
        {"flight.rates", m.rates.norm() * reach,
         "the body's rates times the wing's farthest point, " + format_number(reach) + " m"}};
    for (const Joint& q : joints) {
      const std::string name = q.name;
      if (name == "plunge") {
        causes.push_back({"gait.plunge", q.peak, "the peak plunge rate"});
        continue;
      }
      const bool angle = name != "span_ratio";
      causes.push_back({side + "." + name, q.peak * q.arm,
                        "a peak rate of " + format_number(angle ? q.peak / kDegree : q.peak) +
                            (angle ? " deg/s" : " 1/s") + " times " + q.arm_name + ", " +
                            format_number(q.arm) + " m"});
    }
    double total = 0.0;
    const Cause* largest = &causes.front();
    for (const Cause& c : causes) {
      total += c.speed;
      if (!(c.speed <= largest->speed)) largest = &c;
    }
    if (std::isnan(total)) total = std::numeric_limits<double>::infinity();
    if (total > worst_total) {
      worst_total = total;
      worst = *largest;
      worst_side = m.side == Side::right ? "right" : "left";
    }
  }
  if (worst_total <= kMaxSpeed) return;
  throw InputError(worst.key, format_number(worst.speed) + " m/s (" + worst.how + ")",
                   "the wings must move slower than " + format_number(kMaxSpeed) +
                       " m/s relative to the body (all causes together on the " + worst_side +
                       " wing: " + format_number(worst_total) +
                       " m/s); the models are incompressible",
                   "check the units (degrees, metres, Hz) and the frequency")
      .between_keys();
}

/// Validate the vehicle and derive the body's velocity and rates from a flight condition.
ModelSpec resolved(ModelSpec s) {
  if (s.vehicle) validate(*s.vehicle);
  if (s.condition) {
    const FlightCondition& c = *s.condition;
    if (!s.vehicle)
      throw InputError("flight.airspeed", format_number(c.airspeed),
                       "a flight condition needs the vehicle section (its attitude sets the angle "
                       "of attack)")
          .between_keys();
    if (!(c.airspeed >= 0.0 && c.airspeed <= 1000.0))
      throw InputError("flight.airspeed", format_number(c.airspeed), "must lie in [0, 1000] (m/s)");
    if (!(std::abs(c.flight_path_angle) <= 0.5 * kPi + 1e-12))
      throw InputError("flight.flight_path_angle", format_number(c.flight_path_angle / kDegree),
                       "must lie in [-90, 90] (deg)");
    if (!(std::abs(c.sideslip) <= 0.5 * kPi + 1e-12))
      throw InputError("flight.sideslip", format_number(c.sideslip / kDegree),
                       "must lie in [-90, 90] (deg)");
    if (!(std::abs(c.turn_rate) <= 100.0 * 2 * kPi))
      throw InputError("flight.turn_rate", format_number(c.turn_rate / kDegree),
                       "must lie within ±36000 (deg/s)");
    // The air-relative velocity is V_B; the ground-frame velocity adds the wind.
    s.flight.velocity = air_velocity_body(c, s.vehicle->pitch) + s.flight.wind;
    s.flight.rates = turn_rates_body(c.turn_rate, s.vehicle->roll, s.vehicle->pitch);
  }
  s.flight.velocity += s.flight.velocity_offset;
  s.flight.rates += s.flight.rates_offset;
  s.flight.velocity_offset.setZero();
  s.flight.rates_offset.setZero();
  return s;
}

}  // namespace

Model::Model(ModelSpec spec)
    : spec_(resolved(std::move(spec))),
      planform_(spec_.wing),
      strips_(cut_into_strips(planform_, spec_.strips)),
      air_(resolve_air(spec_.air)),
      motion_{WingMotion(Side::right, validated(spec_.gait), spec_.gait.right, spec_.wing.hinge,
                         validated(spec_.flight)),
              WingMotion(Side::left, spec_.gait, spec_.gait.left, spec_.wing.hinge, spec_.flight)} {
  check_span_ratio(motion_[0]);
  check_span_ratio(motion_[1]);
  check_speeds(motion_, planform_.span(), strips_.chord.maxCoeff());
  validate(spec_.aero);
  validate(spec_.simulation);
  validate(spec_.wing_mass);
  if (spec_.wing_mass.any()) mass_ = distribute_mass(spec_.wing_mass, planform_, strips_);
  const Eigen::Index n = strips_.size();
  auto twice = [n](const Eigen::ArrayXd& a) {
    Eigen::ArrayXd out(2 * n);
    out << a, a;
    return out;
  };
  pair_.chord = twice(strips_.chord);
  pair_.radius = twice(strips_.radius);
  pair_.width = twice(strips_.width);
  pair_.three_quarter_arm = twice(0.75 * strips_.chord - strips_.leading_edge);
  pair_.half_arm = twice(0.5 * strips_.chord - strips_.leading_edge);
  pair_.inverse_semichord = 2.0 / pair_.chord;
  for (const WingMotion& m : motion_)
    for (const Waveform* w : {&m.stroke, &m.deviation, &m.pitch, &m.span_ratio, &m.plunge})
      if (w->spec().shape == WaveShape::step) periodic_ = false;
  const WingMotion& r = motion_[0];
  const WingMotion& l = motion_[1];
  mirror_gait_ = same_waveform(r.stroke.spec(), l.stroke.spec()) &&
                 same_waveform(r.deviation.spec(), l.deviation.spec()) &&
                 same_waveform(r.pitch.spec(), l.pitch.spec()) &&
                 same_waveform(r.span_ratio.spec(), l.span_ratio.spec());
  check_inflow();
  if (!periodic_ && spec_.simulation.start == StartMode::periodic &&
      spec_.aero.kind != ModelKind::quasi_steady)
    throw InputError("simulation.start", "periodic",
                     "needs kinematics that repeat every cycle, and a `step` waveform never "
                     "repeats",
                     "use start: rest or quasi_steady with a step waveform")
        .between_keys();
}

void Model::check_inflow() const {
  const InflowModel inflow = spec_.aero.inflow;
  if (inflow == InflowModel::none) return;
  const std::string name(to_string(inflow));
  double stroke = 0.0;
  for (const WingMotion& m : motion_)
    stroke = std::max(stroke, m.stroke.maximum() - m.stroke.minimum());
  if (!(stroke > 1e-9))
    throw InputError("model.inflow", name,
                     "needs flapping wings: the stroke is constant, so there is no stroke disc",
                     "a fixed wing's downwash is the lifting_line model's job")
        .between_keys();
  if (!periodic_)
    throw InputError("model.inflow", name,
                     "needs kinematics that repeat every cycle (no step waveform)")
        .between_keys();
  if (inflow == InflowModel::stroke_disc &&
      std::abs(spec_.gait.stroke_plane_angle) > 0.25 * kPi + 1e-12)
    throw InputError("model.inflow", name,
                     "needs a stroke plane within ±45 deg of level (gait.stroke_plane_angle is " +
                         format_number(spec_.gait.stroke_plane_angle / kDegree) + " deg)",
                     "the stroke-plane disc models hover and slow flight; use span_disc in forward "
                     "flight")
        .between_keys();
  if (inflow == InflowModel::span_disc && (spec_.flight.velocity - spec_.flight.wind).norm() < 1e-9)
    throw InputError("model.inflow", name,
                     "needs an airspeed (flight.velocity − flight.wind is zero): the span disc "
                     "models forward flight",
                     "use stroke_disc in hover")
        .between_keys();
}

}  // namespace flapline
