#include "flapline/case/vehicle.hpp"

#include <Eigen/Eigenvalues>
#include <cmath>
#include <string>

#include "flapline/common/errors.hpp"
#include "flapline/common/math.hpp"

namespace flapline {

Eigen::Vector3d gravity_body(double roll, double pitch) {
  return kStandardGravity * Eigen::Vector3d(-std::sin(pitch), std::sin(roll) * std::cos(pitch),
                                            std::cos(roll) * std::cos(pitch));
}

Eigen::Vector3d air_velocity_body(const FlightCondition& c, double pitch) {
  const double alpha = pitch - c.flight_path_angle, beta = c.sideslip;
  return c.airspeed * Eigen::Vector3d(std::cos(alpha) * std::cos(beta), std::sin(beta),
                                      std::sin(alpha) * std::cos(beta));
}

Eigen::Vector3d turn_rates_body(double turn_rate, double roll, double pitch) {
  return turn_rate * Eigen::Vector3d(-std::sin(pitch), std::sin(roll) * std::cos(pitch),
                                     std::cos(roll) * std::cos(pitch));
}

Eigen::Matrix3d inertia_matrix(const VehicleSpec& v) {
  Eigen::Matrix3d i;
  i << v.ixx, 0.0, -v.ixz, 0.0, v.iyy, 0.0, -v.ixz, 0.0, v.izz;
  return i;
}

void validate(const VehicleSpec& v) {
  if (!(v.mass > 0.0 && v.mass <= 1000.0))
    throw InputError("vehicle.mass", format_number(v.mass), "must lie in (0, 1000] (kg)");
  for (const auto& [name, value] :
       {std::pair<const char*, double>{"xx", v.ixx}, {"yy", v.iyy}, {"zz", v.izz}, {"xz", v.ixz}})
    if (!std::isfinite(value) || std::abs(value) > 1e6)
      throw InputError(std::string("vehicle.inertia.") + name, format_number(value),
                       "must be finite and within ±1e6 (kg m^2)");
  const Eigen::Matrix3d i = inertia_matrix(v);
  const double smallest =
      Eigen::SelfAdjointEigenSolver<Eigen::Matrix3d>(i).eigenvalues().minCoeff();
  if (!(smallest > 0.0))
    throw InputError("vehicle.inertia",
                     "xx " + format_number(v.ixx) + ", yy " + format_number(v.iyy) + ", zz " +
                         format_number(v.izz) + ", xz " + format_number(v.ixz),
                     "must be positive definite (Ixx, Iyy, Izz > 0 and Ixz² < Ixx·Izz) (kg m^2)");
  if (!(v.drag_area >= 0.0 && v.drag_area <= 100.0))
    throw InputError("vehicle.drag_area", format_number(v.drag_area), "must lie in [0, 100] (m^2)");
  if (!(std::abs(v.roll) <= kPi + 1e-12))
    throw InputError("vehicle.attitude.roll", format_number(v.roll / kDegree),
                     "must lie in [-180, 180] (deg)");
  if (!(std::abs(v.pitch) <= 0.5 * kPi + 1e-12))
    throw InputError("vehicle.attitude.pitch", format_number(v.pitch / kDegree),
                     "must lie in [-90, 90] (deg)");
}

}  // namespace flapline
