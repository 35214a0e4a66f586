// A wing and a gait built in code (an invented hovering wing), run once; the cycle means.
#include <cstdio>

#include "flapline/flapline.hpp"

int main() {
  using namespace flapline;
  ModelSpec spec;
  spec.title = "invented rectangular wing hovering (example)";
  spec.wing.shape = PlanformShape::rectangular;
  spec.wing.span = 0.05;    // m
  spec.wing.chord = 0.015;  // m
  spec.strips.count = 20;
  spec.gait.frequency = 25.0;  // Hz
  spec.gait.right.stroke.shape = WaveShape::harmonic;
  spec.gait.right.stroke.amplitude = 60.0 * kDegree;
  spec.gait.right.pitch.mean = 90.0 * kDegree;  // flipping pitch, leading edge first
  spec.gait.right.pitch.amplitude = 45.0 * kDegree;
  spec.gait.right.pitch.phase = -90.0 * kDegree;
  spec.gait.left = spec.gait.right;
  spec.aero.kind = ModelKind::wagner;
  const Model model(spec);
  const RunSummary r = simulate(model);
  std::printf("%s: %s\n", r.title.c_str(), r.message.c_str());
  std::printf("mean lift %.6g N, thrust %.3g N, actuator power %.6g W\n", r.mean_lift(),
              r.mean_thrust(), r.averages.power_actuator_mean);
  return r.status == RunStatus::converged && r.mean_lift() > 0.0 ? 0 : 1;
}
