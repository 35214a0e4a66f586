#include "flapline/samples/samples.hpp"

#include "flapline/common/math.hpp"

namespace flapline::samples {
WaveformSpec harmonic(double mean, double amplitude, double phase) {
  WaveformSpec w;
  w.mean = mean;
  w.amplitude = amplitude;
  w.phase = phase;
  return w;
}

ModelSpec hover_insect() {
  ModelSpec s;
  s.title = "Invented insect-scale hovering wing (demo)";
  s.wing.shape = PlanformShape::beta;
  s.wing.span = 0.05;
  s.wing.mean_chord = 0.016;
  s.wing.first_moment_radius = 0.5;
  s.wing.second_moment_radius = 0.55;
  s.wing.pitch_axis = 0.25;
  s.wing.hinge = {0.0, 0.005, 0.0};
  s.strips.count = 20;
  s.gait.frequency = 25.0;
  WaveformSpec stroke = harmonic(0.0, 60.0 * kDegree, 0.0);
  stroke.shape = WaveShape::smoothed_triangle;
  stroke.sharpness = 0.7;
  WaveformSpec pitch = harmonic(90.0 * kDegree, 45.0 * kDegree, -90.0 * kDegree);
  pitch.shape = WaveShape::smoothed_square;
  pitch.sharpness = 2.0;
  s.gait.right.stroke = s.gait.left.stroke = stroke;
  s.gait.right.pitch = s.gait.left.pitch = pitch;
  s.aero.suction_recovery = 0.0;
  s.simulation.steps_per_cycle = 400;
  s.simulation.samples_per_cycle = 100;
  return s;
}

ModelSpec forward_bat() {
  ModelSpec s;
  s.title = "Invented bat-scale wing in forward flight, folding on the upstroke (demo)";
  s.wing.shape = PlanformShape::tapered;
  s.wing.span = 0.25;
  s.wing.root_chord = 0.11;
  s.wing.tip_chord = 0.05;
  s.wing.pitch_axis = 0.25;
  s.wing.hinge = {0.0, 0.03, 0.0};
  s.wing.twist_tip = -10.0 * kDegree;
  s.strips.count = 20;
  s.gait.frequency = 6.0;
  s.gait.stroke_plane_angle = -90.0 * kDegree;
  const WaveformSpec stroke = harmonic(0.0, 30.0 * kDegree, 0.0);
  const WaveformSpec pitch = harmonic(96.0 * kDegree, 12.0 * kDegree, -90.0 * kDegree);
  const WaveformSpec span = harmonic(0.8, 0.2, 90.0 * kDegree);
  s.gait.right.stroke = s.gait.left.stroke = stroke;
  s.gait.right.pitch = s.gait.left.pitch = pitch;
  s.gait.right.span_ratio = s.gait.left.span_ratio = span;
  s.flight.velocity = {6.0, 0.0, 0.0};
  return s;
}

ModelSpec rolling_bat() {
  ModelSpec s = forward_bat();
  s.title = "Invented bat-scale wing with a smaller left stroke, rolling the body (demo)";
  s.gait.left.stroke.amplitude = 24.0 * kDegree;
  return s;
}

ModelSpec revolving_wing(double rate, double pitch) {
  ModelSpec s;
  s.title = "Rectangular wing revolving at a constant rate (check case)";
  s.wing.shape = PlanformShape::rectangular;
  s.wing.span = 0.25;
  s.wing.chord = 0.08;
  s.strips.count = 40;
  s.gait.frequency = 1.0;
  s.gait.right.pitch = s.gait.left.pitch = harmonic(pitch, 0.0, 0.0);
  // The body yaws left at `rate`, carrying the wings with it: the right wing revolves leading
  // edge first about the hinge at the origin (the left one trailing edge first).
  s.flight.rates = {0.0, 0.0, -rate};
  s.simulation.steps_per_cycle = 20;
  s.simulation.samples_per_cycle = 4;
  return s;
}

}  // namespace flapline::samples
