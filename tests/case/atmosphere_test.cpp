// ISO 2533 standard atmosphere (REFERENCES §6).
#include <doctest/doctest.h>

#include <cmath>

#include "flapline/case/atmosphere.hpp"
#include "flapline/common/errors.hpp"

using namespace flapline;

TEST_CASE("ISO 2533 densities: the standard's formulas and its table") {
  // Source: ISO 2533:1975 Standard Atmosphere, troposphere formulas T = 288.15 − 0.0065h,
  // p = 101325 (T/288.15)^5.25588, ρ = p/(287.05287 T) (formulas standard; constants from memory,
  // REFERENCES §6). The formula is re-evaluated here independently of the library code path.
  for (double h : {0.0, 1000.0, 2000.0, 3000.0}) {
    const double T = 288.15 - 0.0065 * h;
    const double rho = 101325.0 * std::pow(T / 288.15, 5.25588) / (287.05287 * T);
    CHECK(standard_atmosphere(h).density == doctest::Approx(rho).epsilon(1e-12));
  }
  // Table values 1.2250, 1.1117, 1.0066, 0.9093 kg/m³ (ISO 2533 tables, from memory, not
  // verified: REFERENCES §6); 1e-3 relative covers the table's rounding.
  CHECK(standard_atmosphere(0).density == doctest::Approx(1.2250).epsilon(1e-3));
  CHECK(standard_atmosphere(1000).density == doctest::Approx(1.1117).epsilon(1e-3));
  CHECK(standard_atmosphere(2000).density == doctest::Approx(1.0066).epsilon(1e-3));
  CHECK(standard_atmosphere(3000).density == doctest::Approx(0.9093).epsilon(1e-3));
  // Sea-level kinematic viscosity ≈ 1.46e-5 m²/s (Sutherland's law, REFERENCES §6, from memory),
  // within 1 %.
  CHECK(standard_atmosphere(0).kinematic_viscosity == doctest::Approx(1.46e-5).epsilon(0.01));
}

TEST_CASE("air block: explicit values override, out-of-range altitude is rejected") {
  AirSpec s;
  s.altitude = 1000.0;
  s.density = 1.0;
  const Air a = resolve_air(s);
  CHECK(a.density == 1.0);
  CHECK(a.kinematic_viscosity == doctest::Approx(standard_atmosphere(1000).kinematic_viscosity));
  s.altitude = 20000.0;
  CHECK_THROWS_WITH_AS(resolve_air(s), doctest::Contains("air.altitude"), InputError);
}
