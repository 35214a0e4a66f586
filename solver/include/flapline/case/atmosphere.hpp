#pragma once
/// \file
/// Air properties: given directly, or from an altitude in the ISO 2533 standard atmosphere
/// (troposphere, -2000 m to 11000 m).

#include <optional>

namespace flapline {

/// What the user gave. Key paths in errors: `air.*`.
struct AirSpec {
  std::optional<double> altitude;             ///< m, ISO 2533 geopotential altitude [-2000, 11000]
  std::optional<double> density;              ///< kg/m³, (0, 20]; overrides the altitude's
  std::optional<double> kinematic_viscosity;  ///< m²/s, (0, 1e-2]; overrides the altitude's
};

/// Resolved air properties.
struct Air {
  double density = 1.225;                  ///< kg/m³
  double kinematic_viscosity = 1.4607e-5;  ///< m²/s
  double temperature = 288.15;             ///< K (standard atmosphere at the altitude; informative)
};

/// ISO 2533 troposphere: T = 288.15 - 0.0065 h, p = 101325 (T/288.15)^5.25588,
/// ρ = p / (287.05287 T); dynamic viscosity from Sutherland's law μ = 1.458e-6 T^1.5/(T + 110.4).
Air standard_atmosphere(double altitude_m);

/// Resolve an AirSpec (sea level when nothing is given); throws InputError out of range.
Air resolve_air(const AirSpec& spec);

}  // namespace flapline
