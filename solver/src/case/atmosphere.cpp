#include "flapline/case/atmosphere.hpp"

#include <cmath>

#include "flapline/common/errors.hpp"

namespace flapline {

Air standard_atmosphere(double h) {
  Air air;
  air.temperature = 288.15 - 0.0065 * h;
  const double p = 101325.0 * std::pow(air.temperature / 288.15, 5.25588);
  air.density = p / (287.05287 * air.temperature);
  const double mu = 1.458e-6 * std::pow(air.temperature, 1.5) / (air.temperature + 110.4);
  air.kinematic_viscosity = mu / air.density;
  return air;
}

Air resolve_air(const AirSpec& spec) {
  const double h = spec.altitude.value_or(0.0);
  if (!(h >= -2000.0 && h <= 11000.0))
    throw InputError("air.altitude", format_number(h),
                     "must lie in [-2000, 11000] (m, ISO 2533 troposphere)");
  Air air = standard_atmosphere(h);
  if (spec.density) {
    if (!(*spec.density > 0.0 && *spec.density <= 20.0))
      throw InputError("air.density", format_number(*spec.density), "must lie in (0, 20] (kg/m^3)");
    air.density = *spec.density;
  }
  if (spec.kinematic_viscosity) {
    if (!(*spec.kinematic_viscosity > 0.0 && *spec.kinematic_viscosity <= 1e-2))
      throw InputError("air.kinematic_viscosity", format_number(*spec.kinematic_viscosity),
                       "must lie in (0, 0.01] (m^2/s)");
    air.kinematic_viscosity = *spec.kinematic_viscosity;
  }
  return air;
}

}  // namespace flapline
