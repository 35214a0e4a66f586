#include "flapline/case/simulation_options.hpp"

#include <cmath>
#include <string>

#include "flapline/common/errors.hpp"

namespace flapline {

void validate(const SimulationOptions& o) {
  if (o.steps_per_cycle < kMinStepsPerCycle || o.steps_per_cycle > 100000)
    throw InputError("simulation.steps_per_cycle", std::to_string(o.steps_per_cycle),
                     "must lie in [" + std::to_string(kMinStepsPerCycle) + ", 100000]");
  if (o.samples_per_cycle < kMinSamplesPerCycle || o.samples_per_cycle > o.steps_per_cycle ||
      o.steps_per_cycle % o.samples_per_cycle != 0)
    throw InputError("simulation.samples_per_cycle", std::to_string(o.samples_per_cycle),
                     "must be >= " + std::to_string(kMinSamplesPerCycle) +
                         " and divide simulation.steps_per_cycle (" +
                         std::to_string(o.steps_per_cycle) + ")")
        .between_keys();
  if (o.max_cycles < 1 || o.max_cycles > 100000)
    throw InputError("simulation.max_cycles", std::to_string(o.max_cycles),
                     "must lie in [1, 100000]");
  if (o.min_cycles < 1 || o.min_cycles > o.max_cycles)
    throw InputError(
        "simulation.min_cycles", std::to_string(o.min_cycles),
        "must lie in [1, simulation.max_cycles = " + std::to_string(o.max_cycles) + "]")
        .between_keys();
  if (!(o.tolerance > 0.0 && o.tolerance <= 0.1))
    throw InputError("simulation.tolerance", format_number(o.tolerance), "must lie in (0, 0.1]");
  if (o.cache_mib < 0 || o.cache_mib > 1048576)
    throw InputError("simulation.cache_mib", std::to_string(o.cache_mib),
                     "must lie in [0, 1048576] (MiB per process)");
  if (o.spanwise_phases.size() > 64)
    throw InputError("simulation.spanwise_phases", std::to_string(o.spanwise_phases.size()),
                     "at most 64 phases");
  for (double p : o.spanwise_phases)
    if (!(p >= 0.0 && p < 1.0))
      throw InputError("simulation.spanwise_phases", format_number(p),
                       "every phase must lie in [0, 1) (fraction of the cycle)");
}

}  // namespace flapline
