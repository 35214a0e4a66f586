#pragma once
/// \file
/// The immutable description of one case: wing, gait, air, body motion and options (DESIGN §1).
/// Build it once; algorithms read it through `const Model&` and keep their buffers in a Workspace.
/// The Model names its aerodynamic model by kind (aero_options().kind); the aero layer above
/// supplies the implementation (aero_model in aero/aero_model.hpp).
/// Thread-safety: a Model may be shared by any number of threads, each with its own Workspace.

#include <array>
#include <optional>
#include <string>

#include "flapline/case/aero_options.hpp"
#include "flapline/case/atmosphere.hpp"
#include "flapline/case/simulation_options.hpp"
#include "flapline/case/vehicle.hpp"
#include "flapline/geometry/mass.hpp"
#include "flapline/geometry/planform.hpp"
#include "flapline/geometry/strips.hpp"
#include "flapline/kinematics/gait.hpp"
#include "flapline/kinematics/wing_motion.hpp"

namespace flapline {

/// Everything a case is made of, in SI units. The YAML layer fills it; tests build it in code.
struct ModelSpec {
  std::string title;  ///< free text shown in reports
  PlanformSpec wing;
  WingMassSpec wing_mass;  ///< `wing.mass`: none by default (inertial loads then vanish)
  StripSpec strips;
  GaitSpec gait;
  FlightSpec flight;
  AirSpec air;
  AeroOptions aero;
  SimulationOptions simulation;
  /// The vehicle (mass, inertia, body drag, attitude); none: loads of the wings alone.
  std::optional<VehicleSpec> vehicle;
  /// Airspeed, flight-path angle, sideslip, turn rate: then flight.velocity and flight.rates are
  /// derived (needs a vehicle for its attitude).
  std::optional<FlightCondition> condition;
};

/// Per-strip arrays of the wing pair (right wing's strips first, then the left's), unscaled by
/// the span ratio. Derived once, used by the allocation-free inner loops.
struct PairArrays {
  Eigen::ArrayXd chord;              ///< m
  Eigen::ArrayXd radius;             ///< m
  Eigen::ArrayXd width;              ///< m
  Eigen::ArrayXd three_quarter_arm;  ///< m, ¾-chord point aft of the pitch axis: 0.75c − x₀c
  Eigen::ArrayXd half_arm;           ///< m, mid-chord aft of the pitch axis: 0.5c − x₀c
  Eigen::ArrayXd inverse_semichord;  ///< 1/b = 2/c (1/m)
};

class Model {
 public:
  /// Validate every field and build the derived data; throws InputError with the key path.
  explicit Model(ModelSpec spec);

  const ModelSpec& spec() const noexcept { return spec_; }
  const Planform& planform() const noexcept { return planform_; }
  const Strips& strips() const noexcept { return strips_; }
  const PairArrays& pair() const noexcept { return pair_; }
  const Air& air() const noexcept { return air_; }
  /// One wing's mass elements (empty for a massless wing).
  const MassElements& mass() const noexcept { return mass_; }
  const WingMotion& motion(Side side) const noexcept { return motion_[static_cast<int>(side)]; }
  const AeroOptions& aero_options() const noexcept { return spec_.aero; }
  const SimulationOptions& simulation() const noexcept { return spec_.simulation; }
  /// The vehicle, if the case has one.
  const std::optional<VehicleSpec>& vehicle() const noexcept { return spec_.vehicle; }
  /// The body's velocity and rates in use (derived from a flight condition when there is one,
  /// offsets included): spec().flight after resolution.
  const FlightSpec& flight() const noexcept { return spec_.flight; }
  /// Strips per wing N; the pair has 2N.
  Eigen::Index strips_per_wing() const noexcept { return strips_.size(); }
  Eigen::Index strip_count() const noexcept { return 2 * strips_.size(); }
  double frequency() const noexcept { return spec_.gait.frequency; }
  double period() const noexcept { return 1.0 / spec_.gait.frequency; }
  /// True when every waveform repeats each cycle (no step), so kinematics depend on phase only.
  bool periodic_kinematics() const noexcept { return periodic_; }
  /// True when both wings take the same angles at every instant (stroke, deviation, pitch and
  /// span ratio alike): the pair is then mirror-symmetric about the body's x-z plane.
  bool mirror_gait() const noexcept { return mirror_gait_; }

 private:
  ModelSpec spec_;
  Planform planform_;
  Strips strips_;
  PairArrays pair_;
  MassElements mass_;
  Air air_;
  std::array<WingMotion, 2> motion_;
  bool periodic_ = true;
  bool mirror_gait_ = true;
  void check_inflow() const;
};

/// Side and strip number (0-based within its wing) of pair index k.
inline Side side_of(Eigen::Index k, Eigen::Index per_wing) {
  return k < per_wing ? Side::right : Side::left;
}

}  // namespace flapline
