#pragma once
/// \file
/// How a run is integrated and averaged (DESIGN §5). Key paths in errors: `simulation.*`.

#include <vector>

#include "flapline/common/enum_names.hpp"

namespace flapline {

/// Initial value of the lag states.
enum class StartMode {
  rest,          ///< states zero (an impulsive start)
  quasi_steady,  ///< states at their steady values for the kinematics at t = 0
  periodic       ///< states on the periodic orbit of the uncoupled lag equations (one shooting
                 ///< cycle; exact for the wagner model, a close first guess for coupled ones)
};
template <>
struct EnumNames<StartMode> {
  static constexpr std::array<std::pair<StartMode, std::string_view>, 3> items{
      {{StartMode::rest, "rest"},
       {StartMode::quasi_steady, "quasi_steady"},
       {StartMode::periodic, "periodic"}}};
};

/// Which samples the history keeps.
enum class HistoryKeep {
  all,        ///< every output sample of every cycle
  last_cycle  ///< only the last (averaged) cycle
};
template <>
struct EnumNames<HistoryKeep> {
  static constexpr std::array<std::pair<HistoryKeep, std::string_view>, 2> items{
      {{HistoryKeep::all, "all"}, {HistoryKeep::last_cycle, "last_cycle"}}};
};

/// How the lag states are stepped (DESIGN §5).
enum class Integrator {
  exponential,  ///< exponential time differencing (ETDRK4) on each strip's own 2×2 lag block
  rk4           ///< classical fourth-order Runge–Kutta on every state
};
template <>
struct EnumNames<Integrator> {
  static constexpr std::array<std::pair<Integrator, std::string_view>, 2> items{
      {{Integrator::exponential, "exponential"}, {Integrator::rk4, "rk4"}}};
};

/// Default per-process budget of the lifting line's per-phase matrices (MiB).
inline constexpr int kDefaultCacheMib = 768;

/// Documented limits (configs/README.md).
inline constexpr int kMinStepsPerCycle = 20;
inline constexpr int kMinSamplesPerCycle = 4;

struct SimulationOptions {
  int steps_per_cycle = 400;    ///< RK4 steps per wing-beat, [20, 100000]
  int samples_per_cycle = 100;  ///< output samples per wing-beat, >= 4, divides steps_per_cycle
  int min_cycles = 2;           ///< cycles run at least, [1, max_cycles]
  int max_cycles = 300;         ///< cap, [1, 100000]
  /// Convergence: stop when the change between consecutive cycle means of every force component
  /// is below tolerance × the cycle RMS of |F| (moments: × RMS|F| × R). (0, 0.1].
  double tolerance = 1e-5;
  StartMode start = StartMode::rest;
  /// Cycle fractions [0, 1) at which the spanwise loading is reported (snapped to samples).
  std::vector<double> spanwise_phases{0.1, 0.25, 0.4, 0.65};
  HistoryKeep history = HistoryKeep::all;
  Integrator integrator = Integrator::exponential;
  /// MiB that the per-phase matrices of all lifting-line runs in this process may hold together
  /// (threads of a study included); phases past it are solved afresh at each stage. [0, 1048576]
  int cache_mib = kDefaultCacheMib;
};

/// Throws InputError naming `simulation.<field>`.
void validate(const SimulationOptions& options);

}  // namespace flapline
