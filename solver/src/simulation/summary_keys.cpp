#include "flapline/simulation/summary_keys.hpp"

#include <array>

#include "flapline/common/math.hpp"

namespace flapline {
namespace {

using Value = std::optional<double>;

template <int Wing>  // −1 pair, 0 right, 1 left
const Wrench& wrench_of(const RunSummary& s) {
  if constexpr (Wing < 0)
    return s.averages.mean;
  else
    return s.averages.wing_mean[Wing];
}

template <int Wing>
void add_wrench_keys(std::vector<SummaryKey>& keys, const std::string& prefix) {
  keys.push_back({prefix + "lift_N",
                  [](const RunSummary& s) -> Value { return -wrench_of<Wing>(s).force.z(); }});
  keys.push_back({prefix + "thrust_N",
                  [](const RunSummary& s) -> Value { return wrench_of<Wing>(s).force.x(); }});
  keys.push_back({prefix + "side_force_N",
                  [](const RunSummary& s) -> Value { return wrench_of<Wing>(s).force.y(); }});
  keys.push_back(
      {prefix + "X_N", [](const RunSummary& s) -> Value { return wrench_of<Wing>(s).force.x(); }});
  keys.push_back(
      {prefix + "Y_N", [](const RunSummary& s) -> Value { return wrench_of<Wing>(s).force.y(); }});
  keys.push_back(
      {prefix + "Z_N", [](const RunSummary& s) -> Value { return wrench_of<Wing>(s).force.z(); }});
  keys.push_back({prefix + "L_roll_Nm",
                  [](const RunSummary& s) -> Value { return wrench_of<Wing>(s).moment.x(); }});
  keys.push_back({prefix + "M_pitch_Nm",
                  [](const RunSummary& s) -> Value { return wrench_of<Wing>(s).moment.y(); }});
  keys.push_back({prefix + "N_yaw_Nm",
                  [](const RunSummary& s) -> Value { return wrench_of<Wing>(s).moment.z(); }});
}

template <int Which>  // 0 net mean wrench, 1 steady-flight residual
const Wrench& vehicle_wrench(const VehicleBalance& v) {
  if constexpr (Which == 0)
    return v.net;
  else
    return v.steady_residual;
}

template <int Which>
void add_vehicle_wrench(std::vector<SummaryKey>& keys, const std::string& prefix) {
  const std::array<const char*, 6> names{"X_N",       "Y_N",        "Z_N",
                                         "L_roll_Nm", "M_pitch_Nm", "N_yaw_Nm"};
  using F = Value (*)(const RunSummary&);
  const std::array<F, 6> get{
      [](const RunSummary& s) -> Value {
        return s.vehicle ? Value(vehicle_wrench<Which>(*s.vehicle).force.x()) : std::nullopt;
      },
      [](const RunSummary& s) -> Value {
        return s.vehicle ? Value(vehicle_wrench<Which>(*s.vehicle).force.y()) : std::nullopt;
      },
      [](const RunSummary& s) -> Value {
        return s.vehicle ? Value(vehicle_wrench<Which>(*s.vehicle).force.z()) : std::nullopt;
      },
      [](const RunSummary& s) -> Value {
        return s.vehicle ? Value(vehicle_wrench<Which>(*s.vehicle).moment.x()) : std::nullopt;
      },
      [](const RunSummary& s) -> Value {
        return s.vehicle ? Value(vehicle_wrench<Which>(*s.vehicle).moment.y()) : std::nullopt;
      },
      [](const RunSummary& s) -> Value {
        return s.vehicle ? Value(vehicle_wrench<Which>(*s.vehicle).moment.z()) : std::nullopt;
      }};
  for (std::size_t i = 0; i < 6; ++i) keys.push_back({prefix + names[i], get[i], false, true});
}

// Drive keys (simulation/drive.hpp): per joint of each wing, per wing and for the pair.
template <int Wing, int J>
const JointStats& joint_of(const RunSummary& s) {
  return s.averages.drive[Wing].joint[J];
}

template <int Wing, int J>
void add_joint_keys(std::vector<SummaryKey>& keys, const std::string& wing_prefix) {
  const std::string prefix = wing_prefix + kJointNames[J] + ".";
  const std::string u = kJointForceUnits[J];
  keys.push_back({prefix + "torque_rms_" + u,
                  [](const RunSummary& s) -> Value { return joint_of<Wing, J>(s).torque_rms; }});
  keys.push_back({prefix + "torque_peak_" + u,
                  [](const RunSummary& s) -> Value { return joint_of<Wing, J>(s).torque_peak; }});
  keys.push_back({prefix + "torque_aero_rms_" + u, [](const RunSummary& s) -> Value {
                    return joint_of<Wing, J>(s).torque_aero_rms;
                  }});
  keys.push_back({prefix + "torque_inertial_rms_" + u, [](const RunSummary& s) -> Value {
                    return joint_of<Wing, J>(s).torque_inertial_rms;
                  }});
  keys.push_back({prefix + "power_storage_perfect_W", [](const RunSummary& s) -> Value {
                    return joint_of<Wing, J>(s).power_storage_perfect;
                  }});
  keys.push_back({prefix + "power_storage_none_W", [](const RunSummary& s) -> Value {
                    return joint_of<Wing, J>(s).power_storage_none;
                  }});
  keys.push_back({prefix + "power_peak_W",
                  [](const RunSummary& s) -> Value { return joint_of<Wing, J>(s).power_peak; }});
}

template <int Wing>
void add_wing_drive_keys(std::vector<SummaryKey>& keys, const std::string& prefix) {
  keys.push_back({prefix + "power_storage_perfect_W", [](const RunSummary& s) -> Value {
                    return s.averages.drive[Wing].power_storage_perfect;
                  }});
  keys.push_back({prefix + "power_storage_none_W", [](const RunSummary& s) -> Value {
                    return s.averages.drive[Wing].power_storage_none;
                  }});
  keys.push_back({prefix + "power_peak_W",
                  [](const RunSummary& s) -> Value { return s.averages.drive[Wing].power_peak; }});
  keys.push_back({prefix + "inertial_power_mean_W", [](const RunSummary& s) -> Value {
                    return s.averages.drive[Wing].power_inertial_mean;
                  }});
  add_joint_keys<Wing, 0>(keys, prefix);
  add_joint_keys<Wing, 1>(keys, prefix);
  add_joint_keys<Wing, 2>(keys, prefix);
  add_joint_keys<Wing, 3>(keys, prefix);
  add_joint_keys<Wing, 4>(keys, prefix);
}

std::vector<SummaryKey> make_keys() {
  std::vector<SummaryKey> k;
  auto add = [&k](const char* path, Value (*f)(const RunSummary&)) { k.push_back({path, f}); };
  auto add_vehicle = [&k](const char* path, Value (*f)(const RunSummary&)) {
    k.push_back({path, f, false, true});
  };
  auto add_count = [&k](const char* path, Value (*f)(const RunSummary&)) {
    k.push_back({path, f, true});
  };
  add("run.frequency_Hz", [](const RunSummary& s) -> Value { return s.frequency; });
  add_count("run.strips_per_wing", [](const RunSummary& s) -> Value { return s.strips_per_wing; });
  add_count("run.steps_per_cycle", [](const RunSummary& s) -> Value { return s.steps_per_cycle; });
  add_count("run.samples_per_cycle",
            [](const RunSummary& s) -> Value { return s.samples_per_cycle; });
  add_count("run.cycles", [](const RunSummary& s) -> Value { return s.cycles; });
  add("run.periodicity_residual",
      [](const RunSummary& s) -> Value { return s.periodicity_residual; });
  add("run.state_residual", [](const RunSummary& s) -> Value { return s.state_residual; });
  add("air.density_kg_m3", [](const RunSummary& s) -> Value { return s.air_density; });
  add("air.kinematic_viscosity_m2_s",
      [](const RunSummary& s) -> Value { return s.kinematic_viscosity; });
  add("wing.span_m", [](const RunSummary& s) -> Value { return s.derived.span; });
  add("wing.area_one_wing_m2", [](const RunSummary& s) -> Value { return s.derived.area; });
  add("wing.mean_chord_m", [](const RunSummary& s) -> Value { return s.derived.mean_chord; });
  add("wing.aspect_ratio_pair",
      [](const RunSummary& s) -> Value { return s.derived.aspect_ratio; });
  add("wing.r1_hat", [](const RunSummary& s) -> Value { return s.derived.r1; });
  add("wing.r2_hat", [](const RunSummary& s) -> Value { return s.derived.r2; });
  add("wing.r3_hat", [](const RunSummary& s) -> Value { return s.derived.r3; });
  add_wrench_keys<-1>(k, "cycle_mean.");
  add_wrench_keys<0>(k, "cycle_mean.right_wing.");
  add_wrench_keys<1>(k, "cycle_mean.left_wing.");
  add("power.air_mean_W", [](const RunSummary& s) -> Value { return s.averages.power_air_mean; });
  add("power.air_peak_W", [](const RunSummary& s) -> Value { return s.averages.power_air_peak; });
  add("power.air_mean_positive_W",
      [](const RunSummary& s) -> Value { return s.averages.power_air_mean_positive; });
  add("power.actuator_mean_W",
      [](const RunSummary& s) -> Value { return s.averages.power_actuator_mean; });
  add("power.actuator_peak_W",
      [](const RunSummary& s) -> Value { return s.averages.power_actuator_peak; });
  add("power.actuator_mean_positive_W",
      [](const RunSummary& s) -> Value { return s.averages.power_actuator_mean_positive; });
  add("drive.pair.power_storage_perfect_W",
      [](const RunSummary& s) -> Value { return s.averages.power_mechanical_storage_perfect; });
  add("drive.pair.power_storage_none_W",
      [](const RunSummary& s) -> Value { return s.averages.power_mechanical_storage_none; });
  add("drive.pair.power_peak_W",
      [](const RunSummary& s) -> Value { return s.averages.power_mechanical_peak; });
  add("drive.pair.inertial_power_mean_W",
      [](const RunSummary& s) -> Value { return s.averages.power_inertial_mean; });
  add("drive.lift_per_power_storage_perfect_N_per_W",
      [](const RunSummary& s) -> Value { return s.derived.lift_per_power_storage_perfect; });
  add("drive.lift_per_power_storage_none_N_per_W",
      [](const RunSummary& s) -> Value { return s.derived.lift_per_power_storage_none; });
  add("drive.inertial_mean.X_N",
      [](const RunSummary& s) -> Value { return s.averages.inertial_mean.force.x(); });
  add("drive.inertial_mean.Y_N",
      [](const RunSummary& s) -> Value { return s.averages.inertial_mean.force.y(); });
  add("drive.inertial_mean.Z_N",
      [](const RunSummary& s) -> Value { return s.averages.inertial_mean.force.z(); });
  add("drive.inertial_mean.L_roll_Nm",
      [](const RunSummary& s) -> Value { return s.averages.inertial_mean.moment.x(); });
  add("drive.inertial_mean.M_pitch_Nm",
      [](const RunSummary& s) -> Value { return s.averages.inertial_mean.moment.y(); });
  add("drive.inertial_mean.N_yaw_Nm",
      [](const RunSummary& s) -> Value { return s.averages.inertial_mean.moment.z(); });
  add_wing_drive_keys<0>(k, "drive.right_wing.");
  add_wing_drive_keys<1>(k, "drive.left_wing.");
  add("derived.reference_speed_m_s",
      [](const RunSummary& s) -> Value { return s.derived.reference_speed; });
  add("derived.mean_lift_coefficient",
      [](const RunSummary& s) -> Value { return s.derived.mean_lift_coefficient; });
  add("derived.reynolds_number",
      [](const RunSummary& s) -> Value { return s.derived.reynolds_number; });
  add("derived.reduced_frequency",
      [](const RunSummary& s) -> Value { return s.derived.reduced_frequency; });
  add("derived.advance_ratio",
      [](const RunSummary& s) -> Value { return s.derived.advance_ratio; });
  add("derived.stroke_peak_to_peak_deg",
      [](const RunSummary& s) -> Value { return s.derived.stroke_peak_to_peak / kDegree; });
  add("derived.left_stroke_peak_to_peak_deg",
      [](const RunSummary& s) -> Value { return s.derived.left_stroke_peak_to_peak / kDegree; });
  add("derived.airspeed_m_s", [](const RunSummary& s) -> Value { return s.derived.airspeed; });
  add("derived.force_rms_N", [](const RunSummary& s) -> Value { return s.averages.force_rms; });
  add("derived.induced_drag_N",
      [](const RunSummary& s) -> Value { return s.averages.induced_drag_mean; });
  add("drag.profile_X_N",
      [](const RunSummary& s) -> Value { return s.averages.profile_drag_mean.x(); });
  add("drag.profile_Z_N",
      [](const RunSummary& s) -> Value { return s.averages.profile_drag_mean.z(); });
  auto add_inflow = [&k](const char* path, Value (*f)(const RunSummary&)) {
    k.push_back({path, f, false, false, true});
  };
  add_inflow("inflow.w0_m_s", [](const RunSummary& s) -> Value {
    return s.inflow ? Value(s.inflow->w0) : std::nullopt;
  });
  add_inflow("inflow.velocity_X_m_s", [](const RunSummary& s) -> Value {
    return s.inflow ? Value(s.inflow->velocity.x()) : std::nullopt;
  });
  add_inflow("inflow.velocity_Y_m_s", [](const RunSummary& s) -> Value {
    return s.inflow ? Value(s.inflow->velocity.y()) : std::nullopt;
  });
  add_inflow("inflow.velocity_Z_m_s", [](const RunSummary& s) -> Value {
    return s.inflow ? Value(s.inflow->velocity.z()) : std::nullopt;
  });
  add_inflow("inflow.disc_area_m2", [](const RunSummary& s) -> Value {
    return s.inflow ? Value(s.inflow->area) : std::nullopt;
  });
  add_inflow("inflow.thrust_N", [](const RunSummary& s) -> Value {
    return s.inflow ? Value(s.inflow->thrust) : std::nullopt;
  });
  add_inflow("inflow.induced_power_W", [](const RunSummary& s) -> Value {
    return s.inflow ? Value(s.inflow->induced_power) : std::nullopt;
  });
  add_inflow("inflow.ideal_induced_power_W", [](const RunSummary& s) -> Value {
    return s.inflow ? Value(s.inflow->ideal_power) : std::nullopt;
  });
  add_inflow("inflow.induced_power_fraction", [](const RunSummary& s) -> Value {
    return s.inflow ? s.inflow->induced_fraction : std::nullopt;
  });
  add_inflow("inflow.ideal_power_fraction", [](const RunSummary& s) -> Value {
    return s.inflow ? s.inflow->ideal_fraction : std::nullopt;
  });
  add_inflow("inflow.momentum_residual", [](const RunSummary& s) -> Value {
    return s.inflow ? Value(s.inflow->momentum_residual) : std::nullopt;
  });
  add("derived.reverse_flow_fraction",
      [](const RunSummary& s) -> Value { return s.derived.reverse_flow_fraction; });
  // With a vehicle section (null without one).
  add_vehicle("vehicle.weight_N", [](const RunSummary& s) -> Value {
    return s.vehicle ? Value(s.vehicle->weight) : std::nullopt;
  });
  add_vehicle("vehicle.lift_to_weight", [](const RunSummary& s) -> Value {
    return s.vehicle ? Value(s.vehicle->lift_to_weight) : std::nullopt;
  });
  add_vehicle_wrench<0>(k, "net_mean.");
  add_vehicle_wrench<1>(k, "steady_flight_residual.");
  add_vehicle("vehicle.body_drag_X_N", [](const RunSummary& s) -> Value {
    return s.vehicle ? Value(s.vehicle->body_drag.x()) : std::nullopt;
  });
  add_vehicle("vehicle.body_drag_Y_N", [](const RunSummary& s) -> Value {
    return s.vehicle ? Value(s.vehicle->body_drag.y()) : std::nullopt;
  });
  add_vehicle("vehicle.body_drag_Z_N", [](const RunSummary& s) -> Value {
    return s.vehicle ? Value(s.vehicle->body_drag.z()) : std::nullopt;
  });
  add("derived.high_alpha_fraction",
      [](const RunSummary& s) -> Value { return s.derived.high_alpha_fraction; });
  return k;
}

}  // namespace

const std::vector<SummaryKey>& summary_keys() {
  static const std::vector<SummaryKey> keys = make_keys();
  return keys;
}

const SummaryKey* find_summary_key(const std::string& path) {
  for (const SummaryKey& k : summary_keys())
    if (k.path == path) return &k;
  return nullptr;
}

}  // namespace flapline
