#pragma once
/// \file
/// Invented wings and gaits shared by tests, benchmarks and docs (STYLE §9). None of them
/// describes a real vehicle or animal; each matches a demo config in configs/.

#include "flapline/case/model.hpp"

namespace flapline::samples {

/// A harmonic waveform x = mean + amplitude·sin(2πft + phase), in SI units (rad for angles).
WaveformSpec harmonic(double mean, double amplitude, double phase);

/// Invented insect-scale hovering wing (configs/hover_insect.yaml): beta planform, R = 50 mm,
/// c̄ = 16 mm, 25 Hz, 120° peak-to-peak smoothed-triangle stroke in a level stroke plane, flipping
/// smoothed-square pitch ψ = 90° − 45°·sq(cos ωt), separated leading edge (suction recovery 0).
ModelSpec hover_insect();

/// Invented bat-scale wing in forward flight at 6 m/s (configs/forward_bat.yaml): tapered
/// planform, R = 0.25 m, 6 Hz, vertical stroke plane, span folded to 60 % on the upstroke.
ModelSpec forward_bat();

/// The same bat-scale wing with a smaller left stroke, which rolls the body
/// (configs/rolling_bat.yaml).
ModelSpec rolling_bat();

/// A rectangular wing (R = 0.25 m, c = 0.08 m, 40 strips) carried round by a body yawing at a
/// constant `rate` (rad/s) at a fixed pitch (rad): the right wing revolves leading edge first
/// at a steady state, the classic revolving-wing check.
ModelSpec revolving_wing(double stroke_rate, double pitch);

}  // namespace flapline::samples
